package series

import (
	"fmt"
	"testing"
)

// BenchmarkPoissonInterval times one 95 % interval by count size.
func BenchmarkPoissonInterval(b *testing.B) {
	for _, k := range []float64{3, 30, 300, 3000, 30000} {
		b.Run(fmt.Sprint(k), func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				PoissonInterval(k, 0.95)
			}
		})
	}
}
