package segment

import (
	"errors"
	"fmt"
)

// InterruptedError is Result.Failure of a run whose context ended (the
// caller cancelled it: Ctrl-C, a batch scheduler's time limit). The run
// stopped at the next safe point — after the preload, after an increment
// of the tension stage, or between the levels of the closing search — and
// the Result holds every state that converged before it.
type InterruptedError struct {
	After string // the last converged state, in words
	Err   error  // the context's error
}

// Error says where the run stopped and why.
func (e *InterruptedError) Error() string {
	return fmt.Sprintf("interrupted after %s: %v", e.After, e.Err)
}

// Unwrap gives the context's error, for errors.Is(err, context.Canceled).
func (e *InterruptedError) Unwrap() error { return e.Err }

// IsInterrupted reports whether err (a Result.Failure) is an interruption.
func IsInterrupted(err error) bool {
	var ie *InterruptedError
	return errors.As(err, &ie)
}

// interrupt marks the analysis as stopped by the caller after its last
// converged state.
func (a *analysis) interrupt(err error) {
	after := lastState(a.rows)
	a.failure = &InterruptedError{After: after, Err: err}
	a.ending = "interrupted by the caller"
	a.diagnosis = fmt.Sprintf("The run was interrupted (%v) after %s. Every state up to that one converged and is kept; run the model again for the rest.", err, after)
}
