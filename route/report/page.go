package report

import (
	"html/template"
	"strings"
)

// The map and the long tables are written by Go code rather than by the templates (an order
// of magnitude faster on large campuses), through a builder that cannot emit unescaped text:
// page.w takes only markup, and only constant strings convert to markup implicitly. Text
// from the campus, the plan or the catalog becomes markup only through t, which escapes it
// with html/template's escaper. TestMarkupOnlyHere keeps every other conversion to markup or
// template.HTML out of the package.

// markup is HTML written by this package: a constant, or text escaped by t.
type markup string

// t escapes text for use in HTML text or a double-quoted attribute value.
func t(text string) markup { return markup(template.HTMLEscapeString(text)) }

// page accumulates HTML.
type page struct{ b strings.Builder }

// w writes markup.
func (p *page) w(ms ...markup) {
	for _, m := range ms {
		p.b.WriteString(string(m))
	}
}

// html is what was written, for a template.
func (p *page) html() template.HTML { return template.HTML(p.b.String()) }
