package production

import (
	"bytes"
	"math"
	"reflect"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestManifestJSON: appendManifest writes what encodeJSON (encoding/json,
// the reference) writes for the same manifest, byte for byte: every field
// set (fill gives each its own value, so a field added to a manifest type
// and left out of appendManifest fails here), fields left empty or nil
// (omitempty, null and []), and strings and numbers encoding/json
// escapes or formats its own way.
func TestManifestJSON(t *testing.T) {
	full := func() *Manifest {
		var m Manifest
		seed := 0
		fill(reflect.ValueOf(&m).Elem(), &seed)
		return &m
	}
	cases := map[string]*Manifest{
		"every field":  full(),
		"zero":         {},
		"empty slices": {Data: []FileHash{}, Fonts: []FontHash{}, Terms: []TermHash{}, Outputs: []OutputEntry{}, Inserts: []InsertEntry{}, Files: []FileEntry{}},
	}
	m := full()
	// One term a character encoding/json escapes (or, with HTML escaping
	// off, leaves alone), each in otherwise plain text.
	for _, c := range []string{`"`, `\`, "\t", "\n", "\x01", "\x1f", "\x7f", "<", ">", "&", "é", "日本", "\u2028", "\u2029", "\xff", "a\xc3"} {
		m.Terms = append(m.Terms, TermHash{Term: "term " + c + " end", Peak: -3})
	}
	m.Outputs[0].Proofs = 1e21 // encoding/json switches to an exponent here
	m.Outputs = append(m.Outputs, OutputEntry{Name: "web", Kind: "screen", Proofs: 0.000001, Pages: []PageEntry{}},
		OutputEntry{Name: "none"}, OutputEntry{Proofs: 150, Pages: []PageEntry{{Terms: []string{}}, {}}})
	m.Files = append(m.Files, FileEntry{Path: "a", Terms: []string{}, Pages: []PageEntry{}}, FileEntry{Size: -1})
	m.Inserts = append(m.Inserts, InsertEntry{}, InsertEntry{Terms: []TermHash{}})
	cases["edges"] = m
	for name, m := range cases {
		var want bytes.Buffer
		require.NoError(t, encodeJSON(&want, m), name)
		got, err := appendManifest(nil, m)
		require.NoError(t, err, name)
		assert.Equal(t, want.String(), string(got), name)
	}
	bad := full()
	bad.Outputs[0].Proofs = math.NaN()
	_, err := appendManifest(nil, bad)
	assert.Error(t, err, "NaN fails, as in encoding/json")
}
