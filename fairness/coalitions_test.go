package fairness

import (
	"math"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
)

// A Result's coalitions must be the game its contributions come from:
// the Shapley values of the listed values (Shapley 1953, computed by
// attribution.ExactShapley) are the contributions, the full coalition is
// the estimated gap, N∖{i} each contribution's gap_if_equalised, and
// every coalition names its members by the bits of its position. Checked
// for one side with one fold split, and both sides with several (the
// small table's default: 10 splits below 2,000 records per group).
func TestRunCoalitionsAreTheGame(t *testing.T) {
	for _, extra := range []string{"estimate_from: reference\nfold_splits: 1\n", "estimate_from: both\n"} {
		spec := writeAudit(t, smallSpec+extra, smallData(200))
		r, err := Run(spec, RunOptions{Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		k := len(r.Mechanisms)
		full := 1<<k - 1
		for _, m := range r.Metrics {
			if len(m.Coalitions) != 1<<k || m.CoalitionsOmitted != "" {
				t.Fatalf("%s %s: %d coalitions, omitted %q", extra, m.Metric, len(m.Coalitions), m.CoalitionsOmitted)
			}
			v := make([]float64, len(m.Coalitions))
			for S, c := range m.Coalitions {
				v[S] = c.ChangeFromReference
				var want []string
				for i, mr := range r.Mechanisms {
					if S&(1<<i) != 0 {
						want = append(want, mr.Node)
					}
				}
				if strings.Join(c.ComparisonNodes, ",") != strings.Join(want, ",") {
					t.Errorf("coalition %b names %v, want %v", S, c.ComparisonNodes, want)
				}
			}
			phi := attribution.ExactShapley(v, k)
			for i, c := range m.Contributions {
				if math.Abs(phi[i]-c.Value) > 1e-12 {
					t.Errorf("%s%s φ(%s) of the coalitions %v, contribution %v", extra, m.Metric, c.Node, phi[i], c.Value)
				}
				if v[full&^(1<<i)] != c.IfEqualised {
					t.Errorf("%s: v(N∖{%s}) %v, gap if equalised %v", m.Metric, c.Node, v[full&^(1<<i)], c.IfEqualised)
				}
			}
			if v[full] != m.Estimated {
				t.Errorf("%s: v(N) %v, estimated gap %v", m.Metric, v[full], m.Estimated)
			}
		}
	}
}

// Coalitions are left out, with the reason, above the coalition limit,
// when Shapley values were sampled, and when combine_sides mechanism
// combined the contributions per mechanism.
func TestRunCoalitionsOmitted(t *testing.T) {
	for _, tc := range []struct {
		extra string
		limit int
		want  string
	}{
		{"", 2, OmittedAboveLimit},
		{"", -1, OmittedAboveLimit},
		{"exact_limit: 2\n", 0, OmittedSampled},
		{"estimate_from: both\ncombine_sides: mechanism\nfold_splits: 1\n", 0, OmittedPerMechanism},
		{"", 3, ""},
	} {
		spec := writeAudit(t, smallSpec+tc.extra, smallData(120))
		r, err := Run(spec, RunOptions{Workers: 2, CoalitionLimit: tc.limit})
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range r.Metrics {
			if m.CoalitionsOmitted != tc.want || (tc.want == "") != (len(m.Coalitions) == 8) {
				t.Errorf("%q limit %d, %s: omitted %q with %d coalitions, want %q", tc.extra, tc.limit, m.Metric, m.CoalitionsOmitted, len(m.Coalitions), tc.want)
			}
		}
	}
}
