package routing

import (
	"spanwright/media"
	"strings"
)

// Wavelengths reported in the loss columns, in nm: multimode 850 and 1300, single-mode
// 1310 and 1550 (ANSI/TIA-568.3-D test wavelengths).
var Wavelengths = []int{850, 1300, 1310, 1550}

// LossAt returns the leg's loss at nm, if it has one.
func (l *Leg) LossAt(nm int) (media.Loss, bool) {
	for _, x := range l.Losses {
		if x.WavelengthNM == nm {
			return x, true
		}
	}
	return media.Loss{}, false
}

// WorstLoss returns the operating wavelength with the smallest margin.
func (l *Leg) WorstLoss() (media.Loss, bool) {
	var w media.Loss
	found := false
	for _, x := range l.Losses {
		if x.Operating && (!found || x.MarginDB < w.MarginDB) {
			w, found = x, true
		}
	}
	return w, found
}

// Label names the leg in outputs' lists: its link id and name, "ADM-LIB/diverse" (its name
// alone when it has no link).
func (l *Leg) Label() string {
	if l.Link == nil {
		return l.Name
	}
	return l.Link.ID + "/" + l.Name
}

// ConstructionText names the leg's cable for outputs: its construction, and with an entrance
// transition the inside construction spliced on and where (TransitionText), as
// "osp-loose-tube + ofnr-riser at entrances" (both ends) or "… at CAF entrance" (one end).
func (l *Leg) ConstructionText() string {
	if l.Inside == "" {
		return l.Construction
	}
	return l.Construction + " + " + l.Inside + " " + l.TransitionText()
}

// TransitionText says where the leg's entrance transition is, as outputs write it after the
// cables spliced there: "at entrances" at both ends, "at CAF entrance" at one (the
// building's id); "" without a transition.
func (l *Leg) TransitionText() string {
	if l.Inside == "" || l.Link == nil {
		return ""
	}
	return transitionText(l.InsideAt, l.Link.To, l.Link.From)
}

// transitionText is where a transition at the ends at is, a the building at media.EndA (the
// served one) and b at media.EndB: "at entrances" at both, "at CAF entrance" at one, "" at
// none. It is the one wording of the leg's construction, jacket and option names.
func transitionText(at media.Ends, a, b string) string {
	switch at {
	case media.EndsBoth:
		return "at entrances"
	case media.EndA:
		return "at " + a + " entrance"
	case media.EndB:
		return "at " + b + " entrance"
	}
	return ""
}

// TransitionAt is the buildings at whose entrances the leg's cable is spliced to inside cable:
// the served building (Link.To) first, then the cross-connect's (Link.From), as InsideAt has
// them; nil without a transition.
func (l *Leg) TransitionAt() []string {
	if l.Inside == "" || l.Link == nil {
		return nil
	}
	var out []string
	if l.InsideAt.Has(media.EndA) {
		out = append(out, l.Link.To)
	}
	if l.InsideAt.Has(media.EndB) {
		out = append(out, l.Link.From)
	}
	return out
}

// Explain is the leg's reason in words: why it is infeasible, or why its medium was chosen
// and why each other medium was not.
func (l *Leg) Explain() string {
	if !l.Feasible {
		return l.Reason
	}
	parts := []string{l.Choice}
	for _, rj := range l.Rejected {
		parts = append(parts, rj.Reason)
	}
	return strings.Join(parts, "; ")
}
