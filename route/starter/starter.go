package starter

import (
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

//go:embed files/campus.geojson files/plan.yaml files/prices.yaml
var files embed.FS

// Names are the files Write writes, in the order it writes them; PlanFile is the one to plan.
var Names = []string{"campus.geojson", "plan.yaml", "prices.yaml"}

// PlanFile is the starter plan's name in the folder.
const PlanFile = "plan.yaml"

// ErrExists is wrapped by Write's error when some file it would write exists already.
var ErrExists = errors.New("would replace existing files")

// File returns the content of one starter file by name (one of Names).
func File(name string) ([]byte, error) {
	return files.ReadFile("files/" + name)
}

// Write writes the starter files into dir, creating dir (and its parents) when missing. It
// replaces nothing: when any of the files exists (as a file, a folder or a link, even a
// dangling one) it writes none and its error, wrapping ErrExists, names them all. Each file is
// written under a temporary name and hard-linked to its own, which fails rather than replace a
// file created meanwhile. It returns the paths written.
func Write(dir string) ([]string, error) {
	var exist []string
	for _, n := range Names {
		p := filepath.Join(dir, n)
		if _, err := os.Lstat(p); err == nil {
			exist = append(exist, p)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("starter: %w", err)
		}
	}
	if len(exist) > 0 {
		return nil, fmt.Errorf("starter: %w: %s (move them away or choose another folder)", ErrExists, strings.Join(exist, ", "))
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("starter: %w", err)
	}
	var written []string
	for _, n := range Names {
		data, err := File(n)
		if err != nil {
			return written, fmt.Errorf("starter: %w", err)
		}
		p := filepath.Join(dir, n)
		if err := create(p, data); err != nil {
			return written, fmt.Errorf("starter: %w", err)
		}
		written = append(written, p)
	}
	return written, nil
}

// create writes data to path, which must not exist: to a temporary file in the same folder,
// synced, then hard-linked to path (link fails when path exists).
func create(path string, data []byte) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return err
	}
	defer os.Remove(tmp.Name())
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	if err := os.Link(tmp.Name(), path); err != nil {
		if errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("%w: %s", ErrExists, path)
		}
		return err
	}
	return nil
}
