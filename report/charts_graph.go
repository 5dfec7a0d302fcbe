package report

import (
	"fmt"
	"math"
	"sort"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"

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
	// An arrow spanning several layers is routed through one invisible
	// bend point in each layer it crosses (the dummy vertices of the
	// layered method above). Bend points take part in the ordering like
	// nodes, so they get slots of their own and the arrow passes between
	// the boxes of the layers it skips instead of through them.
	type vertex struct {
		layer, slot int
		up, down    []int
	}
	verts := make([]vertex, len(nodes))
	for i, n := range nodes {
		verts[i].layer = n.Layer
	}
	link := func(a, b int) {
		verts[a].down = append(verts[a].down, b)
		verts[b].up = append(verts[b].up, a)
	}
	bends := make([][]int, len(edges))
	for k, e := range edges {
		from, to := index[e.From], index[e.To]
		if verts[to].layer <= verts[from].layer { // a back edge of a cycle
			continue
		}
		prev := from
		for l := verts[from].layer + 1; l < verts[to].layer; l++ {
			verts = append(verts, vertex{layer: l})
			d := len(verts) - 1
			bends[k] = append(bends[k], d)
			link(prev, d)
			prev = d
		}
		link(prev, to)
	}
	layers := [][]int{}
	for v := range verts {
		l := verts[v].layer
		for len(layers) <= l {
			layers = append(layers, nil)
		}
		layers[l] = append(layers[l], v)
	}
	for _, layer := range layers {
		for s, v := range layer {
			verts[v].slot = s
		}
	}
	reorder := func(l int, neighbours func(int) []int) {
		key := map[int]float64{}
		for _, v := range layers[l] {
			var sum float64
			var n int
			for _, w := range neighbours(v) {
				sum += float64(verts[w].slot)
				n++
			}
			key[v] = float64(verts[v].slot)
			if n > 0 {
				key[v] = sum / float64(n)
			}
		}
		sort.SliceStable(layers[l], func(a, b int) bool { return key[layers[l][a]] < key[layers[l][b]] })
		for s, v := range layers[l] {
			verts[v].slot = s
		}
	}
	// Every up and down neighbour lies in the adjacent layer, since long
	// arrows are split at each layer.
	for sweep := 0; sweep < 4; sweep++ {
		for l := 1; l < len(layers); l++ {
			reorder(l, func(v int) []int { return verts[v].up })
		}
		for l := len(layers) - 2; l >= 0; l-- {
			reorder(l, func(v int) []int { return verts[v].down })
		}
	}
	widest := 0
	for _, layer := range layers {
		widest = max(widest, len(layer))
	}
	pos := func(v int) (x, y float64) {
		l := verts[v].layer
		return 40 + float64(l)*layerGap, 40 + (float64(verts[v].slot)+float64(widest-len(layers[l]))/2)*slotGap
	}
	for i := range nodes {
		nodes[i].Slot = verts[i].slot
		nodes[i].X, nodes[i].Y = pos(i)
	}
	for k, bs := range bends {
		for _, d := range bs {
			x, y := pos(d)
			edges[k].Bends = append(edges[k].Bends, [2]float64{x, y})
		}
	}
	return nodes, edges
}

// rampColour maps t ∈ [−1, 1] to a colour: colourDown at −1, colourNeutral
// at 0, colourUp at 1, interpolating linearly in sRGB.
func rampColour(t float64) string {
	t = math.Max(-1, math.Min(1, t))
	end := colourUp
	if t < 0 {
		end, t = colourDown, -t
	}
	var a, b [3]int
	fmt.Sscanf(colourNeutral, "#%02x%02x%02x", &a[0], &a[1], &a[2])
	fmt.Sscanf(end, "#%02x%02x%02x", &b[0], &b[1], &b[2])
	var c [3]int
	for i := range c {
		c[i] = int(math.Round(float64(a[i]) + t*float64(b[i]-a[i])))
	}
	return fmt.Sprintf("#%02X%02X%02X", c[0], c[1], c[2])
}

// graphChart draws the causal graph for one metric: nodes in layoutDAG's
// layers, arrows from parents to children, each node filled by its
// contribution φ relative to the largest |φ| of the metric (rampColour), its
// label showing the contribution, and a tooltip with the mechanism's
// estimation diagnostics.
func graphChart(res *fairness.Result, m fairness.MetricResult) chartOption {
	nodes, edges := layoutDAG(res.Mechanisms)
	contrib := map[string]float64{}
	var maxAbs float64
	for _, c := range m.Contributions {
		contrib[c.Node] = c.Value
		maxAbs = math.Max(maxAbs, math.Abs(c.Value))
	}
	diag := map[string]fairness.MechanismResult{}
	for _, mr := range res.Mechanisms {
		diag[mr.Node] = mr
	}
	flags := unreliable(res)
	var data []opts.GraphNode
	for _, n := range nodes {
		v, has := contrib[n.Name]
		t := 0.0
		if maxAbs > 0 {
			t = v / maxAbs
		}
		tip := []string{n.Name}
		if has {
			d := diag[n.Name]
			tip = []string{d.Mechanism,
				"contribution to " + MetricTitle(m.Metric) + ": " + formatDelta(m.Metric, v),
				"classifier " + d.Classifier + " (parents: " + d.ParentClassifier + ")",
				"out-of-fold AUC " + formatDiag(d.AUC),
				fmt.Sprintf("effective sample size %s (%.0f%% of reference)", formatCount(math.Round(d.ESS)), 100*d.ESSShare),
				"largest weight share " + formatDiag(d.MaxShare),
				"mean ratio " + formatDiag(d.MeanRatio) + " (1 when right)"}
			if why, ok := flags[n.Name]; ok {
				tip = append(tip, "unreliable: "+why)
			}
		} else {
			tip = append(tip, "no mechanism estimated")
		}
		border := colourMuted
		if _, ok := flags[n.Name]; ok {
			border = colourUp
		}
		width := math.Max(76, 8.5*float64(len([]rune(n.Name)))+28)
		data = append(data, opts.GraphNode{Name: n.Name, X: float32(n.X), Y: float32(n.Y), Symbol: "roundRect",
			SymbolSize: []float64{width, 46},
			ItemStyle:  &opts.ItemStyle{Color: rampColour(t), BorderColor: border, BorderWidth: 1.5},
			Tooltip:    itemTooltip(tip...)})
	}
	// ECharts fits the nodes' bounding box into the series box; a graph
	// whose nodes share one row or column has a flat box and would be
	// stretched, so two invisible frame nodes give the box a minimum size.
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, n := range nodes {
		minX, minY = math.Min(minX, n.X), math.Min(minY, n.Y)
		maxX, maxY = math.Max(maxX, n.X), math.Max(maxY, n.Y)
	}
	if len(nodes) > 0 {
		cx, cy := (minX+maxX)/2, (minY+maxY)/2
		halfW, halfH := math.Max((maxX-minX)/2, layerGap), math.Max((maxY-minY)/2, slotGap)
		for i, p := range [][2]float64{{cx - halfW, cy - halfH}, {cx + halfW, cy + halfH}} {
			data = append(data, opts.GraphNode{Name: frameName(i), X: float32(p[0] + 1000), Y: float32(p[1] + 1000), SymbolSize: 0,
				Tooltip: &opts.Tooltip{Show: opts.Bool(false)}})
		}
		for i := range data[:len(nodes)] {
			data[i].X += 1000
			data[i].Y += 1000
		}
	}
	// Each arrow is a chain of links through its bend points, which are
	// invisible nodes; only the last link carries the arrowhead.
	// report.js moves both ends of every chain onto the borders of the
	// node boxes (it knows the pixel scale), so each arrowhead is visible.
	var links []opts.GraphLink
	var bends []opts.GraphNode
	for k, e := range edges {
		from := e.From
		for j, b := range e.Bends {
			name := bendName(k, j)
			bends = append(bends, opts.GraphNode{Name: name, X: float32(b[0] + 1000), Y: float32(b[1] + 1000), SymbolSize: 0,
				Tooltip: &opts.Tooltip{Show: opts.Bool(false)}})
			links = append(links, opts.GraphLink{Source: from, Target: name})
			from = name
		}
		links = append(links, opts.GraphLink{Source: from, Target: e.To})
	}
	data = append(data, bends...)
	g := charts.NewGraph()
	g.SetGlobalOptions(
		charts.WithTooltipOpts(plainTooltip()),
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(false)}),
	)
	g.AddSeries("causal graph", data, links, charts.WithSeriesOpts(func(s *charts.SingleSeries) {
		s.Id = "gw-graph"
		s.Layout = "none"
		s.EdgeSymbol = []string{"none", "arrow"}
		s.EdgeSymbolSize = []int{0, 10}
		s.LineStyle = &opts.LineStyle{Color: colourMuted, Width: 1.5, Opacity: opts.Float(0.9)}
		s.Label = &opts.Label{Show: opts.Bool(true), Color: colourInk, FontSize: 12, LineHeight: 16}
		s.Left, s.Right, s.Top, s.Bottom = "60", "60", "30", "30"
	}))
	o := optionOf(g)
	// Per-node label colours: white text on strongly shaded nodes.
	if series, ok := o["series"].([]any); ok && len(series) == 1 {
		sm := series[0].(map[string]any)
		ls, _ := sm["links"].([]any)
		li := 0
		for _, e := range edges {
			for j := 0; j <= len(e.Bends); j++ {
				l := ls[li].(map[string]any)
				if j < len(e.Bends) {
					l["symbol"] = []string{"none", "none"}
				}
				l["tooltip"] = map[string]any{"formatter": string(itemTooltip(e.From + " → " + e.To).Formatter)}
				li++
			}
		}
		items, _ := sm["data"].([]any)
		for i, it := range items {
			if i >= len(nodes) {
				it.(map[string]any)["label"] = map[string]any{"show": false}
				continue
			}
			t := 0.0
			if v, ok := contrib[nodes[i].Name]; ok && maxAbs > 0 {
				t = v / maxAbs
			}
			if math.Abs(t) > 0.6 {
				it.(map[string]any)["label"] = map[string]any{"color": "#FFFFFF"}
			}
			if v, ok := contrib[nodes[i].Name]; ok {
				it.(map[string]any)["label"] = mergeLabel(it.(map[string]any)["label"], nodes[i].Name+"\n"+formatDelta(m.Metric, v))
			}
		}
	}
	return o
}

// mergeLabel sets the formatter of a data item's label, keeping its other
// settings.
func mergeLabel(label any, text string) map[string]any {
	l, _ := label.(map[string]any)
	if l == nil {
		l = map[string]any{}
	}
	l["formatter"] = text
	return l
}

// frameName names the invisible frame nodes; the zero-width space keeps
// them apart from any column name.
func frameName(i int) string { return fmt.Sprintf("\u200bframe-%d", i) }

// bendName names the j-th bend point of the k-th arrow, like frameName.
func bendName(k, j int) string { return fmt.Sprintf("\u200bbend-%d-%d", k, j) }
