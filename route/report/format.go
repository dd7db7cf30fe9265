package report

import (
	"spanwright/route/output"
	"strconv"
	"strings"
)

// Options say how a report is rendered.
type Options struct {
	// Units is output.UnitsMetric (default) or output.UnitsImperial: lengths in the report's
	// text, tables and scale bar. Losses stay in dB and fill in mm².
	Units string
}

func (o Options) imperial() bool { return o.Units == output.UnitsImperial }

// lengthUnit is the unit lengths are shown in.
func (o Options) lengthUnit() string {
	if o.imperial() {
		return "ft"
	}
	return "m"
}

// forceUnit is the unit forces are shown in.
func (o Options) forceUnit() string {
	if o.imperial() {
		return "lbf"
	}
	return "N"
}

// sidewallUnit is the unit sidewall bearing pressure is shown in.
func (o Options) sidewallUnit() string {
	if o.imperial() {
		return "lbf/ft"
	}
	return "N/m"
}

// length formats metres in the report's unit with one decimal and thousands separators.
func (o Options) length(m float64) string {
	if o.imperial() {
		m *= output.FtPerM
	}
	return group(strconv.FormatFloat(m, 'f', 1, 64))
}

// lengthU is length with its unit.
func (o Options) lengthU(m float64) string { return o.length(m) + " " + o.lengthUnit() }

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
