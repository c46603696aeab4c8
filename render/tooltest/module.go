package tooltest

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// ModuleFile returns the bytes of the file rel inside module's directory
// in the module cache (fonts shipped with a dependency), or skips — fails
// under SHEAF_REQUIRE_TOOLS=1 — when the go tool cannot locate the module
// or the file is missing.
func ModuleFile(t testing.TB, module, rel string) []byte {
	t.Helper()
	out, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}}", module).Output()
	dir := strings.TrimSpace(string(out))
	if err == nil && dir == "" {
		err = errNoDir
	}
	var b []byte
	if err == nil {
		b, err = os.ReadFile(filepath.Join(dir, rel))
	}
	if err == nil {
		return b
	}
	msg := "module " + module + " file " + rel + " not found (" + err.Error() + "); run go mod download"
	if os.Getenv(EnvRequire) == "1" {
		t.Fatalf("%s (required because %s=1)", msg, EnvRequire)
	}
	t.Skip(msg)
	return nil
}

var errNoDir = errors.New("go list gave no directory")
