package specs

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/santhosh-tekuri/jsonschema/v6"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gopkg.in/yaml.v3"
)

// TestSchemaFileIsGenerated: specs/sheaf.schema.json, which YAML editors
// point at, is exactly what `sheaf schema` prints (regenerate with
// `go run ./cmd/sheaf schema > specs/sheaf.schema.json`).
func TestSchemaFileIsGenerated(t *testing.T) {
	file, err := os.ReadFile("sheaf.schema.json")
	require.NoError(t, err)
	assert.Equal(t, string(Schema()), string(file), "specs/sheaf.schema.json is out of date: go run ./cmd/sheaf schema > specs/sheaf.schema.json")
}

// schemaProps walks a schema's objects and lists every property path, as
// SchemaKeys writes them.
func schemaProps(s map[string]any, prefix string, out map[string]bool) {
	join := func(k string) string {
		if prefix == "" {
			return k
		}
		return prefix + "." + k
	}
	if props, ok := s["properties"].(map[string]any); ok {
		for k, v := range props {
			out[join(k)] = true
			schemaProps(v.(map[string]any), join(k), out)
		}
	}
	if items, ok := s["items"].(map[string]any); ok {
		schemaProps(items, prefix+"[]", out)
	}
	if values, ok := s["additionalProperties"].(map[string]any); ok {
		schemaProps(values, join("*"), out)
	}
	if alts, ok := s["anyOf"].([]any); ok {
		for _, a := range alts {
			schemaProps(a.(map[string]any), prefix, out)
		}
	}
}

// yamlAt writes a spec fragment that sets the key at path (as SchemaKeys
// writes paths) to value.
func yamlAt(path, value string) string {
	var b strings.Builder
	indent := ""
	parts := strings.Split(path, ".")
	for i, p := range parts {
		list := strings.HasSuffix(p, "[]")
		p = strings.TrimSuffix(p, "[]")
		if p == "*" {
			p = "x"
		}
		if i == len(parts)-1 {
			b.WriteString(indent + p + ": " + value + "\n")
			break
		}
		b.WriteString(indent + p + ":\n")
		indent += "  "
		if list {
			b.WriteString(indent + "-\n")
			indent += "  "
		}
	}
	return b.String()
}

// TestSchemaKeysBothWays: every key the loader accepts is a property of
// the schema file, and every property of the schema file is a key the
// loader accepts: each is put in a spec and the loader does not call it
// unknown; a key beside it that is no key is refused by both.
func TestSchemaKeysBothWays(t *testing.T) {
	var s map[string]any
	require.NoError(t, json.Unmarshal(Schema(), &s))
	props := map[string]bool{}
	schemaProps(s, "", props)
	loader := SchemaKeys()
	var inSchema []string
	for k := range props {
		inSchema = append(inSchema, k)
	}
	sort.Strings(inSchema)
	assert.Equal(t, loader, inSchema, "the loader's keys and the schema's properties")
	assert.Greater(t, len(loader), 80, "the spec has some ninety keys (README's tables)")

	sch := compile(t)
	for _, k := range loader {
		_, err := Parse("keys.yaml", []byte(yamlAt(k, "1")))
		require.Error(t, err, k) // data, years and outputs are missing at least
		assert.NotContains(t, err.Error(), "unknown key", "the loader refuses %s, which the schema has", k)

		bogus := k[:strings.LastIndex(k, ".")+1] + "no-such-key"
		_, err = Parse("keys.yaml", []byte(yamlAt(bogus, "1")))
		require.Error(t, err, bogus)
		assert.Contains(t, err.Error(), "unknown key", "the loader takes %s", bogus)
		assert.Error(t, sch.Validate(fromYAML(t, []byte(yamlAt(bogus, "1")))), "the schema takes %s", bogus)
	}
}

// compile loads the schema file with a general-purpose validator
// (github.com/santhosh-tekuri/jsonschema/v6, draft 2020-12).
func compile(t *testing.T) *jsonschema.Schema {
	t.Helper()
	f, err := os.Open("sheaf.schema.json")
	require.NoError(t, err)
	defer f.Close()
	doc, err := jsonschema.UnmarshalJSON(f)
	require.NoError(t, err)
	c := jsonschema.NewCompiler()
	c.DefaultDraft(jsonschema.Draft2020)
	require.NoError(t, c.AddResource(SchemaID, doc))
	sch, err := c.Compile(SchemaID)
	require.NoError(t, err)
	return sch
}

// fromYAML reads YAML as an editor's language server does and hands it
// to the validator as JSON values (a YAML date is its text).
func fromYAML(t *testing.T, data []byte) any {
	t.Helper()
	var v any
	require.NoError(t, yaml.Unmarshal(data, &v))
	var fix func(any) any
	fix = func(v any) any {
		switch x := v.(type) {
		case map[string]any:
			for k, e := range x {
				x[k] = fix(e)
			}
		case []any:
			for i, e := range x {
				x[i] = fix(e)
			}
		case time.Time:
			return x.Format("2006-01-02")
		}
		return v
	}
	b, err := json.Marshal(fix(v))
	require.NoError(t, err)
	j, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	require.NoError(t, err)
	return j
}

// TestSpecsValidate: the demo spec and every spec in testdata that the
// loader takes validate against the schema; every bad spec whose fault is
// its structure (an unknown key, a value of the wrong type or shape, a
// choice or range outside the loader's, nothing at all) fails; bad specs
// whose fault is beyond structure (values that contradict each other,
// data and fonts) are the loader's to refuse and validate.
func TestSpecsValidate(t *testing.T) {
	sch := compile(t)
	tests := []struct {
		file  string
		valid bool
	}{
		{"../examples/quillmere/feature.yaml", true},
		{"../testdata/small/spec.yaml", true},
		{"../testdata/bad/unknown-key.yaml", false}, // colums, trimm
		{"../testdata/bad/types.yaml", false},       // a mapping for a list, words for numbers, a list for a bool
		{"../testdata/bad/unit.yaml", false},        // 2ems, a bare 3
		{"../testdata/bad/columns.yaml", false},     // 0 columns, below the minimum
		{"../testdata/bad/empty.yaml", false},       // no mapping at all
		{"../testdata/bad/lengths.yaml", true},      // -3mm is a length; its sign is the loader's to refuse
		{"../testdata/bad/margins.yaml", true},      // margins too large for the page: the layout says so
		{"../testdata/bad/no-data.yaml", true},      // a missing data file
		{"../testdata/bad/missing-term.yaml", true}, // a term the data lacks
		{"../testdata/bad/bad-rows.yaml", true},     // bad rows in the data
		{"../testdata/bad/one-column.yaml", true},   // a data table with one column
	}
	seen := map[string]bool{}
	for _, tt := range tests {
		seen[filepath.Clean(tt.file)] = true
		data, err := os.ReadFile(tt.file)
		require.NoError(t, err)
		err = sch.Validate(fromYAML(t, data))
		if tt.valid {
			assert.NoError(t, err, tt.file)
		} else {
			assert.Error(t, err, tt.file)
		}
	}
	// Every spec of testdata is in the table, but those YAML cannot read.
	all, err := filepath.Glob("../testdata/*/*.yaml")
	require.NoError(t, err)
	for _, f := range all {
		switch filepath.Base(f) {
		case "syntax.yaml", "tab.yaml", "alias-bomb.yaml": // YAML errors: no value to validate
			continue
		}
		assert.True(t, seen[filepath.Clean(f)], "%s is not in the table", f)
	}
}
