package segment

import (
	"context"
	"errors"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// A cancelled context ends the run before its preload, and one cancelled
// during the tension stage ends it after the increment in hand; either
// way Run returns the context's error.
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
	_, err = Run(ctx, spec, Options{Progress: func(done, _ int) {
		increments = done
		if done == 2 {
			cancel()
		}
	}})
	if !errors.Is(err, context.Canceled) || increments != 2 {
		t.Fatalf("cancelled at increment 2: %v after %d increments", err, increments)
	}
}
