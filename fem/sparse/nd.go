package sparse

// This file is longer than most: the nested-dissection ordering
// (coarsening, separator search, refinement, recursion) is one algorithm
// whose steps share the graph structures.

import (
	"math/rand/v2"
	"runtime"
	"slices"
)

// This file holds the nested dissection ordering (George, "Nested dissection
// of a regular finite element mesh", SIAM J. Numer. Anal. 10(2), 1973;
// George & Liu, "Computer Solution of Large Sparse Positive Definite
// Systems", 1981): a vertex separator splits the graph in two, the halves
// are ordered first, recursively, and the separator last. Separators come
// from the multilevel scheme of Hendrickson & Leland ("A multilevel
// algorithm for partitioning graphs", 1995) and Karypis & Kumar ("A fast and
// high quality multilevel scheme for partitioning irregular graphs", SIAM
// J. Sci. Comput. 20(1), 1998): heavy-edge matching coarsens the graph,
// greedy graph growing bisects the coarsest one, Fiduccia–Mattheyses passes
// (Fiduccia & Mattheyses, 19th Design Automation Conference, 1982) refine
// the edge cut on the way back, a minimum vertex cover of the cut edges
// (König's theorem, by bipartite matching) turns the cut into a vertex
// separator, and vertex-move passes of the same kind shrink it. Large parts
// try a few bisections and keep the smallest separator. Rows with identical
// adjacency (the dofs of one node) are compressed first; parts of at most
// ndLeaf vertices are ordered by AMD. Random choices use a stream seeded by
// the part itself, so the ordering is deterministic, also when the halves
// are ordered concurrently.

const (
	ndLeaf      = 16   // parts this small are ordered by AMD
	ndSepTrials = 3    // multilevel bisections tried on parts above ndTrialMin
	ndTrialMin  = 3000 // vertices
	ndSmall     = 200  // parts below this try fewer initial bisections
	ndCoarsest  = 80   // coarsening stops near this many vertices
	ndTrials    = 4    // initial bisections tried on the coarsest graph
	ndBalance   = 0.55
	ndPasses    = 8
)

type ndGraph struct {
	xadj []int
	adj  []int32
	ew   []int32 // edge weights
	vw   []int32 // vertex weights
}

func (g *ndGraph) n() int { return len(g.xadj) - 1 }

func (g *ndGraph) totalWeight() int {
	t := 0
	for _, w := range g.vw {
		t += int(w)
	}
	return t
}

// nestedDissection is the context of one ordering task; tasks on disjoint
// parts run in parallel, each with its own map and random stream.
type nestedDissection struct {
	g     *ndGraph // compressed graph of the whole matrix, shared
	local []int32  // global → local vertex map while extracting a subgraph
	rnd   *rand.Rand
	order []int32
}

// ndParallel is the smallest part whose halves are ordered concurrently.
const ndParallel = 20000

// ndOrder returns a nested dissection permutation (new → old) of the
// pattern with adjacency (xadj, adj).
func ndOrder(n int, xadj []int, adj []int32) ([]int, error) {
	g, members := compress(n, xadj, adj)
	nd := &nestedDissection{g: g, local: make([]int32, g.n())}
	all := make([]int32, g.n())
	for i := range all {
		all[i] = int32(i)
	}
	nd.dissect(all)
	perm := make([]int, 0, n)
	for _, v := range nd.order {
		perm = append(perm, members[v]...)
	}
	return perm, nil
}

// compress merges vertices with identical closed neighbourhoods.
func compress(n int, xadj []int, adj []int32) (*ndGraph, [][]int) {
	type key struct{ deg, hash int }
	buckets := make(map[key][]int)
	rep := make([]int, n)
	mark := make([]int, n)
	for i := range mark {
		mark[i] = -1
	}
	var members [][]int
	id := make([]int, n)
	for v := 0; v < n; v++ {
		k := key{deg: xadj[v+1] - xadj[v], hash: v}
		for _, u := range adj[xadj[v]:xadj[v+1]] {
			k.hash += int(u)
		}
		rep[v] = v
		for _, r := range buckets[k] {
			mark[r] = v
			for _, u := range adj[xadj[r]:xadj[r+1]] {
				mark[u] = v
			}
			same := mark[v] == v
			for _, u := range adj[xadj[v]:xadj[v+1]] {
				same = same && mark[u] == v
			}
			if same {
				rep[v] = r
				break
			}
		}
		if rep[v] == v {
			buckets[k] = append(buckets[k], v)
			id[v] = len(members)
			members = append(members, []int{v})
		} else {
			id[v] = id[rep[v]]
			members[id[v]] = append(members[id[v]], v)
		}
	}
	nc := len(members)
	g := &ndGraph{xadj: make([]int, nc+1), vw: make([]int32, nc)}
	for i := range mark {
		mark[i] = -1
	}
	for c, mem := range members {
		g.vw[c] = int32(len(mem))
		v := mem[0]
		for _, u := range adj[xadj[v]:xadj[v+1]] {
			if cu := id[u]; cu != c && mark[cu] != c {
				mark[cu] = c
				g.adj = append(g.adj, int32(cu))
			}
		}
		g.xadj[c+1] = len(g.adj)
	}
	g.ew = make([]int32, len(g.adj))
	for i := range g.ew {
		g.ew[i] = 1
	}
	return g, members
}

// subgraph returns the subgraph of nd.g induced by vs, numbered as in vs.
func (nd *nestedDissection) subgraph(vs []int32) *ndGraph {
	g := nd.g
	for i, v := range vs {
		nd.local[v] = int32(i)
	}
	inSet := func(u int32) bool {
		l := nd.local[u]
		return int(l) < len(vs) && vs[l] == u
	}
	s := &ndGraph{xadj: make([]int, len(vs)+1), vw: make([]int32, len(vs))}
	for i, v := range vs {
		s.vw[i] = g.vw[v]
		for p := g.xadj[v]; p < g.xadj[v+1]; p++ {
			if u := g.adj[p]; inSet(u) {
				s.adj = append(s.adj, nd.local[u])
				s.ew = append(s.ew, g.ew[p])
			}
		}
		s.xadj[i+1] = len(s.adj)
	}
	return s
}

// dissect appends an ordering of the vertices vs to nd.order.
func (nd *nestedDissection) dissect(vs []int32) {
	if len(vs) == 0 {
		return
	}
	// The random stream depends on the part only, not on scheduling.
	nd.rnd = rand.New(rand.NewPCG(uint64(len(vs)), uint64(vs[0])))
	g := nd.subgraph(vs)
	if len(vs) <= ndLeaf {
		nd.leaf(vs, g)
		return
	}
	part := nd.bisect(g)
	var a, b, sep []int32
	for i, p := range part {
		switch p {
		case 0:
			a = append(a, vs[i])
		case 1:
			b = append(b, vs[i])
		default:
			sep = append(sep, vs[i])
		}
	}
	if len(a) == 0 || len(b) == 0 {
		nd.leaf(vs, g) // no useful split
		return
	}
	if len(vs) >= ndParallel && runtime.GOMAXPROCS(0) > 1 {
		other := &nestedDissection{g: nd.g, local: make([]int32, len(nd.local))}
		done := make(chan struct{})
		go func() {
			other.dissect(b)
			close(done)
		}()
		nd.dissect(a)
		<-done
		nd.order = append(nd.order, other.order...)
	} else {
		nd.dissect(a)
		nd.dissect(b)
	}
	nd.order = append(nd.order, sep...)
}

// leaf orders a small part by AMD on its weighted graph.
func (nd *nestedDissection) leaf(vs []int32, g *ndGraph) {
	w := make([]int, len(vs))
	for i, x := range g.vw {
		w[i] = int(x)
	}
	for _, i := range amdOrder(g.n(), g.xadj, g.adj, w) {
		nd.order = append(nd.order, vs[i])
	}
}

// bisect returns a vertex separator of g: part[v] is 0 or 1 for the two
// halves and 2 for the separator.
func (nd *nestedDissection) bisect(g *ndGraph) []int8 {
	var best []int8
	bestW := 0
	trials := 1
	if g.n() > ndTrialMin {
		trials = ndSepTrials
	}
	for t := 0; t < trials; t++ {
		part := nd.bisectOnce(g)
		w := 0
		for v, p := range part {
			if p == 2 {
				w += int(g.vw[v])
			}
		}
		if best == nil || w < bestW {
			best, bestW = part, w
		}
	}
	return best
}

// bisectOnce is one multilevel bisection.
func (nd *nestedDissection) bisectOnce(g *ndGraph) []int8 {
	graphs := []*ndGraph{g}
	var maps [][]int32
	for cur := g; cur.n() > ndCoarsest; {
		cg, cmap := nd.coarsen(cur)
		if cg.n() > cur.n()*9/10 {
			break
		}
		graphs = append(graphs, cg)
		maps = append(maps, cmap)
		cur = cg
	}
	coarse := graphs[len(graphs)-1]
	part := nd.initialPartition(coarse)
	for l := len(maps) - 1; l >= 0; l-- {
		fine := graphs[l]
		fp := make([]int8, fine.n())
		for v, c := range maps[l] {
			fp[v] = part[c]
		}
		part = fp
		refine(fine, part, ndPasses)
	}
	sep := vertexSeparator(g, part)
	refineSeparator(g, sep, ndPasses)
	return sep
}

// coarsen contracts a heavy-edge matching of g.
func (nd *nestedDissection) coarsen(g *ndGraph) (*ndGraph, []int32) {
	n := g.n()
	match := make([]int32, n)
	for i := range match {
		match[i] = -1
	}
	maxW := int32(max(1, 3*g.totalWeight()/ndCoarsest))
	visit := nd.rnd.Perm(n)
	for _, v := range visit {
		if match[v] >= 0 {
			continue
		}
		best, bw := int32(v), int32(-1)
		for p := g.xadj[v]; p < g.xadj[v+1]; p++ {
			u := g.adj[p]
			if match[u] < 0 && g.ew[p] > bw && g.vw[u]+g.vw[v] <= maxW {
				best, bw = u, g.ew[p]
			}
		}
		match[v] = best
		match[best] = int32(v)
	}
	cmap := make([]int32, n)
	nc := int32(0)
	for v := 0; v < n; v++ {
		if u := match[v]; int(u) >= v {
			cmap[v] = nc
			cmap[u] = nc
			nc++
		}
	}
	cg := &ndGraph{xadj: make([]int, nc+1), vw: make([]int32, nc)}
	slot := make([]int, nc)
	for i := range slot {
		slot[i] = -1
	}
	c := int32(0)
	for v := 0; v < n; v++ {
		u := int(match[v])
		if u < v {
			continue
		}
		start := len(cg.adj)
		pair := [2]int{v, u}
		for _, x := range pair[:1+min(1, u-v)] {
			cg.vw[c] += g.vw[x]
			for p := g.xadj[x]; p < g.xadj[x+1]; p++ {
				cy := cmap[g.adj[p]]
				if cy == c {
					continue
				}
				if s := slot[cy]; s >= start {
					cg.ew[s] += g.ew[p]
					continue
				}
				slot[cy] = len(cg.adj)
				cg.adj = append(cg.adj, cy)
				cg.ew = append(cg.ew, g.ew[p])
			}
		}
		cg.xadj[c+1] = len(cg.adj)
		c++
	}
	return cg, cmap
}

// initialPartition bisects a small graph by greedy graph growing from a few
// seeds and keeps the refined cut of least weight.
func (nd *nestedDissection) initialPartition(g *ndGraph) []int8 {
	n := g.n()
	var best []int8
	bestCut := -1
	seeds := []int{pseudoPeripheral(g, 0)}
	trials := ndTrials
	if n < ndSmall {
		trials = 2
	}
	for t := 1; t < trials; t++ {
		seeds = append(seeds, nd.rnd.IntN(n))
	}
	for _, seed := range seeds {
		part := grow(g, seed)
		refine(g, part, 4)
		if c := cutWeight(g, part); bestCut < 0 || c < bestCut {
			best, bestCut = part, c
		}
	}
	return best
}

// grow assigns part 0 to a breadth-first region around seed holding half
// the weight; the rest is part 1.
func grow(g *ndGraph, seed int) []int8 {
	n := g.n()
	part := make([]int8, n)
	queued := make([]bool, n)
	for i := range part {
		part[i] = 1
	}
	half := g.totalWeight() / 2
	w, next := 0, 0
	queue := []int32{int32(seed)}
	queued[seed] = true
	for w < half {
		if len(queue) == 0 { // another component
			for next < n && queued[next] {
				next++
			}
			if next == n {
				break
			}
			queue = append(queue, int32(next))
			queued[next] = true
		}
		v := queue[0]
		queue = queue[1:]
		part[v] = 0
		w += int(g.vw[v])
		for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
			if !queued[u] {
				queued[u] = true
				queue = append(queue, u)
			}
		}
	}
	return part
}

// pseudoPeripheral returns a vertex far from start (a few breadth-first
// sweeps, George & Liu 1979).
func pseudoPeripheral(g *ndGraph, start int) int {
	n := g.n()
	dist := make([]int, n)
	v, ecc := start, -1
	for iter := 0; iter < 4; iter++ {
		for i := range dist {
			dist[i] = -1
		}
		dist[v] = 0
		queue := []int{v}
		far := v
		for len(queue) > 0 {
			x := queue[0]
			queue = queue[1:]
			if dist[x] > dist[far] || dist[x] == dist[far] && g.xadj[x+1]-g.xadj[x] < g.xadj[far+1]-g.xadj[far] {
				far = x
			}
			for _, u := range g.adj[g.xadj[x]:g.xadj[x+1]] {
				if dist[u] < 0 {
					dist[u] = dist[x] + 1
					queue = append(queue, int(u))
				}
			}
		}
		if dist[far] <= ecc {
			break
		}
		v, ecc = far, dist[far]
	}
	return v
}

func cutWeight(g *ndGraph, part []int8) int {
	c := 0
	for v := 0; v < g.n(); v++ {
		for p := g.xadj[v]; p < g.xadj[v+1]; p++ {
			if part[g.adj[p]] != part[v] {
				c += int(g.ew[p])
			}
		}
	}
	return c / 2
}

// gainItem is a candidate move with its gain when queued; ver tells stale
// entries from current ones.
type gainItem struct {
	gain int
	v    int32
	to   int8 // target side (vertex separator moves only)
	ver  int32
}

func (x gainItem) before(y gainItem) bool {
	if x.gain != y.gain {
		return x.gain > y.gain
	}
	if x.v != y.v {
		return x.v < y.v
	}
	return x.to < y.to
}

// gainHeap is a binary max-heap of moves by gain, ties to the lower vertex.
type gainHeap []gainItem

func (h *gainHeap) push(x gainItem) {
	*h = append(*h, x)
	a := *h
	i := len(a) - 1
	for i > 0 {
		p := (i - 1) / 2
		if !a[i].before(a[p]) {
			break
		}
		a[i], a[p] = a[p], a[i]
		i = p
	}
}

func (h *gainHeap) pop() gainItem {
	a := *h
	top := a[0]
	last := len(a) - 1
	a[0] = a[last]
	a = a[:last]
	for i := 0; ; {
		l := 2*i + 1
		if l >= len(a) {
			break
		}
		c := l
		if r := l + 1; r < len(a) && a[r].before(a[l]) {
			c = r
		}
		if !a[c].before(a[i]) {
			break
		}
		a[i], a[c] = a[c], a[i]
		i = c
	}
	*h = a
	return top
}

// refine improves the edge cut of a bisection by Fiduccia–Mattheyses
// passes, keeping each part below ndBalance of the total weight.
func refine(g *ndGraph, part []int8, passes int) {
	n := g.n()
	total := g.totalWeight()
	limit := max(int(ndBalance*float64(total)), total/2+1)
	var pw [2]int
	ext := make([]int, n)  // weight of v's edges to the other part
	degw := make([]int, n) // weight of all v's edges
	for v := 0; v < n; v++ {
		pw[part[v]] += int(g.vw[v])
		for p := g.xadj[v]; p < g.xadj[v+1]; p++ {
			degw[v] += int(g.ew[p])
			if part[g.adj[p]] != part[v] {
				ext[v] += int(g.ew[p])
			}
		}
	}
	gain := func(v int) int { return 2*ext[v] - degw[v] }
	// flip moves v to the other part, keeping ext and pw current.
	flip := func(v int) {
		from := part[v]
		to := 1 - from
		part[v] = to
		pw[from] -= int(g.vw[v])
		pw[to] += int(g.vw[v])
		ext[v] = degw[v] - ext[v]
		for p := g.xadj[v]; p < g.xadj[v+1]; p++ {
			if u := g.adj[p]; part[u] == to {
				ext[u] -= int(g.ew[p])
			} else {
				ext[u] += int(g.ew[p])
			}
		}
	}
	ver := make([]int32, n)
	moved := make([]bool, n)
	var h gainHeap
	var moves []int32
	for pass := 0; pass < passes; pass++ {
		h = h[:0]
		for v := 0; v < n; v++ {
			if ext[v] > 0 {
				ver[v]++
				h.push(gainItem{gain: gain(v), v: int32(v), ver: ver[v]})
			}
		}
		for _, v := range moves {
			moved[v] = false
		}
		moves = moves[:0]
		cut, bestCut, bestLen := 0, 0, 0
		bestImb := abs(pw[0] - pw[1])
		sinceBest := 0
		for len(h) > 0 && sinceBest < 60 {
			it := h.pop()
			v := int(it.v)
			if moved[v] || it.ver != ver[v] {
				continue
			}
			if pw[1-part[v]]+int(g.vw[v]) > limit {
				continue
			}
			moved[v] = true
			cut -= gain(v)
			flip(v)
			moves = append(moves, int32(v))
			for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
				if !moved[u] {
					ver[u]++
					h.push(gainItem{gain: gain(int(u)), v: u, ver: ver[u]})
				}
			}
			imb := abs(pw[0] - pw[1])
			if cut < bestCut || cut == bestCut && imb < bestImb {
				bestCut, bestLen, bestImb = cut, len(moves), imb
				sinceBest = 0
			} else {
				sinceBest++
			}
		}
		for i := len(moves) - 1; i >= bestLen; i-- {
			flip(int(moves[i]))
		}
		if bestLen == 0 {
			break
		}
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// vertexSeparator turns an edge bisection into a vertex separator: a
// minimum vertex cover of the cut edges, found from a maximum matching of
// the bipartite boundary graph by König's construction.
func vertexSeparator(g *ndGraph, part []int8) []int8 {
	n := g.n()
	// Boundary vertices of part 0 are the left side of the bipartite graph.
	var left []int32
	for v := 0; v < n; v++ {
		if part[v] != 0 {
			continue
		}
		for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
			if part[u] == 1 {
				left = append(left, int32(v))
				break
			}
		}
	}
	mate := make([]int32, n)
	for i := range mate {
		mate[i] = -1
	}
	seen := make([]int32, n)
	stamp := int32(0)
	var augment func(v int32) bool
	augment = func(v int32) bool {
		for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
			if part[u] != 1 || seen[u] == stamp {
				continue
			}
			seen[u] = stamp
			if mate[u] < 0 || augment(mate[u]) {
				mate[u] = v
				mate[v] = u
				return true
			}
		}
		return false
	}
	for _, v := range left {
		stamp++
		augment(v)
	}
	// Alternating search from the unmatched left vertices.
	visited := make([]bool, n)
	var queue []int32
	for _, v := range left {
		if mate[v] < 0 {
			visited[v] = true
			queue = append(queue, v)
		}
	}
	for len(queue) > 0 {
		v := queue[0]
		queue = queue[1:]
		for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
			if part[u] != 1 || visited[u] {
				continue
			}
			visited[u] = true
			if w := mate[u]; w >= 0 && !visited[w] {
				visited[w] = true
				queue = append(queue, w)
			}
		}
	}
	out := slices.Clone(part)
	for _, v := range left {
		if !visited[v] {
			out[v] = 2
		}
	}
	for v := 0; v < n; v++ {
		if part[v] == 1 && visited[v] {
			out[v] = 2
		}
	}
	return out
}

// refineSeparator shrinks a vertex separator (part 2) by
// Fiduccia–Mattheyses passes over vertex moves: a separator vertex joins
// one side and its neighbours on the other side join the separator. The
// gain of a move is the separator weight it saves.
func refineSeparator(g *ndGraph, part []int8, passes int) {
	n := g.n()
	total := g.totalWeight()
	limit := max(int(ndBalance*float64(total)), total/2+1)
	var pw [3]int
	for v := 0; v < n; v++ {
		pw[part[v]] += int(g.vw[v])
	}
	ver := make([]int32, n)
	locked := make([]bool, n)
	gainTo := func(v int, to int8) int {
		gn := int(g.vw[v])
		for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
			if part[u] == 1-to {
				gn -= int(g.vw[u])
			}
		}
		return gn
	}
	var h gainHeap
	push := func(v int) {
		ver[v]++
		for to := int8(0); to < 2; to++ {
			h.push(gainItem{gainTo(v, to), int32(v), to, ver[v]})
		}
	}
	type move struct {
		v      int32
		to     int8
		pulled int // number of entries in pulledList
	}
	var moves []move
	var pulled []int32
	for pass := 0; pass < passes; pass++ {
		h = h[:0]
		clear(locked)
		for v := 0; v < n; v++ {
			if part[v] == 2 {
				push(v)
			}
		}
		moves, pulled = moves[:0], pulled[:0]
		best, bestLen, bestImb := pw[2], 0, abs(pw[0]-pw[1])
		sinceBest := 0
		for len(h) > 0 && sinceBest < 50 {
			it := h.pop()
			v := int(it.v)
			if part[v] != 2 || locked[v] || it.ver != ver[v] {
				continue
			}
			to := it.to
			if pw[to]+int(g.vw[v]) > limit {
				continue
			}
			locked[v] = true
			part[v] = to
			pw[2] -= int(g.vw[v])
			pw[to] += int(g.vw[v])
			start := len(pulled)
			for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
				if part[u] == 1-to {
					part[u] = 2
					pw[1-to] -= int(g.vw[u])
					pw[2] += int(g.vw[u])
					pulled = append(pulled, u)
				}
			}
			moves = append(moves, move{int32(v), to, len(pulled) - start})
			// Refresh the gains of separator vertices near the change.
			for _, u := range g.adj[g.xadj[v]:g.xadj[v+1]] {
				if part[u] == 2 && !locked[u] {
					push(int(u))
				}
			}
			for _, u := range pulled[start:] {
				for _, x := range g.adj[g.xadj[u]:g.xadj[u+1]] {
					if part[x] == 2 && !locked[x] {
						push(int(x))
					}
				}
			}
			imb := abs(pw[0] - pw[1])
			if pw[2] < best || pw[2] == best && imb < bestImb {
				best, bestLen, bestImb = pw[2], len(moves), imb
				sinceBest = 0
			} else {
				sinceBest++
			}
		}
		// Undo the moves after the best prefix.
		for i := len(moves) - 1; i >= bestLen; i-- {
			m := moves[i]
			for _, u := range pulled[len(pulled)-m.pulled:] {
				part[u] = 1 - m.to
				pw[1-m.to] += int(g.vw[u])
				pw[2] -= int(g.vw[u])
			}
			pulled = pulled[:len(pulled)-m.pulled]
			part[m.v] = 2
			pw[m.to] -= int(g.vw[m.v])
			pw[2] += int(g.vw[m.v])
		}
		if bestLen == 0 {
			break
		}
	}
}
