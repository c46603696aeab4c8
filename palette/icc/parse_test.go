package icc_test

import (
	"encoding/binary"
	"errors"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/palette/icc"
)

func TestBuiltInSRGB(t *testing.T) {
	p := icc.SRGB()
	assert.Equal(t, icc.ClassDisplay, p.Class)
	assert.Equal(t, icc.SpaceRGB, p.Space)
	assert.Equal(t, icc.SpaceXYZ, p.PCS)
	assert.Equal(t, "4.1", p.VersionString())
	assert.Equal(t, icc.SRGBDescription, p.Description)
	// IEC 61966-2-1 white and primaries through the profile, against the
	// PCS values of CSS Color 4's sample code (sRGB → D50 XYZ via Bradford):
	// white is D50; red is (0.4360747, 0.2225045, 0.0139322).
	for _, c := range []struct {
		rgb  []float64
		want icc.XYZ
		src  string
	}{
		{[]float64{1, 1, 1}, icc.D50, "ICC.1:2010 §7.2.16 PCS white"},
		{[]float64{1, 0, 0}, icc.XYZ{X: 0.4360747, Y: 0.2225045, Z: 0.0139322}, "CSS Color 4, lin_sRGB_to_XYZ + D65_to_D50"},
		{[]float64{0, 0, 0}, icc.XYZ{}, "black"},
	} {
		got := p.ToXYZ(c.rgb, icc.RelativeColorimetric)
		assert.InDelta(t, c.want.X, got.X, 2e-4, c.src)
		assert.InDelta(t, c.want.Y, got.Y, 2e-4, c.src)
		assert.InDelta(t, c.want.Z, got.Z, 2e-4, c.src)
		back := p.FromXYZ(got, icc.RelativeColorimetric)
		assert.InDeltaSlice(t, c.rgb, back, 1e-6, "round trip of %v", c.rgb)
	}
}

func TestReadHeader(t *testing.T) {
	h, err := icc.ReadHeader(inventedCMYK())
	require.NoError(t, err)
	assert.Equal(t, icc.ClassOutput, h.Class)
	assert.Equal(t, icc.SpaceCMYK, h.Space)
	assert.Equal(t, "CMYK", h.Space.String())
	assert.Equal(t, "Lab", h.PCS.String())
	_, err = icc.ReadHeader([]byte("%PDF-1.7 not a profile"))
	var fe *icc.FormatError
	require.ErrorAs(t, err, &fe)
}

// Hostile profiles: each must come back as a *FormatError that says what
// is wrong, never a panic or a huge allocation.
func TestHostileProfiles(t *testing.T) {
	good := inventedCMYK()
	be := binary.BigEndian
	mutate := func(f func(b []byte) []byte) []byte {
		return f(append([]byte(nil), good...))
	}
	tagOffset := func(b []byte, sig string) int {
		n := int(be.Uint32(b[128:]))
		for i := 0; i < n; i++ {
			e := b[132+12*i:]
			if string(e[:4]) == sig {
				return int(be.Uint32(e[4:]))
			}
		}
		require.FailNow(t, "tag missing", "no %s tag in the profile's tag table", sig)
		return 0
	}
	cases := []struct {
		name string
		b    []byte
		want string
	}{
		{"empty", nil, "too short"},
		{"not ICC", append([]byte("GIF89a"), make([]byte, 200)...), "acsp"},
		{"truncated in the tags", good[:len(good)-100], "truncated"},
		{"truncated, size patched", mutate(func(b []byte) []byte {
			b = b[:600]
			be.PutUint32(b, 600)
			return b
		}), "past the end"},
		{"tag offset past the end", mutate(func(b []byte) []byte {
			be.PutUint32(b[132+12*2+4:], 0x7fffff00)
			return b
		}), "past the end"},
		{"tag table past the end", mutate(func(b []byte) []byte {
			be.PutUint32(b[128:], 0x10000000)
			return b
		}), "tag table"},
		{"unknown table type", mutate(func(b []byte) []byte {
			copy(b[tagOffset(b, "A2B0"):], "zzzz")
			return b
		}), "unknown table type"},
		{"absurd CLUT", mutate(func(b []byte) []byte {
			// mAB CLUT of 255^4 × 3 entries.
			o := tagOffset(b, "A2B0")
			clut := o + int(be.Uint32(b[o+24:]))
			for i := 0; i < 4; i++ {
				b[clut+i] = 255
			}
			return b
		}), "CLUT"},
		{"CLUT precision 3", mutate(func(b []byte) []byte {
			o := tagOffset(b, "A2B0")
			b[o+int(be.Uint32(b[o+24:]))+16] = 3
			return b
		}), "precision"},
		{"element offset outside", mutate(func(b []byte) []byte {
			o := tagOffset(b, "B2A0")
			be.PutUint32(b[o+12:], 0xfffffff0)
			return b
		}), "outside the tag"},
		{"unknown curve type", mutate(func(b []byte) []byte {
			o := tagOffset(b, "A2B0")
			copy(b[o+int(be.Uint32(b[o+12:])):], "lolo")
			return b
		}), "unknown curve type"},
		{"wrong channel count", mutate(func(b []byte) []byte {
			b[tagOffset(b, "A2B0")+8] = 3
			return b
		}), "channels"},
		{"version 7", mutate(func(b []byte) []byte {
			b[8] = 7
			return b
		}), "version"},
		{"device link", mutate(func(b []byte) []byte {
			copy(b[12:], "link")
			return b
		}), "not supported"},
		{"huge declared size", mutate(func(b []byte) []byte {
			be.PutUint32(b, 0xffffffff)
			return b
		}), "limit"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, err := icc.Parse(c.b)
			assert.Nil(t, p)
			var fe *icc.FormatError
			require.True(t, errors.As(err, &fe), "want a *FormatError, got %v", err)
			assert.Contains(t, err.Error(), c.want)
		})
	}
}

// A hostile lut16 asking for a 255^8 grid is refused before allocating.
func TestHostileLut16(t *testing.T) {
	tag := append([]byte("mft2"), 0, 0, 0, 0, 8, 3, 255, 0)
	for i := 0; i < 9; i++ {
		v := 0.0
		if i%4 == 0 {
			v = 1
		}
		tag = append(tag, s15(v)...)
	}
	tag = binary.BigEndian.AppendUint16(tag, 4096)
	tag = binary.BigEndian.AppendUint16(tag, 4096)
	tag = append(tag, make([]byte, 1000)...)
	b := buildProfile("prtr", "8CLR", "Lab ", 0x02100000, []tagData{{"A2B0", tag}})
	_, err := icc.Parse(b)
	var fe *icc.FormatError
	require.ErrorAs(t, err, &fe)
	assert.Contains(t, err.Error(), "absurd")
	assert.Equal(t, "A2B0", fe.Tag)
}

// FuzzParse feeds Parse arbitrary bytes: it must return a profile or an
// error, never panic; and a profile it returns must convert colours
// without panicking.
func FuzzParse(f *testing.F) {
	f.Add(icc.SRGBBytes())
	f.Add(inventedCMYK())
	f.Add(inventedCMYK()[:700])
	f.Add([]byte("acsp"))
	f.Fuzz(func(t *testing.T, b []byte) {
		p, err := icc.Parse(b)
		if err != nil {
			var fe *icc.FormatError
			require.True(t, errors.As(err, &fe), "error %v is not a *FormatError", err)
			return
		}
		dev := make([]float64, p.Channels())
		for i := range dev {
			dev[i] = 0.3
		}
		for _, in := range []icc.Intent{icc.Perceptual, icc.RelativeColorimetric} {
			l := p.ToLab(dev, in)
			if p.CanOutput() {
				p.FromLab(l, in)
			}
		}
		if p.CanOutput() {
			if xf, err := icc.NewTransform(icc.SRGB(), p, icc.RelativeColorimetric, true); err == nil {
				xf.Convert([]float64{0.2, 0.5, 0.9})
			}
		}
	})
}
