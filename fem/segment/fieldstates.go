package segment

import (
	"fmt"

	"flangeseg/fem/segment/figures"
)

// FieldStates are the kept states of a run that get a field file, in
// order, as the model's output.field_states chooses: all; the key states
// (figures.KeyRows: the end of the preload, the opening, the
// decompression, the peak, the last state); or the end of the preload,
// every N-th increment and the last state.
func (r *Result) FieldStates() []State {
	choice := r.Segment.Spec().Output.FieldChoice()
	if choice.All || len(r.States) == 0 {
		return r.States
	}
	chosen := map[int]bool{r.States[0].Row.Increment: true, r.States[len(r.States)-1].Row.Increment: true}
	if choice.Every > 0 {
		for _, st := range r.States {
			chosen[st.Row.Increment] = chosen[st.Row.Increment] || st.Row.Increment%choice.Every == 0
		}
	} else {
		for _, i := range figures.KeyRows(r.History) {
			chosen[r.History[i].Increment] = true
		}
	}
	var out []State
	for _, st := range r.States {
		if chosen[st.Row.Increment] {
			out = append(out, st)
		}
	}
	return out
}

// EvaluateFieldPoints computes the point results of the field states
// that the analysis kept as displacements only (laws without history):
// one element pass per field file instead of one per increment. Run
// calls it; call it again after changing the model's output.field_states.
func (r *Result) EvaluateFieldPoints() error {
	for _, st := range r.FieldStates() {
		sol := st.Solution
		if sol == nil || sol.Points != nil {
			continue
		}
		if err := sol.EvaluatePoints(); err != nil {
			return fmt.Errorf("%s: %w", st.Label, err)
		}
		if r.Segment.Spec().Analysis.LargeDeformation {
			pts, err := sol.CauchyPoints()
			if err != nil {
				return fmt.Errorf("%s: %w", st.Label, err)
			}
			sol.Points = pts
		}
	}
	return nil
}
