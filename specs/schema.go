package specs

import (
	"bytes"
	"encoding/json"
	"sort"
	"strings"

	"gopkg.in/yaml.v3"
)

// SchemaID is where the spec's JSON Schema lives in this repository.
const SchemaID = "https://sheaf.invalid/specs/sheaf.schema.json"

// Schema returns the JSON Schema (draft 2020-12) of a spec. It is not
// written by hand: the loader runs in a describing mode in which every
// mapping reports its key table (the same []field the loader decodes
// with) and every value decoder its type, so a key added to the loader
// is in the schema. It checks structure — keys, nesting, types, choices,
// required keys; the loader checks the rest (ranges between keys, data,
// fonts).
func Schema() []byte {
	ds := &describer{}
	d := &decoder{file: "schema", pos: map[string]Pos{}, desc: ds}
	root := &jnode{}
	ds.cur = root
	d.spec(&yaml.Node{Kind: yaml.MappingNode}, &Spec{})
	s := root.schema()
	s["$schema"] = "https://json-schema.org/draft/2020-12/schema"
	s["$defs"] = schemaDefs
	s["$id"] = SchemaID
	s["title"] = "sheaf page spec"
	s["description"] = "A YAML page spec for sheaf: data, terms, scale, palette, outputs, inserts, preflight. Generated from the loader's key tables (sheaf schema)."
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		panic("specs: the schema does not encode: " + err.Error()) // only maps, slices, strings and numbers
	}
	return b.Bytes()
}

// SchemaKeys lists every key path the loader accepts, sorted: nested keys
// joined with ".", "*" for a name the user chooses (an output, an
// insert) and "[]" for the items of a list.
func SchemaKeys() []string {
	ds := &describer{}
	d := &decoder{file: "schema", pos: map[string]Pos{}, desc: ds}
	root := &jnode{}
	ds.cur = root
	d.spec(&yaml.Node{Kind: yaml.MappingNode}, &Spec{})
	var keys []string
	root.keys("", &keys)
	sort.Strings(keys)
	return keys
}

// The probes a describing decoder hands every key's decoder: a scalar, a
// mapping of one name to a value, and a list of one item, so that each
// shape the decoder accepts is recorded. A value recorded for valueProbe
// describes the values of a mapping of names; for itemProbe, the items of
// a list.
var (
	valueProbe    = &yaml.Node{Kind: yaml.MappingNode}
	itemProbe     = &yaml.Node{Kind: yaml.MappingNode}
	scalarProbe   = &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str"}
	mappingProbe  = &yaml.Node{Kind: yaml.MappingNode, Content: []*yaml.Node{{Kind: yaml.ScalarNode, Tag: "!!str", Value: "NAME"}, valueProbe}}
	sequenceProbe = &yaml.Node{Kind: yaml.SequenceNode, Content: []*yaml.Node{itemProbe}}
)

// describer collects a schema while the loader describes itself.
type describer struct{ cur *jnode }

// jnode is the schema of one value: the shapes recorded for it, and for
// a list its items, for a mapping of names its values.
type jnode struct {
	alts   []any // map[string]any or *jobject
	items  *jnode
	values *jnode
}

type jobject struct {
	props    []jprop
	required []string
}

type jprop struct {
	name string
	node *jnode
}

// record adds a shape for node n: to the current value, or to its items
// or values when n is a probe for those.
func (ds *describer) record(n *yaml.Node, shape any) {
	target := ds.cur
	switch n {
	case itemProbe:
		if target.items == nil {
			target.items = &jnode{}
		}
		target = target.items
	case valueProbe:
		if target.values == nil {
			target.values = &jnode{}
		}
		target = target.values
	}
	for _, a := range target.alts {
		if sameShape(a, shape) {
			return
		}
	}
	target.alts = append(target.alts, shape)
}

func sameShape(a, b any) bool {
	x, _ := json.Marshal(toJSON(a))
	y, _ := json.Marshal(toJSON(b))
	return bytes.Equal(x, y)
}

// mapping describes a mapping: each field's decoder is run on every probe
// with its own node as the current value.
func (ds *describer) mapping(n *yaml.Node, fields []field, required []string) {
	obj := &jobject{required: required}
	for _, f := range fields {
		child := &jnode{}
		saved := ds.cur
		ds.cur = child
		for _, probe := range []*yaml.Node{scalarProbe, mappingProbe, sequenceProbe} {
			f.set(probe, f.name)
		}
		ds.cur = saved
		obj.props = append(obj.props, jprop{f.name, child})
	}
	ds.record(n, obj)
}

func (n *jnode) schema() map[string]any {
	var alts []any
	for _, a := range n.alts {
		alts = append(alts, toJSON(a))
	}
	if n.items != nil {
		alts = append(alts, map[string]any{"type": "array", "items": n.items.schema()})
	}
	if n.values != nil {
		alts = append(alts, map[string]any{"type": "object", "additionalProperties": n.values.schema()})
	}
	switch len(alts) {
	case 0:
		return map[string]any{}
	case 1:
		return alts[0].(map[string]any)
	}
	return map[string]any{"anyOf": alts}
}

func toJSON(a any) any {
	o, ok := a.(*jobject)
	if !ok {
		return a
	}
	props := map[string]any{}
	for _, p := range o.props {
		props[p.name] = p.node.schema()
	}
	s := map[string]any{"type": "object", "properties": props, "additionalProperties": false}
	if len(o.required) > 0 {
		s["required"] = o.required
	}
	return s
}

func (n *jnode) keys(prefix string, out *[]string) {
	join := func(k string) string {
		if prefix == "" {
			return k
		}
		return prefix + "." + k
	}
	for _, a := range n.alts {
		if o, ok := a.(*jobject); ok {
			for _, p := range o.props {
				k := join(p.name)
				if !contains(*out, k) {
					*out = append(*out, k)
				}
				p.node.keys(k, out)
			}
		}
	}
	if n.items != nil {
		n.items.keys(strings.TrimSuffix(prefix, ".")+"[]", out)
	}
	if n.values != nil {
		n.values.keys(join("*"), out)
	}
}

func contains(xs []string, x string) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}

// Shapes of the value decoders, for the schema; the longer ones are
// defined once under $defs.
var (
	schemaString  = map[string]any{"type": "string"}
	schemaBool    = map[string]any{"$ref": "#/$defs/bool"}
	schemaLength  = map[string]any{"$ref": "#/$defs/length"}
	schemaStrings = map[string]any{"$ref": "#/$defs/strings"}
)

var schemaDefs = map[string]any{
	// The loader takes YAML 1.1's words for booleans too.
	"bool": map[string]any{"anyOf": []any{
		map[string]any{"type": "boolean"},
		map[string]any{"enum": []any{"true", "false", "yes", "no", "on", "off", "True", "False", "Yes", "No", "On", "Off", "TRUE", "FALSE", "YES", "NO", "ON", "OFF"}},
	}},
	// A number with a unit (ParseLength); a bare 0 where no unit is
	// needed (key-every).
	"length": map[string]any{
		"description": "a length with a unit: mm, cm, in, pt, pc or px, like 3mm",
		"anyOf": []any{
			map[string]any{"type": "string", "pattern": `^\s*[-+]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][-+]?[0-9]+)?\s*([mM][mM]|[cC][mM]|[iI][nN]|[pP][tTcCxX])\s*$`},
			map[string]any{"const": 0},
		}},
	// A list of strings, or one string.
	"strings": map[string]any{"anyOf": []any{
		map[string]any{"type": []any{"string", "number"}},
		map[string]any{"type": "array", "items": map[string]any{"type": []any{"string", "number"}}},
	}},
}

func schemaInteger(lo, hi int) map[string]any {
	return map[string]any{"type": "integer", "minimum": lo, "maximum": hi}
}

func schemaNumber(lo, hi float64, loOpen bool) map[string]any {
	s := map[string]any{"type": "number", "maximum": hi}
	if loOpen {
		s["exclusiveMinimum"] = lo
	} else {
		s["minimum"] = lo
	}
	return s
}

func schemaChoice(options []string) map[string]any {
	e := make([]any, len(options))
	for i, o := range options {
		e[i] = o
	}
	return map[string]any{"type": "string", "enum": e}
}
