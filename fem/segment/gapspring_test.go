package segment

import (
	"context"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// TestGapSpring checks contact.gap_spring on the coarse demo joint with a
// parallel gap g: where k·g is below the preload the faces close and the
// clamp force left on them is the preload less k·g (equilibrium of the
// upper flange: bolt = contact + spring); where k·g is above it the gap
// stays open, the faces carry nothing and the spring carries the whole
// preload, its mean approach under the washers F_p/k.
func TestGapSpring(t *testing.T) {
	const gap = 0.2
	for _, c := range []struct {
		name   string
		k      float64 // N/mm
		closes bool
	}{
		{"closes", 2e6, true},
		{"held open", 1e7, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			spec, err := modelfile.Decode(demoModels()[0].Data)
			if err != nil {
				t.Fatal(err)
			}
			spec.Mesh.Size, spec.Load.Increments, spec.Load.MaxDisplacement = 20, 2, 0.1
			spec.Contact.ParallelGap, spec.Contact.GapSpring = gap, c.k
			res, err := Run(context.Background(), spec, Options{})
			if err != nil || res.Failure != nil {
				t.Fatalf("run: %v %v", err, res.Failure)
			}
			pre := res.History[0]
			var clamp float64
			for _, f := range pre.ZoneForce {
				clamp += f
			}
			cl := res.Figures.Closure
			if cl == nil {
				t.Fatal("no face_closure for a joint whose faces start apart")
			}
			if c.closes {
				if want := pre.Fs - c.k*gap; !near(clamp, want, 0.005) || cl.GapLeftMM > 1e-3 {
					t.Errorf("clamp force %.1f kN, want F_p − k·g = %.1f kN; gap left %g mm, want closed", clamp/1e3, want/1e3, cl.GapLeftMM)
				}
				return
			}
			// The largest gap left is at the face's ends, which the flanges'
			// bending about the washers leaves a little wider than the mean
			// under the washers, g − F_p/k.
			if clamp > 1e-3*pre.Fs || cl.GapLeftMM < gap-pre.Fs/c.k || cl.GapLeftMM > gap-0.5*pre.Fs/c.k {
				t.Errorf("clamp force %.3g kN, want none; gap left %g mm, want from g − F_p/k = %g mm to g − F_p/(2k)", clamp/1e3, cl.GapLeftMM, gap-pre.Fs/c.k)
			}
		})
	}
}
