package production

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"hash/crc32"
	"image"
	"image/png"
	"io"
	"maps"
	"os"
	"path/filepath"
	"runtime/debug"
	"slices"
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
	"sheaf/render/draw"
	"sheaf/render/feature"
	"sheaf/render/pdf"
	"sheaf/render/preflight"
	"sheaf/render/raster"
	"sheaf/specs"
)

// Version is the version of sheaf's drawing code: it is written into
// file metadata and into every inputs hash, so a new version redraws.
const Version = "0.1.0"

// Options are the settings of one build.
type Options struct {
	// Dir is the folder the outputs go to (sheaf's default: out/ beside
	// the spec). It is replaced whole, by an atomic swap, when the build
	// is complete.
	Dir string
	// Only builds the output with this name ("": all); the other
	// outputs' files are kept from the last build.
	Only string
	// Strict stops the build before anything is written when preflight
	// finds warnings or errors (as the spec's preflight.strict does).
	Strict bool
	// NoProofs writes no PNG proofs or contact sheet for print outputs.
	NoProofs bool
	// Full draws everything afresh instead of reusing the last build's
	// pages and files.
	Full bool
	// Date is written into file metadata (see feature.DocumentDate).
	Date time.Time
	// Progress hears how the build goes; nil hears nothing.
	Progress Progress
	// Hooks are for tests: each runs at one point of the build, and an
	// error from one fails the build.
	Hooks Hooks
}

// Hooks run at fixed points of a build; each may be nil.
type Hooks struct {
	// BeforeEncode runs before a page is drawn for a PDF (not for a page
	// reused from the cache); page counts from 1.
	BeforeEncode func(output string, page int) error
	// BeforeDraw runs before a screen output ("web") or an insert
	// ("insert NAME") is drawn (not when its files are carried over).
	BeforeDraw func(unit string) error
	// BeforeRaster runs before a PNG is drawn (a proof, a screen page at
	// a scale, an insert), with the path it will have in the stage.
	BeforeRaster func(file string) error
	// BeforeCommit runs just before the stage folder is swapped in.
	BeforeCommit func(stage string) error
}

// Progress hears how a build goes. Begin and Step may be called from
// several goroutines at once.
type Progress interface {
	// Findings hands over preflight's findings, worst first, before
	// anything is written.
	Findings(fs []preflight.Finding)
	// Begin starts a stage of total steps, such as "print: PDF pages".
	Begin(stage string, total int)
	// Step counts one step of the stage done.
	Step()
	// Warn tells of something the build worked around, such as a page
	// too tall for a PNG.
	Warn(msg string)
}

// FindingsRepeater is a Progress that can say in one line that
// preflight found what it found in the last build: Build calls
// FindingsRepeated instead of Findings then.
type FindingsRepeater interface {
	FindingsRepeated(fs []preflight.Finding)
}

// findingsSum hashes a set of findings, for the manifest.
func findingsSum(fs []preflight.Finding) string {
	h := newHasher("sheaf findings v1")
	h.int(len(fs))
	for _, f := range fs {
		h.str(f.ID)
		h.int(int(f.Severity))
		h.str(f.Output)
		h.int(f.Page)
		h.str(f.Term)
		h.int(f.Year)
		h.str(f.At)
		h.str(f.Message)
	}
	return h.sum()
}

// ErrStrict is returned (wrapped) when strict preflight stopped a build
// before it wrote anything.
var ErrStrict = errors.New("strict preflight: stopped before writing anything (fix the warnings and errors found, or build without strictness)")

// Result is what a build did.
type Result struct {
	// Files are the files written, with their paths in Dir.
	Files []string
	// Findings are preflight's, worst first.
	Findings []preflight.Finding
	// Changes says what changed since the last build.
	Changes *ChangeReport
	// FindingsSum hashes Findings; the manifest keeps it.
	FindingsSum string
	// Left is set when the build is in place but what was left of the
	// previous one could not be removed whole: the build succeeded.
	Left *LeftError
}

// Build renders every output of the job (or the one Options.Only names)
// and its inserts into a stage folder beside Options.Dir, writes the
// manifest and the change report, and swaps the stage in. Pages, screen
// outputs and inserts whose inputs did not change since the last build
// are reused. Bad input (a *specs.InputError) stops it before any file is
// touched; a failure or a cancelled ctx leaves Dir as it was.
//
// job.Data may be nil: Build then loads the data itself, while it reads
// what it needs of the last build.
func Build(ctx context.Context, job *feature.Job, opts Options) (*Result, error) {
	if opts.Progress == nil {
		opts.Progress = silent{}
	}
	dir := opts.Dir
	if dir == "" {
		return nil, specs.BadInput(errors.New("no output folder given"))
	}
	if err := checkOutDir(dir); err != nil {
		return nil, specs.BadInput(err)
	}
	// The folder itself, and what could stop the swap or the clean-up
	// after it, are checked before anything is read or drawn.
	final, err := resolveOut(dir)
	if err != nil {
		return nil, err
	}
	if err := checkTree(final); err != nil {
		return nil, err
	}
	spec := job.Spec
	var outs []*specs.Output
	for i := range spec.Outputs {
		o := &spec.Outputs[i]
		if opts.Only == "" || o.Name == opts.Only {
			outs = append(outs, o)
		}
	}
	// The outputs' fonts, and the text widths the last build saved, load
	// on the other core while the table is read on this one, before the
	// rest of what is read from the last build: both are needed before
	// anything is laid out. Errors are the fonts' own, met again (fonts
	// that failed are not kept) where they are reported.
	var warm func()
	loaded := job.Data != nil
	if !loaded {
		job = &feature.Job{Spec: spec}
		warm = func() {
			for _, o := range outs {
				fs, err := job.Fonts(o)
				if err != nil {
					continue
				}
				if !opts.Full {
					loadWidths(final, o.Name, fs)
				}
				// The faces parsed for shaping (measuring and drawing
				// labels) and canvas's parse of them for drawing (about
				// 10 and 25 ms), here rather than on the layout's
				// goroutine when it first needs them; errors, if any,
				// are met again where measuring and drawing check.
				fs.KeepGlyphs() // labels measured are drawn
				fs.PrepareShaping(fonts.Bold, fonts.Regular, fonts.Figures)
				fs.Ready()
			}
		}
	}
	pre := startPrefetch(final, spec, !opts.Full, warm)
	defer pre.stop() // no reading left running after the build
	if !loaded {
		err := job.ReadData()
		if p, ok := <-pre.warmed; ok {
			panic(p) // raised here, where it was before, with the stack it had
		}
		if err != nil {
			return nil, err
		}
	}
	// The terms' hashes (for the pages' inputs, screen outputs' and the
	// manifest) are taken on the other core while fonts load and the
	// layout and preflight run on this one.
	terms := startTerms(ctx, job.Data)
	defer terms.get() // no hashing left running after the build
	if len(outs) == 0 {
		var names []string
		for _, o := range spec.Outputs {
			names = append(names, o.Name)
		}
		return nil, specs.BadInput(fmt.Errorf("no output named %q; the spec has %v", opts.Only, names))
	}
	// Text widths from the last build, before anything is laid out:
	// fitting thousands of labels is otherwise most of a small rebuild's
	// layout time, and a single title measured means parsing a face again
	// for shaping.
	if !opts.Full {
		for _, o := range outs {
			fs, err := job.Fonts(o)
			if err != nil {
				return nil, err
			}
			if loaded {
				loadWidths(final, o.Name, fs)
			}
		}
	}
	// Prepare every output first: bad input stops the build before any
	// file is touched.
	var preps []*feature.Output
	for _, o := range outs {
		p, err := job.Prepare(o)
		if err != nil {
			return nil, err
		}
		preps = append(preps, p)
	}
	// The outputs not built that inserts borrow (`--only`): their inserts
	// are laid out, so checked, though not drawn, and measuring them
	// alone would parse a face again for shaping. Their widths come from
	// their cache; where it has none (or a damaged one), the widths asked
	// here make one (a good file is kept as carried: it holds the whole
	// output's, of which these are a few). A Set
	// whose fonts fail to load is left to PrepareInserts, which says so
	// in the insert's terms.
	var lent []*specs.Output
	if opts.Only != "" {
		for i := range spec.Outputs {
			o := &spec.Outputs[i]
			if o.Name == opts.Only || !feature.BorrowsOutput(spec, o.Name) {
				continue
			}
			fs, err := job.Fonts(o)
			if err != nil {
				continue
			}
			if _, err := os.Stat(filepath.Join(final, CacheDir, o.Name, widthsFile)); err != nil {
				lent = append(lent, o) // none yet
			} else if !opts.Full && !loadWidths(final, o.Name, fs) {
				lent = append(lent, o) // damaged or outdated
			}
		}
	}
	// Inserts too: a missing term or a graphic too small is bad input.
	inserts, err := job.PrepareInserts()
	if err != nil {
		return nil, err
	}
	findings, err := job.Preflight(preps, inserts...)
	if err != nil {
		return nil, err
	}
	// canvas's fonts, which only drawing reads, parsed now: a face it
	// cannot read stops the build before any file is touched. (Figures
	// is the regular face's bytes again, parsed when a page draws.)
	for _, p := range preps {
		if err := p.Fonts.Ready(fonts.Regular, fonts.Bold, fonts.Italic); err != nil {
			return nil, err
		}
	}
	if opts.Only == "" || feature.BorrowsOutput(spec, opts.Only) { // the inserts are built
		for _, in := range inserts {
			if err := in.Graphic.Fonts.Ready(fonts.Regular, fonts.Bold, fonts.Italic); err != nil {
				return nil, err
			}
		}
	}
	res := &Result{Findings: findings}
	// The widths asked for up to here (layout, labels, preflight) are the
	// same for the same inputs, however many pages a build draws: they are
	// what the cache keeps, so an incremental and a full build leave the
	// same file.
	widths := map[string][]byte{}
	for _, p := range preps {
		// The key's and the year labels' widths too, which no step
		// before drawing asks for: else a rebuild that draws any page
		// parses a face again for the handful of them.
		p.Feature.MeasureFurniture()
		var buf bytes.Buffer
		if err := p.Fonts.SaveWidths(&buf); err == nil {
			widths[p.Spec.Name] = buf.Bytes()
		}
	}
	lentWidths := map[string][]byte{}
	for _, o := range lent {
		var buf bytes.Buffer
		if fs, err := job.Fonts(o); err == nil && fs.SaveWidths(&buf) == nil {
			lentWidths[o.Name] = buf.Bytes()
		}
	}
	// The findings' table is shown once per set of findings: a rebuild
	// that finds what the last build found says so instead.
	res.FindingsSum = findingsSum(findings)
	<-pre.manifestRead
	if rep, ok := opts.Progress.(FindingsRepeater); ok && pre.prev != nil && pre.prev.Findings == res.FindingsSum {
		rep.FindingsRepeated(findings)
	} else {
		opts.Progress.Findings(findings)
	}
	if (opts.Strict || spec.Preflight.Strict) && preflight.Stops(findings) {
		return res, ErrStrict
	}
	b := &build{ctx: ctx, j: job, final: final, shown: dir, date: opts.Date, only: opts.Only, noProofs: opts.NoProofs, full: opts.Full,
		progress: opts.Progress, hooks: opts.Hooks, widths: widths, lentWidths: lentWidths, pre: pre, sums: map[string]fileSum{}, insertPreps: inserts,
		findingsSum: res.FindingsSum, pages: pdf.NewPageEncoder(), terms: terms}
	files, err := b.run(preps)
	if err != nil {
		return res, err
	}
	res.Files, res.Changes, res.Left = files, b.changes, b.left
	return res, nil
}

// silent is the Progress of a build nobody watches.
type silent struct{}

func (silent) Findings([]preflight.Finding) {}
func (silent) Begin(string, int)            {}
func (silent) Step()                        {}
func (silent) Warn(string)                  {}

// FolderError says that the output folder is a file, or lies under
// one: the user meant a folder.
type FolderError struct {
	Dir  string // the output folder as given
	File string // the file in its way: Dir itself or a folder above it
}

func (e *FolderError) Error() string {
	switch e.File {
	case e.Dir:
		return fmt.Sprintf("%s is a file; give a folder", e.Dir)
	case "":
		return fmt.Sprintf("%s: a part of the path is a file; give a folder", e.Dir)
	}
	return fmt.Sprintf("%s: %s is a file; give a folder", e.Dir, e.File)
}

// checkOutDir refuses an output folder that is a file, or lies under
// one, before anything is read or written.
func checkOutDir(dir string) error {
	fi, err := os.Stat(dir)
	switch {
	case err == nil && !fi.IsDir():
		return &FolderError{Dir: dir, File: dir}
	case errors.Is(err, syscall.ENOTDIR):
		for p := filepath.Dir(dir); p != filepath.Dir(p); p = filepath.Dir(p) {
			if fi, err := os.Stat(p); err == nil && !fi.IsDir() {
				return &FolderError{Dir: dir, File: p}
			}
		}
		return &FolderError{Dir: dir}
	}
	return nil
}

// build is one run of `sheaf build`: everything is written into a stage
// folder beside the final one, then swapped in.
type build struct {
	ctx      context.Context
	j        *feature.Job
	final    string // DIR, absolute, a symbolic link followed
	shown    string // DIR as given, for the paths Build returns
	left     *LeftError
	stage    *stage
	date     time.Time
	only     string
	noProofs bool
	full     bool
	progress Progress
	hooks    Hooks

	prev         *Manifest
	specSum      string
	outputs      []OutputEntry
	insertPreps  []*feature.Insert // every insert of the spec, laid out
	inserts      []InsertEntry     // inserts built
	insertsBuilt bool
	meta         map[string]fileMeta // by file path relative to DIR
	stats        []OutputStats
	fonts        []FontHash
	changes      *ChangeReport
	widths       map[string][]byte // by output: its fonts' saved widths
	lentWidths   map[string][]byte // by output not built whose inserts were laid out
	pre          *prefetch
	terms        *termSet // hashed from the moment the data is read
	fontSums     fontSums
	sumsMu       sync.Mutex
	sums         map[string]fileSum // files this build wrote, by slash path relative to the stage
	stale        []string           // proofs a --no-proofs build did not keep (slash paths in DIR)
	findingsSum  string

	pages *pdf.PageEncoder // this build's: fonts read once for all pages
}

// fileMeta is what the manifest says of a file beside its hash: the
// pages it shows, its terms, its insert.
type fileMeta struct {
	pages  []PageEntry
	terms  []string
	insert string
}

// note records what a file of the stage shows, for the manifest.
func (b *build) note(path string, m fileMeta) { b.meta[rel(b.stage.dir, path)] = m }

// termSums maps every selected term to the hash of its data; it waits
// for the hashing started with the build.
func (b *build) termSums() map[string]string { return b.terms.get().byTerm }

// OutputStats counts what a build did for one output or insert.
type OutputStats struct {
	Output       string `json:"output"`           // the output, or the one an insert borrows
	Insert       string `json:"insert,omitempty"` // the insert's name
	Kind         string `json:"kind"`             // print, screen or insert
	Pages        int    `json:"pages"`
	Encoded      int    `json:"encoded"`       // pages drawn (and encoded)
	Reused       int    `json:"reused"`        // pages taken from the cache or the last build
	ProofsDrawn  int    `json:"proofs_drawn"`  // proofs rasterized
	ProofsReused int    `json:"proofs_reused"` // proofs kept from the last build
	// Bands of screen PNGs drawn and taken from the last build (see
	// bands.go); panel files drawn and reused.
	BandsDrawn   int `json:"bands_drawn,omitempty"`
	BandsReused  int `json:"bands_reused,omitempty"`
	PanelsDrawn  int `json:"panel_files_drawn,omitempty"`
	PanelsReused int `json:"panel_files_reused,omitempty"`
	// Whole says, for a screen output or an insert (made or kept whole),
	// "reused (inputs unchanged)" or "drawn (WHY)".
	Whole string `json:"whole,omitempty"`
}

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
func (b *build) keepAll(label string, want []string, old []*FileEntry) bool {
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
		b.progress.Begin(label, len(old))
	}
	ok := make([]bool, len(old))
	each(b.ctx, len(old), func(i int) (bool, error) {
		p := filepath.FromSlash(old[i].Path)
		kept := b.keep(filepath.Join(b.final, p), filepath.Join(b.stage.dir, p), old[i].SHA256)
		if label != "" {
			b.progress.Step()
		}
		return kept, nil
	}, func(i int, kept bool) error {
		ok[i] = kept
		return nil
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
func (b *build) run(preps []*feature.Output) (files []string, err error) {
	spec, err := os.ReadFile(b.j.Spec.File)
	if err != nil {
		return nil, err
	}
	b.specSum = sumBytes(spec)
	b.pre.wait()
	b.prev, err = b.pre.prev, b.pre.prevErr
	if err != nil {
		// A damaged manifest costs the change report and the cache, not the build.
		b.progress.Warn(fmt.Sprintf("ignoring the previous manifest: %v", err))
		b.prev = nil
	}
	outs := make([]*specs.Output, len(preps))
	for i, p := range preps {
		outs[i] = p.Spec
	}
	if err := b.checkCollisions(outs); err != nil {
		return nil, err
	}
	b.stage, err = newStage(b.final)
	if err != nil {
		return nil, err
	}
	committed := false
	defer func() {
		if !committed { // an error, or a panic on its way up
			b.stage.abort()
		}
	}()
	b.meta = map[string]fileMeta{}
	for _, p := range preps {
		if err := b.ctx.Err(); err != nil {
			return nil, err
		}
		var written []string
		if p.Spec.Kind == specs.Screen {
			written, err = b.buildScreen(p)
		} else {
			written, err = b.buildPrint(p)
		}
		if err != nil {
			return nil, fmt.Errorf("output %q: %w", p.Spec.Name, err)
		}
		if w, ok := b.widths[p.Spec.Name]; ok {
			err := WriteAtomic(filepath.Join(b.stage.dir, CacheDir, p.Spec.Name, widthsFile), func(f io.Writer) error {
				_, err := f.Write(w)
				return err
			})
			if err != nil {
				return nil, err
			}
		}
		b.fonts = append(b.fonts, b.fontSums.hashes(p.Spec.Name, p.Fonts)...)
		files = append(files, written...)
	}
	// Inserts are built here, into b.stage.dir, when the spec has them.
	if len(b.insertPreps) > 0 && (b.only == "" || feature.BorrowsOutput(b.j.Spec, b.only)) {
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
	// After carry, which brings the lent outputs' caches over: their
	// widths file is replaced, the rest of their cache kept.
	for _, name := range slices.Sorted(maps.Keys(b.lentWidths)) {
		w := b.lentWidths[name]
		if err := WriteAtomic(filepath.Join(b.stage.dir, CacheDir, name, widthsFile), func(f io.Writer) error {
			_, err := f.Write(w)
			return err
		}); err != nil {
			return nil, err
		}
	}
	m, err := b.manifest()
	if err != nil {
		return nil, err
	}
	// What is not sheaf's inside its folders, after the manifest: it is
	// never listed as sheaf's.
	if err := b.carryInside(); err != nil {
		return nil, err
	}
	// The manifest is written while the change report is made from it.
	wrote := make(chan error, 1)
	go func() {
		wrote <- WriteAtomic(filepath.Join(b.stage.dir, ManifestFile), func(w io.Writer) error {
			j, err := appendManifest(nil, m)
			if err == nil {
				_, err = w.Write(j)
			}
			return err
		})
	}()
	b.changes = compareManifests(b.prev, m, b.stats)
	sort.Strings(b.stale)
	b.changes.Stale = append(b.changes.Stale, b.stale...)
	if err := <-wrote; err != nil {
		return nil, err
	}
	if err := writeJSONFile(filepath.Join(b.stage.dir, ChangesJSON), b.changes); err != nil {
		return nil, err
	}
	if err := WriteAtomic(filepath.Join(b.stage.dir, ChangesText), b.changes.WriteText); err != nil {
		return nil, err
	}
	if err := b.ctx.Err(); err != nil {
		return nil, err
	}
	if h := b.hooks.BeforeCommit; h != nil {
		if err := h(b.stage.dir); err != nil {
			return nil, err
		}
	}
	left, err := b.stage.commit()
	if err != nil {
		return nil, err
	}
	committed = true
	if left != nil {
		b.left = left
		b.progress.Warn(left.Error())
	}
	for i, f := range files {
		if rel, err := filepath.Rel(b.stage.dir, f); err == nil && !strings.HasPrefix(rel, "..") {
			files[i] = filepath.Join(b.shown, rel)
		}
	}
	return files, nil
}

// entryOf lists an output's pages with their terms and input hashes.
func (b *build) entryOf(p *feature.Output, dpi float64) (OutputEntry, error) {
	e := OutputEntry{Name: p.Spec.Name, Kind: string(p.Spec.Kind), Proofs: dpi}
	if len(p.Plan.Pages) == 0 {
		return e, nil
	}
	fontSum := b.fontSums.sum(p.Fonts)
	termSums := b.terms.get().bySeries
	e.Pages = make([]PageEntry, len(p.Plan.Pages))
	err := each(b.ctx, len(e.Pages), func(i int) (PageEntry, error) {
		return PageEntry{Page: i + 1, Terms: pageTerms(b.j, p, i),
			Inputs: pageInputs(b.j, p, i, b.setup(p, i), b.specSum, fontSum, termSums)}, nil
	}, func(i int, pe PageEntry) error {
		e.Pages[i] = pe
		return nil
	})
	return e, err
}

// PageBoxes converts a layout page's boxes for the PDF writer.
func PageBoxes(pg *layout.Page) pdf.PageBoxes {
	r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
	return pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}
}

// setup is page i's boxes, marks and slug line. Screen pages have none.
func (b *build) setup(p *feature.Output, i int) pdf.PageSetup {
	if p.Spec.Kind != specs.Print {
		return pdf.PageSetup{}
	}
	out := p.Spec
	pg := &p.Plan.Pages[i]
	setup := pdf.PageSetup{Boxes: PageBoxes(pg), Press: p.Press}
	if out.Marks {
		// The layout's crop-mark geometry (layout.CropMarks), which
		// `sheaf check --json` reports: what the PDF draws.
		setup.Marks = &pdf.MarkOptions{Offset: p.Plan.MarkOffset, Length: p.Plan.MarkLength}
	}
	if out.SlugLine {
		if setup.Marks == nil {
			setup.Marks = &pdf.MarkOptions{SlugOnly: true}
		}
		setup.Slug = fmt.Sprintf("%s · %s · page %d of %d · %s", b.j.Spec.Title, out.Name, i+1, len(p.Plan.Pages), b.date.Format("2006-01-02"))
	}
	return setup
}

// buildPrint writes the PDF, the proofs and the contact sheet of a print
// output into the stage and returns the files written.
func (b *build) buildPrint(p *feature.Output) ([]string, error) {
	out := p.Spec
	dpi := 0.0
	if !b.noProofs {
		dpi = p.Spec.Proofs
		if dpi <= 0 {
			dpi = 100
		}
	}
	entry, err := b.entryOf(p, dpi)
	if err != nil {
		return nil, err
	}
	st := OutputStats{Output: out.Name, Kind: string(out.Kind), Pages: len(entry.Pages)}
	odir := filepath.Join(b.stage.dir, out.Name)
	pdfPath := filepath.Join(odir, out.Name+".pdf")
	// Pages go into the PDF as they are ready, in order, while later ones
	// are still being drawn.
	// The PDF writer hashes what it writes (for the /ID): its digest is
	// the manifest's, so the 10 MB are hashed once.
	var encErr error
	var pw *pdf.Writer
	err = WriteAtomic(pdfPath, func(w io.Writer) error {
		pw = pdf.NewWriter(w, pdf.Options{Title: b.j.Spec.Title, Version: Version, Date: b.date, Press: p.Press})
		// Pages from the cache name their fonts by hash only.
		for _, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic} {
			if _, err := pw.RegisterFont(p.Fonts.Font(st)); err != nil {
				return err
			}
		}
		if encErr = b.encodePages(p, entry.Pages, &st, pw.AddEncoded); encErr != nil {
			return encErr
		}
		return pw.Close()
	})
	if encErr != nil {
		return nil, encErr
	}
	if err != nil {
		return nil, err
	}
	sum, size, err := pw.Digest()
	if err != nil {
		return nil, err
	}
	b.known(pdfPath, fileSum{hex.EncodeToString(sum[:]), size})
	b.note(pdfPath, fileMeta{pages: entry.Pages})
	files := []string{pdfPath}
	if b.noProofs {
		kept, keptDPI := b.keepProofs(p, entry.Pages, odir, &st)
		files = append(files, kept...)
		if len(kept) > 0 {
			entry.Proofs = keptDPI
		}
	}
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
// cache. It stops at add's first error and returns it.
func (b *build) encodePages(p *feature.Output, pages []PageEntry, st *OutputStats, add func(*pdf.EncodedPage) error) error {
	out := p.Spec.Name
	oldCache := filepath.Join(b.final, CacheDir, out)
	newCache := filepath.Join(b.stage.dir, CacheDir, out)
	if err := os.MkdirAll(newCache, 0o755); err != nil {
		return err
	}
	var encodedN, reusedN atomic.Int64
	b.progress.Begin(out+": PDF pages", len(pages))
	err := each(b.ctx, len(pages), func(i int) (*pdf.EncodedPage, error) {
		defer b.progress.Step()
		name := pages[i].Inputs + ".page"
		if !b.full {
			if e, ok := b.reuse(filepath.Join(oldCache, name), filepath.Join(newCache, name)); ok {
				reusedN.Add(1)
				return e, nil
			}
		}
		encodedN.Add(1)
		e, err := b.encode(p, i)
		if err == nil {
			err = WriteAtomic(filepath.Join(newCache, name), func(w io.Writer) error { return writeCachedPage(w, e) })
		}
		if err != nil {
			return nil, fmt.Errorf("page %d: %w", i+1, err)
		}
		return e, nil
	}, func(_ int, e *pdf.EncodedPage) error { return add(e) })
	st.Encoded, st.Reused = int(encodedN.Load()), int(reusedN.Load())
	return err
}

// encode draws and encodes page i.
func (b *build) encode(p *feature.Output, i int) (*pdf.EncodedPage, error) {
	if h := b.hooks.BeforeEncode; h != nil {
		if err := h(p.Spec.Name, i+1); err != nil {
			return nil, err
		}
	}
	return b.pages.Encode(b.setup(p, i), func(c *canvas.Canvas) error { return p.Feature.Draw(canvas.NewContext(draw.Recording{Canvas: c}), i) })
}

// widthsFile holds an output's text widths between builds (see
// fonts.Set.SaveWidths), beside its cached pages.
const widthsFile = "text-widths"

// ReuseWidths gives the fonts of every output of job the text widths
// the last build into dir saved (fonts.Set.SaveWidths), for a caller that
// lays the outputs out without building, as `check` does: what the build
// measured is then read, not shaped, and every other width is measured
// as usual. The widths are the very float64s measured for the same font
// bytes and shaping code (LoadWidths refuses any other), so the layout is
// the one made without them. A folder that holds no build, a missing,
// damaged or outdated file and fonts that do not load (Prepare reports
// those) change nothing. It returns the outputs that got widths.
func ReuseWidths(job *feature.Job, dir string) []string {
	final, err := resolveOut(dir)
	if err != nil {
		return nil
	}
	var got []string
	for i := range job.Spec.Outputs {
		o := &job.Spec.Outputs[i]
		fs, err := job.Fonts(o)
		if err == nil && loadWidths(final, o.Name, fs) {
			got = append(got, o.Name)
		}
	}
	return got
}

// loadWidths gives an output's fonts the widths the last build saved. A missing,
// damaged or outdated file costs only the time to measure again.
func loadWidths(dir, output string, fs *fonts.Set) bool {
	f, err := os.Open(filepath.Join(dir, CacheDir, output, widthsFile))
	if err != nil {
		return false
	}
	defer f.Close()
	return fs.LoadWidths(f) == nil
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

// pageLoader gives the content streams of checked cached pages as the
// PDF writer asks for them, one at a time, through one buffer: holding
// all of them (11 MB for the 4,000-term catalog) cost more in fresh
// memory than reading each page file a second time from the OS's cache.
type pageLoader struct{ buf []byte }

// check reads the cached page at path into buf (returned, grown, for the
// next) and decodes it, leaving its content to be read again when the
// page is written; nil when the file is missing, unreadable or damaged.
func (l *pageLoader) check(path string, buf []byte) (*pdf.EncodedPage, []byte) {
	data, err := readInto(path, buf)
	if err != nil {
		return nil, buf
	}
	e, off, err := decodePage(data)
	if err != nil || len(e.Content) == 0 {
		return nil, data
	}
	n, size, sum := len(e.Content), len(data), binary.LittleEndian.Uint32(data[len(data)-4:])
	e.Content = nil
	e.Load = func() ([]byte, error) { return l.load(path, size, sum, off, n) }
	return e, data
}

// load reads the page file again and gives its content stream, after
// checking the file is the one check decoded: same size and a body that
// matches the same CRC-32C. A file changed in between (which only
// another program writing into the cache can do) fails the build rather
// than putting a page nobody checked into the PDF.
func (l *pageLoader) load(path string, size int, sum uint32, off, n int) ([]byte, error) {
	data, err := readInto(path, l.buf)
	if err != nil {
		return nil, fmt.Errorf("cached page %s: %w", path, err)
	}
	l.buf = data
	if len(data) != size || binary.LittleEndian.Uint32(data[size-4:]) != sum || crc32.Checksum(data[:size-4], castagnoli) != sum {
		return nil, fmt.Errorf("cached page %s changed during the build", path)
	}
	return data[off : off+n], nil
}

// readInto reads the regular file at path into buf's memory, grown when
// it is too small.
func readInto(path string, buf []byte) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !fi.Mode().IsRegular() || fi.Size() > maxCachedPage {
		return nil, fmt.Errorf("%s: not a cached page", path)
	}
	size := int(fi.Size())
	if cap(buf) < size {
		buf = make([]byte, size, size+size/4)
	}
	buf = buf[:size]
	if _, err := io.ReadFull(f, buf); err != nil {
		return nil, err
	}
	// One byte more means the file grew since Stat: not the file measured.
	var one [1]byte
	if k, _ := f.Read(one[:]); k != 0 {
		return nil, fmt.Errorf("%s: changed while read", path)
	}
	return buf, nil
}

// maxCachedPage bounds a page file's size: a page's content stream is
// tens or hundreds of KB; anything near this is not one of ours.
const maxCachedPage = 1 << 30

// prefetch reads, beside the data, what a build needs from the last one:
// its manifest, the SHA-256 of the data files and, unless the build is
// full, the cached pages the manifest lists, decoded. The data read is one
// core's work; this is the other's.
type prefetch struct {
	done         chan struct{}
	warmed       chan string   // closed when the first work is done; a panic in it, with its stack, first
	manifestRead chan struct{} // closed when prev and prevErr are set
	stopped      atomic.Bool
	prev         *Manifest
	prevErr      error
	data         map[string]fileSum          // by resolved path
	pages        map[string]*pdf.EncodedPage // by cache file path; nil for a damaged one
}

type fileSum struct {
	sum  string
	size int64
}

// startPrefetch starts the reading; first (when not nil) runs before it,
// on the same goroutine: one goroutine beside the build's keeps the build
// its core.
func startPrefetch(dir string, s *specs.Spec, pages bool, first func()) *prefetch {
	p := &prefetch{done: make(chan struct{}), warmed: make(chan string, 1), manifestRead: make(chan struct{}), data: map[string]fileSum{}, pages: map[string]*pdf.EncodedPage{}}
	go func() {
		defer close(p.done)
		func() {
			defer func() {
				if r := recover(); r != nil {
					p.warmed <- fmt.Sprintf("%v\n\nin the goroutine reading beside the data:\n%s", r, debug.Stack())
				}
				close(p.warmed)
			}()
			if first != nil {
				first()
			}
		}()
		p.prev, p.prevErr = ReadManifest(dir)
		close(p.manifestRead)
		if p.stopped.Load() {
			return
		}
		for _, d := range []string{s.Data.Counts, s.Data.Totals} {
			path := s.Resolve(d)
			// Only a regular file: a FIFO or a device would keep this
			// reading after the data loader has refused it.
			if fi, err := os.Stat(path); err != nil || !fi.Mode().IsRegular() {
				continue
			}
			if sum, size, err := sumFile(path); err == nil {
				p.data[path] = fileSum{sum, size}
			}
		}
		if !pages || p.prev == nil {
			return
		}
		var buf []byte
		for _, o := range p.prev.Outputs {
			if o.Kind != string(specs.Print) {
				continue
			}
			l := &pageLoader{} // an output's PDF is written by one goroutine
			for _, pg := range o.Pages {
				if p.stopped.Load() {
					return
				}
				path := filepath.Join(dir, CacheDir, o.Name, pg.Inputs+".page")
				p.pages[path], buf = l.check(path, buf)
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
func (b *build) writeProofs(p *feature.Output, pages []PageEntry, dpi float64, odir string, st *OutputStats) ([]string, error) {
	n := len(pages)
	prevOut := b.prev.Output(p.Spec.Name)
	files := make([]string, n)
	fresh := make([]image.Image, n) // drawn this build; nil when kept
	b.progress.Begin(p.Spec.Name+": proofs", n)
	var draw []int // pages whose proof is drawn
	for i := range n {
		path := filepath.Join(odir, "proofs", fmt.Sprintf("page-%03d.png", i+1))
		files[i] = path
		relp := rel(b.stage.dir, path)
		b.note(path, fileMeta{pages: pages[i : i+1]})
		if !b.full && prevOut != nil && prevOut.Proofs == dpi {
			if old := b.prev.File(relp); old != nil && len(old.Pages) == 1 && old.Pages[0].Inputs == pages[i].Inputs {
				if b.keep(filepath.Join(b.final, relp), path, old.SHA256) {
					st.ProofsReused++
					b.progress.Step()
					continue
				}
			}
		}
		draw = append(draw, i)
	}
	st.ProofsDrawn = len(draw)
	err := each(b.ctx, len(draw), func(k int) (struct{}, error) {
		defer b.progress.Step()
		i := draw[k]
		pg := &p.Plan.Pages[i]
		region := raster.RegionOf(pg.Media.H(), dpi, pg.Trim.X0, pg.Trim.Y0, pg.Trim.X1, pg.Trim.Y1)
		trim, err := b.rasterize(files[i], func() (*image.RGBA, error) {
			// With a printing condition the proof is a soft proof: colours
			// as the press prints them.
			return raster.ProofRegionContext(b.ctx, pg.Media.H(), dpi, region, p.Feature.PaperColor(), p.Press, func(ctx *canvas.Context) error {
				return p.Feature.Draw(ctx, i)
			})
		})
		if err != nil {
			return struct{}{}, err
		}
		if err := b.writeHashed(files[i], func(w io.Writer) error { return raster.WritePNGContext(b.ctx, w, trim) }); err != nil {
			return struct{}{}, err
		}
		fresh[i] = trim
		return struct{}{}, nil
	}, nil)
	if err != nil {
		return nil, err
	}
	cpath := filepath.Join(odir, "contact.png")
	files = append(files, cpath)
	crel := rel(b.stage.dir, cpath)
	b.note(cpath, fileMeta{pages: pages})
	if st.ProofsDrawn == 0 && prevOut != nil && samePages(prevOut.Pages, pages) {
		if old := b.prev.File(crel); old != nil && b.keep(filepath.Join(b.final, crel), cpath, old.SHA256) {
			for _, pg := range pages { // keep the thumbnails for the next build
				name := fmt.Sprintf("%s-%g.thumb.png", pg.Inputs, dpi)
				linkOrCopy(filepath.Join(b.final, CacheDir, p.Spec.Name, name), filepath.Join(b.stage.dir, CacheDir, p.Spec.Name, name))
			}
			return files, nil
		}
	}
	// Thumbnails are cached beside the pages: scaling 84 proofs down costs
	// more than the one page that changed.
	thumbs := make([]image.Image, n)
	err = each(b.ctx, n, func(i int) (image.Image, error) {
		return b.thumbnail(p.Spec.Name, pages[i].Inputs, dpi, fresh[i], files[i])
	}, func(i int, t image.Image) error {
		thumbs[i] = t
		return nil
	})
	if err != nil {
		return nil, err
	}
	right := make([]bool, len(p.Plan.Pages))
	for i := range p.Plan.Pages {
		right[i] = p.Plan.Pages[i].Right
	}
	sheet := contact.Spreads(thumbs, right, 2) // facing pages as the reader sees them
	if err := b.writeHashed(cpath, func(w io.Writer) error { return raster.WritePNGContext(b.ctx, w, sheet) }); err != nil {
		return nil, err
	}
	return files, nil
}

// keepProofs is --no-proofs: nothing is drawn, but the last build's
// proofs of pages whose inputs did not change are kept, and its contact
// sheet when every page is as it was. The others no longer show their
// pages: they are left out (removed with the swap) and listed as stale.
// It returns the files kept (stage paths) and their resolution.
func (b *build) keepProofs(p *feature.Output, pages []PageEntry, odir string, st *OutputStats) ([]string, float64) {
	prevOut := b.prev.Output(p.Spec.Name)
	if prevOut == nil || prevOut.Proofs <= 0 || b.full {
		for _, f := range b.prev.FilesOf(p.Spec.Name, "") {
			if strings.HasSuffix(f.Path, ".png") {
				b.stale = append(b.stale, f.Path)
			}
		}
		return nil, 0
	}
	dpi := prevOut.Proofs
	var kept []string
	keptAll := len(pages) == len(prevOut.Pages)
	want := map[string]bool{}
	for i := range pages {
		path := filepath.Join(odir, "proofs", fmt.Sprintf("page-%03d.png", i+1))
		relp := rel(b.stage.dir, path)
		want[relp] = true
		old := b.prev.File(relp)
		if old != nil && len(old.Pages) == 1 && old.Pages[0].Inputs == pages[i].Inputs &&
			b.keep(filepath.Join(b.final, relp), path, old.SHA256) {
			b.note(path, fileMeta{pages: pages[i : i+1]})
			kept = append(kept, path)
			st.ProofsReused++
			continue
		}
		keptAll = false
	}
	cpath := filepath.Join(odir, "contact.png")
	crel := rel(b.stage.dir, cpath)
	want[crel] = keptAll
	if old := b.prev.File(crel); keptAll && old != nil && samePages(prevOut.Pages, pages) &&
		b.keep(filepath.Join(b.final, crel), cpath, old.SHA256) {
		b.note(cpath, fileMeta{pages: pages})
		kept = append(kept, cpath)
		for _, pg := range pages { // the thumbnails, for the next build with proofs
			name := fmt.Sprintf("%s-%g.thumb.png", pg.Inputs, dpi)
			linkOrCopy(filepath.Join(b.final, CacheDir, p.Spec.Name, name), filepath.Join(b.stage.dir, CacheDir, p.Spec.Name, name))
		}
	} else {
		want[crel] = false
	}
	for _, f := range b.prev.FilesOf(p.Spec.Name, "") {
		if strings.HasSuffix(f.Path, ".png") && !want[f.Path] || want[f.Path] && !b.stageHas(f.Path) {
			b.stale = append(b.stale, f.Path)
		}
	}
	return kept, dpi
}

// stageHas reports whether the stage holds the file (slash path).
func (b *build) stageHas(relp string) bool {
	b.sumsMu.Lock()
	defer b.sumsMu.Unlock()
	_, ok := b.sums[relp]
	return ok
}

// rasterize runs the BeforeRaster hook for file, then draw.
func (b *build) rasterize(file string, draw func() (*image.RGBA, error)) (*image.RGBA, error) {
	if h := b.hooks.BeforeRaster; h != nil {
		if err := h(file); err != nil {
			return nil, err
		}
	}
	return draw()
}

// thumbnail returns a page's contact-sheet thumbnail: from the previous
// build's cache when the page and resolution are the same, else scaled
// from the proof (drawn now, or read back from its PNG, which holds the
// same pixels) and cached.
func (b *build) thumbnail(output, inputs string, dpi float64, img image.Image, proof string) (image.Image, error) {
	name := fmt.Sprintf("%s-%g.thumb.png", inputs, dpi)
	old := filepath.Join(b.final, CacheDir, output, name)
	cur := filepath.Join(b.stage.dir, CacheDir, output, name)
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
	if err := WriteAtomic(cur, func(w io.Writer) error { return raster.WritePNG(w, t) }); err != nil {
		return nil, err
	}
	return t, nil
}

func samePages(a, b []PageEntry) bool {
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

// writeHashed is WriteAtomic that also hashes what it writes, so that the
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
	err := WriteAtomic(path, func(w io.Writer) error {
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
func (b *build) manifest() (*Manifest, error) {
	s := b.j.Spec
	m := &Manifest{Sheaf: Version, Spec: FileHash{Path: filepath.Base(s.File), SHA256: b.specSum}, Findings: b.findingsSum}
	for _, d := range []string{s.Data.Counts, s.Data.Totals} {
		fs, ok := b.pre.data[s.Resolve(d)]
		if !ok {
			sum, size, err := sumFile(s.Resolve(d))
			if err != nil {
				return nil, err
			}
			fs = fileSum{sum, size}
		}
		m.Data = append(m.Data, FileHash{Path: d, SHA256: fs.sum})
	}
	m.Terms = b.terms.get().list
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
		if strings.HasPrefix(name, ".") || name == ManifestFile || name == ChangesJSON || name == ChangesText || b.stage.foreign[name] {
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
				if old := b.prev.File(fs[i].Path); old != nil {
					fs[i].Pages, fs[i].Terms, fs[i].Insert = old.Pages, old.Terms, old.Insert
				} else {
					fs[i].Path = "" // carried with an output kept (--only), not sheaf's
				}
			}
		}
		fs = slices.DeleteFunc(fs, func(f FileEntry) bool { return f.Path == "" })
		m.Files = append(m.Files, fs...)
	}
	sort.Slice(m.Files, func(i, j int) bool { return m.Files[i].Path < m.Files[j].Path })
	return m, nil
}
