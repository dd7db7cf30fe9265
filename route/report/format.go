package report

import (
	"math"
	"strconv"
	"strings"

	"spanwright/route/output"
)

// Options say how a report is rendered.
type Options struct {
	// Units is output.UnitsMetric (default) or output.UnitsImperial: lengths in the report's
	// text, tables and scale bar, diameters in inches. Losses stay in dB and fill in
	// percent.
	Units string
}

func (o Options) imperial() bool { return o.Units == output.UnitsImperial }

// units are the report's units and their conversions, the run's (output.UnitsOf).
func (o Options) units() output.Units { return output.UnitsOf(output.WriteOptions{Units: o.Units}) }

// diameter formats a diameter in millimetres in the report's unit: whole millimetres above
// 20 mm (a duct), else one decimal (a cable); inches with two decimals (1 in = 25.4 mm
// exactly, NIST SP 811 B.8).
func (o Options) diameter(mm float64) string {
	if o.imperial() {
		return strconv.FormatFloat(o.units().MM(mm), 'f', 2, 64)
	}
	if mm > 20 {
		return strconv.FormatFloat(mm, 'f', 0, 64)
	}
	return strconv.FormatFloat(mm, 'f', 1, 64)
}

// ductDiameter is a duct's inside diameter as diameter writes it, but in millimetres to the
// tenth when it has one (101.5 mm, the default, trade size 103 PVC Schedule 40: not "102",
// beside the warnings that name it; 100 stays "100"), since a few tenths may turn the jam
// band's verdict.
func (o Options) ductDiameter(mm float64) string {
	if o.imperial() {
		return o.diameter(mm)
	}
	return strconv.FormatFloat(math.Round(mm*10)/10, 'f', -1, 64)
}

// diameters lists the cables' diameters with their unit, equal ones counted once in the
// order they first come: "3 × 10.5, 12.0 mm" for three cables of 10.5 and one of 12.
func (o Options) diameters(mm []float64) string {
	var texts []string
	count := map[string]int{}
	for _, d := range mm {
		t := o.diameter(d)
		if count[t] == 0 {
			texts = append(texts, t)
		}
		count[t]++
	}
	for i, t := range texts {
		if n := count[t]; n > 1 {
			texts[i] = strconv.Itoa(n) + " × " + t
		}
	}
	return strings.Join(texts, ", ") + " " + o.units().Diameter
}

// length formats metres in the report's unit with one decimal and thousands separators.
func (o Options) length(m float64) string {
	return group(strconv.FormatFloat(o.units().Rounded(m, 1), 'f', 1, 64))
}

// lengthU is length with its unit.
func (o Options) lengthU(m float64) string { return o.length(m) + " " + o.units().Length }

// money formats cents as an amount with two decimals and thousands separators:
// 1234567 is "12,345.67".
func money(cents int64) string {
	sign := ""
	if cents < 0 {
		sign, cents = "−", -cents
	}
	return sign + group(strconv.FormatInt(cents/100, 10)) + "." + pad2(cents%100)
}

// moneyShort formats cents as whole currency units with separators: 1234567 is "12,346".
func moneyShort(cents int64) string {
	sign := ""
	if cents < 0 {
		sign, cents = "−", -cents
	}
	return sign + group(strconv.FormatInt((cents+50)/100, 10))
}

func pad2(n int64) string {
	if n < 10 {
		return "0" + strconv.FormatInt(n, 10)
	}
	return strconv.FormatInt(n, 10)
}

// group puts a comma between each three digits of the integer part of a decimal string.
func group(s string) string {
	neg := strings.HasPrefix(s, "-")
	if neg {
		s = s[1:]
	}
	intPart, frac := s, ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		intPart, frac = s[:i], s[i:]
	}
	var b strings.Builder
	if neg && strings.Trim(s, "0.") != "" {
		b.WriteString("−")
	}
	for i, c := range intPart {
		if i > 0 && (len(intPart)-i)%3 == 0 {
			b.WriteByte(',')
		}
		b.WriteRune(c)
	}
	b.WriteString(frac)
	return b.String()
}

// dB formats a loss or margin in dB with two decimals.
func dB(x float64) string {
	s := strconv.FormatFloat(x, 'f', 2, 64)
	if s == "-0.00" {
		return "0.00"
	}
	return strings.Replace(s, "-", "−", 1)
}

// num formats an SVG coordinate with one decimal, never "-0.0".
func num(x float64) string {
	s := strconv.FormatFloat(x, 'f', 1, 64)
	if s == "-0.0" {
		return "0.0"
	}
	return s
}

// pct formats a fraction as a whole percentage.
func pct(f float64) string { return strconv.FormatFloat(100*f, 'f', 0, 64) + " %" }
