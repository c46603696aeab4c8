package series

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// setDigest is the SHA-256 of a Set printed with %#v: every field,
// unexported ones too, every float in Go's shortest round-tripping form,
// so two sets one bit of one value apart have different digests.
func setDigest(set *Set) string {
	sum := sha256.Sum256(fmt.Appendf(nil, "%#v", *set))
	return hex.EncodeToString(sum[:])
}

// TestDemoSetsUnchanged: the demo features, loaded in ways that take
// every path of the reader and of the scaling (each scaling, fold-case,
// a few terms read a second time, every term kept from the first read,
// each order and grouping), give the sets the code gave before the
// counts were read in blocks and scaled in parallel (issue 22). The
// reference digests are that code's output (commit fb93391, setDigest of
// Load, and of Catalog's stats), recorded before the change.
func TestDemoSetsUnchanged(t *testing.T) {
	const demo = "../../examples/quillmere/"
	tests := []struct {
		name, spec string
		edit       func(*specs.Spec)
		set, cat   string
	}{
		{"feature", demo + "feature.yaml", func(*specs.Spec) {},
			"7877f1857e5e069f4a93edd4357454f68e0b772f67a751aa10e94864b9755277", "d3302558ed5068f654153ecc9f3da5a9ce69bdc4b358df067858871e6a75f878"},
		{"de", demo + "de.yaml", func(*specs.Spec) {},
			"bd491b14bfa22d69450b8c798b7fc3b1f8375a2415e19d398fb9c4f44b0470f1", "d3302558ed5068f654153ecc9f3da5a9ce69bdc4b358df067858871e6a75f878"},
		{"similarity", demo + "similarity.yaml", func(*specs.Spec) {},
			"1a93a172af06dfb4281aa0148989595d966be2a69a2eeb1c21c5420ea302d33c", "d3302558ed5068f654153ecc9f3da5a9ce69bdc4b358df067858871e6a75f878"},
		{"raw-rolling", demo + "feature.yaml", func(s *specs.Spec) { s.Scale.Mode = specs.ScaleRaw },
			"0a31a09cc82b8e743dbe04f48ebbcb764f1a552f1da3b263722d19545a1bc5b4", "d3302558ed5068f654153ecc9f3da5a9ce69bdc4b358df067858871e6a75f878"},
		{"share-own-range", demo + "feature.yaml", func(s *specs.Spec) {
			s.Scale.Mode, s.Scale.YRange, s.Scale.Rolling = specs.ScaleShare, specs.YOwn, 0
		}, "b308eb09f8a712ffe62851dede2435e221d012977e753f4aa6338caeafc744f9", "d3302558ed5068f654153ecc9f3da5a9ce69bdc4b358df067858871e6a75f878"},
		{"fold-top-12", demo + "feature.yaml", func(s *specs.Spec) { s.Data.FoldCase, s.Terms.Top = true, 12 },
			"9418ad3efe200ff5eb6c0c95955e766c509c9a9c889462a0303ecba223122f2d", "fd20f36ebf3f09ecbdc417f8cb234427c8b1d0aad548e4c4c4fa490c9a75e4ea"},
		{"alpha-decades", demo + "feature.yaml", func(s *specs.Spec) { s.Order, s.Group = specs.OrderAlpha, specs.GroupPeakDecade },
			"c22d7e3e3f3e3fa53ea21ae29fbeb0e6024f1d5bd8be64f3303904ffaa6e5939", "d3302558ed5068f654153ecc9f3da5a9ce69bdc4b358df067858871e6a75f878"},
		{"small", small, func(*specs.Spec) {},
			"dab6b39f699358045fc429f98037e11a8f18a459d251304cb70549489ad22b14", "cd319f296685a034485ea66fa7c54c8b7d500286e3631732981eac7c086ca428"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s, err := specs.Load(tt.spec)
			require.NoError(t, err)
			tt.edit(s)
			set, err := Load(s)
			require.NoError(t, err)
			assert.Equal(t, tt.set, setDigest(set), "digest of the set")
			cat, err := Catalog(s)
			require.NoError(t, err)
			sum := sha256.Sum256(fmt.Appendf(nil, "%#v", cat))
			assert.Equal(t, tt.cat, hex.EncodeToString(sum[:]), "digest of the catalog")
		})
	}
}

// TestBlocksAgreeWithRecords: tables whose runs of plain lines hold
// every kind of row tally.read and tally.add must hand back (errors of each kind, a
// new term, blank and CRLF lines, too few and too many fields, quoted
// terms between plain lines, fractional and exponent counts, a term with
// spaces around it, fold-case spellings) load to the same set, or the
// same errors with the same places, as when every row is read as a
// record (tally.row, the reader before issue 22).
func TestBlocksAgreeWithRecords(t *testing.T) {
	base := "term,year,count\nboiler,1900,5\nboiler,1901,6\n"
	tests := []struct {
		name, rows, extra string
		fold              bool
		fails             bool // with an error, not a set
	}{
		{"plain", "boiler,1902,7\nsteam,1900,1\nsteam,1901,2\n", "", false, false},
		{"second row for a year", "boiler,1902,7\nboiler,1901,8\nboiler,1904,1\n", "", false, true},
		{"year outside the span", "boiler,1899,7\nboiler,1902,1\n", "", false, true},
		{"year after the span", "boiler,1906,7\nboiler,1902,1\n", "", false, true},
		{"year not a number", "boiler,19x2,7\nboiler,1902,1\n", "", false, true},
		{"count not a number", "boiler,1902,7a\nboiler,1904,1\n", "", false, true},
		{"count hexadecimal", "boiler,1902,0x7\nboiler,1904,1\n", "", false, true},
		{"count above the total", "boiler,1902,999999999\nboiler,1904,1\n", "", false, true},
		{"count in a gap year", "boiler,1903,2\nboiler,1904,1\n", "", false, true},
		{"count in a gap year, raw", "boiler,1903,2\nboiler,1904,1\n", "scale: {values: raw}\n", false, false},
		{"fraction and exponent", "boiler,1902,2.5\nboiler,1904,1e1\nboiler,1905, 3\n", "", false, false},
		{"blank and CRLF lines", "\nboiler,1902,2\r\n\r\n   \nboiler,1904,1\n", "", false, false},
		{"CRLF line with an error", "boiler,1902,2\r\nboiler,1904,7a\r\nboiler,1905,1\r\n", "", false, true},
		{"too few fields", "boiler,1902\nboiler,1904,1\n", "", false, true},
		{"too many fields", "boiler,1902,1,250\nboiler,1904,1\n", "", false, true},
		{"quoted between plain", "\"boiler\",1902,2\nboiler,1904,1\n\"steam, high\",1900,3\nsteam,1901,1\n", "", false, false},
		{"spaces around the term", " boiler ,1902,2\nboiler\t,1904,1\n", "", false, false},
		{"empty term", ",1902,2\nboiler,1904,1\n", "", false, true},
		{"control character in a new term", "bo\x01iler,1902,2\nboiler,1904,1\n", "", false, true},
		{"fold-case spellings", "Boiler,1900,1\nBoiler,1902,2\nboiler,1902,3\nBOILER,1900,4\nBoiler,1902,5\n", "", true, true},
		{"last line without a line end", "boiler,1902,2\nboiler,1904,1", "", false, false},
		{"runs broken and resumed", "steam,1900,1\nboiler,1902,2\nsteam,1901,1\n", "", false, false},
		{"second row for a year, the run resumed", "steam,1900,1\nboiler,1902,2\nsteam,1901,1\nboiler,1904,1\nsteam,1900,5\n", "", false, true},
		{"fold-case spellings resumed", "Boiler,1902,2\nsteam,1900,1\nBoiler,1904,2\nboiler,1902,1\nsteam,1901,1\nboiler,1904,3\n", "", true, false},
	}
	// Plain rows before the case's, so that they fall inside a block of
	// plain lines or across the end of one: the reader's buffer, which
	// a block fills, is 64 KiB.
	filler := func(name string, bytes int) string {
		var b strings.Builder
		for i := 0; b.Len() < bytes; i++ {
			for y := 1900; y <= 1905; y++ {
				if y != 1903 {
					fmt.Fprintf(&b, "%s%05d,%d,%d\n", name, i, y, i%7)
				}
			}
		}
		return b.String()
	}
	for _, pad := range []int{0, 20 << 10, 45 << 10, 64 << 10, 100 << 10} {
		for _, tt := range tests {
			t.Run(fmt.Sprintf("%s after %d bytes", tt.name, pad), func(t *testing.T) {
				counts := "term,year,count\n" + filler("before", pad) + strings.TrimPrefix(base, "term,year,count\n") + tt.rows
				if strings.HasSuffix(counts, "\n") {
					counts += filler("after", pad/2)
				}
				agree(t, counts, tt.extra, tt.fold, tt.fails)
			})
		}
	}
}

// agree loads counts (with the small totals) both ways and compares the
// sets or the errors: selecting every term (the counts kept from the
// first read) and the top 3 (read a second time, pass2).
func agree(t *testing.T, counts, extra string, fold, fails bool) {
	s, err := specs.Load(feature(t, "counts.csv", counts, "", extra))
	require.NoError(t, err)
	s.Data.FoldCase = fold
	for _, top := range []int{0, 3} {
		s.Terms.Top = top
		ref, refErr := loadRecords(s)
		set, err := Load(s)
		require.Equal(t, fails, refErr != nil, "top %d: an error reading every row as a record: %v", top, refErr)
		if fails {
			assert.Equal(t, refErr.Error(), fmt.Sprint(err), "top %d: errors", top)
			continue
		}
		require.NoError(t, err)
		assert.Equal(t, setDigest(ref), setDigest(set), "top %d: set", top)
		assert.Equal(t, ref.Rows, set.Rows, "top %d: rows", top)
	}
}

// poolBefore is PoolInto as it was before issue 22 (commit fb93391),
// the reference for the pooling now done by running sums: every window
// summed from 0, year by year, in order.
func poolBefore(counts, exposure []float64, years int) ([]float64, []float64) {
	n := len(counts)
	pooled, pooledExposure := make([]float64, n), make([]float64, n)
	half := 0
	if years > 1 {
		half = years / 2
	}
	gap := func(j int) bool { return math.IsNaN(counts[j]) || math.IsNaN(exposure[j]) }
	for j := 0; j < n; {
		if gap(j) {
			pooled[j], pooledExposure[j] = math.NaN(), math.NaN()
			j++
			continue
		}
		start, end := j, j
		for end < n && !gap(end) {
			end++
		}
		for i := start; i < end; i++ {
			lo, hi := max(start, i-half), min(end-1, i+half)
			var c, e float64
			for k := lo; k <= hi; k++ {
				c += counts[k]
				e += exposure[k]
			}
			pooled[i], pooledExposure[i] = c, e
		}
		j = end
	}
	return pooled, pooledExposure
}

// TestPoolingMatchesBefore: Pool, and the pooling scale does for counts
// whose gaps are the exposure's, give poolBefore's sums to the bit for
// every window from none to 9 years: with fractional counts (summed
// year by year, where the order of the additions shows), whole counts
// and totals (running sums), whole numbers too large for a running sum
// to stay exact (2^52 and up), negative zeros, and gaps at the ends,
// together and alone. Counts with a gap of their own are left to
// PoolInto. The numbers are invented (a fixed xorshift sequence).
func TestPoolingMatchesBefore(t *testing.T) {
	const n = 40
	x := uint64(2463534242)
	next := func() uint64 {
		x ^= x << 13
		x ^= x >> 7
		x ^= x << 17
		return x
	}
	kinds := []struct {
		name  string
		value func(j int) float64
	}{
		{"fractional", func(int) float64 { return float64(next()%1000) / 7 }},
		{"whole", func(int) float64 { return float64(next() % 1000) }},
		{"whole, some -0", func(j int) float64 {
			if j%3 == 0 {
				return math.Copysign(0, -1)
			}
			return float64(next() % 3)
		}},
		{"whole, too large for running sums", func(int) float64 { return float64(1<<52 + next()%1000) }},
		{"whole, one too large", func(j int) float64 {
			if j == 17 {
				return 1 << 53
			}
			return float64(next() % 1000)
		}},
	}
	for _, ek := range kinds {
		for _, ck := range kinds {
			exposure := make([]float64, n)
			for j := range exposure {
				exposure[j] = 1e6 + ek.value(j)
			}
			for _, j := range []int{0, 9, 10, 23, n - 1} {
				exposure[j] = math.NaN()
			}
			counts := make([]float64, n)
			for j := range counts {
				counts[j] = ck.value(j)
				if math.IsNaN(exposure[j]) {
					counts[j] = math.NaN()
				}
			}
			for years := range 10 {
				what := fmt.Sprintf("exposure %s, counts %s, window %d", ek.name, ck.name, years)
				wantC, wantE := poolBefore(counts, exposure, years)
				gotC, gotE := Pool(counts, exposure, years)
				set := &Set{Rolling: years, totals: exposure}
				sc := &scaler{set: set, exposure: exposure}
				scaled := make([]float64, n)
				require.True(t, sc.pool(counts, scaled), "%s: counts with the exposure's gaps", what)
				for j := range wantC {
					assert.Equal(t, math.Float64bits(wantC[j]), math.Float64bits(gotC[j]), "%s, year %d: Pool's count %v, want %v", what, j, gotC[j], wantC[j])
					assert.Equal(t, math.Float64bits(wantE[j]), math.Float64bits(gotE[j]), "%s, year %d: Pool's exposure %v, want %v", what, j, gotE[j], wantE[j])
					assert.Equal(t, math.Float64bits(wantC[j]), math.Float64bits(scaled[j]), "%s, year %d: scale's count %v, want %v", what, j, scaled[j], wantC[j])
				}
				own := slices.Clone(counts)
				own[5] = math.NaN()
				assert.False(t, sc.pool(own, scaled), "%s: a gap of the counts' own is PoolInto's", what)
			}
		}
	}
}

// TestScaleWorkersAgree: scaling shares the series out to as many
// goroutines as there are processors (one per 256 series at most); the
// set must not depend on how many: 700 terms (so two or three workers)
// scaled by one goroutine and by several give the same set to the bit.
// The table is invented (bigFeatureWith).
func TestScaleWorkersAgree(t *testing.T) {
	spec, _ := bigFeatureWith(t, 700, 30, "terms: {top: 700, min-total: 0}\norder: peak-year\nscale: {values: own-peak, y-range: shared, rolling: {years: 5}}\n")
	s, err := specs.Load(spec)
	require.NoError(t, err)
	digests := map[int]string{}
	for _, procs := range []int{1, 2, 3} {
		old := runtime.GOMAXPROCS(procs)
		set, err := Load(s)
		runtime.GOMAXPROCS(old)
		require.NoError(t, err)
		require.Len(t, set.Series, 700, "selected")
		digests[procs] = setDigest(set)
	}
	assert.Equal(t, digests[1], digests[2], "one goroutine and two")
	assert.Equal(t, digests[1], digests[3], "one goroutine and three")
}
