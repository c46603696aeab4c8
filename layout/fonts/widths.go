package fonts

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"runtime/debug"
	"sort"
	"strings"
)

// widthsMagic starts a widths file. Change the version whenever Width
// measures differently, so that old files are refused.
const widthsMagic = "sheaf text widths v2\n"

// maxWidthsFile bounds what LoadWidths reads: a full cache of long
// strings is well under it.
const maxWidthsFile = 64 << 20

// SaveWidths writes every width measured (or taken from LoadWidths) so
// far, for LoadWidths in a later run with the same fonts: shaping
// thousands of labels costs more than reading their widths back. Widths
// loaded but not used are left out, so the file follows what the runs
// measure. Entries are sorted: equal caches give equal bytes.
func (s *Set) SaveWidths(w io.Writer) error {
	s.mu.Lock()
	if s.savedRaw != nil && s.reused == len(s.widths) && len(s.widths) == len(s.saved) {
		// Every width came from the file loaded, and all of it was used:
		// the same entries, so the same bytes.
		raw := s.savedRaw
		s.mu.Unlock()
		_, err := w.Write(raw)
		return err
	}
	keys := make([]widthKey, 0, len(s.widths))
	for k := range s.widths {
		keys = append(keys, k)
	}
	var buf bytes.Buffer
	buf.WriteString(widthsMagic)
	id := s.identity()
	buf.Write(id[:])
	sort.Slice(keys, func(i, j int) bool {
		a, b := keys[i], keys[j]
		if a.st != b.st {
			return a.st < b.st
		}
		if a.size != b.size {
			return a.size < b.size
		}
		return a.text < b.text
	})
	buf.Write(binary.AppendUvarint(nil, uint64(len(keys))))
	for _, k := range keys {
		var e []byte
		e = append(e, byte(k.st))
		e = binary.LittleEndian.AppendUint64(e, math.Float64bits(k.size))
		e = binary.LittleEndian.AppendUint64(e, math.Float64bits(s.widths[k]))
		e = binary.AppendUvarint(e, uint64(len(k.text)))
		e = append(e, k.text...)
		buf.Write(e)
	}
	s.mu.Unlock()
	sum := sha256.Sum256(buf.Bytes())
	buf.Write(sum[:])
	_, err := w.Write(buf.Bytes())
	return err
}

// LoadWidths makes the widths SaveWidths wrote answer Width, in place of
// those loaded before. Data written for other fonts or by another build
// of the measuring code, or damaged, is an error and adds nothing: widths
// are then measured afresh. Widths read are the very float64 values
// measured, so text laid out with them is laid out as before.
func (s *Set) LoadWidths(r io.Reader) error {
	data, err := io.ReadAll(io.LimitReader(r, maxWidthsFile+1))
	if err != nil {
		return err
	}
	if len(data) > maxWidthsFile {
		return errors.New("fonts: widths: file too large")
	}
	if len(data) < len(widthsMagic)+2*sha256.Size || !strings.HasPrefix(string(data), widthsMagic) {
		return errors.New("fonts: widths: not a widths file of this version")
	}
	body, sum := data[:len(data)-sha256.Size], data[len(data)-sha256.Size:]
	if got := sha256.Sum256(body); !bytes.Equal(got[:], sum) {
		return errors.New("fonts: widths: checksum mismatch (damaged file)")
	}
	body = body[len(widthsMagic):]
	id := s.identity()
	if !bytes.Equal(body[:sha256.Size], id[:]) {
		return errors.New("fonts: widths: written for other fonts or another build of sheaf")
	}
	rest := body[sha256.Size:]
	n, k := binary.Uvarint(rest)
	if k <= 0 {
		return errors.New("fonts: widths: bad entry count")
	}
	rest = rest[k:]
	// Sized once: an entry takes 18 bytes at least, so the count is
	// bounded by the data, whatever the header says.
	entries := make(map[widthKey]float64, min(n, uint64(len(rest)/18)))
	for i := uint64(0); i < n; i++ {
		if len(rest) < 17 {
			return fmt.Errorf("fonts: widths: entry %d is cut short", i)
		}
		st := Style(rest[0])
		if st >= numStyles {
			return fmt.Errorf("fonts: widths: entry %d: style %d", i, rest[0])
		}
		size := math.Float64frombits(binary.LittleEndian.Uint64(rest[1:]))
		w := math.Float64frombits(binary.LittleEndian.Uint64(rest[9:]))
		rest = rest[17:]
		l, k := binary.Uvarint(rest)
		if k <= 0 || l > uint64(len(rest)-k) {
			return fmt.Errorf("fonts: widths: entry %d: bad text length", i)
		}
		entries[widthKey{st, size, string(rest[k : k+int(l)])}] = w
		rest = rest[k+int(l):]
	}
	if len(rest) != 0 {
		return errors.New("fonts: widths: data after the last entry")
	}
	s.mu.Lock()
	s.saved, s.savedRaw, s.reused = entries, data, 0
	for k := range s.widths {
		if _, ok := entries[k]; ok {
			s.reused++ // measured before the load, and in the file too
		}
	}
	s.seedAdvances(entries)
	s.mu.Unlock()
	return nil
}

// seedAdvances makes the advances behind saved widths known, to s and to
// the Sets sharing its shaping (ShareShaping): a width is a whole number
// of font units scaled by its size (measure), so a width saved at one
// size gives the text's advance, and with it the width at any other size
// or in another output set in the same faces, as shaping would give it.
// Only an advance that gives the saved float64 back exactly is taken.
// s.mu is held.
func (s *Set) seedAdvances(entries map[widthKey]float64) {
	if s.adv == nil {
		s.adv = &advances{}
	}
	a := s.adv
	a.mu.Lock()
	defer a.mu.Unlock()
	for k, w := range entries {
		ak := advanceKey{k.st, k.text}
		if _, ok := a.m[ak]; ok || len(a.m) >= maxAdvances || s.sfnt[k.st] == nil {
			continue
		}
		em := s.mmPerEm(k.st, k.size)
		u := math.Round(w * mmPerPt / em)
		if math.IsNaN(u) || math.Abs(u) > math.MaxInt32 || em*u/mmPerPt != w {
			continue
		}
		if a.m == nil {
			a.m = make(map[advanceKey]int32, len(entries))
		}
		a.m[ak] = int32(u)
	}
}

// sameBytes reports whether a and b are the same slice of memory.
func sameBytes(a, b []byte) bool {
	return len(a) == len(b) && (len(a) == 0 || &a[0] == &b[0])
}

// identity is what a width depends on besides the key: the bytes of each
// font and the versions of the shaping code (canvas and the HarfBuzz port
// under it, as recorded in the binary).
func (s *Set) identity() [sha256.Size]byte {
	h := sha256.New()
	h.Write([]byte(widthsMagic))
	var sums [numStyles][sha256.Size]byte
	for st := Style(0); st < numStyles; st++ {
		sum := &sums[st]
		switch c := s.fonts[st]; {
		case st > Regular && sameBytes(s.raw[st], s.raw[Regular]):
			*sum = sums[Regular] // the italic or figures face is the regular one
		case c != nil && sameBytes(c.b, s.raw[st]):
			*sum = c.sum()
		default:
			*sum = sha256.Sum256(s.raw[st])
		}
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
