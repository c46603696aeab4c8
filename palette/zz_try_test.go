package palette

import (
	"os"
	"testing"
)

func TestZZTry(t *testing.T) {
	white, _ := ParseHex("#ffffff")
	for _, sp := range [][2]float64{{1868, 2025}, {1900, 2000}, {1800, 2000}} {
		s, _ := Default(sp[0], sp[1])
		r, err := Check(s, white, 0.75, Print, DefaultThresholds())
		if err != nil {
			t.Fatal(err)
		}
		r.WriteTable(os.Stdout)
	}
	s, _ := NewScale("eras", DefaultAnchors(1868, 2025), []float64{1868, 1900, 1930, 1960, 1990, 2025})
	r, _ := Check(s, white, 0.5, Screen, DefaultThresholds())
	r.WriteTable(os.Stdout)
}
