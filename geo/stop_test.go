package geo

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"spanwright/geo/ctxtest"
)

// TestLoadContextStops reads two files of 600 pathways each with a context cancelled at each
// look the reading takes at it (before each file, every featureCheckEvery features): each
// returns context.Canceled and no campus. A context never done reads the same campus as Load.
func TestLoadContextStops(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var paths []string
	for f := 0; f < 2; f++ {
		var feats []string
		for i := 0; i < 600; i++ {
			x, y := -75+float64(i%30)*0.001, 40+float64(i/30)*0.001+float64(f)*0.05
			feats = append(feats, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"W%d-%d"},"geometry":{"type":"LineString","coordinates":[[%.4f,%.4f],[%.4f,%.4f]]}}`,
				f, i, x, y, x+0.0008, y))
		}
		p := filepath.Join(dir, fmt.Sprintf("part%d.geojson", f))
		if err := os.WriteFile(p, []byte(`{"type":"FeatureCollection","features":[`+strings.Join(feats, ",")+"]}"), 0o644); err != nil {
			t.Fatal(err)
		}
		paths = append(paths, p)
	}
	want, err := Load(paths)
	if err != nil {
		t.Fatal(err)
	}
	count := ctxtest.New(0)
	got, err := LoadContext(count, paths)
	if err != nil || !reflect.DeepEqual(got, want) {
		t.Fatalf("with a context never done: %v, same campus: %v", err, reflect.DeepEqual(got, want))
	}
	total := count.Looks()
	if want := int64(2 + 2*(600+featureCheckEvery-1)/featureCheckEvery); total < want {
		t.Fatalf("%d looks at the context, want at least %d (each file, every %d features)", total, want, featureCheckEvery)
	}
	for at := int64(1); at <= total; at++ {
		if c, err := LoadContext(ctxtest.New(at), paths); !errors.Is(err, context.Canceled) || c != nil {
			t.Errorf("cancelled at look %d of %d: got a campus %v, %v; want none and context.Canceled", at, total, c != nil, err)
		}
	}
}

// TestBuildContextStops builds a 10 × 10 street grid with a context cancelled at each look
// the building takes at it (between its steps): each returns context.Canceled and no network;
// a context never done builds the same network as Build.
func TestBuildContextStops(t *testing.T) {
	t.Parallel()
	c := gridCampus(10, 10, rand.New(rand.NewPCG(5, 6)))
	want, err := Build(&c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	count := ctxtest.New(0)
	got, err := BuildContext(count, &c, Options{})
	if err != nil || !reflect.DeepEqual(got, want) {
		t.Fatalf("with a context never done: %v, same network: %v", err, reflect.DeepEqual(got, want))
	}
	total := count.Looks()
	for at := int64(1); at <= total; at++ {
		if n, err := BuildContext(ctxtest.New(at), &c, Options{}); !errors.Is(err, context.Canceled) || n != nil {
			t.Errorf("cancelled at look %d of %d: got a network %v, %v; want none and context.Canceled", at, total, n != nil, err)
		}
	}
}

// TestWriteRoutesContextStops writes 300 routes with a context cancelled at each look the
// writing takes at it (every routeCheckEvery routes): each returns context.Canceled and writes
// nothing; a context never done writes what WriteRoutes writes.
func TestWriteRoutesContextStops(t *testing.T) {
	t.Parallel()
	n := routeNetwork(t)
	var feats []RouteFeature
	for i := 0; i < 300; i++ {
		feats = append(feats, RouteFeature{FromBuilding: "B2", ToBuilding: "B1", Steps: []Step{{SpanID: "T/2", Reverse: true}},
			Props: map[string]any{"n": i}})
	}
	var want, got bytes.Buffer
	if err := n.WriteRoutes(&want, feats); err != nil {
		t.Fatal(err)
	}
	count := ctxtest.New(0)
	if err := n.WriteRoutesContext(count, &got, feats); err != nil || !bytes.Equal(got.Bytes(), want.Bytes()) {
		t.Fatalf("with a context never done: %v, same bytes: %v", err, bytes.Equal(got.Bytes(), want.Bytes()))
	}
	total := count.Looks()
	for at := int64(1); at <= total; at++ {
		var out bytes.Buffer
		if err := n.WriteRoutesContext(ctxtest.New(at), &out, feats); !errors.Is(err, context.Canceled) || out.Len() > 0 {
			t.Errorf("cancelled at look %d of %d: wrote %d bytes, %v; want none and context.Canceled", at, total, out.Len(), err)
		}
	}
}
