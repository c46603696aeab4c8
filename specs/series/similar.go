package series

import (
	"slices"

	"sheaf/specs"
	"sheaf/specs/series/shape"
)

// MaxSimilar is the most panels order: similarity and group: similarity
// take: they compare every two panels and keep the distances (n²/2
// float32: 50 MB at this many).
const MaxSimilar = 5000

// Shapes returns each series as its panel plots it (package shape).
func (set *Set) Shapes() [][]float64 {
	out := make([][]float64, len(set.Series))
	for i := range set.Series {
		out[i] = shape.Of(set.Series[i].Values, set.Series[i].YMax)
	}
	return out
}

// seriate puts the series in the order of shape.Seriate.
func seriate(set *Set) {
	sr := shape.Seriate(set.Shapes())
	out := make([]Series, len(set.Series))
	for p, i := range sr.Order {
		out[p] = set.Series[i]
	}
	copy(set.Series, out)
}

// bySimilarity cuts the series into clusters of alike shapes (group:
// similarity) headed by what their mean shape does, in the order of
// shape.Seriate. With another order than similarity, each cluster keeps
// the seriation's place and is sorted inside by that order (ser is
// already in it: arrange sorted it).
func bySimilarity(s *specs.Spec, set *Set) {
	ser := set.Series
	shapes := set.Shapes()
	sr := shape.Seriate(shapes)
	runs, heads := sr.Described(shapes, s.Years.From)
	order := slices.Clone(sr.Order)
	if s.Order != specs.OrderSimilarity {
		for _, r := range runs {
			slices.Sort(order[r.Start : r.Start+r.Count]) // index order is the spec's order
		}
	}
	out := make([]Series, len(ser))
	for p, i := range order {
		out[p] = ser[i]
	}
	copy(ser, out)
	set.Groups = set.Groups[:0]
	for i, r := range runs {
		set.Groups = append(set.Groups, Group{Heading: heads[i], Start: r.Start, Count: r.Count})
	}
}
