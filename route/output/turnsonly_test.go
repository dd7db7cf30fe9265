package output

import (
	"fmt"
	"strings"
	"testing"

	"spanwright/route/site"
)

// TestCheckTurnsOnlyCapped: check names at most turnsOnlyShown links under "turns only" and
// counts the rest (review 18 F7: every one of 142 was printed); a list one longer than that is
// printed whole, since "and 1 more" would take a line too.
func TestCheckTurnsOnlyCapped(t *testing.T) {
	t.Parallel()
	for _, n := range []int{turnsOnlyShown, turnsOnlyShown + 1, turnsOnlyShown + 30} {
		var r site.CheckReport
		for i := range n {
			r.TurnsOnly = append(r.TurnsOnly, fmt.Sprintf("link L%03d: no route", i))
		}
		var out strings.Builder
		if err := PrintCheck(&out, r, WriteOptions{}); err != nil {
			t.Fatal(err)
		}
		named := strings.Count(out.String(), ": no route\n")
		more := strings.Contains(out.String(), fmt.Sprintf("and %d more", n-turnsOnlyShown))
		switch {
		case n <= turnsOnlyShown+1 && (named != n || more):
			t.Errorf("%d links: %d named, 'more' line %v; want all named", n, named, more)
		case n > turnsOnlyShown+1 && (named != turnsOnlyShown || !more):
			t.Errorf("%d links: %d named, 'more' line %v; want %d named and the rest counted", n, named, more, turnsOnlyShown)
		}
		if !strings.Contains(out.String(), fmt.Sprintf("%d links have no route", n)) {
			t.Errorf("%d links: the heading does not count them all:\n%s", n, out.String())
		}
	}
}
