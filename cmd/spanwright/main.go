// Command spanwright plans campus network backbones: routes, media, loss budgets and costs.
package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"
	"syscall"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	app := newApp()
	err := app.RunContext(ctx, intersperse(app, os.Args))
	stop()
	if err != nil {
		fmt.Fprintf(os.Stderr, "spanwright: %v\n", err)
	}
	os.Exit(exitCode(err))
}
