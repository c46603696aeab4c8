package production

import (
	"bytes"
	"strconv"
	"unicode/utf8"
)

// decodeManifest reads a manifest as sheaf writes it, without
// reflection: a rebuild of the 4,000-term catalog reads an 850 KB
// manifest, which encoding/json scans once to check and again to
// decode. It gives up (false) at anything it is not sure to read as
// json.Unmarshal would — an escape in a string, a key it does not know
// or knows in other letter case, a null where no list is, a number not
// written as sheaf writes one, bytes after the end — and the caller then
// asks encoding/json, which decides, with its own errors.
// TestDecodeManifest holds the two to the same result.
func decodeManifest(b []byte) (*Manifest, bool) {
	r := &jsonReader{b: b}
	m := &Manifest{}
	ok := r.object(func(key []byte) bool {
		switch string(key) {
		case "sheaf":
			return r.str(&m.Sheaf)
		case "spec":
			return r.fileHash(&m.Spec)
		case "data":
			return list(r, &m.Data, r.fileHash)
		case "fonts":
			return list(r, &m.Fonts, r.fontHash)
		case "terms":
			return list(r, &m.Terms, r.termHash)
		case "outputs":
			return list(r, &m.Outputs, r.outputEntry)
		case "inserts":
			return list(r, &m.Inserts, r.insertEntry)
		case "files":
			return list(r, &m.Files, r.fileEntry)
		case "findings":
			return r.str(&m.Findings)
		}
		return false
	})
	r.space()
	if !ok || r.i != len(r.b) {
		return nil, false
	}
	return m, true
}

// jsonReader reads the JSON sheaf writes; every method reports false
// where it is unsure, and the reading stops there.
type jsonReader struct {
	b []byte
	i int
}

func (r *jsonReader) space() {
	for r.i < len(r.b) {
		switch r.b[r.i] {
		case ' ', '\t', '\n', '\r':
			r.i++
		default:
			return
		}
	}
}

// next skips space and reports whether the next byte is c, taking it.
func (r *jsonReader) next(c byte) bool {
	r.space()
	if r.i < len(r.b) && r.b[r.i] == c {
		r.i++
		return true
	}
	return false
}

// null takes a null.
func (r *jsonReader) null() bool {
	r.space()
	if len(r.b)-r.i >= 4 && string(r.b[r.i:r.i+4]) == "null" {
		r.i += 4
		return true
	}
	return false
}

// object reads {…}, handing each key to member, which reads its value.
func (r *jsonReader) object(member func(key []byte) bool) bool {
	if !r.next('{') {
		return false
	}
	if r.next('}') {
		return true
	}
	var seen [16][]byte // encoding/json merges a key given twice: not ours to copy
	n := 0
	for {
		key, ok := r.raw()
		if !ok || n == len(seen) {
			return false
		}
		for _, k := range seen[:n] {
			if bytes.Equal(k, key) {
				return false
			}
		}
		seen[n] = key
		n++
		if !r.next(':') || !member(key) {
			return false
		}
		if r.next('}') {
			return true
		}
		if !r.next(',') {
			return false
		}
	}
}

// list reads a JSON array into *out (null leaves it nil, as
// encoding/json does), each element by elem.
func list[T any](r *jsonReader, out *[]T, elem func(*T) bool) bool {
	if r.null() {
		*out = nil
		return true
	}
	if !r.next('[') {
		return false
	}
	s := []T{}
	if r.next(']') {
		*out = s
		return true
	}
	for {
		var zero T
		s = append(s, zero)
		if !elem(&s[len(s)-1]) {
			return false
		}
		if r.next(']') {
			*out = s
			return true
		}
		if !r.next(',') {
			return false
		}
	}
}

// str reads a string with nothing escaped in it, of valid UTF-8.
func (r *jsonReader) str(out *string) bool {
	b, ok := r.raw()
	if ok {
		*out = string(b)
	}
	return ok
}

// raw reads a string as str does, giving its bytes in the input.
func (r *jsonReader) raw() ([]byte, bool) {
	if !r.next('"') {
		return nil, false
	}
	start, ascii := r.i, true
	for r.i < len(r.b) {
		c := r.b[r.i]
		switch {
		case c == '"':
			s := r.b[start:r.i]
			if !ascii && !utf8.Valid(s) {
				return nil, false // encoding/json replaces bad bytes
			}
			r.i++
			return s, true
		case c == '\\' || c < 0x20:
			return nil, false
		case c >= utf8.RuneSelf:
			ascii = false
		}
		r.i++
	}
	return nil, false
}

// number takes a JSON number as sheaf writes one: -?(0|[1-9][0-9]*),
// then a fraction and an exponent only when frac.
func (r *jsonReader) number(frac bool) ([]byte, bool) {
	r.space()
	start := r.i
	if r.i < len(r.b) && r.b[r.i] == '-' {
		r.i++
	}
	digits := func() int {
		n := 0
		for r.i < len(r.b) && r.b[r.i] >= '0' && r.b[r.i] <= '9' {
			r.i++
			n++
		}
		return n
	}
	first := r.i
	if n := digits(); n == 0 || n > 1 && r.b[first] == '0' {
		return nil, false
	}
	if frac {
		if r.i < len(r.b) && r.b[r.i] == '.' {
			r.i++
			if digits() == 0 {
				return nil, false
			}
		}
		if r.i < len(r.b) && (r.b[r.i] == 'e' || r.b[r.i] == 'E') {
			r.i++
			if r.i < len(r.b) && (r.b[r.i] == '+' || r.b[r.i] == '-') {
				r.i++
			}
			if digits() == 0 {
				return nil, false
			}
		}
	}
	return r.b[start:r.i], true // a fraction after an integer is a syntax error to the caller
}

func (r *jsonReader) int(out *int) bool {
	var v int64
	ok := r.int64(&v)
	*out = int(v)
	return ok && int64(int(v)) == v
}

// int64 reads an integer of at most 18 digits, which cannot overflow;
// a longer one is left to encoding/json.
func (r *jsonReader) int64(out *int64) bool {
	s, ok := r.number(false)
	if !ok {
		return false
	}
	neg := s[0] == '-'
	if neg {
		s = s[1:]
	}
	if len(s) > 18 {
		return false
	}
	var v int64
	for _, c := range s {
		v = v*10 + int64(c-'0')
	}
	if neg {
		v = -v
	}
	*out = v
	return true
}

func (r *jsonReader) float(out *float64) bool {
	s, ok := r.number(true)
	if !ok {
		return false
	}
	v, err := strconv.ParseFloat(string(s), 64)
	*out = v
	return err == nil
}

func (r *jsonReader) fileHash(f *FileHash) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "path":
			return r.str(&f.Path)
		case "sha256":
			return r.str(&f.SHA256)
		}
		return false
	})
}

func (r *jsonReader) fontHash(f *FontHash) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "output":
			return r.str(&f.Output)
		case "style":
			return r.str(&f.Style)
		case "name":
			return r.str(&f.Name)
		case "path":
			return r.str(&f.Path)
		case "sha256":
			return r.str(&f.SHA256)
		}
		return false
	})
}

func (r *jsonReader) termHash(t *TermHash) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "term":
			return r.str(&t.Term)
		case "sha256":
			return r.str(&t.SHA256)
		case "peak":
			return r.int(&t.Peak)
		}
		return false
	})
}

func (r *jsonReader) pageEntry(p *PageEntry) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "page":
			return r.int(&p.Page)
		case "terms":
			return list(r, &p.Terms, r.str)
		case "inputs":
			return r.str(&p.Inputs)
		}
		return false
	})
}

func (r *jsonReader) outputEntry(o *OutputEntry) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "name":
			return r.str(&o.Name)
		case "kind":
			return r.str(&o.Kind)
		case "proof_dpi":
			return r.float(&o.Proofs)
		case "inputs":
			return r.str(&o.Inputs)
		case "pages":
			return list(r, &o.Pages, r.pageEntry)
		}
		return false
	})
}

func (r *jsonReader) insertEntry(e *InsertEntry) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "name":
			return r.str(&e.Name)
		case "output":
			return r.str(&e.Output)
		case "terms":
			return list(r, &e.Terms, r.termHash)
		case "inputs":
			return r.str(&e.Inputs)
		}
		return false
	})
}

func (r *jsonReader) fileEntry(f *FileEntry) bool {
	return r.object(func(key []byte) bool {
		switch string(key) {
		case "path":
			return r.str(&f.Path)
		case "output":
			return r.str(&f.Output)
		case "sha256":
			return r.str(&f.SHA256)
		case "size":
			return r.int64(&f.Size)
		case "insert":
			return r.str(&f.Insert)
		case "terms":
			return list(r, &f.Terms, r.str)
		case "pages":
			return list(r, &f.Pages, r.pageEntry)
		}
		return false
	})
}
