package synth

import (
	"fmt"
	"strings"
)

// AnaemiaSpec returns the demo's audit spec (YAML) for the cohort written to
// dataFile, a path relative to the spec's folder. It marks the data
// synthetic and audits FNR, FPR, PPV, Brier score, calibration-in-the-large
// and ECE at threshold 0.5 with seed 1. Its names key gives the groups,
// nodes and columns readable names with the units of the generator
// (GroupParams), and its model key names the invented screening model
// that wrote the score; it has no audit_date, so the demo's outputs are
// the same on any day.
func AnaemiaSpec(dataFile string) []byte { return AnaemiaSpecVersion(dataFile, "1.0") }

// AnaemiaSpecVersion is AnaemiaSpec naming the model's version (DemoModel)
// in its model key.
func AnaemiaSpecVersion(dataFile, version string) []byte {
	return []byte(`# Anaemia screening audit. SYNTHETIC DATA: invented by gapwise's demo
# generator (package fairness/synth); it describes no real patients.
title: Anaemia screening (synthetic demo)
synthetic: true
data: ` + dataFile + `
label: anaemia
score: score
threshold: 0.5
groups: {column: sex, reference: male, comparison: female}
metrics: [fnr, fpr, ppv, brier, calibration_in_the_large, ece]
seed: 1
graph:
  - node: age
  - node: anaemia
    parents: [age]
  - node: hb
    parents: [anaemia, age]
  - node: panel
    columns: [mcv, rdw]
    parents: [anaemia]
  - node: bmi
    parents: [age]
names:
  groups: {reference: men, comparison: women}
  nodes:
    age: {name: age, unit: years}
    anaemia: {levels: {0: no anaemia, 1: anaemia}}
    hb: {name: haemoglobin, unit: g/dL}
    panel: red-cell indices
    bmi: {name: body-mass index, unit: kg/m²}
  columns:
    mcv: {name: mean cell volume, unit: fL}
    rdw: {name: red-cell distribution width, unit: "%"}
    score: anaemia risk score
model: {name: Demo anaemia screening model, version: "` + version + `"}
`)
}

// BenchSpec returns an audit spec (YAML) for a benchmark cohort with k
// mechanisms written to dataFile (see BenchTable): label y, nodes x1 …
// x(k−1), metrics FNR, FPR and Brier score, threshold 0.5, seed 1.
func BenchSpec(dataFile string, k int) []byte {
	var b strings.Builder
	fmt.Fprintf(&b, "# Benchmark cohort. SYNTHETIC DATA from gapwise's generator (package fairness/synth).\n")
	fmt.Fprintf(&b, "title: Benchmark (synthetic, %d mechanisms)\nsynthetic: true\ndata: %s\n", k, dataFile)
	b.WriteString("label: y\nscore: score\nthreshold: 0.5\n")
	b.WriteString("groups: {column: group, reference: a, comparison: b}\n")
	b.WriteString("metrics: [fnr, fpr, brier]\nseed: 1\ngraph:\n  - node: y\n")
	for j := 1; j < k; j++ {
		fmt.Fprintf(&b, "  - node: x%d\n    parents: [%s]\n", j, strings.Join(benchParents(j), ", "))
	}
	return []byte(b.String())
}

// AnaemiaAltGraph returns an alternative causal graph (YAML, a graph key
// alone) over the demo spec's columns, for `gapwise decompose --alt-graph`:
// it supposes that haemoglobin depends on anaemia alone, not on age, and
// that the red-cell indices depend on age as well as on anaemia. The demo
// generator draws haemoglobin given anaemia and age (Generate), so the
// spec's graph is the one that holds; the alternative shows what a
// reviewer who drew the graph differently would conclude.
func AnaemiaAltGraph() []byte {
	return []byte(`# An alternative causal graph for the anaemia-screening demo (SYNTHETIC
# scenario): haemoglobin depends on anaemia alone, the red-cell indices
# on age as well. gapwise demo reruns the audit under it to show which
# conclusions depend on the graph.
graph:
  - node: age
  - node: anaemia
    parents: [age]
  - node: hb
    parents: [anaemia]
  - node: panel
    columns: [mcv, rdw]
    parents: [anaemia, age]
  - node: bmi
    parents: [age]
`)
}
