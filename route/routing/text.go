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
// transition the inside construction spliced on, as "osp-loose-tube + ofnr-riser at entrances".
func (l *Leg) ConstructionText() string {
	if l.Inside == "" {
		return l.Construction
	}
	return l.Construction + " + " + l.Inside + " at entrances"
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
