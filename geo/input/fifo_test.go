//go:build unix

package input

import (
	"errors"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestReadFileFIFO: POSIX open(2) on a FIFO for reading blocks until a writer opens it, so
// reading one named as an input would hang; it is refused before it is opened.
func TestReadFileFIFO(t *testing.T) {
	t.Parallel()
	p := filepath.Join(t.TempDir(), "campus.geojson")
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skipf("mkfifo: %v", err)
	}
	_, err := ReadFile(p, MiB)
	if !errors.Is(err, ErrNotRegular) || !strings.Contains(err.Error(), "a named pipe (FIFO)") {
		t.Errorf("got %v, want a named pipe refused", err)
	}
}
