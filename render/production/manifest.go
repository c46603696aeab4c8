package production

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"hash"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"sync"

	"sheaf/layout/fonts"
	"sheaf/specs/series"
)

// Names of the files every build writes into its folder, beside the
// outputs' folders.
const (
	ManifestFile = "manifest.json"
	ChangesJSON  = "changes.json"
	ChangesText  = "changes.txt"
	CacheDir     = ".cache" // encoded pages: .cache/OUTPUT/HASH.page
)

// Manifest is DIR/manifest.json: what went into a build and what came
// out, with enough hashes to tell the next build what changed. README
// documents it.
type Manifest struct {
	Sheaf   string        `json:"sheaf"` // sheaf version
	Spec    FileHash      `json:"spec"`
	Data    []FileHash    `json:"data"`
	Fonts   []FontHash    `json:"fonts"`
	Terms   []TermHash    `json:"terms"` // every selected term, sorted by term
	Outputs []OutputEntry `json:"outputs"`
	Inserts []InsertEntry `json:"inserts,omitempty"` // in the spec's order
	Files   []FileEntry   `json:"files"`             // every file of every output and insert, sorted by path
	// Findings hashes preflight's findings, so the next build can say
	// "as before" instead of printing the same table again.
	Findings string `json:"findings,omitempty"`
}

// FileHash is a file that went into a build, with its SHA-256.
type FileHash struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
}

// FontHash is one font of an output, with the SHA-256 of its bytes.
type FontHash struct {
	Output string `json:"output"`
	Style  string `json:"style"`
	Name   string `json:"name"`
	Path   string `json:"path"` // "" for the Go fonts built into sheaf
	SHA256 string `json:"sha256"`
}

// TermHash is a term's data: its yearly counts and plotted values.
type TermHash struct {
	Term   string `json:"term"`
	SHA256 string `json:"sha256"`
	// Peak is the term's peak year, for the change report ("its peak
	// moved 1905 → 1880"); 0 where not recorded (an insert's terms).
	Peak int `json:"peak,omitempty"`
}

// OutputEntry is one output of a build: its pages, and for a screen
// output the hash of its inputs.
type OutputEntry struct {
	Name   string  `json:"name"`
	Kind   string  `json:"kind"`
	Proofs float64 `json:"proof_dpi,omitempty"` // 0: no proofs were made
	// Inputs, for a screen output, hashes everything that decides its
	// files (see screenInputs): equal hashes and intact files mean the
	// next build carries the files over instead of drawing them.
	Inputs string      `json:"inputs,omitempty"`
	Pages  []PageEntry `json:"pages"`
}

// InsertEntry is one insert: the output it borrows, its terms with the
// hash of their data, and the hash of everything that decides its files
// (see insertInputs).
type InsertEntry struct {
	Name   string     `json:"name"`
	Output string     `json:"output"`
	Terms  []TermHash `json:"terms"` // in the insert's order
	Inputs string     `json:"inputs"`
}

// PageEntry is one page: the terms on it and the hash of everything that
// decides its drawing (see pageInputs).
type PageEntry struct {
	Page   int      `json:"page"` // from 1
	Terms  []string `json:"terms"`
	Inputs string   `json:"inputs"`
}

// FileEntry is one file of a build: its hash and size, and what it shows.
type FileEntry struct {
	Path   string      `json:"path"` // relative to DIR, with forward slashes
	Output string      `json:"output,omitempty"`
	SHA256 string      `json:"sha256"`
	Size   int64       `json:"size"`
	Insert string      `json:"insert,omitempty"` // the insert the file shows
	Terms  []string    `json:"terms,omitempty"`  // an insert's terms, or a panel file's term
	Pages  []PageEntry `json:"pages,omitempty"`  // the PDF's pages, or the page(s) a proof, PNG or SVG shows
}

// ReadManifest reads DIR/manifest.json. No file is not an error: it
// returns nil, nil.
func ReadManifest(dir string) (*Manifest, error) {
	b, err := os.ReadFile(filepath.Join(dir, ManifestFile))
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, fmt.Errorf("%s: %v", filepath.Join(dir, ManifestFile), err)
	}
	return &m, nil
}

// encodeJSON is json with two-space indent, HTML characters left alone.
func encodeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}

// Output returns the output named name, or nil (also for a nil manifest).
func (m *Manifest) Output(name string) *OutputEntry {
	if m == nil {
		return nil
	}
	for i := range m.Outputs {
		if m.Outputs[i].Name == name {
			return &m.Outputs[i]
		}
	}
	return nil
}

// Insert returns the insert named name, or nil.
func (m *Manifest) Insert(name string) *InsertEntry {
	if m == nil {
		return nil
	}
	for i := range m.Inserts {
		if m.Inserts[i].Name == name {
			return &m.Inserts[i]
		}
	}
	return nil
}

// FilesOf lists the files of output (insert == "") or of an insert.
func (m *Manifest) FilesOf(output, insert string) []*FileEntry {
	if m == nil {
		return nil
	}
	var out []*FileEntry
	for i := range m.Files {
		f := &m.Files[i]
		if insert != "" && f.Insert == insert || insert == "" && f.Output == output && output != "" {
			out = append(out, f)
		}
	}
	return out
}

// File returns the file at path (relative to the build folder, with
// forward slashes), or nil.
func (m *Manifest) File(path string) *FileEntry {
	if m == nil {
		return nil
	}
	i := sort.Search(len(m.Files), func(i int) bool { return m.Files[i].Path >= path })
	if i < len(m.Files) && m.Files[i].Path == path {
		return &m.Files[i]
	}
	for i := range m.Files { // a hand-edited manifest may be unsorted
		if m.Files[i].Path == path {
			return &m.Files[i]
		}
	}
	return nil
}

func hexSum(h hash.Hash) string { return hex.EncodeToString(h.Sum(nil)) }

func sumBytes(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

// sumFile returns the SHA-256 and size of a file.
func sumFile(path string) (string, int64, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", 0, err
	}
	defer f.Close()
	h := sha256.New()
	n, err := io.Copy(h, f)
	if err != nil {
		return "", 0, fmt.Errorf("reading %s: %w", path, err)
	}
	return hexSum(h), n, nil
}

// hasher writes values into a SHA-256 unambiguously: strings with their
// length, floats by their bits.
type hasher struct {
	h   hash.Hash
	buf []byte // floats' bytes, reused
}

func newHasher(kind string) *hasher {
	h := &hasher{h: sha256.New()}
	h.str(kind)
	return h
}

// reset starts a new hash of kind, keeping the buffers.
func (h *hasher) reset(kind string) {
	h.h.Reset()
	h.str(kind)
}

func (h *hasher) str(s string) {
	h.int(len(s))
	io.WriteString(h.h, s)
}

// bytes is str without a string's copy: the same bytes hashed.
func (h *hasher) bytes(b []byte) {
	h.int(len(b))
	h.h.Write(b)
}

func (h *hasher) int(n int) {
	var b [8]byte
	binary.LittleEndian.PutUint64(b[:], uint64(n))
	h.h.Write(b[:])
}

func (h *hasher) float(v float64) {
	var b [8]byte
	binary.LittleEndian.PutUint64(b[:], math.Float64bits(v))
	h.h.Write(b[:])
}

func (h *hasher) floats(vs []float64) {
	h.int(len(vs))
	if cap(h.buf) < 8*len(vs) {
		h.buf = make([]byte, 8*len(vs)) // at once, not grown by appending
	}
	b := h.buf[:8*len(vs)]
	for i, v := range vs {
		binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(v))
	}
	h.h.Write(b)
}

func (h *hasher) sum() string { return hexSum(h.h) }

// value hashes v depth first: numbers by their bits, strings and slices
// with their lengths, a pointer's nil-ness before what it points to, and
// of a struct its exported fields in declaration order, without those
// encoding/json leaves out (tagged "-"). It is what hashing v's JSON
// was, a page's layout in full, without formatting every float as text
// first. Kinds with no fixed order (maps, interfaces) are hashed as
// their JSON.
func (h *hasher) value(v reflect.Value) {
	switch v.Kind() {
	case reflect.Bool:
		if v.Bool() {
			h.int(1)
		} else {
			h.int(0)
		}
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		h.int(int(v.Int()))
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		h.int(int(v.Uint()))
	case reflect.Float32, reflect.Float64:
		h.float(v.Float())
	case reflect.String:
		h.str(v.String())
	case reflect.Slice:
		if v.IsNil() {
			h.int(-1)
			return
		}
		fallthrough
	case reflect.Array:
		h.int(v.Len())
		for i := range v.Len() {
			h.value(v.Index(i))
		}
	case reflect.Pointer:
		if v.IsNil() {
			h.int(0)
			return
		}
		h.int(1)
		h.value(v.Elem())
	case reflect.Struct:
		for _, i := range hashedFields(v.Type()) {
			h.value(v.Field(i))
		}
	default:
		b, err := json.Marshal(v.Interface())
		if err != nil {
			b = []byte(err.Error())
		}
		h.bytes(b)
	}
}

// structFields caches hashedFields by type.
var structFields sync.Map // reflect.Type → []int

// hashedFields lists the indexes of t's exported fields that
// encoding/json would write.
func hashedFields(t reflect.Type) []int {
	if f, ok := structFields.Load(t); ok {
		return f.([]int)
	}
	var out []int
	for i := range t.NumField() {
		f := t.Field(i)
		// An embedded struct's fields are written as its parent's.
		embedded := f.Anonymous && (f.Type.Kind() == reflect.Struct || f.Type.Kind() == reflect.Pointer && f.Type.Elem().Kind() == reflect.Struct)
		if (f.IsExported() || embedded) && f.Tag.Get("json") != "-" {
			out = append(out, i)
		}
	}
	structFields.Store(t, out)
	return out
}

// termSum is the hash of a term's data as drawn: counts and plotted
// values, year by year.
func termSum(sr *series.Series) string {
	return termSumWith(newHasher(termKind), sr)
}

const termKind = "sheaf term v1"

func termSumWith(h *hasher, sr *series.Series) string {
	h.reset(termKind)
	h.str(sr.Term)
	h.floats(sr.Counts)
	h.floats(sr.Values)
	return h.sum()
}

// termHashes hashes every term, sorted by term. Cancelled, it returns
// what it has (the build is stopping).
func termHashes(ctx context.Context, d *series.Set) []TermHash {
	ts := termHashesInOrder(ctx, d)
	sort.Slice(ts, func(i, j int) bool { return ts[i].Term < ts[j].Term })
	return ts
}

// termHashesInOrder is termHashes in the data's order of series, on one
// goroutine: it runs beside the build's one busy goroutine (layout,
// preflight), on the core that one leaves idle, and ten thousand terms
// of two hundred years are a few megabytes of SHA-256, done long before
// the pages want them.
func termHashesInOrder(ctx context.Context, d *series.Set) []TermHash {
	ts := make([]TermHash, len(d.Series))
	h := newHasher(termKind) // one hasher and buffer for all: one a term was megabytes of fresh memory
	for i := range ts {
		if i%256 == 0 && ctx.Err() != nil {
			return ts
		}
		ts[i] = TermHash{Term: d.Series[i].Term, SHA256: termSumWith(h, &d.Series[i]), Peak: d.Series[i].PeakYear}
	}
	return ts
}

// termSet is the hashes of every selected term, taken on the other core
// from the moment the data is read (startTerms) while the layout and
// preflight run: the pages' inputs, screen outputs' and the manifest
// wait for them (get).
type termSet struct {
	done     chan struct{}
	list     []TermHash        // sorted by term, for the manifest
	byTerm   map[string]string // SHA256 by term
	bySeries []string          // SHA256 by index into the data's Series
}

func startTerms(ctx context.Context, d *series.Set) *termSet {
	t := &termSet{done: make(chan struct{})}
	go func() {
		defer close(t.done)
		inOrder := termHashesInOrder(ctx, d)
		t.bySeries = make([]string, len(inOrder))
		t.byTerm = make(map[string]string, len(inOrder))
		for i, th := range inOrder {
			t.bySeries[i] = th.SHA256
			t.byTerm[th.Term] = th.SHA256
		}
		t.list = inOrder
		sort.Slice(t.list, func(i, j int) bool { return t.list[i].Term < t.list[j].Term })
	}()
	return t
}

// get waits for the hashing and gives the set.
func (t *termSet) get() *termSet {
	<-t.done
	return t
}

// fontHashesOf lists the fonts of an output with the hash of their raw
// bytes (sums, in fontStyles' order); the built-in Go fonts too, so a
// sheaf upgrade that changes them shows.
func fontHashesOf(output string, fs *fonts.Set, sums [3]string) []FontHash {
	var out []FontHash
	for k, st := range fontStyles {
		out = append(out, FontHash{Output: output, Style: st.String(), Name: fs.Name(st), Path: fs.Path(st), SHA256: sums[k]})
	}
	return out
}

// hashFiles hashes every regular file under root/sub (a path relative to
// root) and returns entries with slash paths relative to root. Files in
// known (by slash path) were hashed as they were written.
func hashFiles(root, sub, output string, known map[string]fileSum) ([]FileEntry, error) {
	var out []FileEntry
	base := filepath.Join(root, sub)
	err := filepath.WalkDir(base, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			if errors.Is(err, fs.ErrNotExist) && p == base {
				return filepath.SkipDir
			}
			return err
		}
		if !d.Type().IsRegular() || strings.HasPrefix(d.Name(), ".") {
			return nil
		}
		rel, err := filepath.Rel(root, p)
		if err != nil {
			return err
		}
		rel = filepath.ToSlash(rel)
		fs, ok := known[rel]
		if !ok {
			if fs.sum, fs.size, err = sumFile(p); err != nil {
				return err
			}
		}
		out = append(out, FileEntry{Path: rel, Output: output, SHA256: fs.sum, Size: fs.size})
		return nil
	})
	return out, err
}

// writeJSONFile writes v as indented JSON to path, atomically.
func writeJSONFile(path string, v any) error {
	return WriteAtomic(path, func(w io.Writer) error { return encodeJSON(w, v) })
}
