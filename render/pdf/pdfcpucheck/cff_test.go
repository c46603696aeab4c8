package pdfcpucheck

import (
	"bytes"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/pdf"
)

// TestPDFCPUReadBackCFF: a document set in CFF OpenType fonts (Latin
// Modern Sans, github.com/go-fonts/latin-modern) passes pdfcpu's strict
// validation, and its fonts are what ISO 32000-1 asks for CFF outlines in
// a Type 0 font: a CIDFontType0 descendant (§9.7.4.1) whose descriptor has
// FontFile3 with Subtype CIDFontType0C (Table 126), and no CIDToGIDMap
// (which only CIDFontType2 has, Table 117).
func TestPDFCPUReadBackCFF(t *testing.T) {
	reg, bold := font(t, lmsans10regular.TTF), font(t, lmsans10bold.TTF)
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: "CFF read back", Version: "0.0.1", Date: testDate})
	for i := 0; i < 2; i++ {
		require.NoError(t, w.AddPage(pdf.PageSetup{Boxes: boxes(), Marks: &pdf.MarkOptions{}, Slug: "read-back test"}, drawing(reg, bold)))
	}
	require.NoError(t, w.Close())
	ctx := readStrict(t, buf.Bytes())

	d, _, _, err := ctx.PageDict(1, false)
	require.NoError(t, err)
	fonts := dict(t, ctx, dict(t, ctx, d["Resources"])["Font"])
	cffFonts := 0
	for name, f := range fonts {
		fd := dict(t, ctx, f)
		arr, err := ctx.DereferenceArray(fd["DescendantFonts"])
		require.NoError(t, err)
		require.Len(t, arr, 1)
		cid := dict(t, ctx, arr[0])
		if st := cid.NameEntry("Subtype"); st == nil || *st != "CIDFontType0" {
			continue // the slug's TrueType font
		}
		cffFonts++
		_, hasMap := cid.Find("CIDToGIDMap")
		assert.False(t, hasMap, "font %s: CIDFontType0 has no CIDToGIDMap", name)
		_, hasW := cid.Find("W")
		assert.True(t, hasW, "font %s: widths", name)
		_, hasTU := fd.Find("ToUnicode")
		assert.True(t, hasTU, "font %s: ToUnicode", name)
		desc := dict(t, ctx, cid["FontDescriptor"])
		sd, _, err := ctx.DereferenceStreamDict(desc["FontFile3"])
		require.NoError(t, err)
		require.NotNil(t, sd, "font %s: FontFile3", name)
		st := sd.Dict.NameEntry("Subtype")
		require.NotNil(t, st)
		assert.Equal(t, "CIDFontType0C", *st)
	}
	assert.Equal(t, 2, cffFonts, "both faces embedded as CFF")
}
