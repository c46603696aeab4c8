package fonts

import (
	"bytes"
	"crypto/sha256"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime/debug"
	"strings"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"golang.org/x/image/font/gofont/gobold"

	"sheaf/specs"
)

// widthTexts are measured, saved and read back. The reference for every
// width read back is the same Set's own measurement by shaping (the cache
// must change nothing, to the bit); TestWidthAgainstSfnt checks those
// measurements against golang.org/x/image/font/sfnt.
var widthTexts = []struct {
	st   Style
	size float64
	text string
}{
	{Regular, 7, "dictionary"},
	{Bold, 6.5, "steam engine"},
	{Bold, 5.525, "agricultural compre…"},
	{Italic, 8, "Maßstab"},
	{Regular, 7, "AVAT Wa"}, // kerned pairs
	{Regular, 0.1, "x"},
	{Bold, 12, "café – ½"},
}

func measured(t *testing.T, reverse bool) (*Set, []float64) {
	t.Helper()
	s := mustDefault(t)
	ws := make([]float64, len(widthTexts))
	for k := range widthTexts {
		i := k
		if reverse {
			i = len(widthTexts) - 1 - k
		}
		w := widthTexts[i]
		ws[i] = s.Width(w.st, w.size, w.text)
	}
	return s, ws
}

func saved(t *testing.T, s *Set) []byte {
	t.Helper()
	var b bytes.Buffer
	require.NoError(t, s.SaveWidths(&b))
	return b.Bytes()
}

func TestWidthsRoundTrip(t *testing.T) {
	a, want := measured(t, false)
	data := saved(t, a)
	b := mustDefault(t)
	require.NoError(t, b.LoadWidths(bytes.NewReader(data)))
	require.Len(t, b.saved, len(widthTexts), "widths read back")
	assert.Less(t, len(saved(t, b)), len(data), "widths loaded but not used are saved again")
	for i, w := range widthTexts {
		got, ok := b.saved[widthKey{w.st, w.size, w.text}]
		assert.True(t, ok, "%v %g %q: not read back", w.st, w.size, w.text)
		assert.Equal(t, math.Float64bits(want[i]), math.Float64bits(got), "%v %g %q: bits read back (%v) vs measured (%v)", w.st, w.size, w.text, got, want[i])
		assert.Equal(t, want[i], b.Width(w.st, w.size, w.text), "%v %g %q: Width after loading", w.st, w.size, w.text)
	}
	assert.True(t, bytes.Equal(saved(t, b), data), "widths used from a loaded file do not save to the same bytes")
	// One width more than the file had: saved with the rest.
	b.Width(Regular, 9, "one more")
	more := mustDefault(t)
	assert.NoError(t, more.LoadWidths(bytes.NewReader(saved(t, b))), "after a new width")
	assert.Len(t, more.saved, len(widthTexts)+1, "after a new width: widths saved")
	// Sorted entries: the order of measuring does not show in the bytes.
	c, _ := measured(t, true)
	assert.True(t, bytes.Equal(saved(t, c), data), "the same widths measured in another order save to other bytes")
}

func TestWidthsRefused(t *testing.T) {
	a, _ := measured(t, false)
	data := saved(t, a)

	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "Other.ttf"), gobold.TTF, 0o644))
	other, err := Load(&specs.Spec{File: filepath.Join(dir, "f.yaml"), Dir: dir},
		&specs.Output{Name: "print", Fonts: specs.Fonts{Regular: "Other.ttf"}})
	require.NoError(t, err)
	flipped := bytes.Clone(data)
	flipped[len(flipped)/2] ^= 1
	for _, tc := range []struct {
		name string
		set  *Set
		data []byte
	}{
		{"other fonts", other, data},
		{"a flipped bit", mustDefault(t), flipped},
		{"cut short", mustDefault(t), data[:len(data)-40]},
		{"empty", mustDefault(t), nil},
		{"not a widths file", mustDefault(t), []byte("term,year,count\nboiler,1900,5\n")},
	} {
		assert.Error(t, tc.set.LoadWidths(bytes.NewReader(tc.data)), tc.name)
		assert.Empty(t, tc.set.saved, "%s: widths added", tc.name)
	}
}

// Widths read back give the texts' advances, so the same texts at other
// sizes, and in a Set sharing the shaping, measure without shaping and
// to the bit as shaping measures them (the reference: a fresh Set that
// shapes). A CFF face too (Latin Modern Sans, 1000 units per em, where
// DejaVu has 2048).
func TestWidthsGiveAdvancesAtEverySize(t *testing.T) {
	sets := map[string]func() *Set{
		"built-in": func() *Set { return mustDefault(t) },
		"latin-modern": func() *Set {
			spec, out := specIn(t, specHead+"    fonts: {regular: lm.otf}\n", map[string][]byte{"lm.otf": lmsans10regular.TTF})
			s, err := Load(spec, out)
			require.NoError(t, err)
			return s
		},
	}
	for name, load := range sets {
		t.Run(name, func(t *testing.T) {
			a := load()
			for _, w := range widthTexts {
				a.Width(w.st, w.size, w.text)
			}
			b, ref, shared := load(), load(), load()
			require.True(t, shared.ShareShaping(b))
			require.NoError(t, b.LoadWidths(bytes.NewReader(saved(t, a))))
			for _, w := range widthTexts {
				for _, size := range []float64{w.size, 5.525, 9, 13.5, 0.7} {
					want := ref.Width(w.st, size, w.text)
					assert.Equal(t, math.Float64bits(want), math.Float64bits(b.Width(w.st, size, w.text)), "%v %g %q", w.st, size, w.text)
					assert.Equal(t, math.Float64bits(want), math.Float64bits(shared.Width(w.st, size, w.text)), "shared: %v %g %q", w.st, size, w.text)
				}
			}
			assert.Equal(t, [numStyles]bool{}, b.adv.tried, "no shaper made: every advance came from the widths")
			b.Width(Regular, 9, "a text never saved")
			assert.True(t, b.adv.tried[Regular], "and one not saved is shaped")
		})
	}
}

// A saved width that is no whole number of font units at its size (not
// one measure wrote) gives no advance: the text at other sizes is shaped.
func TestWidthsOddWidthGivesNoAdvance(t *testing.T) {
	a, ref, b := mustDefault(t), mustDefault(t), mustDefault(t)
	k := widthKey{Bold, 6.5, "steam engine"}
	a.Width(k.st, k.size, k.text)
	a.widths[k] *= 1 + 1e-9
	require.NoError(t, b.LoadWidths(bytes.NewReader(saved(t, a))))
	assert.Equal(t, a.widths[k], b.Width(k.st, k.size, k.text), "the saved width itself is read")
	assert.Equal(t, ref.Width(k.st, 9, k.text), b.Width(k.st, 9, k.text))
	assert.True(t, b.adv.tried[Bold], "shaped")
}

// The widths' identity hashes each style's bytes once per face however
// the Sets share them, and is the hash of every style's bytes in turn
// (the reference: crypto/sha256 over each style's bytes, as written out
// here), so files saved before still load.
func TestWidthsIdentityHashesEveryStyle(t *testing.T) {
	ref := func(s *Set) [sha256.Size]byte {
		h := sha256.New()
		h.Write([]byte(widthsMagic))
		for st := range numStyles {
			sum := sha256.Sum256(bytes.Clone(s.raw[st]))
			h.Write(sum[:])
			fmt.Fprintf(h, "face %d\n", s.face[st])
		}
		h.Write([]byte(features + "\n" + figureFeatures + "\n"))
		if bi, ok := debug.ReadBuildInfo(); ok {
			for _, d := range bi.Deps {
				if strings.HasPrefix(d.Path, "github.com/tdewolff/") || strings.HasPrefix(d.Path, "github.com/go-text/") {
					fmt.Fprintf(h, "%s@%s %s\n", d.Path, d.Version, d.Sum)
				}
			}
		}
		var id [sha256.Size]byte
		h.Sum(id[:0])
		return id
	}
	a := mustDefault(t)
	b, err := Load(&specs.Spec{}, &specs.Output{}, a)
	require.NoError(t, err)
	spec, out := specIn(t, specHead+"    fonts: {regular: lm.otf}\n", map[string][]byte{"lm.otf": lmsans10regular.TTF})
	c, err := Load(spec, out, a)
	require.NoError(t, err)
	for name, s := range map[string]*Set{"built-in": a, "loaded like it": b, "custom regular": c} {
		assert.Equal(t, ref(s), s.identity(), name)
		assert.Equal(t, ref(s), s.identity(), "%s, again", name)
	}
	assert.NotEqual(t, a.identity(), c.identity())
}
