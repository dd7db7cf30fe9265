package geo

import (
	"fmt"
	"strings"
	"testing"
)

// TestIDHintEntrance: an entrance whose building differs from a building's id only by letter
// case or by spaces at its ends is refused, as ids are matched exactly, with the building
// meant named (tester 13 F-J).
func TestIDHintEntrance(t *testing.T) {
	t.Parallel()
	data := `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"kind":"building","id":"HAYL"},"geometry":{"type":"Polygon","coordinates":[[[10,50],[10.0003,50],[10.0003,50.0002],[10,50.0002],[10,50]]]}},
{"type":"Feature","properties":{"kind":"entrance","id":"E-1","building":"hayl"},"geometry":{"type":"Point","coordinates":[10.0001,50]}},
{"type":"Feature","properties":{"kind":"entrance","id":"E-2","building":"HAYL "},"geometry":{"type":"Point","coordinates":[10.0002,50]}},
{"type":"Feature","properties":{"kind":"entrance","id":"E-3","building":"BARN"},"geometry":{"type":"Point","coordinates":[10.0002,50]}}
]}`
	_, err := Parse("c.geojson", []byte(data))
	if err == nil {
		t.Fatal("want problems")
	}
	for _, want := range []string{
		`c.geojson: feature #1 "E-1": property "building": want the id of a building, got "hayl", which no feature has; did you mean "HAYL" (c.geojson feature #0)? (letter case matters)`,
		`c.geojson: feature #2 "E-2": property "building": want the id of a building, got "HAYL ", which no feature has; did you mean "HAYL" (c.geojson feature #0)? (spaces at either end matter)`,
		`c.geojson: feature #3 "E-3": property "building": want the id of a building, got "BARN", which no feature has` + "\n",
	} {
		if !strings.Contains(err.Error()+"\n", want) {
			t.Errorf("got\n%v\nwant it to contain\n%s", err, want)
		}
	}
}

// TestBlankIDWarned: an id with a space (or a tab, a no-break space) at either end is taken
// as given, ids being matched exactly, and warned of, as nothing shows the space; a file
// whose ids all have one (a padded text column) gets one warning.
func TestBlankIDWarned(t *testing.T) {
	t.Parallel()
	feature := func(id string, x float64) string {
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":%q,"type":"handhole"},"geometry":{"type":"Point","coordinates":[%g,50]}}`, id, 10+x)
	}
	for _, tc := range []struct {
		name string
		ids  []string
		want []string
	}{
		{"one each", []string{"MH-02 ", " MH-03", "\u00a0MH-04\t", "MH-05"}, []string{
			`#0 (MH-02 ): its id "MH-02 " ends with a space: ids are matched exactly, so the plan and the campus must name it with the space; take the space out of the id`,
			`#1 ( MH-03): its id " MH-03" starts with a space:`,
			"#2 (\u00a0MH-04\t): its id \"\\u00a0MH-04\\t\" starts and ends with a space:",
		}},
		{"a padded column", []string{"A   ", "B   ", "C   ", "D   ", "E"}, []string{
			`#0 (A   ): its id "A   " ends with a space, and so do those of 3 more features of this file (a text column padded to its width?)`,
		}},
	} {
		var fs []string
		for i, id := range tc.ids {
			fs = append(fs, feature(id, float64(i)*0.001))
		}
		c, err := Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`))
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		var got []string
		for _, w := range c.warns {
			got = append(got, w.src.Short(w.id)+": "+w.msg)
		}
		if len(got) != len(tc.want) {
			t.Errorf("%s: got %d warnings, want %d:\n%s", tc.name, len(got), len(tc.want), strings.Join(got, "\n"))
			continue
		}
		for i, w := range tc.want {
			if !strings.HasPrefix(got[i], w) {
				t.Errorf("%s: got\n%s\nwant it to start with\n%s", tc.name, got[i], w)
			}
		}
	}
}

// TestGroupSpellingsWarned: shared-risk groups matched exactly, "North trench" and
// "north trench " are two groups (a diverse pair may take one of each): warned of, naming the
// other pathway; the same spelling again is no warning.
func TestGroupSpellingsWarned(t *testing.T) {
	t.Parallel()
	var fs []string
	for i, g := range []string{"North trench", "North trench", "north trench", "North trench ", "DB-2"} {
		fs = append(fs, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P-%d","group":%q},"geometry":{"type":"LineString","coordinates":[[10,%g],[10.001,%g]]}}`,
			i, g, 50+float64(i)*0.001, 50+float64(i)*0.001))
	}
	c, err := Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range c.warns {
		got = append(got, w.src.Short(w.id)+": "+w.msg)
	}
	want := []string{
		`#2 (P-2): its shared-risk group "north trench" differs from "North trench" (pathway "P-0", c.geojson feature #0) only by letter case: they are two groups, and a diverse pair may use one of each; write the group alike on every pathway of one trench or duct bank`,
		`#3 (P-3): its shared-risk group "North trench " differs from "North trench" (pathway "P-0", c.geojson feature #0) only by spaces at either end:`,
	}
	if len(got) != len(want) {
		t.Fatalf("got %d warnings, want %d:\n%s", len(got), len(want), strings.Join(got, "\n"))
	}
	for i, w := range want {
		if !strings.HasPrefix(got[i], w) {
			t.Errorf("got\n%s\nwant it to start with\n%s", got[i], w)
		}
	}
}
