package report

import (
	"context"
	"strconv"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route/internal/testplan"
)

// TestPlanAcceptance: the links table shows each wavelength's field test limit under its loss
// and, under the reason, the field limits an application sets below the ANSI/TIA-568.3-D link
// limit and the attenuator the loss includes. One demo leg is given by hand a 10GBASE-SR
// field limit at 850 nm of 2.6 dB against a link limit of 3.087 dB (IEEE 802.3 Clause 52 on
// OM3, from memory; ANSI/TIA-568.3-D, from memory: tester 8's ADM-CHM) and a 5 dB attenuator.
func TestPlanAcceptance(t *testing.T) {
	t.Parallel()
	r, x := testplan.DemoOperatingLoss(t)
	// The leg's own application sets it here (its name borrowed: the figures are 10GBASE-SR's).
	app := r.Legs[0].Application
	x.FieldLimitDB, x.CablingLimitDB, x.FieldLimitBy, x.AttenuatorDB = 2.6, 3.087, app, 5
	b, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, want := range []string{
		// The loss holds the attenuator, the field limit not: the cell says so (tester 9's finding 2).
		`<span class="small field">≤ 2.60 without the 5 dB attenuator</span>`,
		`Field test limit at ` + strconv.Itoa(x.WavelengthNM) + ` nm 2.60 dB, set by ` + app + ` (ANSI/TIA-568.3-D link limit 3.09 dB). Margin to keep `,
		`. The loss includes a 5 dB fixed attenuator at each receiver; the link is tested without it.`,
		`<span class="small">field limit</span>`,
	} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	// Set by another application than the leg's: the one its future rate plans for (tester 9's
	// finding 4: "set by 10GBASE-SR" under a 1000BASE-SX leg).
	if got := acceptanceOf([]media.Loss{{WavelengthNM: 850, FieldLimitDB: 2.6, CablingLimitDB: 3.087, FieldLimitBy: "10GBASE-SR"}}, "1000BASE-SX"); !strings.Contains(got, "set by 10GBASE-SR, the application of its future rate") {
		t.Errorf("future rate's limit: %q", got)
	}
	// Every fibre leg says the margin it must keep and what it is made of, from its loss
	// budget (media.Loss.RequiredMarginBasis); the other legs, limited by ANSI/TIA-568.3-D with
	// no attenuator, say nothing more.
	fibre := 0
	for i := range r.Legs {
		l := &r.Legs[i]
		w, ok := l.WorstLoss()
		if !ok {
			continue
		}
		fibre++
		if w.RequiredMarginBasis == "" {
			t.Errorf("%s: no words for its required margin %.2f dB", l.Label(), w.RequiredMarginDB)
		}
		if want := "Margin to keep " + dB(w.RequiredMarginDB) + " dB: " + w.RequiredMarginBasis + "."; !strings.Contains(html, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	if n := strings.Count(html, `class="small acceptance"`); n != fibre || fibre == 0 {
		t.Errorf("%d acceptance lines, want one for each of the %d fibre legs", n, fibre)
	}
	if n := strings.Count(html, "Field test limit at "); n != 1 {
		t.Errorf("%d field test limits set by an application, want 1", n)
	}
}
