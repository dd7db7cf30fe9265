//go:build !proj

package crs

import (
	"errors"
	"strings"
	"testing"
)

// TestNoPROJSaysWhatToInstall: a build without PROJ refuses a projected system with
// ErrNoPROJ and says what to install and how to build.
func TestNoPROJSaysWhatToInstall(t *testing.T) {
	t.Parallel()
	to, err := ToWGS84(32630)
	if !errors.Is(err, ErrNoPROJ) || to != nil {
		t.Fatalf("ToWGS84(32630) = %v, want ErrNoPROJ", err)
	}
	for _, want := range []string{"EPSG:32630", "libproj-dev", "-tags proj", "EPSG:4326"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q does not say %q", err, want)
		}
	}
}
