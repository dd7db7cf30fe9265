package media

import (
	"errors"
	"reflect"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
)

// TestEveryNumberHasARange walks the types the catalog, rule and price files decode into:
// each number a file can give (a field, the elements of a list, the values and keys of a
// map) must name its range in a tag, so that none is read unchecked.
func TestEveryNumberHasARange(t *testing.T) {
	t.Parallel()
	unmarshalerType := reflect.TypeOf((*yaml.Unmarshaler)(nil)).Elem()
	nodeType := reflect.TypeOf(yaml.Node{})
	tagRange := func(f reflect.StructField, tag string) *input.Range {
		name := f.Tag.Get(tag)
		if name == "" {
			return nil
		}
		r, ok := ranges[name]
		if !ok {
			t.Fatalf("%s: unknown range %q", f.Name, name)
		}
		return &r
	}
	isNum := func(t reflect.Type) bool {
		switch t.Kind() {
		case reflect.Int, reflect.Int64, reflect.Float64:
			return !reflect.PointerTo(t).Implements(unmarshalerType)
		}
		return false
	}
	seen := map[reflect.Type]bool{}
	var walk func(typ reflect.Type)
	walk = func(typ reflect.Type) {
		if typ.Kind() != reflect.Struct || seen[typ] {
			return
		}
		seen[typ] = true
		for i := 0; i < typ.NumField(); i++ {
			f := typ.Field(i)
			if f.Tag.Get("yaml") == "-" || f.Type == nodeType {
				continue
			}
			ft := f.Type
			for ft.Kind() == reflect.Slice || ft.Kind() == reflect.Map {
				if ft.Kind() == reflect.Map && isNum(ft.Key()) && tagRange(f, "keyrange") == nil {
					t.Errorf("%s.%s: a map with numeric keys and no keyrange tag", typ.Name(), f.Name)
				}
				ft = ft.Elem()
			}
			if isNum(ft) && tagRange(f, "range") == nil {
				t.Errorf("%s.%s: a number with no range tag", typ.Name(), f.Name)
			}
			walk(ft)
		}
	}
	for _, v := range []any{catalogFile{}, priceFile{}, rulesFile{}} {
		walk(reflect.TypeOf(v))
	}
	if len(seen) < 10 {
		t.Errorf("walked %d types; the file types changed shape", len(seen))
	}
}

// TestLoadRefusesDevice: each file loader reads only regular files, and names the file.
func TestLoadRefusesDevice(t *testing.T) {
	t.Parallel()
	loads := map[string]func(string) error{
		"catalog": func(p string) error { _, err := LoadCatalog(p); return err },
		"rules":   func(p string) error { _, err := LoadRules(p); return err },
		"prices":  func(p string) error { _, err := LoadPriceBook(p); return err },
	}
	for name, load := range loads {
		// Linux null(4): /dev/zero reads as zero bytes without end.
		err := load("/dev/zero")
		var fe *input.Problem
		if !errors.As(err, &fe) || !errors.Is(err, input.ErrNotRegular) ||
			!strings.Contains(err.Error(), "/dev/zero: read: not a regular file but a character device") {
			t.Errorf("%s: got %v, want an *input.Problem refusing the device", name, err)
		}
	}
}
