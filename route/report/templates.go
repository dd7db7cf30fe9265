package report

import (
	"embed"
	"html/template"
	"sync"
)

//go:embed tmpl/*.tmpl tmpl/style.css
var tmplFS embed.FS

var styleCSS = mustRead("tmpl/style.css")

func mustRead(name string) string {
	b, err := tmplFS.ReadFile(name)
	if err != nil {
		panic("report: embedded file missing: " + name)
	}
	return string(b)
}

// templates parses the embedded templates once; a template that does not parse is a
// programmer's error.
var templates = sync.OnceValue(func() *template.Template {
	return template.Must(template.New("report").ParseFS(tmplFS, "tmpl/*.tmpl"))
})
