package report

import (
	"bytes"
	"fmt"
	"html/template"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/route/escape"
	"spanwright/route/estimate"
	"spanwright/route/fileset"
	"spanwright/route/output"
	"spanwright/route/sweep"
)

// SweepFileName is the sweep report's file name in a sweep's output folder, beside compare.csv.
const SweepFileName = "compare.html"

// SweepOptions say how a sweep report is rendered.
type SweepOptions struct {
	Title string // e.g. the sweep file's name; "" gives a generic title
}

type sweepCell struct {
	Num  bool // in a numeric column: never wrapped
	Text string
	Sort string // the value the table sorts by: a number for numeric columns, "" for blank
	Link string // a relative link (the scenario's report), or ""
}

type sweepCol struct {
	Name string
	Num  bool
}

// Head is the column's name with a line-break opportunity after each dot, underscore and
// hyphen, so that a long override key (design.slack_loop_structure_m) wraps in a narrow
// printed column instead of widening the table past the page.
func (c sweepCol) Head() template.HTML {
	var p page
	for _, r := range c.Name {
		p.w(t(string(r)))
		if r == '.' || r == '_' || r == '-' {
			p.w("<wbr>")
		}
	}
	return p.html()
}

type sweepRow struct {
	Class string
	Cells []sweepCell
}

type plotPoint struct {
	X, Y   string
	Class  string
	Label  string // the scenario index for Pareto points, else ""
	LX, LY string
	Title  string
}

type tick struct {
	Pos, Text string
}

type scatter struct {
	W, H                   string
	Left, Right, Top, Bot  string
	Points                 []plotPoint
	XTicks, YTicks         []tick
	XLabel, YLabel         string
	NoFibreY               string // y of the "no fibre leg" band, "" when unused
	Empty                  bool
	LabelX, LabelY, AxisMY string
}

type sweepView struct {
	Title      string
	CSS        template.CSS
	Scenarios  int
	OK         int
	Infeasible int
	Failed     int
	Pareto     int
	Incomplete int // ok scenarios whose totals leave out items not priced (sweep.Row.Incomplete), ranked among the same exclusion
	// Apart and ApartOK are set when the ranked rows, and the ok rows, make more than one
	// ranked set (sweep.RankSets): only then is such a row ranked apart from others (tester 14
	// F10).
	Apart, ApartOK bool
	// InfeasibleRanked counts the scenarios with infeasible legs ranked among those leaving
	// the same legs unserved (sweep.Row.Apart).
	InfeasibleRanked int
	Currency         string
	Cols             []sweepCol
	Rows             []sweepRow
	Plot             scatter
	Cheapest         string
	DemoPrices       int // scenarios priced by the invented demo price book
	// Reports and Planned count the planned scenarios whose folder holds a report (a sweep
	// run with --full) and all planned ones: the page says where the cautions are read.
	Reports, Planned int
	// Unserved are the sets of legs scenarios leave unserved (sweep.UnservedSets), named once
	// below the table, as compare.md does: the rank and Pareto cells only count them.
	Unserved []unservedLine
}

// unservedLine is one set of unserved legs, with the scenarios that leave it.
type unservedLine struct{ IDs, Legs string }

// Sweep renders a sweep's comparison as one self-contained HTML page: the table of every
// scenario (its overrides, status, cost, budget, margin, trench, diverse routes, media,
// rank, Pareto flag), sortable by clicking a column head, and a cost-versus-margin scatter
// plot with the Pareto-optimal scenarios marked.
func Sweep(c *sweep.Comparison, opt SweepOptions) ([]byte, error) {
	v := sweepViewOf(c, opt)
	var b bytes.Buffer
	if err := templates().ExecuteTemplate(&b, "sweep", v); err != nil {
		return nil, fmt.Errorf("report: %w", err)
	}
	return escape.HTML(b.Bytes()), nil
}

// SweepFiles renders the sweep report as the output file SweepFileName; it suits
// sweep.Options.Compare and sweep.Merge.
func SweepFiles(opt SweepOptions) sweep.CompareFunc {
	return func(c *sweep.Comparison) ([]fileset.OutputFile, error) {
		data, err := Sweep(c, opt)
		if err != nil {
			return nil, err
		}
		return []fileset.OutputFile{{Name: SweepFileName, Data: data}}, nil
	}
}

func sweepViewOf(c *sweep.Comparison, opt SweepOptions) *sweepView {
	v := &sweepView{Title: "Sweep comparison", CSS: template.CSS(styleCSS), Scenarios: len(c.Rows), Currency: c.Currency}
	if opt.Title != "" {
		v.Title += ": " + opt.Title
	}
	cur := c.Currency
	if cur == "" {
		cur = "currency units"
	}
	lu := output.UnitsOf(output.WriteOptions{Units: c.Units})
	v.Cols = append(v.Cols, sweepCol{"#", true}, sweepCol{"scenario", false}, sweepCol{"case", false})
	for _, k := range c.Keys {
		v.Cols = append(v.Cols, sweepCol{k, false})
	}
	v.Cols = append(v.Cols,
		sweepCol{"status", false}, sweepCol{"total cost (" + cur + ")", true})
	// A total of the served legs only, beside the total cost it is not (blank in its row),
	// when some row has one (sweep.Row.ServedLegsTotal; tester 15 F7).
	served := slices.ContainsFunc(c.Rows, func(j sweep.Judged) bool { _, ok := j.ServedLegsTotal(); return ok })
	if served {
		v.Cols = append(v.Cols, sweepCol{"total of the served legs only (" + cur + ")", true})
	}
	v.Cols = append(v.Cols, sweepCol{"budget", true},
		sweepCol{"over budget", true}, sweepCol{"infeasible legs", true}, sweepCol{"worst margin (dB)", true},
		sweepCol{"new trench (" + lu.Length + ")", true})
	// The new construction by kind (sweep.Row.NewConstruction), as compare.csv has it.
	for _, k := range estimate.NewKinds {
		v.Cols = append(v.Cols, sweepCol{"new construction: " + output.KindName(k) + " (" + lu.Length + ")", true})
	}
	v.Cols = append(v.Cols, sweepCol{"diverse links", true}, sweepCol{"of them sharing a single point of failure", true}, sweepCol{"lacking diverse", true},
		sweepCol{"media (legs)", false}, sweepCol{"rank by cost", true}, sweepCol{"Pareto", false},
		sweepCol{"warnings", true}, sweepCol{"error", false},
		sweepCol{"search started from", false}, sweepCol{"handholes to build", true})
	// The bill's subtotals and markups, which add up to the total, as compare.csv has them.
	for _, cat := range sweep.SubtotalCategories() {
		v.Cols = append(v.Cols, sweepCol{cat + " (" + cur + ")", true})
	}
	for _, m := range sweep.Markups {
		v.Cols = append(v.Cols, sweepCol{m.Name + " (" + cur + ")", true})
	}
	v.Cols = append(v.Cols, sweepCol{"safety cautions", false})
	v.Apart, v.ApartOK = c.RankSets > 1, c.OKSets > 1
	var cheapest []string // the cheapest ok scenarios, every one of a tie (sweep.TiedText)
	var cheapestCents int64
	for i := range c.Rows {
		j := &c.Rows[i]
		switch j.Status {
		case sweep.StatusOK:
			v.OK++
			if j.Incomplete() {
				v.Incomplete++
			}
			if j.Cheapest(j.Rank) {
				cheapest = append(cheapest, fmt.Sprintf("#%d %s", j.Index, j.ID))
				cheapestCents = j.TotalCents
			}
		case sweep.StatusInfeasible:
			v.Infeasible++
			if j.Ranked() {
				v.InfeasibleRanked++
			}
		default:
			v.Failed++
		}
		if j.Pareto && !j.RankedApart() {
			v.Pareto++
		}
		if j.DemoPrices {
			v.DemoPrices++
		}
		if j.Status != sweep.StatusFailed {
			v.Planned++
			if j.Report != "" {
				v.Reports++
			}
		}
		row := sweepRowOf(j, c.Keys, lu, served)
		for i := range row.Cells {
			row.Cells[i].Num = v.Cols[i].Num
		}
		v.Rows = append(v.Rows, row)
	}
	if len(cheapest) > 0 {
		v.Cheapest = fmt.Sprintf("%s at %s %s", sweep.TiedText(cheapest), money(cheapestCents), c.Currency)
	}
	v.Plot = scatterOf(c)
	rows := make([]sweep.Row, len(c.Rows))
	for i := range c.Rows {
		rows[i] = c.Rows[i].Row
	}
	sets := sweep.UnservedSets(rows)
	for n, set := range sets {
		v.Unserved = append(v.Unserved, unservedLine{IDs: sweep.SetLabel(n, len(sets)) + strings.Join(set.IDs, ", "),
			Legs: output.Counted(len(set.Legs), "leg", "legs") + ": " + strings.Join(set.Legs, ", ")})
	}
	return v
}

func sweepRowOf(j *sweep.Judged, keys []string, lu output.Units, served bool) sweepRow {
	planned := j.Status != sweep.StatusFailed
	text := func(s string) sweepCell { return sweepCell{Text: s, Sort: s} }
	intc := func(n int, ok bool) sweepCell {
		if !ok {
			return sweepCell{}
		}
		s := strconv.Itoa(n)
		return sweepCell{Text: s, Sort: s}
	}
	moneyc := func(c int64, ok bool) sweepCell {
		if !ok {
			return sweepCell{}
		}
		return sweepCell{Text: money(c), Sort: strconv.FormatInt(c, 10)}
	}
	row := sweepRow{Class: j.Status}
	if j.Pareto {
		row.Class += " pareto"
	}
	id := sweepCell{Text: j.ID, Sort: j.ID}
	if planned {
		// The scenario's report when its folder holds one (a sweep run with --full), else
		// the folder; relative, so that it works wherever the folders are moved together.
		id.Link = j.Dir + "/" + j.Report
	}
	row.Cells = append(row.Cells, intc(j.Index, true), id, text(j.Case))
	for _, k := range keys {
		val := ""
		for _, kv := range j.Set {
			if kv[0] == k {
				val = kv[1]
			}
		}
		row.Cells = append(row.Cells, text(val))
	}
	hasBudget := planned && j.BudgetCents != nil
	budget, over := sweepCell{}, sweepCell{}
	if hasBudget {
		budget, over = moneyc(*j.BudgetCents, true), moneyc(*j.OverBudgetCents, true)
		over.Text += sweep.FeasibleOnlyText(&j.Row) // the check of the feasible legs only
	}
	margin := sweepCell{}
	if planned && j.WorstMarginDB != nil {
		margin = sweepCell{Text: dB(*j.WorstMarginDB), Sort: strconv.FormatFloat(*j.WorstMarginDB, 'f', 2, 64)}
	}
	length := func(m float64, ok bool) sweepCell {
		if !ok {
			return sweepCell{}
		}
		s := strconv.FormatFloat(lu.Rounded(m, 1), 'f', 1, 64)
		return sweepCell{Text: group(s), Sort: s}
	}
	spof := sweepCell{} // blank in rows written before the figure was kept
	if j.DiverseSinglePoint != nil {
		spof = intc(*j.DiverseSinglePoint, planned)
	}
	pareto := text(sweep.ParetoText(&j.Row, j.Pareto, j.LegSet))
	row.Cells = append(row.Cells, text(j.Status), moneyc(j.Total()))
	if served {
		row.Cells = append(row.Cells, moneyc(j.ServedLegsTotal()))
	}
	row.Cells = append(row.Cells, budget, over, intc(j.InfeasibleLegs, planned), margin, length(j.NewTrenchM, planned))
	for _, k := range estimate.NewKinds {
		row.Cells = append(row.Cells, length(j.NewConstruction(k)))
	}
	row.Cells = append(row.Cells, intc(j.DiverseLinks, planned), spof, intc(j.DiverseMissing, planned), text(j.MediaMix),
		rankc(j), pareto, intc(j.Warnings, planned), text(j.Error))
	hh, cautions := sweepCell{}, sweepCell{} // blank in rows written before they were kept
	if j.HandholesToBuild != nil {
		hh = intc(*j.HandholesToBuild, planned)
	}
	if planned && j.Cautions != nil {
		c := "none"
		if len(j.Cautions) > 0 {
			c = strconv.Itoa(len(j.Cautions)) + ": " + strings.ToLower(strings.Join(j.Cautions, ", "))
		}
		cautions = text(c)
	}
	started := sweepCell{}
	if planned {
		started = text(j.StartedFrom)
	}
	row.Cells = append(row.Cells, started, hh)
	for _, cat := range sweep.SubtotalCategories() {
		row.Cells = append(row.Cells, moneyc(j.CostByCategory[cat], j.Billed()))
	}
	for _, m := range sweep.Markups {
		row.Cells = append(row.Cells, moneyc(m.Cents(&j.Row), j.Billed()))
	}
	row.Cells = append(row.Cells, cautions)
	return row
}

// Scatter plot geometry, in SVG pixels.
const (
	plotW      = 900.0
	plotH      = 460.0
	plotLeft   = 78.0
	plotRight  = 24.0
	plotTop    = 34.0
	plotBottom = 56.0
)

// scatterOf plots every planned scenario's total cost (x) against its worst loss margin (y).
// Scenarios without fibre legs have no margin and sit on a band above the axis; infeasible
// scenarios are drawn hollow (their cost leaves out the links they could not serve).
func scatterOf(c *sweep.Comparison) scatter {
	s := scatter{W: num(plotW), H: num(plotH), Left: num(plotLeft), Right: num(plotW - plotRight),
		Top: num(plotTop), Bot: num(plotH - plotBottom)}
	cur := c.Currency
	if cur == "" {
		cur = "currency units"
	}
	s.XLabel = "total cost (" + cur + ")"
	s.YLabel = "worst loss margin (dB)"
	var xs, ys []float64
	noFibre := false
	for _, j := range c.Rows {
		if j.Status == sweep.StatusFailed {
			continue
		}
		xs = append(xs, float64(j.TotalCents)/100)
		if j.WorstMarginDB != nil {
			ys = append(ys, *j.WorstMarginDB)
		} else {
			noFibre = true
		}
	}
	if len(xs) == 0 {
		s.Empty = true
		return s
	}
	x0, x1, xt := axis(xs)
	y0, y1, yt := 0.0, 1.0, []float64{0, 0.5, 1}
	if len(ys) > 0 {
		y0, y1, yt = axis(ys)
	}
	top := plotTop
	if noFibre {
		top += 24
		s.NoFibreY = num(plotTop + 8)
	}
	px := func(x float64) float64 { return plotLeft + (x-x0)/(x1-x0)*(plotW-plotLeft-plotRight) }
	py := func(y float64) float64 { return plotH - plotBottom - (y-y0)/(y1-y0)*(plotH-plotBottom-top) }
	for _, t := range xt {
		s.XTicks = append(s.XTicks, tick{Pos: num(px(t)), Text: moneyShort(int64(math.Round(t * 100)))})
	}
	for _, t := range yt {
		s.YTicks = append(s.YTicks, tick{Pos: num(py(t)), Text: strconv.FormatFloat(t, 'f', decimals(yt), 64)})
	}
	s.LabelX, s.LabelY, s.AxisMY = num((plotLeft+plotW-plotRight)/2), num(plotH-12), num((top+plotH-plotBottom)/2)
	// Pareto points last, so they are drawn on top; then by index.
	order := make([]int, 0, len(c.Rows))
	for i, j := range c.Rows {
		if j.Status != sweep.StatusFailed {
			order = append(order, i)
		}
	}
	sort.SliceStable(order, func(a, b int) bool { return !c.Rows[order[a]].Pareto && c.Rows[order[b]].Pareto })
	// "ranked apart" only when there is another ranked set to be apart from (tester 14 F10).
	rankWord, apartWord := "ranked ", ""
	if c.RankSets > 1 {
		rankWord = "ranked apart: "
	}
	if c.OKSets > 1 {
		apartWord = "ranked apart: "
	}
	for _, i := range order {
		j := c.Rows[i]
		x := px(float64(j.TotalCents) / 100)
		y := plotTop + 8
		margin := "no fibre leg"
		if j.WorstMarginDB != nil {
			y = py(*j.WorstMarginDB)
			margin = dB(*j.WorstMarginDB) + " dB"
		}
		p := plotPoint{X: num(x), Y: num(y), Class: "pt pt-ok",
			Title: fmt.Sprintf("#%d %s: %s %s%s, worst margin %s, %s", j.Index, j.ID, money(j.TotalCents), c.Currency, servedOnly(&j.Row), margin, j.Status)}
		switch {
		case j.Status == sweep.StatusInfeasible:
			p.Class = "pt pt-infeasible"
			if j.Rank > 0 { // the rank names what its total leaves out
				p.Title += ", " + rankWord + sweep.RankText(&j.Row, j.Rank, j.Of, j.LegSet)
			}
		case j.Incomplete():
			p.Class = "pt pt-incomplete"
			p.Title += ", " + apartWord + "its total leaves out " + j.Exclusion() + ", ranked " + sweep.RankText(&j.Row, j.Rank, j.Of, j.LegSet)
		case j.Pareto:
			p.Class = "pt pt-pareto"
			p.Label = "#" + strconv.Itoa(j.Index)
			p.LX, p.LY = num(x+7), num(y-6)
		}
		if j.Pareto {
			p.Title += ", Pareto-optimal"
		}
		s.Points = append(s.Points, p)
	}
	return s
}

// axis returns a padded range covering vs and round ticks across it.
func axis(vs []float64) (lo, hi float64, ticks []float64) {
	lo, hi = vs[0], vs[0]
	for _, v := range vs {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	span := hi - lo
	if span <= 0 {
		span = math.Max(math.Abs(hi)*0.1, 1)
	}
	lo, hi = lo-span*0.08, hi+span*0.08
	step := niceStep((hi - lo) / 5)
	for t := math.Ceil(lo/step) * step; t <= hi+step*1e-9; t += step {
		ticks = append(ticks, math.Round(t/step)*step)
	}
	return lo, hi, ticks
}

// niceStep is the smallest 1, 2 or 5 × 10^k not below x.
func niceStep(x float64) float64 {
	k := math.Pow(10, math.Floor(math.Log10(x)))
	for _, f := range []float64{1, 2, 5, 10} {
		if f*k >= x {
			return f * k
		}
	}
	return 10 * k
}

// decimals is how many decimals tell the ticks apart.
func decimals(ticks []float64) int {
	if len(ticks) < 2 {
		return 1
	}
	step := ticks[1] - ticks[0]
	d := int(math.Max(0, math.Ceil(-math.Log10(step)+1e-9)))
	return min(d, 3)
}

// servedOnly is what follows a plotted total that prices the served legs only
// (sweep.Row.ServedLegsTotal), "" after a complete one.
func servedOnly(r *sweep.Row) string {
	if _, ok := r.ServedLegsTotal(); ok {
		return " for the served legs only"
	}
	return ""
}

// rankc is a scenario's rank cell: the rank, sorting as a number, with, for one ranked apart,
// the size of its rank group and what sets it apart (sweep.RankText).
func rankc(j *sweep.Judged) sweepCell {
	if j.Rank <= 0 {
		return sweepCell{}
	}
	return sweepCell{Text: sweep.RankText(&j.Row, j.Rank, j.Of, j.LegSet), Sort: strconv.Itoa(j.Rank)}
}
