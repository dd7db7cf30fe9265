// Command spanwright plans campus network backbones: routes, media, loss budgets and costs.
package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"sync/atomic"
	"syscall"

	"spanwright/route/escape"
)

func main() {
	ctx, cancel := context.WithCancel(context.Background())
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM)
	var got atomic.Value // the signal that stopped the run
	go func() {
		s := <-sigs
		got.Store(s)
		cancel()
	}()
	app := newApp()
	app.Writer = escape.NewTerminal(os.Stdout) // ids and names from the input, printed
	err := runApp(ctx, app, os.Args)
	escape.FlushTerminal(app.Writer)
	signal.Stop(sigs)
	cancel()
	code := exitCode(err)
	if err != nil {
		msg := err.Error()
		if s, ok := got.Load().(syscall.Signal); ok && errors.Is(err, context.Canceled) {
			// One plain line: which signal, and what was written; not the context's "canceled".
			msg = stopLine(s, err)
			code = 128 + int(s) // the shell's convention: 130 for Ctrl-C, 143 for SIGTERM
		}
		fmt.Fprintf(escape.NewTerminal(os.Stderr), "spanwright: %s\n", msg)
	}
	stopProfile()
	os.Exit(code)
}
