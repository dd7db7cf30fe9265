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
	if err != nil {
		fmt.Fprintf(escape.NewTerminal(os.Stderr), "spanwright: %v\n", err)
	}
	stopProfile()
	code := exitCode(err)
	if s, ok := got.Load().(syscall.Signal); ok && err != nil && errors.Is(err, context.Canceled) {
		code = 128 + int(s) // the shell's convention: 130 for Ctrl-C, 143 for SIGTERM
	}
	os.Exit(code)
}
