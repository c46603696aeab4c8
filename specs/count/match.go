package count

// matcher finds every occurrence of a set of token sequences in a stream
// of tokens: an Aho–Corasick automaton (Aho and Corasick, "Efficient
// string matching", CACM 18(6), 1975) whose alphabet is the tokens of the
// terms rather than bytes. A token no term has takes it back to the root,
// since no match can run through it.
type matcher struct {
	ids  map[string]int32 // token text → symbol
	next map[uint64]int32 // state<<32 | symbol → state
	fail []int32          // longest proper suffix state
	out  [][]int32        // terms ending at a state, its suffixes' too
}

// newMatcher builds the automaton of terms, each a sequence of tokens.
func newMatcher(terms [][]string) *matcher {
	m := &matcher{ids: map[string]int32{}, next: map[uint64]int32{}, fail: []int32{0}, out: [][]int32{nil}}
	for ti, toks := range terms {
		state := int32(0)
		for _, tk := range toks {
			id, ok := m.ids[tk]
			if !ok {
				id = int32(len(m.ids))
				m.ids[tk] = id
			}
			key := uint64(state)<<32 | uint64(uint32(id))
			nxt, ok := m.next[key]
			if !ok {
				nxt = int32(len(m.fail))
				m.next[key] = nxt
				m.fail = append(m.fail, 0)
				m.out = append(m.out, nil)
			}
			state = nxt
		}
		m.out[state] = append(m.out[state], int32(ti))
	}
	// Failure links breadth first: children of a state in symbol order
	// need not be sorted, any order of a level will do.
	children := make([][]struct{ sym, to int32 }, len(m.fail))
	for key, to := range m.next {
		from := int32(key >> 32)
		children[from] = append(children[from], struct{ sym, to int32 }{int32(uint32(key)), to})
	}
	queue := []int32{0}
	for len(queue) > 0 {
		s := queue[0]
		queue = queue[1:]
		for _, c := range children[s] {
			if s != 0 {
				f := m.fail[s]
				for {
					if to, ok := m.next[uint64(f)<<32|uint64(uint32(c.sym))]; ok {
						m.fail[c.to] = to
						break
					}
					if f == 0 {
						break
					}
					f = m.fail[f]
				}
			}
			m.out[c.to] = append(m.out[c.to], m.out[m.fail[c.to]]...)
			queue = append(queue, c.to)
		}
	}
	return m
}

// step moves from state over token tok and returns the new state; the
// terms that end there are m.out[state].
func (m *matcher) step(state int32, tok []byte) int32 {
	id, ok := m.ids[string(tok)]
	if !ok {
		return 0
	}
	for {
		if to, ok := m.next[uint64(state)<<32|uint64(uint32(id))]; ok {
			return to
		}
		if state == 0 {
			return 0
		}
		state = m.fail[state]
	}
}
