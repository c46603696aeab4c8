package palette

import (
	"fmt"
	"math"
	"os/exec"
	"strings"
	"testing"

	"sheaf/render/tooltest"
)

// Outside check: LittleCMS (transicc, liblcms2-utils) converts sRGB to
// ICC Lab (D50, Bradford-adapted). Our LabD50 must agree to within the
// D50 convention spread noted in srgb_reference.csv (≤ 0.02), plus
// LittleCMS's 4-decimal printout.
func TestLabD50AgainstLittleCMS(t *testing.T) {
	transicc := tooltest.Require(t, "transicc", "liblcms2-utils")
	var colours []Color
	var in strings.Builder
	for _, hex := range []string{"#ff0000", "#00ff00", "#0000ff", "#ffff00", "#7654cd", "#777777", "#ffffff"} {
		colours = append(colours, mustHex(t, hex))
	}
	for _, a := range DefaultAnchors(0, 1) {
		colours = append(colours, mustHex(t, a.Color.Hex())) // as 8-bit, what transicc gets
	}
	for _, c := range colours {
		r, g, b := c.RGB().RGB8()
		fmt.Fprintf(&in, "%d %d %d\n", r, g, b)
	}
	cmd := exec.Command(transicc, "-i", "*sRGB", "-o", "*Lab", "-n")
	cmd.Stdin = strings.NewReader(in.String())
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("transicc: %v", err)
	}
	var got []Lab
	for _, line := range strings.Split(string(out), "\n") {
		var l Lab
		if n, _ := fmt.Sscanf(strings.TrimSpace(line), "%g %g %g", &l.L, &l.A, &l.B); n == 3 {
			got = append(got, l)
		}
	}
	if len(got) != len(colours) {
		t.Fatalf("transicc gave %d colours for %d:\n%s", len(got), len(colours), out)
	}
	for i, c := range colours {
		ours := c.LabD50()
		if d := math.Max(math.Abs(ours.L-got[i].L), math.Max(math.Abs(ours.A-got[i].A), math.Abs(ours.B-got[i].B))); d > 0.03 {
			t.Errorf("%s: ours %.4f %.4f %.4f, LittleCMS %.4f %.4f %.4f", c.Hex(), ours.L, ours.A, ours.B, got[i].L, got[i].A, got[i].B)
		}
	}
}
