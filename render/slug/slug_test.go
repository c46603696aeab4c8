package slug

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestAll: colliding slugs get -2, -3 in the terms' order; a name never
// depends on anything but the terms before it.
func TestAll(t *testing.T) {
	assert.Equal(t,
		[]string{"steam-engine", "steam-engine-2", "boiler", "steam-engine-3", "u3b1"},
		All([]string{"steam engine", "Steam-Engine", "boiler", "steam engine!", "α"}))
	assert.Empty(t, All(nil))
}
