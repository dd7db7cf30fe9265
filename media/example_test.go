package media_test

import (
	"fmt"
	"os"

	"spanwright/media"
)

// A 10G link between two buildings, 612 m of channel: multimode does not reach, copper may
// not leave the building, and single-mode on outside-plant cable closes its budget.
func ExampleEngine_Choose() {
	e, err := media.NewEngine(media.DefaultCatalog(), media.DefaultRules(), media.DefaultPriceBook(),
		media.EngineOptions{LossMarginDB: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	ch := e.Choose(media.Link{ID: "hall-to-library", RouteM: 580, RiserM: 20, SlackM: 12, RateGbps: 10,
		MaxEMI: "low", Outdoor: true, PathwayTypes: []string{"duct"}, ConnectorPairs: 2, Strands: 12})
	fmt.Println(ch.Medium, ch.Application, ch.Construction, media.FormatCents(ch.CostCents))
	for _, l := range ch.Losses {
		if l.Operating {
			fmt.Printf("%d nm: loss %.2f dB, limit %.2f dB, margin %.2f dB, field limit %.2f dB\n",
				l.WavelengthNM, l.LossDB, l.LimitDB, l.MarginDB, l.FieldLimitDB)
		}
	}
	for _, r := range ch.Rejected {
		fmt.Println(r.Reason)
	}
	// Output:
	// os2 10GBASE-LR osp-loose-tube 1289.16
	// 1310 nm: loss 1.91 dB, limit 6.20 dB, margin 4.29 dB, field limit 2.41 dB
	// cat6a rejected by copper-90m: installed copper (the permanent link) is at most 90 m; this link installs 612 m
	// om3 rejected by reach: 10GBASE-SR reaches 300 m, channel is 612 m
	// om4 rejected by reach: 10GBASE-SR reaches 400 m, channel is 612 m
	// om5 rejected by reach: 10GBASE-SR reaches 400 m, channel is 612 m
}

// The longest channel each medium can serve at 10G inside a building with two patch panels.
func ExampleEngine_MaxChannelM() {
	e, err := media.NewEngine(nil, nil, nil, media.EngineOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, m := range e.Media() {
		fmt.Printf("%s %.0f m\n", m, e.MaxChannelM(m, 10, 0, media.Link{ConnectorPairs: 2}))
	}
	// Output:
	// cat6a 90 m
	// om3 143 m
	// om4 229 m
	// om5 229 m
	// os2 17800 m
}

func ExampleCatalog_Table() {
	if err := media.DefaultCatalog().Table(os.Stdout, 40); err != nil {
		fmt.Println(err)
	}
	// Output:
	// application  IEEE 802.3 clause  rate  wavelength nm  uses      medium  range m  max channel loss dB  min channel loss dB  jacket
	// 40GBASE-SR4  86                 40G   850            8 fibres  om3     100      1.90                 0.00                 aqua
	// 40GBASE-SR4  86                 40G   850            8 fibres  om4     150      1.50                 0.00                 aqua
	// 40GBASE-SR4  86                 40G   850            8 fibres  om5     150      1.50                 0.00                 lime green
	// 40GBASE-LR4  87                 40G   1310           2 fibres  os2     10000    6.70                 0.00                 yellow
	//
	// medium  constructions                                            max cabled attenuation, which every loss budget counts
	// om3     ofnr-riser, ofnp-plenum, indoor-outdoor, osp-loose-tube  3.50 dB/km at 850 nm, 1.50 dB/km at 1300 nm
	// om4     ofnr-riser, ofnp-plenum, indoor-outdoor, osp-loose-tube  3.50 dB/km at 850 nm, 1.50 dB/km at 1300 nm
	// om5     ofnr-riser, ofnp-plenum, indoor-outdoor, osp-loose-tube  3.50 dB/km at 850 nm, 1.50 dB/km at 1300 nm
	// os2     ofnr-riser, ofnp-plenum                                  1.00 dB/km at 1310 nm, 1.00 dB/km at 1550 nm
	// os2     indoor-outdoor, osp-loose-tube                           0.50 dB/km at 1310 nm, 0.50 dB/km at 1550 nm
	//
	// medium  construction    name                                                listing   metal in the cable    outdoors  plenum  direct burial  pull rating N
	// om3     ofnr-riser      indoor riser, tight buffer                          OFNR      none, all-dielectric  no        no      no             1335
	// om3     ofnp-plenum     indoor plenum, tight buffer                         OFNP      none, all-dielectric  no        yes     no             1335
	// om3     indoor-outdoor  indoor/outdoor loose tube, riser listed             OFNR      none, all-dielectric  yes       no      no             2670 (12-fibre 1335)
	// om3     osp-loose-tube  outside plant loose tube, all-dielectric, unlisted  unlisted  none, all-dielectric  yes       no      yes            2670
	// om4     ofnr-riser      indoor riser, tight buffer                          OFNR      none, all-dielectric  no        no      no             1335
	// om4     ofnp-plenum     indoor plenum, tight buffer                         OFNP      none, all-dielectric  no        yes     no             1335
	// om4     indoor-outdoor  indoor/outdoor loose tube, riser listed             OFNR      none, all-dielectric  yes       no      no             2670 (12-fibre 1335)
	// om4     osp-loose-tube  outside plant loose tube, all-dielectric, unlisted  unlisted  none, all-dielectric  yes       no      yes            2670
	// om5     ofnr-riser      indoor riser, tight buffer                          OFNR      none, all-dielectric  no        no      no             1335
	// om5     ofnp-plenum     indoor plenum, tight buffer                         OFNP      none, all-dielectric  no        yes     no             1335
	// om5     indoor-outdoor  indoor/outdoor loose tube, riser listed             OFNR      none, all-dielectric  yes       no      no             2670 (12-fibre 1335)
	// om5     osp-loose-tube  outside plant loose tube, all-dielectric, unlisted  unlisted  none, all-dielectric  yes       no      yes            2670
	// os2     ofnr-riser      indoor riser, tight buffer                          OFNR      none, all-dielectric  no        no      no             1335
	// os2     ofnp-plenum     indoor plenum, tight buffer                         OFNP      none, all-dielectric  no        yes     no             1335
	// os2     indoor-outdoor  indoor/outdoor loose tube, riser listed             OFNR      none, all-dielectric  yes       no      no             2670 (12-fibre 1335)
	// os2     osp-loose-tube  outside plant loose tube, all-dielectric, unlisted  unlisted  none, all-dielectric  yes       no      yes            2670
	// connections: field acceptance (ANSI/TIA-568.3-D maxima) mated pair 0.75 dB, splice 0.30 dB; design mated pair 0.50 dB, splice 0.30 dB
	// margins: what each mated pair and splice may lose at its ANSI/TIA-568.3-D maximum beyond its design loss (0.25 dB a pair, 0.00 dB a splice), plus 0.00 dB multimode, 0.00 dB single-mode (extra_multimode_db, extra_singlemode_db); single-mode also 0.5 repair splices per km of outside plant
	// higher grades: om4 also uses om3's figures; om5 also uses om4's figures
	// ranges and losses per IEEE 802.3, see catalog.yaml (embedded)
}
