package output

import (
	"strconv"
	"strings"

	"spanwright/route"
	"spanwright/route/routing"
)

// scheduleHead names links.csv's last columns, the cable schedule an installer cuts and
// labels cable by (scheduleText), after reason_code so that no earlier column moves.
func scheduleHead(opt WriteOptions) []string {
	cutH, _ := opt.lengthCol("cut_length")
	slackH, _ := opt.lengthCol("slack_loops")
	return []string{"cables", cutH, "reels", slackH, "structures_passed", "jacket_colour", "cable_label"}
}

// scheduleText is the cable schedule of leg i of r, as links.csv's last columns: its cables, each
// cable's cut length (the cable bought, waste included: routing.CableTakeoff.LengthM, bom.xlsx
// links sheet's "cable bought"), the reels it takes, its slack loops' metres and the
// structures passed (the takeoff's, as the links sheet), the jacket colour (JacketText) and
// the cables' labels (CableLabels, separated by spaces). Empty for an infeasible leg.
func scheduleText(opt WriteOptions, r *route.Result, i int) []string {
	l := &r.Legs[i]
	if !l.Feasible {
		return make([]string, len(scheduleHead(opt)))
	}
	t := l.Cable
	_, length := opt.lengthCol("")
	return []string{strconv.Itoa(t.Cables), length(t.LengthM), strconv.Itoa(t.Reels), length(t.SlackM()),
		strconv.Itoa(t.Structures), JacketText(r, l), strings.Join(CableLabels(r, i), " ")}
}

// JacketText is the jacket colour of a leg's cable as the catalog lists it for its
// construction (TIA-598 colour names for premises fibre; an outside-plant construction gives
// its own, commonly black), and with an entrance transition the inside construction's too,
// as ConstructionText names them: "black + yellow at entrances". "" where the catalog gives
// none (copper: TIA-598 covers optical fibre only).
func JacketText(r *route.Result, l *routing.Leg) string {
	colour := func(construction string) string {
		if r.Engine == nil {
			return ""
		}
		m := r.Engine.Catalog().Medium(l.Medium)
		if m == nil {
			return ""
		}
		if c := m.Construction(construction); c != nil {
			return c.JacketColour
		}
		return m.JacketColour
	}
	out := colour(l.Construction)
	if l.Inside != "" {
		out += " + " + colour(l.Inside) + " at entrances"
	}
	return out
}

// CableLabels are the labels of the cables of leg i of r, one per cable, written on the cable
// at both ends: the link's from and to buildings and a cable number, "ADM/LIB-1", after the
// form of ANSI/TIA-606's campus backbone cable identifier [b1-f1s1]/[b2-f2s2]-n without the
// floor and space, which the campus does not give (from memory). A link's cables are numbered
// from 1 over its legs in order (route.Result.Legs keeps a link's legs together, the primary
// first), so that no two cables of a link share a label.
func CableLabels(r *route.Result, i int) []string {
	l := &r.Legs[i]
	if !l.Feasible || l.Link == nil {
		return nil
	}
	first := 1
	for k := i - 1; k >= 0 && r.Legs[k].Link != nil && r.Legs[k].Link.ID == l.Link.ID; k-- {
		if r.Legs[k].Feasible {
			first += r.Legs[k].Cable.Cables
		}
	}
	out := make([]string, l.Cable.Cables)
	for j := range out {
		out[j] = l.Link.From + "/" + l.Link.To + "-" + strconv.Itoa(first+j)
	}
	return out
}
