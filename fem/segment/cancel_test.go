package segment

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// A cancelled context ends the run before its preload with the context's
// error; one cancelled during the tension stage ends it after the
// increment in hand, with the increments so far and an *InterruptedError
// that wraps the context's error.
func TestRunCancelled(t *testing.T) {
	spec, err := modelfile.Decode(demoModels()[0].Data)
	if err != nil {
		t.Fatal(err)
	}
	spec.Mesh.Size, spec.Load.Increments = 16, 4
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, spec, Options{}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled before the run: %v, want context.Canceled", err)
	}
	ctx, cancel = context.WithCancel(context.Background())
	defer cancel()
	increments := 0
	res, err := Run(ctx, spec, Options{Progress: func(done, _ int) {
		increments = done
		if done == 2 {
			cancel()
		}
	}})
	if err != nil || increments != 2 {
		t.Fatalf("cancelled at increment 2: %v after %d increments", err, increments)
	}
	if !errors.Is(res.Failure, context.Canceled) || !IsInterrupted(res.Failure) {
		t.Fatalf("failure %v, want an interruption", res.Failure)
	}
	// The run stops right after the increment for which Progress first
	// reported two of the four increments done (the loaded edge at
	// 2/4 of its travel, rounded as Progress rounds).
	last := res.History[len(res.History)-1]
	for _, r := range res.History[1:] {
		if done := math.Round(4 * r.U / spec.Load.MaxDisplacement); done >= 2 && r.Increment != last.Increment {
			t.Fatalf("ran past increment %d (u = %g mm) to %d", r.Increment, r.U, last.Increment)
		}
	}
	if done := math.Round(4 * last.U / spec.Load.MaxDisplacement); done != 2 {
		t.Fatalf("last row at u = %g mm: %g of 4 increments done, want 2", last.U, done)
	}
	if st := res.States[len(res.States)-1]; st.Label != fmt.Sprintf("increment %d", last.Increment) {
		t.Errorf("last state kept %q, want that of increment %d", st.Label, last.Increment)
	}
	if !strings.Contains(res.Diagnosis, "interrupted") || res.Ending != "interrupted by the caller" {
		t.Errorf("ending %q, diagnosis %q", res.Ending, res.Diagnosis)
	}
}
