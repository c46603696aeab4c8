package fonts

import (
	"testing"

	"golang.org/x/image/font/gofont/goregular"
)

// FuzzFont: any bytes given as a font file load as a font or fail with
// an error; a font that loads measures and wraps text without a panic.
// The seed is Go Regular; the fuzzer damages its tables.
func FuzzFont(f *testing.F) {
	f.Add(goregular.TTF)
	f.Add(goregular.TTF[:512])
	f.Fuzz(func(t *testing.T, b []byte) {
		s := &Set{}
		if err := s.set(Regular, b, "fuzz.ttf"); err != nil {
			return
		}
		s.raw[Bold], s.fonts[Bold] = s.raw[Regular], s.fonts[Regular]
		s.raw[Italic], s.fonts[Italic] = s.raw[Regular], s.fonts[Regular]
		_ = s.Width(Regular, 10, "Quillmere 1868–2025 ﬁ")
		_ = s.Metrics(Regular, 10)
		_ = s.Wrap(Regular, 10, "the words of a weekly", 30)
	})
}
