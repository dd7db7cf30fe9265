package report

import (
	"bytes"
	"context"
	"errors"
	"testing"

	"spanwright/geo/ctxtest"
)

// TestPlanStop renders the demo's report with a context never done (the same bytes as with
// context.Background) and then cancelled at one look after another of those rendering takes
// at it (building the view, drawing the map, writing the page): each returns
// context.Canceled and no page.
func TestPlanStop(t *testing.T) {
	t.Parallel()
	r := result(t, demoPlan)
	want, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	count := ctxtest.New(0)
	got, err := Plan(count, r, Options{})
	if err != nil || !bytes.Equal(got, want) {
		t.Fatalf("with a context never done: %v, same page: %v", err, bytes.Equal(got, want))
	}
	total := count.Looks()
	if total < 4 {
		t.Fatalf("rendering looked at its context %d times, want at least 4", total)
	}
	for at := int64(1); at <= total; at += max(1, total/20) {
		page, err := Plan(ctxtest.New(at), r, Options{})
		if !errors.Is(err, context.Canceled) || page != nil {
			t.Errorf("cancelled at look %d of %d: got %d bytes, %v; want none and context.Canceled", at, total, len(page), err)
		}
	}
}
