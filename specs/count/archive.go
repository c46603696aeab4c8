package count

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"sheaf/specs"
)

// File is one text file of the archive and the year it belongs to.
type File struct {
	Year int
	Path string
	Size int64
}

// DefaultYearPattern finds the year in a file's path below the archive
// folder: the first run of exactly four digits, as in "1868/spring.txt",
// "issue-1868-04.txt" or "1868.txt".
const DefaultYearPattern = `(?:^|[^0-9])([0-9]{4})(?:[^0-9]|$)`

// BadInput is an archive or term list that cannot be counted: it names
// the file and, where there is one, the place in it.
type BadInput struct {
	Path string
	Line int   // from 1; 0 when the error is about the whole file
	Off  int64 // byte offset, -1 when none
	Msg  string
}

func (e *BadInput) Error() string {
	switch {
	case e.Off >= 0 && e.Line > 0:
		return fmt.Sprintf("%s:%d: byte %d: %s", e.Path, e.Line, e.Off, e.Msg)
	case e.Line > 0:
		return fmt.Sprintf("%s:%d: %s", e.Path, e.Line, e.Msg)
	}
	return e.Path + ": " + e.Msg
}

// BadInput marks the error as the user's input (exit status 2).
func (e *BadInput) BadInput() bool { return true }

func bad(path, format string, args ...any) *BadInput {
	return &BadInput{Path: path, Off: -1, Msg: fmt.Sprintf(format, args...)}
}

// Folder lists the text files under root: regular files whose names end
// in ext (any case; "" for every file), hidden files and folders (a name
// starting with ".") left out, each with the year that pattern finds in its
// path relative to root (slash-separated). pattern must have exactly one
// capture group, the year. A file with no year is an error naming it.
// The list is sorted by path. Errors are *BadInput marked as
// *specs.InputError.
func Folder(root, ext string, pattern *regexp.Regexp) ([]File, error) {
	files, err := folder(root, ext, pattern)
	return files, specs.BadInput(err)
}

func folder(root, ext string, pattern *regexp.Regexp) ([]File, error) {
	if pattern.NumSubexp() != 1 {
		return nil, bad("--year-pattern", "%q needs exactly one capture group (the year), not %d", pattern, pattern.NumSubexp())
	}
	var files []File
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return bad(path, "cannot read: %v", unwrapPath(err))
		}
		if path != root && strings.HasPrefix(d.Name(), ".") {
			if d.IsDir() {
				return filepath.SkipDir
			}
			return nil
		}
		if d.IsDir() || ext != "" && !strings.EqualFold(filepath.Ext(path), ext) {
			return nil
		}
		info, err := os.Stat(path) // follows a link to the file
		if err != nil {
			return bad(path, "cannot read: %v", unwrapPath(err))
		}
		if !info.Mode().IsRegular() {
			return nil
		}
		rel, _ := filepath.Rel(root, path)
		rel = filepath.ToSlash(rel)
		m := pattern.FindStringSubmatch(rel)
		if m == nil {
			return bad(path, "no year in its path %q (the year pattern is %s)", rel, pattern)
		}
		year, err := strconv.Atoi(m[1])
		if err != nil || year < 1 || year > 9999 {
			return bad(path, "%q in its path is not a year from 1 to 9999", m[1])
		}
		files = append(files, File{Year: year, Path: path, Size: info.Size()})
		return nil
	})
	if err != nil {
		var b *BadInput
		if errors.As(err, &b) {
			return nil, b
		}
		return nil, bad(root, "cannot read: %v", unwrapPath(err))
	}
	if len(files) == 0 {
		what := "*" + ext + " files"
		if ext == "" {
			what = "files"
		}
		return nil, bad(root, "the archive is empty: no %s in it", what)
	}
	slices.SortFunc(files, func(a, b File) int { return strings.Compare(a.Path, b.Path) })
	return files, nil
}

// Manifest reads a table of year,path rows (a header naming the columns
// year and path; CSV, or TSV when the name ends in .tsv or .tab). Paths
// are relative to the manifest's folder. The files are in table order.
// Errors are *BadInput marked as *specs.InputError.
func Manifest(path string) ([]File, error) {
	files, err := manifest(path)
	return files, specs.BadInput(err)
}

func manifest(path string) ([]File, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, bad(path, "cannot read: %v", unwrapPath(err))
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	r := csv.NewReader(bytes.NewReader(data))
	switch strings.ToLower(filepath.Ext(path)) {
	case ".tsv", ".tab":
		r.Comma = '\t'
	}
	r.FieldsPerRecord = -1
	head, err := r.Read()
	if err == io.EOF {
		return nil, bad(path, "the manifest is empty: it needs a header year,path and a row for each file")
	}
	if err != nil {
		return nil, csvError(path, err)
	}
	yc, pc := -1, -1
	for i, h := range head {
		switch strings.TrimSpace(strings.ToLower(h)) {
		case "year":
			yc = i
		case "path":
			pc = i
		}
	}
	if yc < 0 || pc < 0 {
		return nil, &BadInput{Path: path, Line: 1, Off: -1, Msg: fmt.Sprintf("the header needs columns year and path (it has %s)", strings.Join(head, ", "))}
	}
	dir := filepath.Dir(path)
	var files []File
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvError(path, err)
		}
		line, _ := r.FieldPos(0)
		if len(rec) <= max(yc, pc) {
			return nil, &BadInput{Path: path, Line: line, Off: -1, Msg: fmt.Sprintf("%d fields; year and path need %d", len(rec), max(yc, pc)+1)}
		}
		year, err := strconv.Atoi(strings.TrimSpace(rec[yc]))
		if err != nil || year < 1 || year > 9999 {
			return nil, &BadInput{Path: path, Line: line, Off: -1, Msg: fmt.Sprintf("year %q is not a year from 1 to 9999", rec[yc])}
		}
		p := strings.TrimSpace(rec[pc])
		if p == "" {
			return nil, &BadInput{Path: path, Line: line, Off: -1, Msg: "the path is empty"}
		}
		if !filepath.IsAbs(p) {
			p = filepath.Join(dir, filepath.FromSlash(p))
		}
		info, err := os.Stat(p)
		if err != nil {
			return nil, &BadInput{Path: path, Line: line, Off: -1, Msg: fmt.Sprintf("%s: cannot read: %v", p, unwrapPath(err))}
		}
		if !info.Mode().IsRegular() {
			return nil, &BadInput{Path: path, Line: line, Off: -1, Msg: fmt.Sprintf("%s is not a regular file", p)}
		}
		files = append(files, File{Year: year, Path: p, Size: info.Size()})
	}
	if len(files) == 0 {
		return nil, bad(path, "the archive is empty: the manifest lists no files")
	}
	return files, nil
}

func csvError(path string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &BadInput{Path: path, Line: pe.Line, Off: -1, Msg: pe.Err.Error()}
	}
	return bad(path, "%v", err)
}

// unwrapPath drops the path an *fs.PathError repeats.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
