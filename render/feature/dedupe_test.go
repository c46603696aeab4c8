package feature

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/preflight"
)

// TestDedupeData: a spike is a fact about the data, reported once however
// many outputs show the term; findings about an output stay one each
// (invented findings).
func TestDedupeData(t *testing.T) {
	in := []preflight.Finding{
		{ID: preflight.IDSpike, Output: "print", Page: 7, Term: "window", Year: 2014, Message: "m"},
		{ID: preflight.IDLabelCut, Output: "print", Page: 1, Term: "window"},
		{ID: preflight.IDSpike, Output: "web", Page: 1, Term: "window", Year: 2014, Message: "m"},
		{ID: preflight.IDLabelCut, Output: "web", Page: 1, Term: "window"},
		{ID: preflight.IDSpike, Output: "web", Page: 1, Term: "tool", Year: 1924, Message: "n"},
	}
	got := dedupeData(in)
	require.Len(t, got, 4)
	assert.Equal(t, "m; also web p. 1", got[0].Message, "the first spike names the other place")
	assert.Equal(t, "tool", got[3].Term, "the other spike")
	assert.Equal(t, "n", got[3].Message, "the other spike")
}

// TestDedupeSparse: sparse-counts is a fact about a term's data, listed
// once however many outputs show the term (invented findings).
func TestDedupeSparse(t *testing.T) {
	in := []preflight.Finding{
		{ID: preflight.IDSparse, Output: "print", Page: 3, Term: "rivet", Message: "median 3"},
		{ID: preflight.IDSparse, Output: "web", Page: 1, Term: "rivet", Message: "median 3"},
		{ID: preflight.IDSparse, Output: "web", Page: 1, Term: "gear", Message: "median 4"},
	}
	got := dedupeData(in)
	require.Len(t, got, 2)
	assert.Equal(t, "median 3; also web p. 1", got[0].Message)
	assert.Equal(t, "gear", got[1].Term)
}
