package media

import (
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"
)

// ReachTable writes, for each rate (rateGbps only, when not 0) and fibre medium of c, the
// longest channel the engine plans with the default design: two patch panels (two mated
// pairs), strand ends spliced to pigtails, every margin the catalog's and the default rules'
// (Engine.MaxChannelM); for a link inside buildings (no outside plant, so no repair splices)
// and for one between buildings (outside plant: its cable and its repair splices).
// It stands beside the applications' IEEE 802.3 ranges so that a reader does not take those
// for what a plan allows: 10GBASE-SR reaches 300 m of OM3, a plan with spliced pigtails 143 m
// (verify 18 V7).
func (c *Catalog) ReachTable(w io.Writer, rateGbps float64) error {
	e, err := NewEngine(c, nil, nil, EngineOptions{})
	if err != nil {
		return err
	}
	inside := Link{ConnectorPairs: 2, Strands: 2}
	between := Link{ConnectorPairs: 2, Strands: 2, Outdoor: true}
	tw := tabwriter.NewWriter(w, 0, 8, 2, ' ', 0)
	fmt.Fprintln(tw)
	fmt.Fprintln(tw, "longest channel a plan gives a medium with the default design (two patch panels, strand ends spliced to pigtails, the margins above), in m:")
	fmt.Fprintln(tw, "rate\tmedium\tinside buildings\tbetween buildings")
	for _, rate := range c.Rates() {
		if rateGbps != 0 && rate != rateGbps {
			continue
		}
		for _, m := range c.Media {
			if !m.Fibre() {
				continue
			}
			if !c.runsAt(rate, m.ID) {
				continue
			}
			reach := func(l Link) string {
				if v := e.MaxChannelM(m.ID, rate, 0, l); v > 0 {
					return strconv.FormatFloat(v, 'f', 0, 64)
				}
				return "none"
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", FormatRate(rate), m.ID, reach(inside), reach(between))
		}
	}
	return tw.Flush()
}

// runsAt reports whether some application at rateGbps runs on medium.
func (c *Catalog) runsAt(rateGbps float64, medium string) bool {
	for _, a := range c.Applications {
		if _, ok := a.On(medium); ok && a.RateGbps == rateGbps {
			return true
		}
	}
	return false
}
