package output

import (
	"context"
	"slices"
	"strconv"
	"testing"

	"spanwright/route/internal/testplan"
)

// TestLinksAcceptanceColumns: links.csv's acceptance columns (after the cable schedule) are
// the leg's loss budget as the rule engine set it: per wavelength the field limit and what
// sets it, the required margin beside margin_db with what it is made of, and the attenuator the
// loss includes. The demo's legs are all single-mode, limited by ANSI/TIA-568.3-D; one leg is
// given by hand what a 10GBASE-ER leg with a 5 dB attenuator on a synthetic 6 dB channel limit
// would carry (see media's TestFieldLimitLessAttenuator), so that the application and the
// attenuator show.
func TestLinksAcceptanceColumns(t *testing.T) {
	t.Parallel()
	r, x := testplan.DemoOperatingLoss(t)
	l := &r.Legs[0]
	x.AttenuatorDB, x.LimitDB, x.FieldLimitDB, x.FieldLimitBy = 5, 6, 1, "10GBASE-ER"
	files, err := Files(context.Background(), r, WriteOptions{SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	head := rows[0]
	col := func(name string) int {
		i := slices.Index(head, name)
		if i < 0 {
			t.Fatalf("links.csv has no column %s", name)
		}
		return i
	}
	if want := append(append(scheduleHead(WriteOptions{}), acceptanceHead()...), "mid_span_splices_at", "safety"); !slices.Equal(head[len(head)-len(want):], want) {
		t.Errorf("last columns %q, want the schedule's, the acceptance columns, then the joins' places %q", head[len(head)-len(want):], want)
	}
	for i := range r.Legs {
		l, row := &r.Legs[i], rows[i+1]
		for _, x := range l.Losses {
			nm := strconv.Itoa(x.WavelengthNM)
			if got, want := row[col("field_limit_"+nm+"_db")], strconv.FormatFloat(x.FieldLimitDB, 'f', 2, 64); got != want {
				t.Errorf("%s %s nm: field limit %s, want %s", l.Label(), nm, got, want)
			}
			if got := row[col("field_limit_by_"+nm)]; got != x.FieldLimitBy || got == "" {
				t.Errorf("%s %s nm: field limit by %q, want %q", l.Label(), nm, got, x.FieldLimitBy)
			}
		}
		w, ok := l.WorstLoss()
		if !ok {
			continue
		}
		if got, want := row[col("required_margin_db")], strconv.FormatFloat(w.RequiredMarginDB, 'f', 2, 64); got != want {
			t.Errorf("%s: required margin %s, want %s", l.Label(), got, want)
		}
		if got := row[col("required_margin_from")]; got != w.RequiredMarginBasis || got == "" {
			t.Errorf("%s: required margin from %q, want %q", l.Label(), got, w.RequiredMarginBasis)
		}
		if got, want := row[col("attenuator_db")], strconv.FormatFloat(w.AttenuatorDB, 'f', -1, 64); got != want {
			t.Errorf("%s: attenuator %s, want %s", l.Label(), got, want)
		}
	}
	first := rows[1]
	nm := strconv.Itoa(x.WavelengthNM)
	if first[col("field_limit_"+nm+"_db")] != "1.00" || first[col("field_limit_by_"+nm)] != "10GBASE-ER" || first[col("attenuator_db")] != "5" {
		t.Errorf("%s: field limit %s by %s, attenuator %s; want 1.00 by 10GBASE-ER, 5", l.Label(),
			first[col("field_limit_"+nm+"_db")], first[col("field_limit_by_"+nm)], first[col("attenuator_db")])
	}
}
