package main

// --no-proofs keeps the proofs of pages that did not change (issue 15,
// item 3): a proof that no longer shows its page is removed and listed
// as stale, the contact sheet likewise.

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestNoProofsKeepsUnchangedProofs(t *testing.T) {
	spec := newJob(t, jobSpec("order: alphabetical\n")) // no reflow: only page 2 changes
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet")
	before := snapshot(t, out)
	m := loadManifest(t, out)
	pages := m.Output("print").Pages
	require.Greater(t, len(pages), 2)
	term := pages[1].Terms[0] // on page 2
	nudgeCount(t, spec, term)

	buildInto(t, spec, out, "--quiet", "--no-proofs")
	r := loadChanges(t, out)
	proof := func(n int) string { return fmt.Sprintf("print/proofs/page-%03d.png", n) }
	assert.Equal(t, []string{"print/contact.png", proof(2)}, r.Stale, "stale: page 2's proof and the contact sheet; %+v", r.PageReasons)
	for n := 1; n <= len(pages); n++ {
		got, err := os.ReadFile(filepath.Join(out, filepath.FromSlash(proof(n))))
		if n == 2 {
			assert.True(t, os.IsNotExist(err), "page 2's proof is stale: removed")
			continue
		}
		require.NoError(t, err, "page %d's proof is kept", n)
		assert.Equal(t, before[proof(n)], got, "page %d's proof is the last build's", n)
	}
	_, err := os.Stat(filepath.Join(out, "print", "contact.png"))
	assert.True(t, os.IsNotExist(err), "the contact sheet shows page 2: removed")

	// Nothing changed: nothing removed, the kept proofs stay.
	buildInto(t, spec, out, "--quiet", "--no-proofs")
	r = loadChanges(t, out)
	assert.True(t, r.Nothing(), "summary: %s", r.Summary)
	assert.Empty(t, r.Stale)
	_, err = os.Stat(filepath.Join(out, filepath.FromSlash(proof(1))))
	assert.NoError(t, err)

	// With proofs again, only page 2's is drawn.
	_, stderr := buildInto(t, spec, out)
	assert.Contains(t, stderr, fmt.Sprintf("proofs 1 drawn, %d kept", len(pages)-1))
}
