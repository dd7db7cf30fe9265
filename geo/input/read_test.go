package input

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"
)

func TestReadFileRefuses(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	small := filepath.Join(dir, "small.yaml")
	if err := os.WriteFile(small, []byte("name: x\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.yaml")
	if err := os.Symlink(small, link); err != nil {
		t.Fatal(err)
	}
	big := filepath.Join(dir, "big.geojson")
	if err := os.WriteFile(big, make([]byte, 2*MiB+1), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		path string
		max  int64
		is   error
		want string
	}{
		// Linux null(4): reading /dev/zero never reaches the end of the file.
		{"character device", "/dev/zero", MiB, ErrNotRegular, "not a regular file but a character device"},
		{"folder", dir, MiB, ErrNotRegular, "not a regular file but a folder"},
		{"over the cap", big, 2 * MiB, ErrTooLarge, "larger than the input limit of 2 MiB (raise it with --max-input-mb)"},
		{"one byte over", small, 7, ErrTooLarge, "larger than the input limit of 7 bytes"},
		{"at the cap", small, 8, nil, ""},
		{"symbolic link to a regular file", link, MiB, nil, ""},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			data, err := ReadFile(tc.path, tc.max)
			if tc.is == nil {
				if err != nil || string(data) != "name: x\n" {
					t.Fatalf("%s: got %q, %v; want the file", tc.name, data, err)
				}
				return
			}
			if !errors.Is(err, tc.is) {
				t.Fatalf("%s: got %v, want %v", tc.name, err, tc.is)
			}
			if !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), tc.path) {
				t.Errorf("%s: got %q, want the path and %q", tc.name, err, tc.want)
			}
		})
	}
}

// TestReadCappedGrowing reads a file longer than its size said (one that grows while it is
// read): the cap holds all the same.
func TestReadCappedGrowing(t *testing.T) {
	t.Parallel()
	r := strings.NewReader(strings.Repeat("x", 5000))
	if _, err := readCapped("f", r, 10, 4096); !errors.Is(err, ErrTooLarge) {
		t.Errorf("got %v, want ErrTooLarge", err)
	}
	r = strings.NewReader(strings.Repeat("x", 5000))
	if data, err := readCapped("f", r, 10, 5000); err != nil || len(data) != 5000 {
		t.Errorf("got %d bytes, %v; want 5000", len(data), err)
	}
}

func TestReadFS(t *testing.T) {
	t.Parallel()
	fsys := fstest.MapFS{"a.geojson": {Data: []byte("{}")}, "d": {Mode: os.ModeDir}}
	if data, err := ReadFS(fsys, "a.geojson", 2); err != nil || string(data) != "{}" {
		t.Errorf("got %q, %v", data, err)
	}
	if _, err := ReadFS(fsys, "a.geojson", 1); !errors.Is(err, ErrTooLarge) {
		t.Errorf("got %v, want ErrTooLarge", err)
	}
	if _, err := ReadFS(fsys, "d", 1); !errors.Is(err, ErrNotRegular) {
		t.Errorf("got %v, want ErrNotRegular", err)
	}
}

func TestCap(t *testing.T) {
	t.Parallel()
	if got := Cap(0, DefaultTextMiB); got != 16*MiB {
		t.Errorf("default: got %d", got)
	}
	if got := Cap(3, DefaultTextMiB); got != 3 {
		t.Errorf("set: got %d", got)
	}
}
