package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/palette/icc"
	"sheaf/render/tooltest"
)

// TestBuildPress: from the command line, an output without press is an
// honest RGB PDF and one with press a CMYK PDF/X-4 (README, Press colour);
// changing the profile file, with the spec unchanged, redraws the pages
// (the page inputs hash the profile's bytes).
func TestBuildPress(t *testing.T) {
	coated := tooltest.ICCProfile(t, "default_cmyk.icc")
	other := tooltest.ICCProfile(t, "ps_cmyk.icc")

	rgbSpec := newJob(t, jobSpec(""))
	rgbOut := filepath.Join(t.TempDir(), "out")
	buildInto(t, rgbSpec, rgbOut, "--quiet")
	rgb, err := os.ReadFile(filepath.Join(rgbOut, "print", "print.pdf"))
	require.NoError(t, err)
	for _, not := range []string{"/OutputIntents", "GTS_PDFX", "pdfxid"} {
		assert.False(t, bytes.Contains(rgb, []byte(not)), "an RGB PDF has %s", not)
	}

	spec := newJob(t, jobSpec("    press: {profile: press.icc}\n"))
	profile := filepath.Join(filepath.Dir(spec), "press.icc")
	b, err := os.ReadFile(coated)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(profile, b, 0o644))
	out := filepath.Join(t.TempDir(), "out")
	buildInto(t, spec, out, "--quiet")
	cmyk, err := os.ReadFile(filepath.Join(out, "print", "print.pdf"))
	require.NoError(t, err)
	for _, want := range []string{"/OutputIntents", "/GTS_PDFXVersion (PDF/X-4)", "pdfxid:GTS_PDFXVersion"} {
		assert.True(t, bytes.Contains(cmyk, []byte(want)), "the press PDF lacks %s", want)
	}
	assert.True(t, bytes.Contains(cmyk, []byte("/Info ("+describe(t, b)+")")), "the output intent carries the given profile")
	_, err = os.Stat(filepath.Join(out, "print", "proofs", "page-001.png"))
	require.NoError(t, err, "soft proofs are written")

	// Another profile under the same name: every page is drawn again.
	b2, err := os.ReadFile(other)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(profile, b2, 0o644))
	buildInto(t, spec, out, "--quiet")
	ch := loadChanges(t, out)
	require.NotEmpty(t, ch.Pages, "pages redrawn after the profile changed")
	again, err := os.ReadFile(filepath.Join(out, "print", "print.pdf"))
	require.NoError(t, err)
	assert.True(t, bytes.Contains(again, []byte("/Info ("+describe(t, b2)+")")), "the new profile is the output intent")
}

func describe(t *testing.T, profile []byte) string {
	p, err := icc.Parse(profile)
	require.NoError(t, err)
	return p.Description
}

// TestPressBadProfile: a profile that is not a printer's is bad input at
// its spec line (exit 2), for check and build alike.
func TestPressBadProfile(t *testing.T) {
	// jobSpec's extra keys start at line 14; "profile" at column 13.
	spec := newJob(t, jobSpec("    press: {profile: screen.icc}\n"))
	require.NoError(t, os.WriteFile(filepath.Join(filepath.Dir(spec), "screen.icc"), icc.SRGBBytes(), 0o644))
	for _, cmd := range []string{"check", "build"} {
		var o, e bytes.Buffer
		code := run([]string{cmd, spec, "--out", filepath.Join(t.TempDir(), "out")}, &o, &e)
		if cmd == "check" {
			code = run([]string{cmd, spec}, &o, &e)
		}
		assert.Equal(t, exitBadInput, code, cmd)
		assert.Contains(t, e.String(), "spec.yaml:14:13", cmd)
		assert.Contains(t, e.String(), "is a display profile ('mntr')", cmd)
	}
}

// TestPalettePress: `sheaf palette` with a press prints the rows on press
// and draws the taller swatch.
func TestPalettePress(t *testing.T) {
	coated := tooltest.ICCProfile(t, "default_cmyk.icc")
	spec := newJob(t, jobSpec("    press: {profile: "+coated+", ink-limit: 250%}\n"))
	out := filepath.Join(t.TempDir(), "pal")
	var o, e bytes.Buffer
	code := run([]string{"palette", spec, "--out", out}, &o, &e)
	require.Contains(t, []int{exitOK, exitFindings}, code, e.String())
	s := o.String()
	assert.Contains(t, s, "On press: ")
	assert.Contains(t, s, "ink limit 250%")
	assert.Regexp(t, `year\s+screen\s+C\s+M\s+Y\s+K\s+ink %\s+ΔE00\s+proof`, s)
	assert.Regexp(t, `2025\s+#[0-9a-f]{6}(\s+[\d.]+){4}\s+\d+\s+[\d.]+\s+#[0-9a-f]{6}`, s)
	_, err := os.Stat(filepath.Join(out, "swatch.png"))
	require.NoError(t, err)
}
