package count

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

// benchArchive writes an invented archive of about size bytes: 128 files
// over 64 years, words drawn from 20,000 invented ones with Zipf's law
// (4% accented or with the fi ligature), sentences, lines wrapped
// at 72 columns with hyphenated line ends. It returns the files and 200
// terms (single words and pairs) to count.
func benchArchive(b *testing.B, size int) ([]File, []string) {
	b.Helper()
	dir := b.TempDir()
	rng := rand.New(rand.NewPCG(1, 1))
	syll := []string{"ka", "lo", "mi", "re", "tu", "va", "sen", "dor", "pim", "qua", "fin", "sto", "bre"}
	vocab := make([]string, 20000)
	for i := range vocab {
		n := 1 + rng.IntN(4)
		var w strings.Builder
		for range n {
			w.WriteString(syll[rng.IntN(len(syll))])
		}
		vocab[i] = w.String()
		switch i % 50 { // 4% of the words: an accent, the fi ligature
		case 1:
			vocab[i] = strings.Replace(vocab[i], "e", "é", 1)
		case 2:
			vocab[i] = strings.Replace(vocab[i], "fi", "\ufb01", 1)
		}
	}
	zipf := rand.NewZipf(rng, 1.1, 2, uint64(len(vocab)-1))
	var files []File
	per := size / 128
	for f := range 128 {
		var sb strings.Builder
		col := 0
		for sb.Len() < per {
			w := vocab[zipf.Uint64()]
			if col+len(w)+1 > 72 {
				if len(w) > 8 && isLowerASCII(w) && rng.IntN(2) == 0 {
					sb.WriteString(" " + w[:4] + "-\n" + w[4:])
					col = len(w) - 4
					continue
				}
				sb.WriteByte('\n')
				col = 0
			} else if col > 0 {
				sb.WriteByte(' ')
				col++
			}
			sb.WriteString(w)
			col += len(w)
			if rng.IntN(12) == 0 {
				sb.WriteString(".")
			}
		}
		year := 1900 + f/2
		p := filepath.Join(dir, fmt.Sprint(year), fmt.Sprintf("part-%d.txt", f%2))
		require.NoError(b, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(b, os.WriteFile(p, []byte(sb.String()), 0o644))
		files = append(files, File{Year: year, Path: p, Size: int64(sb.Len())})
	}
	var terms []string
	seen := map[string]bool{}
	for i := 0; len(terms) < 200; i += 7 {
		t := vocab[i]
		if i%2 == 1 {
			t += " " + vocab[i+1]
		}
		if !seen[t] {
			seen[t] = true
			terms = append(terms, t)
		}
	}
	return files, terms
}

// benchSize is the archive BenchmarkCount reads.
const benchSize = 64 << 20

// BenchmarkCount reads a 64 MB invented archive (benchSize): 200 listed terms, and
// every word and pair seen 5 times or more (two passes, so twice the
// bytes), on one core and on all. MB/s is of the archive's bytes read.
func BenchmarkCount(b *testing.B) {
	files, terms := benchArchive(b, benchSize)
	var size int64
	for _, f := range files {
		size += f.Size
	}
	for _, workers := range []int{1, runtime.GOMAXPROCS(0)} {
		b.Run(fmt.Sprintf("list/workers=%d", workers), func(b *testing.B) {
			b.SetBytes(size)
			cpu := cpuTime()
			for b.Loop() {
				_, err := Count(files, Options{Fold: true, Terms: terms, Workers: workers})
				require.NoError(b, err)
			}
			reportPerCPU(b, cpu, size)
		})
		b.Run(fmt.Sprintf("ngrams2/workers=%d", workers), func(b *testing.B) {
			b.SetBytes(2 * size)
			cpu := cpuTime()
			for b.Loop() {
				_, err := Count(files, Options{Fold: true, NGrams: 2, MinCount: 5, Workers: workers})
				require.NoError(b, err)
			}
			reportPerCPU(b, cpu, 2*size)
		})
	}
}

// cpuTime is the process's user and system CPU time so far: on a shared
// machine, MB per CPU-second says more than MB per wall-clock second.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func reportPerCPU(b *testing.B, start time.Duration, bytes int64) {
	used := (cpuTime() - start).Seconds()
	if used > 0 {
		b.ReportMetric(float64(bytes)*float64(b.N)/1e6/used, "MB/cpu-s")
	}
}

// BenchmarkTokens is the tokenizer alone on 4 MB of invented text held in
// memory (no files, no counting).
func BenchmarkTokens(b *testing.B) {
	files, _ := benchArchive(b, 4<<20)
	var text []byte
	for _, f := range files {
		data, err := os.ReadFile(f.Path)
		require.NoError(b, err)
		text = append(text, data...)
	}
	tk := &Tokenizer{Fold: true}
	b.SetBytes(int64(len(text)))
	for b.Loop() {
		require.NoError(b, tk.Tokens(bytes.NewReader(text), func([]byte, bool) {}))
	}
}
