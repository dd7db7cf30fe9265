package route

import (
	"errors"
	"fmt"
	"strings"
	"testing"
)

// TestInfeasibleErrorLines: the terminal gets one infeasible leg per line, at most
// ShownInfeasible of them and a count of the rest (a 5,000-building campus had 35 legs, each
// with a reason of several hundred characters, printed as one line); it still wraps
// ErrInfeasible (exit status 3).
func TestInfeasibleErrorLines(t *testing.T) {
	one := &InfeasibleError{Legs: []string{"L1/primary: beyond reach"}}
	if got, want := one.Error(), "1 infeasible link leg:\n  L1/primary: beyond reach"; got != want {
		t.Errorf("one leg: got %q, want %q", got, want)
	}
	var legs []string
	for i := range ShownInfeasible + 3 {
		legs = append(legs, fmt.Sprintf("L%d/primary: beyond reach", i))
	}
	many := &InfeasibleError{Legs: legs}
	lines := strings.Split(many.Error(), "\n")
	if len(lines) != ShownInfeasible+2 {
		t.Fatalf("%d legs: %d lines, want %d:\n%s", len(legs), len(lines), ShownInfeasible+2, many.Error())
	}
	if want := fmt.Sprintf("%d infeasible link legs:", len(legs)); lines[0] != want {
		t.Errorf("first line %q, want %q", lines[0], want)
	}
	if want := "  and 3 more; links.csv lists every leg with its reason"; lines[len(lines)-1] != want {
		t.Errorf("last line %q, want %q", lines[len(lines)-1], want)
	}
	if !errors.Is(many, ErrInfeasible) {
		t.Error("does not wrap ErrInfeasible")
	}
	// The list is InfeasibleList's text, the one the terminal summary prints; once listed
	// there, the error only counts the legs.
	if got, want := many.Error(), lines[0]+"\n"+strings.TrimSuffix(InfeasibleList(legs), "\n"); got != want {
		t.Errorf("the error's list is not InfeasibleList's:\n%s", got)
	}
	listed := &InfeasibleError{Legs: legs, Listed: true}
	if got, want := listed.Error(), fmt.Sprintf("%d infeasible link legs, listed above", len(legs)); got != want || !errors.Is(listed, ErrInfeasible) {
		t.Errorf("listed: got %q, want %q and ErrInfeasible", got, want)
	}
	// An id or reason holding a line feed cannot add a line of its own (escape.Terminal).
	if got, want := InfeasibleList([]string{"L\nhub ok/primary: x"}), "  L<U+000A>hub ok/primary: x\n"; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
}
