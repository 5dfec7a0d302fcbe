package fairness

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"slices"
	"strings"

	"gopkg.in/yaml.v3"
)

// Readings of the graph that Run can rerun an audit under
// (GraphRun.Reading).
const (
	// ReadingSpec is the spec's own graph: the audit's main numbers.
	ReadingSpec = "spec"
	// ReadingFile is a graph read from a file by LoadAltGraph.
	ReadingFile = "file"
	// ReadingIndependent makes every node a root: no node depends on
	// another, the "no structure" reading (IndependentGraph).
	ReadingIndependent = "independent_roots"
	// ReadingLabelParent makes the label the only parent of every node
	// the spec's graph places below it (LabelParentGraph).
	ReadingLabelParent = "label_only_parent"
)

// AltGraph is one alternative graph over the spec's columns.
type AltGraph struct {
	Reading string     // ReadingFile, ReadingIndependent or ReadingLabelParent
	File    string     // the file it was read from (ReadingFile), else ""
	SHA256  string     // hex SHA-256 of that file's bytes, else ""
	Graph   []NodeSpec // validated like the spec's graph
}

// LoadAltGraph reads an alternative graph from the YAML file at path
// (ParseAltGraph). A missing file gives a *SpecError wrapping
// ErrSpecNotFound.
func LoadAltGraph(base *Spec, path string) (*AltGraph, error) {
	f, err := os.Open(path)
	if err != nil {
		msg := "cannot read graph file: %v"
		if errors.Is(err, fs.ErrNotExist) {
			return nil, &SpecError{File: path, Err: wrapf(ErrSpecNotFound, "graph file not found")}
		}
		return nil, &SpecError{File: path, Err: wrapf(ErrSpecNotFound, msg, err)}
	}
	defer f.Close()
	src, err := readSpecFile(f)
	if errors.Is(err, ErrTooLarge) {
		return nil, &SpecError{File: path, Err: err}
	}
	if err != nil {
		return nil, &SpecError{File: path, Err: wrapf(ErrSpecNotFound, "cannot read graph file: %v", err)}
	}
	return ParseAltGraph(base, path, src)
}

// ParseAltGraph parses src, a YAML mapping with the one key graph written
// as in a spec, into an alternative to base's graph. It must cover exactly
// base's graph columns (an error lists what differs) and pass the spec's
// graph checks (validateGraph); every problem is a *SpecError naming file,
// line and key.
func ParseAltGraph(base *Spec, file string, src []byte) (*AltGraph, error) {
	sum := sha256.Sum256(src)
	p := &specParser{file: file}
	var doc yaml.Node
	if err := yaml.Unmarshal(src, &doc); err != nil {
		return nil, p.syntax(err)
	}
	if len(doc.Content) == 0 {
		return nil, specErr(file, 0, "graph", ErrMissingKey, "the graph file is empty; it holds one key, graph, written as in a spec")
	}
	root := resolve(doc.Content[0])
	if root.Kind != yaml.MappingNode {
		return nil, specErr(file, root.Line, "", ErrBadValue, "a graph file must be a mapping with the one key graph")
	}
	alt := &Spec{File: file}
	line := 0
	for i := 0; i+1 < len(root.Content); i += 2 {
		k, v := resolve(root.Content[i]), resolve(root.Content[i+1])
		if k.Value != "graph" {
			return nil, p.unknownKey(k.Line, k.Value, k.Value, []string{"graph"})
		}
		if line != 0 {
			return nil, specErr(file, k.Line, "graph", ErrDuplicateKey, "key given twice (first on line %d)", line)
		}
		line = k.Line
		if err := p.graph(alt, v); err != nil {
			return nil, err
		}
	}
	if line == 0 {
		return nil, specErr(file, 0, "graph", ErrMissingKey, "missing required key %q", "graph")
	}
	if err := sameColumns(base, alt, line); err != nil {
		return nil, err
	}
	if err := validateAltGraph(base, file, alt.Graph); err != nil {
		return nil, err
	}
	return &AltGraph{Reading: ReadingFile, File: file, SHA256: hex.EncodeToString(sum[:]), Graph: alt.Graph}, nil
}

// sameColumns checks that alt's graph holds exactly base's graph columns;
// line is the line of alt's graph key.
func sameColumns(base, alt *Spec, line int) error {
	want, got := base.Columns(), alt.Columns()
	var missing, extra []string
	for _, c := range want {
		if !slices.Contains(got, c) {
			missing = append(missing, c)
		}
	}
	for _, c := range got {
		if !slices.Contains(want, c) {
			extra = append(extra, c)
		}
	}
	if len(missing)+len(extra) == 0 {
		return nil
	}
	var parts []string
	if len(missing) > 0 {
		parts = append(parts, fmt.Sprintf("the spec's graph columns %s are in no node of this graph", quoteList(missing)))
	}
	if len(extra) > 0 {
		parts = append(parts, fmt.Sprintf("columns %s are not in the spec's graph", quoteList(extra)))
	}
	return specErr(alt.File, line, "graph", ErrBadValue, "an alternative graph must hold the same columns as the spec's graph: %s", strings.Join(parts, "; "))
}

// quoteList quotes each name and joins them with commas.
func quoteList(xs []string) string {
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = fmt.Sprintf("%q", x)
	}
	return strings.Join(q, ", ")
}

// validateAltGraph runs the spec's graph checks on graph in place of
// base's; errors name file.
func validateAltGraph(base *Spec, file string, graph []NodeSpec) error {
	s := *base
	s.File = file
	s.Graph = graph
	return validateGraph(&s)
}

// IndependentGraph is the "no structure" reading of s's graph: the same
// nodes and columns, every node a root.
func IndependentGraph(s *Spec) AltGraph {
	g := make([]NodeSpec, len(s.Graph))
	for i, n := range s.Graph {
		g[i] = NodeSpec{Node: n.Node, Columns: n.Columns, Line: n.Line, columnLines: n.columnLines}
	}
	return AltGraph{Reading: ReadingIndependent, Graph: g}
}

// LabelParentGraph is the reading of s's graph in which the label is the
// only parent of every node the spec's graph places below it (its
// descendants, such as findings and the score node); the label's node and
// the nodes not below it keep their parents.
func LabelParentGraph(s *Spec) AltGraph {
	label := labelNode(s)
	below := descendants(s.Graph, label)
	g := make([]NodeSpec, len(s.Graph))
	for i, n := range s.Graph {
		g[i] = n
		if below[n.Node] {
			g[i].Parents = []string{label}
			g[i].parentLines = []int{n.Line}
		}
	}
	return AltGraph{Reading: ReadingLabelParent, Graph: g}
}

// labelNode names the node holding the label column.
func labelNode(s *Spec) string {
	for _, n := range s.Graph {
		if slices.Contains(n.Columns, s.Label) {
			return n.Node
		}
	}
	return ""
}

// descendants returns the nodes reachable from node along parent → child
// edges, node itself excluded.
func descendants(graph []NodeSpec, node string) map[string]bool {
	out := map[string]bool{}
	frontier := []string{node}
	for len(frontier) > 0 {
		cur := frontier[0]
		frontier = frontier[1:]
		for _, n := range graph {
			if !out[n.Node] && slices.Contains(n.Parents, cur) {
				out[n.Node] = true
				frontier = append(frontier, n.Node)
			}
		}
	}
	return out
}
