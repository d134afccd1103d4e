package fatigue

import (
	"io"
	"math/rand/v2"
	"strconv"
	"testing"
)

const benchSamples = 10_000_000

// signal is a deterministic random segment-force history, N: a
// first-order autoregressive process about a mean of 150 kN with
// 60 kN standard deviation, so that turning points come every few samples
// as in a measured tower load.
type signal struct {
	rng *rand.Rand
	z   float64
}

func newSignal() *signal { return &signal{rng: rand.New(rand.NewPCG(7, 11))} }

func (s *signal) next() float64 {
	s.z = 0.8*s.z + 0.6*60e3*s.rng.NormFloat64()
	return 150e3 + s.z
}

// benchDamage is the bolt of the demo kind: an M48 on the invented
// trilinear function of the tests, γ_Mf = 1.15.
func benchDamage(b *testing.B) func(Cycle) error {
	f, err := NewBoltForceFunction([]float64{0, 150e3, 300e3, 2000e3}, []float64{1000e3, 1022.5e3, 1065e3, 4125e3}, nil)
	if err != nil {
		b.Fatal(err)
	}
	tr, _ := NewTransfer(f, 1473, Axial)
	curve, _ := Bolt(48)
	m, _ := NewMiner(curve, 1.15)
	spec, _ := NewSpectrum(0.1)
	var d float64
	return func(c Cycle) error {
		ds, err := tr.Range(c)
		if err != nil {
			return err
		}
		dd := m.Damage(ds, c.Count)
		d += dd
		return spec.Add(ds, c.Count, dd)
	}
}

// BenchmarkRainflowDamage streams 10⁷ samples through the rainflow
// counter, the transfer, Miner's sum and the spectrum. Memory is the
// counter's stack (reported as stack-points) and the spectrum's bins; the
// allocations per run stay a handful whatever the length of the history.
func BenchmarkRainflowDamage(b *testing.B) {
	b.ReportAllocs()
	var stack int
	for b.Loop() {
		s := newSignal()
		c := NewCounter(benchDamage(b))
		for range benchSamples {
			if err := c.Add(s.next()); err != nil {
				b.Fatal(err)
			}
		}
		stack = c.MaxStack()
		if err := c.Finish(); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(stack), "stack-points")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/benchSamples, "ns/sample")
}

// seriesReader produces a segment-force CSV of n samples on the fly, so
// that the benchmark reads a 10⁷-line file without holding it anywhere.
type seriesReader struct {
	s    *signal
	left int
	buf  []byte
	head bool
}

func (r *seriesReader) Read(p []byte) (int, error) {
	for len(r.buf) < len(p) && (r.left > 0 || !r.head) {
		if !r.head {
			r.buf, r.head = append(r.buf, "Z_kN\n"...), true
			continue
		}
		r.buf = strconv.AppendFloat(r.buf, r.s.next()/1e3, 'f', 3, 64)
		r.buf = append(r.buf, '\n')
		r.left--
	}
	if len(r.buf) == 0 {
		return 0, io.EOF
	}
	n := copy(p, r.buf)
	r.buf = r.buf[:copy(r.buf, r.buf[n:])]
	return n, nil
}

// BenchmarkReadLoadsSeries reads a 10⁷-line segment-force CSV through
// ReadLoads (CSV parsing, rainflow, transfer, damage, spectrum).
func BenchmarkReadLoadsSeries(b *testing.B) {
	b.ReportAllocs()
	var info LoadInfo
	for b.Loop() {
		var err error
		info, err = ReadLoads(&seriesReader{s: newSignal(), left: benchSamples}, Tower{}, benchDamage(b))
		if err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(info.MaxStack), "stack-points")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/benchSamples, "ns/sample")
}
