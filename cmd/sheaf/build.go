package main

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"image"
	"image/png"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/render/contact"
	"sheaf/render/pdf"
	"sheaf/render/preflight"
	"sheaf/render/raster"
	"sheaf/specs"
	"sheaf/specs/series"
)

func runBuild(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("build", "SPEC [--out DIR] [--only OUTPUT] [--strict] [--no-proofs] [--full] [--quiet]",
		"Render every output of the spec: for print, one PDF with bleed and crop marks, a PNG proof per page\n"+
			"and a contact sheet. Preflight runs first. Pages whose inputs did not change since the last build\n"+
			"are reused from DIR/.cache, and screen outputs and inserts whose inputs did not change keep their\n"+
			"files; DIR/manifest.json records what went in and came out, and\n"+
			"DIR/changes.txt and changes.json say what changed since the last build. The outputs are written\n"+
			"beside DIR and swapped in only when all is done: an interrupted build leaves DIR as it was.", stderr)
	outDir := fs.String("out", "", "folder for the outputs (default: out/ beside the spec)")
	only := fs.String("only", "", "build only the output with this name; the others' files are kept")
	strict := fs.Bool("strict", false, "stop without writing anything when preflight finds warnings or errors")
	noProofs := fs.Bool("no-proofs", false, "write no PNG proofs or contact sheet for print outputs")
	full := fs.Bool("full", false, "draw every page, screen output and insert afresh instead of reusing unchanged ones")
	quiet := fs.Bool("quiet", false, "no progress line")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	// loadJob in two steps: the last build's manifest and cached pages
	// are read beside the data (see prefetch).
	spec, err := specs.Load(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	dir := *outDir
	if dir == "" {
		dir = filepath.Join(spec.Dir, "out")
	}
	if err := checkOutDir(dir, *outDir != ""); err != nil {
		fmt.Fprintf(stderr, "sheaf build: %v\n", err)
		return exitBadInput
	}
	pre := startPrefetch(dir, spec, !*full)
	defer pre.stop() // no reading left running after the build
	data, err := series.Load(spec)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	j := &job{spec: spec, data: data}
	var outs []*specs.Output
	for i := range j.spec.Outputs {
		o := &j.spec.Outputs[i]
		if *only == "" || o.Name == *only {
			outs = append(outs, o)
		}
	}
	if len(outs) == 0 {
		var names []string
		for _, o := range j.spec.Outputs {
			names = append(names, o.Name)
		}
		fmt.Fprintf(stderr, "sheaf build: no output named %q; the spec has %v\n", *only, names)
		return exitBadInput
	}
	date, err := documentDate(j.spec)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	// Prepare every output first: bad input stops the build before any
	// file is touched.
	var preps []*prepared
	for _, o := range outs {
		p, err := prepare(j, o)
		if err != nil {
			fmt.Fprintln(stderr, err)
			return exitBadInput
		}
		preps = append(preps, p)
	}
	// Text widths from the last build: fitting thousands of labels is
	// otherwise most of a small rebuild's layout time.
	if !*full {
		for _, p := range preps {
			loadWidths(dir, p)
		}
	}
	// Inserts too: a missing term or a graphic too small is bad input.
	inserts, err := prepareInserts(j)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	findings, err := runPreflight(j, preps)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	// The widths asked for up to here (layout, labels, preflight) are the
	// same for the same inputs, however many pages a build draws: they are
	// what the cache keeps, so an incremental and a full build leave the
	// same file.
	widths := map[string][]byte{}
	for _, p := range preps {
		var buf bytes.Buffer
		if err := p.fonts.SaveWidths(&buf); err == nil {
			widths[p.out.Name] = buf.Bytes()
		}
	}
	writeFindings(stderr, findings, maxFindingsShown)
	if (*strict || j.spec.Preflight.Strict) && preflight.Stops(findings) {
		fmt.Fprintln(stderr, "sheaf build: strict preflight: stopped before writing anything (fix the warnings and errors above, or build without --strict)")
		return exitFindings
	}

	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	b := &build{ctx: ctx, j: j, final: dir, date: date, only: *only, noProofs: *noProofs, full: *full,
		progress: progressFor(stderr, *quiet), widths: widths, pre: pre, sums: map[string]fileSum{}, insertPreps: inserts}
	files, err := b.run(preps)
	b.progress.done()
	if err != nil {
		if ctx.Err() != nil {
			fmt.Fprintf(stderr, "sheaf build: interrupted; %s is as it was before the build\n", dir)
			return exitFindings
		}
		fmt.Fprintf(stderr, "sheaf build: %v\n", err)
		fmt.Fprintf(stderr, "sheaf build: nothing was changed in %s\n", dir)
		return exitFindings
	}
	for _, f := range files {
		fmt.Fprintln(stdout, f)
	}
	b.changes.writeSummary(stderr)
	return exitOK
}

// checkOutDir refuses an output folder that is a file, or lies under
// one, before anything is read or written: the user meant a folder.
// flag says whether the path came from --out.
func checkOutDir(dir string, flag bool) error {
	name := dir
	if flag {
		name = "--out " + dir
	}
	fi, err := os.Stat(dir)
	switch {
	case err == nil && !fi.IsDir():
		return fmt.Errorf("%s is a file; give a folder", name)
	case errors.Is(err, syscall.ENOTDIR):
		for p := filepath.Dir(dir); p != filepath.Dir(p); p = filepath.Dir(p) {
			if fi, err := os.Stat(p); err == nil && !fi.IsDir() {
				return fmt.Errorf("%s: %s is a file; give a folder", name, p)
			}
		}
		return fmt.Errorf("%s: a part of the path is a file; give a folder", name)
	}
	return nil
}

// build is one run of `sheaf build`: everything is written into a stage
// folder beside the final one, then swapped in.
type build struct {
	ctx      context.Context
	j        *job
	final    string // DIR
	stage    *stage
	date     time.Time
	only     string
	noProofs bool
	full     bool
	progress *progress

	prev         *manifest
	specSum      string
	outputs      []outputEntry
	insertPreps  []*preparedInsert // every insert of the spec, laid out
	inserts      []insertEntry     // inserts built
	insertsBuilt bool
	meta         map[string]fileMeta // by file path relative to DIR
	stats        []outputStats
	fonts        []fontHash
	changes      *changeReport
	widths       map[string][]byte // by output: its fonts' saved widths
	pre          *prefetch
	termsDone    chan struct{} // closed when termList and termMap are ready
	termList     []termHash    // termHashes of the data
	termMap      map[string]string
	sumsMu       sync.Mutex
	sums         map[string]fileSum // files this build wrote, by slash path relative to the stage
}

// fileMeta is what the manifest says of a file beside its hash: the
// pages it shows, its terms, its insert.
type fileMeta struct {
	pages  []pageEntry
	terms  []string
	insert string
}

// note records what a file of the stage shows, for the manifest.
func (b *build) note(path string, m fileMeta) { b.meta[rel(b.stage.dir, path)] = m }

// termSums maps every selected term to the hash of its data; it waits
// for the hashing started with the build.
func (b *build) termSums() map[string]string {
	<-b.termsDone
	return b.termMap
}

// outputStats counts what a build did for one output or insert.
type outputStats struct {
	Output       string `json:"output"`           // the output, or the one an insert borrows
	Insert       string `json:"insert,omitempty"` // the insert's name
	Kind         string `json:"kind"`             // print, screen or insert
	Pages        int    `json:"pages"`
	Encoded      int    `json:"encoded"`       // pages drawn (and encoded)
	Reused       int    `json:"reused"`        // pages taken from the cache or the last build
	ProofsDrawn  int    `json:"proofs_drawn"`  // proofs rasterized
	ProofsReused int    `json:"proofs_reused"` // proofs kept from the last build
	// Whole says, for a screen output or an insert (made or kept whole),
	// "reused (inputs unchanged)" or "drawn (WHY)".
	Whole string `json:"whole,omitempty"`
}

// Test hooks: encodeHook runs before a page is drawn for the PDF (not
// for a page reused from the cache); drawHook before a screen output
// ("web") or an insert ("insert NAME") is drawn (not when its files are
// carried over); an error from either fails the build. commitHook runs
// just before the stage is swapped in.
var (
	encodeHook func(output string, page int) error
	drawHook   func(unit string) error
	commitHook func(stage string) error
)

// drawReason says why a screen output or insert must be drawn, or ""
// when its files may be carried over from the last build: have says the
// last manifest has it, same that its inputs hash is this build's.
func (b *build) drawReason(have, same bool) string {
	switch {
	case b.full:
		return "--full"
	case b.prev == nil:
		return "first build"
	case !have:
		return "not in the last build"
	case !same:
		return "inputs changed"
	}
	return ""
}

// keepAll carries the last build's files of one output or insert into
// the stage, when they are exactly the files this build would write
// (want: stage paths) and each still has the SHA-256 the last manifest
// recorded. Files are hashed on all cores; with a label, the progress
// line counts them. On any miss it takes back
// what it linked and reports false: the caller draws them.
func (b *build) keepAll(label string, want []string, old []*fileEntry) bool {
	if len(old) == 0 || len(old) != len(want) {
		return false
	}
	wanted := map[string]bool{}
	for _, w := range want {
		wanted[rel(b.stage.dir, w)] = true
	}
	for _, f := range old {
		if !wanted[f.Path] {
			return false
		}
	}
	if label != "" {
		b.progress.begin(label, len(old))
	}
	ok := make([]bool, len(old))
	parallel(len(old), func(lo, hi int) {
		for i := lo; i < hi && b.ctx.Err() == nil; i++ {
			p := filepath.FromSlash(old[i].Path)
			ok[i] = b.keep(filepath.Join(b.final, p), filepath.Join(b.stage.dir, p), old[i].SHA256)
			if label != "" {
				b.progress.step()
			}
		}
	})
	all := true
	for _, k := range ok {
		all = all && k
	}
	if all {
		return true
	}
	b.sumsMu.Lock()
	defer b.sumsMu.Unlock()
	for i, k := range ok {
		if k {
			os.Remove(filepath.Join(b.stage.dir, filepath.FromSlash(old[i].Path)))
			delete(b.sums, old[i].Path)
		}
	}
	return false
}

// run builds every prepared output into the stage and swaps it in. It
// returns the files written, with their final paths.
func (b *build) run(preps []*prepared) (files []string, err error) {
	spec, err := os.ReadFile(b.j.spec.File)
	if err != nil {
		return nil, err
	}
	b.specSum = sumBytes(spec)
	b.pre.wait()
	b.prev, err = b.pre.prev, b.pre.prevErr
	if err != nil {
		// A damaged manifest costs the change report and the cache, not the build.
		fmt.Fprintf(b.progress.w, "sheaf build: warning: ignoring the previous manifest: %v\n", err)
		b.prev = nil
	}
	b.stage, err = newStage(b.final)
	if err != nil {
		return nil, err
	}
	defer func() {
		if err != nil {
			b.stage.abort()
		}
	}()
	// The terms' hashes are for the manifest at the end, and for screen
	// outputs' inputs: they are taken while print pages are drawn.
	b.termsDone = make(chan struct{})
	go func() {
		defer close(b.termsDone)
		b.termList = termHashes(b.j.data)
		b.termMap = make(map[string]string, len(b.termList))
		for _, t := range b.termList {
			b.termMap[t.Term] = t.SHA256
		}
	}()
	defer func() { <-b.termsDone }() // no hashing left running after the build
	b.meta = map[string]fileMeta{}
	for _, p := range preps {
		if err := b.ctx.Err(); err != nil {
			return nil, err
		}
		var written []string
		if p.out.Kind == specs.Screen {
			written, err = b.buildScreen(p)
		} else {
			written, err = b.buildPrint(p)
		}
		if err != nil {
			return nil, fmt.Errorf("output %q: %w", p.out.Name, err)
		}
		if w, ok := b.widths[p.out.Name]; ok {
			err := writeAtomic(filepath.Join(b.stage.dir, cacheDir, p.out.Name, widthsFile), func(f io.Writer) error {
				_, err := f.Write(w)
				return err
			})
			if err != nil {
				return nil, err
			}
		}
		b.fonts = append(b.fonts, fontHashes(p.out.Name, p.fonts)...)
		files = append(files, written...)
	}
	// Inserts are built here, into b.stage.dir, when the spec has them.
	if len(b.insertPreps) > 0 && (b.only == "" || insertsBorrow(b.j.spec, b.only)) {
		written, err := b.buildInserts(b.insertPreps)
		if err != nil {
			return nil, fmt.Errorf("inserts: %w", err)
		}
		b.insertsBuilt = true
		files = append(files, written...)
	}
	if err := b.carry(); err != nil {
		return nil, err
	}
	m, err := b.manifest()
	if err != nil {
		return nil, err
	}
	// The manifest is written while the change report is made from it.
	wrote := make(chan error, 1)
	go func() { wrote <- writeJSONFile(filepath.Join(b.stage.dir, manifestFile), m) }()
	b.changes = compareManifests(b.prev, m, b.stats)
	if err := <-wrote; err != nil {
		return nil, err
	}
	if err := writeJSONFile(filepath.Join(b.stage.dir, changesJSON), b.changes); err != nil {
		return nil, err
	}
	if err := writeAtomic(filepath.Join(b.stage.dir, changesText), b.changes.writeText); err != nil {
		return nil, err
	}
	if err := b.ctx.Err(); err != nil {
		return nil, err
	}
	if commitHook != nil {
		if err := commitHook(b.stage.dir); err != nil {
			return nil, err
		}
	}
	if err := b.stage.commit(); err != nil {
		return nil, err
	}
	for i, f := range files {
		if rel, err := filepath.Rel(b.stage.dir, f); err == nil && !strings.HasPrefix(rel, "..") {
			files[i] = filepath.Join(b.final, rel)
		}
	}
	return files, nil
}

// outputEntry lists an output's pages with their terms and input hashes.
func (b *build) outputEntry(p *prepared, dpi float64) outputEntry {
	e := outputEntry{Name: p.out.Name, Kind: string(p.out.Kind), Proofs: dpi}
	if len(p.plan.Pages) == 0 {
		return e
	}
	fontSum := fontsSum(p.fonts)
	e.Pages = make([]pageEntry, len(p.plan.Pages))
	parallel(len(e.Pages), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			e.Pages[i] = pageEntry{Page: i + 1, Terms: pageTerms(b.j, p, i),
				Inputs: pageInputs(b.j, p, i, b.setup(p, i), b.specSum, fontSum)}
		}
	})
	return e
}

// boxes converts a layout page's boxes for the PDF writer.
func boxes(pg *layout.Page) pdf.PageBoxes {
	r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
	return pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}
}

// setup is page i's boxes, marks and slug line. Screen pages have none.
func (b *build) setup(p *prepared, i int) pdf.PageSetup {
	if p.out.Kind != specs.Print {
		return pdf.PageSetup{}
	}
	out := p.out
	pg := &p.plan.Pages[i]
	setup := pdf.PageSetup{Boxes: boxes(pg)}
	if out.Marks {
		setup.Marks = &pdf.MarkOptions{}
	}
	if out.SlugLine {
		if setup.Marks == nil {
			setup.Marks = &pdf.MarkOptions{Length: 0.001}
		}
		setup.Slug = fmt.Sprintf("%s · %s · page %d of %d · %s", b.j.spec.Title, out.Name, i+1, len(p.plan.Pages), b.date.Format("2006-01-02"))
	}
	return setup
}

// buildPrint writes the PDF, the proofs and the contact sheet of a print
// output into the stage and returns the files written.
func (b *build) buildPrint(p *prepared) ([]string, error) {
	out := p.out
	dpi := 0.0
	if !b.noProofs {
		dpi = p.out.Proofs
		if dpi <= 0 {
			dpi = 100
		}
	}
	entry := b.outputEntry(p, dpi)
	st := outputStats{Output: out.Name, Kind: string(out.Kind), Pages: len(entry.Pages)}
	odir := filepath.Join(b.stage.dir, out.Name)
	pdfPath := filepath.Join(odir, out.Name+".pdf")
	// Pages go into the PDF as they are ready, in order, while later ones
	// are still being drawn.
	var encErr error
	err := b.writeHashed(pdfPath, func(w io.Writer) error {
		pw := pdf.NewWriter(w, pdf.Options{Title: b.j.spec.Title, Version: version, Date: b.date})
		// Pages from the cache name their fonts by hash only.
		for _, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic} {
			if _, err := pw.RegisterFont(p.fonts.Font(st)); err != nil {
				return err
			}
		}
		var addErr error
		encErr = b.encodePages(p, entry.Pages, &st, func(e *pdf.EncodedPage) bool {
			addErr = pw.AddEncoded(e)
			return addErr == nil
		})
		switch {
		case encErr != nil:
			return encErr
		case addErr != nil:
			return addErr
		}
		return pw.Close()
	})
	if encErr != nil {
		return nil, encErr
	}
	if err != nil {
		return nil, err
	}
	b.note(pdfPath, fileMeta{pages: entry.Pages})
	files := []string{pdfPath}
	if dpi > 0 {
		proofs, err := b.writeProofs(p, entry.Pages, dpi, odir, &st)
		if err != nil {
			return nil, err
		}
		files = append(files, proofs...)
	}
	b.outputs = append(b.outputs, entry)
	b.stats = append(b.stats, st)
	return files, nil
}

func rel(root, path string) string {
	r, err := filepath.Rel(root, path)
	if err != nil {
		return filepath.ToSlash(path)
	}
	return filepath.ToSlash(r)
}

// encodePages hands every page, encoded for the PDF, to add in page order
// as soon as it and the pages before it are ready; pages are drawn in
// parallel. A page whose inputs hash is in the previous build's cache is
// taken from it; the others are drawn and encoded and go into the new
// cache. It stops when add reports false.
func (b *build) encodePages(p *prepared, pages []pageEntry, st *outputStats, add func(*pdf.EncodedPage) bool) error {
	out := p.out.Name
	oldCache := filepath.Join(b.final, cacheDir, out)
	newCache := filepath.Join(b.stage.dir, cacheDir, out)
	if err := os.MkdirAll(newCache, 0o755); err != nil {
		return err
	}
	n := len(pages)
	res := make([]*pdf.EncodedPage, n)
	errs := make([]error, n)
	done := make([]chan struct{}, n)
	for i := range done {
		done[i] = make(chan struct{})
	}
	var encodedN, reusedN atomic.Int64
	var stop atomic.Bool
	b.progress.begin(out+": PDF pages", n)
	work := make(chan int, n)
	for i := range n {
		work <- i
	}
	close(work)
	var wg sync.WaitGroup
	for range runtime.GOMAXPROCS(0) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range work {
				b.encodeOne(p, i, pages[i].Inputs+".page", oldCache, newCache, &stop, &encodedN, &reusedN, &res[i], &errs[i])
				close(done[i])
			}
		}()
	}
	var first error // the first page in order that failed
	for i := range n {
		<-done[i]
		if errs[i] != nil {
			first = fmt.Errorf("page %d: %w", i+1, errs[i])
			break
		}
		if !add(res[i]) {
			break
		}
		res[i] = nil // the writer has it
	}
	stop.Store(true)
	wg.Wait()
	if err := b.ctx.Err(); err != nil {
		return err
	}
	st.Encoded, st.Reused = int(encodedN.Load()), int(reusedN.Load())
	return first
}

// encodeOne takes page i from the old cache or draws and encodes it.
func (b *build) encodeOne(p *prepared, i int, name, oldCache, newCache string, stop *atomic.Bool, encodedN, reusedN *atomic.Int64, res **pdf.EncodedPage, errp *error) {
	if stop.Load() {
		*errp = errors.New("stopped")
		return
	}
	if err := b.ctx.Err(); err != nil {
		*errp = err
		return
	}
	if !b.full {
		if e, ok := b.reuse(filepath.Join(oldCache, name), filepath.Join(newCache, name)); ok {
			*res = e
			reusedN.Add(1)
			b.progress.step()
			return
		}
	}
	e, err := b.encode(p, i)
	if err == nil {
		err = writeAtomic(filepath.Join(newCache, name), func(w io.Writer) error { return writeCachedPage(w, e) })
	}
	*res, *errp = e, err
	encodedN.Add(1)
	b.progress.step()
}

// encode draws and encodes page i.
func (b *build) encode(p *prepared, i int) (*pdf.EncodedPage, error) {
	if encodeHook != nil {
		if err := encodeHook(p.out.Name, i+1); err != nil {
			return nil, err
		}
	}
	return pdf.EncodePage(b.setup(p, i), func(c *canvas.Canvas) error { return p.feat.Draw(canvas.NewContext(c), i) })
}

// widthsFile holds an output's text widths between builds (see
// fonts.Set.SaveWidths), beside its cached pages.
const widthsFile = "text-widths"

// loadWidths gives p's fonts the widths the last build saved. A missing,
// damaged or outdated file costs only the time to measure again.
func loadWidths(dir string, p *prepared) {
	f, err := os.Open(filepath.Join(dir, cacheDir, p.out.Name, widthsFile))
	if err != nil {
		return
	}
	defer f.Close()
	p.fonts.LoadWidths(f)
}

// reuse reads a cached page, or takes it as prefetched, and links it into
// the new cache. Any problem (missing, unreadable, damaged) means: encode
// it again.
func (b *build) reuse(old, new string) (*pdf.EncodedPage, bool) {
	e, ok := b.pre.pages[old]
	if !ok {
		e = readCachedPage(old)
	}
	if e == nil {
		return nil, false
	}
	if err := linkOrCopy(old, new); err != nil {
		return nil, false
	}
	return e, true
}

// readCachedPage decodes an encoded page from the cache; nil when it is
// missing, unreadable or damaged.
func readCachedPage(path string) *pdf.EncodedPage {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil
	}
	e, err := decodeCachedPage(data)
	if err != nil || len(e.Content) == 0 {
		return nil
	}
	return e
}

// prefetch reads, beside the data, what a build needs from the last one:
// its manifest, the SHA-256 of the data files and, unless the build is
// full, the cached pages the manifest lists, decoded. The data read is one
// core's work; this is the other's.
type prefetch struct {
	done    chan struct{}
	stopped atomic.Bool
	prev    *manifest
	prevErr error
	data    map[string]fileSum          // by resolved path
	pages   map[string]*pdf.EncodedPage // by cache file path; nil for a damaged one
}

type fileSum struct {
	sum  string
	size int64
}

func startPrefetch(dir string, s *specs.Spec, pages bool) *prefetch {
	p := &prefetch{done: make(chan struct{}), data: map[string]fileSum{}, pages: map[string]*pdf.EncodedPage{}}
	go func() {
		defer close(p.done)
		p.prev, p.prevErr = readManifest(dir)
		if p.stopped.Load() {
			return
		}
		for _, d := range []string{s.Data.Counts, s.Data.Totals} {
			path := s.Resolve(d)
			if sum, size, err := sumFile(path); err == nil {
				p.data[path] = fileSum{sum, size}
			}
		}
		if !pages || p.prev == nil {
			return
		}
		for _, o := range p.prev.Outputs {
			if o.Kind != string(specs.Print) {
				continue
			}
			for _, pg := range o.Pages {
				if p.stopped.Load() {
					return
				}
				path := filepath.Join(dir, cacheDir, o.Name, pg.Inputs+".page")
				p.pages[path] = readCachedPage(path)
			}
		}
	}()
	return p
}

func (p *prefetch) wait() { <-p.done }

// stop ends the reading early and waits for it.
func (p *prefetch) stop() {
	p.stopped.Store(true)
	<-p.done
}

// writeProofs writes a PNG of every page's trim area, pages in parallel,
// and the contact sheet. A proof whose page inputs and resolution match
// the previous build's, and whose file is intact, is kept instead of
// drawn again.
func (b *build) writeProofs(p *prepared, pages []pageEntry, dpi float64, odir string, st *outputStats) ([]string, error) {
	n := len(pages)
	prevOut := b.prev.output(p.out.Name)
	files := make([]string, n)
	fresh := make([]image.Image, n) // drawn this build; nil when kept
	errs := make([]error, n)
	kept := make([]bool, n)
	b.progress.begin(p.out.Name+": proofs", n)
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for i := range n {
		if b.ctx.Err() != nil {
			break
		}
		path := filepath.Join(odir, "proofs", fmt.Sprintf("page-%03d.png", i+1))
		files[i] = path
		relp := rel(b.stage.dir, path)
		b.note(path, fileMeta{pages: pages[i : i+1]})
		if !b.full && prevOut != nil && prevOut.Proofs == dpi {
			if old := b.prev.file(relp); old != nil && len(old.Pages) == 1 && old.Pages[0].Inputs == pages[i].Inputs {
				if b.keep(filepath.Join(b.final, relp), path, old.SHA256) {
					kept[i] = true
					st.ProofsReused++
					b.progress.step()
					continue
				}
			}
		}
		st.ProofsDrawn++
		wg.Add(1)
		sem <- struct{}{}
		go func(i int) {
			defer func() { <-sem; wg.Done() }()
			defer b.progress.step()
			pg := &p.plan.Pages[i]
			region := raster.RegionOf(pg.Media.H(), dpi, pg.Trim.X0, pg.Trim.Y0, pg.Trim.X1, pg.Trim.Y1)
			trim, err := raster.DrawRegion(pg.Media.H(), dpi, region, p.feat.PaperColor(), func(ctx *canvas.Context) error {
				return p.feat.Draw(ctx, i)
			})
			if err != nil {
				errs[i] = err
				return
			}
			if err := b.writeHashed(files[i], func(w io.Writer) error { return raster.WritePNG(w, trim) }); err != nil {
				errs[i] = err
				return
			}
			fresh[i] = trim
		}(i)
	}
	wg.Wait()
	if err := b.ctx.Err(); err != nil {
		return nil, err
	}
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	cpath := filepath.Join(odir, "contact.png")
	files = append(files, cpath)
	crel := rel(b.stage.dir, cpath)
	b.note(cpath, fileMeta{pages: pages})
	if st.ProofsDrawn == 0 && prevOut != nil && samePages(prevOut.Pages, pages) {
		if old := b.prev.file(crel); old != nil && b.keep(filepath.Join(b.final, crel), cpath, old.SHA256) {
			for _, pg := range pages { // keep the thumbnails for the next build
				name := fmt.Sprintf("%s-%g.thumb.png", pg.Inputs, dpi)
				linkOrCopy(filepath.Join(b.final, cacheDir, p.out.Name, name), filepath.Join(b.stage.dir, cacheDir, p.out.Name, name))
			}
			return files, nil
		}
	}
	// Thumbnails are cached beside the pages: scaling 84 proofs down costs
	// more than the one page that changed.
	thumbs := make([]image.Image, n)
	errs = make([]error, n)
	for i := range n {
		wg.Add(1)
		sem <- struct{}{}
		go func(i int) {
			defer func() { <-sem; wg.Done() }()
			thumbs[i], errs[i] = b.thumbnail(p.out.Name, pages[i].Inputs, dpi, fresh[i], files[i])
		}(i)
	}
	wg.Wait()
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	sheet := contact.Sheet(thumbs, 4)
	if err := b.writeHashed(cpath, func(w io.Writer) error { return raster.WritePNG(w, sheet) }); err != nil {
		return nil, err
	}
	return files, nil
}

// thumbnail returns a page's contact-sheet thumbnail: from the previous
// build's cache when the page and resolution are the same, else scaled
// from the proof (drawn now, or read back from its PNG, which holds the
// same pixels) and cached.
func (b *build) thumbnail(output, inputs string, dpi float64, img image.Image, proof string) (image.Image, error) {
	name := fmt.Sprintf("%s-%g.thumb.png", inputs, dpi)
	old := filepath.Join(b.final, cacheDir, output, name)
	cur := filepath.Join(b.stage.dir, cacheDir, output, name)
	if img == nil && !b.full {
		if f, err := os.Open(old); err == nil {
			t, err := png.Decode(f)
			f.Close()
			if err == nil && linkOrCopy(old, cur) == nil {
				return t, nil
			}
		}
	}
	if img == nil {
		f, err := os.Open(proof)
		if err != nil {
			return nil, err
		}
		img, err = png.Decode(f)
		f.Close()
		if err != nil {
			return nil, fmt.Errorf("reading proof %s: %w", proof, err)
		}
	}
	t := contact.Thumbnail(img, 240)
	if err := writeAtomic(cur, func(w io.Writer) error { return raster.WritePNG(w, t) }); err != nil {
		return nil, err
	}
	return t, nil
}

func samePages(a, b []pageEntry) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Inputs != b[i].Inputs {
			return false
		}
	}
	return true
}

// keep links the previous build's file into the stage when its content
// is still what the previous manifest recorded.
func (b *build) keep(old, new, sum string) bool {
	got, size, err := sumFile(old)
	if err != nil || got != sum {
		return false
	}
	if err := os.MkdirAll(filepath.Dir(new), 0o755); err != nil {
		return false
	}
	if linkOrCopy(old, new) != nil {
		return false
	}
	b.known(new, fileSum{got, size})
	return true
}

// writeHashed is writeAtomic that also hashes what it writes, so that the
// manifest need not read the file back. The hashing runs beside the
// writing, on 64 KiB blocks.
func (b *build) writeHashed(path string, fill func(w io.Writer) error) error {
	h := sha256.New()
	var n int64
	blocks := make(chan []byte, 8)
	free := make(chan []byte, 10)
	hashed := make(chan struct{})
	go func() {
		for p := range blocks {
			h.Write(p)
			select {
			case free <- p[:0]:
			default:
			}
		}
		close(hashed)
	}()
	err := writeAtomic(path, func(w io.Writer) error {
		bw := bufio.NewWriterSize(writerFunc(func(p []byte) (int, error) {
			var c []byte
			select {
			case c = <-free:
			default:
			}
			blocks <- append(c, p...)
			k, err := w.Write(p)
			n += int64(k)
			return k, err
		}), 64<<10)
		if err := fill(bw); err != nil {
			return err
		}
		return bw.Flush()
	})
	close(blocks)
	<-hashed
	if err == nil {
		b.known(path, fileSum{hexSum(h), n})
	}
	return err
}

// known records the hash of a file in the stage.
func (b *build) known(path string, fs fileSum) {
	b.sumsMu.Lock()
	b.sums[rel(b.stage.dir, path)] = fs
	b.sumsMu.Unlock()
}

type writerFunc func(p []byte) (int, error)

func (f writerFunc) Write(p []byte) (int, error) { return f(p) }

// manifest describes the stage as it will be swapped in.
func (b *build) manifest() (*manifest, error) {
	s := b.j.spec
	m := &manifest{Sheaf: version, Spec: fileHash{Path: filepath.Base(s.File), SHA256: b.specSum}}
	for _, d := range []string{s.Data.Counts, s.Data.Totals} {
		fs, ok := b.pre.data[s.Resolve(d)]
		if !ok {
			sum, size, err := sumFile(s.Resolve(d))
			if err != nil {
				return nil, err
			}
			fs = fileSum{sum, size}
		}
		m.Data = append(m.Data, fileHash{Path: d, SHA256: fs.sum})
	}
	<-b.termsDone
	m.Terms = b.termList
	m.Fonts = b.fonts
	m.Inserts = b.inserts
	m.Outputs = b.outputs
	built := map[string]bool{}
	for _, o := range b.outputs {
		built[o.Name] = true
	}
	// Outputs kept from the last build (--only) keep their entries.
	if b.prev != nil {
		for _, o := range b.prev.Outputs {
			if !built[o.Name] && b.stage.carried[o.Name] {
				m.Outputs = append(m.Outputs, o)
			}
		}
		for _, f := range b.prev.Fonts {
			if !built[f.Output] && b.stage.carried[f.Output] {
				m.Fonts = append(m.Fonts, f)
			}
		}
		// Inserts not built (--only an output none borrows) keep theirs.
		if !b.insertsBuilt && b.stage.carried[""] {
			m.Inserts = b.prev.Inserts
		}
	}
	order := map[string]int{}
	for i, o := range s.Outputs {
		order[o.Name] = i
	}
	sort.SliceStable(m.Outputs, func(i, j int) bool { return order[m.Outputs[i].Name] < order[m.Outputs[j].Name] })
	sort.SliceStable(m.Fonts, func(i, j int) bool { return order[m.Fonts[i].Output] < order[m.Fonts[j].Output] })

	entries, err := os.ReadDir(b.stage.dir)
	if err != nil {
		return nil, err
	}
	for _, e := range entries {
		name := e.Name()
		if strings.HasPrefix(name, ".") || name == manifestFile || name == changesJSON || name == changesText || b.stage.foreign[name] {
			continue
		}
		output := ""
		if s.Output(name) != nil {
			output = name
		}
		fs, err := hashFiles(b.stage.dir, name, output, b.sums)
		if err != nil {
			return nil, err
		}
		for i := range fs {
			if md, ok := b.meta[fs[i].Path]; ok {
				fs[i].Pages, fs[i].Terms, fs[i].Insert = md.pages, md.terms, md.insert
			} else if !built[output] {
				if old := b.prev.file(fs[i].Path); old != nil {
					fs[i].Pages, fs[i].Terms, fs[i].Insert = old.Pages, old.Terms, old.Insert
				}
			}
		}
		m.Files = append(m.Files, fs...)
	}
	sort.Slice(m.Files, func(i, j int) bool { return m.Files[i].Path < m.Files[j].Path })
	return m, nil
}
