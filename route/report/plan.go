package report

import (
	"bufio"
	"bytes"
	"cmp"
	"context"
	"fmt"
	"html/template"
	"io"
	"maps"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route"
	"spanwright/route/escape"
	"spanwright/route/estimate"
	"spanwright/route/fileset"
	"spanwright/route/internal/ctxio"
	"spanwright/route/output"
	"spanwright/route/routing"
)

// FileName is the plan report's file name in a plan's output folder.
const FileName = "report.html"

// mediumInfo is how a medium is drawn and named.
type mediumInfo struct {
	ID          string
	Label       string // "os2, OS2 single-mode"
	Hex         string
	ColourLabel string // the TIA-598 colour name, or why there is none
	Dash        string // stroke-dasharray by kind, so media differ in grey print too
	DashName    string
	Kind        string
}

// Dash patterns of route lines by medium kind.
var kindDash = map[string][2]string{
	media.KindSinglemode: {"", "solid line"},
	media.KindMultimode:  {"10 4", "long dashes"},
	media.KindCopper:     {"3 3", "short dashes"},
}

func mediumOf(cat *media.Catalog, id string) mediumInfo {
	mi := mediumInfo{ID: id, Label: id, Hex: unknownHex, ColourLabel: "unknown medium"}
	m := cat.Medium(id)
	if m == nil {
		return mi
	}
	if m.Name != "" {
		mi.Label = id + ", " + m.Name
	}
	mi.Kind = m.Kind
	mi.Hex, mi.ColourLabel = colourOf(m.JacketColour)
	if d, ok := kindDash[m.Kind]; ok {
		mi.Dash, mi.DashName = d[0], d[1]
	}
	return mi
}

type lossCell struct {
	Text      string
	Field     string // the field test limit there (media.Loss.FieldLimitDB); "" without a loss
	Operating bool
}

type marginBar struct {
	LossW, MarginW string // widths in px of the loss and margin parts of a 100 px bar
	Class          string
}

type legRow struct {
	Link, Leg        string
	From, To         string
	FromName, ToName string
	Rate             string
	Feasible         bool
	Medium           mediumInfo
	HasMedium        bool
	// Jacket is the jacket colour of the cable the leg installs (its construction's, which
	// may differ from the medium's TIA-598 colour: outside-plant cable is black), and of the
	// listed cable spliced on at the entrances when it differs; "" without a medium.
	Jacket            string
	Application       string
	Construction      string
	Strands           string
	Route, Lat, Riser string
	Losses            []lossCell
	Limit, Margin     string
	// Acceptance says, under the reason, which field test limits an application sets below
	// the ANSI/TIA-568.3-D link limit and the attenuator the loss includes; "" when neither.
	Acceptance string
	Bar        *marginBar
	Cost       string
	Reason     string
	Rejected   []string
	Pathways   string
	// EntranceFrom and EntranceTo are the entrances used at From and To; Crosses the
	// buildings the route passes through and Turns the junctions where it turns at a
	// handhole the plan adds, in travel order.
	EntranceFrom, EntranceTo string
	Crosses, Turns           []string
}

type bar struct {
	Label  string
	Value  string
	W      string // px
	Y      string
	TextY  string
	ValueX string
	Class  string
}

type mediumRow struct {
	Info  mediumInfo
	Links int // links with a feasible leg of the medium
	Legs  int
	Route string
	Cost  string
}

type fillRow struct {
	Span, Pathway string
	Cables        int
	Ducts         string
	Used, Allowed string
	Pct           string
	BarW          string
	Over          bool
}

type ductRow struct {
	Span, Pathway string
	Duct          string
	DuctID        string
	Cables        string
	Fill, Allowed string
	BarW, LimitX  string
	Jam           string
	JamRisk       bool
	Over          bool
	Bad           bool
	Legs          string // the legs of its cables, one per cable (estimate.DuctFill.Legs)
	Note          string // too many separate cables for sound pulls (install.CrowdedNote)
}

type pullRow struct {
	Link, Leg string
	Seq       int
	From, To  string
	Spans     string
	Length    string
	Bends     string
	Feed      string
	Tension   string
	Other     string
	Rated     string
	BarW      string
	Pct       string // the tension's share of the rating, as text beside the bar
	SWBP      string
	Added     string
	Over      bool
	Reason    string
}

// structureRow is a row of the structures table (output.Structure).
type structureRow struct {
	Mark                  int
	Place                 string
	Status, Type, Purpose string
	Lon, Lat              string
	Legs                  string
	Joined                string // the legs with a mid-span join there (output.Structure.Joined)
	Coiled                string // the cable coiled there (output.Structure.CoiledM), in the page's unit; "" for none
	ToBuild               bool
}

type driverRow struct {
	Category, Item string
	Cost           string
	Pct            string
}

type buildingRow struct {
	ID, Name, Role string
}

type planView struct {
	Title      string
	CSS        template.CSS
	Unit       string
	Currency   string
	S          output.Summary
	Hub        string
	HubName    string
	Feasible   int
	TotalRoute string
	NewTrench  string
	// NewWorkParts is NewTrench's bored and building laterals' parts (output.NewWorkParts),
	// "" for none.
	NewWorkParts string
	// NewConstruction is the new construction by kind (output.NewConstructionText of
	// estimate.Construction.ByKind), "none" when the plan builds none, "" without an estimate.
	NewConstruction string
	// CountOfPulls is what the count of pulls a duct lays beyond the fill alone
	// (output.CountText of estimate.Construction.ForCount); "" without an estimate.
	CountOfPulls string
	Opened       string // "N proposed spans"
	Worst        string
	Total        string
	PricedNote   string // output.Summary.PricedNote
	NotPriced    string // output.Summary.NotPricedNote
	Budget       string
	Over         string
	OverPct      string
	BudgetScope  string // output.Summary.BudgetScope: the check covers the feasible legs only
	NoVerdict    bool   // output.Summary.NoLegPriced: BudgetScope in the verdict's place
	IsOver       bool
	HasBudget    bool
	BudgetBar    struct{ TotalW, BudgetX, Class, LabelX, Anchor, BudgetAnchor string }
	Costs        []bar
	CostsH       string
	Media        []mediumRow
	Map          mapView
	// Core is the core's map, drawn larger below the whole campus's (coreBounds); nil when
	// the whole map draws it large enough.
	Core       *coreView
	Legend     legend
	Legs       []legRow
	Infeasible int
	Wavelength []int
	// Attenuation is the cabled attenuation the loss budgets count, one entry per fibre
	// construction the legs use (attenuationUsed).
	Attenuation []string
	ReasonSpan  int // columns of the links table the reason row spans
	DesignDB    string
	DesignFrom  string // what DesignDB is made of (media.Loss.RequiredMarginBasis)
	Fill        []fillRow
	FillOver    int
	FillOpen    int
	Ducts       []ductRow
	DuctsOver   int
	NoDuct      string // how many cables fit no duct of their span (estimate.DuctFill.Unplaced), "" for none
	// Crowded counts the ducts given more separate cables than sound pulls allow
	// (install.Crowded), of every duct, listed or not; Separate is that number of cables. The
	// packing keeps to that count (install.Load.Takes) and the campus declares no cable
	// already in a duct, so it is 0 on every plan spanwright makes: a check, not a finding.
	Crowded, Separate int
	HasEst            bool
	Pulls             []pullRow
	PullsOver         int
	PullPoints        int
	Force             string
	Sidewall          string // the unit of sidewall pressure: N/m, or lbf/ft when imperial
	Diameter          string // the unit of duct and cable diameters: mm, or in when imperial
	Drivers           []driverRow
	BOMLabel          string
	Subtotal          string
	ModelCost         string
	// Bound and Gap are the optimizer's proved lower bound on its objective and the gap of the
	// routes to it in percent (output.Summary.LowerBoundCents, GapPct, as output.GapText
	// prints it); Bound is "" without a bound.
	Objective, Bound, Gap string
	// OffCrossing is what keeping diverse legs off junctions where ducts cross with no
	// structure costs by the optimizer's objective (output.Summary.DiverseOffCrossingCents).
	OffCrossing string
	Warnings    []string
	// Notes are the plan's notes (route.Result.Notes: the plan's own, such as a link entry a
	// sweep carried to another hub, a links entry dropped for the hub, a warm start's routes
	// placed afresh), and StartedFrom the plan folder its search began
	// from (route.Result.StartedFrom), "" for a plan from scratch: the owner's document says
	// what the terminal and summary.json say (tester 12's finding 13).
	Notes       []string
	StartedFrom string
	// Assumed lists the new trench priced on the design's assumed surface (AssumedSurface),
	// each as its source and length (estimate.Construction.Assumed).
	Assumed        []string
	AssumedSurface string
	Buildings      []buildingRow
	// Cautions are the plan's safety cautions (route.Result.Cautions), with the words said
	// before and after them.
	Cautions []route.Caution
	// PHYs names the IEEE 802.3 applications the feasible legs use, sorted, for the sources.
	PHYs                              string
	CautionsPreamble, CautionsClosing string
	// Structures is the structures table (output.StructuresOf), keyed to the map's numbers.
	Structures []structureRow
	// How much of each detail table is listed (DetailRows).
	LegsListed, PullsListed, DuctsListed, FillListed, StructuresListed listed
}

// DetailRows is the most rows a detail table of the plan report lists: the links, the pull
// sections and the duct fill. A plan with more lists those that most need a look (infeasible
// legs and the thinnest loss margins; pulls nearest their cable's rated tension; ducts over
// or nearest their fill limit), says so above the table and names the files that hold every
// row (links.csv, bom.xlsx, plan.gpkg). A page of tens of thousands of rows (120 MB of HTML
// at 5,000 buildings) is more than a browser opens usefully, and such lists are read in a
// spreadsheet. The demo's largest table has 131 rows. Common practice, no published source.
const DetailRows = 250

// listed says how many rows of a detail table the report lists, of how many.
type listed struct{ Shown, Of int }

// listOf is how much of a table of n rows is listed.
func listOf(n int) listed { return listed{Shown: min(n, DetailRows), Of: n} }

// Cut reports whether rows are left out.
func (l listed) Cut() bool { return l.Shown < l.Of }

// countOf counts the rows of a table for which is holds, listed or not.
func countOf[T any](rows []T, is func(T) bool) int {
	n := 0
	for _, r := range rows {
		if is(r) {
			n++
		}
	}
	return n
}

type legendItem struct {
	Class, Stroke, Dash, Label string
	Shape                      string
}

type legend struct {
	// Over are what the map draws over the routes: new construction, tunnels and pole
	// lines carrying cable, cable counts; each drawn on a route of RouteStroke.
	Over        []legendItem
	RouteStroke string
	Counts      bool
	Pathways    []legendItem
	Media       []legendItem
	Structures  []legendItem
	Crossed     bool // a building some route passes through
}

// Plan renders the report of a planned scenario as one self-contained HTML page. It fails
// only when a leg's steps do not match the network (a programmer's error upstream), or with
// ctx's error when ctx is done before the page is whole.
func Plan(ctx context.Context, r *route.Result, opt Options) ([]byte, error) {
	var b bytes.Buffer
	if err := WritePlan(ctx, &b, r, opt); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// WritePlan is Plan writing the page to w as the template renders it (through
// escape.NewHTML), so that the page is never held whole; on failure w may hold part of it.
// An error of w is returned wrapped.
func WritePlan(ctx context.Context, w io.Writer, r *route.Result, opt Options) error {
	v, err := planViewOf(ctx, r, opt)
	if err != nil {
		return err
	}
	esc := escape.NewHTML(w)
	bw := bufio.NewWriterSize(esc, pagePiece)
	err = templates().ExecuteTemplate(ctxio.Writer(ctx, bw), "plan", v)
	if err == nil {
		err = bw.Flush()
	}
	if err == nil {
		err = escape.Flush(esc)
	}
	switch {
	case ctx.Err() != nil:
		return ctx.Err()
	case err != nil:
		return fmt.Errorf("report: %w", err)
	}
	return nil
}

// pagePiece is how many bytes of the page WritePlan gathers before escaping and writing them.
const pagePiece = 64 << 10

// Output is the plan report as one of a plan's output files (FileName), rendered by
// WritePlan when written (output.WriteSet).
func Output(r *route.Result, opt Options) output.File {
	return output.File{Name: FileName, Weight: output.WeightMiB(r, output.ReportKiBPerLeg), Render: func(ctx context.Context, w io.Writer) error {
		return WritePlan(ctx, w, r, opt)
	}}
}

// legCheckEvery is how many legs the map draws between two looks at the context.
const legCheckEvery = 64

// File renders the plan report as an output file named FileName.
func File(ctx context.Context, r *route.Result, opt Options) (fileset.OutputFile, error) {
	data, err := Plan(ctx, r, opt)
	if err != nil {
		return fileset.OutputFile{}, err
	}
	return fileset.OutputFile{Name: FileName, Data: data}, nil
}

// Extra returns a hook for route/sweep's Options.Extra that adds the plan report to each
// scenario's folder.
func Extra(opt Options) func(context.Context, *route.Result) ([]fileset.OutputFile, error) {
	return func(ctx context.Context, r *route.Result) ([]fileset.OutputFile, error) {
		f, err := File(ctx, r, opt)
		if err != nil {
			return nil, err
		}
		return []fileset.OutputFile{f}, nil
	}
}

func planViewOf(ctx context.Context, r *route.Result, opt Options) (*planView, error) {
	cat := media.DefaultCatalog()
	if r.Engine != nil {
		cat = r.Engine.Catalog()
	}
	s := output.Summarize(r)
	v := &planView{S: s, Unit: opt.units().Length, Currency: r.Currency, Hub: r.Hub,
		CautionsPreamble: route.CautionsPreamble, CautionsClosing: route.CautionsClosing}
	// What calls for each caution in the run's units (a handhole's place names its distance);
	// its text as written, which gives both units.
	for _, c := range r.Cautions {
		c.Where = c.WhereIn(opt.lengthU)
		v.Cautions = append(v.Cautions, c)
	}
	phys := map[string]bool{}
	for _, l := range r.Legs {
		if l.Feasible && l.Application != "" {
			phys[l.Application] = true
		}
	}
	v.PHYs = strings.Join(slices.Sorted(maps.Keys(phys)), ", ")
	v.Title = "Backbone plan: " + s.Scenario
	if s.Scenario == "" {
		v.Title = "Backbone plan"
	}
	v.CSS = template.CSS(styleCSS)
	names := map[string]string{}
	ends := map[string]bool{} // the buildings at an end of a leg of the plan
	for i := range r.Legs {
		ends[r.Legs[i].Link.From], ends[r.Legs[i].Link.To] = true, true
	}
	for _, b := range r.Site.Campus.Buildings {
		names[b.ID] = b.Name
		role := "served"
		switch {
		case b.Role == "" && b.ID != r.Hub && !ends[b.ID]:
			role = "not served (link skipped)" // tester 13's finding A
		case b.ID == r.Hub:
			role = "hub (main cross-connect)"
		case b.Role == "ic":
			role = "intermediate cross-connect"
		case b.Role == "mc":
			role = "main cross-connect (not the plan's hub)"
		}
		v.Buildings = append(v.Buildings, buildingRow{ID: b.ID, Name: b.Name, Role: role})
	}
	sort.Slice(v.Buildings, func(i, j int) bool { return v.Buildings[i].ID < v.Buildings[j].ID })
	v.HubName = names[r.Hub]
	v.Feasible = s.Legs - s.Infeasible
	tot := output.TotalsOf(r)
	v.TotalRoute = group(strconv.FormatFloat(output.RouteListed(opt.units(), r), 'f', 1, 64)) + " " + opt.units().Length
	v.NewTrench = opt.lengthU(tot.NewM)
	if r.Estimate != nil {
		v.NewWorkParts = output.NewWorkParts(r.Estimate.Construction, opt.lengthU)
		v.NewConstruction = output.NewConstructionText(r.Estimate.Construction.ByKind, opt.lengthU)
		if v.NewConstruction == "" {
			v.NewConstruction = "none"
		}
		v.CountOfPulls = strings.TrimPrefix(output.InUnits(output.WriteOptions{Units: opt.Units}, output.CountText(r.Estimate.Construction.ForCount, s.CablesPerDuct, opt.lengthU,
			func(c int64) string { return money(c) + " " + r.Currency })), "count of pulls: ")
	}
	v.Opened = output.Counted(len(r.Opened), "proposed span", "proposed spans")
	if s.WorstMarginDB != nil {
		v.Worst = dB(*s.WorstMarginDB) + " dB"
	}
	v.Total = money(s.TotalCents)
	v.PricedNote = s.PricedNote()
	v.HasBudget = s.BudgetCents != nil
	if v.HasBudget {
		budget := *s.BudgetCents
		v.Budget = money(budget)
		over := *s.OverBudgetCents
		v.IsOver = over > 0
		if over < 0 {
			over = -over
		}
		v.Over = money(over)
		v.OverPct = strconv.FormatFloat(abs(*s.OverBudgetPct), 'f', 1, 64) + " %"
		v.BudgetScope, v.NoVerdict = s.BudgetScope(), s.NoLegPriced()
		top := max(s.TotalCents, budget)
		const full = 560.0
		v.BudgetBar.TotalW = num(full * float64(s.TotalCents) / float64(top))
		v.BudgetBar.BudgetX = num(full * float64(budget) / float64(top))
		v.BudgetBar.LabelX, v.BudgetBar.Anchor = num(full*float64(s.TotalCents)/float64(top)+6), "start"
		if float64(s.TotalCents)/float64(top) > 0.7 {
			v.BudgetBar.LabelX, v.BudgetBar.Anchor = num(full*float64(s.TotalCents)/float64(top)-6), "end"
		}
		v.BudgetBar.BudgetAnchor = "middle"
		if bx := full * float64(budget) / float64(top); bx < 80 {
			v.BudgetBar.BudgetAnchor = "start"
		} else if bx > full-20 {
			v.BudgetBar.BudgetAnchor = "end"
		}
		v.BudgetBar.Class = "under"
		if v.IsOver {
			v.BudgetBar.Class = "over"
		}
	}
	// The margin the worst leg must keep and what it is made of (media.Loss.RequiredMarginDB,
	// RequiredMarginBasis): the margin policy's, or the plan's loss_margin_db when larger.
	worstMargin, required, from, found := 0.0, 0.0, "", false
	for _, l := range r.Legs {
		if w, ok := l.WorstLoss(); ok && l.Feasible && (!found || w.MarginDB < worstMargin) {
			worstMargin, required, from, found = w.MarginDB, w.RequiredMarginDB, w.RequiredMarginBasis, true
		}
	}
	v.DesignDB, v.DesignFrom = dB(required), from

	// Media in catalog order, then any the catalog does not know, by id.
	used := map[string]bool{}
	for _, l := range r.Legs {
		if l.Feasible && l.Medium != "" {
			used[l.Medium] = true
		}
	}
	med := map[string]mediumInfo{}
	var order []string
	for _, m := range cat.Media {
		if used[m.ID] {
			order = append(order, m.ID)
		}
	}
	var extra []string
	for id := range used {
		if cat.Medium(id) == nil {
			extra = append(extra, id)
		}
	}
	sort.Strings(extra)
	order = append(order, extra...)
	for _, id := range order {
		med[id] = mediumOf(cat, id)
	}

	if err := ctx.Err(); err != nil {
		return nil, err
	}
	v.Costs, v.CostsH = costBars(r)
	v.Media = mediaRows(r, opt, med, order)
	v.Wavelength = wavelengths(r)
	v.Attenuation = attenuationUsed(r)
	v.ReasonSpan = 11 + len(v.Wavelength)
	v.Legs, v.Infeasible, v.LegsListed = legRows(r, opt, med, names, v.Wavelength)
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	v.Fill, v.FillOver, v.FillOpen, v.FillListed = fillRows(r)
	v.ModelCost = money(s.ModelCents)
	v.OffCrossing = money(s.DiverseOffCrossingCents)
	if s.LowerBoundCents != nil {
		v.Objective, v.Bound, v.Gap = money(s.ObjectiveCents), money(*s.LowerBoundCents), output.GapText(s.GapPct)
	}
	if e := r.Estimate; e != nil && e.BOM != nil {
		v.HasEst = true
		v.BOMLabel = e.BOM.Label
		v.NotPriced = s.NotPricedNote()
		v.Subtotal = money(e.BOM.SubtotalCents)
		v.Ducts, v.DuctsOver, v.DuctsListed = ductRows(e.Fill, opt)
		noDuct := 0
		for _, f := range e.Fill {
			if f.Unplaced {
				noDuct += len(f.CablesODMM)
			} else if f.Crowded() {
				v.Crowded++
				v.Separate = f.Pulls
			}
		}
		switch {
		case noDuct == 1:
			v.NoDuct = "1 cable fits no duct of its span"
		case noDuct > 1:
			v.NoDuct = strconv.Itoa(noDuct) + " cables fit no duct of their span"
		}
		v.Pulls, v.PullsOver, v.PullsListed = pullRows(r, opt)
		v.PullPoints = e.AddedPullPoints
		for _, d := range s.CostDrivers {
			v.Drivers = append(v.Drivers, driverRow{Category: d.Category, Item: output.InUnits(output.WriteOptions{Units: opt.Units}, d.ItemText(opt.lengthU)), Cost: money(d.Cents),
				Pct: strconv.FormatFloat(d.Pct, 'f', 1, 64) + " %"})
		}
	}
	u := opt.units()
	v.Force, v.Sidewall, v.Diameter = u.Force, u.SWBP, u.Diameter
	// Warnings are text made inside the model in metres (summary.json keeps them so): the
	// report writes their lengths in its units, as it does the rule engine's reasons.
	for _, w := range r.Warnings {
		if slices.Contains(r.Shown, w) { // the campus's figures in its keys' units (route.Result.Shown)
			v.Warnings = append(v.Warnings, w)
			continue
		}
		v.Warnings = append(v.Warnings, output.InUnits(output.WriteOptions{Units: opt.Units}, w))
	}
	for _, n := range r.Notes {
		v.Notes = append(v.Notes, output.InUnits(output.WriteOptions{Units: opt.Units}, n))
	}
	v.StartedFrom = r.StartedFrom
	if e := r.Estimate; e != nil {
		v.AssumedSurface = e.Construction.AssumedSurface
		for _, a := range e.Construction.Assumed {
			v.Assumed = append(v.Assumed, a.From+": "+opt.lengthU(a.LengthM))
		}
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	sts, err := output.StructuresOf(r)
	if err != nil {
		return nil, err
	}
	v.Structures, v.StructuresListed = structureRows(sts, opt)
	whole := drawnBounds(r)
	core, inCore, hasCore := coreBounds(r, whole)
	var frame *bounds
	if hasCore {
		frame = &core
	}
	m, err := buildMap(ctx, r, opt, med, sts, whole, frame)
	if err != nil {
		return nil, err
	}
	v.Map = m
	if hasCore {
		cm, err := buildMap(ctx, r, opt, med, sts, core, nil)
		if err != nil {
			return nil, err
		}
		cm.Label = "map of the campus core with the planned routes"
		v.Core = &coreView{Map: cm, Buildings: inCore, Of: len(r.Site.Campus.Buildings)}
		v.Core.caption(core, cm.pxPerM/m.pxPerM, opt)
	}
	v.Legend = legendOf(r, med, order, m)
	return v, nil
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// structureLegs is the most legs a row of the structures table names; the rest are counted,
// and bom.xlsx's structures sheet names every one. Common practice, no published source.
const structureLegs = 12

// structureRows is the structures table, as many rows as DetailRows lists.
func structureRows(sts []output.Structure, opt Options) ([]structureRow, listed) {
	shown := listOf(len(sts))
	out := make([]structureRow, shown.Shown)
	for i, st := range sts[:shown.Shown] {
		legs, more := input.Shown(st.Legs, structureLegs)
		joined, moreJoined := input.Shown(st.Joined, structureLegs)
		out[i] = structureRow{Mark: st.Mark, Place: st.Place(opt.lengthU), Status: st.Status, Type: st.Type, Purpose: st.Purpose,
			Lon: strconv.FormatFloat(st.Point[0], 'f', 7, 64), Lat: strconv.FormatFloat(st.Point[1], 'f', 7, 64), Legs: strings.Join(legs, ", ") + more,
			Joined: strings.Join(joined, ", ") + moreJoined, ToBuild: st.Status == output.StructureToBuild}
		if st.CoiledM > 0 {
			out[i].Coiled = opt.lengthU(st.CoiledM)
		}
	}
	return out, shown
}

// costBars is the cost-by-category chart: the legs' cable, labour, construction and optics,
// and plan-level cost not carried by a leg.
func costBars(r *route.Result) ([]bar, string) {
	type cat struct {
		label string
		cents int64
		cls   string
	}
	var cats []cat
	if e := r.Estimate; e != nil && e.BOM != nil {
		// Labels fit the 230 px left of the bars at the chart's 12 px.
		names := map[string][2]string{
			media.CategoryMaterial:     {"material: cable, connectivity", "c-cable"},
			media.CategoryLabour:       {"labour", "c-labour"},
			media.CategoryConstruction: {"construction: civil works", "c-constr"},
			media.CategoryOptics:       {"optics: transceivers", "c-optics"},
			media.CategoryBidItems:     {"bid items (price book)", "c-extra"},
		}
		for _, st := range e.BOM.Subtotal {
			n, ok := names[st.Category]
			if !ok {
				n = [2]string{st.Category, "c-extra"}
			}
			cats = append(cats, cat{n[0], st.Cents, n[1]})
		}
		cats = append(cats, cat{"markup: contingency", e.BOM.ContingencyCents, "c-extra"},
			cat{"markup: overhead", e.BOM.OverheadCents, "c-extra"}, cat{"tax", e.BOM.TaxCents, "c-extra"})
	} else {
		// Without a bill of materials: the cost model's breakdown of the legs.
		var cable, labour, constr, optics int64
		for _, l := range r.Legs {
			cable += l.Cost.CableCents
			labour += l.Cost.LabourCents
			constr += l.Cost.ConstructionCents
			optics += l.Cost.OpticsCents
		}
		cats = []cat{
			{"cable", cable, "c-cable"},
			{"labour", labour, "c-labour"},
			{"construction (trench, added duct, entrances)", constr, "c-constr"},
			{"optics and terminations", optics, "c-optics"},
		}
		if r.ExtraCents != 0 {
			cats = append(cats, cat{"plan level (markups, other)", r.ExtraCents, "c-extra"})
		}
	}
	var top, all int64 = 1, 0
	for _, c := range cats {
		top = max(top, c.cents)
		all += c.cents
	}
	// The longest bar, in px: its value and share (about 130 px) still end inside the
	// chart's 760.
	const full = 380.0
	const rowH = 26.0
	out := make([]bar, len(cats))
	for i, c := range cats {
		w := 0.0
		if c.cents > 0 {
			w = full * float64(c.cents) / float64(top)
		}
		y := float64(i) * rowH
		// The amount (the caption gives the currency) and its share of the chart's total.
		value := money(c.cents)
		if all > 0 {
			value += " (" + strconv.FormatFloat(100*float64(c.cents)/float64(all), 'f', 1, 64) + " %)"
		}
		out[i] = bar{Label: c.label, Value: value, W: num(w), Y: num(y + 4),
			TextY: num(y + 17), ValueX: num(230 + w + 6), Class: c.cls}
	}
	return out, num(float64(len(cats))*rowH + 4)
}

func mediaRows(r *route.Result, opt Options, med map[string]mediumInfo, order []string) []mediumRow {
	legs := map[string]int{}
	links := map[string]map[string]bool{}
	listed := output.RouteListedBy(opt.units(), r) // in the report's unit, as the total route
	cost := map[string]int64{}
	for _, l := range r.Legs {
		if !l.Feasible {
			continue
		}
		legs[l.Medium]++
		if links[l.Medium] == nil {
			links[l.Medium] = map[string]bool{}
		}
		links[l.Medium][l.Link.ID] = true
		cost[l.Medium] += l.Cost.TotalCents()
	}
	out := make([]mediumRow, 0, len(order))
	for _, id := range order {
		out = append(out, mediumRow{Info: med[id], Links: len(links[id]), Legs: legs[id], Route: group(strconv.FormatFloat(listed[id], 'f', 1, 64)), Cost: money(cost[id])})
	}
	return out
}

// attenuationUsed is the catalog's maximum cabled attenuation of each fibre construction a
// feasible leg uses, its own or the inside one of an entrance transition, in catalog order:
// "os2 osp-loose-tube 0.50 dB/km at 1310 nm, 0.50 dB/km at 1550 nm", the figures a loss
// budget multiplies by the length (tester 11's finding 7: printed nowhere).
func attenuationUsed(r *route.Result) []string {
	used := map[[2]string]bool{}
	for _, l := range r.Legs {
		if l.Feasible {
			used[[2]string{l.Medium, l.Construction}] = true
			if l.Inside != "" {
				used[[2]string{l.Medium, l.Inside}] = true
			}
		}
	}
	var out []string
	for _, m := range r.Engine.Catalog().Media {
		for _, k := range m.Constructions {
			if m.Fibre() && used[[2]string{m.ID, k.ID}] {
				out = append(out, m.ID+" "+k.ID+" "+k.AttenuationText())
			}
		}
	}
	return out
}

// wavelengths lists the loss columns: routing.Wavelengths at which some leg has a loss.
func wavelengths(r *route.Result) []int {
	have := map[int]bool{}
	for _, l := range r.Legs {
		for _, x := range l.Losses {
			have[x.WavelengthNM] = true
		}
	}
	var out []int
	for _, nm := range routing.Wavelengths {
		if have[nm] {
			out = append(out, nm)
		}
	}
	return out
}

// legRows lists the legs, the infeasible ones first (by link, primary before diverse) and
// how many of those there are, and says how many it lists (DetailRows): when there are
// more legs, the feasible ones follow by their loss margin, thinnest first (legs without a
// loss budget last), and the list is cut; otherwise they follow in leg order.
func legRows(r *route.Result, opt Options, med map[string]mediumInfo, names map[string]string, nms []int) ([]legRow, int, listed) {
	var bad, good []int
	for i := range r.Legs {
		if r.Legs[i].Feasible {
			good = append(good, i)
		} else {
			bad = append(bad, i)
		}
	}
	sort.SliceStable(bad, func(i, j int) bool {
		a, b := &r.Legs[bad[i]], &r.Legs[bad[j]]
		if a.Link.ID != b.Link.ID {
			return a.Link.ID < b.Link.ID
		}
		return a.Name > b.Name // primary before diverse
	})
	list := listOf(len(r.Legs))
	if list.Cut() {
		margin := func(l *routing.Leg) (float64, bool) {
			w, ok := l.WorstLoss()
			return w.MarginDB, ok && w.LimitDB > 0
		}
		sort.SliceStable(good, func(i, j int) bool {
			a, aok := margin(&r.Legs[good[i]])
			b, bok := margin(&r.Legs[good[j]])
			if aok != bok {
				return aok
			}
			return aok && a < b
		})
	}
	order := append(bad, good...)[:list.Shown]
	rows := make([]legRow, len(order))
	for k, i := range order {
		rows[k] = legRowOf(r, &r.Legs[i], opt, med, names, nms)
	}
	return rows, len(bad), list
}

// jacketOf is the jacket of the cable leg l installs, as the links table names it: "jacket
// black" (its construction's colour, output.JacketColours, by colourOf's name), and ", yellow
// at entrances" for a listed cable spliced on at both entrances in another colour (", yellow
// at CAF entrance" at one: routing.Leg.TransitionText); "" when the
// catalog gives no colour for its construction (copper: no TIA-598 colour, which the medium's
// label says) or has no such medium or construction.
func jacketOf(r *route.Result, l *routing.Leg) string {
	outside, inside := output.JacketColours(r, l)
	if outside == "" {
		return ""
	}
	_, out := colourOf(outside)
	if inside != "" && inside != outside {
		_, in := colourOf(inside)
		out += ", " + in + " " + l.TransitionText()
	}
	return "jacket " + out
}

// legRowOf is the links table's row of the leg l.
func legRowOf(r *route.Result, l *routing.Leg, opt Options, med map[string]mediumInfo, names map[string]string, nms []int) legRow {
	pathways, crosses, turns := output.LegLists(r.Site.Net, l) // from→to, as every output lists them
	row := legRow{Link: l.Link.ID, Leg: l.Name, From: l.Link.From, To: l.Link.To,
		FromName: names[l.Link.From], ToName: names[l.Link.To], Rate: l.Link.Rate, Feasible: l.Feasible,
		Application: l.Application, Construction: l.ConstructionText(), Strands: output.StrandsText(r.Engine.Catalog(), l),
		Route: opt.length(l.RouteM), Lat: opt.length(l.LateralM), Riser: opt.length(l.RiserM),
		Cost: money(l.Cost.TotalCents()), EntranceFrom: l.EntranceFrom, EntranceTo: l.EntranceTo,
		Crosses: crosses, Turns: turns}
	if l.Link.FutureRate != "" {
		row.Rate += " → " + l.Link.FutureRate
	}
	row.Pathways = strings.Join(pathways, " ")
	if l.Feasible {
		row.Reason = output.InUnits(output.WriteOptions{Units: opt.Units}, l.Choice)
		for _, rj := range l.Rejected {
			row.Rejected = append(row.Rejected, output.InUnits(output.WriteOptions{Units: opt.Units}, rj.Reason))
		}
	} else {
		row.Reason = output.InUnits(output.WriteOptions{Units: opt.Units}, l.Reason)
	}
	if l.Medium != "" {
		row.Medium, row.HasMedium = med[l.Medium], true
		row.Jacket = jacketOf(r, l)
	}
	for _, nm := range nms {
		c := lossCell{}
		for _, x := range l.Losses {
			if x.WavelengthNM == nm {
				c = lossCell{Text: dB(x.LossDB), Field: dB(x.FieldLimitDB), Operating: x.Operating}
				if x.AttenuatorDB > 0 {
					// The loss holds the attenuator, the field test does not (tester 9's
					// finding 2: "7.84 ≤ 5.34" read as a link failing its own test).
					c.Field += " without the " + strconv.FormatFloat(x.AttenuatorDB, 'f', -1, 64) + " dB attenuator"
				}
			}
		}
		row.Losses = append(row.Losses, c)
	}
	row.Acceptance = acceptanceOf(l.Losses, l.Application)
	var worst *media.Loss
	for k := range l.Losses {
		x := &l.Losses[k]
		if x.Operating && (worst == nil || x.MarginDB < worst.MarginDB) {
			worst = x
		}
	}
	if worst != nil && worst.LimitDB > 0 {
		row.Limit, row.Margin = dB(worst.LimitDB), dB(worst.MarginDB)
		lossW := 100 * worst.LossDB / worst.LimitDB
		if lossW > 100 {
			lossW = 100
		}
		if lossW < 0 {
			lossW = 0
		}
		b := &marginBar{LossW: num(lossW), MarginW: num(100 - lossW), Class: "ok"}
		switch {
		case worst.MarginDB < 0:
			b.Class = "bad"
		case worst.MarginDB < worst.RequiredMarginDB:
			b.Class = "thin"
		}
		row.Bar = b
	}
	return row
}

// acceptanceOf is the links table's line on a leg's acceptance: the wavelengths whose field
// test limit an application sets below the ANSI/TIA-568.3-D link limit, with both figures,
// the margin the leg must keep at its worst operating wavelength and what it is made of
// (media.Loss.RequiredMarginBasis), and the fixed attenuator at each receiver that the loss
// includes; "" when there is none of them (copper).
func acceptanceOf(losses []media.Loss, app string) string {
	var parts []string
	att := 0.0
	var worst *media.Loss
	for i := range losses {
		if x := &losses[i]; x.Operating && (worst == nil || x.MarginDB < worst.MarginDB) {
			worst = x
		}
	}
	for _, x := range losses {
		if x.FieldLimitBy != "" && x.FieldLimitBy != media.FieldLimitByCabling {
			by := x.FieldLimitBy
			if by != app {
				// Not the leg's own application: the one its future rate plans for (tester 9's
				// finding 4).
				by += ", the application of its future rate"
			}
			parts = append(parts, fmt.Sprintf("at %d nm %s dB, set by %s (ANSI/TIA-568.3-D link limit %s dB)",
				x.WavelengthNM, dB(x.FieldLimitDB), by, dB(x.CablingLimitDB)))
		}
		if x.Operating {
			att = max(att, x.AttenuatorDB)
		}
	}
	var out []string
	if len(parts) > 0 {
		out = append(out, "Field test limit "+strings.Join(parts, "; ")+".")
	}
	if worst != nil && worst.RequiredMarginBasis != "" {
		out = append(out, fmt.Sprintf("Margin to keep %s dB: %s.", dB(worst.RequiredMarginDB), worst.RequiredMarginBasis))
	}
	if att > 0 {
		out = append(out, fmt.Sprintf("The loss includes a %s dB fixed attenuator at each receiver; the link is tested without it.",
			strconv.FormatFloat(att, 'f', -1, 64)))
	}
	return strings.Join(out, " ")
}

// fillRows lists the spans whose ducts limit the fill, those over the NFPA 70 Chapter 9
// Table 1 area first, then by fill, then by span id; it also counts the spans with no fill
// limit (tunnel, tray, aerial, buried, existing or new). It lists at most DetailRows spans
// and says how many; the count over is of them all. Its ducts are the spare ones and those
// the plan lays beside them ("2 + 2 added"), or an opened span's, all laid ("3 new").
func fillRows(r *route.Result) ([]fillRow, int, int, listed) {
	type f struct {
		routing.SegmentFill
		ratio float64
	}
	var list []f
	open := 0
	for _, x := range r.Fill {
		if !x.Limited {
			open++
			continue
		}
		ratio := 0.0
		if x.AllowedAreaMM2 > 0 {
			ratio = x.UsedAreaMM2 / x.AllowedAreaMM2
		} else if x.UsedAreaMM2 > 0 {
			ratio = 2
		}
		list = append(list, f{x, ratio})
	}
	over := func(x f) bool { return x.UsedAreaMM2 > x.AllowedAreaMM2+1e-9 }
	sort.SliceStable(list, func(i, j int) bool {
		a, b := list[i], list[j]
		if over(a) != over(b) {
			return over(a)
		}
		if a.ratio != b.ratio {
			return a.ratio > b.ratio
		}
		return a.Span < b.Span
	})
	n := countOf(list, over)
	shown := listOf(len(list))
	out := make([]fillRow, shown.Shown)
	for i, x := range list[:shown.Shown] {
		ducts := strconv.Itoa(x.Ducts)
		switch {
		case slices.Contains(r.Opened, x.Span):
			ducts = strconv.Itoa(x.AddedDucts) + " new"
		case x.AddedDucts > 0:
			ducts += " + " + strconv.Itoa(x.AddedDucts) + " added"
		}
		w := x.ratio * 100
		if w > 100 {
			w = 100
		}
		out[i] = fillRow{Span: x.Span, Pathway: x.PathwayID, Cables: x.Cables, Ducts: ducts,
			Used: strconv.FormatFloat(x.UsedAreaMM2, 'f', 0, 64), Allowed: strconv.FormatFloat(x.AllowedAreaMM2, 'f', 0, 64),
			Pct: pct(x.ratio), BarW: num(w), Over: over(x)}
	}
	return out, n, open, shown
}

// legendOf lists what the map shows: the pathway types and statuses present, the media of
// the feasible legs, the structure types present, handholes to add at turns, entrances and
// buildings routes pass through when m draws them.
func legendOf(r *route.Result, med map[string]mediumInfo, order []string, m mapView) legend {
	var lg legend
	net := r.Site.Net
	opened := map[string]bool{}
	for _, id := range r.Opened {
		opened[id] = true
	}
	have := map[string]bool{}
	emi := false
	for i := range net.Spans {
		s := &net.Spans[i]
		have[pathwayClass(s, opened[s.ID])] = true
		if s.EMI == "high" {
			emi = true
		}
	}
	lg.Pathways = present(have, []legendItem{
		{Class: "pw-duct", Label: "existing duct"},
		{Class: "pw-tunnel", Label: "existing utility tunnel"},
		{Class: "pw-aerial", Label: "existing aerial (pole line)"},
		{Class: "pw-buried", Label: "existing direct-buried"},
		{Class: "pw-tray", Label: "existing cable tray"},
		{Class: "pw-other", Label: "other pathway"},
		{Class: "pw-proposed", Label: "proposed trench, not used (dashed)"},
		{Class: "pw-new", Label: "new pathway opened by this plan (dashed)"},
	})
	if len(net.Access) > 0 {
		for _, a := range net.Access {
			if len(a.Lateral) >= 2 {
				lg.Pathways = append(lg.Pathways, legendItem{Class: "lateral", Label: "lateral to a building (dotted)"})
				break
			}
		}
	}
	if emi {
		lg.Pathways = append(lg.Pathways, legendItem{Class: "emi-high", Label: "high EMI (halo)"})
	}
	for _, id := range order {
		mi := med[id]
		label := mi.Label + ": " + mi.ColourLabel
		if mi.DashName != "" {
			label += ", " + mi.DashName
		}
		lg.Media = append(lg.Media, legendItem{Stroke: mi.Hex, Dash: mi.Dash, Label: label})
	}
	types := map[string]bool{}
	for _, s := range r.Site.Campus.Structures {
		types[s.Type] = true
	}
	var ts []string
	for t := range types {
		ts = append(ts, t)
	}
	sort.Strings(ts)
	for _, t := range ts {
		lg.Structures = append(lg.Structures, legendItem{Shape: structureShape(t), Class: "st", Label: t})
	}
	if len(m.Turns) > 0 {
		lg.Structures = append(lg.Structures, legendItem{Shape: "square", Class: "st turn", Label: "handhole to add (a route turns between pathways, new pathway joins, a lateral taps a duct or a pole line, along new construction, or a pull point)"})
	}
	if len(m.Keys) > 0 {
		lg.Structures = append(lg.Structures, legendItem{Shape: "key", Class: "key", Label: "structure number, keyed to the structures table (numbers that would crowd a label are left out)"})
	}
	if len(m.Entrances) > 0 {
		lg.Structures = append(lg.Structures, legendItem{Shape: "dot", Class: "ent", Label: "building entrance"})
	}
	if slices.ContainsFunc(m.Entrances, func(e mark) bool { return e.Class == "ent used" }) {
		lg.Structures = append(lg.Structures, legendItem{Shape: "dot", Class: "ent used", Label: "entrance a leg uses"})
	}
	lg.Crossed = m.Crossed
	over := map[string]bool{}
	for _, w := range append(append([]svgPath(nil), m.Works...), m.Carriers...) {
		over[w.Class] = true
	}
	lg.Over = present(over, []legendItem{
		{Class: "nw-trench", Label: "new trench the plan builds (long dashes)"},
		{Class: "nw-bore", Label: "new directional bore the plan builds (dots)"},
		{Class: "nw-aerial", Label: "new pole line the plan builds (dash and dot)"},
		{Class: "nw-tray", Label: "new cable tray the plan builds (short even dashes)"},
		{Class: "nw-tunnel", Label: "new utility tunnel the plan builds (wide, dash and two dots)"},
		{Class: "on-tunnel", Label: "route in a utility tunnel (thin brown line)"},
		{Class: "on-aerial", Label: "route on a pole line, aerial (dark dots)"},
	})
	lg.RouteStroke = "#9aa3ad"
	if len(order) > 0 {
		lg.RouteStroke = med[order[0]].Hex
	}
	lg.Counts = len(m.Counts) > 0
	return lg
}

// present keeps the legend items whose class the map draws.
func present(drawn map[string]bool, items []legendItem) []legendItem {
	var out []legendItem
	for _, it := range items {
		if drawn[it.Class] {
			out = append(out, it)
		}
	}
	return out
}

// ductRows lists the fill of every duct that holds cable on a span of limited capacity, and
// the cables of a span that fit none of its ducts (a row of their own, duct "none"): those
// and ducts over the NFPA 70 Chapter 9 Table 1 fill or at risk of a jam first, then by fill
// relative to its limit, then by span and duct. The count is of the ducts not OK.
func ductRows(fs []estimate.DuctFill, opt Options) ([]ductRow, int, listed) {
	list := append([]estimate.DuctFill(nil), fs...)
	ratio := func(f estimate.DuctFill) float64 {
		if f.AllowedPct <= 0 {
			return 0
		}
		return f.FillPct / f.AllowedPct
	}
	sort.SliceStable(list, func(i, j int) bool {
		a, b := list[i], list[j]
		if a.OK != b.OK {
			return !a.OK
		}
		if ratio(a) != ratio(b) {
			return ratio(a) > ratio(b)
		}
		if a.Span != b.Span {
			return a.Span < b.Span
		}
		return a.Duct < b.Duct
	})
	bad := countOf(list, func(f estimate.DuctFill) bool { return !f.OK && !f.Unplaced })
	shown := listOf(len(list))
	out := make([]ductRow, shown.Shown)
	for i, f := range list[:shown.Shown] {
		duct := strconv.Itoa(f.Duct)
		if f.Added {
			duct += " (added)"
		}
		if f.Unplaced {
			duct = "none"
		}
		cables := strconv.Itoa(len(f.CablesODMM))
		if f.Innerduct {
			cables += " in innerduct"
		}
		if len(f.CablesODMM) > 0 {
			cables += " (OD " + opt.diameters(f.CablesODMM) + ")"
		}
		// The bar spans 0 to 100 % of the duct's area; the mark is the allowed fill.
		w := math.Min(f.FillPct, 100)
		row := ductRow{Span: f.Span, Pathway: f.PathwayID, Duct: duct, DuctID: opt.ductDiameter(f.DuctIDMM),
			Cables: cables, Fill: strconv.FormatFloat(f.FillPct, 'f', 1, 64) + " %", Allowed: strconv.FormatFloat(f.AllowedPct, 'f', 0, 64) + " %",
			BarW: num(w), LimitX: num(math.Min(f.AllowedPct, 100)), Over: f.FillPct > f.AllowedPct, JamRisk: f.JamRisk, Bad: !f.OK}
		if f.JamRatio > 0 {
			row.Jam = strconv.FormatFloat(f.JamRatio, 'f', 2, 64)
		}
		row.Legs, row.Note = strings.Join(f.Legs, ", "), f.Note()
		if f.Unplaced {
			row.Fill, row.Allowed, row.BarW, row.LimitX = "fit no duct", "", num(0), num(0)
		}
		out[i] = row
	}
	return out, bad, shown
}

// pullRows lists every pull section: those over the cable's rated tension first, then by
// tension relative to the rating, then in leg order.
func pullRows(r *route.Result, opt Options) ([]pullRow, int, listed) {
	all := r.Estimate.Pulls
	ratio := func(p *estimate.PullSection) float64 {
		if p.RatedN <= 0 {
			return 0
		}
		return p.TensionN / p.RatedN
	}
	// The sections' indexes are sorted, not the sections: a large plan has a hundred
	// thousand of them, and only the first DetailRows are shown.
	order := make([]int32, len(all))
	for i := range order {
		order[i] = int32(i)
	}
	before := func(a, b *estimate.PullSection) bool {
		if a.WithinRating != b.WithinRating {
			return !a.WithinRating
		}
		return ratio(a) > ratio(b)
	}
	slices.SortStableFunc(order, func(i, j int32) int {
		switch a, b := &all[i], &all[j]; {
		case before(a, b):
			return -1
		case before(b, a):
			return 1
		}
		return 0
	})
	u := opt.units()
	force := func(n float64) string { return group(strconv.FormatFloat(u.N(n), 'f', 1, 64)) }
	// Sidewall pressure in the table's unit, no decimals.
	sidewall := func(v float64) string { return group(strconv.FormatFloat(u.NPerM(v), 'f', 0, 64)) }
	// Why a pull is over its limits, in the report's units and formatting.
	units := install.Units{Length: opt.lengthU,
		Force:    func(n float64) string { return force(n) + " " + u.Force },
		Pressure: func(v float64) string { return sidewall(v) + " " + u.SWBP }}
	over := countOf(all, func(p estimate.PullSection) bool { return !p.WithinRating })
	shown := listOf(len(all))
	out := make([]pullRow, shown.Shown)
	for i, k := range order[:shown.Shown] {
		p := &all[k]
		l := &r.Legs[p.Leg]
		var added []string
		if p.AddedFrom {
			added = append(added, "start")
		}
		if p.AddedTo {
			added = append(added, "end")
		}
		row := pullRow{Link: l.Link.ID, Leg: l.Name, Seq: p.Seq, From: p.From.Text(opt.lengthU), To: p.To.Text(opt.lengthU), Spans: p.SpansText(),
			Length: opt.length(p.LengthM), Bends: strconv.FormatFloat(p.BendDeg, 'f', 0, 64) + "°", Feed: p.FeedAt.Text(opt.lengthU),
			Tension: force(p.TensionN), Other: force(p.OtherN), Rated: force(p.RatedN),
			BarW: num(math.Min(100*ratio(p), 100)), Pct: pct(ratio(p)), SWBP: sidewall(p.SWBPNPerM),
			Added: strings.Join(added, ", "), Over: !p.WithinRating, Reason: install.Why(p.Over, units)}
		out[i] = row
	}
	return out, over, shown
}

// fillBar is a 100 px bar filled to w px, red when over; limitX, when not "", marks a limit.
func fillBar(p *page, w string, over bool, limitX string) {
	cls := markup("f-ok")
	if over {
		cls = "f-over"
	}
	p.w(`<svg width="100" height="10" aria-hidden="true"><rect x="0" y="1" width="100" height="8" class="f-bg"/><rect x="0" y="1" width="`,
		t(w), `" height="8" class="`, cls, `"/>`)
	if limitX != "" {
		p.w(`<line x1="`, t(limitX), `" y1="0" x2="`, t(limitX), `" y2="10" class="f-limit"/>`)
	}
	p.w(`</svg>`)
}

// td writes a table cell of text, with a class when class is not "".
func td(p *page, class markup, text string) {
	if class == "" {
		p.w("<td>")
	} else {
		p.w(`<td class="`, class, `">`)
	}
	p.w(t(text), "</td>")
}

// HTML is the pull section's table row.
func (r pullRow) HTML() template.HTML {
	var p page
	p.b.Grow(640)
	if r.Over {
		p.w(`<tr class="over">`)
	} else {
		p.w("<tr>")
	}
	p.w("<td><b>", t(r.Link), `</b> <span class="small">`, t(r.Leg), "</span></td>")
	td(&p, "n", strconv.Itoa(r.Seq))
	td(&p, "", r.From+" → "+r.To)
	td(&p, "n", r.Length)
	td(&p, "n", r.Bends)
	td(&p, "", r.Feed)
	td(&p, "n", r.Tension)
	td(&p, "n", r.Other)
	td(&p, "n", r.Rated)
	p.w(`<td class="margin">`)
	fillBar(&p, r.BarW, r.Over, "")
	p.w(" ", t(r.Pct))
	if r.Over {
		p.w(" <b>over</b>")
	}
	p.w("</td>")
	td(&p, "n", r.SWBP)
	td(&p, "", r.Added)
	p.w(`<td class="small">`, t(r.Spans))
	if r.Reason != "" {
		p.w("<br><b>", t(r.Reason), "</b>")
	}
	p.w("</td></tr>\n")
	return p.html()
}

// HTML is the duct's table row.
func (d ductRow) HTML() template.HTML {
	var p page
	p.b.Grow(480)
	if d.Bad {
		p.w(`<tr class="over">`)
	} else {
		p.w("<tr>")
	}
	td(&p, "", d.Span)
	td(&p, "", d.Pathway)
	td(&p, "", d.Duct)
	td(&p, "n", d.DuctID)
	td(&p, "", d.Cables)
	p.w(`<td class="margin">`)
	fillBar(&p, d.BarW, d.Over, d.LimitX)
	p.w(" ", t(d.Fill))
	if d.Over {
		p.w(" <b>over</b>")
	}
	p.w("</td>")
	td(&p, "n", d.Allowed)
	p.w(`<td class="n">`, t(d.Jam))
	if d.JamRisk {
		p.w(" <b>jam risk</b>")
	}
	p.w("</td><td>", t(d.Legs))
	if d.Note != "" {
		p.w("<br><b>", t(d.Note), "</b>")
	}
	p.w("</td></tr>\n")
	return p.html()
}

// HTML is the leg's two table rows (figures, then reasons) in their own tbody; span is the
// number of columns the reason row spans.
func (l legRow) HTML(span int) template.HTML {
	var p page
	p.b.Grow(2048)
	if l.Feasible {
		p.w(`<tbody class="leg"><tr class="main">`, "\n")
	} else {
		p.w(`<tbody class="leg infeasible"><tr class="main">`, "\n")
	}
	p.w("<td><b>", t(l.Link), `</b><br><span class="small">`, t(l.Leg), "</span></td>\n")
	p.w("<td>", t(l.From+" → "+l.To))
	if l.FromName != "" || l.ToName != "" {
		p.w(`<br><span class="small">`, t(l.FromName+" → "+l.ToName), "</span>")
	}
	if l.EntranceFrom != "" || l.EntranceTo != "" {
		p.w(`<br><span class="small entrances">entrances `, t(l.EntranceFrom+" → "+l.EntranceTo), "</span>")
	}
	p.w("</td>\n")
	td(&p, "", l.Rate)
	p.w("\n<td>")
	if l.HasMedium {
		p.w(`<svg class="sw" width="22" height="12" aria-hidden="true"><rect x="0.5" y="0.5" width="21" height="11" fill="`,
			t(l.Medium.Hex), `" class="sw-box"/></svg> `, t(l.Medium.ID), `<br><span class="small">`, t(cmp.Or(l.Jacket, l.Medium.ColourLabel)), "</span>")
	} else {
		p.w(`<span class="badge bad">infeasible</span>`)
	}
	p.w("</td>\n<td>", t(l.Application))
	if l.Construction != "" {
		p.w(`<br><span class="small">`, t(l.Construction), "</span>")
	}
	p.w("</td>\n")
	td(&p, "n", l.Strands)
	p.w("\n")
	td(&p, "n", l.Route)
	td(&p, "n", l.Lat)
	td(&p, "n", l.Riser)
	p.w("\n")
	for _, c := range l.Losses {
		class := markup("n")
		if c.Operating {
			class = "n op"
		}
		p.w(`<td class="`, class, `">`, t(c.Text))
		if c.Field != "" {
			p.w(`<br><span class="small field">≤ `, t(c.Field), "</span>")
		}
		p.w("</td>")
	}
	p.w("\n")
	td(&p, "n", l.Limit)
	p.w("\n", `<td class="margin">`)
	if l.Bar != nil {
		p.w(`<svg width="100" height="10" aria-hidden="true"><rect x="0" y="1" width="`, t(l.Bar.LossW),
			`" height="8" class="m-loss"/><rect x="`, t(l.Bar.LossW), `" y="1" width="`, t(l.Bar.MarginW),
			`" height="8" class="m-`, t(l.Bar.Class), `"/></svg>`)
	}
	p.w(" ", t(l.Margin), "</td>\n")
	td(&p, "n", l.Cost)
	p.w("\n</tr>\n", `<tr class="why"><td></td><td colspan="`, t(strconv.Itoa(span)), `"><span class="reason">`)
	if !l.Feasible {
		p.w("<b>Infeasible:</b> ")
	}
	p.w(t(l.Reason), "</span>")
	if l.Acceptance != "" {
		p.w(`<br><span class="small acceptance">`, t(l.Acceptance), "</span>")
	}
	if len(l.Rejected) > 0 {
		p.w(`<br><span class="small">Not chosen: `, t(strings.Join(l.Rejected, "; ")), ".</span>")
	}
	if l.Pathways != "" {
		p.w(`<br><span class="small">Via `, t(l.Pathways), "</span>")
	}
	if len(l.Crosses) > 0 {
		p.w(`<br><span class="small crosses">Passes through buildings `, t(strings.Join(l.Crosses, ", ")), "</span>")
	}
	if len(l.Turns) > 0 {
		p.w(`<br><span class="small turns">Turns between pathways at `, t(strings.Join(l.Turns, ", ")), ", where a handhole is added</span>")
	}
	p.w("</td></tr></tbody>\n")
	return p.html()
}
