package feature

import (
	"testing"

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
	if len(got) != 4 {
		t.Fatalf("%d findings, want 4: %v", len(got), got)
	}
	if got[0].Message != "m; also web p. 1" {
		t.Errorf("first spike says %q", got[0].Message)
	}
	if got[3].Term != "tool" || got[3].Message != "n" {
		t.Errorf("other spike %v", got[3])
	}
}
