package fatigue

import (
	"fmt"
	"math"
)

// Cycle is a counted cycle or half cycle: the load goes from From to To
// (in the order they occur in the history) and, for a full cycle, back.
type Cycle struct {
	From, To float64
	Count    float64 // 1 for a full cycle, 0.5 for a half cycle; a table may give any number
}

// Range returns |To − From|.
func (c Cycle) Range() float64 { return math.Abs(c.To - c.From) }

// Mean returns (From + To)/2.
func (c Cycle) Mean() float64 { return (c.From + c.To) / 2 }

// Min returns the smaller extreme.
func (c Cycle) Min() float64 { return math.Min(c.From, c.To) }

// Max returns the larger extreme.
func (c Cycle) Max() float64 { return math.Max(c.From, c.To) }

// Counter is a streaming rainflow counter after ASTM E1049-85, section
// 5.4.4. Add takes the samples in order; Counter reduces them to peaks and
// valleys on the fly and keeps on a stack only those not yet discarded, so
// its memory is the residue, not the history. Each cycle is handed to the
// sink as soon as the rules count it.
//
// The rules of 5.4.4, with X the most recent range, Y the one before it
// and S the starting point: while X ≥ Y, count Y as one cycle and discard
// its two points — or, if Y contains S, count Y as a half cycle, discard
// its first point and make its second the new S. At the end of the
// history (Finish) every range left on the stack, the residue, is counted
// as a half cycle, as step 6 of 5.4.4 says. The history is not assumed
// to repeat; a repeating block needs the standard's own procedure for
// repeating histories, which this counter does not apply.
//
// The first sample is taken as the first turning point (the history's
// start). Repeated equal samples and samples that continue a rise or a fall
// are not turning points.
type Counter struct {
	sink     func(Cycle) error
	stack    []float64 // turning points not discarded; stack[0] is S
	last     float64   // latest sample: the candidate for the next turning point
	dir      int       // +1 rising, −1 falling, 0 before the first change
	samples  int
	maxStack int
}

// NewCounter returns a counter that hands every cycle to sink. An error
// from sink stops the count: Add or Finish returns it.
func NewCounter(sink func(Cycle) error) *Counter {
	return &Counter{sink: sink}
}

// Add feeds the next sample of the history. It fails on a sample that is
// not finite or when the sink fails.
func (c *Counter) Add(x float64) error {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return fmt.Errorf("fatigue: rainflow: sample %d is %v: must be finite", c.samples, x)
	}
	c.samples++
	if c.samples == 1 {
		c.last = x
		return nil
	}
	d := x - c.last
	var err error
	switch {
	case d == 0:
		return nil
	case c.dir == 0: // the first change: the first sample is the starting point
		err = c.push(c.last)
		c.dir = sign(d)
	case sign(d) != c.dir: // a reversal: the latest sample was a peak or valley
		err = c.push(c.last)
		c.dir = -c.dir
	}
	c.last = x
	return err
}

// Finish ends the history: the last sample is the last turning point, and
// the residue is counted as half cycles from the oldest range to the
// newest. The counter is then empty and counts a new history.
func (c *Counter) Finish() error {
	defer c.reset()
	if c.dir == 0 {
		return nil // fewer than two distinct samples: no range at all
	}
	if err := c.push(c.last); err != nil {
		return err
	}
	for i := 0; i+1 < len(c.stack); i++ {
		if err := c.sink(Cycle{From: c.stack[i], To: c.stack[i+1], Count: 0.5}); err != nil {
			return err
		}
	}
	return nil
}

// Samples returns the number of samples added since the last Finish.
func (c *Counter) Samples() int { return c.samples }

// MaxStack returns the largest number of turning points the counter has
// held at once since it was made: its memory in float64 values.
func (c *Counter) MaxStack() int { return c.maxStack }

func (c *Counter) reset() {
	c.stack, c.samples, c.dir, c.last = c.stack[:0], 0, 0, 0
}

// push adds a turning point and applies steps 2 to 5 of 5.4.4.
func (c *Counter) push(p float64) error {
	c.stack = append(c.stack, p)
	c.maxStack = max(c.maxStack, len(c.stack))
	for {
		n := len(c.stack)
		if n < 3 {
			return nil
		}
		x := math.Abs(c.stack[n-1] - c.stack[n-2])
		y := math.Abs(c.stack[n-2] - c.stack[n-3])
		if x < y {
			return nil
		}
		if n == 3 { // Y contains the starting point S = stack[0]
			if err := c.sink(Cycle{From: c.stack[0], To: c.stack[1], Count: 0.5}); err != nil {
				return err
			}
			c.stack[0], c.stack[1] = c.stack[1], c.stack[2]
			c.stack = c.stack[:2]
			continue
		}
		if err := c.sink(Cycle{From: c.stack[n-3], To: c.stack[n-2], Count: 1}); err != nil {
			return err
		}
		c.stack[n-3] = c.stack[n-1]
		c.stack = c.stack[:n-2]
	}
}

func sign(x float64) int {
	if x > 0 {
		return 1
	}
	return -1
}

// Count counts a whole history held in memory and returns its cycles in
// the order the rules count them, the residue last.
func Count(history []float64) ([]Cycle, error) {
	var out []Cycle
	c := NewCounter(func(cy Cycle) error {
		out = append(out, cy)
		return nil
	})
	for _, x := range history {
		if err := c.Add(x); err != nil {
			return nil, err
		}
	}
	if err := c.Finish(); err != nil {
		return nil, err
	}
	return out, nil
}
