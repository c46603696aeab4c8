package count

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"unicode"
	"unicode/utf8"

	"github.com/clipperhouse/uax29/v2/words"
	"golang.org/x/text/cases"
	"golang.org/x/text/unicode/norm"
)

// maxLine is the longest run of text read without a line end. Running text
// has far shorter lines; a longer one is cut at its last space (a word
// boundary under UAX #29 WB3d), and one with no space in it is refused.
const maxLine = 1 << 20

// Hyphens that join a compound inside a line ("steam-engine" is one word)
// and that, at a line end, mark a word broken across lines.
const (
	hyphenMinus = '-'      // U+002D HYPHEN-MINUS
	hyphen      = '\u2010' // U+2010 HYPHEN
	softHyphen  = '\u00ad' // U+00AD SOFT HYPHEN: a discretionary break, never printed
)

// joiners keeps hyphenated compounds in one token: UAX #29 alone splits
// "steam-engine" into "steam", "-", "engine".
var joiners = &words.Joiners[[]byte]{Middle: []rune{hyphenMinus, hyphen}}

// Tokenizer turns running text into tokens. Its zero value keeps case; a
// Tokenizer is not safe for use by several goroutines at once.
//
// The rules, in order:
//  1. The text must be UTF-8 with no NUL byte; a leading byte order mark is
//     skipped. Lines end at LF; a CR before it is dropped.
//  2. Each line is normalised to NFKC, so ligatures, long s, full-width
//     letters and the like read as their plain letters ("ﬁ" → "fi",
//     "ſ" → "s").
//  3. The line is split at word boundaries (UAX #29, Unicode 17), except
//     that a hyphen (U+002D, U+2010) between letters or digits joins them:
//     "steam-engine" is one word.
//  4. A segment with a letter or a digit in it is a word: "don't", "3.5",
//     "1,000", "3D". One of whitespace or invisible format characters only
//     is skipped. Anything else (punctuation, symbols) is a mark: it is no
//     word, and a term's words must not have one between them unless the
//     term has it too.
//  5. In a word, soft hyphens are removed and the typographic apostrophes
//     U+2019 and U+02BC become "'", so "don’t" and "don't" are one word.
//  6. With Fold, words are case-folded (Unicode full case folding).
//  7. A word that ends a line with a hyphen right after it (or a soft
//     hyphen in it), followed on the next line by a word, is one word: the
//     hyphen is dropped when the next part starts with a lower-case letter
//     or the break was a soft hyphen ("locomo-⏎tive" → "locomotive"), and
//     kept otherwise ("pre-⏎1900" → "pre-1900"), or when the hyphenated
//     form is in Keep ("über-⏎gear" → "über-gear" when "über-gear" is a
//     listed word). A blank line, a mark or the end of the text after the
//     hyphen leaves the word and the hyphen as they are.
type Tokenizer struct {
	Fold bool
	// Keep holds hyphenated words (as tokenized: NFKC, folded with Fold)
	// that keep their hyphen when it falls at a line end.
	Keep map[string]bool

	seg    *words.Iterator[[]byte]
	caser  cases.Caser
	folder bool
	norm   []byte
	arena  []byte
	toks   []tok
	held   heldWord
	long   []byte
}

// tok is a token of the line being read: arena[start:end].
type tok struct {
	start, end int
	word       bool
	lower      bool // first letter lower-case, before folding
	soft       bool // ended with a soft hyphen (removed)
	adj        bool // the segment before it touched it (no space between)
}

// heldWord is a word that ended a line with a hyphen, waiting for the
// next line's first token.
type heldWord struct {
	text   []byte
	hyphen []byte // the hyphen after it, unless soft
	soft   bool
	ok     bool
}

// Emit receives each token in order: its text (valid only during the
// call) and whether it is a word.
type Emit func(text []byte, word bool)

// SyntaxError says where text is not what the tokenizer reads: invalid
// UTF-8, a NUL byte (a binary file), a line with no space in a MiB.
type SyntaxError struct {
	Offset int64 // byte offset from the start of the input, from 0
	Line   int   // from 1
	Msg    string
}

func (e *SyntaxError) Error() string {
	return fmt.Sprintf("byte %d (line %d): %s", e.Offset, e.Line, e.Msg)
}

func (t *Tokenizer) init() {
	if t.seg == nil {
		t.seg = words.FromBytes(nil)
		t.seg.Joiners(joiners)
	}
	if t.Fold && !t.folder {
		t.caser = cases.Fold()
		t.folder = true
	}
}

// Tokens reads r to its end and passes every token to emit. Reading
// errors come back as they are; text the tokenizer cannot read as a
// *SyntaxError.
func (t *Tokenizer) Tokens(r io.Reader, emit Emit) error {
	t.init()
	t.held.ok = false
	br := bufio.NewReaderSize(r, 64<<10)
	var off int64
	line := 1
	first := true
	for {
		b, err := br.ReadSlice('\n')
		if err == bufio.ErrBufferFull {
			// A long line: gather it, cutting at a space when it grows
			// past maxLine.
			t.long = append(t.long[:0], b...)
			for err == bufio.ErrBufferFull {
				b, err = br.ReadSlice('\n')
				t.long = append(t.long, b...)
				if len(t.long) > maxLine && err == bufio.ErrBufferFull {
					cut := bytes.LastIndexAny(t.long, " \t")
					if cut < 0 {
						return &SyntaxError{off, line, fmt.Sprintf("more than %d bytes with no space or line end: not running text", maxLine)}
					}
					if e := t.line(t.long[:cut+1], off, line, first, false, emit); e != nil {
						return e
					}
					first = false
					off += int64(cut + 1)
					t.long = append(t.long[:0], t.long[cut+1:]...)
				}
			}
			b = t.long
		}
		if err != nil && err != io.EOF {
			return err
		}
		if len(b) > 0 {
			ends := b[len(b)-1] == '\n'
			if e := t.line(b, off, line, first, ends, emit); e != nil {
				return e
			}
			first = false
			off += int64(len(b))
			line++
		}
		if err == io.EOF {
			t.flushHeld(emit)
			return nil
		}
	}
}

// line reads one line (or, with ends false, a piece of a long line).
func (t *Tokenizer) line(b []byte, off int64, lineNo int, first, ends bool, emit Emit) error {
	if first && bytes.HasPrefix(b, []byte("\ufeff")) {
		b = b[3:]
		off += 3
	}
	ascii := true
	for i, c := range b {
		if c >= utf8.RuneSelf {
			ascii = false
			break
		}
		if c == 0 {
			return &SyntaxError{off + int64(i), lineNo, "a NUL byte: a binary file, or text in UTF-16 (save it as UTF-8)"}
		}
	}
	if !ascii {
		if err := checkUTF8(b, off, lineNo); err != nil {
			return err
		}
	}
	if n := len(b); n > 0 && b[n-1] == '\n' {
		b = b[:n-1]
		if n > 1 && b[n-2] == '\r' {
			b = b[:n-2]
		}
	}
	if !ascii && !norm.NFKC.IsNormal(b) {
		t.norm = norm.NFKC.Append(t.norm[:0], b...)
		b = t.norm
	}
	t.split(b, ascii)
	t.emitLine(ends, emit)
	return nil
}

func checkUTF8(b []byte, off int64, lineNo int) error {
	for i := 0; i < len(b); {
		c := b[i]
		if c < utf8.RuneSelf {
			if c == 0 {
				return &SyntaxError{off + int64(i), lineNo, "a NUL byte: a binary file, or text in UTF-16 (save it as UTF-8)"}
			}
			i++
			continue
		}
		r, n := utf8.DecodeRune(b[i:])
		if r == utf8.RuneError && n <= 1 {
			return &SyntaxError{off + int64(i), lineNo, fmt.Sprintf("not valid UTF-8 (byte 0x%02X): save the text as UTF-8", c)}
		}
		i += n
	}
	return nil
}

// split segments one line into t.toks, the words' text post-processed
// into t.arena.
func (t *Tokenizer) split(b []byte, ascii bool) {
	t.toks, t.arena = t.toks[:0], t.arena[:0]
	t.seg.SetText(b)
	prevEnd := -1
	for t.seg.Next() {
		s := t.seg.Value()
		adj := prevEnd == t.seg.Start()
		prevEnd = t.seg.End()
		kind := classify(s)
		if kind == kindSkip {
			prevEnd = -1 // whitespace between: the next token touches nothing
			continue
		}
		start := len(t.arena)
		k := tok{start: start, word: kind == kindWord, adj: adj}
		if !k.word {
			t.arena = append(t.arena, s...)
		} else {
			k.lower, k.soft = t.appendWord(s)
		}
		k.end = len(t.arena)
		t.toks = append(t.toks, k)
	}
}

type kind uint8

const (
	kindSkip kind = iota
	kindWord
	kindMark
)

// classify tells a word (a letter or digit in it) from a mark and from
// what is skipped (whitespace, invisible format characters).
func classify(s []byte) kind {
	skip := true
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			i++
			switch {
			case c >= 'a' && c <= 'z', c >= 'A' && c <= 'Z', c >= '0' && c <= '9':
				return kindWord
			case c == ' ', c == '\t', c == '\v', c == '\f', c == '\r', c == '\n':
			default:
				skip = false
			}
			continue
		}
		r, n := utf8.DecodeRune(s[i:])
		i += n
		switch {
		case unicode.IsLetter(r), unicode.IsNumber(r):
			return kindWord
		case unicode.IsSpace(r), unicode.Is(unicode.Cf, r), unicode.Is(unicode.Mn, r), unicode.Is(unicode.Me, r):
		default:
			skip = false
		}
	}
	if skip {
		return kindSkip
	}
	return kindMark
}

// appendWord appends word s to the arena as rule 5 and 6 say. It reports
// whether its first letter is lower-case and whether it had a soft
// hyphen at its end.
func (t *Tokenizer) appendWord(s []byte) (lower, soft bool) {
	start := len(t.arena)
	plain := true
	for _, c := range s {
		if c >= utf8.RuneSelf {
			plain = false
			break
		}
	}
	if plain {
		lower = firstLower(s)
		if t.Fold {
			for _, c := range s {
				if c >= 'A' && c <= 'Z' {
					c += 'a' - 'A'
				}
				t.arena = append(t.arena, c)
			}
		} else {
			t.arena = append(t.arena, s...)
		}
		return lower, false
	}
	soft = bytes.HasSuffix(s, []byte("\u00ad"))
	lowerSet := false
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRune(s[i:])
		i += n
		if !lowerSet && (unicode.IsLetter(r) || unicode.IsNumber(r)) {
			lower, lowerSet = unicode.IsLower(r), true
		}
		switch r {
		case softHyphen:
			continue
		case '\u2019', '\u02bc':
			r = '\''
		}
		t.arena = utf8.AppendRune(t.arena, r)
	}
	if t.Fold {
		folded := t.caser.Bytes(t.arena[start:])
		t.arena = append(t.arena[:start], folded...)
	}
	return lower, soft
}

func firstLower(s []byte) bool {
	for _, c := range s {
		switch {
		case c >= 'a' && c <= 'z':
			return true
		case c >= 'A' && c <= 'Z', c >= '0' && c <= '9':
			return false
		}
	}
	return false
}

func isHyphenMark(b []byte) bool {
	return len(b) == 1 && b[0] == hyphenMinus || string(b) == "\u2010"
}

// emitLine passes the line's tokens on, first settling a word held from
// the line before and holding back this line's last word when it is
// hyphenated at the line end.
func (t *Tokenizer) emitLine(ends bool, emit Emit) {
	toks := t.toks
	if t.held.ok {
		if len(toks) > 0 && toks[0].word {
			next := toks[0]
			text := t.arena[next.start:next.end]
			h := t.held.text
			switch {
			case t.held.soft || next.lower && !t.keep(h, text):
				h = append(h, text...)
			default:
				h = append(h, '-')
				h = append(h, text...)
			}
			t.held.text = h
			t.held.ok = false
			switch {
			case ends && len(toks) == 1 && next.soft:
				// The joined word breaks again at this line's end.
				t.held.ok, t.held.soft = true, true
				return
			case ends && len(toks) == 2 && t.hyphenEnd(toks):
				t.held.ok, t.held.soft = true, false
				t.held.hyphen = append(t.held.hyphen[:0], t.arena[toks[1].start:toks[1].end]...)
				return
			}
			emit(h, true)
			toks = toks[1:]
		} else {
			t.flushHeld(emit)
		}
	}
	hold := 0
	if ends && len(toks) > 0 {
		last := toks[len(toks)-1]
		switch {
		case last.word && last.soft:
			hold = 1
		case len(toks) >= 2 && t.hyphenEnd(toks):
			hold = 2
		}
	}
	for _, k := range toks[:len(toks)-hold] {
		emit(t.arena[k.start:k.end], k.word)
	}
	if hold > 0 {
		w := toks[len(toks)-hold]
		t.held.text = append(t.held.text[:0], t.arena[w.start:w.end]...)
		t.held.soft = hold == 1
		if hold == 2 {
			h := toks[len(toks)-1]
			t.held.hyphen = append(t.held.hyphen[:0], t.arena[h.start:h.end]...)
		}
		t.held.ok = true
	}
}

// hyphenEnd reports whether toks ends with a word and a hyphen touching it.
func (t *Tokenizer) hyphenEnd(toks []tok) bool {
	n := len(toks)
	h, w := toks[n-1], toks[n-2]
	return !h.word && h.adj && w.word && isHyphenMark(t.arena[h.start:h.end])
}

func (t *Tokenizer) keep(head, tail []byte) bool {
	if len(t.Keep) == 0 {
		return false
	}
	k := make([]byte, 0, len(head)+1+len(tail))
	k = append(append(append(k, head...), '-'), tail...)
	return t.Keep[string(k)]
}

// flushHeld passes on a held word as it was: the word, then its hyphen.
func (t *Tokenizer) flushHeld(emit Emit) {
	if !t.held.ok {
		return
	}
	t.held.ok = false
	emit(t.held.text, true)
	if !t.held.soft {
		emit(t.held.hyphen, false)
	}
}
