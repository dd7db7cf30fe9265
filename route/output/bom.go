package output

import (
	"context"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route"
	"spanwright/route/escape"
	"spanwright/route/routing"
	"spanwright/route/workbook"
)

// Markup rows of a bill of materials, after its lines and subtotals.
const (
	rowSubtotal    = "subtotal"
	rowContingency = "contingency"
	rowOverhead    = "overhead"
	rowTax         = "tax"
	rowTotal       = "total"
	rowNote        = "note" // after the total: when it prices only some legs (PricedNoteOf), and the safety cautions (SafetyNote)
)

// bomUnit is a BOM line's unit, quantity and unit price at the output edge, and the
// decimals the price is shown with: metres become feet when imperial, the price per foot
// then being perFoot's (the extended price, the metric line's in whole cents, over the feet
// shown, to as many decimals as make the row extend), shown in bom.csv and bom.xlsx alike to
// those decimals, so that quantity × unit price as printed, rounded to the cent, is the
// extended price in either file (tester 15 F6: bom.csv wrote four decimals, 88,707.6 ft ×
// 1.0058 = 89,222.10 against 89,225.40, and a bid spreadsheet re-extending it got another
// total). The extended price never changes. A
// cable line's feet are the pieces the cable schedule cuts for it, as written (cut, the
// tenths of a foot of cutOf), so that they add up to the line as whole metres do in metric.
func bomUnit(opt WriteOptions, l media.BOMLine, cut cableCut) (unit string, qty, unitPrice float64, priceDecimals int) {
	unit, qty, unitPrice, priceDecimals = l.Unit, l.Quantity, float64(l.UnitCents)/100, 2
	if opt.imperial() && l.Unit == media.UnitM {
		// The metres summed, converted, then rounded (Units.Rounded): not the billed 0.1 m
		// converted, which can show 0.1 ft off what the terminal and the report show.
		ft := UnitsOf(opt).Rounded(l.Summed, qtyDecimals("ft"))
		if tenths, ok := cut[l.Price]; ok && l.Price.Item == media.PriceCable {
			ft = float64(tenths) / 10
		}
		unitPrice, priceDecimals = perFoot(l.ExtendedCents, ft, unitPrice*install.MPerFt)
		return "ft", ft, unitPrice, priceDecimals
	}
	return unit, qty, unitPrice, priceDecimals
}

// perFootDecimals is the fewest decimals a price per foot shows: a hundredth of a cent a foot,
// finer than cable is quoted. Common practice, no published source.
const perFootDecimals = 4

// perFoot is the price per foot of a line of extendedCents over shownFt feet (as the row
// shows them) and the decimals it is written with, the one decision behind bom.csv's and
// bom.xlsx's unit price per foot. The extended price stays the metric line's (the book prices
// by the metre), so that the totals are the same in either units; the price is then the
// extended price over the feet, written to the fewest decimals from perFootDecimals up that
// make the row extend: shownFt × the price as written is within half a cent of the extended
// price (an estimator checks every extension). Four decimals leave up to half a unit of the
// last one per foot, up to 31 USD on the 620,482 ft of one line of the 200-building campus
// (7.45 USD measured there: review 4 finding 2), which shows 8. Without feet the price is
// price, to perFootDecimals.
func perFoot(extendedCents int64, shownFt, price float64) (float64, int) {
	if shownFt <= 0 {
		return roundHalfAway(price, perFootDecimals), perFootDecimals
	}
	exact, ext := float64(extendedCents)/100/shownFt, float64(extendedCents)/100
	for d := perFootDecimals; d < workbook.MaxDecimals; d++ {
		p := roundHalfAway(exact, d)
		if math.Abs(shownFt*p-ext) < extendsWithin {
			return p, d
		}
	}
	return roundHalfAway(exact, workbook.MaxDecimals), workbook.MaxDecimals
}

// extendsWithin is how close quantity × unit price must come to the extended price for a row
// to extend: under half a cent, so that it rounds to the extended price, less a margin for
// the binary fractions of the figures as written.
const extendsWithin = 0.005 - 1e-6

// qtyDecimals is how many decimals a BOM quantity shows: counts none, lengths one, hours two.
func qtyDecimals(unit string) int {
	switch unit {
	case media.UnitEach:
		return 0
	case media.UnitHour:
		return 2
	}
	return 1
}

// describe is a BOM line's item at the output edge, labour work in feet and diameters in
// inches when imperial (InUnits).
func describe(opt WriteOptions, l media.BOMLine) string {
	return InUnits(opt, l.Describe(func(m float64) string { return LengthText(opt, m) }))
}

func pct(bp int64) string { return strconv.FormatFloat(float64(bp)/100, 'f', 2, 64) }

// fromText is a BOM line's sources (media.BOMLine.From) as one cell, separated by "; " as
// each source has a space in it ("leg L-1/primary"), in the run's units (fromIn).
func fromText(opt WriteOptions, l media.BOMLine) string { return strings.Join(fromIn(opt, l), "; ") }

// fromIn is a BOM line's sources in the run's units: a stretch of pathway named by its metres
// ("pathway EA-3, 0.0 m to 20.1 m", geo.Network.Stretches) in feet in an imperial run
// (review 22 F3).
func fromIn(opt WriteOptions, l media.BOMLine) []string {
	if !opt.imperial() {
		return l.From
	}
	out := make([]string, len(l.From))
	for i, f := range l.From {
		out[i] = InUnits(opt, f)
	}
	return out
}

// xlCellChars is the most characters a workbook cell holds (Excel specifications and
// limits: 32,767 characters in a cell; the writer cuts longer text off silently), less room
// for the note fromCell adds.
const xlCellChars = 32767 - 100

// fromCell is fromText for a workbook cell (fitCell), the rest in bom.csv.
func fromCell(opt WriteOptions, l media.BOMLine) string {
	return fitCell(fromIn(opt, l), "; ", "bom.csv")
}

// fitCell is items joined by sep for a workbook cell: when they do not fit one cell
// (xlCellChars) it keeps as many whole items as fit and says how many more the file named
// where lists.
func fitCell(items []string, sep, where string) string {
	text := strings.Join(items, sep)
	if utf8.RuneCountInString(text) <= xlCellChars {
		return text
	}
	n, kept := 0, 0
	for _, it := range items {
		if n+utf8.RuneCountInString(it)+len(sep) > xlCellChars {
			break
		}
		n += utf8.RuneCountInString(it) + len(sep)
		kept++
	}
	return fmt.Sprintf("%s%sand %d more, all in %s", strings.Join(items[:kept], sep), sep, len(items)-kept, where)
}

// bomCSV renders bom.csv: one row per line (category, item, unit, quantity, unit price,
// extended price, and last the legs, buildings, spans or junctions it comes from), then a subtotal row per category and for all, contingency, overhead,
// tax and total, and a note when the total prices only some legs (PricedNoteOf). Money has two decimals; imperial unit prices per foot are the extended price
// over the feet shown, to as many decimals as make the row extend (perFoot).
func bomCSV(out io.Writer, r *route.Result, opt WriteOptions) error {
	b := r.Estimate.BOM
	cur := strings.ToLower(b.Currency)
	w := escape.NewWriter(out)
	w.Write([]string{"category", "item", "unit", "quantity", "unit_price_" + cur, "extended_" + cur, "from", "price_key"})
	cut := cutOf(opt, r)
	for _, l := range b.Lines {
		unit, qty, price, dp := bomUnit(opt, l, cut)
		q, p := strconv.FormatFloat(qty, 'f', qtyDecimals(unit), 64), media.FormatCents(l.UnitCents)
		if unit == "ft" {
			p = strconv.FormatFloat(price, 'f', dp, 64)
		}
		ext := media.FormatCents(l.ExtendedCents)
		if l.NotPriced {
			p, ext = l.NotPricedText(), ""
		}
		w.Write([]string{l.Category, describe(opt, l), unit, q, p, ext, fromText(opt, l), l.PriceKeys()})
	}
	for _, s := range b.Subtotal {
		w.Write([]string{rowSubtotal, s.Category, "", "", "", media.FormatCents(s.Cents), "", ""})
	}
	w.Write([]string{rowSubtotal, "all categories", "", "", "", media.FormatCents(b.SubtotalCents), "", ""})
	w.Write([]string{rowContingency, pct(b.ContingencyBP) + " % of the subtotal", "%", pct(b.ContingencyBP),
		media.FormatCents(b.SubtotalCents), media.FormatCents(b.ContingencyCents), "", markupKey + media.MarkupContingency})
	w.Write([]string{rowOverhead, pct(b.OverheadBP) + " % of the subtotal", "%", pct(b.OverheadBP),
		media.FormatCents(b.SubtotalCents), media.FormatCents(b.OverheadCents), "", markupKey + media.MarkupOverhead})
	w.Write([]string{rowTax, pct(b.TaxBP) + " % of " + taxedWords(b), "%", pct(b.TaxBP),
		media.FormatCents(b.TaxBaseCents), media.FormatCents(b.TaxCents), "", markupKey + "tax"})
	w.Write([]string{rowTotal, b.Label, "", "", "", media.FormatCents(b.TotalCents), "", ""})
	if note := PricedNoteOf(r); note != "" {
		w.Write([]string{rowNote, note, "", "", "", "", "", ""})
	}
	if note := SafetyNote(r); note != "" {
		w.Write([]string{rowNote, note, "", "", "", "", "", ""})
	}
	return w.Flush()
}

// markupKey begins the price-book key of a markup row (bom.csv's and the bill sheet's price
// key): markups_percent.contingency, .overhead and .tax.
const markupKey = "markups_percent."

// money is an amount in integer cents in currency units, as a workbook's money cells hold it.
func money(cents int64) float64 { return float64(cents) / 100 }

// roundHalfAway rounds x to d decimals, halves away from zero, as a spreadsheet's ROUND does.
func roundHalfAway(x float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(x*p) / p
}

// Units are the names of the physical units a run's outputs for people are in, and the
// conversions into them from the metric figures inside: metres, newtons, N/m (sidewall
// pressure) and millimetres (diameters), or feet, pound-force, lbf/ft and inches when
// imperial. The workbook, the report and the terminal take them from here.
type Units struct {
	Length, Force, SWBP, Diameter string
	M, N, NPerM, MM               func(float64) float64
}

// UnitsOf returns the units of opt.
func UnitsOf(opt WriteOptions) Units {
	id := func(x float64) float64 { return x }
	if opt.imperial() {
		return Units{"ft", "lbf", "lbf/ft", "in", install.MToFt, install.NToLbf, install.NPerMToLbfPerFt,
			func(mm float64) float64 { return mm / install.MMPerIn }}
	}
	return Units{"m", "N", "N/m", "mm", id, id, id, id}
}

// Rounded is metres m in the length unit, rounded to decimals (halves away from zero): the
// one way every output for people (the terminal, the report, bom.csv, the workbook) turns a
// length into the figure it shows, always from the unrounded metric figure, so that one
// length never shows two ways (metres rounded first and then converted can be 0.1 ft off).
func (u Units) Rounded(m float64, decimals int) float64 { return roundHalfAway(u.M(m), decimals) }

// bomXLSX renders bom.xlsx: sheets summary, links (the cable schedule), bill of materials,
// pull sections, structures (StructuresOf), duct fill, loss budgets and safety (the plan's cautions). Extended prices, subtotals, markups, the
// total and the budget check are formulas, so a changed unit price or quantity moves
// them. Physical quantities are numbers with their unit in the header.
func bomXLSX(ctx context.Context, out io.Writer, r *route.Result, opt WriteOptions, sts func() (structureList, error)) error {
	u := UnitsOf(opt)
	b := r.Estimate.BOM
	cur := b.Currency
	wb := workbook.New()
	sum := wb.AddSheet("summary", workbook.Column{Name: "figure"}, workbook.Column{Name: "value", Width: 22}, workbook.Column{Name: "unit"})
	// The links sheet's columns in groups: an infeasible leg leaves its takeoff's and its
	// schedule's blank, as many cells as the groups have columns.
	takeoffCols := []workbook.Column{{Name: "medium"}, {Name: "application"},
		{Name: "construction"}, {Name: "strands"}, {Name: "cables"},
		{Name: "cable OD", Unit: u.Diameter}, {Name: "route", Unit: u.Length},
		{Name: "risers", Unit: u.Length}, {Name: "slack loops", Unit: u.Length},
		{Name: "structures passed"}, {Name: "cable bought", Unit: u.Length},
		{Name: "reels"}, {Name: "mid-span splices"},
		{Name: "reel lengths", Unit: u.Length}, {Name: "mid-span splices at"},
		{Name: "pull sections"},
		{Name: "highest pull", Unit: u.Force}, {Name: "rated pull", Unit: u.Force}}
	// The schedule's (schedule.sheetCells), with the cut of each construction (links.csv's
	// cut_length and inside_ columns) last, so that no earlier column moves.
	scheduleCols := []workbook.Column{{Name: "jacket colour"}, {Name: "cable labels"},
		{Name: "cut length", Unit: u.Length}, {Name: "inside cables"},
		{Name: "inside cut at to", Unit: u.Length}, {Name: "inside cut at from", Unit: u.Length},
		{Name: "inside labels"}}
	linkCols := []workbook.Column{{Name: "link"}, {Name: "leg"}, {Name: "from"}, {Name: "to"}, {Name: "rate"}}
	linkCols = append(linkCols, takeoffCols...)
	linkCols = append(linkCols, workbook.Column{Name: "model cost", Unit: cur}, workbook.Column{Name: "feasible"}, workbook.Column{Name: "note"},
		workbook.Column{Name: "from entrance"}, workbook.Column{Name: "to entrance"}, workbook.Column{Name: "buildings crossed"},
		workbook.Column{Name: "turns at added handholes"}, workbook.Column{Name: "reason code"})
	links := wb.AddSheet("links", append(linkCols, scheduleCols...)...)
	links.Filter = true
	bom := wb.AddSheet("bill of materials", workbook.Column{Name: "category"}, workbook.Column{Name: "item"},
		workbook.Column{Name: "unit"}, workbook.Column{Name: "quantity"}, workbook.Column{Name: "unit price", Unit: cur},
		workbook.Column{Name: "extended", Unit: cur}, workbook.Column{Name: "from"}, workbook.Column{Name: "price key"})
	bom.Filter = true
	pulls := wb.AddSheet("pull sections",
		workbook.Column{Name: "link"}, workbook.Column{Name: "leg"}, workbook.Column{Name: "pull"},
		workbook.Column{Name: "from"}, workbook.Column{Name: "to"}, workbook.Column{Name: "feed at"},
		workbook.Column{Name: "spans"}, workbook.Column{Name: "start", Unit: u.Length}, workbook.Column{Name: "length", Unit: u.Length},
		workbook.Column{Name: "bends", Unit: "deg"}, workbook.Column{Name: "bend radius", Unit: u.Length},
		workbook.Column{Name: "tension", Unit: u.Force}, workbook.Column{Name: "other way", Unit: u.Force},
		workbook.Column{Name: "rated", Unit: u.Force}, workbook.Column{Name: "of rating", Unit: "%"},
		workbook.Column{Name: "sidewall pressure", Unit: u.SWBP}, workbook.Column{Name: "added at from"},
		workbook.Column{Name: "added at to"}, workbook.Column{Name: "within rating"}, workbook.Column{Name: "reason"})
	pulls.Filter = true
	structs := wb.AddSheet("structures",
		workbook.Column{Name: "mark"}, workbook.Column{Name: "structure"}, workbook.Column{Name: "status"},
		workbook.Column{Name: "type"}, workbook.Column{Name: "purpose"}, workbook.Column{Name: "longitude", Unit: "deg"},
		workbook.Column{Name: "latitude", Unit: "deg"}, workbook.Column{Name: "legs through it"}, workbook.Column{Name: "legs joined there"},
		workbook.Column{Name: "coiled there", Unit: u.Length})
	structs.Filter = true
	fill := wb.AddSheet("duct fill",
		workbook.Column{Name: "span"}, workbook.Column{Name: "pathway"}, workbook.Column{Name: "duct"},
		workbook.Column{Name: "added"}, workbook.Column{Name: "duct ID", Unit: u.Diameter}, workbook.Column{Name: "cables"},
		workbook.Column{Name: odsHeader(r), Unit: u.Diameter}, workbook.Column{Name: "fill", Unit: "%"},
		workbook.Column{Name: "NFPA 70 limit", Unit: "%"}, workbook.Column{Name: "jam ratio 1.05 D/d"},
		workbook.Column{Name: "in jam band 2.8-3.2"}, workbook.Column{Name: "ok"},
		workbook.Column{Name: "legs (one per cable)"}, workbook.Column{Name: "pulling note"})
	fill.Filter = true
	loss := wb.AddSheet("loss budgets",
		workbook.Column{Name: "link"}, workbook.Column{Name: "leg"}, workbook.Column{Name: "medium"},
		workbook.Column{Name: "application"}, workbook.Column{Name: "construction"}, workbook.Column{Name: "wavelength", Unit: "nm"},
		workbook.Column{Name: "attenuation", Unit: "dB/km"}, workbook.Column{Name: "channel", Unit: u.Length}, workbook.Column{Name: "connector pairs"},
		workbook.Column{Name: "splices"}, workbook.Column{Name: "loss", Unit: "dB"}, workbook.Column{Name: "limit", Unit: "dB"},
		workbook.Column{Name: "margin", Unit: "dB"}, workbook.Column{Name: "field test limit", Unit: "dB"},
		workbook.Column{Name: "operating"}, workbook.Column{Name: "field test limit by"},
		workbook.Column{Name: "TIA-568.3-D link limit", Unit: "dB"}, workbook.Column{Name: "required margin", Unit: "dB"},
		workbook.Column{Name: "required margin from"}, workbook.Column{Name: "attenuator at each receiver, in loss", Unit: "dB"})
	loss.Filter = true
	safety := wb.AddSheet(SheetSafety, workbook.Column{Name: "caution"}, workbook.Column{Name: "in this plan"},
		workbook.Column{Name: "what to do"}, workbook.Column{Name: "source"}, workbook.Column{Name: "key (links.csv safety)"})

	// Bill of materials: lines, then subtotals, markups and the total, all formulas.
	n := len(b.Lines)
	last := max(n+1, 2)
	catRange, extRange := fmt.Sprintf("$A$2:$A$%d", last), fmt.Sprintf("$F$2:$F$%d", last)
	// Bid items priced as a percentage come last (Bill) and take a percentage of the lines
	// above them: their ranges end before the first, so that no cell refers to itself.
	above := last
	for i, l := range b.Lines {
		if l.PercentOf != nil {
			above = max(i+1, 2)
			break
		}
	}
	catAbove, extAbove := fmt.Sprintf("$A$2:$A$%d", above), fmt.Sprintf("$F$2:$F$%d", above)
	cut := cutOf(opt, r)
	for i, l := range b.Lines {
		row := i + 2
		unit, qty, price, dp := bomUnit(opt, l, cut)
		dq := qtyDecimals(unit)
		unitPrice := workbook.Number(price, dp)
		if l.PercentOf != nil {
			// A bid item priced as a percentage: its price is the percentage of its categories'
			// lines, live, as Bill computed it.
			var sums []string
			for _, c := range l.PercentOf {
				sums = append(sums, fmt.Sprintf("SUMIF(%s,%q,%s)", catAbove, c, extAbove))
			}
			unitPrice = workbook.Formula(fmt.Sprintf("ROUND((%s)*%s/100,2)", strings.Join(sums, "+"), pct(l.PercentBP)), price, 2)
		}
		extended := workbook.Formula(fmt.Sprintf("ROUND(%s*%s,2)", workbook.Ref(3, row), workbook.Ref(4, row)), money(l.ExtendedCents), 2)
		if l.NotPriced {
			// The quantity the plan needs, and in place of a price the words that say why
			// there is none; no extended price, so the subtotals leave it out.
			unitPrice, extended = workbook.Text(l.NotPricedText()), workbook.Blank()
		}
		bom.Append(workbook.Text(l.Category), workbook.Text(describe(opt, l)), workbook.Text(unit), workbook.Number(qty, dq),
			unitPrice, extended, workbook.Text(fromCell(opt, l)), workbook.Text(l.PriceKeys()))
	}
	bom.Append()
	subRow := map[string]int{}
	for _, s := range b.Subtotal {
		subRow[s.Category] = bom.Rows() + 2
		bom.Append(workbook.Text(rowSubtotal), workbook.Text(s.Category), workbook.Blank(), workbook.Blank(), workbook.Blank(),
			workbook.Formula(fmt.Sprintf("SUMIF(%s,%q,%s)", catRange, s.Category, extRange), money(s.Cents), 2))
	}
	allRow := bom.Rows() + 2
	var parts []string
	for _, s := range b.Subtotal {
		parts = append(parts, workbook.Ref(5, subRow[s.Category]))
	}
	bom.Append(workbook.Text(rowSubtotal), workbook.Text("all categories"), workbook.Blank(), workbook.Blank(), workbook.Blank(),
		workbook.Formula(strings.Join(parts, "+"), money(b.SubtotalCents), 2))
	// A markup row: its percentage, its base (baseCents) and the markup (cents), as Bill
	// computed them.
	markup := func(name, what string, bp int64, base string, baseCents, cents int64, key string) int {
		row := bom.Rows() + 2
		bom.Append(workbook.Text(name), workbook.Text(what), workbook.Text("%"), workbook.Number(float64(bp)/100, 2),
			workbook.Formula(base, money(baseCents), 2),
			workbook.Formula(fmt.Sprintf("ROUND(%s*%s/100,2)", workbook.Ref(3, row), workbook.Ref(4, row)), money(cents), 2),
			workbook.Blank(), workbook.Text(markupKey+key))
		return row
	}
	all := workbook.Ref(5, allRow)
	contRow := markup(rowContingency, "% of the subtotal", b.ContingencyBP, all, b.SubtotalCents, b.ContingencyCents, media.MarkupContingency)
	overRow := markup(rowOverhead, "% of the subtotal", b.OverheadBP, all, b.SubtotalCents, b.OverheadCents, media.MarkupOverhead)
	cont, over := workbook.Ref(5, contRow), workbook.Ref(5, overRow)
	taxBase := all + "+" + cont + "+" + over
	if !taxesAll(b) {
		var refs []string
		for _, s := range b.Subtotal {
			if slices.Contains(b.Taxed, s.Category) {
				refs = append(refs, workbook.Ref(5, subRow[s.Category]))
			}
		}
		if slices.Contains(b.Taxed, media.MarkupContingency) {
			refs = append(refs, cont)
		}
		if slices.Contains(b.Taxed, media.MarkupOverhead) {
			refs = append(refs, over)
		}
		taxBase = "0"
		if len(refs) > 0 {
			taxBase = strings.Join(refs, "+")
		}
	}
	taxRow := markup(rowTax, "% of "+taxedWords(b), b.TaxBP, taxBase, b.TaxBaseCents, b.TaxCents, "tax")
	totalRow := bom.Rows() + 2
	bom.Append(workbook.Text(rowTotal), workbook.Text(b.Label), workbook.Blank(), workbook.Blank(), workbook.Blank(),
		workbook.Formula(all+"+"+cont+"+"+over+"+"+workbook.Ref(5, taxRow), money(b.TotalCents), 2))
	note := PricedNoteOf(r)
	if note != "" {
		bom.Append(workbook.Text(rowNote), workbook.Text(note))
	}
	ref := func(row int) string { return "'bill of materials'!" + workbook.Ref(5, row) }

	// Summary: figures, then the money as formulas on the bill of materials.
	s, lengths := Summarize(r), TotalsOf(r)
	text := func(fig, v string) { sum.Append(workbook.Text(fig), workbook.Text(v)) }
	num := func(fig string, v float64, d int, unit string) {
		sum.Append(workbook.Text(fig), workbook.Number(v, d), workbook.Text(unit))
	}
	moneyRow := func(fig, formula string, cents int64) {
		sum.Append(workbook.Text(fig), workbook.Formula(formula, money(cents), 2), workbook.Text(cur))
	}
	text("scenario", s.Scenario)
	text("hub", s.Hub)
	text("price book", b.Label+", prices of "+r.Engine.PriceBook().PricesDate)
	num("links", float64(s.Links), 0, "")
	num("legs", float64(s.Legs), 0, "")
	num("infeasible legs", float64(s.Infeasible), 0, "")
	num("route", RouteListed(u, r), 1, u.Length)
	num("cable bought", cut.all(), 1, u.Length)
	num("new trench", u.Rounded(lengths.NewM, 1), 1, u.Length)
	num("pull sections", float64(s.PullSections), 0, "")
	num("added pull points", float64(s.AddedPullPoints), 0, "")
	for _, c := range b.Subtotal {
		moneyRow(c.Category, ref(subRow[c.Category]), c.Cents)
	}
	moneyRow("subtotal", ref(allRow), b.SubtotalCents)
	moneyRow("contingency", ref(contRow), b.ContingencyCents)
	moneyRow("overhead", ref(overRow), b.OverheadCents)
	moneyRow("tax", ref(taxRow), b.TaxCents)
	totalAt := sum.Rows() + 2
	moneyRow("total", ref(totalRow), b.TotalCents)
	if note != "" {
		text(rowNote, note)
	}
	budgetAt := sum.Rows() + 2
	// Without a budget the budget cell is blank (a formula reads it as 0, no budget), not
	// a budget of 0; typing one in makes the two rows below check it.
	budgetCell := workbook.Blank()
	if s.BudgetCents != nil {
		budgetCell = workbook.Cents(*s.BudgetCents)
	}
	sum.Append(workbook.Text("budget"), budgetCell, workbook.Text(cur))
	tot, bud := workbook.Ref(1, totalAt), workbook.Ref(1, budgetAt)
	// The budget check as the formulas work it out from the total and the budget cells.
	overCents, overPct := int64(0), 0.0
	if s.BudgetCents != nil {
		overCents = b.TotalCents - *s.BudgetCents
		overPct = roundHalfAway(100*(money(b.TotalCents)-money(*s.BudgetCents))/money(*s.BudgetCents), 1)
	}
	moneyRow("over (+) or under (-) budget", fmt.Sprintf("IF(%s>0,%s-%s,0)", bud, tot, bud), overCents)
	sum.Append(workbook.Text("over (+) or under (-) budget"), workbook.Formula(fmt.Sprintf("IF(%s>0,ROUND(100*(%s-%s)/%s,1),0)", bud, tot, bud, bud), overPct, 1), workbook.Text("%"))
	if scope := s.BudgetScope(); scope != "" {
		if s.NoLegPriced() {
			text(rowNote, "the budget check: "+scope)
		} else {
			text(rowNote, "the budget check "+scope)
		}
	}
	sum.Append(workbook.Text("model cost (legs, no markups)"), workbook.Cents(s.ModelCents), workbook.Text(cur))
	num("warnings", float64(s.WarningCount), 0, "")
	num("safety cautions", float64(len(r.Cautions)), 0, "sheet "+SheetSafety)

	// Cable schedule.
	pullsOf, hiOf := map[int]int{}, map[int]float64{}
	for _, p := range r.Estimate.Pulls {
		pullsOf[p.Leg]++
		if p.TensionN > hiOf[p.Leg] {
			hiOf[p.Leg] = p.TensionN
		}
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		t := l.Cable
		cells := []workbook.Cell{workbook.Text(l.Link.ID), workbook.Text(l.Name), workbook.Text(l.Link.From), workbook.Text(l.Link.To),
			workbook.Text(l.Link.Rate)}
		if !l.Feasible {
			cells = append(cells, make([]workbook.Cell, len(takeoffCols))...)
			cells = append(cells, workbook.Cents(l.Cost.TotalCents()), workbook.Bool(false), workbook.Text(InUnits(opt, l.Reason)))
			links.Append(append(append(cells, passage(r, l)...), scheduleOf(r, i).sheetCells(u)...)...)
			continue
		}
		hi := hiOf[i]
		rated := r.Engine.Catalog().Medium(l.Medium).Construction(l.Construction).LeastPullRatingN(t.Cables)
		sch := scheduleOf(r, i)
		takeoff := []workbook.Cell{workbook.Text(l.Medium), workbook.Text(l.Application), workbook.Text(l.ConstructionText()),
			workbook.Int(int64(l.StrandsCable)), workbook.Int(int64(sch.cables)), workbook.Number(u.MM(t.Cables.Largest().ODMM), 1),
			workbook.Number(u.M(l.RouteM), 1), workbook.Number(u.M(l.RiserM), 1), workbook.Number(u.M(sch.slackM), 1),
			workbook.Int(int64(sch.structures)), workbook.Number(u.M(t.LengthM), 1), workbook.Int(int64(sch.reels)),
			workbook.Int(int64(t.Joins)), workbook.Text(ReelsText(opt, t.ReelsM)), workbook.Text(SplicesText(opt, t.Splices)),
			workbook.Int(int64(pullsOf[i])), workbook.Number(u.N(hi), 1), workbook.Number(u.N(rated), 1)}
		cells = append(append(cells, takeoff...), workbook.Cents(l.Cost.TotalCents()), workbook.Bool(true), workbook.Text(InUnits(opt, l.Reason)))
		links.Append(append(append(cells, passage(r, l)...), sch.sheetCells(u)...)...)
	}
	for _, p := range r.Estimate.Pulls {
		l := &r.Legs[p.Leg]
		pulls.Append(workbook.Text(l.Link.ID), workbook.Text(l.Name), workbook.Int(int64(p.Seq)), workbook.Text(PointText(opt, p.From)),
			workbook.Text(PointText(opt, p.To)), workbook.Text(PointText(opt, p.FeedAt)), workbook.Text(p.SpansText()),
			workbook.Number(u.M(p.StartM), 1), workbook.Number(u.M(p.LengthM), 1), workbook.Number(p.BendDeg, 1),
			workbook.Number(u.M(p.BendRadiusM), 2), workbook.Number(u.N(p.TensionN), 1), workbook.Number(u.N(p.OtherN), 1),
			workbook.Number(u.N(p.RatedN), 1), workbook.Number(100*p.TensionN/p.RatedN, 1), workbook.Number(u.NPerM(p.SWBPNPerM), 1),
			workbook.Bool(p.AddedFrom), workbook.Bool(p.AddedTo), workbook.Bool(p.WithinRating), workbook.Text(install.Why(p.Over, PullUnits(opt))))
	}
	found, err := sts()
	if err != nil {
		return err
	}
	for _, st := range found.all {
		structs.Append(workbook.Int(int64(st.Mark)), workbook.Text(st.Place(func(m float64) string { return LengthText(opt, m) })),
			workbook.Text(st.Status), workbook.Text(st.Type), workbook.Text(st.Purpose), workbook.Number(st.Point[0], 7),
			workbook.Number(st.Point[1], 7), workbook.Text(listCell(st.Legs, "plan.gpkg's structures layer")),
			workbook.Text(listCell(st.Joined, "plan.gpkg's structures layer")), workbook.Number(u.M(st.CoiledM), 1))
	}
	for _, f := range r.Estimate.Fill {
		ods := make([]string, len(f.CablesODMM))
		for i, od := range f.CablesODMM {
			ods[i] = strconv.FormatFloat(u.MM(od), 'f', 2, 64)
		}
		jam := workbook.Blank()
		if f.JamRatio > 0 {
			jam = workbook.Number(f.JamRatio, 2)
		}
		duct, pct, limit := workbook.Int(int64(f.Duct)), workbook.Number(f.FillPct, 1), workbook.Number(f.AllowedPct, 0)
		if f.Unplaced { // cables that fit none of the span's ducts
			duct, pct, limit = workbook.Text("none"), workbook.Blank(), workbook.Blank()
		}
		fill.Append(workbook.Text(f.Span), workbook.Text(f.PathwayID), duct, workbook.Bool(f.Added),
			workbook.Number(u.MM(f.DuctIDMM), 2), workbook.Int(int64(len(f.CablesODMM))), workbook.Text(strings.Join(ods, " ")),
			pct, limit, jam, workbook.Bool(f.JamRisk), workbook.Bool(f.OK), workbook.Text(strings.Join(f.Legs, " ")),
			workbook.Text(f.Note()))
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		for _, x := range l.Losses {
			row := []workbook.Cell{workbook.Text(l.Link.ID), workbook.Text(l.Name), workbook.Text(l.Medium), workbook.Text(l.Application),
				workbook.Text(l.ConstructionText()), workbook.Int(int64(x.WavelengthNM)), workbook.Number(x.AttenDBPerKm, 3),
				workbook.Number(u.M(l.Cable.ChannelM), 1),
				workbook.Int(int64(x.Pairs)), workbook.Int(int64(x.Splices)), workbook.Number(x.LossDB, 2)}
			if x.Operating {
				row = append(row, workbook.Number(x.LimitDB, 2), workbook.Number(x.MarginDB, 2))
			} else {
				row = append(row, workbook.Blank(), workbook.Blank())
			}
			row = append(row, workbook.Number(x.FieldLimitDB, 2), workbook.Bool(x.Operating), workbook.Text(x.FieldLimitBy),
				workbook.Number(x.CablingLimitDB, 2))
			if x.Operating {
				row = append(row, workbook.Number(x.RequiredMarginDB, 2), workbook.Text(x.RequiredMarginBasis), workbook.Number(x.AttenuatorDB, 0))
			} else {
				row = append(row, workbook.Blank(), workbook.Blank(), workbook.Blank())
			}
			loss.Append(row...)
		}
	}
	// Safety: the plan's cautions (route.Result.Cautions), between the words said before and
	// after them, as the report lists them; what calls for each in the run's units (a
	// handhole's place names its distance), its text as written (it gives both units).
	safety.Append(workbook.Text("planning aid"), workbook.Blank(), workbook.Text(route.CautionsPreamble))
	for _, c := range r.Cautions {
		safety.Append(workbook.Text(c.Title), workbook.Text(c.WhereIn(func(m float64) string { return LengthText(opt, m) })), workbook.Text(c.Text), workbook.Text(c.Source), workbook.Text(c.ID))
	}
	safety.Append(workbook.Text("codes"), workbook.Blank(), workbook.Text(route.CautionsClosing))
	return wb.WriteToContext(ctx, out)
}

// SheetSafety is the name of bom.xlsx's sheet of safety cautions.
const SheetSafety = "safety"

// listCell is ids separated by spaces for a workbook cell (fitCell), the rest in where.
func listCell(ids []string, where string) string { return fitCell(ids, " ", where) }

// passage is the links sheet's last cells of a leg, as text: links.csv's last columns (see
// passageText), then the reason code.
func passage(r *route.Result, l *routing.Leg) []workbook.Cell {
	texts := append(passageText(l, travelOf(r.Site.Net, l)), l.ReasonCode)
	cells := make([]workbook.Cell, len(texts))
	for i, x := range texts {
		cells[i] = workbook.Text(x)
	}
	return cells
}

// odsHeader names the duct fill sheet's diameters column: the cables', or the innerducts'
// that hold them.
func odsHeader(r *route.Result) string {
	if r.Plan != nil && r.Plan.Design.Innerduct() {
		return "innerduct ODs (one per cable)"
	}
	return "cable ODs"
}

// taxesAll reports whether tax applies to every category and both markups, as a price book
// without taxed_categories says.
func taxesAll(b *media.BOM) bool {
	for _, s := range b.Subtotal {
		if !slices.Contains(b.Taxed, s.Category) {
			return false
		}
	}
	return slices.Contains(b.Taxed, media.MarkupContingency) && slices.Contains(b.Taxed, media.MarkupOverhead)
}

// taxedWords says what tax applies to: "subtotal, contingency and overhead" when it applies
// to everything, else the taxed categories and markups, e.g. "material + optics".
func taxedWords(b *media.BOM) string {
	if taxesAll(b) {
		return "subtotal, contingency and overhead"
	}
	if len(b.Taxed) == 0 {
		return "nothing (no taxed categories)"
	}
	return strings.Join(b.Taxed, " + ")
}
