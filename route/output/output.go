package output

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"maps"
	"math"
	"regexp"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route"
	"spanwright/route/escape"
	"spanwright/route/estimate"
	"spanwright/route/fileset"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// Unit systems for the outputs' edges; inside, everything is metric.
const (
	UnitsMetric   = "metric"
	UnitsImperial = "imperial"
)

// FtPerM converts metres to feet (1 ft = 0.3048 m exactly, by the 1959 international agreement).
const FtPerM = 1 / 0.3048

// WriteOptions says how outputs are rendered.
type WriteOptions struct {
	Units string // UnitsMetric (default) or UnitsImperial: CSV, XLSX and stdout only; JSON, GeoJSON and the GeoPackage stay metric
	// SkipWorkbook leaves bom.xlsx out, for runs of many scenarios where the CSV is enough.
	SkipWorkbook bool
	// SkipGeoPackage leaves plan.gpkg out, for the same runs: routes.geojson has the legs.
	SkipGeoPackage bool
}

func (o WriteOptions) imperial() bool { return o.Units == UnitsImperial }

// lengthCol returns a length column's header and a formatter for its values.
func (o WriteOptions) lengthCol(name string) (string, func(m float64) string) {
	return name + "_" + UnitsOf(o).Length, func(m float64) string { return ftOrM(o, m, 1) }
}

// File is one output file of a planned scenario: its name in the output folder and how to
// render it. Render writes the whole file to w or returns an error (ctx's when ctx is done);
// what it wrote before an error is not to be used.
type File struct {
	Name   string
	Render func(ctx context.Context, w io.Writer) error
	// Weight is the memory its renderer holds beyond the plan, in MiB as WeightMiB
	// estimates it, for WriteSet's budget (WriteBudgetMiB): 0 for a file written as it goes
	// in little memory (routes.geojson, the CSVs, summary.json).
	Weight int
}

// Working memory of the large renderers, in KiB per leg of the plan: the heap above the
// plan's own at its highest while the file alone was rendered (BenchmarkPlanOutputs, -cpu 1,
// the generated 5,000-building campus: 5,097 legs, 211 MB live; bom.xlsx 636 MB, report.html
// 645 MB, plan.gpkg 434 MB at the highest), garbage not yet collected included. Measured
// figures, no published source.
const (
	WorkbookKiBPerLeg   = 84
	ReportKiBPerLeg     = 86
	GeoPackageKiBPerLeg = 44
)

// WeightMiB is the Weight of a large file whose renderer holds kibPerLeg KiB per leg of r.
func WeightMiB(r *route.Result, kibPerLeg int) int { return 1 + len(r.Legs)*kibPerLeg/1024 }

// Outputs lists the output files of the result, in the set's order (Files renders them in
// it; WriteSet reports the first failing file in it, though it starts the heaviest first):
// routes.geojson, links.csv, summary.json, plan.gpkg (unless opt.SkipGeoPackage), and with a
// bill of materials bom.csv and bom.xlsx (unless opt.SkipWorkbook). Nothing is rendered
// until a file's Render is called.
func Outputs(r *route.Result, opt WriteOptions) []File {
	sts := structuresOnce(r) // plan.gpkg and bom.xlsx both list them
	files := []File{
		{Name: "routes.geojson", Render: func(ctx context.Context, w io.Writer) error { return routesGeoJSON(ctx, w, r) }},
		{Name: "links.csv", Render: func(ctx context.Context, w io.Writer) error { return linksCSV(w, r, opt) }},
		{Name: "summary.json", Render: func(ctx context.Context, w io.Writer) error { return summaryJSON(w, r) }},
	}
	if !opt.SkipGeoPackage {
		files = append(files, File{Name: geoPackageFileName, Weight: WeightMiB(r, GeoPackageKiBPerLeg), Render: func(ctx context.Context, w io.Writer) error {
			return named(ctx, geoPackageFileName, writeGeoPackage(ctx, w, r, sts))
		}})
	}
	if r.Estimate == nil || r.Estimate.BOM == nil {
		return files
	}
	files = append(files, File{Name: "bom.csv", Render: func(ctx context.Context, w io.Writer) error {
		return named(ctx, "bom.csv", bomCSV(w, r, opt))
	}})
	if !opt.SkipWorkbook {
		files = append(files, File{Name: "bom.xlsx", Weight: WeightMiB(r, WorkbookKiBPerLeg), Render: func(ctx context.Context, w io.Writer) error {
			return named(ctx, "bom.xlsx", bomXLSX(ctx, w, r, opt, sts))
		}})
	}
	return files
}

// Names lists the names of the files Outputs writes for a plan with or without a bill of
// materials (bill), in its order: Outputs decides, nothing is rendered.
func Names(opt WriteOptions, bill bool) []string {
	r := &route.Result{}
	if bill {
		r.Estimate = &estimate.Estimate{BOM: &media.BOM{}}
	}
	var names []string
	for _, f := range Outputs(r, opt) {
		names = append(names, f.Name)
	}
	return names
}

// named is err with the file's name before it, or ctx's error alone when ctx is done.
func named(ctx context.Context, name string, err error) error {
	switch {
	case ctx.Err() != nil:
		return ctx.Err()
	case err != nil:
		return fmt.Errorf("%s: %w", name, err)
	}
	return nil
}

// Files renders every output file of the result in memory (Outputs, in order). When ctx is
// done it returns ctx's error and no file.
func Files(ctx context.Context, r *route.Result, opt WriteOptions) ([]fileset.OutputFile, error) {
	outs := Outputs(r, opt)
	files := make([]fileset.OutputFile, 0, len(outs))
	for _, f := range outs {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		var buf bytes.Buffer
		if err := f.Render(ctx, &buf); err != nil {
			return nil, err
		}
		files = append(files, fileset.OutputFile{Name: f.Name, Data: buf.Bytes()})
	}
	return files, nil
}

// Write renders the outputs and writes them as one set into dir (WriteSet); when ctx is done
// it writes nothing and returns ctx's error.
func Write(ctx context.Context, r *route.Result, dir string, opt WriteOptions) error {
	return WriteSet(ctx, dir, Outputs(r, opt), r.Inputs())
}

// WriteSet writes files into dir as one set (fileset.Begin): each is rendered straight into
// its temporary file, never held whole, and the set replaces dir's outputs once every file is
// whole. The files render side by side on up to GOMAXPROCS goroutines (fileset.Set.WriteParts),
// the heaviest first, and no more of them at once than WriteBudgetMiB allows by their Weight,
// so that the memory of a large plan's biggest renderers does not add up. A file that fails to
// render, or ctx done, leaves dir as it was, and the error is the first failing file's in the
// order of files, whatever the scheduling; an output that would replace one of the files in
// protect is refused before anything is rendered.
func WriteSet(ctx context.Context, dir string, files []File, protect []string) error {
	names := make([]string, len(files))
	parts := make([]fileset.Part, len(files))
	for i, f := range files {
		names[i] = f.Name
		parts[i] = fileset.Part{Name: f.Name, Render: f.Render, Weight: f.Weight}
	}
	set, err := fileset.Begin(ctx, dir, names, protect)
	if err != nil {
		return err
	}
	defer set.Abort()
	if err := set.WriteParts(parts, runtime.GOMAXPROCS(0), WriteBudgetMiB); err != nil {
		return err
	}
	return set.Commit()
}

// WriteBudgetMiB is how much Weight WriteSet renders at once: the memory, in MiB, that the
// files rendering side by side may hold beyond the plan. bom.xlsx and report.html render side
// by side up to about 4,200 legs, either of them beside plan.gpkg up to about 5,500; beyond,
// one at a time. At 5,000 buildings (5,097 legs) plan.gpkg renders beside one of the two
// and they one after the other, which keeps the plan's peak well under issue 16's 1 GB
// (README, "Writing the files side by side").
const WriteBudgetMiB = 700

func round1(x float64) float64 {
	v, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'f', 1, 64), 64)
	return v
}

func round2(x float64) float64 {
	v, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'f', 2, 64), 64)
	return v
}

// routesGeoJSON writes routes.geojson: one feature per feasible leg, each built as it is
// written (geo.Network.WriteRoutesSeq looks at ctx every few routes), and, when the routes are
// the plan from scratch of their routing problem, its fingerprint (problem_sha256: see
// routing.Start.ProblemSHA256).
func routesGeoJSON(ctx context.Context, w io.Writer, r *route.Result) error {
	var members [][2]string
	if r.ProblemSHA256 != "" {
		members = [][2]string{{"problem_sha256", r.ProblemSHA256}}
	}
	return r.Site.Net.WriteRoutesSeq(ctx, w, members, func(yield func(geo.RouteFeature) bool) {
		for i := range r.Legs {
			if l := &r.Legs[i]; l.Feasible && !yield(routeFeature(r, l)) {
				return
			}
		}
	})
}

// routeFeature is the feature of routes.geojson of the feasible leg l.
func routeFeature(r *route.Result, l *routing.Leg) geo.RouteFeature {
	{
		tr := travelOf(r.Site.Net, l)
		f := LegRoute(l)
		props := map[string]any{
			"link":         l.Link.ID,
			"from":         l.Link.From,
			"to":           l.Link.To,
			"leg":          l.Name,
			"rate":         l.Link.Rate,
			"route_m":      round1(l.RouteM),
			"riser_m":      round1(l.RiserM),
			"pathways":     tr.pathways,
			"medium":       l.Medium,
			"application":  l.Application,
			"construction": l.ConstructionText(),
			"strands":      l.StrandsCable,
			"reason":       l.Explain(),
			"reason_code":  l.ReasonCode,
			"cost_cents":   l.Cost.TotalCents(),
			// The entrances used at each end, the buildings crossed and the junctions turned
			// at, in the line's order, from the leg's from building to its to building.
			"from_entrance": l.EntranceFrom,
			"to_entrance":   l.EntranceTo,
			"crosses":       tr.crosses,
			"turns":         tr.turns,
			// The spans in the line's order: what `plan --start-from` starts a plan from
			// (ReadStart).
			"spans": spansOf(f.Steps),
			// The lists again as plain text (ListText), for clients without list properties.
			"spans_text":    ListText(spansOf(f.Steps)),
			"pathways_text": ListText(tr.pathways),
			"crosses_text":  ListText(tr.crosses),
			"turns_text":    ListText(tr.turns),
		}
		for _, nm := range routing.Wavelengths {
			if x, ok := l.LossAt(nm); ok {
				props[fmt.Sprintf("loss_%d_db", nm)] = round2(x.LossDB)
			}
		}
		if w, ok := l.WorstLoss(); ok {
			props["limit_db"] = round2(w.LimitDB)
			props["margin_db"] = round2(w.MarginDB)
		}
		f.Props = props
		return f
	}
}

func linksCSV(out io.Writer, r *route.Result, opt WriteOptions) error {
	w := escape.NewWriter(out)
	routeH, routeF := opt.lengthCol("route")
	latH, latF := opt.lengthCol("lateral")
	riserH, riserF := opt.lengthCol("riser")
	head := []string{"link", "leg", "from", "to", "rate", "future_rate", "strands", routeH, latH, riserH, "pathways",
		"feasible", "medium", "application", "construction"}
	for _, nm := range routing.Wavelengths {
		head = append(head, fmt.Sprintf("loss_%d_db", nm))
	}
	for _, nm := range routing.Wavelengths {
		head = append(head, fmt.Sprintf("field_limit_%d_db", nm))
	}
	cur := strings.ToLower(r.Currency)
	if cur == "" {
		cur = "cents"
	}
	head = append(head, "limit_db", "margin_db", "cost_"+cur, "cable_"+cur, "labour_"+cur, "construction_"+cur, "terminations_transceivers_"+cur, "reason")
	// Appended after reason, so that no column before them moves.
	head = append(head, passageHead...)
	head = append(head, "reason_code")
	head = append(head, scheduleHead(opt)...)
	head = append(head, acceptanceHead()...)
	// Last, where the mid-span joins go (SplicesText, as bom.xlsx's links sheet): the
	// structures table names the legs joined at each.
	head = append(head, "mid_span_splices_at")
	// Last, the leg's own safety cautions, by their keys (route.Result.LegCautions), which
	// the safety sheet of bom.xlsx, the report's safety section and summary.json's cautions
	// give in full (tester 14 F16: not the plan's whole note on every row).
	head = append(head, "safety")
	w.Write(head)
	db := func(x float64) string { return strconv.FormatFloat(x, 'f', 2, 64) }
	for i := range r.Legs {
		l := &r.Legs[i]
		tr := travelOf(r.Site.Net, l)
		row := []string{l.Link.ID, l.Name, l.Link.From, l.Link.To, l.Link.Rate, l.Link.FutureRate,
			strconv.Itoa(l.StrandsCable), routeF(l.RouteM), latF(l.LateralM), riserF(l.RiserM),
			strings.Join(tr.pathways, " "), strconv.FormatBool(l.Feasible), l.Medium, l.Application, l.ConstructionText()}
		for _, nm := range routing.Wavelengths {
			if x, ok := l.LossAt(nm); ok {
				row = append(row, db(x.LossDB))
			} else {
				row = append(row, "")
			}
		}
		for _, nm := range routing.Wavelengths {
			if x, ok := l.LossAt(nm); ok && x.FieldLimitDB > 0 {
				row = append(row, db(x.FieldLimitDB))
			} else {
				row = append(row, "")
			}
		}
		if wl, ok := l.WorstLoss(); ok {
			row = append(row, db(wl.LimitDB), db(wl.MarginDB))
		} else {
			row = append(row, "", "")
		}
		c := l.Cost
		row = append(row, media.FormatCents(c.TotalCents()), media.FormatCents(c.CableCents), media.FormatCents(c.LabourCents),
			media.FormatCents(c.ConstructionCents), media.FormatCents(c.OpticsCents), InUnits(opt, l.Explain()))
		row = append(row, passageText(l, tr)...)
		row = append(row, l.ReasonCode)
		row = append(row, scheduleOf(r, i).text(opt)...)
		joins := ""
		if l.Feasible {
			joins = SplicesText(opt, l.Cable.Splices)
		}
		w.Write(append(append(row, acceptanceText(l)...), joins, strings.Join(r.LegCautions(i), " ")))
	}
	return w.Flush()
}

// acceptanceHead names links.csv's columns after the cable schedule: what decides each
// wavelength's field limit (field_limit_…_db), then the margin the leg must keep, beside
// margin_db's worth of it, and what that margin is made of, and the fixed attenuator at each
// receiver, which the operating wavelengths' loss_…_db include.
func acceptanceHead() []string {
	var head []string
	for _, nm := range routing.Wavelengths {
		head = append(head, fmt.Sprintf("field_limit_by_%d", nm))
	}
	return append(head, "required_margin_db", "required_margin_from", "attenuator_db")
}

// acceptanceText is leg l's acceptanceHead columns: per wavelength media.Loss.FieldLimitBy
// ("TIA-568.3-D" or the application; "" where the leg has no loss there), then the worst
// operating wavelength's RequiredMarginDB, which margin_db is held to, its
// RequiredMarginBasis and its AttenuatorDB at each receiver (0 without one); all "" without a
// loss budget.
func acceptanceText(l *routing.Leg) []string {
	var row []string
	for _, nm := range routing.Wavelengths {
		x, _ := l.LossAt(nm)
		row = append(row, x.FieldLimitBy)
	}
	if w, ok := l.WorstLoss(); ok {
		return append(row, strconv.FormatFloat(w.RequiredMarginDB, 'f', 2, 64), w.RequiredMarginBasis, strconv.FormatFloat(w.AttenuatorDB, 'f', -1, 64))
	}
	return append(row, "", "", "")
}

// lengthText finds, in one pass, what InUnits converts: a setting of an input file in a
// metric unit followed by its value ("snap_m 0.5", "design.max_lateral_m 30 m", "duct_mm
// 100 mm"; groups 1 to 4), a diameter in millimetres, or two ("innerduct 33/27 mm":
// outside and inside; groups 5 and 6), and a length in metres ("a 247.41 m channel"; group
// 7). A setting comes first so that its value is not converted as a bare length.
var lengthText = regexp.MustCompile(`\b([a-z][a-z0-9_]*_(m|mm)) (\d+(?:\.\d+)?)( (?:m|mm)\b)?|(\d+(?:\.\d+)?)(?:/(\d+(?:\.\d+)?))? mm\b|(\d+(?:\.\d+)?) m\b`)

// InUnits writes the lengths in metres of a reason from the rule engine, a warning or an
// item of the bill in the run's units: in feet, with as many decimals, when imperial (1 ft =
// 0.3048 m exactly); diameters in millimetres in inches, with two decimals ("innerduct
// 1.30/1.06 in"). The value of a setting the user writes in a metric unit (a key ending _m
// or _mm) keeps that unit, the run's after it, to a tenth of a foot at least: "beyond
// snap_m 0.5 m (1.6 ft)", "snap_m 3 m (9.8 ft)" (tester 15 F9: "beyond snap_m 0.5" beside
// lengths in feet read as feet).
func InUnits(opt WriteOptions, text string) string {
	if !opt.imperial() {
		return text
	}
	u := UnitsOf(opt)
	ft := func(num string, dec int) string { // with as many decimals as num, at least dec
		v, err := strconv.ParseFloat(num, 64)
		if err != nil {
			return ""
		}
		if i := strings.IndexByte(num, '.'); i >= 0 {
			dec = max(dec, len(num)-i-1)
		}
		return strconv.FormatFloat(u.M(v), 'f', dec, 64) + " ft"
	}
	in := func(num string) string {
		v, err := strconv.ParseFloat(num, 64)
		if err != nil {
			return ""
		}
		return strconv.FormatFloat(u.MM(v), 'f', 2, 64)
	}
	return lengthText.ReplaceAllStringFunc(text, func(m string) string {
		g := lengthText.FindStringSubmatch(m)
		switch {
		case g[1] != "":
			if g[4] != "" && strings.TrimSpace(g[4]) != g[2] { // "x_m 3 mm": not its unit
				return m
			}
			if g[2] == "m" {
				if f := ft(g[3], 1); f != "" {
					return g[1] + " " + g[3] + " m (" + f + ")"
				}
				return m
			}
			if i := in(g[3]); i != "" {
				return g[1] + " " + g[3] + " mm (" + i + " in)"
			}
			return m
		case g[5] != "":
			var out []string
			for _, num := range g[5:7] {
				if num == "" {
					continue
				}
				i := in(num)
				if i == "" {
					return m
				}
				out = append(out, i)
			}
			return strings.Join(out, "/") + " in"
		default:
			if f := ft(g[7], 0); f != "" {
				return f
			}
			return m
		}
	})
}

// legsInUnits is legs ("link/leg: reason", route.Result.InfeasibleLegs) with the lengths of
// their reasons in the run's units (InUnits).
func legsInUnits(opt WriteOptions, legs []string) []string {
	out := make([]string, len(legs))
	for i, l := range legs {
		out[i] = InUnits(opt, l)
	}
	return out
}

// passageHead names links.csv's columns of passageText.
var passageHead = []string{"from_entrance", "to_entrance", "crosses", "turns"}

// passageText is how a leg passes the campus, as the last columns of links.csv and of the
// workbook's links sheet: the entrance (a geo.Entry id) it uses at its from building (the
// cross-connect) and at its to building, the buildings it passes through and the junctions
// where it turns between pathways at a handhole the plan adds, each list in the order of the
// leg's line (tr, from its from building to its to building) with its ids separated by
// spaces, as the pathways column.
func passageText(l *routing.Leg, tr travel) []string {
	return []string{l.EntranceFrom, l.EntranceTo, strings.Join(tr.crosses, " "), strings.Join(tr.turns, " ")}
}

// SummaryFormat is summary.json's first member, "format": which layout of the file this is.
// Format 2 named the bound lower_bound_cents and the gap gap_pct (in percent), and writes
// null for budget_cents, over_budget_cents and over_budget_pct when the plan has no budget;
// the files before it have no format member (lower_bound, gap as a fraction, a budget of 0
// for none). A resumed sweep plans again a scenario whose summary.json is of another format.
// A member added keeps the format (DEVELOPERS.md: renaming a member or changing what one
// means bumps it): a file of format 2 written before the member was added lacks it and reads
// as its zero value (a reader that must tell "not kept" from zero keeps it as a pointer or nil
// slice, as sweep.Row does for the comparison's blank cells). So are the members added after
// format 2: cautions, planning_aid, splice_points_to_build, cables_per_duct, count_laid_*,
// budget_feasible_legs_only, no_new_trench, new_construction_m (absent before: a reader
// takes it as no breakdown, never as none built).
const SummaryFormat = "spanwright summary 2"

// Summary is the machine-readable digest of a planned scenario (summary.json).
type Summary struct {
	Format     string `json:"format"` // SummaryFormat
	Scenario   string `json:"scenario"`
	Hub        string `json:"hub"`
	Buildings  int    `json:"buildings"`
	Links      int    `json:"links"`
	Legs       int    `json:"legs"`
	Infeasible int    `json:"infeasible_legs"`
	// InfeasibleNames names the infeasible legs, "link/leg" in leg order (links.csv gives
	// each one's reason); absent when every leg is feasible. A sweep ranks a scenario with
	// infeasible legs among those that leave the same legs unserved (sweep.Row.Unserved).
	InfeasibleNames []string `json:"infeasible_leg_names,omitempty"`
	TotalRouteM     float64  `json:"total_route_m"`
	NewTrenchM      float64  `json:"new_trench_m"` // new civil work, trenched or bored: opened pathways and trenches for added ducts
	// NewConstructionM is the new construction by kind (estimate.NewKinds: trench, bore,
	// aerial for a pole line, tray, tunnel), in metres, each the bill's lines of that kind
	// added up (estimate.Construction.ByKind): every kind given, 0 where the plan builds none.
	// Its trench and bore add up to NewTrenchM.
	NewConstructionM map[string]float64 `json:"new_construction_m"`
	DiverseLinks     int                `json:"diverse_links"`   // links with two disjoint feasible legs
	DiverseShort     int                `json:"diverse_missing"` // links that asked for a diverse route and did not get one
	// DiverseSinglePoint counts, of DiverseLinks, those whose two routes still share a single
	// point of failure (the only entrance of a building at either end, a junction where their
	// ducts cross with no structure): reason_code SPOF on the diverse leg
	// (routing.CodeSharedPt). The terminal and the report print it beside DiverseLinks.
	DiverseSinglePoint int `json:"diverse_single_point"`
	// DiverseOffCrossing counts, of DiverseLinks, those whose legs are kept off a junction
	// where ducts cross with no structure that a cheaper pair would share, and
	// DiverseOffCrossingCents what that costs, all of them together, by the optimizer's
	// objective (routing.Routed.CrossingAvoidedCents: the plan against the plan with each of
	// them on its cheaper pair; the legs' own figures, routing.Leg.CrossingAvoidedCents, each
	// hold the rest of the plan fixed and need not add up to it): part of ObjectiveCents the
	// lower bound, which does not know such places, cannot see.
	DiverseOffCrossing      int   `json:"diverse_off_crossing"`
	DiverseOffCrossingCents int64 `json:"diverse_off_crossing_cents"`
	// CrossingLegs counts the feasible legs whose route passes through a building (in at one
	// entrance, out at another); TurnHandholes the junctions, each once, where a feasible
	// leg turns between pathways at a handhole the plan adds for that alone (one also for new
	// pathway joining or a lateral tapping is counted under those: routing.Handhole.Purpose).
	CrossingLegs  int `json:"crossing_legs"`
	TurnHandholes int `json:"turn_handholes"`
	// TurnsInOtherHandholes counts the junctions, each once, where a feasible leg turns
	// between pathways (routing.Leg.Turns, links.csv's turns) in a handhole the plan adds for
	// new pathway joining or a lateral tapping there, so counted under that purpose and not
	// among TurnHandholes (routing.Handhole.Purpose). Not in summary.json: the terminal prints
	// it beside TurnHandholes.
	TurnsInOtherHandholes int `json:"-"`
	// RunHandholes counts the handholes placed along new construction (design
	// handhole_spacing_m and pull_bend_deg), and Entrances the building entrances the plan
	// uses, each priced when the book prices building_entrance_each.
	RunHandholes int `json:"run_handholes"`
	// JoinHandholes and TapHandholes count the junctions, each once, where the plan adds a
	// handhole because new pathway joins the network there, or a counted lateral taps a duct
	// (routing.Handhole.Purpose; a junction is counted under one purpose only).
	// HandholesToBuild is every handhole the plan adds: TurnHandholes + JoinHandholes +
	// TapHandholes + RunHandholes + AddedPullPoints, the bill's handhole lines added up.
	JoinHandholes    int `json:"join_handholes"`
	TapHandholes     int `json:"tap_handholes"`
	HandholesToBuild int `json:"handholes_to_build"`
	// SplicePointsToBuild counts the splice points to build (estimate.Estimate.SplicePoints:
	// mid-span joins no structure within a reel's reach takes, one a place), billed on a line of
	// their own, not among HandholesToBuild; most are dug as handholes, one on an aerial span's
	// strand is a closure there. The terminal prints it beside the handholes, and the cautions'
	// handholes to set are HandholesToBuild and the dug ones (review 15 F6).
	SplicePointsToBuild int `json:"splice_points_to_build"`
	Entrances           int `json:"entrances_used"`
	// AddedDuctM is the duct laid new, in metres: in opened duct spans, in counted laterals and
	// beside full ducts (estimate.Construction.AddedDuctM), as the bill's added-duct line.
	AddedDuctM float64 `json:"added_duct_m"`
	// CablesPerDuct is the design's count of pulls a duct (design.cables_per_duct; 0: the
	// fill alone); CountLaidDuctM, CountLaidTrenchM and CountLaidCents the duct, the trench
	// or bore beside existing banks and their price laid only for that count, which the fill
	// alone would not need on these routes (estimate.Construction.ForCount; CountText).
	CablesPerDuct    int     `json:"cables_per_duct"`
	CountLaidDuctM   float64 `json:"count_laid_duct_m"`
	CountLaidTrenchM float64 `json:"count_laid_trench_m"`
	CountLaidCents   int64   `json:"count_laid_cents"`
	// CountLaidSpans are the ids of the spans where that work is laid (CountSpans); absent
	// when none.
	CountLaidSpans []string `json:"count_laid_spans,omitempty"`
	// WorstMarginDB is the smallest loss margin of any feasible fibre leg; null when none.
	WorstMarginDB *float64       `json:"worst_margin_db"`
	MediaMix      map[string]int `json:"media_mix"` // feasible legs per medium
	Currency      string         `json:"currency,omitempty"`
	// DemoPrices is DemoPricesWarning when the embedded demo price book priced the plan
	// (the plan named no prices: file and no --prices was given); absent otherwise.
	DemoPrices string  `json:"demo_prices_warning,omitempty"`
	CableM     float64 `json:"cable_m"` // cable bought, every cable of every feasible leg, waste included

	// TotalCents is the bill of materials' grand total: every line, contingency, overhead
	// and tax.
	TotalCents int64 `json:"total_cents"`
	// BudgetCents is the plan's budget; nil (null) when the plan sets none (budget absent
	// or 0). OverBudgetCents is total minus budget, positive over and negative under, and
	// OverBudgetPct the same in percent of the budget (one decimal); both nil without a
	// budget.
	BudgetCents     *int64   `json:"budget_cents"`
	OverBudgetCents *int64   `json:"over_budget_cents"`
	OverBudgetPct   *float64 `json:"over_budget_pct"`
	// BudgetFeasibleOnly says the budget check covers the feasible legs only: the plan has a
	// budget and infeasible legs, which the total does not price (BudgetScope says so in
	// words); absent otherwise.
	BudgetFeasibleOnly bool `json:"budget_feasible_legs_only,omitempty"`
	// NoNewTrench, for a plan that may build no new trench (design.allow_new_trench: false),
	// says what civil work it still does (NoNewTrenchNote); absent when new trench is allowed.
	NoNewTrench string `json:"no_new_trench,omitempty"`
	// ModelCents is the legs' costs summed (each leg's bill items priced one by one, its
	// share of new trench, added duct, handholes and the building entrances it uses; no
	// building panels or enclosures, no markups): the
	// cost model the routes were chosen by (README, "One cost model"), not a price.
	ModelCents int64 `json:"model_cents"`
	// ObjectiveCents is what the optimizer minimised for these routes (route.Result
	// .ObjectiveCents); LowerBoundCents is its proved lower bound over every plan serving the
	// same legs, and GapPct = 100 × (ObjectiveCents − LowerBoundCents) / LowerBoundCents, in
	// percent (BoundGap): no plan of these legs costs less than the bound, so a better plan
	// saves at most that share. Both null with the length objective (no bound is computed).
	ObjectiveCents   int64            `json:"objective_cents"`
	LowerBoundCents  *int64           `json:"lower_bound_cents"`
	GapPct           *float64         `json:"gap_pct"`
	CostByCategory   map[string]int64 `json:"cost_by_category_cents"` // BOM subtotals: material, labour, construction, optics
	SubtotalCents    int64            `json:"subtotal_cents"`
	ContingencyCents int64            `json:"contingency_cents"`
	OverheadCents    int64            `json:"overhead_cents"`
	TaxCents         int64            `json:"tax_cents"`
	CostDrivers      []CostDriver     `json:"cost_drivers"` // the five largest BOM lines

	PullSections    int `json:"pull_sections"`
	AddedPullPoints int `json:"added_pull_points"`
	PullsOverRating int `json:"pulls_over_rating"`
	MidSpanSplices  int `json:"mid_span_splices"` // reel joins over all cables

	WarningCount int `json:"warning_count"`
	// WarningCounts splits WarningCount by source: network (the campus and its noding),
	// install (pulling, duct fill, bends), budget, and plan (the rest: the plan's own, such as
	// a building it cannot serve or the price book it runs on, and routing's), so that they add
	// up to WarningCount (verify 18 V6).
	WarningCounts map[string]int `json:"warning_counts"`
	Warnings      []string       `json:"warnings"`
	// Notes are the plan's own notes and what of its entries was left out, and why
	// (route.Result.Notes).
	Notes []string `json:"notes,omitempty"`
	// NotPriced lists the keys of the prices the book leaves out that the bill needs
	// (media.BOM.NotPricedKeys): their lines have a quantity and no price, and the total
	// leaves them out (see NotPricedNote); absent when every line is priced.
	NotPriced []string `json:"not_priced,omitempty"`
	// StartedFrom names the plan folder whose routes the optimizer began from (route.Result
	// .StartedFrom: `plan --start-from`, a sweep's base scenario); absent for a plan solved
	// from scratch.
	StartedFrom string `json:"started_from,omitempty"`
	// Cautions are the safety cautions the plan's work calls for (route.Result.Cautions, the
	// one list the report's safety section, bom.xlsx's safety sheet and the terminal's
	// "safety:" line show): what each is and what in this plan calls for it; empty when none.
	// PlanningAid is route.PlanningAid: the output is a planning aid, and the local codes and
	// the authority having jurisdiction prevail.
	Cautions    []SummaryCaution `json:"cautions"`
	PlanningAid string           `json:"planning_aid"`
}

// SummaryCaution is one safety caution in summary.json: its id (route.Caution*), title, what
// in this plan calls for it (lengths in metres), and its source. What to do is in the
// report's safety section and bom.xlsx's safety sheet.
type SummaryCaution struct {
	ID     string `json:"id"`
	Title  string `json:"title"`
	Where  string `json:"where"`
	Source string `json:"source"`
}

// HasBill reports whether the plan the summary describes has a bill of materials (then
// cost_by_category_cents is an object, possibly empty; without one it is null).
func (s Summary) HasBill() bool { return s.CostByCategory != nil }

// CostDriver is one of the largest lines of the bill of materials.
type CostDriver struct {
	Category string  `json:"category"`
	Item     string  `json:"item"` // in metres: summary.json is for programs (ItemText for people)
	Cents    int64   `json:"cents"`
	Pct      float64 `json:"pct_of_subtotal"`
	line     media.BOMLine
}

// ItemText is the driver's item for a person, a labour line's work and rate written by
// length (a number of metres with its unit, in the output's units); Item for a driver not
// made by Summarize.
func (d CostDriver) ItemText(length func(m float64) string) string {
	if d.line.Item == "" {
		return d.Item
	}
	return d.line.Describe(length)
}

// newWorkM is the plan's new civil work in metres (Construction.NewM), 0 without an estimate.
func newWorkM(e *estimate.Estimate) float64 {
	if e == nil {
		return 0
	}
	return e.Construction.NewM
}

// Totals are a plan's length totals, unrounded: the route of its feasible legs, the cable
// bought for every leg (waste included: the pieces the schedule cuts, cableCut, whole metres
// that add up to the bill's cable lines) and the new civil work (Construction.NewM).
// Summarize rounds them to 0.1 m for summary.json; the outputs for people show the route and
// new work converted and then rounded (Units.Rounded), so that a total in feet is the metres'
// own, and the cable bought as cableCut in their unit, the pieces as written added up.
type Totals struct{ CableM, NewM float64 }

// NewWorkParts is what the new trench figure (estimate.Construction.NewM) holds besides
// trench, with lengths written by length: "155.0 m of it bored; 45.0 m of it building
// laterals", "" when neither. The one text of it the terminal and the report print, so the
// report's summary no longer calls bored metres new trench alone (tester 11's finding 13).
func NewWorkParts(c estimate.Construction, length func(m float64) string) string {
	var of []string
	if c.BoreM > 0 {
		of = append(of, length(c.BoreM)+" of it bored")
	}
	if c.LateralM > 0 {
		of = append(of, length(c.LateralM)+" of it building laterals")
	}
	return strings.Join(of, "; ")
}

// kindNames are the words for people of each kind of new construction (estimate.NewKinds).
var kindNames = map[string]string{geo.MethodTrench: "open-cut trench", geo.MethodBore: "directional bore",
	geo.TypeAerial: "pole line", geo.TypeTray: "cable tray", geo.TypeTunnel: "utility tunnel"}

// KindName is the words for people of a kind of new construction (estimate.NewKinds):
// "open-cut trench", "directional bore", "pole line", "cable tray", "utility tunnel" (open-cut:
// beside "new trench", which counts the bore too, review 19 F7).
func KindName(kind string) string {
	if n, ok := kindNames[kind]; ok {
		return n
	}
	return kind
}

// NewConstructionText is the new construction by kind (estimate.Construction.ByKind) that
// the plan builds, in the order of estimate.NewKinds, with lengths written by length:
// "open-cut trench 156.5 m, directional bore 20.0 m, pole line 591.2 m", "" when none. The one text
// of it the terminal and the report print.
func NewConstructionText(byKind []estimate.KindM, length func(m float64) string) string {
	var out []string
	for _, k := range byKind {
		if k.LengthM > 0 {
			out = append(out, KindName(k.Kind)+" "+length(k.LengthM))
		}
	}
	return strings.Join(out, ", ")
}

// newConstructionM is summary.json's new_construction_m: every kind of estimate.NewKinds,
// its metres of byKind (0 where none, and for every kind without an estimate).
func newConstructionM(e *estimate.Estimate) map[string]float64 {
	out := make(map[string]float64, len(estimate.NewKinds))
	for _, k := range estimate.NewKinds {
		out[k] = 0
	}
	if e != nil {
		for _, k := range e.Construction.ByKind {
			out[k.Kind] = k.LengthM
		}
	}
	return out
}

// TotalsOf adds up the totals of r.
func TotalsOf(r *route.Result) Totals {
	return Totals{NewM: newWorkM(r.Estimate), CableM: cutOf(WriteOptions{}, r).all()}
}

// RouteListed is the route of the feasible legs in the length unit of u, as every output
// prints it: the sum of each leg's route as links.csv lists it (u.Rounded to 0.1), so that the
// rows add up to the total printed beside them. Rounding the sum of the exact lengths instead
// gave 28,096.7 m over rows adding up to 28,096.8 m (tester 14 F14).
func RouteListed(u Units, r *route.Result) float64 {
	var dm int64 // tenths of the unit
	for _, n := range routeListedDM(u, r) {
		dm += n
	}
	return float64(dm) / 10
}

// RouteListedBy is RouteListed of the feasible legs of each medium, the report's "Links by
// medium" rows, which thus add up to the total route printed above them (tester 15 F8: the
// rows summed the exact lengths, 27,619.9 m under a total of 27,620.0 m).
func RouteListedBy(u Units, r *route.Result) map[string]float64 {
	out := map[string]float64{}
	for m, dm := range routeListedDM(u, r) {
		out[m] = float64(dm) / 10
	}
	return out
}

// routeListedDM is the one rule behind RouteListed and RouteListedBy: per medium, the tenths
// of the unit of each feasible leg's route as links.csv lists it, added up.
func routeListedDM(u Units, r *route.Result) map[string]int64 {
	dm := map[string]int64{}
	for _, l := range r.Legs {
		if l.Feasible {
			dm[l.Medium] += int64(math.Round(u.Rounded(l.RouteM, 1) * 10))
		}
	}
	return dm
}

// Summarize digests the result.
func Summarize(r *route.Result) Summary {
	tot := TotalsOf(r)
	s := Summary{Format: SummaryFormat, Scenario: r.Plan.Name, Hub: r.Hub, Buildings: len(r.Site.Campus.Buildings),
		Links: len(r.Links), Legs: len(r.Legs), Warnings: append([]string{}, r.Warnings...), Notes: r.Notes,
		MediaMix: map[string]int{}, Currency: r.Currency, NewTrenchM: round1(tot.NewM),
		NewConstructionM: newConstructionM(r.Estimate), CablesPerDuct: r.Plan.Design.CablesPerDuct,
		StartedFrom: r.StartedFrom, Cautions: []SummaryCaution{}, PlanningAid: route.PlanningAid}
	for _, c := range r.Cautions {
		s.Cautions = append(s.Cautions, SummaryCaution{ID: c.ID, Title: c.Title, Where: c.WhereIn(estimate.MetresText), Source: c.Source})
	}
	if DemoPrices(r) {
		s.DemoPrices = DemoPricesWarning
	}
	feasibleLegs := map[string]int{}
	sharedPoint := map[string]bool{} // links whose diverse leg shares a single point of failure
	for _, l := range r.Legs {
		s.ModelCents += l.Cost.TotalCents()
		s.MidSpanSplices += l.Cable.Joins * len(l.Cable.Cables)
		if !l.Feasible {
			s.Infeasible++
			s.InfeasibleNames = append(s.InfeasibleNames, l.Label())
			continue
		}
		feasibleLegs[l.Link.ID]++
		if l.Name == routing.LegDiverse && l.ReasonCode == routing.CodeSharedPt {
			sharedPoint[l.Link.ID] = true
		}
		if l.CrossingAvoidedCents > 0 {
			s.DiverseOffCrossing++
		}
		if len(l.Crosses) > 0 {
			s.CrossingLegs++
		}
		if l.Medium != "" {
			s.MediaMix[l.Medium]++
		}
		if _, ok := l.WorstLoss(); ok && (s.WorstMarginDB == nil || l.WorstMarginDB < *s.WorstMarginDB) {
			m := round2(l.WorstMarginDB)
			s.WorstMarginDB = &m
		}
	}
	if r.Estimate != nil {
		s.TurnHandholes = len(r.Estimate.Construction.TurnJunctions) // the bill's count, each once
		turn, other := map[string]bool{}, map[string]bool{}
		for _, j := range r.Estimate.Construction.TurnJunctions {
			turn[j] = true
		}
		for _, l := range r.Legs {
			for _, j := range l.Turns {
				if l.Feasible && !turn[j] {
					other[j] = true
				}
			}
		}
		s.TurnsInOtherHandholes = len(other)
		s.RunHandholes = len(r.Estimate.Construction.RunHandholes)
		s.JoinHandholes = len(r.Estimate.Construction.NewJunctions)
		s.TapHandholes = len(r.Estimate.Construction.TapJunctions)
		s.HandholesToBuild = s.TurnHandholes + s.JoinHandholes + s.TapHandholes + s.RunHandholes + r.Estimate.AddedPullPoints
		s.SplicePointsToBuild = len(r.Estimate.SplicePoints)
		s.Entrances = len(r.Estimate.Construction.Entrances)
		s.AddedDuctM = round1(r.Estimate.Construction.AddedDuctM)
		fc := r.Estimate.Construction.ForCount
		s.CountLaidDuctM, s.CountLaidTrenchM, s.CountLaidCents = round1(fc.DuctM), round1(fc.TrenchM), fc.Cents
		s.CountLaidSpans = CountSpans(fc)
	}
	s.ObjectiveCents = r.ObjectiveCents
	s.LowerBoundCents, s.GapPct = BoundGap(r.ObjectiveCents, r.LowerBoundCents)
	s.DiverseOffCrossingCents = r.CrossingAvoidedCents
	s.ModelCents += r.ExtraCents
	s.TotalCents = s.ModelCents
	s.WarningCounts = map[string]int{"network": len(r.Site.Net.Warnings)}
	if e := r.Estimate; e != nil && e.BOM != nil {
		b := e.BOM
		s.TotalCents, s.SubtotalCents = b.TotalCents, b.SubtotalCents
		s.ContingencyCents, s.OverheadCents, s.TaxCents = b.ContingencyCents, b.OverheadCents, b.TaxCents
		s.CostByCategory = map[string]int64{}
		for _, c := range b.Subtotal {
			s.CostByCategory[c.Category] = c.Cents
		}
		for _, l := range b.Largest(5) {
			d := CostDriver{Category: l.Category, Item: l.Describe(nil), Cents: l.ExtendedCents, line: l}
			if b.SubtotalCents > 0 {
				d.Pct = round1(100 * float64(l.ExtendedCents) / float64(b.SubtotalCents))
			}
			s.CostDrivers = append(s.CostDrivers, d)
		}
		s.PullSections, s.AddedPullPoints = len(e.Pulls), e.AddedPullPoints
		for _, p := range e.Pulls {
			if !p.WithinRating {
				s.PullsOverRating++
			}
		}
		s.NotPriced = b.NotPricedKeys()
		s.WarningCounts["install"] = len(e.Warnings)
		s.WarningCounts["budget"] = 0
		if e.BudgetWarning != "" {
			s.WarningCounts["budget"] = 1
		}
	}
	s.CableM = round1(tot.CableM)
	for _, l := range r.Links {
		if l.Diverse {
			if feasibleLegs[l.ID] == 2 {
				s.DiverseLinks++
				if sharedPoint[l.ID] {
					s.DiverseSinglePoint++
				}
			} else {
				s.DiverseShort++
			}
		}
	}
	if budget := int64(r.Plan.Budget); budget > 0 { // 0 is the plan's "no budget"
		over := s.TotalCents - budget
		pct := round1(100 * float64(over) / float64(budget))
		s.BudgetCents, s.OverBudgetCents, s.OverBudgetPct = &budget, &over, &pct
		s.BudgetFeasibleOnly = s.Infeasible > 0
	}
	if !r.Plan.Design.AllowNewTrench {
		s.NoNewTrench = NoNewTrenchNote(s)
	}
	s.TotalRouteM = RouteListed(UnitsOf(WriteOptions{}), r)
	s.WarningCount = len(s.Warnings)
	s.WarningCounts["plan"] = s.WarningCount
	for k, n := range s.WarningCounts {
		if k != "plan" {
			s.WarningCounts["plan"] -= n
		}
	}
	return s
}

// BoundGap returns the lower bound and the gap 100 × (objective − bound) / bound in percent,
// rounded to four decimals (a fraction to six), as summary.json writes them: both nil when
// there is no bound (bound < 0), the gap nil when the bound is 0.
func BoundGap(objectiveCents, boundCents int64) (bound *int64, gapPct *float64) {
	if boundCents < 0 {
		return nil, nil
	}
	b := boundCents
	if b == 0 {
		return &b, nil
	}
	g := math.Round(1e6*float64(objectiveCents-b)/float64(b)) / 1e4
	return &b, &g
}

func summaryJSON(w io.Writer, r *route.Result) error {
	b, err := json.MarshalIndent(Summarize(r), "", "  ")
	if err != nil {
		return fmt.Errorf("summary: %w", err)
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// wideGapPct is the gap, in percent, above which the terminal says what a wide gap means:
// the bound's dual ascent is capped on large campuses (route/optimize, lowerbound.go), so
// there the bound is usually the weak side (the generated 1,000- and 5,000-building campuses
// give 68 % and 33 %).
const wideGapPct = 10.0

// PctText formats a percentage for people, with two decimals and no sign of the unit
// ("4.42"): the gap to the bound on the terminal (GapText), in report.html and in compare.md.
func PctText(pct float64) string { return strconv.FormatFloat(pct, 'f', 2, 64) }

// GapText formats a gap in percent (summary.json's gap_pct) with its unit, "4.42 %"; "—"
// for none (a bound of 0).
func GapText(gapPct *float64) string {
	if gapPct == nil {
		return "—"
	}
	return PctText(*gapPct) + " %"
}

// PrintSummary writes a short human summary of the result: links and legs, media, cable
// bought by construction, new construction, pulling, and the total against the budget,
// lengths and forces in the units of opt.
func PrintSummary(w io.Writer, r *route.Result, opt WriteOptions) error {
	s := Summarize(r)
	u := UnitsOf(opt)
	length := func(m float64) string { return LengthText(opt, m) }
	t := escape.Terminal // ids and names from the input, each within a line
	fmt.Fprintf(w, "plan %q: hub %s, %s, %s, %s of route\n", s.Scenario, t(s.Hub), Counted(s.Links, "link", "links"), Counted(s.Legs, "leg", "legs"), strconv.FormatFloat(RouteListed(u, r), 'f', 1, 64)+" "+u.Length)
	for _, n := range s.Notes {
		fmt.Fprintf(w, "note: %s\n", t(n))
	}
	if s.Infeasible > 0 {
		fmt.Fprintf(w, "%s infeasible:\n%s", Counted(s.Infeasible, "leg", "legs"), route.InfeasibleList(legsInUnits(opt, r.InfeasibleLegs())))
	}
	for _, sh := range r.Shown { // as written: the campus's figures in its keys' units
		fmt.Fprintf(w, "warning: %s\n", t(sh))
	}
	if len(s.MediaMix) > 0 {
		links := map[string]map[string]bool{}
		for _, l := range r.Legs {
			if l.Feasible {
				if links[l.Medium] == nil {
					links[l.Medium] = map[string]bool{}
				}
				links[l.Medium][l.Link.ID] = true
			}
		}
		var mix []string
		for _, m := range slices.Sorted(maps.Keys(s.MediaMix)) {
			mix = append(mix, fmt.Sprintf("%s %d (%s)", t(m), len(links[m]), Counted(s.MediaMix[m], "leg", "legs")))
		}
		fmt.Fprintf(w, "links by medium: %s\n", strings.Join(mix, ", "))
	}
	// The cable the schedule cuts, as the bill buys it (cableCut), in the run's unit.
	cut := cutOf(opt, r)
	if byCons := cut.byConstruction(); len(byCons) > 0 {
		shown := func(x float64) string { return strconv.FormatFloat(x, 'f', 1, 64) + " " + u.Length }
		var parts []string
		for _, k := range slices.Sorted(maps.Keys(byCons)) {
			parts = append(parts, t(k)+" "+shown(byCons[k]))
		}
		fmt.Fprintf(w, "cable bought: %s (%s in all, %s)\n", strings.Join(parts, ", "), shown(cut.all()), Counted(s.MidSpanSplices, "mid-span splice", "mid-span splices"))
	}
	if line := diverseLine(s); line != "" {
		fmt.Fprintln(w, line)
	}
	if more := s.TurnsInOtherHandholes; s.CrossingLegs > 0 || s.TurnHandholes > 0 || more > 0 {
		also := ""
		switch {
		case more == 1:
			also = "; 1 more turn is in a handhole added where new pathway joins or a lateral taps"
		case more > 1:
			also = fmt.Sprintf("; %d more turns are in handholes added where new pathway joins or a lateral taps", more)
		}
		fmt.Fprintf(w, "legs through a building: %d; handholes to add where a route turns between pathways: %d%s (see links.csv)\n",
			s.CrossingLegs, s.TurnHandholes, also)
	}
	if s.LowerBoundCents != nil {
		countToo := "" // design.cables_per_duct 0: fill alone
		if s.CablesPerDuct > 0 {
			countToo = " and for the count of pulls a duct"
		}
		closed := ""
		switch {
		case s.GapPct != nil && *s.GapPct <= 1e-7:
			closed = " (proved optimal)"
		case s.GapPct != nil && *s.GapPct > wideGapPct:
			crossing := ""
			if s.DiverseOffCrossing > 0 {
				crossing = ", nor the junctions diverse legs are kept off (" + s.moneyText(s.DiverseOffCrossingCents) + " above)"
			}
			closed = " (no plan of these legs costs less than the bound; a gap this wide usually means a weak bound rather than poor routes: the bound leaves out duct capacity, so the ducts and trench added for fill" + countToo + " are not in it" + crossing + ")"
		}
		fmt.Fprintf(w, "optimizer: routes %s by the optimizer's objective, proved lower bound %s, gap %s%s\n",
			s.moneyText(s.ObjectiveCents), s.moneyText(*s.LowerBoundCents), GapText(s.GapPct), closed)
	}
	e := r.Estimate
	if e == nil || e.BOM == nil {
		if line := cautionLine(r, false); line != "" {
			fmt.Fprintln(w, line)
		}
		if s.WarningCount > 0 {
			fmt.Fprintf(w, "%s (see summary.json)\n", Counted(s.WarningCount, "warning", "warnings"))
		}
		return nil
	}
	c := e.Construction
	bored := ""
	if of := NewWorkParts(c, length); of != "" {
		bored = " (" + of + ")"
	}
	taps := ""
	if len(c.TapJunctions) > 0 {
		taps = fmt.Sprintf(", %d where laterals tap a duct or a pole line", len(c.TapJunctions))
	}
	turns := ""
	if s.TurnHandholes > 0 {
		turns = fmt.Sprintf(", with the %d where routes turn", s.TurnHandholes)
	}
	// The splice points to build (Summary.SplicePointsToBuild) are billed on a line of
	// their own, not among the handholes, though most are dug as handholes (not a closure on an
	// aerial strand): said beside them, so that a reader can add the terminal's handholes to
	// the cautions' handholes to set (tester 11's finding 1).
	splices := ""
	if n := s.SplicePointsToBuild; n > 0 {
		splices = "; and " + Counted(n, "splice point", "splice points") + " to build"
	}
	if kinds := NewConstructionText(c.ByKind, length); kinds != "" {
		fmt.Fprintf(w, "new construction by kind: %s (the bill's lines)\n", kinds)
	}
	fmt.Fprintf(w, "construction: new trench %s%s, added duct %s, %s where new pathway joins, %d along new construction%s, %d for added pull points (%s to build in all%s%s); %s used\n",
		length(c.NewM), bored, length(c.AddedDuctM), Counted(s.JoinHandholes, "handhole", "handholes"), s.RunHandholes, taps, e.AddedPullPoints,
		Counted(s.HandholesToBuild, "handhole", "handholes"), turns, splices, Counted(len(c.Entrances), "building entrance", "building entrances"))
	if s.NoNewTrench != "" {
		fmt.Fprintln(w, s.NoNewTrench)
	}
	if len(e.Pulls) > 0 {
		hi := e.Pulls[0]
		for _, p := range e.Pulls {
			if p.TensionN/p.RatedN > hi.TensionN/hi.RatedN {
				hi = p
			}
		}
		// The pull nearest its cable's rating, not the largest tension: a share of the rating,
		// said as such (tester 8 finding 17), with the tension and rating it is made of.
		tn, rated := u.N(hi.TensionN), u.N(hi.RatedN)
		fmt.Fprintf(w, "pulling: %s, %d over rating; highest share of rating %.0f %%: %.1f %s of %.1f %s rated (%s %s, from %s to %s)\n",
			Counted(s.PullSections, "pull section", "pull sections"), s.PullsOverRating, 100*hi.TensionN/hi.RatedN, tn, u.Force, rated, u.Force,
			t(r.Legs[hi.Leg].Link.ID), t(r.Legs[hi.Leg].Name), t(PointText(opt, hi.From)), t(PointText(opt, hi.To)))
	}
	if line := fillLine(e.Fill); line != "" {
		fmt.Fprintln(w, line)
	}
	if fc := c.ForCount; s.CablesPerDuct > 0 && (fc.DuctM > 0 || fc.TrenchM > 0 || fc.Cents > 0) {
		// InUnits: the stretches it names by their metres (review 22 F3); its own lengths are
		// in the run's units already.
		fmt.Fprintln(w, t(InUnits(opt, CountText(fc, s.CablesPerDuct, length, func(c int64) string { return media.FormatCents(c) + " " + e.BOM.Currency }))))
	}
	b := e.BOM
	var cats []string
	for _, x := range b.Subtotal {
		cats = append(cats, x.Category+" "+media.FormatCents(x.Cents))
	}
	fmt.Fprintf(w, "total %s %s: %s, markups %s (%s)\n", media.FormatCents(b.TotalCents), t(b.Currency), strings.Join(cats, ", "),
		media.FormatCents(b.TotalCents-b.SubtotalCents), t(b.Label))
	if note := s.PricedNote(); note != "" {
		fmt.Fprintf(w, "warning: %s\n", note)
	}
	for _, np := range b.NotPriced(r.Engine.PriceBook().File) { // also among the warnings (estimate.Build)
		fmt.Fprintf(w, "warning: %s\n", t(np))
	}
	if s.BudgetCents != nil {
		word, over := "under", -*s.OverBudgetCents
		if *s.OverBudgetCents > 0 {
			word, over = "over", *s.OverBudgetCents
		}
		scope := ""
		if sc := s.BudgetScope(); sc != "" {
			scope = " " + sc
		}
		if s.NoLegPriced() {
			fmt.Fprintf(w, "budget %s %s: %s\n", media.FormatCents(*s.BudgetCents), t(b.Currency), s.BudgetScope())
		} else {
			fmt.Fprintf(w, "budget %s %s: %s by %s (%.1f %%)%s\n", media.FormatCents(*s.BudgetCents), t(b.Currency), word, media.FormatCents(over), math.Abs(*s.OverBudgetPct), scope)
		}
	}
	if line := cautionLine(r, true); line != "" {
		fmt.Fprintln(w, line)
	}
	if s.WarningCount > 0 {
		fmt.Fprintf(w, "%s (see summary.json)\n", Counted(s.WarningCount, "warning", "warnings"))
	}
	if s.DemoPrices != "" {
		fmt.Fprintf(w, "warning: %s\n", s.DemoPrices)
	}
	return nil
}

// cautionLine is the terminal's one line on the plan's safety cautions (route.Result.Cautions):
// their titles and where each is written out; "" when the plan calls for none. bom tells
// whether bom.xlsx, with its safety sheet, is written.
func cautionLine(r *route.Result, bom bool) string {
	if len(r.Cautions) == 0 {
		return ""
	}
	where := "report.html (Safety)"
	if bom {
		where += " and bom.xlsx (sheet " + SheetSafety + ")"
	}
	return fmt.Sprintf("safety: %s for this plan's work: %s; %s say what to do (local codes and the authority having jurisdiction prevail)", Counted(len(r.Cautions), "caution", "cautions"),
		strings.ToLower(strings.Join(route.CautionTitles(r.Cautions), ", ")), where)
}

// SafetyNote points a reader of the CSVs (the crew's cable schedule links.csv, the estimator's
// bom.csv) to the plan's safety cautions, which only the files for people and summary.json
// carry: how many, their titles and where they are written, with the planning aid's
// deference to the codes; "" when the plan calls for none. bom.csv gives it in a closing note
// row, so that a CSV reader still gets one table of the same columns (tester 13's finding H);
// links.csv gives each leg's own cautions by key instead (route.Result.LegCautions).
func SafetyNote(r *route.Result) string {
	if len(r.Cautions) == 0 {
		return ""
	}
	return fmt.Sprintf("safety: %s for this plan's work: %s; summary.json (cautions) and, where written, report.html (Safety) and bom.xlsx (sheet %s) say what to do; spanwright is a planning aid: local codes and the authority having jurisdiction prevail",
		Counted(len(r.Cautions), "caution", "cautions"), strings.ToLower(strings.Join(route.CautionTitles(r.Cautions), ", ")), SheetSafety)
}

// moneyText is cents in currency units with the plan's currency after them, for the
// terminal ("163495.99 USD"; the amount alone when the plan has none).
func (s Summary) moneyText(cents int64) string {
	if s.Currency == "" {
		return media.FormatCents(cents)
	}
	return media.FormatCents(cents) + " " + escape.Terminal(s.Currency)
}

// diverseLine is the terminal's line on the links that asked for a diverse route: how many
// got two routes, how many of those still share a single point of failure, how many lack
// one; "" when no link asked.
func diverseLine(s Summary) string {
	if s.DiverseLinks+s.DiverseShort == 0 {
		return ""
	}
	line := fmt.Sprintf("diverse links: %d with two routes", s.DiverseLinks)
	if s.DiverseSinglePoint > 0 {
		line += fmt.Sprintf(", %d of them sharing a single point of failure (reason_code %s in links.csv)", s.DiverseSinglePoint, routing.CodeSharedPt)
	}
	if s.DiverseOffCrossing > 0 {
		line += fmt.Sprintf(", %d kept off a junction where ducts cross with no structure that a cheaper pair would share (%s more by the optimizer's objective)",
			s.DiverseOffCrossing, s.moneyText(s.DiverseOffCrossingCents))
	}
	if s.DiverseShort > 0 {
		line += fmt.Sprintf("; %d lacking a diverse route", s.DiverseShort)
	}
	return line
}

// shownFillSpans is the most spans the terminal's duct fill line names.
const shownFillSpans = 5

// fillLine is the terminal's duct fill line: the ducts over their NFPA 70 Chapter 9 fill
// limit or at risk of a jam, and the cables that fit no duct of their span, with the spans
// they are on; "" when every duct is OK.
func fillLine(fill []estimate.DuctFill) string {
	ducts, cables := 0, 0
	var spans []string
	for _, f := range fill {
		if f.OK {
			continue
		}
		if f.Unplaced {
			cables += len(f.CablesODMM)
		} else {
			ducts++
		}
		if len(spans) == 0 || spans[len(spans)-1] != f.Span {
			spans = append(spans, f.Span)
		}
	}
	if ducts == 0 && cables == 0 {
		return ""
	}
	var parts []string
	if ducts > 0 {
		parts = append(parts, Counted(ducts, "duct", "ducts")+" over the fill limit or at risk of a jam")
	}
	if cables > 0 {
		parts = append(parts, Counted(cables, "cable", "cables")+" in no duct")
	}
	slices.Sort(spans)
	spans = slices.Compact(spans)
	shown, more := input.Shown(spans, shownFillSpans)
	return fmt.Sprintf("duct fill: %s, on %s %s%s (see the duct fill sheet of bom.xlsx)",
		strings.Join(parts, ", "), Counted(len(spans), "span", "spans"), escape.TerminalList(shown), more)
}

// PricedNote says, when some legs are infeasible, that the plan's costs price only the
// feasible ones (an infeasible leg has no route, no medium and no bill lines), or, when every
// leg is, that no leg is priced; "" when every leg is feasible. The terminal and the report
// print it beside the total, bom.csv and bom.xlsx after it (PricedNoteOf).
func (s Summary) PricedNote() string {
	if s.Infeasible == 0 {
		return ""
	}
	if s.Infeasible == s.Legs {
		which := "the one leg is"
		if s.Legs != 1 {
			which = fmt.Sprintf("all %d legs are", s.Legs)
		}
		return "no leg is priced: " + which + " infeasible (no route or medium was found)"
	}
	return fmt.Sprintf("the total prices the %s of %d only; %s not priced (no route or medium was found)",
		Counted(s.Legs-s.Infeasible, "feasible leg", "feasible legs"), s.Legs, Counted(s.Infeasible, "infeasible leg is", "infeasible legs are"))
}

// BudgetScope qualifies the budget check of a plan with infeasible legs
// (BudgetFeasibleOnly): "for the 21 feasible legs of 31 only; 10 legs unpriced", since the
// total it compares prices those legs alone and serving the others costs more; "" otherwise.
// The terminal, the report and bom.xlsx's budget rows print it after the verdict (tester 12
// F4: "under by 56.4 %" for a plan leaving 10 of 31 legs unserved); with every leg infeasible
// (NoLegPriced) it is no verdict but says so, "no verdict: no leg is priced (all 31 legs
// infeasible)", and they print it in the verdict's place.
func (s Summary) BudgetScope() string {
	if !s.BudgetFeasibleOnly {
		return ""
	}
	if s.NoLegPriced() {
		return fmt.Sprintf("no verdict: no leg is priced (%s infeasible)", allLegs(s.Legs))
	}
	return fmt.Sprintf("for the %s of %d only; %s unpriced", Counted(s.Legs-s.Infeasible, "feasible leg", "feasible legs"), s.Legs,
		Counted(s.Infeasible, "infeasible leg", "infeasible legs"))
}

// NoLegPriced reports whether the plan has a budget and every leg infeasible: its total
// prices no leg, so the budget check gives no verdict (BudgetScope says so instead of "under
// by 99.6 %": review 17 F8).
func (s Summary) NoLegPriced() bool { return s.BudgetFeasibleOnly && s.Infeasible == s.Legs }

// allLegs is "the leg" or "all 31 legs".
func allLegs(n int) string {
	if n == 1 {
		return "the leg"
	}
	return fmt.Sprintf("all %d legs", n)
}

// NoNewTrenchNote says what a plan with design.allow_new_trench: false still builds, from
// the summary's handhole counts: no trench or bore but the counted laterals to buildings no
// pathway reaches, and the handholes set into existing duct banks, by purpose. A cable
// changes from one duct bank to another only in a structure (a duct bank is not opened to bend
// a cable from one conduit into another without one; common practice, no published source),
// so routes that turn where no structure stands still dig a handhole each (tester 12 F3:
// "no new trench" read as "nobody digs"). The terminal, the report and summary.json's
// no_new_trench print it.
func NoNewTrenchNote(s Summary) string {
	note := "no new trench or bore (design.allow_new_trench: false)"
	if s.NewTrenchM > 0 {
		note += " but the counted laterals to buildings no pathway reaches"
	}
	splices := ""
	if s.SplicePointsToBuild > 0 {
		// The splice points between reels are dug too (a handhole each, but a closure on an
		// aerial span's strand): review 17 F3.
		splices = "; and " + Counted(s.SplicePointsToBuild, "splice point", "splice points") + " to build between reels (a handhole each where underground)"
	}
	if s.HandholesToBuild == 0 {
		if splices != "" {
			return note + "; no handhole at a junction" + splices
		}
		return note + "; no handhole is built"
	}
	var why []string
	for _, p := range []struct {
		n    int
		what string
	}{
		{s.TurnHandholes, "where routes change pathway"},
		{s.TapHandholes, "where laterals tap a duct or a pole line"},
		{s.JoinHandholes, "where new pathway joins"},
		{s.RunHandholes, "along new construction"},
		{s.AddedPullPoints, "for added pull points"},
	} {
		if p.n > 0 {
			why = append(why, fmt.Sprintf("%d %s", p.n, p.what))
		}
	}
	turns := ""
	if s.TurnHandholes > 0 {
		turns = " (design.turn_handholes: false keeps routes to existing structures, which may leave legs without a route)"
	}
	return fmt.Sprintf("%s; %s still dug into existing pathways (%s): a cable changes duct bank only in a structure%s%s",
		note, Counted(s.HandholesToBuild, "handhole is", "handholes are"), strings.Join(why, ", "), turns, splices)
}

// NotPricedNote says, when the book leaves out prices the bill needs, that the total leaves
// their lines out, naming the keys; "" when every line is priced. The report prints it beside
// the total and a sweep's comparison in the scenario's note, where totals are ranked; the keys
// sorted, as the comparison's rank and pareto name them ("1 (without …)", sweep.Row.Exclusion;
// tester 9's finding 6: two orders in one row).
func (s Summary) NotPricedNote() string {
	if len(s.NotPriced) == 0 {
		return ""
	}
	return "not priced, left out of the total: " + strings.Join(slices.Sorted(slices.Values(s.NotPriced)), ", ") + " (see the warnings)"
}

// PricedNoteOf is r's PricedNote, counted from its legs without the rest of the summary.
func PricedNoteOf(r *route.Result) string {
	s := Summary{Legs: len(r.Legs)}
	for i := range r.Legs {
		if !r.Legs[i].Feasible {
			s.Infeasible++
		}
	}
	return s.PricedNote()
}

// DemoPricesWarning is the warning printed on the terminal, written in summary.json and shown
// in the report's header whenever the embedded demo price book priced a plan.
const DemoPricesWarning = "costs are from the invented demo price book built into spanwright: " +
	"not a quotation; name your own price book (prices: in the plan, or --prices; `spanwright starter` writes a template)"

// DemoPrices reports whether r was priced by the embedded demo price book: the book the
// media engine takes when a plan names none (media.NewEngine), known by its file name.
func DemoPrices(r *route.Result) bool {
	return r.Engine != nil && r.Engine.PriceBook().File == media.DefaultPricesFile
}

// LengthText writes a length for a person, with its unit: metres, or feet when imperial,
// with one decimal ("12.3 m", "40.4 ft").
func LengthText(opt WriteOptions, m float64) string {
	return ftOrM(opt, m, 1) + " " + UnitsOf(opt).Length
}

// PointText writes a pull point for a person, an added handhole's place on its span in the
// run's units (estimate.PullPoint.Text).
func PointText(opt WriteOptions, p estimate.PullPoint) string {
	return p.Text(func(m float64) string { return LengthText(opt, m) })
}

// ReelsText writes the lengths cut from a leg's reels (routing.CableTakeoff.ReelsM) for a
// person, in the run's length unit without it (the column names it), "; " between them.
func ReelsText(opt WriteOptions, reelsM []float64) string {
	out := make([]string, len(reelsM))
	for i, m := range reelsM {
		out[i] = ftOrM(opt, m, 1)
	}
	return strings.Join(out, "; ")
}

// SplicesText writes where a leg's mid-span splices go (routing.CableTakeoff.Splices) for a
// person, in travel order from the served building, "; " between them; "" without any.
func SplicesText(opt WriteOptions, splices []routing.SplicePoint) string {
	out := make([]string, len(splices))
	for i, p := range splices {
		out[i] = p.Text(func(m float64) string { return LengthText(opt, m) })
	}
	return strings.Join(out, "; ")
}

// PullUnits writes the figures of a pull's excesses (install.Excess) for a person: metres,
// newtons and N/m, or feet, pound-force and lbf/ft when imperial, with one decimal.
func PullUnits(opt WriteOptions) install.Units {
	if !opt.imperial() {
		return install.Units{}
	}
	u := UnitsOf(opt)
	one := func(v float64, unit string) string { return strconv.FormatFloat(v, 'f', 1, 64) + " " + unit }
	return install.Units{
		Length:   func(m float64) string { return LengthText(opt, m) },
		Force:    func(n float64) string { return one(u.N(n), u.Force) },
		Pressure: func(v float64) string { return one(u.NPerM(v), u.SWBP) },
	}
}

// ftOrM formats a length for an output edge: metres, or feet when imperial.
func ftOrM(opt WriteOptions, m float64, decimals int) string {
	return strconv.FormatFloat(UnitsOf(opt).Rounded(m, decimals), 'f', decimals, 64)
}

// CannotServe says, one clause each, what a check report finds a plan cannot serve: the
// buildings cut off from the hub, those reaching it only through a building routes may not
// cross or only over proposed pathways, and the diverse links with no second route (listed
// in the report itself). Nil when there is none.
func CannotServe(rep site.CheckReport) []string {
	var out []string
	var cut []string // cut off and served: a building no link serves is no problem of the plan
	for _, b := range rep.Unreachable {
		if !slices.Contains(rep.Unserved, b) {
			cut = append(cut, b)
		}
	}
	if len(cut) > 0 {
		out = append(out, fmt.Sprintf("%s cannot reach the hub %s: %s", Counted(len(cut), "building", "buildings"),
			escape.Terminal(rep.Hub), escape.TerminalList(cut)))
	}
	if len(rep.ThroughOnly) > 0 {
		out = append(out, fmt.Sprintf("%s the hub %s only through another building routes may not cross: %s",
			Counted(len(rep.ThroughOnly), "building reaches", "buildings reach"), escape.Terminal(rep.Hub), escape.TerminalList(rep.ThroughOnly)))
	}
	if len(rep.OnlyProposed) > 0 {
		out = append(out, fmt.Sprintf("%s the hub %s only over proposed pathways (design.allow_new_trench: false): %s",
			Counted(len(rep.OnlyProposed), "building reaches", "buildings reach"), escape.Terminal(rep.Hub), escape.TerminalList(rep.OnlyProposed)))
	}
	if len(rep.NoDiverse) > 0 {
		out = append(out, fmt.Sprintf("%s no second route, as plan would find, listed above",
			Counted(len(rep.NoDiverse), "diverse link has", "diverse links have")))
	}
	if len(rep.TurnsOnly) > 0 {
		out = append(out, fmt.Sprintf("%s no route without a turn at a junction without a structure (design.turn_handholes: false), listed above",
			Counted(len(rep.TurnsOnly), "link has", "links have")))
	}
	return out
}

// PrintCheck writes a check report as aligned text; lengths in metres, or feet when imperial
// (those inside the texts of cut-off buildings, near misses and warnings by InUnits).
func PrintCheck(w io.Writer, r site.CheckReport, opt WriteOptions) error {
	t := escape.Terminal // ids and names from the input, each within a line
	u := UnitsOf(opt)
	skipped := ""
	if len(r.Skipped) > 0 { // given a plan: buildings whose links it skips, not served
		shown, more := input.Shown(slices.Clone(r.Skipped), 6)
		for i := range shown {
			shown[i] = t(shown[i])
		}
		skipped = fmt.Sprintf(", skipped %d: %s%s", len(r.Skipped), strings.Join(shown, " "), more)
	}
	fmt.Fprintf(w, "buildings   %d (mc %d, ic %d, served %d%s)\n", r.Buildings, r.ByRole["mc"], r.ByRole["ic"], r.ByRole["served"], skipped)
	fmt.Fprintf(w, "structures  %d\n", r.Structures)
	fmt.Fprintf(w, "junctions   %d\n", r.Junctions)
	fmt.Fprintf(w, "spans       %d\n", r.Spans)
	fmt.Fprintln(w, piecesLine(r))
	fmt.Fprintln(w, "pathways:")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "  type\tstatus\tcount\tlength %s\t\n", u.Length)
	var total float64
	for _, p := range r.Pathways {
		fmt.Fprintf(tw, "  %s\t%s\t%d\t%.1f\t\n", t(p.Type), t(p.Status), p.Pathways, u.M(p.LengthM))
		total += p.LengthM
	}
	fmt.Fprintf(tw, "  all\t\t\t%.1f\t\n", u.M(total))
	if err := tw.Flush(); err != nil {
		return err
	}
	proposed := "" // the plan may not use proposed pathways: who reaches the hub only over them
	if len(r.OnlyProposed) > 0 {
		proposed = fmt.Sprintf("; %s it only over proposed pathways (below)", Counted(len(r.OnlyProposed), "building reaches", "buildings reach"))
	}
	switch {
	case r.Hub == "":
		fmt.Fprintln(w, "hub         none (no building has role mc and none was named)")
	case len(r.Unreachable) == 0 && len(r.ThroughOnly) == 0 && len(r.Served) == 0:
		fmt.Fprintf(w, "hub         %s: every building can reach it%s\n", t(r.Hub), proposed)
	case len(r.Unreachable) == 0 && len(r.ThroughOnly) == 0:
		fmt.Fprintf(w, "hub         %s: every building can reach its cross-connect in the plan; %s the hub only through another building (below)%s\n", t(r.Hub),
			Counted(len(r.Served), "building reaches", "buildings reach"), proposed)
	case len(r.Unreachable) == 0:
		fmt.Fprintf(w, "hub         %s: %s it only through another building (below); every other building can reach it%s\n", t(r.Hub),
			Counted(len(r.ThroughOnly), "building reaches", "buildings reach"), proposed)
	default:
		fmt.Fprintf(w, "hub         %s: %s cannot reach it: %s\n", t(r.Hub), Counted(len(r.Unreachable), "building", "buildings"), escape.TerminalList(r.Unreachable))
		for i, why := range r.CutOff {
			if slices.Contains(r.Unserved, r.Unreachable[i]) {
				why += "; no link of the plan serves it"
			}
			fmt.Fprintf(w, "  cut off: %s\n", t(InUnits(opt, why)))
		}
	}
	if len(r.ThroughOnly) > 0 {
		fmt.Fprintf(w, "through     %s the hub only through another building routes may not cross: %s\n",
			Counted(len(r.ThroughOnly), "building reaches", "buildings reach"), escape.TerminalList(r.ThroughOnly))
		for _, why := range r.Through {
			fmt.Fprintf(w, "  no route: %s\n", t(InUnits(opt, why)))
		}
	}
	if len(r.OnlyProposed) > 0 {
		fmt.Fprintf(w, "proposed    %s the hub only over proposed pathways, which the plan may not use (design.allow_new_trench: false): %s\n",
			Counted(len(r.OnlyProposed), "building reaches", "buildings reach"), escape.TerminalList(r.OnlyProposed))
	}
	if len(r.Served) > 0 {
		fmt.Fprintf(w, "through     %s the hub only through another building, and the plan serves it from a cross-connect it reaches: %s\n",
			Counted(len(r.Served), "building reaches", "buildings reach"), escape.TerminalList(r.Served))
	}
	if len(r.NoDiverse) > 0 {
		fmt.Fprintf(w, "diverse     %s no second route, however planned:\n", Counted(len(r.NoDiverse), "diverse link has", "diverse links have"))
		for _, why := range r.NoDiverse {
			fmt.Fprintf(w, "  %s\n", t(InUnits(opt, why)))
		}
	}
	if len(r.TurnsOnly) > 0 {
		fmt.Fprintf(w, "turns only  %s no route that keeps to existing structures where it changes pathway (design.turn_handholes: false), as plan would find:\n",
			Counted(len(r.TurnsOnly), "link has", "links have"))
		for i, why := range r.TurnsOnly {
			if i == turnsOnlyShown && len(r.TurnsOnly) > turnsOnlyShown+1 {
				fmt.Fprintf(w, "  and %d more (plan's links.csv gives each its reason)\n", len(r.TurnsOnly)-i)
				break
			}
			fmt.Fprintf(w, "  %s\n", t(InUnits(opt, why)))
		}
	}
	// The entrances, one line per building that has more than one or a declared one.
	var multi []string
	for i := 0; i < len(r.Entrances); {
		j := i
		var ids []string
		declared := false
		for ; j < len(r.Entrances) && r.Entrances[j].Building == r.Entrances[i].Building; j++ {
			ids = append(ids, r.Entrances[j].ID)
			declared = declared || r.Entrances[j].Via == geo.ViaEntrance
		}
		if j-i > 1 || declared {
			multi = append(multi, fmt.Sprintf("  %s: %s", t(r.Entrances[i].Building), escape.TerminalList(ids)))
		}
		i = j
	}
	fmt.Fprintf(w, "entrances   %d (%s with more than one, or declared ones)\n", len(r.Entrances), Counted(len(multi), "building", "buildings"))
	for _, m := range multi {
		fmt.Fprintln(w, m)
	}
	fmt.Fprintf(w, "turns       %s where a turn between pathways needs a structure built\n", Counted(len(r.Turns), "junction", "junctions"))
	for i, id := range r.Turns {
		if i == len(r.TurnPoints) {
			break
		}
		// Six decimals of a degree: about 0.1 m, enough to find the junction on a map.
		fmt.Fprintf(w, "  %s at %.6f, %.6f (longitude, latitude)\n", t(id), r.TurnPoints[i][0], r.TurnPoints[i][1])
	}
	fmt.Fprintf(w, "near misses %d\n", len(r.NearMisses))
	for _, m := range r.NearMisses {
		fmt.Fprintf(w, "  %s\n", t(InUnits(opt, m)))
	}
	fmt.Fprintf(w, "warnings    %d\n", len(r.Warnings))
	for _, m := range r.Warnings {
		if !slices.Contains(r.Slips, m) { // those as written: the campus's figures in its keys' units
			m = InUnits(opt, m)
		}
		fmt.Fprintf(w, "  warning: %s\n", t(m))
	}
	return nil
}

// ShownOffPiece is the most buildings off the hub's piece of the network that check's
// network line names; the hub line below it lists them all.
const ShownOffPiece = 5

// piecesLine is check's line on how many separate pieces of the pathway network hold
// buildings (site.CheckReport.Components) and, when the campus is in more than one, how many
// buildings cannot reach the hub's piece and the first ShownOffPiece of them.
func piecesLine(r site.CheckReport) string {
	const head = "network     "
	switch {
	case r.Components == 0:
		return head + "no pathway reaches a building"
	case r.Components == 1:
		return head + "in one piece: every pathway that reaches a building joins the others"
	}
	line := fmt.Sprintf("%sin %d separate pieces that each hold buildings", head, r.Components)
	if r.Hub == "" || len(r.Unreachable) == 0 {
		return line
	}
	ids, more := input.Shown(r.Unreachable, ShownOffPiece)
	return fmt.Sprintf("%s; %s off the hub's piece: %s%s", line, Counted(len(r.Unreachable), "building is", "buildings are"),
		escape.TerminalList(ids), more)
}

// Counted is input.Counted, the one way a count is written with its noun.
var Counted = input.Counted

// turnsOnlyShown is the most links check lists by name under "turns only" (review 18 F7: 142
// lines on a 200-building campus with design.turn_handholes: false); the count says the rest.
const turnsOnlyShown = 20
