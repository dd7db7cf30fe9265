package routing

import (
	"testing"

	"spanwright/media"
)

// TestCableForKeysEachEnd: the cable a medium is priced as before routing (cableFor) depends on
// each end's metres inside its building, which the rule entrance-15m judges one end at a time
// (NFPA 70 770.48(A): unlisted outside-plant cable at most 15 m inside from the point of
// entrance, from memory), not on their sum: risers of 7 m at both ends leave 15 m inside each
// (riser, 5 m coil, 3 m loop: outside-plant cable passes), 14 m and 0 m leave 22 m inside one
// (it does not). Remembered by the risers' sum alone, the second link got the first's answer.
func TestCableForKeysEachEnd(t *testing.T) {
	t.Parallel()
	m, p := defaultModel(t)
	ends := func(a, b float64) media.Link {
		return media.Link{ID: "L", RiserM: a + b, ConnectorPairs: ConnectorPairs, Strands: 12, MaxEMI: "none",
			InsideAM: a + p.Design.SlackM + p.Design.SlackLoopEntranceM, InsideBM: b + p.Design.SlackM + p.Design.SlackLoopEntranceM}
	}
	slackM := 2*p.Design.SlackM + 2*p.Design.SlackLoopEntranceM
	even, _ := m.cableFor("os2", 10, ends(7, 7), slackM)
	uneven, _ := m.cableFor("os2", 10, ends(14, 0), slackM)
	if even.Construction != "osp-loose-tube" || uneven.Construction == "osp-loose-tube" || uneven.Construction == "" {
		t.Errorf("risers 7 + 7 m: %q, 14 + 0 m: %q; want osp-loose-tube (15 m inside each end), then a listed construction (22 m inside one)",
			even.Construction, uneven.Construction)
	}
}
