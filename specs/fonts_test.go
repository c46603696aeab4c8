package specs

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestFontsFaceForm: a font is a path, or {path, face} picking a face of
// a collection by full name (a string) or index (an integer); problems
// are reported at their place (line:col counted by hand from the text,
// 1-based as YAML 1.2 §5 numbers them).
func TestFontsFaceForm(t *testing.T) {
	tests := []struct {
		name         string
		fonts        string
		regular      string
		regularFace  FaceRef
		bold         string
		boldFace     FaceRef
		errAt, errIs string
	}{
		{"paths", "{regular: a.otf, bold: b.otf}", "a.otf", FaceRef{}, "b.otf", FaceRef{}, "", ""},
		{"face by name", `{regular: {path: c.otc, face: "House Sans Bold"}}`, "c.otc", FaceRef{Name: "House Sans Bold"}, "", FaceRef{}, "", ""},
		{"face by index", "{bold: {path: c.ttc, face: 2}}", "", FaceRef{}, "c.ttc", FaceRef{Index: 2}, "", ""},
		{"index as a string is a name", `{bold: {path: c.ttc, face: "2"}}`, "", FaceRef{}, "c.ttc", FaceRef{Name: "2"}, "", ""},
		{"path alone in a mapping", "{regular: {path: a.otf}}", "a.otf", FaceRef{}, "", FaceRef{}, "", ""},
		{"no path", "{regular: {face: 1}}", "", FaceRef{}, "", FaceRef{}, "7:22", "outputs.print.fonts.regular.path is missing"},
		{"negative index", "{regular: {path: c.ttc, face: -1}}", "", FaceRef{}, "", FaceRef{}, "7:42", "a face index is a whole number from 0"},
		{"empty name", `{regular: {path: c.ttc, face: ""}}`, "", FaceRef{}, "", FaceRef{}, "7:42", "name the face"},
		{"unknown key", "{regular: {path: c.ttc, fase: 1}}", "", FaceRef{}, "", FaceRef{}, "7:36", `unknown key "fase" in outputs.print.fonts.regular; did you mean "face"?`},
		{"a list", "{regular: [a, b]}", "", FaceRef{}, "", FaceRef{}, "7:22", "must be a single value, not a list"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Parse("spec.yaml", []byte(printOut+"    fonts: "+tc.fonts+"\n"))
			if tc.errIs != "" {
				require.Error(t, err)
				assert.Contains(t, err.Error(), "spec.yaml:"+tc.errAt+":")
				assert.Contains(t, err.Error(), tc.errIs)
				return
			}
			require.NoError(t, err)
			f := s.Outputs[0].Fonts
			assert.Equal(t, tc.regular, f.Regular)
			assert.Equal(t, tc.regularFace, f.RegularFace)
			assert.Equal(t, tc.bold, f.Bold)
			assert.Equal(t, tc.boldFace, f.BoldFace)
		})
	}
}

func TestDefaultFamilyNamesNoCommercialFace(t *testing.T) {
	// The screen default names the built-in face and a generic family
	// (CSS Fonts 4 §2.1.3) only.
	assert.Equal(t, `"DejaVu Sans Condensed", sans-serif`, DefaultOutput("web", Screen).Fonts.Family)
}
