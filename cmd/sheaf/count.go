package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"time"
	"unicode/utf8"

	"sheaf/specs"
	"sheaf/specs/count"
)

const countArgs = "ARCHIVE --out DIR (--spec SPEC | --terms FILE | --ngrams N) [--min-count N] [--max-terms N] [--keep-case] [--ext .txt] [--year-pattern RE] [--jobs N] [--quiet]"

// runCount is `sheaf count`: a dated text archive (a folder, or a manifest
// table year,path) to counts.csv and totals.csv in DIR.
func runCount(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("count", countArgs, "count terms in a dated text archive; write counts.csv and totals.csv as data: reads them", stderr)
	out := fs.String("out", "", "folder to write counts.csv and totals.csv into (required; made if missing)")
	specPath := fs.String("spec", "", "count the spec's own terms (terms.list and the inserts' terms); only years of its span")
	termsPath := fs.String("terms", "", "count the terms in this UTF-8 file, one a line (blank lines and lines starting with # skipped)")
	ngrams := fs.Int("ngrams", 0, "count every word and phrase of up to N words (no term list)")
	minCount := fs.Int64("min-count", 5, "with --ngrams: keep terms seen at least this many times over the archive")
	maxTerms := fs.Int("max-terms", count.DefaultMaxTerms, "with --ngrams: the most distinct terms held in memory at once, per job (about 120 bytes + 16 a year each)")
	keepCase := fs.Bool("keep-case", false, "keep case (default: fold case, so Telegraph counts as telegraph)")
	ext := fs.String("ext", ".txt", "in a folder, read only files ending in this (\"\" for all)")
	yearPattern := fs.String("year-pattern", count.DefaultYearPattern, "regular expression finding the year in a file's path below the folder: one capture group")
	jobs := fs.Int("jobs", runtime.GOMAXPROCS(0), "files read at once")
	quiet := fs.Bool("quiet", false, "no progress line")
	pos, err := parseFlags(fs, args)
	if errors.Is(err, flag.ErrHelp) {
		return exitOK
	}
	if err != nil {
		return exitBadInput
	}
	usageErr := func(format string, a ...any) int {
		fmt.Fprintf(stderr, "sheaf count: "+format+"\n", a...)
		fs.Usage()
		return exitBadInput
	}
	if len(pos) != 1 {
		return usageErr("give exactly one archive: a folder or a manifest table (got %d: %s)", len(pos), strings.Join(pos, " "))
	}
	if *out == "" {
		return usageErr("--out DIR is required")
	}
	given := 0
	for _, on := range []bool{*specPath != "", *termsPath != "", *ngrams != 0} {
		if on {
			given++
		}
	}
	if given != 1 {
		return usageErr("give one of --spec, --terms or --ngrams")
	}
	if *ngrams < 0 || *ngrams > 8 {
		return usageErr("--ngrams must be 1 to 8")
	}
	if *jobs < 1 {
		return usageErr("--jobs must be at least 1")
	}
	if fi, err := os.Stat(*out); err == nil && !fi.IsDir() {
		return report(stderr, specs.BadInput(&count.BadInput{Path: *out, Off: -1, Msg: "--out names a file, not a folder"}))
	}

	opt := count.Options{Fold: !*keepCase, NGrams: *ngrams, MinCount: *minCount, MaxTerms: *maxTerms, Workers: *jobs}
	var span *specs.Span
	switch {
	case *specPath != "":
		s, err := specs.Load(*specPath)
		if err != nil {
			fmt.Fprintln(stderr, err)
			return exitBadInput
		}
		opt.Terms = specTerms(s)
		if len(opt.Terms) == 0 {
			return report(stderr, specs.BadInput(&count.BadInput{Path: *specPath, Off: -1, Msg: "the spec lists no terms (terms.list or inserts): give --terms FILE, or --ngrams N to count every word"}))
		}
		span = &s.Years
	case *termsPath != "":
		opt.Terms, err = readTermList(*termsPath)
		if err != nil {
			return report(stderr, specs.BadInput(err))
		}
	}

	files, err := archiveFiles(pos[0], *ext, *yearPattern)
	if err != nil {
		return report(stderr, specs.BadInput(err))
	}
	if span != nil {
		var in []count.File
		for _, f := range files {
			if f.Year >= span.From && f.Year <= span.To {
				in = append(in, f)
			}
		}
		if skipped := len(files) - len(in); skipped > 0 {
			fmt.Fprintf(stderr, "sheaf count: %d file(s) outside the spec's years %d–%d left out\n", skipped, span.From, span.To)
		}
		if len(in) == 0 {
			return report(stderr, specs.BadInput(&count.BadInput{Path: pos[0], Off: -1, Msg: fmt.Sprintf("no file of the archive is dated within the spec's years %d–%d", span.From, span.To)}))
		}
		files = in
	}

	prog := &countProgress{w: stderr, on: !*quiet && isTerminal(stderr), start: time.Now()}
	opt.Progress = prog.show
	start := time.Now()
	res, err := count.Count(files, opt)
	prog.end()
	if err != nil {
		return report(stderr, err)
	}
	for _, t := range res.Missing {
		fmt.Fprintf(stderr, "sheaf count: warning: %q is nowhere in the archive; the counts table has no row for it\n", t)
	}
	paths, err := writeTables(*out, res)
	if err != nil {
		fmt.Fprintf(stderr, "sheaf count: %v\n", err)
		return exitFindings
	}
	var words int64
	for _, t := range res.Totals {
		words += t
	}
	if !*quiet {
		fmt.Fprintf(stderr, "sheaf count: %d files, %d years, %d words, %d rows in %.1fs\n", len(files), len(res.Years), words, len(res.Rows), time.Since(start).Seconds())
	}
	for _, p := range paths {
		fmt.Fprintln(stdout, p)
	}
	return exitOK
}

// specTerms is the terms a spec names: its list, then its inserts' terms.
func specTerms(s *specs.Spec) []string {
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

// readTermList reads a term list: one term a line.
func readTermList(path string) ([]string, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, &count.BadInput{Path: path, Off: -1, Msg: fmt.Sprintf("cannot read: %v", err)}
	}
	var terms []string
	seen := map[string]int{}
	for i, line := range strings.Split(strings.TrimPrefix(string(data), "\ufeff"), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		if !utf8.ValidString(line) {
			return nil, &count.BadInput{Path: path, Line: i + 1, Off: -1, Msg: "not valid UTF-8: save the list as UTF-8"}
		}
		if j, ok := seen[line]; ok {
			return nil, &count.BadInput{Path: path, Line: i + 1, Off: -1, Msg: fmt.Sprintf("%q listed twice (first at line %d)", line, j)}
		}
		seen[line] = i + 1
		terms = append(terms, line)
	}
	if len(terms) == 0 {
		return nil, &count.BadInput{Path: path, Off: -1, Msg: "lists no terms"}
	}
	return terms, nil
}

// archiveFiles lists a folder, or reads a manifest table.
func archiveFiles(path, ext, pattern string) ([]count.File, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, &count.BadInput{Path: path, Off: -1, Msg: fmt.Sprintf("cannot read: %v", errors.Unwrap(err))}
	}
	if !fi.IsDir() {
		return count.Manifest(path)
	}
	re, err := regexp.Compile(pattern)
	if err != nil {
		return nil, &count.BadInput{Path: "--year-pattern", Off: -1, Msg: err.Error()}
	}
	if ext != "" && !strings.HasPrefix(ext, ".") {
		ext = "." + ext
	}
	return count.Folder(path, ext, re)
}

// writeTables writes both tables under temporary names in dir and renames
// them into place only when both are whole, so a failed run leaves the
// old tables as they were.
func writeTables(dir string, res *count.Result) ([]string, error) {
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

// countProgress draws "count: N of M MB (P%)" on a terminal, at most ten
// times a second, after the first second. The clock decides only when to
// draw, never what is written to the tables.
type countProgress struct {
	w           io.Writer
	on          bool
	start, last time.Time
	drawn       bool
}

func (p *countProgress) show(done, total int64) {
	if !p.on {
		return
	}
	now := time.Now()
	if now.Sub(p.start) < time.Second || now.Sub(p.last) < 100*time.Millisecond {
		return
	}
	p.last, p.drawn = now, true
	mb := float64(done) / 1e6
	rate := mb / now.Sub(p.start).Seconds()
	fmt.Fprintf(p.w, "\rcount: %.0f of %.0f MB (%d%%), %.0f MB/s ", mb, float64(total)/1e6, done*100/max(total, 1), rate)
}

func (p *countProgress) end() {
	if p.drawn {
		fmt.Fprint(p.w, "\r\033[K")
	}
}
