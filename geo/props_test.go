package geo

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"testing"
)

// TestAppendPropsMatchesEncodingJSON checks the hand-written property encoder against
// encoding/json (the reference: Go's standard library, HTML escaping off) on random maps of
// every type it writes itself, with strings of random bytes (control characters, quotes,
// invalid UTF-8, U+2028) and floats from their random bits, and on values it hands on.
func TestAppendPropsMatchesEncodingJSON(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(1, 2))
	pieces := []string{"a", "Z", "\"", "\\", "\n", "\t", "\x00", "\x1f", "\x7f", "<", "&", "é", "\u2028", "\u2029", "\xff", "\xe2\x80", "🛰", " "}
	str := func() string {
		var b []byte
		for n := r.IntN(6); n > 0; n-- {
			b = append(b, pieces[r.IntN(len(pieces))]...)
		}
		return string(b)
	}
	float := func() float64 {
		for {
			var f float64
			switch r.IntN(4) {
			case 0:
				f = math.Float64frombits(r.Uint64())
			case 1:
				f = math.Round(r.NormFloat64()*1e4) / 100
			case 2:
				f = r.Float64() * math.Pow(10, float64(r.IntN(50)-25))
			default:
				f = -float64(r.IntN(1000))
			}
			if !math.IsNaN(f) && !math.IsInf(f, 0) {
				return f
			}
		}
	}
	value := func() any {
		switch r.IntN(8) {
		case 0:
			return str()
		case 1:
			return r.IntN(2) == 0
		case 2:
			return r.IntN(1<<20) - 1<<19
		case 3:
			return r.Int64()
		case 4:
			return float()
		case 5:
			var l []string
			for n := r.IntN(3); n > 0; n-- {
				l = append(l, str())
			}
			if l == nil && r.IntN(2) == 0 {
				l = []string{}
			}
			return l
		case 6:
			return []float64{float(), 0.5}
		default:
			return nil
		}
	}
	for i := 0; i < 5000; i++ {
		props := map[string]any{}
		for n := r.IntN(6); n > 0; n-- {
			props[str()] = value()
		}
		var want bytes.Buffer
		enc := json.NewEncoder(&want)
		enc.SetEscapeHTML(false)
		if err := enc.Encode(props); err != nil {
			t.Fatal(err)
		}
		got, err := appendProps(nil, props)
		if err != nil {
			t.Fatal(err)
		}
		if w := bytes.TrimRight(want.Bytes(), "\n"); !bytes.Equal(got, w) {
			t.Fatalf("props %#v:\ngot  %s\nwant %s", props, got, w)
		}
	}
	if _, err := appendProps(nil, map[string]any{"x": math.NaN()}); err == nil {
		t.Error("NaN: got no error, want encoding/json's")
	}
}
