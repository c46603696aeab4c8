package main

import (
	"bytes"
	"encoding/json"
	"math"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/pdfcpu/pdfcpu/pkg/api"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestCropMarksAsReported: the crop marks the PDF draws are the ones
// `sheaf check --json` reports (mark_offset, mark_length beside the trim
// box), read back from page 1's content stream with pdfcpu v0.15.0 (a
// general-purpose PDF library). The expected offsets are the one rule,
// layout.CropMarks (common practice, print-facts.md "Crop marks"):
// max(bleed + 1 mm, 3 mm) outside the trim, 6 mm long.
func TestCropMarksAsReported(t *testing.T) {
	const mm = 72 / 25.4
	for _, c := range []struct {
		bleed  string
		offset float64 // mm, by the rule
	}{
		{"3mm", 4}, // the default bleed: 1 mm beyond it
		{"5mm", 6}, // a wider bleed: the marks move out with it
		{"0mm", 3}, // no bleed: 3 mm clear of the trim
	} {
		t.Run("bleed "+c.bleed, func(t *testing.T) {
			spec := newJob(t, strings.Replace(jobSpec(""), "    kind: print\n", "    kind: print\n    bleed: "+c.bleed+"\n    slug: 12mm\n", 1))
			var o, e bytes.Buffer
			require.Equal(t, exitOK, run([]string{"check", spec, "--json"}, &o, &e), e.String())
			var rep struct {
				Outputs []struct {
					Layout struct {
						MarkOffset float64 `json:"mark_offset"`
						MarkLength float64 `json:"mark_length"`
						Pages      []struct {
							Trim [4]float64 `json:"trim"`
						} `json:"pages"`
					} `json:"layout"`
				} `json:"outputs"`
			}
			require.NoError(t, json.Unmarshal(o.Bytes(), &rep))
			lay := rep.Outputs[0].Layout
			assert.InDelta(t, c.offset*mm, lay.MarkOffset, 0.001, "check --json mark_offset")
			assert.InDelta(t, 6*mm, lay.MarkLength, 0.001, "check --json mark_length")

			out := filepath.Join(t.TempDir(), "out")
			buildInto(t, spec, out, "--no-proofs", "--quiet")
			ctx, err := api.ReadContextFile(filepath.Join(out, "print", "print.pdf"))
			require.NoError(t, err)
			d, _, _, err := ctx.PageDict(1, false)
			require.NoError(t, err)
			content, err := ctx.PageContent(d, 1)
			require.NoError(t, err)

			trim := lay.Pages[0].Trim
			outside := func(x, y float64) bool {
				return x < trim[0]-0.001 || x > trim[2]+0.001 || y < trim[1]-0.001 || y > trim[3]+0.001
			}
			// "x0 y0 m x1 y1 l S": a stroked segment (ISO 32000-1 §8.5.2);
			// the marks are the segments wholly outside the trim.
			seg := regexp.MustCompile(`(-?[\d.]+) (-?[\d.]+) m (-?[\d.]+) (-?[\d.]+) l S`)
			var marks int
			for _, m := range seg.FindAllSubmatch(content, -1) {
				var v [4]float64
				for i := range v {
					v[i], _ = strconv.ParseFloat(string(m[i+1]), 64)
				}
				if !outside(v[0], v[1]) || !outside(v[2], v[3]) {
					continue
				}
				marks++
				length := math.Hypot(v[2]-v[0], v[3]-v[1])
				assert.InDelta(t, lay.MarkLength, length, 0.002, "mark %v length", v)
				// Along a trim line; its near end mark_offset from the trim.
				var near float64
				switch {
				case v[0] == v[2] && (math.Abs(v[0]-trim[0]) < 0.001 || math.Abs(v[0]-trim[2]) < 0.001):
					near = math.Min(dist1(v[1], trim[1], trim[3]), dist1(v[3], trim[1], trim[3]))
				case v[1] == v[3] && (math.Abs(v[1]-trim[1]) < 0.001 || math.Abs(v[1]-trim[3]) < 0.001):
					near = math.Min(dist1(v[0], trim[0], trim[2]), dist1(v[2], trim[0], trim[2]))
				default:
					assert.Fail(t, "mark not on a trim line", "mark %v, trim %v", v, trim)
					continue
				}
				assert.InDelta(t, lay.MarkOffset, near, 0.002, "mark %v starts off the reported offset", v)
			}
			assert.Equal(t, 8, marks, "two marks per trim corner")
		})
	}
}

// dist1 is how far v lies outside the interval [lo, hi].
func dist1(v, lo, hi float64) float64 {
	return math.Max(lo-v, v-hi)
}
