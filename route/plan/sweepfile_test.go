package plan

import (
	"strings"
	"testing"
)

// TestParsePlanSweepFile: a sweep file named where a plan is wanted (check, plan) gets one
// line that says what it is and what to run, instead of "campus: missing" and an unknown key
// for each of its keys.
func TestParsePlanSweepFile(t *testing.T) {
	src := "base: plan.yaml\nvary:\n  prices: [a.yaml, b.yaml]\n"
	_, err := ParsePlan("sweep.yaml", []byte(src))
	if err == nil {
		t.Fatal("a sweep file parsed as a plan")
	}
	msg := err.Error()
	if strings.Count(msg, "\n") != 0 || !strings.Contains(msg, "sweep.yaml:1:7: base: this is a sweep file") ||
		!strings.Contains(msg, "spanwright sweep sweep.yaml --out DIR") {
		t.Errorf("got %q", msg)
	}
	// A plan with a key named base but no vary or cases is an ordinary unknown key.
	if _, err := ParsePlan("plan.yaml", []byte("base: x\n")); err == nil || strings.Contains(err.Error(), "sweep file") {
		t.Errorf("plan with base: only: %v", err)
	}
}
