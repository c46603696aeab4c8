package svg

import (
	"bytes"
	"math"

	"github.com/tdewolff/canvas"
)

// writePathData writes p (already in px, y down, arcs replaced) as SVG
// path data: every point snapped to the 0.1 px grid, a subpath started
// with an absolute M and continued with relative commands (h and v for
// axis-parallel lines), repeated command letters left out and numbers
// packed as the path grammar allows ("1.5-2", ".5.5"). Offsets are taken
// between snapped points, so rounding never accumulates along a long line.
func writePathData(b *bytes.Buffer, p *canvas.Path) {
	w := pathWriter{b: b}
	var cur, start, prev2 [2]int64
	smooth := false // the last segment was a cubic; prev2 is its second control point
	snap := func(pt canvas.Point) [2]int64 {
		return [2]int64{int64(math.Round(pt.X * 10)), int64(math.Round(pt.Y * 10))}
	}
	for s := p.Scanner(); s.Scan(); {
		afterCubic := smooth
		smooth = false
		switch s.Cmd() {
		case canvas.MoveToCmd:
			e := snap(s.End())
			w.cmd('M', true)
			w.num(e[0])
			w.num(e[1])
			cur, start = e, e
		case canvas.LineToCmd:
			e := snap(s.End())
			dx, dy := e[0]-cur[0], e[1]-cur[1]
			switch {
			case dy == 0 && dx != 0:
				w.cmd('h', false)
				w.num(dx)
			case dx == 0 && dy != 0:
				w.cmd('v', false)
				w.num(dy)
			default:
				w.cmd('l', false)
				w.num(dx)
				w.num(dy)
			}
			cur = e
		case canvas.QuadToCmd:
			c1, e := snap(s.CP1()), snap(s.End())
			w.cmd('q', false)
			w.num(c1[0] - cur[0])
			w.num(c1[1] - cur[1])
			w.num(e[0] - cur[0])
			w.num(e[1] - cur[1])
			cur = e
		case canvas.CubeToCmd:
			c1, c2, e := snap(s.CP1()), snap(s.CP2()), snap(s.End())
			// A curve that leaves a point along the tangent it arrived on
			// (a C¹ spline such as the monotone cubic through yearly
			// values) may omit its first control point: s reflects the
			// previous one. The reflection is allowed to miss the snapped
			// point by one grid step (0.1 px), which moves the curve by
			// less than that.
			if afterCubic && abs64(2*cur[0]-prev2[0]-c1[0]) <= 1 && abs64(2*cur[1]-prev2[1]-c1[1]) <= 1 {
				w.cmd('s', false)
			} else {
				w.cmd('c', false)
				w.num(c1[0] - cur[0])
				w.num(c1[1] - cur[1])
			}
			w.num(c2[0] - cur[0])
			w.num(c2[1] - cur[1])
			w.num(e[0] - cur[0])
			w.num(e[1] - cur[1])
			cur, prev2, smooth = e, c2, true
		case canvas.CloseCmd:
			w.cmd('z', true)
			cur = start
		}
	}
}

type pathWriter struct {
	b       *bytes.Buffer
	last    byte // last command letter written
	prevNum bool // the last token was a number
	prevDot bool // ... and it held a decimal point
	tmp     []byte
}

// cmd writes a command letter unless it repeats the last one and may be
// implied (always for M and z).
func (w *pathWriter) cmd(c byte, always bool) {
	if !always && c == w.last {
		return
	}
	w.b.WriteByte(c)
	w.last = c
	w.prevNum = false
}

// num writes n/10 with the least separation the grammar needs.
func (w *pathWriter) num(n int64) {
	w.tmp = appendTenths(w.tmp[:0], n, true)
	t := w.tmp
	if w.prevNum && t[0] != '-' && !(t[0] == '.' && w.prevDot) {
		w.b.WriteByte(' ')
	}
	w.b.Write(t)
	w.prevNum = true
	w.prevDot = bytes.IndexByte(t, '.') >= 0
}

func abs64(v int64) int64 {
	if v < 0 {
		return -v
	}
	return v
}
