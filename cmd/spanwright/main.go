// Command spanwright plans campus network backbones: routes, media, loss budgets and costs.
package main

import (
	"fmt"
	"os"

	"spanwright/route/escape"
)

func main() {
	ctx, signalled, stop := stopOnSignal()
	app := newApp()
	app.Writer = escape.NewTerminal(os.Stdout) // ids and names from the input, printed
	err := runApp(ctx, app, os.Args)
	escape.FlushTerminal(app.Writer)
	stop()
	code, msg := finalStatus(err, signalled())
	if msg != "" {
		fmt.Fprintf(escape.NewTerminal(os.Stderr), "spanwright: %s\n", msg)
	}
	stopProfile()
	os.Exit(code)
}
