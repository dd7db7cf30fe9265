package media

import "testing"

// Bad input never crashes: the readers return errors, never panic. `go test` runs the seeds;
// `go test -fuzz FuzzParseCatalog ./media/` explores further.

func FuzzParseCatalog(f *testing.F) {
	f.Add(string(catalogYAML))
	f.Add("media: 5\napplications: [1, 2]\nconnections: []\n")
	f.Add("media:\n  - *x\n")
	f.Add("media:\n  - id: a\n    attenuation_db_per_km: {abc: 1}\n    constructions: [3]\n")
	f.Add("shared: &a [*a]\n")
	f.Fuzz(func(t *testing.T, data string) {
		c, err := ParseCatalog("f.yaml", []byte(data))
		if err == nil && c == nil {
			t.Fatal("nil catalog without an error")
		}
	})
}

func FuzzParseRules(f *testing.F) {
	f.Add(string(rulesYAML))
	f.Add("rules:\n  - id: a\n    when: |\n      (outdoor\n    effect: exclude\n    reason: \"{x\"\n")
	f.Add("rules: {a: 1}\n")
	f.Fuzz(func(t *testing.T, data string) {
		_, _ = ParseRules("f.yaml", []byte(data))
	})
}

func FuzzParseCondition(f *testing.F) {
	for _, s := range []string{"channel_m > 100 and kind == \"copper\"", "not (a or", "-", "1.", "\"", "((((", "max_emi == \"x\"", "é"} {
		f.Add(s)
	}
	facts := make([]value, nFacts)
	f.Fuzz(func(t *testing.T, src string) {
		c, err := parseCondition(src)
		if err != nil {
			if ce, ok := err.(*condError); !ok || ce.Off < 0 || ce.Off > len(src) {
				t.Fatalf("%q: bad error %v", src, err)
			}
			return
		}
		c.eval(facts)
	})
}

func FuzzParsePriceBook(f *testing.F) {
	f.Add(string(pricesYAML))
	f.Add("cable_per_m: {a: {b: {x: 1}}}\nlabour: 3\n")
	f.Fuzz(func(t *testing.T, data string) {
		_, _ = ParsePriceBook("f.yaml", []byte(data))
	})
}
