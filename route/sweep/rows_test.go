//go:build unix

package sweep

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"spanwright/geo/input"
)

// TestReadRowsRefuses: a rows file with a member given twice, or a FIFO in the place of
// one, is refused with the file named, not read with one value kept or waited on.
func TestReadRowsRefuses(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	data, err := encodeRows(rowsHeader{Format: RowsFormat, Scenarios: 2}, []Row{{Index: 0, ID: "a-1", Status: StatusOK}, {Index: 1, ID: "b-2", Status: StatusOK}})
	if err != nil {
		t.Fatal(err)
	}
	ok := filepath.Join(dir, "rows.jsonl")
	if err := os.WriteFile(ok, data, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, rows, err := readRows(ok); err != nil || len(rows) != 2 {
		t.Fatalf("well-formed rows: got %d rows, %v", len(rows), err)
	}
	// RFC 8259 §4: names within an object SHOULD be unique; encoding/json keeps the last.
	dup := filepath.Join(dir, "rows-1-of-2.jsonl")
	twice := strings.Replace(string(data), `{"index":1,`, `{"index":1,"index":0,`, 1)
	if twice == string(data) {
		t.Fatal("row 1 not found in the encoded rows; update the test")
	}
	if err := os.WriteFile(dup, []byte(twice), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := readRows(dup); err == nil || !strings.Contains(err.Error(), dup+`:3: member "index" given twice`) {
		t.Errorf("duplicate member: got %v", err)
	}
	// POSIX mkfifo(3): opening a FIFO for reading waits for a writer.
	fifo := filepath.Join(dir, "rows-2-of-2.jsonl")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := readRows(fifo); !errors.Is(err, input.ErrNotRegular) || !strings.Contains(err.Error(), fifo) {
		t.Errorf("FIFO: got %v, want it refused", err)
	}
}
