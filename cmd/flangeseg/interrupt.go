package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"
	"syscall"
)

// interruptible returns a context that ends at the first SIGINT or SIGTERM
// (Ctrl-C, a batch scheduler's time limit): the analysis then stops at
// its next safe point and the command writes what converged. The first
// signal also gives the signals back their default action, so a second
// one ends the process at once. release stops listening; call it when
// the command is done.
func interruptible() (ctx context.Context, release func()) {
	signals := make(chan os.Signal, 1)
	signal.Notify(signals, os.Interrupt, syscall.SIGTERM)
	ctx, cancel := context.WithCancelCause(context.Background())
	done := make(chan struct{})
	go func() {
		select {
		case s := <-signals:
			signal.Stop(signals)
			cancel(fmt.Errorf("%w by signal %q", context.Canceled, s))
		case <-done:
		}
	}()
	return ctx, func() {
		signal.Stop(signals)
		close(done)
		cancel(nil)
	}
}
