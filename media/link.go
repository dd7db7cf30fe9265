package media

// Link holds the facts about one candidate route for one link leg that the rule engine decides on.
type Link struct {
	ID string // the link's id, for messages

	RouteM float64 // along pathways, laterals included, in metres
	RiserM float64 // risers at both ends, in metres
	SlackM float64 // slack loops and service coils, in metres

	RateGbps       float64 // required data rate
	FutureRateGbps float64 // rate the medium must also carry later; 0 when none

	MaxEMI       string   // highest EMI level on the route: "none", "low" or "high"
	Outdoor      bool     // the route leaves a building (any segment outside)
	PathwayTypes []string // distinct pathway types on the route, sorted
	Plenum       bool     // part of the route runs in a plenum (an air-handling space)

	// Connection counts from the route: mated connector pairs (two patch panels plus any
	// cross-connect passed) and splices (entrance transitions and mid-span joins).
	ConnectorPairs int
	Splices        int

	Strands int // fibre strands required; copper carries them as one 4-pair cable per two strands
}

// ChannelM is the full channel length in metres: route, risers and slack.
func (l Link) ChannelM() float64 { return l.RouteM + l.RiserM + l.SlackM }

// Loss is the loss budget of a fibre link at one wavelength. Losses are reported at every
// wavelength the link is tested at (multimode 850 and 1300 nm, single-mode 1310 and
// 1550 nm); LimitDB and MarginDB apply only where the application operates.
type Loss struct {
	WavelengthNM int
	LossDB       float64 // cabled attenuation × length + connections + splices
	LimitDB      float64 // the application's maximum channel insertion loss; 0 when !Operating
	MarginDB     float64 // LimitDB − LossDB; 0 when !Operating
	FieldLimitDB float64 // acceptance limit for a loss test set on the installed link (TIA-568.3-D Tier 1)
	Operating    bool    // the application transmits at this wavelength
}

// Rejection says why one candidate medium was not chosen.
type Rejection struct {
	Medium string
	Rule   string // the id of the rule that excluded it, or "cost" when it lost on price
	Reason string // e.g. "om4 rejected by reach: 10GBASE-SR reaches 400 m, channel is 612 m"
}

// Choice is the rule engine's decision for one Link.
type Choice struct {
	Feasible     bool
	Medium       string // catalog medium id, e.g. "os2"
	Application  string // IEEE 802.3 PHY name, e.g. "10GBASE-LR"
	Construction string // e.g. "osp-loose-tube"
	Losses       []Loss // fibre only, one per test wavelength, ascending; see Loss.Operating
	CostCents    int64  // installed cost of the medium: cable, terminations, transceivers
	CableCents   int64  // the cable part of CostCents (entrance transition enclosures and trays included); the rest is labour, terminations and transceivers
	LabourCents  int64  // splicing the entrance transitions, part of CostCents; 0 without
	Inside       string // with an entrance transition: the listed construction Construction is spliced to at both entrances, which runs the risers; "" without
	Strands      int    // strands terminated at each end (4-pair cables for copper)
	Reason       string // why this medium, or why no medium fits when !Feasible
	Rejected     []Rejection
}
