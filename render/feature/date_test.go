package feature

import (
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestDocumentDate: SOURCE_DATE_EPOCH first (reproducible-builds.org:
// decimal seconds since 1970-01-01T00:00:00Z), then the spec's date, then
// FallbackDate; a malformed value is bad input.
func TestDocumentDate(t *testing.T) {
	dated := &specs.Spec{Date: "2001-02-03"}
	specDay := time.Date(2001, 2, 3, 0, 0, 0, 0, time.UTC)
	tests := []struct {
		spec    *specs.Spec
		epoch   string
		want    time.Time
		wantErr bool
	}{
		{&specs.Spec{}, "", FallbackDate, false},
		{dated, "", specDay, false},
		{dated, "0", time.Unix(0, 0).UTC(), false},
		{dated, "1715938200", time.Date(2024, 5, 17, 9, 30, 0, 0, time.UTC), false}, // date -u -d @1715938200
		{dated, "yesterday", time.Time{}, true},
		{dated, "1.5", time.Time{}, true},
		{dated, "-1", time.Time{}, true},                                                 // a PDF date has a four-digit year (ISO 32000-1 §7.9.4)
		{dated, "253402300799", time.Date(9999, 12, 31, 23, 59, 59, 0, time.UTC), false}, // the last second it can hold
		{dated, "253402300800", time.Time{}, true},
	}
	for _, tt := range tests {
		got, err := DocumentDate(tt.spec, tt.epoch)
		if tt.wantErr {
			require.Error(t, err, "SOURCE_DATE_EPOCH=%q", tt.epoch)
			assert.True(t, specs.IsBadInput(err), "SOURCE_DATE_EPOCH=%q is bad input", tt.epoch)
			continue
		}
		require.NoError(t, err, "SOURCE_DATE_EPOCH=%q", tt.epoch)
		assert.True(t, tt.want.Equal(got), "SOURCE_DATE_EPOCH=%q: %v, want %v", tt.epoch, got, tt.want)
	}
}
