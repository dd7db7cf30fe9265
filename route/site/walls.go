package site

// BuiltEntriesAt counts, by junction ID, the entrances there already (geo.Entry.Built): an
// existing pathway meets a building's wall at the junction, through a penetration of its own.
// A duct the plan lays beside such a pathway reaches the wall beside it and needs a
// penetration of its own (items.AddedDuctWalls).
func (s *Site) BuiltEntriesAt() map[string]int {
	at := map[string]int{}
	for _, e := range s.Net.Entrances {
		if e.Built {
			at[e.Junction]++
		}
	}
	return at
}
