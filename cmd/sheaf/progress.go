package main

import (
	"fmt"
	"io"
	"os"
	"sync"
	"time"

	"sheaf/render/preflight"
)

// maxFindingsShown bounds the preflight table on stderr; `sheaf check
// --json` lists every finding.
const maxFindingsShown = 40

// progress shows "OUTPUT: STAGE done/total" on one line of a terminal
// while a build runs longer than progressDelay: PDF pages, proofs, a
// screen output's SVG pages, PNGs and panel files, files carried over,
// and the inserts. It is silent when stderr
// is not a terminal (piped, redirected, in tests) or with --quiet. The
// clock it reads decides only when to draw the line, never any output.
type progress struct {
	w     io.Writer
	on    bool
	start time.Time
	now   func() time.Time

	mu          sync.Mutex
	label       string
	done_, all  int
	shown, last time.Time
	width       int
}

// Delays of the progress line: shown after a second, redrawn at most
// ten times a second.
const (
	progressDelay = time.Second
	progressEvery = 100 * time.Millisecond
)

func newProgress(w io.Writer, quiet bool) *progress {
	return &progress{w: w, on: !quiet && isTerminal(w), start: time.Now(), now: time.Now}
}

// progressFor makes a build's progress line: newProgress, but a test may
// put in one that draws without a terminal.
var progressFor = newProgress

// isTerminal reports whether w is a character device: a terminal.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	fi, err := f.Stat()
	if err != nil || fi.Mode()&os.ModeCharDevice == 0 {
		return false
	}
	// The null device is a character device too, but no one reads it.
	if null, err := os.Stat(os.DevNull); err == nil && os.SameFile(fi, null) {
		return false
	}
	return true
}

// Begin starts counting a stage of total steps.
func (p *progress) Begin(label string, total int) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.label, p.done_, p.all = label, 0, total
	p.draw(true)
}

// Step counts one step done. Safe for concurrent use.
func (p *progress) Step() {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.done_++
	p.draw(p.done_ == p.all)
}

func (p *progress) draw(force bool) {
	if !p.on {
		return
	}
	now := p.now()
	if now.Sub(p.start) < progressDelay || !force && now.Sub(p.last) < progressEvery {
		return
	}
	p.last = now
	line := fmt.Sprintf("%s %d/%d", p.label, p.done_, p.all)
	pad := max(0, p.width-len(line))
	fmt.Fprintf(p.w, "\r%s%*s", line, pad, "")
	p.width = len(line)
	p.shown = now
}

// Warn prints a warning on its own line.
func (p *progress) Warn(msg string) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.clear()
	fmt.Fprintln(p.w, "sheaf build: warning:", msg)
}

// Findings prints preflight's findings as a table.
func (p *progress) Findings(fs []preflight.Finding) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.clear()
	preflight.WriteTable(p.w, fs, maxFindingsShown)
}

// FindingsRepeated says in one line that preflight found what the last
// build found, instead of printing the same table again.
func (p *progress) FindingsRepeated(fs []preflight.Finding) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.clear()
	if len(fs) == 0 {
		return
	}
	fmt.Fprintf(p.w, "%s, as in the last build (sheaf check lists them)\n", preflight.CountLine(fs))
}

// clear removes the line, if one is shown, so that text can follow.
func (p *progress) clear() {
	if p.on && !p.shown.IsZero() && p.width > 0 {
		fmt.Fprintf(p.w, "\r%*s\r", p.width, "")
		p.width = 0
	}
}

// done clears the line, if one was drawn.
func (p *progress) done() {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.clear()
}
