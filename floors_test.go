package spanwright

import (
	"go/parser"
	"go/token"
	"io/fs"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// floors ranks every package of the module: a package may import only packages on lower
// floors, so data and decisions flow one way (DEVELOPERS.md, "Architecture"). A new package
// must be given its floor here.
var floors = map[string]int{
	// the ground: no package of ours, or only of this floor's neighbours below
	".":                                    0, // the embedded demo campus
	"geo/input":                            0,
	"geo/ctxtest":                          0,
	"geo/crs":                              0,
	"geo/gpkgout":                          0,
	"media/install":                        0,
	"route/escape":                         0,
	"route/fileset":                        0,
	"route/starter":                        0,
	"route/internal/ctxio":                 0,
	"route/internal/campusgen":             0,
	"route/internal/campusgen/campusfiles": 1,
	"internal/pgtest":                      0, // tests only: a throwaway PostgreSQL with PostGIS
	"geo":                                  1,
	"route/optimize":                       1, // duct capacity packs by media/install
	"geo/gpkg":                             2,
	"geo/postgis":                          2,
	"route/workbook":                       1,
	"media":                                2,
	"route/plan":                           3,
	"route/site":                           4,
	"route/items":                          5,
	"route/internal/testsite":              5,
	"route/routing":                        6,
	"route/estimate":                       7,
	"route":                                8,
	"route/output":                         9,
	"route/internal/testplan":              9,
	"route/sweep":                          10,
	"route/report":                         11,
	"cmd/spanwright":                       12,
}

// TestFloors reads the imports of every package's non-test files and fails on an import of
// a package on the same or a higher floor, and on a package missing from the table.
func TestFloors(t *testing.T) {
	const module = "spanwright"
	err := filepath.WalkDir(".", func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			if name := d.Name(); path != "." && (strings.HasPrefix(name, ".") || name == "testdata") {
				return filepath.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(path, ".go") || strings.HasSuffix(path, "_test.go") {
			return nil
		}
		pkg := filepath.ToSlash(filepath.Dir(path))
		floor, ok := floors[pkg]
		if !ok {
			t.Errorf("%s: package %s has no floor in floors_test.go", path, pkg)
			return nil
		}
		f, err := parser.ParseFile(token.NewFileSet(), path, nil, parser.ImportsOnly)
		if err != nil {
			return err
		}
		for _, imp := range f.Imports {
			p, _ := strconv.Unquote(imp.Path.Value)
			if p != module && !strings.HasPrefix(p, module+"/") {
				continue
			}
			dep := strings.TrimPrefix(strings.TrimPrefix(p, module), "/")
			if dep == "" {
				dep = "."
			}
			if df, ok := floors[dep]; !ok || df >= floor {
				t.Errorf("%s: %s (floor %d) imports %s (floor %d): imports must point down", path, pkg, floor, dep, df)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
}
