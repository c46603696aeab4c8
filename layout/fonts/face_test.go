package fonts

import (
	"encoding/binary"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/specs"
)

// The CFF fonts the tests use. Latin Modern comes with the
// github.com/go-fonts/latin-modern module (GUST Font License); EB Garamond
// is read from tdewolff/font's resources in the module cache (SIL Open Font
// License); TeX Gyre Heros from Debian's fonts-texgyre.
const texGyreHeros = "/usr/share/texmf/fonts/opentype/public/tex-gyre/texgyreheros-regular.otf"

// requireFile skips when a font file from a Debian package is missing,
// and fails under SHEAF_REQUIRE_TOOLS=1 as render/tooltest.Require does.
func requireFile(t testing.TB, path, debianPackage string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err == nil {
		return b
	}
	msg := path + " not found; install Debian package " + debianPackage
	require.False(t, os.Getenv("SHEAF_REQUIRE_TOOLS") == "1", "%s (required because SHEAF_REQUIRE_TOOLS=1)", msg)
	t.Skip(msg)
	return nil
}

// moduleFile reads a file of a module in the module cache.
func moduleFile(t testing.TB, module, rel string) []byte {
	t.Helper()
	out, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}}", module).Output()
	if err != nil || strings.TrimSpace(string(out)) == "" {
		msg := fmt.Sprintf("module %s not in the module cache: %v", module, err)
		require.False(t, os.Getenv("SHEAF_REQUIRE_TOOLS") == "1", "%s (required because SHEAF_REQUIRE_TOOLS=1)", msg)
		t.Skip(msg)
	}
	b, err := os.ReadFile(filepath.Join(strings.TrimSpace(string(out)), rel))
	require.NoError(t, err)
	return b
}

func ebGaramond(t testing.TB) []byte {
	return moduleFile(t, "github.com/tdewolff/font", "resources/EBGaramond12-Regular.otf")
}

// specIn writes files into a temporary folder and parses spec text there,
// so that errors carry the spec's positions.
func specIn(t *testing.T, yaml string, files map[string][]byte) (*specs.Spec, *specs.Output) {
	t.Helper()
	dir := t.TempDir()
	for name, b := range files {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	path := filepath.Join(dir, "feature.yaml")
	require.NoError(t, os.WriteFile(path, []byte(yaml), 0o644))
	s, err := specs.Parse(path, []byte(yaml))
	require.NoError(t, err)
	s.Dir = dir
	return s, &s.Outputs[0]
}

const specHead = `title: T
data: {counts: c.csv, totals: t.csv}
years: {from: 1900, to: 1910}
outputs:
  print:
    kind: print
`

func TestLoadCFFFonts(t *testing.T) {
	tests := []struct {
		name  string
		bytes func(t *testing.T) []byte
		full  string // name ID 4, checked against fc-query below
	}{
		{"lmsans10-regular.otf", func(*testing.T) []byte { return lmsans10regular.TTF }, "Latin Modern Sans 10 Regular"},
		{"lmsans10-bold.otf", func(*testing.T) []byte { return lmsans10bold.TTF }, "Latin Modern Sans 10 Bold"},
		{"EBGaramond12-Regular.otf", func(t *testing.T) []byte { return ebGaramond(t) }, "EB Garamond 12 Regular"},
		{"texgyreheros-regular.otf", func(t *testing.T) []byte { return requireFile(t, texGyreHeros, "fonts-texgyre") }, "TeX Gyre Heros"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			b := tc.bytes(t)
			spec, out := specIn(t, specHead+"    fonts: {regular: "+tc.name+"}\n", map[string][]byte{tc.name: b})
			s, err := Load(spec, out)
			require.NoError(t, err)
			e := s.Embedding(Regular)
			assert.Equal(t, CFF, e.Outlines)
			assert.Empty(t, e.Outlined, "a CFF font is embedded, not outlined")
			assert.Greater(t, s.Width(Regular, 7, "1908 gas-lit"), 0.0)
			names, err := Faces(b)
			require.NoError(t, err)
			assert.Equal(t, []string{tc.full}, names)
			// fontconfig's reader gives the same full name (fc-query).
			if fc, err := exec.LookPath("fc-query"); err == nil {
				got, err := exec.Command(fc, "-f", "%{fullname}", filepath.Join(spec.Dir, tc.name)).Output()
				require.NoError(t, err)
				assert.Contains(t, strings.Split(string(got), ","), tc.full)
			}
		})
	}
}

// makeCollection joins fonts into one collection file (OpenType spec,
// "Font Collections": a 'ttcf' header, then each font's table directory,
// whose table offsets count from the start of the file).
func makeCollection(t testing.TB, fonts ...[]byte) []byte {
	t.Helper()
	be := binary.BigEndian
	out := []byte("ttcf")
	out = be.AppendUint32(out, 0x00010000)
	out = be.AppendUint32(out, uint32(len(fonts)))
	dirAt := len(out)
	out = append(out, make([]byte, 4*len(fonts))...)
	for i, f := range fonts {
		for len(out)%4 != 0 {
			out = append(out, 0)
		}
		base := len(out)
		be.PutUint32(out[dirAt+4*i:], uint32(base))
		n := int(be.Uint16(f[4:]))
		dir := append([]byte(nil), f[:12+16*n]...)
		body := len(dir)
		// tables follow the directory; copy each and rebase its offset
		var tables []byte
		for r := 0; r < n; r++ {
			rec := 12 + 16*r
			off, length := be.Uint32(f[rec+8:]), be.Uint32(f[rec+12:])
			require.LessOrEqual(t, int(off+length), len(f))
			be.PutUint32(dir[rec+8:], uint32(base+body+len(tables)))
			tables = append(tables, f[off:off+length]...)
			for len(tables)%4 != 0 {
				tables = append(tables, 0)
			}
		}
		out = append(out, dir...)
		out = append(out, tables...)
	}
	return out
}

func TestCollectionFaces(t *testing.T) {
	otc := makeCollection(t, lmsans10regular.TTF, lmsans10bold.TTF)
	ttc := makeCollection(t, goregular.TTF, gobold.TTF)
	files := map[string][]byte{"lm.otc": otc, "go.ttc": ttc}
	for name, b := range files {
		names, err := Faces(b)
		require.NoError(t, err, name)
		require.Len(t, names, 2, name)
		// fontconfig reads the same faces in the same order (fc-query
		// lists a collection's faces with their index).
		if fc, err := exec.LookPath("fc-query"); err == nil {
			dir := t.TempDir()
			p := filepath.Join(dir, name)
			require.NoError(t, os.WriteFile(p, b, 0o644))
			got, err := exec.Command(fc, "-f", "%{index}:%{fullname}\n", p).Output()
			require.NoError(t, err)
			lines := strings.Split(strings.TrimSpace(string(got)), "\n")
			sort.Strings(lines)
			require.Len(t, lines, 2, name)
			for i, l := range lines {
				idx, list, _ := strings.Cut(l, ":")
				assert.Equal(t, strconv.Itoa(i), idx)
				assert.Contains(t, strings.Split(list, ","), names[i], name)
			}
		}
	}

	tests := []struct {
		fonts    string
		wantName string // the face loaded as regular
		wantErr  []string
	}{
		{"{regular: lm.otc}", "LMSans10-Regular", nil}, // Name is the PostScript name
		{"{regular: {path: lm.otc, face: 1}}", "LMSans10-Bold", nil},
		{`{regular: {path: lm.otc, face: "LMSans10-Bold"}}`, "LMSans10-Bold", nil},
		{`{regular: {path: go.ttc, face: "Go Bold"}}`, "Go-Bold", nil},
		{`{regular: {path: lm.otc, face: "LM Sans 10 Oblique"}}`, "", []string{
			"feature.yaml:7:", `fonts.regular.face`, `no face "LM Sans 10 Oblique"`, `0 "Latin Modern Sans 10 Regular", 1 "Latin Modern Sans 10 Bold"`}},
		{`{regular: {path: lm.otc, face: 2}}`, "", []string{"feature.yaml:7:", "no face #2", `1 "Latin Modern Sans 10 Bold"`}},
		{`{regular: {path: lmsans.otf, face: 1}}`, "", []string{"no face #1", `0 "Latin Modern Sans 10 Regular"`}},
	}
	files["lmsans.otf"] = lmsans10regular.TTF
	for _, tc := range tests {
		t.Run(tc.fonts, func(t *testing.T) {
			spec, out := specIn(t, specHead+"    fonts: "+tc.fonts+"\n", files)
			s, err := Load(spec, out)
			if tc.wantErr != nil {
				require.Error(t, err)
				for _, w := range tc.wantErr {
					assert.Contains(t, err.Error(), w)
				}
				return
			}
			require.NoError(t, err)
			assert.Equal(t, tc.wantName, s.Name(Regular))
		})
	}
}

// withFsType returns a copy of an sfnt font with its OS/2 fsType set, the
// table checksum and the head checkSumAdjustment recomputed (OpenType
// spec, "Calculating checksums").
func withFsType(t testing.TB, b []byte, fsType uint16) []byte {
	t.Helper()
	be := binary.BigEndian
	b = append([]byte(nil), b...)
	n := int(be.Uint16(b[4:]))
	headAt := -1
	found := false
	for r := 0; r < n; r++ {
		rec := 12 + 16*r
		off, length := int(be.Uint32(b[rec+8:])), int(be.Uint32(b[rec+12:]))
		switch string(b[rec : rec+4]) {
		case "OS/2":
			be.PutUint16(b[off+8:], fsType) // fsType is at offset 8 of OS/2
			be.PutUint32(b[rec+4:], sum32(b[off:off+(length+3)&^3]))
			found = true
		case "head":
			headAt = off
		}
	}
	require.True(t, found, "no OS/2 table")
	require.GreaterOrEqual(t, headAt, 0, "no head table")
	be.PutUint32(b[headAt+8:], 0)
	be.PutUint32(b[headAt+8:], 0xB1B0AFBA-sum32(b))
	return b
}

func sum32(b []byte) uint32 {
	var s uint32
	for i := 0; i < len(b); i += 4 {
		var w [4]byte
		copy(w[:], b[i:min(i+4, len(b))])
		s += binary.BigEndian.Uint32(w[:])
	}
	return s
}

func TestLicenceBits(t *testing.T) {
	// fsType bits from the OpenType spec, OS/2 table, fsType.
	tests := []struct {
		fsType  uint16
		kind    string // print, screen, screen-embed
		wantErr string
		noSub   bool
	}{
		{0x0000, "print", "", false},                             // Installable
		{0x0002, "print", "Restricted License embedding", false}, // Restricted
		{0x0002, "screen-embed", "Restricted License", false},    // embedding in SVG too
		{0x0002, "screen", "", false},                            // nothing embedded
		{0x0006, "print", "", false},                             // v0–2 fonts: the least restrictive applies
		{0x0004, "print", "", false},                             // Preview & Print
		{0x0008, "print", "", false},                             // Editable
		{0x0100, "print", "", true},                              // No subsetting
		{0x0200, "print", "Bitmap embedding only", false},        // Bitmap only
		{0x0208, "screen-embed", "Bitmap embedding only", false}, // Editable, bitmap only
		{0x0104, "print", "", true},                              // Preview & Print, no subsetting
	}
	for _, tc := range tests {
		for _, base := range []struct {
			name string
			b    []byte
		}{{"lm.otf", lmsans10regular.TTF}, {"go.ttf", goregular.TTF}} {
			t.Run(base.name+"/"+tc.kind, func(t *testing.T) {
				out := "    fonts: {regular: " + base.name + "}\n"
				head := specHead
				switch tc.kind {
				case "screen":
					head = strings.Replace(head, "kind: print", "kind: screen", 1)
				case "screen-embed":
					head = strings.Replace(head, "kind: print", "kind: screen", 1)
					out = "    fonts: {regular: " + base.name + ", embed: true}\n"
				}
				spec, o := specIn(t, head+out, map[string][]byte{base.name: withFsType(t, base.b, tc.fsType)})
				s, err := Load(spec, o)
				if tc.wantErr != "" {
					require.Error(t, err, "fsType %#04x", tc.fsType)
					assert.Contains(t, err.Error(), tc.wantErr)
					assert.Contains(t, err.Error(), "feature.yaml:7:")
					assert.Contains(t, err.Error(), base.name)
					return
				}
				require.NoError(t, err, "fsType %#04x", tc.fsType)
				l := s.Embedding(Regular).Licence
				assert.True(t, l.HasOS2)
				assert.Equal(t, tc.fsType, l.FsType)
				assert.Equal(t, tc.noSub, l.NoSubsetting())
			})
		}
	}
}

// cffRange returns where the CFF table sits in an OpenType file.
func cffRange(t testing.TB, b []byte) (int, int) {
	be := binary.BigEndian
	for r := 0; r < int(be.Uint16(b[4:])); r++ {
		rec := 12 + 16*r
		if string(b[rec:rec+4]) == "CFF " {
			return int(be.Uint32(b[rec+8:])), int(be.Uint32(b[rec+12:]))
		}
	}
	require.Fail(t, "no CFF table")
	return 0, 0
}

func TestBadCFFFontsAreErrors(t *testing.T) {
	lm := lmsans10regular.TTF
	off, length := cffRange(t, lm)
	be := binary.BigEndian
	patch := func(f func(b []byte)) []byte {
		b := append([]byte(nil), lm...)
		f(b)
		return b
	}
	tests := []struct {
		name string
		b    []byte
	}{
		// the file cut inside its CFF table
		{"truncated", lm[:off+length/2]},
		// the CFF table's directory length cut to 100 bytes: its INDEXes
		// run past its end
		{"short CFF table", patch(func(b []byte) {
			for r := 0; r < int(be.Uint16(b[4:])); r++ {
				if rec := 12 + 16*r; string(b[rec:rec+4]) == "CFF " {
					be.PutUint32(b[rec+12:], 100)
				}
			}
		})},
		// the Name INDEX's offset size set to 9 (TN #5176 allows 1–4)
		{"offset size out of range", patch(func(b []byte) { b[off+int(b[off+2])+2] = 9 })},
		// CFF version 2 in a CFF table
		{"wrong version", patch(func(b []byte) { b[off] = 2 })},
		// every charstring byte made a callsubr with a stack of one
		// number: subroutine numbers beyond the INDEX
		{"charstrings call missing subroutines", patch(func(b []byte) {
			for i := off + length - 400; i < off+length; i += 2 {
				b[i], b[i+1] = 0xF8, 0x0A // 247-based number, then callsubr
			}
		})},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			spec, out := specIn(t, specHead+"    fonts: {regular: bad.otf}\n", map[string][]byte{"bad.otf": tc.b})
			_, err := Load(spec, out)
			require.Error(t, err)
			assert.Contains(t, err.Error(), "bad.otf")
			assert.Contains(t, err.Error(), "feature.yaml:7:")
		})
	}
}

// FuzzFontFile feeds arbitrary bytes to what loading a font file runs:
// the face list, face selection, the parse and the outline checks. It must
// return errors, never panic or hang.
func FuzzFontFile(f *testing.F) {
	f.Add(lmsans10regular.TTF[:4096])
	f.Add(makeCollection(f, goregular.TTF, lmsans10bold.TTF)[:6000])
	f.Add([]byte("ttcf\x00\x01\x00\x00\x00\x00\x00\x02\x00\x00\x00\x14\x00\x00\x00\x20"))
	off, length := cffRange(f, lmsans10regular.TTF)
	f.Add(lmsans10regular.TTF[off : off+min(length, 3000)])
	f.Fuzz(func(t *testing.T, b []byte) {
		_, _ = Faces(b)
		if i, err := pickFace(b, specs.FaceRef{Name: "x"}); err == nil {
			var s Set
			_ = s.set(Regular, b, "", i, "fuzz")
		}
		var s Set
		if s.set(Regular, b, "", 0, "fuzz") == nil {
			// What Load accepts is measured and drawn: canvas's deferred
			// parse, metrics and shaping must fail as errors too.
			_ = s.Ready()
			_ = s.Metrics(Regular, 10)
			_ = s.Width(Regular, 10, "Ag 1868")
			_ = s.Err()
			_ = s.HasGlyph(Regular, 'A')
		}
	})
}

func TestFiguresAreTabularLining(t *testing.T) {
	// EB Garamond's default figures are old-style and proportional: '1'
	// is narrower than '0'. Regular text is shaped with lnum (lining,
	// still proportional); Figures with lnum and tnum (every digit one
	// advance). The default face's figures are tabular already (DejaVu
	// Sans Condensed: all ten digits one advance, read from its hmtx by
	// canvas here and equal under both styles).
	eb := ebGaramond(t)
	spec, out := specIn(t, specHead+"    fonts: {regular: eb.otf}\n", map[string][]byte{"eb.otf": eb})
	s, err := Load(spec, out)
	require.NoError(t, err)
	assert.NotEqual(t, s.Width(Regular, 10, "1111"), s.Width(Regular, 10, "0000"), "proportional figures in text")
	assert.InDelta(t, s.Width(Figures, 10, "1111"), s.Width(Figures, 10, "0000"), 1e-9, "tabular figures")
	assert.InDelta(t, s.Width(Figures, 10, "1868"), s.Width(Figures, 10, "2025"), 1e-9, "tabular figures")

	d := mustDefault(t)
	for _, st := range []Style{Regular, Figures} {
		assert.InDelta(t, d.Width(st, 10, "1111"), d.Width(st, 10, "0000"), 1e-9, st.String())
	}
	assert.Equal(t, d.Width(Regular, 7, "1868 2025"), d.Width(Figures, 7, "1868 2025"))
}

func TestEmbeddingOf(t *testing.T) {
	// Outlines a PDF or SVG cannot carry as a font are drawn as outlines,
	// with the reason; the font reader refuses such files today (CFF2:
	// "not supported"), so these faces are built by hand.
	goFace, err := parseSFNT(goregular.TTF, 0)
	require.NoError(t, err)
	e, err := embeddingOf(goFace)
	require.NoError(t, err)
	assert.Equal(t, TrueType, e.Outlines)
	assert.Empty(t, e.Outlined)

	noLoca := *goFace
	noLoca.Tables = map[string][]byte{"head": goFace.Tables["head"], "glyf": goFace.Tables["glyf"]}
	e, err = embeddingOf(&noLoca)
	require.NoError(t, err)
	assert.Contains(t, e.Outlined, "lack a glyf or loca table")

	short := *goFace
	short.Tables = map[string][]byte{"head": goFace.Tables["head"], "glyf": goFace.Tables["glyf"], "loca": goFace.Tables["loca"][:10]}
	e, err = embeddingOf(&short)
	require.NoError(t, err)
	assert.Contains(t, e.Outlined, "loca table is shorter")

	lm, err := parseSFNT(lmsans10regular.TTF, 0)
	require.NoError(t, err)
	cff2 := *lm
	cff2.Tables = map[string][]byte{"CFF2": {2, 0, 5, 0, 0}}
	e, err = embeddingOf(&cff2)
	require.NoError(t, err)
	assert.Equal(t, CFF2, e.Outlines)
	assert.Contains(t, e.Outlined, "CFF2")
}

// TestDamagedCompositeGlyphs: a composite glyph record cut short or naming
// a glyph past the font's count (OpenType glyf table, "Composite glyph
// description") is refused when the font loads, so `check` refuses what
// the PDF writer would fail on (issue 20).
func TestDamagedCompositeGlyphs(t *testing.T) {
	face, err := parseSFNT(dejavusanscondensed.TTF, 0)
	require.NoError(t, err)
	head, loca := face.Tables["head"], face.Tables["loca"]
	long := binary.BigEndian.Uint16(head[50:]) == 1
	at := func(i int) uint32 {
		if long {
			return binary.BigEndian.Uint32(loca[4*i:])
		}
		return 2 * uint32(binary.BigEndian.Uint16(loca[2*i:]))
	}
	// The first composite glyph of the default face (an accented letter).
	comp := -1
	for id := 0; id < int(face.NumGlyphs()); id++ {
		g := face.Tables["glyf"][at(id):at(id+1)]
		if len(g) >= 14 && int16(binary.BigEndian.Uint16(g)) < 0 {
			comp = id
			break
		}
	}
	require.GreaterOrEqual(t, comp, 0, "DejaVu Sans Condensed has composite glyphs")
	start := at(comp)
	cases := []struct {
		name  string
		patch func(glyf []byte)
		want  string
	}{
		{"component past the glyph count", func(g []byte) { binary.BigEndian.PutUint16(g[start+12:], 0xffff) }, "beyond the font's"},
		{"more components promised than recorded", func(g []byte) {
			// MORE_COMPONENTS on the last record: the walk runs off the glyph.
			for p := start + 10; ; {
				flags := binary.BigEndian.Uint16(g[p:])
				size := uint32(4 + 2)
				if flags&1 != 0 {
					size = 4 + 4
				}
				switch {
				case flags&0x08 != 0:
					size += 2
				case flags&0x40 != 0:
					size += 4
				case flags&0x80 != 0:
					size += 8
				}
				if flags&0x20 == 0 {
					binary.BigEndian.PutUint16(g[p:], flags|0x20)
					return
				}
				p += size
			}
		}, "truncated composite"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bad := *face
			bad.Tables = map[string][]byte{}
			for k, v := range face.Tables {
				bad.Tables[k] = v
			}
			glyf := append([]byte(nil), face.Tables["glyf"]...)
			c.patch(glyf)
			bad.Tables["glyf"] = glyf
			_, err := embeddingOf(&bad)
			require.Error(t, err)
			assert.Contains(t, err.Error(), c.want)
		})
	}
}
