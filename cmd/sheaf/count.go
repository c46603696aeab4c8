package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"runtime"
	"strings"
	"time"

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
		opt.Terms = count.SpecTerms(s)
		if len(opt.Terms) == 0 {
			return report(stderr, specs.BadInput(&count.BadInput{Path: *specPath, Off: -1, Msg: "the spec lists no terms (terms.list or inserts): give --terms FILE, or --ngrams N to count every word"}))
		}
		span = &s.Years
	case *termsPath != "":
		opt.Terms, err = count.ReadTerms(*termsPath)
		if err != nil {
			return report(stderr, specs.BadInput(err))
		}
	}

	files, err := count.Archive(pos[0], *ext, *yearPattern)
	if err != nil {
		return report(stderr, specs.BadInput(err))
	}
	if span != nil {
		in, skipped := count.Within(files, *span)
		if skipped > 0 {
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
	paths, err := count.WriteTables(*out, res)
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
