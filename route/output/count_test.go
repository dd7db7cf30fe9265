package output

import (
	"bytes"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/estimate"
	"spanwright/route/internal/testplan"
)

// TestCountTextRule: the count-of-pulls sentence counts its cables in the singular for one (review
// 17 F8: "at most 1 loose cables") and tags only the default count as common practice, no
// published source: another count is the plan's own value, not a rule of thumb the program
// asserts.
func TestCountTextRule(t *testing.T) {
	t.Parallel()
	m := func(x float64) string { return "" }
	c := func(int64) string { return "" }
	for _, tc := range []struct {
		perDuct int
		want    string
	}{
		{1, "count of pulls: at most 1 loose cable a duct, one pull each (design.cables_per_duct): "},
		{3, "count of pulls: at most 3 loose cables a duct, one pull each (design.cables_per_duct; common practice, no published source): "},
		{4, "count of pulls: at most 4 loose cables a duct, one pull each (design.cables_per_duct): "},
	} {
		if got := CountText(estimate.CountWork{}, tc.perDuct, m, c); !strings.HasPrefix(got, tc.want) {
			t.Errorf("%d a duct: %q, want it to begin %q", tc.perDuct, got, tc.want)
		}
	}
}

// TestCountSpansShown: where the count of pulls lays its work is said where its figures are
// (review 17 F5: estimate.CountWork.Spans was computed and never shown): the terminal's and the
// report's sentence names them by the stretches of pathway drawn (estimate.CountWork.Where),
// at most maxCountSpans of them, and summary.json lists the spans in count_laid_spans. On the demo the spans named lay the trench the figure gives (their
// lengths add up to count_laid_trench_m).
func TestCountSpansShown(t *testing.T) {
	t.Parallel()
	m := func(x float64) string { return "" }
	c := func(int64) string { return "" }
	spans := func(n int) estimate.CountWork {
		w := estimate.CountWork{TrenchM: 10, Cents: 100}
		for i := range n {
			w.Spans = append(w.Spans, estimate.CountSpan{Span: "S" + strconv.Itoa(i+1), Trench: true, LengthM: 10})
			w.Where = append(w.Where, "pathway S"+strconv.Itoa(i+1))
		}
		return w
	}
	for _, tc := range []struct {
		n    int
		want string
	}{
		{1, " laid only for it (on pathway S1), "},
		{2, " laid only for it (2 stretches: pathway S1; pathway S2), "},
		{12, " laid only for it (12 stretches: pathway S1; pathway S2; pathway S3; pathway S4; pathway S5; pathway S6; pathway S7; pathway S8; pathway S9; pathway S10 and 2 more), "},
	} {
		if got := CountText(spans(tc.n), 3, m, c); !strings.Contains(got, tc.want) {
			t.Errorf("%d spans: %q lacks %q", tc.n, got, tc.want)
		}
	}

	r := testplan.DemoResult(t)
	s := Summarize(r)
	fc := r.Estimate.Construction.ForCount
	if s.CountLaidTrenchM <= 0 || len(s.CountLaidSpans) != len(fc.Spans) {
		t.Fatalf("demo: count_laid_trench_m %.1f, count_laid_spans %q; want trench and every span of %d", s.CountLaidTrenchM, s.CountLaidSpans, len(fc.Spans))
	}
	trenchM := 0.0
	for i, sp := range fc.Spans {
		if s.CountLaidSpans[i] != sp.Span {
			t.Errorf("count_laid_spans[%d] %q, want %q", i, s.CountLaidSpans[i], sp.Span)
		}
		if sp.Trench {
			trenchM += sp.LengthM
		}
	}
	if math.Abs(trenchM-s.CountLaidTrenchM) > 0.05 {
		t.Errorf("the spans named trench %.2f m, count_laid_trench_m %.1f", trenchM, s.CountLaidTrenchM)
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	// The sentence names the spans by the stretches of pathway drawn, as the bill does: on the
	// demo S-TWR-E/1 and S-TWR-E/2, cut only where RSA's counted lateral might tap it, are
	// the whole pathway S-TWR-E (review 20 F5).
	if want := "laid only for it (2 stretches: pathway EA-3, 0.0 m to 20.1 m; pathway S-TWR-E), "; !slices.Equal(fc.Where, r.Site.Net.Stretches(s.CountLaidSpans)) || !strings.Contains(term.String(), want) {
		t.Errorf("terminal's count of pulls line does not name the stretches of %q (%q), want %q:\n%s", s.CountLaidSpans, fc.Where, want, term.String())
	}
	t.Logf("demo: %q, %.1f m of trench", s.CountLaidSpans, s.CountLaidTrenchM)
}
