package synth

import (
	"slices"
	"testing"

	"gopkg.in/yaml.v3"
)

// specDoc mirrors the spec keys the generators write.
type specDoc struct {
	Title     string   `yaml:"title"`
	Synthetic bool     `yaml:"synthetic"`
	Data      string   `yaml:"data"`
	Label     string   `yaml:"label"`
	Score     string   `yaml:"score"`
	Threshold float64  `yaml:"threshold"`
	Seed      int      `yaml:"seed"`
	Metrics   []string `yaml:"metrics"`
	Groups    struct {
		Column, Reference, Comparison string
	} `yaml:"groups"`
	Graph []struct {
		Node    string   `yaml:"node"`
		Columns []string `yaml:"columns"`
		Parents []string `yaml:"parents"`
	} `yaml:"graph"`
}

func TestAnaemiaSpecMatchesTable(t *testing.T) {
	var d specDoc
	if err := yaml.Unmarshal(AnaemiaSpec("cohort.csv"), &d); err != nil {
		t.Fatal(err)
	}
	if !d.Synthetic || d.Data != "cohort.csv" || d.Threshold != 0.5 || d.Seed != 1 || d.Title != "Anaemia screening (synthetic demo)" {
		t.Errorf("spec header: %+v", d)
	}
	header := AnaemiaTable(nil).Header
	var nodes []string
	for _, n := range d.Graph {
		nodes = append(nodes, n.Node)
		cols := n.Columns
		if cols == nil {
			cols = []string{n.Node}
		}
		for _, c := range cols {
			if !slices.Contains(header, c) {
				t.Errorf("node %s: column %s not in the table", n.Node, c)
			}
		}
	}
	if !slices.Equal(nodes, AnaemiaNodes()) {
		t.Errorf("graph nodes %v, want %v", nodes, AnaemiaNodes())
	}
	for _, c := range []string{d.Label, d.Score, d.Groups.Column} {
		if !slices.Contains(header, c) {
			t.Errorf("column %s not in the table", c)
		}
	}
}

func TestBenchSpecMatchesTable(t *testing.T) {
	for _, k := range []int{2, 5} {
		var d specDoc
		if err := yaml.Unmarshal(BenchSpec("b.csv", k), &d); err != nil {
			t.Fatal(err)
		}
		if len(d.Graph) != k {
			t.Errorf("k=%d: %d graph nodes", k, len(d.Graph))
		}
		tab, _ := BenchTable(1, k, 1)
		for _, n := range d.Graph {
			if !slices.Contains(tab.Header, n.Node) {
				t.Errorf("k=%d: node %s not a column", k, n.Node)
			}
		}
	}
}
