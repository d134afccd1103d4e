package assess

import (
	"math"

	"flangeseg/post/fatigue"
)

// Add tallies one segment-force cycle (N) through every function, as
// Count does for each cycle of the load file, and counts it in Info. It
// is for callers that make the cycles themselves: the ring check hands
// each bolt its own share of the tower loads.
func (j *Job) Add(c fatigue.Cycle) error {
	if j.info.Cycles == 0 {
		j.info.ZMin, j.info.ZMax = c.Min(), c.Max()
	}
	j.info.Cycles += c.Count
	j.info.ZMin, j.info.ZMax = min(j.info.ZMin, c.Min()), max(j.info.ZMax, c.Max())
	for _, b := range j.fns {
		if err := b.add(j.miner, c); err != nil {
			return err
		}
	}
	return nil
}

// Bins are the function's stress range bins of the given width (MPa,
// rounded to a multiple of FineBin), up to its largest range.
func (b *Function) Bins(width float64) []fatigue.Bin {
	return b.spec.Bins(max(1, int(math.Round(width/FineBin))), 0)
}
