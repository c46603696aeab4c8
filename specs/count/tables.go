package count

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"unicode/utf8"

	"sheaf/specs"
)

// SpecTerms is the terms a spec names: its list, then its inserts'
// terms, each once, in that order.
func SpecTerms(s *specs.Spec) []string {
	seen := map[string]bool{}
	var terms []string
	add := func(t string) {
		if !seen[t] {
			seen[t] = true
			terms = append(terms, t)
		}
	}
	for _, t := range s.Terms.List {
		add(t)
	}
	for _, in := range s.Inserts {
		for _, t := range in.Terms {
			add(t)
		}
	}
	return terms
}

// ReadTerms reads a term list: a UTF-8 file, one term a line; blank
// lines and lines starting with # are skipped. A term listed twice, or a
// list with no term, is a *BadInput naming the line.
func ReadTerms(path string) ([]string, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, &BadInput{Path: path, Off: -1, Msg: fmt.Sprintf("cannot read: %v", err)}
	}
	var terms []string
	seen := map[string]int{}
	for i, line := range strings.Split(strings.TrimPrefix(string(data), "\ufeff"), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		if !utf8.ValidString(line) {
			return nil, &BadInput{Path: path, Line: i + 1, Off: -1, Msg: "not valid UTF-8: save the list as UTF-8"}
		}
		if j, ok := seen[line]; ok {
			return nil, &BadInput{Path: path, Line: i + 1, Off: -1, Msg: fmt.Sprintf("%q listed twice (first at line %d)", line, j)}
		}
		seen[line] = i + 1
		terms = append(terms, line)
	}
	if len(terms) == 0 {
		return nil, &BadInput{Path: path, Off: -1, Msg: "lists no terms"}
	}
	return terms, nil
}

// Archive lists an archive: a folder (files ending in ext, "" for all,
// dated by the first capture group of pattern in their path; see Folder)
// or a manifest table (see Manifest).
func Archive(path, ext, pattern string) ([]File, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, &BadInput{Path: path, Off: -1, Msg: fmt.Sprintf("cannot read: %v", errors.Unwrap(err))}
	}
	if !fi.IsDir() {
		return Manifest(path)
	}
	re, err := regexp.Compile(pattern)
	if err != nil {
		return nil, &BadInput{Path: "--year-pattern", Off: -1, Msg: err.Error()}
	}
	if ext != "" && !strings.HasPrefix(ext, ".") {
		ext = "." + ext
	}
	return Folder(path, ext, re)
}

// Within keeps the files dated in the span, in their order, and says how
// many it left out.
func Within(files []File, span specs.Span) (in []File, left int) {
	for _, f := range files {
		if f.Year >= span.From && f.Year <= span.To {
			in = append(in, f)
		}
	}
	return in, len(files) - len(in)
}

// WriteTables writes counts.csv and totals.csv into dir (made if
// missing) and returns their paths. Both are written under temporary
// names and renamed into place only when both are whole, so a failed run
// leaves the old tables as they were and no stray file; nothing else in
// dir is touched.
func WriteTables(dir string, res *Result) ([]string, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	type table struct {
		name  string
		write func(io.Writer) error
		tmp   string
	}
	tables := []*table{{name: "counts.csv", write: res.WriteCounts}, {name: "totals.csv", write: res.WriteTotals}}
	cleanup := func() {
		for _, t := range tables {
			if t.tmp != "" {
				os.Remove(t.tmp)
			}
		}
	}
	for _, t := range tables {
		f, err := os.CreateTemp(dir, "."+t.name+".*.tmp")
		if err != nil {
			cleanup()
			return nil, err
		}
		t.tmp = f.Name()
		err = t.write(f)
		if err == nil {
			err = f.Sync()
		}
		if cerr := f.Close(); err == nil {
			err = cerr
		}
		if err == nil {
			err = os.Chmod(t.tmp, 0o644)
		}
		if err != nil {
			cleanup()
			return nil, fmt.Errorf("writing %s: %v", filepath.Join(dir, t.name), err)
		}
	}
	var paths []string
	for _, t := range tables {
		p := filepath.Join(dir, t.name)
		if err := os.Rename(t.tmp, p); err != nil {
			cleanup()
			return nil, err
		}
		t.tmp = ""
		paths = append(paths, p)
	}
	return paths, nil
}
