package sparse

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// The same Q8 block assembled three ways (NewPattern + AddDense, Triplets,
// and AddDense fed only the block's lower triangle in idx order) must give
// the same matrix.
func TestAssemblyPathsAgree(t *testing.T) {
	groups, n := q8Mesh(4, 3)
	ke := q8Stiffness(210000, 0.3)
	viaPattern := q8Matrix(t, 4, 3)

	tr := NewTriplets(n, 0)
	for _, g := range groups {
		for r, gr := range g {
			for c, gc := range g {
				if gr >= gc { // one triangle, in either orientation
					tr.Add(gc, gr, ke[r*16+c])
				}
			}
		}
	}
	if err := tr.Err(); err != nil {
		t.Fatal(err)
	}
	viaTriplets := tr.Matrix()

	// Entries with idx[r] < idx[c] are poisoned: AddDense must not read them.
	viaLower, err := NewPattern(n, groups)
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range groups {
		kp := slices.Clone(ke)
		for r := range g {
			for c := range g {
				if g[r] < g[c] {
					kp[r*16+c] = math.NaN()
				}
			}
		}
		if err := viaLower.AddDense(g, kp); err != nil {
			t.Fatal(err)
		}
	}
	for name, m := range map[string]*Matrix{"triplets": viaTriplets, "lower triangle only": viaLower} {
		if !m.samePattern(viaPattern) {
			t.Errorf("%s: pattern differs from NewPattern's", name)
			continue
		}
		for p := range m.val {
			if d := math.Abs(m.val[p] - viaPattern.val[p]); d > 1e-9*math.Abs(viaPattern.val[p]) || math.IsNaN(m.val[p]) {
				t.Errorf("%s: entry %d = %g, want %g", name, p, m.val[p], viaPattern.val[p])
				break
			}
		}
	}
}

func TestNewPatternSmall(t *testing.T) {
	m, err := NewPattern(5, [][]int{{0, 3, -1}, {3, 4}, {}})
	if err != nil {
		t.Fatal(err)
	}
	wantPtr := []int{0, 2, 3, 4, 6, 7}
	wantRow := []int32{0, 3, 1, 2, 3, 4, 4}
	if !slices.Equal(m.colPtr, wantPtr) || !slices.Equal(m.rowIdx, wantRow) {
		t.Errorf("pattern %v %v, want %v %v", m.colPtr, m.rowIdx, wantPtr, wantRow)
	}
	if _, err := NewPattern(3, [][]int{{0, 3}}); !errors.Is(err, errIndex) {
		t.Errorf("index ≥ n: err = %v", err)
	}
	if _, err := NewPattern(-1, nil); err == nil {
		t.Error("negative n accepted")
	}
}

func TestAddDenseErrors(t *testing.T) {
	m, _ := NewPattern(4, [][]int{{0, 1}, {2, 3}})
	tests := []struct {
		name string
		idx  []int
		k    []float64
		want error
	}{
		{"outside pattern", []int{1, 2}, make([]float64, 4), errPattern},
		{"index too large", []int{0, 4}, make([]float64, 4), errIndex},
		{"wrong length", []int{0, 1}, make([]float64, 3), errLength},
		{"large block outside pattern", seq(0, 70, 4), make([]float64, 70*70), errPattern},
	}
	for _, tt := range tests {
		if err := m.AddDense(tt.idx, tt.k); !errors.Is(err, tt.want) {
			t.Errorf("%s: err = %v, want %v", tt.name, err, tt.want)
		}
	}
	// Skipped and repeated indices.
	m.Zero()
	if err := m.AddDense([]int{-1, 0, 0}, []float64{9, 9, 9, 9, 1, 2, 9, 3, 4}); err != nil {
		t.Fatal(err)
	}
	if got := m.At(0, 0); got != 10 { // all four (0,0) entries of the block
		t.Errorf("repeated index: At(0,0) = %g, want 10", got)
	}
}

// seq returns n indices cycling through 0…mod-1.
func seq(from, n, mod int) []int {
	s := make([]int, n)
	for i := range s {
		s[i] = (from + i) % mod
	}
	return s
}

func TestAddDenseLargeBlock(t *testing.T) {
	// A block bigger than sortSmall takes the binary-search path.
	const ne = 80
	idx := make([]int, ne)
	for i := range idx {
		idx[i] = (i * 7) % ne
	}
	m, _ := NewPattern(ne, [][]int{idx})
	k := make([]float64, ne*ne)
	for r := 0; r < ne; r++ {
		for c := 0; c < ne; c++ {
			k[r*ne+c] = float64(idx[r]*1000 + idx[c])
		}
	}
	if err := m.AddDense(idx, k); err != nil {
		t.Fatal(err)
	}
	for i := 0; i < ne; i++ {
		for j := 0; j <= i; j++ {
			if got, want := m.At(j, i), float64(i*1000+j); got != want {
				t.Fatalf("At(%d,%d) = %g, want %g", j, i, got, want)
			}
		}
	}
}

func TestTriplets(t *testing.T) {
	tr := NewTriplets(3, 2)
	tr.Add(0, 1, 1)
	tr.Add(1, 0, 2) // the same entry from the other triangle
	tr.Add(2, 2, 5)
	tr.Add(-1, 2, 7) // skipped
	tr.Add(3, 0, 1)  // dropped, remembered
	if tr.Len() != 3 {
		t.Errorf("Len = %d, want 3", tr.Len())
	}
	if !errors.Is(tr.Err(), errIndex) {
		t.Errorf("Err = %v", tr.Err())
	}
	m := tr.Matrix()
	if m.NNZ() != 4 || m.At(1, 0) != 3 || m.At(0, 1) != 3 || m.At(2, 2) != 5 || m.At(1, 1) != 0 {
		t.Errorf("matrix: nnz %d, entries %v %v", m.NNZ(), m.rowIdx, m.val)
	}
	if m.At(2, 0) != 0 || m.At(-1, 0) != 0 || m.At(5, 5) != 0 {
		t.Error("At outside the pattern or range is not 0")
	}
}

func TestMulVecCopyDiagonal(t *testing.T) {
	rnd := rand.New(rand.NewPCG(5, 6))
	m := randomSPD(50, 4, rnd)
	x := randVec(50, rnd)
	got := make([]float64, 50)
	m.MulVecTo(got, x)
	d := dense(m)
	for i := 0; i < 50; i++ {
		var want float64
		for j := 0; j < 50; j++ {
			want += d.At(i, j) * x[j]
		}
		if math.Abs(got[i]-want) > 1e-13*math.Abs(want)+1e-14 {
			t.Fatalf("MulVecTo[%d] = %g, want %g", i, got[i], want)
		}
	}
	c := m.Copy()
	c.val[0] = 123
	if m.val[0] == 123 {
		t.Error("Copy shares values")
	}
	diag := make([]float64, 50)
	m.Diagonal(diag)
	for i, v := range diag {
		if v != d.At(i, i) {
			t.Fatalf("Diagonal[%d] = %g, want %g", i, v, d.At(i, i))
		}
	}
	c.Zero()
	if slices.ContainsFunc(c.val, func(v float64) bool { return v != 0 }) || c.NNZ() != m.NNZ() {
		t.Error("Zero changed the pattern or left values")
	}
}

// A product large enough to be split over two goroutines equals the
// product taken column by column on one, to rounding.
func TestMulVecSplit(t *testing.T) {
	rnd := rand.New(rand.NewPCG(7, 8))
	m := randomSPD(30000, 6, rnd)
	if m.NNZ() < splitProductNNZ {
		t.Fatalf("%d entries: too few to split", m.NNZ())
	}
	x := randVec(m.n, rnd)
	got, want := make([]float64, m.n), make([]float64, m.n)
	m.MulVecTo(got, x)
	m.mulColumns(want, x, 0, m.n, 0)
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-13*(math.Abs(want[i])+1) {
			t.Fatalf("row %d: %g split, %g on one goroutine", i, got[i], want[i])
		}
	}
}

// A block added at its slots lands as AddDense adds it, to the last bit:
// blocks with skipped (negative) and repeated indices, in and out of
// order, small and larger than AddDense sorts on the stack; an entry
// outside the pattern is refused.
func TestAddSlotsIsAddDense(t *testing.T) {
	rnd := rand.New(rand.NewPCG(9, 10))
	const n = 120
	blocks := [][]int{
		{7, 3, -1, 12, 3},
		{0, 1, 2, 3},
		{119, 50, -1, -1, 60},
	}
	big := make([]int, sortSmall+6)
	for i := range big {
		big[i] = (i * 37) % n
	}
	blocks = append(blocks, big)
	m, err := NewPattern(n, blocks)
	if err != nil {
		t.Fatal(err)
	}
	viaDense, viaSlots := m.Copy(), m.Copy()
	for round := 0; round < 2; round++ {
		for _, idx := range blocks {
			k := randVec(len(idx)*len(idx), rnd)
			if err := viaDense.AddDense(idx, k); err != nil {
				t.Fatal(err)
			}
			sl, err := viaSlots.SlotsOf(idx)
			if err != nil {
				t.Fatal(err)
			}
			if err := viaSlots.AddSlots(sl, k); err != nil {
				t.Fatal(err)
			}
		}
	}
	for p := range viaDense.val {
		if math.Float64bits(viaDense.val[p]) != math.Float64bits(viaSlots.val[p]) {
			t.Fatalf("value %d: %v by AddDense, %v at the slots", p, viaDense.val[p], viaSlots.val[p])
		}
	}
	if _, err := m.SlotsOf([]int{0, 119}); err == nil {
		t.Error("a block outside the pattern got slots")
	}
}
