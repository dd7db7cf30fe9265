package geo

import (
	"context"
	"strconv"
	"strings"
	"testing"
)

// TestPartialWaitsOnUnknownIDs: what Reader.Partial leaves known of the buildings when the
// campus has problems (README "Limits": the plan's names wait only when a feature could not
// be read far enough to know its id, since it might be the building named; tester 15 F3).
// A building without an id, or a file whose "crs" cannot be taken (a code no PROJ knows), is
// such a case (nil); a structure without an id is not (it is no building a plan names), nor
// a building's role under "ROLE", which only leaves unknown which building is mc
// (RoleUnread). The rule is the README's, no published source.
func TestPartialWaitsOnUnknownIDs(t *testing.T) {
	t.Parallel()
	const hall = `{"type":"Feature","properties":{"kind":"building","id":"HALL","role":"mc"},"geometry":{"type":"Polygon","coordinates":[[[6.98,46.52],[6.981,46.52],[6.981,46.521],[6.98,46.521],[6.98,46.52]]]}}`
	partial := func(t *testing.T, files ...string) *Partial {
		t.Helper()
		r := NewReader(context.Background())
		for i, f := range files {
			r.Parse(string(rune('a'+i))+".geojson", []byte(f))
		}
		if _, err := r.Campus(); err == nil {
			t.Fatal("read without problems")
		}
		return r.Partial()
	}
	coll := func(feats ...string) string {
		return `{"type":"FeatureCollection","features":[` + strings.Join(feats, ",") + `]}`
	}
	noIDBuilding := strings.Replace(hall, `"id":"HALL"`, `"ID":"LAB"`, 1)
	if p := partial(t, coll(hall, noIDBuilding)); p != nil {
		t.Errorf("a building without an id: Partial %+v, want nil", p)
	}
	noIDStructure := `{"type":"Feature","properties":{"kind":"structure","ID":"MH1"},"geometry":{"type":"Point","coordinates":[6.982,46.52]}}`
	p := partial(t, coll(hall, noIDStructure))
	if p == nil || len(p.Buildings) != 1 || p.Buildings[0].ID != "HALL" || p.RoleUnread {
		t.Errorf("a structure without an id: Partial %+v, want HALL read", p)
	}
	refused := `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"EPSG:999999"}},"features":[` + hall + `]}`
	if p := partial(t, coll(noIDStructure), refused); p != nil {
		t.Errorf("a file refused at its crs: Partial %+v, want nil", p)
	}
	p = partial(t, coll(strings.Replace(hall, `"role"`, `"ROLE"`, 1)))
	if p == nil || !p.RoleUnread || len(p.Buildings) != 1 {
		t.Errorf("a role under ROLE: Partial %+v, want HALL read and RoleUnread", p)
	}
}

// TestRepeatedSlipOnce: a slip every feature of a file repeats (no id but under "ID"; positions
// in a projected system) is one problem per file (and kind, for ids) on the first feature,
// with the count and the next features named; a file with one such feature says it plainly;
// each file its own (tester 15 F3: 210 identical lines). Common practice, no published source.
func TestRepeatedSlipOnce(t *testing.T) {
	t.Parallel()
	pt := func(id string, x float64) string {
		return `{"type":"Feature","properties":{"kind":"structure","ID":"` + id + `"},"geometry":{"type":"Point","coordinates":[` +
			strconv.FormatFloat(x, 'f', -1, 64) + `,46.52]}}`
	}
	r := NewReader(context.Background())
	r.Parse("a.geojson", []byte(`{"type":"FeatureCollection","features":[`+pt("S1", 6.98)+","+pt("S2", 6.981)+","+pt("S3", 6.982)+","+pt("S4", 6.983)+","+pt("S5", 6.984)+`]}`))
	r.Parse("b.geojson", []byte(`{"type":"FeatureCollection","features":[`+pt("S6", 6.985)+`]}`))
	proj := strings.ReplaceAll(`{"type":"FeatureCollection","features":[`+pt("P1", 600000)+","+pt("P2", 600100)+`]}`, `"ID"`, `"id"`)
	r.Parse("c.geojson", []byte(proj))
	_, err := r.Campus()
	if err == nil {
		t.Fatal("read without problems")
	}
	got := strings.Split(err.Error(), "\n")
	slip := `; every structure needs a unique id; the feature gives "ID", which is not read: did you mean "id"? (property names are matched exactly)`
	want := []string{
		`a.geojson: feature #0 (no id): property "id": missing, and on 4 more structures of this file (#1, #2, #3, …)` + slip,
		`b.geojson: feature #0 (no id): property "id": missing` + slip,
		`c.geojson: feature #0 "P1": geometry: got [600000, 46.52]: coordinates look projected (metres or feet?), and so do positions of 1 more feature of this file (#1 (P2)); ` + projectedAdvice,
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("got\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}
