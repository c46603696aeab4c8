package palette

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Reference: testdata/machado2009_cvd_matrices.tsv — G. M. Machado,
// M. M. Oliveira, L. A. F. Fernandes, "A Physiologically-based Model for
// Simulation of Color Vision Deficiency", IEEE TVCG 15(6):1291–1298, 2009,
// authors' pre-computed matrices; severity 1.0 = dichromacy, applied to
// linear sRGB.
func machadoRef(t *testing.T) map[Deficiency][3][3]float64 {
	kinds := map[string]Deficiency{"protanomaly": Protanopia, "deuteranomaly": Deuteranopia, "tritanomaly": Tritanopia}
	out := map[Deficiency][3][3]float64{}
	for _, r := range refRows(t, "machado2009_cvd_matrices.tsv", "\t") {
		d, ok := kinds[r["type"]]
		if !ok || r["severity"] != "1.0" {
			continue
		}
		var m [3][3]float64
		for i := range 3 {
			for j := range 3 {
				m[i][j] = num(t, r["m"+string(rune('0'+i))+string(rune('0'+j))])
			}
		}
		out[d] = m
	}
	require.Len(t, out, 3, "found %d severity-1.0 matrices, want 3", len(out))
	return out
}

func TestMachadoMatrices(t *testing.T) {
	for d, want := range machadoRef(t) {
		assert.Equal(t, want, machado[d], "%v matrix = %v, Machado et al. (2009) give %v", d, machado[d], want)
	}
}

func TestSimulateMatchesMatrixProduct(t *testing.T) {
	ref := machadoRef(t)
	// Pure sRGB primaries are linear (1,0,0) etc., so the simulated linear
	// colour is the matrix column (clipped to [0,1] as a display would).
	for _, tc := range []struct {
		hex string
		col int
	}{{"#ff0000", 0}, {"#00ff00", 1}, {"#0000ff", 2}} {
		for d, m := range ref {
			got := Simulate(mustHex(t, tc.hex), d).RGB().Linear()
			want := [3]float64{m[0][tc.col], m[1][tc.col], m[2][tc.col]}
			for i, g := range [3]float64{got.R, got.G, got.B} {
				assert.InDelta(t, clamp01(want[i]), g, 1e-6, "%v of %s: linear component %d against the matrix", d, tc.hex, i)
			}
		}
	}
	// Rows sum to 1, so greys are unchanged (file header).
	for _, d := range Deficiencies() {
		for _, hex := range []string{"#ffffff", "#777777", "#000000"} {
			assert.Equal(t, hex, Simulate(mustHex(t, hex), d).Hex(), "%v of grey %s", d, hex)
		}
	}
}
