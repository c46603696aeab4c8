package production

import (
	"encoding/json"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// decodeAsJSON is the reference: what encoding/json makes of b, and
// whether it could.
func decodeAsJSON(b []byte) (*Manifest, bool) {
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, false
	}
	return &m, true
}

// TestDecodeManifest: decodeManifest reads every manifest sheaf writes
// (every field set, lists empty and nil, strings of every kind) as
// encoding/json does; where it gives up, encoding/json is asked; it
// never gives a result encoding/json would not: not for a manifest cut
// short anywhere, nor for JSON sheaf does not write (keys in other case or
// unknown or twice, escapes, nulls, numbers in other forms, more after
// the end).
func TestDecodeManifest(t *testing.T) {
	full := func() *Manifest {
		var m Manifest
		seed := 0
		fill(reflect.ValueOf(&m).Elem(), &seed)
		return &m
	}
	edges := full()
	for _, c := range []string{"é", "日本", "<&>", "\x7f"} {
		edges.Terms = append(edges.Terms, TermHash{Term: "t " + c, Peak: -3})
	}
	edges.Outputs = append(edges.Outputs, OutputEntry{Name: "web", Proofs: 1e21, Pages: []PageEntry{}}, OutputEntry{Proofs: 0.000001}, OutputEntry{Proofs: 150})
	edges.Files = append(edges.Files, FileEntry{Path: "a", Size: -1})
	for name, m := range map[string]*Manifest{"every field": full(), "zero": {}, "edges": edges,
		"empty lists": {Data: []FileHash{}, Terms: []TermHash{}, Outputs: []OutputEntry{{Pages: []PageEntry{{Terms: []string{}}}}}, Files: []FileEntry{}}} {
		b, err := appendManifest(nil, m)
		require.NoError(t, err)
		got, ok := decodeManifest(b)
		require.True(t, ok, "%s: sheaf's own manifest read without encoding/json", name)
		want, _ := decodeAsJSON(b)
		assert.Equal(t, want, got, name)
		// Cut short anywhere: never a manifest.
		for i := range len(b) - 1 {
			_, ok := decodeManifest(b[:i])
			_, jsonOK := decodeAsJSON(b[:i])
			require.False(t, ok && !jsonOK, "%s cut at %d of %d read as a manifest", name, i, len(b))
		}
	}
	base, err := appendManifest(nil, full())
	require.NoError(t, err)
	// One value changed in place, by a pattern: the first match only.
	set := func(pattern, value string) string {
		loc := regexp.MustCompile(pattern).FindIndex(base)
		require.NotNil(t, loc, pattern)
		return string(base[:loc[0]]) + value + string(base[loc[1]:])
	}
	variants := map[string]string{
		"key in other case":    set(`"sheaf"`, `"Sheaf"`),
		"unknown key":          set(`"sheaf"`, `"sheafs": 1, "sheaf"`),
		"key twice":            set(`"sheaf"`, `"spec": {"path": "x"}, "sheaf"`),
		"list twice":           `{"outputs": [{"name": "p", "pages": [{"page": 1, "inputs": "a"}], "pages": [{"page": 2}]}]}`,
		"escape":               set(`"path": "`, `"path": "\u0041\n`),
		"invalid UTF-8":        set(`"path": "`, "\"path\": \"\xff"),
		"null string":          set(`"sha256": "[^"]*"`, `"sha256": null`),
		"null list":            set(`"terms": \[`, `"terms": null, "y": [`),
		"null object":          set(`"spec": \{[^}]*\}`, `"spec": null`),
		"fraction in int":      set(`"page": \d+`, `"page": 1.5`),
		"exponent in int":      set(`"size": \d+`, `"size": 1e3`),
		"leading zero":         set(`"size": \d+`, `"size": 01`),
		"minus zero":           set(`"size": \d+`, `"size": -0`),
		"bool":                 set(`"sheaf": "[^"]*"`, `"sheaf": true`),
		"int overflow":         set(`"size": \d+`, `"size": 99999999999999999999`),
		"int of 18 digits":     set(`"size": \d+`, `"size": -999999999999999999`),
		"float exponent range": set(`"proof_dpi": [0-9.]+`, `"proof_dpi": 1e999`),
		"float exponent":       set(`"proof_dpi": [0-9.]+`, `"proof_dpi": 1.5E+2`),
		"after the end":        string(base) + "{}",
		"space around":         " \t\r\n" + string(base) + " \n",
		"compact":              compactJSON(t, base),
		"top-level null":       "null",
		"empty object":         "{}",
	}
	for name, v := range variants {
		got, ok := decodeManifest([]byte(v))
		want, jsonOK := decodeAsJSON([]byte(v))
		if ok {
			require.True(t, jsonOK, "%s: read a manifest encoding/json refuses", name)
			assert.Equal(t, want, got, name)
		}
	}
	for _, name := range []string{"compact", "space around", "minus zero", "int of 18 digits", "float exponent", "empty object"} {
		_, ok := decodeManifest([]byte(variants[name]))
		assert.True(t, ok, "%s: read without encoding/json", name)
	}
}

func compactJSON(t *testing.T, b []byte) string {
	var out strings.Builder
	var m map[string]any
	require.NoError(t, json.Unmarshal(b, &m))
	enc := json.NewEncoder(&out)
	enc.SetEscapeHTML(false)
	require.NoError(t, enc.Encode(m))
	return out.String()
}

// FuzzDecodeManifest: whatever decodeManifest reads, encoding/json reads
// the same.
func FuzzDecodeManifest(f *testing.F) {
	b, err := appendManifest(nil, &Manifest{Sheaf: "0.1.0", Terms: []TermHash{{Term: "a", SHA256: "b", Peak: 1900}},
		Outputs: []OutputEntry{{Name: "print", Kind: "print", Proofs: 100, Pages: []PageEntry{{Page: 1, Terms: []string{"a"}, Inputs: "c"}}}},
		Files:   []FileEntry{{Path: "print/print.pdf", Output: "print", SHA256: "d", Size: 5}}})
	require.NoError(f, err)
	f.Add(b)
	f.Add([]byte(`{"terms": null}`))
	f.Fuzz(func(t *testing.T, b []byte) {
		got, ok := decodeManifest(b)
		if !ok {
			return
		}
		want, jsonOK := decodeAsJSON(b)
		require.True(t, jsonOK, "read a manifest encoding/json refuses: %q", b)
		require.Equal(t, want, got)
	})
}
