package output

import (
	"strconv"
	"strings"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/routing"
)

// scheduleHead names links.csv's last columns, the cable schedule an installer cuts and
// labels cable by (scheduleText), after reason_code so that no earlier column moves; the
// inside pieces of an entrance transition last, after cable_label.
func scheduleHead(opt WriteOptions) []string {
	cutH, _ := opt.lengthCol("cut_length")
	slackH, _ := opt.lengthCol("slack_loops")
	toH, _ := opt.lengthCol("inside_cut_to")
	fromH, _ := opt.lengthCol("inside_cut_from")
	return []string{"cables", cutH, "reels", slackH, "structures_passed", "jacket_colour", "cable_label",
		"inside_cables", toH, fromH, "inside_labels"}
}

// scheduleText is the cable schedule of leg i of r, as links.csv's last columns: its cables, each
// cable's cut length (the cable bought of the leg's own construction, waste included:
// routing.CableTakeoff.OutsideLengthM, which is all of bom.xlsx links sheet's "cable bought"
// but with an entrance transition), the reels it takes, its slack loops' metres and the
// structures passed (the takeoff's, as the links sheet), the jacket colour (JacketText) and
// the cables' labels (CableLabels, separated by spaces); then, with an entrance transition
// (Leg.Inside), the inside cables and the piece each is cut to at the served building (to) and
// at the cross-connect (from), and their labels (InsideLabels), empty without. A cable's pieces
// add up to the cable bought: cut length + inside cut to + inside cut from. Empty for an
// infeasible leg.
func scheduleText(opt WriteOptions, r *route.Result, i int) []string {
	l := &r.Legs[i]
	if !l.Feasible {
		return make([]string, len(scheduleHead(opt)))
	}
	t := l.Cable
	_, length := opt.lengthCol("")
	inside := []string{"", "", "", ""}
	if l.Inside != "" {
		inside = []string{strconv.Itoa(t.InsideCables), length(t.InsideToM), length(t.InsideFromM), strings.Join(InsideLabels(r, i), " ")}
	}
	return append([]string{strconv.Itoa(t.Cables), length(t.OutsideLengthM()), strconv.Itoa(t.Reels), length(t.SlackM()),
		strconv.Itoa(t.Structures), JacketText(r, l), strings.Join(CableLabels(r, i), " ")}, inside...)
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

// StrandsText is what a table in words gives as leg l's strands: the count for fibre,
// "4 pairs" for a feasible copper leg, whose count is its pairs (routing.Leg.StrandsCable).
// links.csv, routes.geojson and plan.gpkg give the number alone, documented as pairs for copper.
func StrandsText(cat *media.Catalog, l *routing.Leg) string {
	n := strconv.Itoa(l.StrandsCable)
	if m := cat.Medium(l.Medium); l.Feasible && m != nil && !m.Fibre() {
		return n + " pairs"
	}
	return n
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
	first := firstCable(r, i)
	out := make([]string, l.Cable.Cables)
	for j := range out {
		out[j] = cableLabel(l, first+j)
	}
	return out
}

// firstCable is the number of the first cable of leg i of r: 1 after the cables of the
// earlier legs of its link (CableLabels).
func firstCable(r *route.Result, i int) int {
	l := &r.Legs[i]
	first := 1
	for k := i - 1; k >= 0 && r.Legs[k].Link != nil && r.Legs[k].Link.ID == l.Link.ID; k-- {
		if r.Legs[k].Feasible {
			first += r.Legs[k].Cable.Cables
		}
	}
	return first
}

// cableLabel is the label of cable n of leg l's link, "ADM/LIB-1".
func cableLabel(l *routing.Leg, n int) string {
	return l.Link.From + "/" + l.Link.To + "-" + strconv.Itoa(n)
}

// InsideLabels are the labels of the inside pieces of leg i of r with an entrance transition
// (Leg.Inside), nil without: each inside cable's piece at the served building, then each one's
// at the cross-connect, labelled as the cable it is spliced to (CableLabels, numbered alike
// from the leg's first cable, inside cables where their count differs) and ":" with the
// building it is in, "ADM/LIB-1:LIB" and "ADM/LIB-1:ADM", so that the three pieces of one
// channel read as one cable. Common practice, no published source: ANSI/TIA-606 labels a
// cable, not the pieces a transition splice makes of it (from memory).
func InsideLabels(r *route.Result, i int) []string {
	l := &r.Legs[i]
	if !l.Feasible || l.Link == nil || l.Inside == "" {
		return nil
	}
	first := firstCable(r, i)
	out := make([]string, 0, 2*l.Cable.InsideCables)
	for _, b := range []string{l.Link.To, l.Link.From} {
		for j := 0; j < l.Cable.InsideCables; j++ {
			out = append(out, cableLabel(l, first+j)+":"+b)
		}
	}
	return out
}
