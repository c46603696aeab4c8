package preflight

import (
	"encoding/binary"
	"os"
	"path/filepath"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// fontDir holds the test data and the named font files.
func fontDir(t *testing.T, files map[string][]byte) string {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []string{"counts.csv", "totals.csv"} {
		b, err := os.ReadFile(filepath.Join("testdata", f))
		require.NoError(t, err)
		require.NoError(t, os.WriteFile(filepath.Join(dir, f), b, 0o644))
	}
	for name, b := range files {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	return dir
}

// withFsType sets a font's OS/2 fsType (OpenType spec, OS/2 table; the
// checksums are not read by the loader).
func withFsType(b []byte, v uint16) []byte {
	b = append([]byte(nil), b...)
	be := binary.BigEndian
	for r := 0; r < int(be.Uint16(b[4:])); r++ {
		if rec := 12 + 16*r; string(b[rec:rec+4]) == "OS/2" {
			be.PutUint16(b[be.Uint32(b[rec+8:])+8:], v)
		}
	}
	return b
}

func TestFontFindings(t *testing.T) {
	tests := []struct {
		name   string
		fsType uint16
		extra  string
		id     string // "" for none
		want   string
	}{
		// OpenType OS/2 fsType bits
		{"installable", 0x0000, "", "", ""},
		{"no subsetting", 0x0100, "", IDLicence, "the whole font is embedded"},
		{"preview & print", 0x0004, "", IDLicence, "preview & print"},
		{"editable", 0x0008, "", "", ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := fontDir(t, map[string][]byte{"lm.otf": withFsType(lmsans10regular.TTF, tc.fsType)})
			got := checkSpec(t, dir, specText("    fonts: {regular: lm.otf, bold: lm.otf}\n", ""))
			var found []Finding
			for _, f := range got {
				if f.ID == IDLicence || f.ID == IDOutlined {
					found = append(found, f)
				}
			}
			if tc.id == "" {
				assert.Empty(t, found)
				return
			}
			require.Len(t, found, 1, "one finding for the one face used twice:\n%s", list(got))
			assert.Equal(t, tc.id, found[0].ID)
			assert.Equal(t, Info, found[0].Severity)
			assert.Contains(t, found[0].Message, tc.want)
			assert.Contains(t, found[0].Message, "LMSans10-Regular")
			assert.Contains(t, found[0].At, "spec.yaml:")
		})
	}
}
