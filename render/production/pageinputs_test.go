package production

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"reflect"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette/press"
	"sheaf/render/pdf"
)

// fill sets every number, string and bool under v to a value of its own
// (seed counts them), giving slices one element and pointers a target:
// two fills from the same seed are equal.
func fill(v reflect.Value, seed *int) {
	*seed++
	switch v.Kind() {
	case reflect.Bool:
		v.SetBool(*seed%2 == 0)
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		v.SetInt(int64(*seed % 100))
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		v.SetUint(uint64(*seed % 100))
	case reflect.Float32, reflect.Float64:
		v.SetFloat(float64(*seed) + 0.25)
	case reflect.String:
		v.SetString(fmt.Sprintf("s%d", *seed))
	case reflect.Slice:
		v.Set(reflect.MakeSlice(v.Type(), 1, 1))
		fill(v.Index(0), seed)
	case reflect.Array:
		for i := range v.Len() {
			fill(v.Index(i), seed)
		}
	case reflect.Pointer:
		v.Set(reflect.New(v.Type().Elem()))
		fill(v.Elem(), seed)
	case reflect.Struct:
		for _, i := range hashedFields(v.Type()) {
			fill(v.Field(i), seed)
		}
	}
}

// leaves counts the numbers, strings and bools fill sets under v.
func leaves(v reflect.Value) []reflect.Value {
	switch v.Kind() {
	case reflect.Slice, reflect.Array:
		var out []reflect.Value
		for i := range v.Len() {
			out = append(out, leaves(v.Index(i))...)
		}
		return out
	case reflect.Pointer:
		return leaves(v.Elem())
	case reflect.Struct:
		var out []reflect.Value
		for _, i := range hashedFields(v.Type()) {
			out = append(out, leaves(v.Field(i))...)
		}
		return out
	}
	return []reflect.Value{v}
}

// change sets a leaf to another value of its kind.
func change(v reflect.Value) {
	switch v.Kind() {
	case reflect.Bool:
		v.SetBool(!v.Bool())
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		v.SetInt(v.Int() + 1)
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		v.SetUint(v.Uint() + 1)
	case reflect.Float32, reflect.Float64:
		v.SetFloat(v.Float() + 1)
	case reflect.String:
		v.SetString(v.String() + "x")
	}
}

func valueSum(v any) string {
	h := newHasher("test")
	h.value(reflect.ValueOf(v).Elem())
	return h.sum()
}

// TestValueHashCoversLayout: every field of a page's layout and setup
// that encoding/json writes (what pageInputs hashed as JSON before)
// reaches the page's hash, however deep, and so do a slice's length and a
// pointer's nil-ness; a field JSON leaves out (PageSetup.Press, hashed by
// its fingerprint beside) does not, and equal values hash equal.
func TestValueHashCoversLayout(t *testing.T) {
	for _, typ := range []reflect.Type{reflect.TypeFor[layout.Page](), reflect.TypeFor[pdf.PageSetup]()} {
		t.Run(typ.Name(), func(t *testing.T) {
			fresh := func() reflect.Value {
				v := reflect.New(typ)
				seed := 0
				fill(v.Elem(), &seed)
				return v
			}
			base := valueSum(fresh().Interface())
			require.Equal(t, base, valueSum(fresh().Interface()), "equal values hash equal")
			n := len(leaves(fresh().Elem()))
			require.Greater(t, n, 10, "the filled value reaches its nested fields")
			for k := range n {
				v := fresh()
				leaf := leaves(v.Elem())[k]
				change(leaf)
				assert.NotEqual(t, base, valueSum(v.Interface()), "leaf %d of %d (%s) does not reach the hash", k, n, leaf.Type())
			}
			// Lengths: an empty and a nil slice differ from the filled one and from each other.
			for i := range typ.NumField() {
				if typ.Field(i).Type.Kind() != reflect.Slice {
					continue
				}
				empty, null := fresh(), fresh()
				empty.Elem().Field(i).Set(reflect.MakeSlice(typ.Field(i).Type, 0, 0))
				null.Elem().Field(i).Set(reflect.Zero(typ.Field(i).Type))
				assert.NotEqual(t, base, valueSum(empty.Interface()), typ.Field(i).Name)
				assert.NotEqual(t, valueSum(empty.Interface()), valueSum(null.Interface()), typ.Field(i).Name)
			}
		})
	}
	// The press condition is not the layout's: pageInputs hashes its
	// fingerprint (profile bytes and settings) itself.
	a, b := pdf.PageSetup{Slug: "x"}, pdf.PageSetup{Slug: "x", Press: &press.Condition{}}
	assert.Equal(t, valueSum(&a), valueSum(&b), "PageSetup.Press (json:\"-\") is left out")
	m := pdf.PageSetup{Slug: "x", Marks: &pdf.MarkOptions{}}
	assert.NotEqual(t, valueSum(&a), valueSum(&m), "a nil and a zero MarkOptions differ")
}

// TestStartTerms: the term set started with the build holds, by series
// index and by term, each term's termSum, and the manifest's list is
// termHashes' (sorted by term).
func TestStartTerms(t *testing.T) {
	d := termData(40)
	ts := startTerms(context.Background(), d).get()
	require.Len(t, ts.bySeries, len(d.Series))
	for i := range d.Series {
		want := termSum(&d.Series[i])
		assert.Equal(t, want, ts.bySeries[i], "series %d", i)
		assert.Equal(t, want, ts.byTerm[d.Series[i].Term], "term %q", d.Series[i].Term)
	}
	assert.Equal(t, termHashes(context.Background(), termData(40)), ts.list)
}

// TestFontSums: a build's font hashes are the SHA-256 (FIPS 180-4, here
// crypto/sha256) of each style's bytes, in the manifest's order regular,
// bold, italic, taken once per Set and given again unchanged.
func TestFontSums(t *testing.T) {
	j := demoJob(t, "")
	fs, err := j.Fonts(&j.Spec.Outputs[0])
	require.NoError(t, err)
	var c fontSums
	got := c.hashes("print", fs)
	require.Len(t, got, 3)
	var sums [3]string
	for k, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic} {
		s := sha256.Sum256(fs.Bytes(st))
		sums[k] = hex.EncodeToString(s[:])
		assert.Equal(t, FontHash{Output: "print", Style: st.String(), Name: fs.Name(st), Path: fs.Path(st), SHA256: sums[k]}, got[k])
	}
	h := newHasher("sheaf fonts v1")
	for _, s := range sums {
		h.str(s)
	}
	assert.Equal(t, h.sum(), c.sum(fs), "one hash over the three, as pages' inputs had it")
	assert.Equal(t, got, c.hashes("print", fs), "the same a second time")
	assert.NotEqual(t, sums[0], sums[1], "regular and bold are different files")
}
