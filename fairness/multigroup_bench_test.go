package fairness

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/internal/scm"
)

// BenchmarkRunGroups compares one audit of five comparison groups
// (RunGroups: the spec parsed and the data file read once) with five
// separate audits, each parsing its own spec and reading the file (LoadSpec
// and Run per comparison, as five runs of the command line would), on a
// cohort of six groups of 2,000 records from internal/scm's Screening
// model, without intervals:
//
//	go test ./fairness -run '^$' -bench RunGroups -benchtime 3x
func BenchmarkRunGroups(b *testing.B) {
	m := scm.Screening("bench", scm.Shift{Prevalence: 0.5, Age: 0.3})
	groups := []scmGroup{{"g0", m, scm.Reference, 2000, 1}}
	values := []string{"g1", "g2", "g3", "g4", "g5"}
	for i, v := range values {
		groups = append(groups, scmGroup{v, m, scm.Comparison, 2000, uint64(i + 2)})
	}
	path := writeSCMCohort(b, groups, "groups: {column: group, reference: g0, comparison: every-other}\nclassifier: linear\n")
	src, err := os.ReadFile(path)
	if err != nil {
		b.Fatal(err)
	}
	dir := filepath.Dir(path)
	var single []string
	for _, v := range values {
		p := filepath.Join(dir, "spec-"+v+".yaml")
		if err := os.WriteFile(p, []byte(strings.Replace(string(src), "comparison: every-other", "comparison: "+v, 1)), 0o644); err != nil {
			b.Fatal(err)
		}
		single = append(single, p)
	}
	b.Run("one-audit-five-groups", func(b *testing.B) {
		for b.Loop() {
			spec, err := LoadSpec(path)
			if err != nil {
				b.Fatal(err)
			}
			if _, err := RunGroups(spec, RunOptions{}); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("five-separate-audits", func(b *testing.B) {
		for b.Loop() {
			for _, p := range single {
				spec, err := LoadSpec(p)
				if err != nil {
					b.Fatal(err)
				}
				if _, err := Run(spec, RunOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		}
	})
}
