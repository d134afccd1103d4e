package fem

import (
	"fmt"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"

	"flangeseg/material"

	"flangeseg/fem/sparse"
)

// elementMap carries an element's node dofs to independent dofs: element
// dof i has the value Σ_j t[i·len(indep)+j]·u[indep[j]]. For an element with
// no rigid-edge nodes t is nil and indep equals the element dofs.
type elementMap struct {
	dofs  []Dof // the element's node dofs, x and z per node
	indep []Dof
	t     []float64
}

func (m *Model) elementMaps() []elementMap {
	maps := make([]elementMap, len(m.mesh.Elements))
	for e, el := range m.mesh.Elements {
		dofs := make([]Dof, 0, 2*len(el.Nodes))
		tied := false
		for _, n := range el.Nodes {
			dx, dz := m.NodeDof(n, X), m.NodeDof(n, Z)
			dofs = append(dofs, dx, dz)
			tied = tied || m.depends[dx] != nil || m.depends[dz] != nil
		}
		em := elementMap{dofs: dofs, indep: dofs}
		if tied {
			em.indep, em.t = m.tieMap(dofs)
		}
		maps[e] = em
	}
	return maps
}

// tieMap builds the transformation of a set of dofs, some of them tied.
func (m *Model) tieMap(dofs []Dof) ([]Dof, []float64) {
	seen := map[Dof]bool{}
	var indep []Dof
	for _, d := range dofs {
		if m.depends[d] == nil {
			if !seen[d] {
				seen[d] = true
				indep = append(indep, d)
			}
			continue
		}
		for _, t := range m.depends[d] {
			if !seen[t.master] {
				seen[t.master] = true
				indep = append(indep, t.master)
			}
		}
	}
	sort.Slice(indep, func(i, j int) bool { return indep[i] < indep[j] })
	col := map[Dof]int{}
	for j, d := range indep {
		col[d] = j
	}
	t := make([]float64, len(dofs)*len(indep))
	for i, d := range dofs {
		if m.depends[d] == nil {
			t[i*len(indep)+col[d]] = 1
			continue
		}
		for _, tm := range m.depends[d] {
			t[i*len(indep)+col[tm.master]] += tm.coef
		}
	}
	return indep, t
}

// equationGroups lists each element's equation numbers, for the pattern.
func (m *Model) equationGroups(maps []elementMap) [][]int {
	groups := make([][]int, len(maps))
	for e, em := range maps {
		g := make([]int, len(em.indep))
		for j, d := range em.indep {
			g[j] = m.eq[d]
		}
		groups[e] = g
	}
	return groups
}

// assembler holds what repeated assemblies on one numbering share.
type assembler struct {
	// linear caches the stiffness of elements whose response is linear
	// (elastic law, small strain, standard formulation): their tangent
	// never changes, so a Newton iteration only multiplies it out. stamp
	// is the model's stamp the cache was built for.
	linear [][]float64
	stamp  int
	m      *Model
	maps   []elementMap
	eqIdx  [][]int // per element, equation of each independent dof (−1 if none)
	s      *scratch
	kt     []float64 // Tᵀ·ke·T
	tmp    []float64
	// Buffers of the elements evaluated in an assembly: their indices,
	// forces and tangents (maxElementDofs-strided slots), and the scratch
	// of the workers beyond the first.
	work    []int
	fe, ke  []float64
	scratch []*scratch
	// dup, if set, is a change of the dof values (all dofs, tied ones
	// expanded); a tangent assembly then also adds K·dup, the linear
	// change of the internal forces, into kdup (all dofs, node level).
	dup, kdup []float64
	// slots: where each element's block goes in the values of slotsOf
	// (found once per pattern); searched: the matrix the last whole
	// assembly searched the pattern of.
	slots             []sparse.Slots
	slotsOf, searched *sparse.Matrix
}

func newAssembler(m *Model) *assembler {
	if m.eq == nil {
		m.Number()
	}
	maps := m.elementMaps()
	m.cacheGeometry()
	return &assembler{m: m, maps: maps, eqIdx: m.equationGroups(maps), s: newScratch()}
}

// pattern returns the sparsity pattern of the tangent in equation space.
func (a *assembler) pattern() (*sparse.Matrix, error) {
	return sparse.NewPattern(a.m.nEq, a.eqIdx)
}

// assemble computes the internal force at displacements u (all dofs; tied
// dofs must be expanded) into fint (all dofs, node level: tied dofs keep
// their own force, see Model.reduce) and, if k is not nil, the tangent in
// equation space. pts, if not nil, receives the integration point results
// per element.
func (a *assembler) assemble(u, fint []float64, k *sparse.Matrix, pts [][]PointResult) error {
	for i := range fint {
		fint[i] = 0
	}
	if k != nil {
		k.Zero()
	}
	s := a.s
	// Elements with a cached linear stiffness cost a product; the others
	// (yielding, finite strain, eigenstrain, point output) are evaluated
	// first, side by side on all cores, into per-element buffers, and
	// then everything is summed in element order, so the result does not
	// depend on the number of cores.
	work := a.work[:0]
	for e := range a.maps {
		nd := len(a.maps[e].dofs)
		if pts == nil && a.m.eigen[a.m.mesh.Elements[e].Region] == ([4]float64{}) && a.cached(e, nd) != nil {
			continue
		}
		work = append(work, e)
	}
	a.work = work
	if err := a.evaluate(work, u, k != nil, pts); err != nil {
		return err
	}
	next := 0
	for e := range a.maps {
		em := &a.maps[e]
		nd := len(em.dofs)
		var fe, ke []float64
		if next < len(work) && work[next] == e {
			fe = a.fe[next*maxElementDofs : next*maxElementDofs+nd]
			if k != nil {
				ke = a.ke[next*maxElementDofs*maxElementDofs : next*maxElementDofs*maxElementDofs+nd*nd]
			}
			next++
		} else {
			c := a.cached(e, nd)
			ue := s.ue[:nd]
			for i, d := range em.dofs {
				ue[i] = u[d]
			}
			fe = s.fe[:nd]
			mulVec(fe, c, ue)
			ke = c
		}
		for i, d := range em.dofs {
			fint[d] += fe[i]
		}
		if k == nil {
			continue
		}
		if a.dup != nil {
			addProduct(a.kdup, a.dup, em.dofs, ke)
		}
		if em.t != nil {
			ke = a.transform(em, ke)
		}
		if err := a.addElement(k, e, ke); err != nil {
			return err
		}
	}
	if k != nil {
		a.searched = k
	}
	return nil
}

// addElement adds element e's block ke (in equation space) to k: at the
// element's slots from the second assembly into k on; the first searches
// the pattern (an elastic model assembles its tangent once a pattern, and
// finding the slots costs about what one search of every block does).
func (a *assembler) addElement(k *sparse.Matrix, e int, ke []float64) error {
	if a.slotsOf != k && a.searched != k {
		if err := k.AddDense(a.eqIdx[e], ke); err != nil {
			return fmt.Errorf("fem: element %d: %w", e, err)
		}
		return nil
	}
	if a.slotsOf != k {
		a.slots, a.slotsOf = make([]sparse.Slots, len(a.eqIdx)), nil
		for i, idx := range a.eqIdx {
			sl, err := k.SlotsOf(idx)
			if err != nil {
				return fmt.Errorf("fem: element %d: %w", i, err)
			}
			a.slots[i] = sl
		}
		a.slotsOf = k
	}
	if err := k.AddSlots(a.slots[e], ke); err != nil {
		return fmt.Errorf("fem: element %d: %w", e, err)
	}
	return nil
}

// evaluate computes the response of the listed elements into a.fe and
// a.ke (slot i for work[i]), on all cores when the list is long. The first
// error in element order is returned.
func (a *assembler) evaluate(work []int, u []float64, tangent bool, pts [][]PointResult) error {
	if n := len(work) * maxElementDofs; cap(a.fe) < n {
		a.fe = make([]float64, n)
	}
	if n := len(work) * maxElementDofs * maxElementDofs; tangent && cap(a.ke) < n {
		a.ke = make([]float64, n)
	}
	a.fe = a.fe[:cap(a.fe)]
	a.ke = a.ke[:cap(a.ke)]
	errs := make([]error, len(work))
	one := func(i int, s *scratch) {
		e := work[i]
		em := &a.maps[e]
		nd := len(em.dofs)
		ue := s.ue[:nd]
		for j, d := range em.dofs {
			ue[j] = u[d]
		}
		fe := a.fe[i*maxElementDofs : i*maxElementDofs+nd]
		var ke []float64
		if tangent {
			ke = a.ke[i*maxElementDofs*maxElementDofs : i*maxElementDofs*maxElementDofs+nd*nd]
		}
		var pe []PointResult
		if pts != nil {
			pe = pts[e]
		}
		errs[i] = a.m.elementResponse(e, ue, fe, ke, pe, s)
	}
	workers := min(runtime.NumCPU(), len(work)/64+1)
	if workers <= 1 {
		for i := range work {
			one(i, a.s)
		}
	} else {
		var next atomic.Int64
		var wg sync.WaitGroup
		for w := 0; w < workers; w++ {
			s := a.s
			if w > 0 {
				for len(a.scratch) < w {
					a.scratch = append(a.scratch, newScratch())
				}
				s = a.scratch[w-1]
			}
			wg.Go(func() {
				const chunk = 16
				for {
					lo := int(next.Add(chunk)) - chunk
					if lo >= len(work) {
						return
					}
					for i := lo; i < min(lo+chunk, len(work)); i++ {
						one(i, s)
					}
				}
			})
		}
		wg.Wait()
	}
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// transform returns Tᵀ·ke·T for an element with tied dofs.
func (a *assembler) transform(em *elementMap, ke []float64) []float64 {
	nd, ni := len(em.dofs), len(em.indep)
	if cap(a.tmp) < nd*ni {
		a.tmp = make([]float64, nd*ni)
	}
	if cap(a.kt) < ni*ni {
		a.kt = make([]float64, ni*ni)
	}
	kt, tmp := a.kt[:ni*ni], a.tmp[:nd*ni]
	for r := 0; r < nd; r++ { // tmp = ke·T
		for c := 0; c < ni; c++ {
			v := 0.0
			for q := 0; q < nd; q++ {
				v += ke[r*nd+q] * em.t[q*ni+c]
			}
			tmp[r*ni+c] = v
		}
	}
	for r := 0; r < ni; r++ { // kt = Tᵀ·tmp
		for c := 0; c < ni; c++ {
			v := 0.0
			for q := 0; q < nd; q++ {
				v += em.t[q*ni+r] * tmp[q*ni+c]
			}
			kt[r*ni+c] = v
		}
	}
	return kt
}

// cacheLimit bounds the memory of cached element stiffnesses (values).
const cacheLimit = 1 << 26

// cached returns the stored stiffness of a linear element, computing it
// on first use; nil for an element whose response is not linear.
func (a *assembler) cached(e, nd int) []float64 {
	m := a.m
	if a.linear == nil || a.stamp != m.stamp {
		if len(m.mesh.Elements)*nd*nd > cacheLimit {
			return nil
		}
		a.linear, a.stamp = make([][]float64, len(m.mesh.Elements)), m.stamp
	}
	if c := a.linear[e]; c != nil {
		return c
	}
	if _, ok := m.kin.(SmallStrain); !ok || m.opt.Formulation != Standard {
		return nil
	}
	if _, ok := m.laws[m.mesh.Elements[e].Region].(material.Elastic); !ok {
		return nil
	}
	ue := make([]float64, nd)
	fe := make([]float64, nd)
	ke := make([]float64, nd*nd)
	eig := m.eigen[m.mesh.Elements[e].Region]
	m.eigen[m.mesh.Elements[e].Region] = [4]float64{}
	err := m.elementResponse(e, ue, fe, ke, nil, newScratch())
	m.eigen[m.mesh.Elements[e].Region] = eig
	if err != nil {
		return nil
	}
	a.linear[e] = ke
	return ke
}

// addProduct adds k·x over dofs to y: k is a square row-major block over
// the dofs, x and y are indexed by dof.
func addProduct[D ~int](y, x []float64, dofs []D, k []float64) {
	n := len(dofs)
	for c, dc := range dofs {
		xc := x[dc]
		if xc == 0 {
			continue
		}
		for r, dr := range dofs {
			y[dr] += k[r*n+c] * xc
		}
	}
}

// mulVec sets dst = k·x for a square row-major k.
func mulVec(dst, k, x []float64) {
	n := len(x)
	for r := range dst {
		v := 0.0
		row := k[r*n : (r+1)*n]
		for c, xc := range x {
			v += row[c] * xc
		}
		dst[r] = v
	}
}

// allLinear reports whether every element's response is linear, its
// stiffness cached.
func (a *assembler) allLinear() bool {
	for e := range a.maps {
		if a.cached(e, len(a.maps[e].dofs)) == nil {
			return false
		}
	}
	return true
}

// addLinearTangent adds every element's cached stiffness to k (all must
// be linear, see allLinear).
func (a *assembler) addLinearTangent(k *sparse.Matrix) error {
	for e := range a.maps {
		em := &a.maps[e]
		ke := a.cached(e, len(em.dofs))
		if ke == nil {
			return fmt.Errorf("fem: element %d is not linear", e)
		}
		if em.t != nil {
			ke = a.transform(em, ke)
		}
		if err := a.addElement(k, e, ke); err != nil {
			return err
		}
	}
	a.searched = k
	return nil
}
