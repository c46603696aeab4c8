package pdf

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestShadingKeys: the writer's remembered keys are shadingKey's, byte
// for byte, for gradients that share stops, differ in one stop's bits
// (0 and -0 format alike but are other bits), carry inks or are radial.
func TestShadingKeys(t *testing.T) {
	stops := []Stop{{Offset: 0, R: 0.1, G: 0.2, B: 0.3}, {Offset: 0.5, R: 0.4, G: 0.5, B: 0.6}, {Offset: 1, R: 0.7, G: 0.8, B: 0.9}}
	other := append([]Stop(nil), stops...)
	other[1].G = 0.55
	negZero := append([]Stop(nil), stops...)
	negZero[0].Offset = math.Copysign(0, -1)
	inks := []Stop{{Offset: 0, Ink: []float64{0.1, 0, 0, 0.2}}, {Offset: 1, Ink: []float64{0.3, 0.1, 0, 0}}}
	inksShort := []Stop{{Offset: 0, Ink: []float64{0.1, 0, 0}}, {Offset: 1, Ink: []float64{0.3, 0.1, 0, 0}}}
	shs := []Shading{
		{Coords: []float64{0, 0, 10, 0}, Stops: stops},
		{Coords: []float64{5, 5, 10, 0}, Stops: stops},
		{Coords: []float64{0, 0, 10, 0}, Stops: other},
		{Coords: []float64{0, 0, 10, 0}, Stops: negZero},
		{Radial: true, Coords: []float64{0, 0, 1, 0, 0, 5}, Stops: stops},
		{Device: 4, Coords: []float64{0, 0, 10, 0}, Stops: inks},
		{Device: 4, Coords: []float64{0, 0, 10, 0}, Stops: inksShort},
		{Coords: []float64{0, 0, 10, 0}},
		// The same numbers in the same order, split otherwise between
		// colours and inks: other stops.
		{Device: 4, Coords: []float64{0, 0, 10, 0}, Stops: []Stop{{Offset: 0, Ink: []float64{0.2, 0.3, 0.4, 0.5}}, {Offset: 1}}},
		{Device: 4, Coords: []float64{0, 0, 10, 0}, Stops: []Stop{{Offset: 0}, {Offset: 0.2, R: 0.3, G: 0.4, B: 0.5, Ink: []float64{1, 0, 0, 0}}}},
	}
	var k shadingKeys
	for round := range 2 { // the second round takes every key remembered
		for i, sh := range shs {
			assert.Equal(t, shadingKey(sh), k.key(sh), "round %d, shading %d", round, i)
		}
	}
}
