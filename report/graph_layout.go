package report

import (
	"sort"

	"github.com/gapwise/gapwise/fairness"
)

// dagNode is a node of the causal graph placed by layoutDAG.
type dagNode struct {
	Name    string
	Parents []string
	Layer   int // longest path from a root: 0 for roots, 1 + max over parents otherwise
	Slot    int // position within the layer, 0 first
	X, Y    float64
}

// dagEdge is an arrow from a parent to its child.
type dagEdge struct {
	From, To string
	// Bends are the points, one per layer crossed, through which an
	// arrow spanning more than one layer is drawn.
	Bends [][2]float64
}

// Layout spacing of the graph drawing, in ECharts' abstract coordinates
// (the series scales them to fit its box).
const (
	layerGap = 200.0
	slotGap  = 90.0
)

// layoutDAG places the graph of the Result's mechanisms in layers, left to
// right: a node's layer is the length of the longest directed path reaching
// it, so every arrow points to a later layer. Within each layer, nodes start
// in graph order and are then reordered by four down-and-up sweeps of the
// barycentre heuristic (Sugiyama, Tagawa & Toda 1981, "Methods for visual
// understanding of hierarchical system structures"; cited from memory):
// each node moves to the mean slot of its neighbours in the previous layer
// of the sweep, ties keeping their order. An arrow spanning several
// layers is split at a bend point in each layer it crosses; bend points
// are ordered like nodes and returned in the arrow's Bends. Parents that
// are not mechanisms become nodes too. Arrows that would close a cycle
// (not possible in a valid Result) are drawn straight but ignored for
// layering. Coordinates are offset
// to be positive (go-echarts drops zero coordinates).
func layoutDAG(mechs []fairness.MechanismResult) ([]dagNode, []dagEdge) {
	nodes, edges, index := dagOf(mechs)
	assignLayers(nodes, index)
	lg := splitLongEdges(nodes, edges, index)
	lg.sweep(4)
	lg.place(nodes, edges)
	return nodes, edges
}

// dagOf lists the graph's nodes (the mechanisms in order, then parents that
// are not mechanisms) with their parents, the arrows parent → child, and
// each node's index by name.
func dagOf(mechs []fairness.MechanismResult) ([]dagNode, []dagEdge, map[string]int) {
	index := map[string]int{}
	var nodes []dagNode
	add := func(name string, parents []string) {
		if i, ok := index[name]; ok {
			if parents != nil {
				nodes[i].Parents = parents
			}
			return
		}
		index[name] = len(nodes)
		nodes = append(nodes, dagNode{Name: name, Parents: parents})
	}
	for _, m := range mechs {
		add(m.Node, append([]string{}, m.Parents...))
	}
	for _, m := range mechs {
		for _, p := range m.Parents {
			add(p, nil)
		}
	}
	var edges []dagEdge
	for _, n := range nodes {
		for _, p := range n.Parents {
			edges = append(edges, dagEdge{From: p, To: n.Name})
		}
	}
	return nodes, edges, index
}

// assignLayers sets each node's Layer to the length of the longest path
// from a root to it, ignoring the back edges of cycles.
func assignLayers(nodes []dagNode, index map[string]int) {
	const (
		unseen = iota
		active
		done
	)
	state := make([]int, len(nodes))
	var depth func(i int) int
	depth = func(i int) int {
		switch state[i] {
		case done:
			return nodes[i].Layer
		case active: // a cycle: ignore the back edge
			return -1
		}
		state[i] = active
		l := 0
		for _, p := range nodes[i].Parents {
			if d := depth(index[p]); d+1 > l {
				l = d + 1
			}
		}
		nodes[i].Layer, state[i] = l, done
		return l
	}
	for i := range nodes {
		depth(i)
	}
}

// vertex is a node or a bend point of the layered graph, with its slot in
// its layer and its neighbours in the layers above and below.
type vertex struct {
	layer, slot int
	up, down    []int
}

// layeredGraph is the graph in layers: vertices 0 … len(nodes)−1 are the
// nodes, the rest bend points; layers lists each layer's vertices in slot
// order; bends[k] are the bend points of arrow k.
type layeredGraph struct {
	verts  []vertex
	layers [][]int
	bends  [][]int
}

// splitLongEdges routes an arrow spanning several layers through one
// invisible bend point in each layer it crosses (the dummy vertices of the
// layered method). Bend points take part in the ordering like nodes, so
// they get slots of their own and the arrow passes between the boxes of the
// layers it skips instead of through them. Slots start in graph order.
func splitLongEdges(nodes []dagNode, edges []dagEdge, index map[string]int) *layeredGraph {
	g := &layeredGraph{verts: make([]vertex, len(nodes)), bends: make([][]int, len(edges))}
	for i, n := range nodes {
		g.verts[i].layer = n.Layer
	}
	link := func(a, b int) {
		g.verts[a].down = append(g.verts[a].down, b)
		g.verts[b].up = append(g.verts[b].up, a)
	}
	for k, e := range edges {
		from, to := index[e.From], index[e.To]
		if g.verts[to].layer <= g.verts[from].layer { // a back edge of a cycle
			continue
		}
		prev := from
		for l := g.verts[from].layer + 1; l < g.verts[to].layer; l++ {
			g.verts = append(g.verts, vertex{layer: l})
			d := len(g.verts) - 1
			g.bends[k] = append(g.bends[k], d)
			link(prev, d)
			prev = d
		}
		link(prev, to)
	}
	for v := range g.verts {
		l := g.verts[v].layer
		for len(g.layers) <= l {
			g.layers = append(g.layers, nil)
		}
		g.layers[l] = append(g.layers[l], v)
	}
	for _, layer := range g.layers {
		for s, v := range layer {
			g.verts[v].slot = s
		}
	}
	return g
}

// sweep runs the given number of down-and-up sweeps of the barycentre
// heuristic. Every up and down neighbour lies in the adjacent layer, since
// long arrows are split at each layer.
func (g *layeredGraph) sweep(sweeps int) {
	for range sweeps {
		for l := 1; l < len(g.layers); l++ {
			g.reorder(l, func(v int) []int { return g.verts[v].up })
		}
		for l := len(g.layers) - 2; l >= 0; l-- {
			g.reorder(l, func(v int) []int { return g.verts[v].down })
		}
	}
}

// reorder moves each vertex of layer l to the mean slot of its neighbours
// (itself when it has none), ties keeping their order.
func (g *layeredGraph) reorder(l int, neighbours func(int) []int) {
	key := map[int]float64{}
	for _, v := range g.layers[l] {
		var sum float64
		var n int
		for _, w := range neighbours(v) {
			sum += float64(g.verts[w].slot)
			n++
		}
		key[v] = float64(g.verts[v].slot)
		if n > 0 {
			key[v] = sum / float64(n)
		}
	}
	sort.SliceStable(g.layers[l], func(a, b int) bool { return key[g.layers[l][a]] < key[g.layers[l][b]] })
	for s, v := range g.layers[l] {
		g.verts[v].slot = s
	}
}

// place sets the slots and coordinates of the nodes and the bend points of
// the arrows: layers left to right, each centred on the widest.
func (g *layeredGraph) place(nodes []dagNode, edges []dagEdge) {
	widest := 0
	for _, layer := range g.layers {
		widest = max(widest, len(layer))
	}
	pos := func(v int) (x, y float64) {
		l := g.verts[v].layer
		return 40 + float64(l)*layerGap, 40 + (float64(g.verts[v].slot)+float64(widest-len(g.layers[l]))/2)*slotGap
	}
	for i := range nodes {
		nodes[i].Slot = g.verts[i].slot
		nodes[i].X, nodes[i].Y = pos(i)
	}
	for k, bs := range g.bends {
		for _, d := range bs {
			x, y := pos(d)
			edges[k].Bends = append(edges[k].Bends, [2]float64{x, y})
		}
	}
}
