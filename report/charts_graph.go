package report

import (
	"fmt"
	"math"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"

	"github.com/gapwise/gapwise/fairness"
)

// rampColour maps t ∈ [−1, 1] to a colour: colourNarrows at −1,
// colourNeutral at 0, colourWidens at 1, interpolating linearly in sRGB.
func rampColour(t float64) string {
	t = math.Max(-1, math.Min(1, t))
	end := colourWidens
	if t < 0 {
		end, t = colourNarrows, -t
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

// gapShade is the shade of a node in rampColour's terms: its contribution
// relative to the largest |φ| of the metric, positive when it widens the
// gap and negative when it narrows it; 0 when the gap prints as zero or
// the contribution is not estimable.
func gapShade(m fairness.MetricResult, c fairness.Contribution, maxAbs float64) float64 {
	if maxAbs == 0 || c.NotEstimable || isZeroText(formatMagnitude(m.Metric, m.Gap)) {
		return 0
	}
	t := c.Value / maxAbs
	if m.Gap < 0 {
		t = -t
	}
	return t
}

// graphChart draws the causal graph for one metric: nodes in layoutDAG's
// layers, arrows from parents to children, each node filled by the part
// its contribution φ plays in the gap (gapShade, rampColour: orange when
// it widens the gap, sky blue when it narrows it, stronger for larger
// |φ|), outlined dashed in vermillion and labelled so when unreliable,
// its label showing the contribution, and a tooltip with the mechanism's
// estimation diagnostics.
func graphChart(res *fairness.Result, m fairness.MetricResult) chartOption {
	nodes, edges := layoutDAG(res.Mechanisms)
	contrib := map[string]fairness.Contribution{}
	var maxAbs float64
	for _, c := range m.Contributions {
		contrib[c.Node] = c
		if !c.NotEstimable {
			maxAbs = math.Max(maxAbs, math.Abs(c.Value))
		}
	}
	diag := map[string]fairness.MechanismResult{}
	for _, mr := range res.Mechanisms {
		diag[mr.Node] = mr
	}
	flags := unreliable(res)
	var data []opts.GraphNode
	for _, n := range nodes {
		c, has := contrib[n.Name]
		t := gapShade(m, c, maxAbs)
		tip := []string{nodeName(res, n.Name)}
		if has {
			d := diag[n.Name]
			tip = []string{mechName(res, d.Node),
				"contribution to " + MetricTitle(m.Metric) + ": " + nodeValue(m.Metric, c),
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
			border = colourFlag
		}
		// The box holds the name, the contribution and, when unreliable,
		// that word, one line each (nodeBox).
		width, height := nodeBox(nodeName(res, n.Name), nodeValue(m.Metric, c), flags[n.Name] != "")
		data = append(data, opts.GraphNode{Name: n.Name, X: float32(n.X), Y: float32(n.Y), Symbol: "roundRect",
			SymbolSize: []float64{width, height},
			ItemStyle:  &opts.ItemStyle{Color: rampColour(t), BorderColor: border, BorderWidth: 1.5},
			Tooltip:    itemTooltip(tip...)})
	}
	data = withFrameNodes(data, nodes)
	links, bends := edgeLinks(edges)
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
	styleGraphItems(o, res, m, nodes, edges, contrib, flags)
	return o
}

// withFrameNodes appends two invisible frame nodes and shifts the nodes
// (see the comment inside).
func withFrameNodes(data []opts.GraphNode, nodes []dagNode) []opts.GraphNode {
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
	return data
}

// edgeLinks returns the links of every arrow and its invisible bend nodes.
func edgeLinks(edges []dagEdge) ([]opts.GraphLink, []opts.GraphNode) {
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
	return links, bends
}

// styleGraphItems sets, in the chart option o, the arrows' tooltips and
// bend links without heads, and every node's label (name, value and, when
// unreliable, that word with a dashed border).
func styleGraphItems(o map[string]any, res *fairness.Result, m fairness.MetricResult, nodes []dagNode, edges []dagEdge, contrib map[string]fairness.Contribution, flags map[string]string) {
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
				l["tooltip"] = map[string]any{"formatter": string(itemTooltip(nodeName(res, e.From) + " → " + nodeName(res, e.To)).Formatter)}
				li++
			}
		}
		items, _ := sm["data"].([]any)
		for i, it := range items {
			if i >= len(nodes) {
				it.(map[string]any)["label"] = map[string]any{"show": false}
				continue
			}
			c, ok := contrib[nodes[i].Name]
			if !ok {
				continue
			}
			text := formatterText(nodeName(res, nodes[i].Name)) + "\n" + nodeValue(m.Metric, c)
			if _, flagged := flags[c.Node]; flagged {
				text += "\nunreliable"
				if is, ok := it.(map[string]any)["itemStyle"].(map[string]any); ok {
					is["borderType"] = "dashed"
				}
			}
			it.(map[string]any)["label"] = mergeLabel(it.(map[string]any)["label"], text)
		}
	}
}

// nodeBox returns the size in pixels of a node's box: wide enough for
// the longer of its name and its value at about 8.5 px a character of
// 12 px type (at least 76), and 16 px taller for a third line saying it
// is unreliable.
func nodeBox(name, value string, flagged bool) (width, height float64) {
	n := max(len([]rune(name)), len([]rune(value)))
	width = math.Max(76, 8.5*float64(n)+28)
	height = 46
	if flagged {
		height += 16
	}
	return width, height
}

// nodeValue is a node's contribution as its label and tooltip print it,
// or "not estimable".
func nodeValue(metric string, c fairness.Contribution) string {
	if c.NotEstimable {
		return notEstimable
	}
	return formatDelta(metric, c.Value)
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
