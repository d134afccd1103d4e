package fem

// The solver's tangent: its sparsity pattern, grown as contact couples
// new dofs, and the assembly of element and contact forces into it.

import (
	"flangeseg/fem/sparse"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"time"
)

// groupKey identifies a coupling group by its sorted equations.
func groupKey(g []int) string {
	q := slices.Clone(g)
	slices.Sort(q)
	var b strings.Builder
	for _, v := range q {
		if v >= 0 {
			b.WriteString(strconv.Itoa(v))
			b.WriteByte(',')
		}
	}
	return b.String()
}

// ensurePattern adds the contact couplings at the current positions to the
// pattern, rebuilding it (and the symbolic analysis) when one is new.
func (s *Solver) ensurePattern() error {
	s.updateCurrent()
	fresh := false
	for _, p := range s.pairs {
		for _, dofs := range p.Couplings(s.cur) {
			g := s.equations(dofs)
			key := groupKey(g)
			if s.seen[key] {
				continue
			}
			s.seen[key] = true
			s.groups = append(s.groups, g)
			// The contact equations are coupled densely already.
			fresh = fresh || s.cs == nil || !s.cs.covers(g)
		}
	}
	if !fresh && !s.unanalysed {
		return nil
	}
	return s.rebuild()
}

// equations maps node dofs to equations (tied dofs to their masters).
func (s *Solver) equations(dofs []int) []int {
	var g []int
	for _, d := range dofs {
		if ts := s.m.depends[d]; ts != nil {
			for _, t := range ts {
				g = append(g, s.m.eq[t.master])
			}
			continue
		}
		g = append(g, s.m.eq[d])
	}
	return g
}

func (s *Solver) rebuild() error {
	start := time.Now()
	// Nested dissection costs more to compute but halves the work of each
	// factorization on large meshes; a Newton run factors many times.
	ord := sparse.OrderAMD
	if s.m.nEq > 50000 {
		ord = sparse.OrderNestedDissection
	}
	k, sym, cs, err := s.analyseContactSpace(ord)
	if err != nil {
		return err
	}
	if cs == nil {
		if k, err = sparse.NewPattern(s.m.nEq, s.groups); err != nil {
			return fmt.Errorf("fem: sparsity pattern: %w", err)
		}
		if sym, err = sparse.Analyze(k, ord); err != nil {
			return fmt.Errorf("fem: ordering: %w", err)
		}
	}
	s.k, s.sym, s.cs, s.klin = k, sym, cs, nil
	s.unanalysed = false
	if cs != nil {
		if err := s.a.addLinearTangent(k); err != nil {
			return err
		}
		s.klin = k.Copy()
	}
	s.kFull = false
	s.factorOK = false
	s.Timing.Analysis += time.Since(start)
	s.Timing.Analyses++
	return nil
}

// assemble computes internal and contact forces and, if tangent, the
// tangent at s.u.
func (s *Solver) assemble(tangent bool) error {
	// With a contact space the elements' part of the tangent is constant
	// (klin): a tangent assembly collects only the contact stiffness, and
	// the whole tangent is put together when it is needed (wholeTangent).
	lazy := tangent && s.cs != nil && s.a.dup == nil && s.opt.Inspect == nil
	var k *sparse.Matrix
	if tangent && !lazy {
		k = s.k
	}
	start := time.Now()
	if err := s.a.assemble(s.u, s.fint, k, nil); err != nil {
		return err
	}
	mid := time.Now()
	s.Timing.Assembly += mid.Sub(start)
	s.updateCurrent()
	if tangent {
		s.couplings = s.couplings[:0]
		s.factorStale = true
		s.kFull = !lazy
		if s.cs != nil {
			clear(s.cs.kc)
		}
	}
	for _, p := range s.pairs {
		err := p.Evaluate(s.cur, tangent, func(dofs []int, f, kc []float64) error {
			return s.addContact(dofs, f, kc, k, tangent)
		})
		if err != nil {
			return fmt.Errorf("fem: contact %q: %w", p.Name(), err)
		}
		if tangent {
			for _, b := range p.SlidingCouplings() {
				eqs, kb := s.toEquations(b.Dofs, b.K)
				s.couplings = append(s.couplings, coupling{eqs: slices.Clone(eqs), k: slices.Clone(kb)})
			}
		}
	}
	s.Timing.Contact += time.Since(mid)
	s.forcesValid = true
	return nil
}

// forces makes fint hold the forces at the current u.
func (s *Solver) forces() error {
	if s.forcesValid {
		return nil
	}
	return s.assemble(false)
}

func (s *Solver) addContact(dofs []int, f, kc []float64, k *sparse.Matrix, tangent bool) error {
	for i, d := range dofs {
		s.fint[d] += f[i]
	}
	if !tangent || kc == nil {
		return nil
	}
	if s.a.dup != nil {
		addProduct(s.a.kdup, s.a.dup, dofs, kc)
	}
	idx, ke := s.toEquations(dofs, kc)
	if s.cs != nil {
		s.cs.add(idx, ke)
	}
	if k == nil {
		return nil
	}
	return k.AddDense(idx, ke)
}

// wholeTangent makes k hold the whole current tangent where the last
// assembly left it to the contact space (see assemble).
func (s *Solver) wholeTangent() error {
	if s.kFull || s.cs == nil {
		return nil
	}
	if err := s.k.CopyValues(s.klin); err != nil {
		return err
	}
	if err := s.k.AddDense(s.cs.eqs, s.cs.kc); err != nil {
		return fmt.Errorf("fem: contact stiffness: %w", err)
	}
	s.kFull = true
	return nil
}

// toEquations maps a dense block over node dofs to the equations, folding
// tied dofs onto their masters; the slices may be the assembler's buffers.
func (s *Solver) toEquations(dofs []int, kc []float64) ([]int, []float64) {
	ds := make([]Dof, len(dofs))
	tied := false
	for i, d := range dofs {
		ds[i] = Dof(d)
		tied = tied || s.m.depends[d] != nil
	}
	idx := make([]int, 0, len(dofs))
	if !tied {
		for _, d := range dofs {
			idx = append(idx, s.m.eq[d])
		}
		return idx, kc
	}
	indep, t := s.m.tieMap(ds)
	em := elementMap{dofs: ds, indep: indep, t: t}
	for _, d := range indep {
		idx = append(idx, s.m.eq[d])
	}
	return idx, s.a.transform(&em, kc)
}

// mulTangent is dst = K·v for the full current tangent: the symmetric
// matrix plus the sliding-friction couplings.
func (s *Solver) mulTangent(dst, v []float64) error {
	s.k.MulVecTo(dst, v)
	if !s.coupled {
		return nil
	}
	for _, c := range s.couplings {
		c.addProduct(dst, v)
	}
	return nil
}

// addProduct adds the block's product with v to dst (indices −1: none).
func (c coupling) addProduct(dst, v []float64) {
	n := len(c.eqs)
	for i, ei := range c.eqs {
		if ei < 0 {
			continue
		}
		sum := 0.0
		for j, ej := range c.eqs {
			if ej >= 0 {
				sum += c.k[i*n+j] * v[ej]
			}
		}
		dst[ei] += sum
	}
}
