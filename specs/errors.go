package specs

import (
	"fmt"
	"strings"
)

// MaxErrors caps how many problems one run reports.
const MaxErrors = 50

// Error is one problem at a place in a spec or data file.
type Error struct {
	Pos Pos
	Msg string
}

func (e *Error) Error() string { return e.Pos.String() + ": " + e.Msg }

// Errors is every problem found, in file order. It is an error itself.
type Errors []*Error

func (es Errors) Error() string {
	var b strings.Builder
	for i, e := range es {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
	}
	if len(es) >= MaxErrors {
		fmt.Fprintf(&b, "\n(stopped after %d problems)", MaxErrors)
	}
	return b.String()
}

// Add appends a problem unless the cap is reached. It reports whether
// there is room for more.
func (es *Errors) Add(pos Pos, format string, args ...any) bool {
	if len(*es) >= MaxErrors {
		return false
	}
	*es = append(*es, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...)})
	return len(*es) < MaxErrors
}

// Err returns the list as an error, or nil when it is empty.
func (es Errors) Err() error {
	if len(es) == 0 {
		return nil
	}
	return es
}

// Closest returns up to n candidates nearest to word by edit distance,
// for "did you mean" hints. Candidates further than about a third of the
// word's length are left out.
func Closest(word string, candidates []string, n int) []string {
	type scored struct {
		s string
		d int
	}
	limit := len([]rune(word))/3 + 2
	var best []scored
	for _, c := range candidates {
		d := editDistance(strings.ToLower(word), strings.ToLower(c))
		if d > limit {
			continue
		}
		i := len(best)
		for i > 0 && (best[i-1].d > d || best[i-1].d == d && best[i-1].s > c) {
			i--
		}
		if i >= n {
			continue
		}
		best = append(best, scored{})
		copy(best[i+1:], best[i:])
		best[i] = scored{c, d}
		if len(best) > n {
			best = best[:n]
		}
	}
	out := make([]string, len(best))
	for i, b := range best {
		out[i] = b.s
	}
	return out
}

// editDistance is the Levenshtein distance over runes.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

func didYouMean(word string, candidates []string) string {
	c := Closest(word, candidates, 1)
	if len(c) == 0 {
		return ""
	}
	return fmt.Sprintf("; did you mean %q?", c[0])
}
