package fem

import (
	"fmt"
	"sort"

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
}

func newAssembler(m *Model) *assembler {
	if m.eq == nil {
		m.Number()
	}
	maps := m.elementMaps()
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
	for e := range a.maps {
		em := &a.maps[e]
		nd := len(em.dofs)
		ue, fe := s.ue[:nd], s.fe[:nd]
		for i, d := range em.dofs {
			ue[i] = u[d]
		}
		var ke []float64
		if k != nil {
			ke = s.ke[:nd*nd]
		}
		var pe []PointResult
		if pts != nil {
			pe = pts[e]
		}
		if c := a.cached(e, nd); c != nil && pe == nil && a.m.eigen[a.m.mesh.Elements[e].Region] == ([4]float64{}) {
			mulVec(fe, c, ue)
			if ke != nil {
				copy(ke, c)
			}
		} else if err := a.m.elementResponse(e, ue, fe, ke, pe, s); err != nil {
			return err
		}
		for i, d := range em.dofs {
			fint[d] += fe[i]
		}
		if k == nil {
			continue
		}
		if em.t != nil {
			ke = a.transform(em, ke)
		}
		if err := k.AddDense(a.eqIdx[e], ke); err != nil {
			return fmt.Errorf("fem: element %d: %w", e, err)
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
