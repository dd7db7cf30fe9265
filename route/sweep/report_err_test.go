package sweep

import (
	"errors"
	"spanwright/route"
	"strings"
	"testing"
)

// TestReportErrInfeasible: scenarios with infeasible legs end the sweep with exit status 3
// (route.ErrInfeasible) and one sentence that says where to look, without the wrapped
// error's words repeated after it ("9 of 17 scenarios have infeasible legs: some links are
// infeasible").
func TestReportErrInfeasible(t *testing.T) {
	err := (&Report{Run: 17, Infeasible: 9}).Err()
	if !errors.Is(err, route.ErrInfeasible) {
		t.Fatalf("%v does not wrap route.ErrInfeasible", err)
	}
	msg := err.Error()
	if !strings.HasPrefix(msg, "9 of 17 scenarios have infeasible legs (") || strings.Contains(msg, route.ErrInfeasible.Error()) {
		t.Errorf("message %q", msg)
	}
	if msg := (&Report{Run: 1, Infeasible: 1}).Err().Error(); !strings.HasPrefix(msg, "1 of 1 scenario has infeasible legs") {
		t.Errorf("one scenario: %q", msg)
	}
}
