package insert

import (
	"regexp"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/specs"
)

// roomRE reads how much more room an error asks for: "at least about
// W × H more" (overlay) or "at least about W wider and H taller" (rows),
// in the output's unit (px on screen, mm in print; README, Inserts: "an
// error saying how much more room the insert needs").
var roomRE = regexp.MustCompile(`at least about ([0-9.]+) (px|mm)(?: × | wider and )([0-9.]+) (px|mm)(?: more| taller)`)

// TestTooSmallSaysHowMuchMore: an insert too small for its plot is an
// error that names the insert and says how much more width and height it
// needs; that is the real shortfall: grown by the amounts (plus the
// message's rounding, 0.01 px or 0.05 mm) it fits, grown by them less a
// little on the axis that is short it still does not.
func TestTooSmallSaysHowMuchMore(t *testing.T) {
	tests := []struct {
		name    string
		kind    specs.Kind
		compare specs.Compare
		w, h    specs.Length // in points
	}{
		{"overlay, screen", specs.Screen, specs.CompareOverlay, 60, 40},
		{"overlay, screen, only too short", specs.Screen, specs.CompareOverlay, 400, 60},
		{"rows, screen", specs.Screen, specs.CompareRows, 60, 40},
		{"rows, screen, only too narrow", specs.Screen, specs.CompareRows, 90, 300},
		{"overlay, print", specs.Print, specs.CompareOverlay, 50 * specs.PtPerMm, 25 * specs.PtPerMm},
		{"rows, print", specs.Print, specs.CompareRows, 40 * specs.PtPerMm, 30 * specs.PtPerMm},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			build := func(w, h specs.Length) error {
				out := specs.DefaultOutput("o", tt.kind)
				s := &specs.Spec{Title: "T"}
				in := &specs.Insert{Name: "tiny", Output: "o", Size: specs.Size{W: w, H: h}, Compare: tt.compare}
				fs, err := fonts.Load(s, &out)
				require.NoError(t, err)
				pal, err := palette.NewScale("test", palette.DefaultAnchors(1900, 1905), nil)
				require.NoError(t, err)
				_, err = New(s, in, &out, testSet(), pal, fs)
				return err
			}
			err := build(tt.w, tt.h)
			require.Error(t, err)
			assert.Contains(t, err.Error(), `insert "tiny"`)
			m := roomRE.FindStringSubmatch(err.Error())
			require.NotNil(t, m, "no amount in %q", err)
			unit := specs.PtPerPx
			slack := 0.01
			if m[2] == "mm" {
				unit, slack = specs.PtPerMm, 0.05
			}
			dw, _ := strconv.ParseFloat(m[1], 64)
			dh, _ := strconv.ParseFloat(m[3], 64)
			require.True(t, dw > 0 || dh > 0, "asks for no room: %q", err)
			grow := func(gw, gh float64) error {
				return build(tt.w+specs.Length(gw*unit), tt.h+specs.Length(gh*unit))
			}
			assert.NoError(t, grow(dw+slack, dh+slack), "grown by what %q asks", err)
			if dw > 1 {
				assert.Error(t, grow(dw-1, dh+slack), "1 %s narrower than asked still fails", m[2])
			}
			if dh > 1 {
				assert.Error(t, grow(dw+slack, dh-1), "1 %s shorter than asked still fails", m[2])
			}
		})
	}
}
