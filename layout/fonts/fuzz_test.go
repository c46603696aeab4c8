package fonts

import (
	"os"
	"path/filepath"
	"testing"

	"golang.org/x/image/font/gofont/goregular"

	"sheaf/specs"
)

// FuzzFont: any bytes given as a spec's font file load as a font or fail
// with an error, through the public Load a build uses; a font that loads
// measures and wraps text without a panic. The seed is Go Regular; the
// fuzzer damages its tables.
func FuzzFont(f *testing.F) {
	f.Add(goregular.TTF)
	f.Add(goregular.TTF[:512])
	f.Fuzz(func(t *testing.T, b []byte) {
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "f.ttf"), b, 0o644); err != nil {
			t.Fatal(err)
		}
		spec := &specs.Spec{File: filepath.Join(dir, "feature.yaml"), Dir: dir}
		s, err := Load(spec, &specs.Output{Name: "print", Fonts: specs.Fonts{Regular: "f.ttf", Bold: "f.ttf"}})
		if err != nil {
			return
		}
		_ = s.Width(Regular, 10, "Quillmere 1868–2025 ﬁ")
		_ = s.Metrics(Bold, 10)
		_ = s.Wrap(Regular, 10, "the words of a weekly", 30)
	})
}
