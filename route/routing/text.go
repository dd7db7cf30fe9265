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

// Laying is the leg's cable as the media engine names a laying: its construction, and with
// an entrance transition the inside construction and the transition's ends (InsideAt); the
// optimizer's option for such a laying is named by it (optionName).
func (l *Leg) Laying() media.Laying {
	return media.Laying{Construction: l.Construction, Inside: l.Inside, At: l.InsideAt}
}

// TransitionText says where the leg's entrance transition is, as outputs write it after the
// cables spliced there: "at entrances" at both ends, "at CAF entrance" at one (the
// building's id); "" without a transition.
func (l *Leg) TransitionText() string {
	at := l.TransitionAt()
	switch len(at) {
	case 0:
		return ""
	case 1:
		return "at " + at[0] + " entrance"
	}
	return "at entrances"
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
