package specs

import (
	"encoding/binary"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"
)

// Press is the printing condition of a print output: the printer's ICC
// output profile and how colours are converted into it. An output without
// one is an honest RGB file (sRGB colours, no PDF/X claim).
type Press struct {
	Profile   string  // path to the ICC output profile as the spec gives it (resolve with Spec.Resolve)
	Condition string  // OutputConditionIdentifier; empty: the profile's description
	Registry  string  // RegistryName of the condition
	InkLimit  float64 // total area coverage the press allows, in percent
	Intent    Intent  // rendering intent
	MaxShift  float64 // ΔE00 between a year's colour and its press round trip above which preflight warns
}

// Intent is the ICC rendering intent of the conversion to press colours.
type Intent string

const (
	// IntentRelative is relative colorimetric with black-point
	// compensation: in-gamut colours stay, the paper is white, the
	// source's black maps to the press's.
	IntentRelative   Intent = "relative-colorimetric"
	IntentPerceptual Intent = "perceptual"
)

// Press defaults: the ICC registry of characterized printing conditions
// (ISO 15930-7 §3 and Annex: RegistryName is usually this), 300 % total
// area coverage (common practice for coated offset; the printer's
// specification decides), and a 3 ΔE00 tolerance for a year's colour on
// press (common practice for a visible but not gross shift).
const (
	DefaultRegistry = "http://www.color.org"
	DefaultInkLimit = 300
	DefaultMaxShift = 3
)

func (d *decoder) press(n *yaml.Node, path string) *Press {
	p := &Press{Registry: DefaultRegistry, InkLimit: DefaultInkLimit, Intent: IntentRelative, MaxShift: DefaultMaxShift}
	var intent string
	d.mapping(n, path, []field{
		{"profile", d.str(&p.Profile)},
		{"condition", d.str(&p.Condition)},
		{"registry", d.str(&p.Registry)},
		{"ink-limit", func(n *yaml.Node, path string) {
			n, ok := d.scalar(n, path)
			if !ok {
				return
			}
			v, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(n.Value), "%")), 64)
			if !strings.HasSuffix(strings.TrimSpace(n.Value), "%") || err != nil || v != v {
				d.errorf(n, "%s must be a percentage of total ink, like 300%%, not %q", path, n.Value)
				return
			}
			if v < 100 || v > 400 {
				d.errorf(n, "%s: %s is outside 100%%–400%% (four inks at most 100%% each)", path, n.Value)
				return
			}
			p.InkLimit = v
		}},
		{"intent", d.choice(&intent, string(IntentRelative), string(IntentPerceptual))},
		{"max-shift", d.number(&p.MaxShift, 0, 100, true)},
	}, "profile")
	if intent != "" {
		p.Intent = Intent(intent)
	}
	return p
}

// checkPress reads the 128-byte header of every output's press profile, so
// a missing, unreadable, non-ICC or wrong-class file is reported at the
// spec line that names it (the full profile is parsed when it is used).
// ICC.1:2010 §7.2: bytes 12–15 device class, 16–19 colour space, 36–39
// 'acsp'.
func (d *decoder) checkPress(s *Spec) {
	for _, o := range s.Outputs {
		if o.Press == nil || o.Press.Profile == "" {
			continue
		}
		key := "outputs." + o.Name + ".press.profile"
		at := s.Where(key)
		path := s.Resolve(o.Press.Profile)
		f, err := os.Open(path)
		if err != nil {
			if errors.Is(err, fs.ErrNotExist) {
				d.errs.Add(at, "%s: %s does not exist; give the printer's ICC output profile (on Debian, ghostscript installs one at /usr/share/color/icc/ghostscript/default_cmyk.icc)", key, o.Press.Profile)
			} else {
				d.errs.Add(at, "%s: cannot read %s: %v", key, o.Press.Profile, unwrapPathErr(err))
			}
			continue
		}
		var h [128]byte
		_, err = io.ReadFull(f, h[:])
		st, _ := f.Stat()
		f.Close()
		switch {
		case st != nil && st.IsDir():
			d.errs.Add(at, "%s: %s is a folder; give the ICC profile file", key, o.Press.Profile)
		case err != nil || string(h[36:40]) != "acsp":
			d.errs.Add(at, "%s: %s is not an ICC profile (no 'acsp' signature at byte 36)", key, filepath.Base(path))
		default:
			class, space := string(h[12:16]), string(h[16:20])
			size := binary.BigEndian.Uint32(h[0:])
			switch {
			case class != "prtr":
				what := map[string]string{"mntr": "a display profile", "scnr": "an input (scanner or camera) profile", "link": "a device link", "spac": "a colour space profile", "abst": "an abstract profile", "nmcl": "a named colour profile"}[class]
				if what == "" {
					what = "a profile of class " + strconv.Quote(class)
				}
				d.errs.Add(at, "%s: %s is %s ('%s'); press needs the printer's output profile (class 'prtr')", key, filepath.Base(path), what, class)
			case space != "CMYK" && space != "GRAY" && space != "RGB ":
				d.errs.Add(at, "%s: %s is an output profile for %q; press takes CMYK, gray or RGB output profiles", key, filepath.Base(path), strings.TrimSpace(space))
			case size < 132:
				d.errs.Add(at, "%s: %s declares %d bytes, too few for an ICC profile", key, filepath.Base(path), size)
			}
		}
	}
}

func unwrapPathErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
