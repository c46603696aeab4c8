package production

import (
	"bytes"
	"encoding/json"
	"strconv"
	"unicode/utf8"
)

// appendManifest appends m as encodeJSON writes it (two-space indent,
// HTML characters left alone, a newline at the end), byte for byte,
// without reflection: a rebuild of the 4,000-term catalog writes an
// 850 KB manifest, which encoding/json formats and then re-indents in a
// second pass. TestManifestJSON holds the two to the same bytes for every
// field (a field added to a manifest type and not here fails it).
func appendManifest(b []byte, m *Manifest) ([]byte, error) {
	w := jsonWriter{b: b}
	w.object(func() {
		w.strField("sheaf", m.Sheaf)
		w.field("spec")
		w.fileHash(m.Spec)
		w.field("data")
		w.array(m.Data == nil, len(m.Data), func(i int) { w.fileHash(m.Data[i]) })
		w.field("fonts")
		w.array(m.Fonts == nil, len(m.Fonts), func(i int) { w.fontHash(&m.Fonts[i]) })
		w.field("terms")
		w.termHashes(m.Terms)
		w.field("outputs")
		w.array(m.Outputs == nil, len(m.Outputs), func(i int) { w.outputEntry(&m.Outputs[i]) })
		if len(m.Inserts) > 0 {
			w.field("inserts")
			w.array(false, len(m.Inserts), func(i int) { w.insertEntry(&m.Inserts[i]) })
		}
		w.field("files")
		w.array(m.Files == nil, len(m.Files), func(i int) { w.fileEntry(&m.Files[i]) })
		if m.Findings != "" {
			w.strField("findings", m.Findings)
		}
	})
	if w.err != nil {
		return nil, w.err
	}
	return append(w.b, '\n'), nil
}

// jsonWriter appends indented JSON as encoding/json's Encoder with
// SetIndent("", "  ") lays it out.
type jsonWriter struct {
	b     []byte
	depth int
	first bool // no member written yet in the object or array open
	err   error
}

func (w *jsonWriter) newline() {
	w.b = append(w.b, '\n')
	for range w.depth {
		w.b = append(w.b, "  "...)
	}
}

// member starts a member of the object or array open.
func (w *jsonWriter) member() {
	if !w.first {
		w.b = append(w.b, ',')
	}
	w.first = false
	w.newline()
}

// object writes {…}, members written by body; an object with none is {}.
func (w *jsonWriter) object(body func()) {
	w.b = append(w.b, '{')
	w.depth++
	w.first = true
	body()
	w.depth--
	if !w.first {
		w.newline()
	}
	w.first = false
	w.b = append(w.b, '}')
}

// array writes n elements, each by elem; null when isNil, [] when empty.
func (w *jsonWriter) array(isNil bool, n int, elem func(i int)) {
	if isNil {
		w.b = append(w.b, "null"...)
		return
	}
	if n == 0 {
		w.b = append(w.b, "[]"...)
		return
	}
	w.b = append(w.b, '[')
	w.depth++
	for i := range n {
		if i > 0 {
			w.b = append(w.b, ',')
		}
		w.newline()
		elem(i)
	}
	w.depth--
	w.newline()
	w.b = append(w.b, ']')
}

func (w *jsonWriter) field(name string) {
	w.member()
	w.str(name)
	w.b = append(w.b, ": "...)
}

func (w *jsonWriter) str(s string) {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c == '"' || c == '\\' || c >= utf8.RuneSelf {
			w.b = appendJSONString(w.b, s)
			return
		}
	}
	w.b = append(w.b, '"')
	w.b = append(w.b, s...)
	w.b = append(w.b, '"')
}

// appendJSONString is encoding/json's own string encoding, for strings
// with anything to escape (control characters, quotes, backslashes,
// invalid UTF-8, U+2028 and U+2029).
func appendJSONString(b []byte, s string) []byte {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	enc.Encode(s) // a string always encodes
	return append(b, bytes.TrimSuffix(buf.Bytes(), []byte("\n"))...)
}

func (w *jsonWriter) int(n int64) { w.b = strconv.AppendInt(w.b, n, 10) }

// strField writes a field whose value is a string.
func (w *jsonWriter) strField(name, v string) {
	w.field(name)
	w.str(v)
}

func (w *jsonWriter) strs(ss []string) {
	w.array(ss == nil, len(ss), func(i int) { w.str(ss[i]) })
}

func (w *jsonWriter) fileHash(f FileHash) {
	w.object(func() {
		w.strField("path", f.Path)
		w.strField("sha256", f.SHA256)
	})
}

func (w *jsonWriter) fontHash(f *FontHash) {
	w.object(func() {
		w.strField("output", f.Output)
		w.strField("style", f.Style)
		w.strField("name", f.Name)
		w.strField("path", f.Path)
		w.strField("sha256", f.SHA256)
	})
}

func (w *jsonWriter) termHashes(ts []TermHash) {
	w.array(ts == nil, len(ts), func(i int) {
		t := &ts[i]
		w.object(func() {
			w.strField("term", t.Term)
			w.strField("sha256", t.SHA256)
			if t.Peak != 0 {
				w.field("peak")
				w.int(int64(t.Peak))
			}
		})
	})
}

func (w *jsonWriter) pageEntries(ps []PageEntry) {
	w.array(ps == nil, len(ps), func(i int) {
		p := &ps[i]
		w.object(func() {
			w.field("page")
			w.int(int64(p.Page))
			w.field("terms")
			w.strs(p.Terms)
			w.strField("inputs", p.Inputs)
		})
	})
}

func (w *jsonWriter) outputEntry(o *OutputEntry) {
	w.object(func() {
		w.strField("name", o.Name)
		w.strField("kind", o.Kind)
		if o.Proofs != 0 {
			w.field("proof_dpi")
			b, err := json.Marshal(o.Proofs) // encoding/json's float format, and its error for NaN
			if err != nil && w.err == nil {
				w.err = err
			}
			w.b = append(w.b, b...)
		}
		if o.Inputs != "" {
			w.strField("inputs", o.Inputs)
		}
		w.field("pages")
		w.pageEntries(o.Pages)
	})
}

func (w *jsonWriter) insertEntry(e *InsertEntry) {
	w.object(func() {
		w.strField("name", e.Name)
		w.strField("output", e.Output)
		w.field("terms")
		w.termHashes(e.Terms)
		w.strField("inputs", e.Inputs)
	})
}

func (w *jsonWriter) fileEntry(f *FileEntry) {
	w.object(func() {
		w.strField("path", f.Path)
		if f.Output != "" {
			w.strField("output", f.Output)
		}
		w.strField("sha256", f.SHA256)
		w.field("size")
		w.int(f.Size)
		if f.Insert != "" {
			w.strField("insert", f.Insert)
		}
		if len(f.Terms) > 0 {
			w.field("terms")
			w.strs(f.Terms)
		}
		if len(f.Pages) > 0 {
			w.field("pages")
			w.pageEntries(f.Pages)
		}
	})
}
