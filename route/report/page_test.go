package report

import (
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestMarkupOnlyHere: outside page.go, nothing in the package turns a string into markup or
// template.HTML (or HTMLAttr, JS, URL) except a string literal, so text from the input can
// reach a page only through t's escaping or html/template's own. (The style sheet, our own
// embedded file, goes in as template.CSS.)
func TestMarkupOnlyHere(t *testing.T) {
	files, err := filepath.Glob("*.go")
	if err != nil {
		t.Fatal(err)
	}
	fset := token.NewFileSet()
	for _, name := range files {
		if strings.HasSuffix(name, "_test.go") || name == "page.go" {
			continue
		}
		src, err := os.ReadFile(name)
		if err != nil {
			t.Fatal(err)
		}
		f, err := parser.ParseFile(fset, name, src, 0)
		if err != nil {
			t.Fatal(err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			call, ok := n.(*ast.CallExpr)
			if !ok || len(call.Args) != 1 {
				return true
			}
			var what string
			switch fn := call.Fun.(type) {
			case *ast.Ident:
				if fn.Name == "markup" {
					what = "markup"
				}
			case *ast.SelectorExpr:
				if x, ok := fn.X.(*ast.Ident); ok && x.Name == "template" && (fn.Sel.Name == "HTML" || fn.Sel.Name == "HTMLAttr" ||
					fn.Sel.Name == "JS" || fn.Sel.Name == "URL") {
					what = "template." + fn.Sel.Name
				}
			}
			if what == "" {
				return true
			}
			if lit, ok := call.Args[0].(*ast.BasicLit); ok && lit.Kind == token.STRING {
				return true
			}
			t.Errorf("%s: %s(...) of a non-constant: use t() or a template", fset.Position(call.Pos()), what)
			return true
		})
	}
}
