package pdf

import (
	"testing"

	"github.com/stretchr/testify/require"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
)

// EncodePage reuses compressors and content buffers between pages. A
// reused zlib.Writer must write what a new one writes (Go's compress/zlib
// documents Reset as giving the state of NewWriterLevel), and a reused
// buffer must not leak a longer page's bytes into a shorter one: the page
// encoded after others equals the page encoded with nothing pooled.
func TestEncodePageReuseIsByteIdentical(t *testing.T) {
	reg, bold := loadFont(t, goregular.TTF), loadFont(t, gobold.TTF)
	long := PageSetup{Boxes: a5Boxes(), Marks: &MarkOptions{}, Slug: "a longer page first"}
	short := PageSetup{Boxes: a5Boxes()}

	fresh, err := encodePage(short, nil, 0, nil, nil) // nothing pooled: the reference
	require.NoError(t, err)
	for range 3 {
		_, err := EncodePage(long, testDrawing(reg, bold))
		require.NoError(t, err)
		again, err := EncodePage(short, nil)
		require.NoError(t, err)
		require.Equal(t, fresh.Content, again.Content)
	}
	require.NotEmpty(t, encodePools.zlibs, "compressors were kept for the next page")
}
