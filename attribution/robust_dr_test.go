package attribution_test

// Double robustness of the robust estimator, checked directly: with the
// true density ratios and a deliberately wrong regression, and with wrong
// ratios and the true regressions, the FNR contributions stay within
// their sampling error of the ground truth; with both wrong they do not.
// Sources: ground truth by direct simulation of the SCM (common random
// numbers, package scm) + Shapley 1953; the true ratios and conditional
// means are derived analytically from the screening model's equations
// (scm.Screening) below.

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/metrics"
)

// screeningParams are one group's parameters of scm.Screening.
type screeningParams struct {
	ageMu, prev, kappa, tau, nu float64
	site                        [3]float64
}

func paramsOf(sh scm.Shift) [2]screeningParams {
	ref := screeningParams{tau: 1, site: [3]float64{0.5, 0.3, 0.2}}
	cmp := ref
	cmp.ageMu, cmp.prev, cmp.kappa, cmp.nu = sh.Age, sh.Prevalence, sh.DiseasedMarker, sh.Unread
	if sh.Spread != 0 {
		cmp.tau = sh.Spread
	}
	if sh.Site {
		cmp.site = [3]float64{0.3, 0.3, 0.4}
	}
	return [2]screeningParams{ref, cmp}
}

// screeningRecord holds one record's node values.
type screeningRecord struct{ age, site, dis, ma, mb, unread float64 }

func screeningRecords(s *attribution.Sample, mechs []attribution.Mechanism) []screeningRecord {
	n, _ := s.X.Dims()
	out := make([]screeningRecord, n)
	for i := range out {
		col := func(m int) float64 { return s.X.At(i, mechs[m].NodeCols[0]) }
		site := 0.0
		for l, c := range mechs[scm.NodeSite].NodeCols {
			if s.X.At(i, c) == 1 {
				site = float64(l + 1)
			}
		}
		out[i] = screeningRecord{age: col(scm.NodeAge), site: site, dis: col(scm.NodeDisease), ma: col(scm.NodeMarkerA), mb: col(scm.NodeMarkerB), unread: col(scm.NodeUnread)}
	}
	return out
}

func sigmoid(x float64) float64 { return 1 / (1 + math.Exp(-x)) }

func normCDF(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// diseaseP is P_g(disease = 1 | age, site).
func (p screeningParams) diseaseP(age, site float64) float64 {
	eta := -1.5 + 0.5*age + p.prev
	switch int(site) {
	case 1:
		eta += 0.4
	case 2:
		eta += 0.8
	}
	return sigmoid(eta)
}

// trueLogRatios returns log r_i = log P_cmp(x_i | pa_i) − log P_ref(x_i |
// pa_i) of every mechanism at every record, from the model's equations.
func trueLogRatios(sh scm.Shift, recs []screeningRecord) [][]float64 {
	pr := paramsOf(sh)
	a, b := pr[0], pr[1]
	out := make([][]float64, 6)
	for m := range out {
		out[m] = make([]float64, len(recs))
	}
	normal := func(x, mu, sd float64) float64 { return -math.Log(sd) - (x-mu)*(x-mu)/(2*sd*sd) }
	for i, v := range recs {
		out[scm.NodeAge][i] = normal(v.age, b.ageMu, 1) - normal(v.age, a.ageMu, 1)
		out[scm.NodeSite][i] = math.Log(b.site[int(v.site)] / a.site[int(v.site)])
		p0, p1 := a.diseaseP(v.age, v.site), b.diseaseP(v.age, v.site)
		if v.dis == 1 {
			out[scm.NodeDisease][i] = math.Log(p1 / p0)
		} else {
			out[scm.NodeDisease][i] = math.Log((1 - p1) / (1 - p0))
		}
		m := 1.5*v.dis + 0.3*v.age
		out[scm.NodeMarkerA][i] = normal(v.ma, m+b.kappa*v.dis, 1) - normal(v.ma, m+a.kappa*v.dis, 1)
		out[scm.NodeMarkerB][i] = normal(v.mb, 1.2*v.dis, b.tau) - normal(v.mb, 1.2*v.dis, a.tau)
		base := 0.5*v.age + v.dis
		out[scm.NodeUnread][i] = normal(v.unread, base+b.nu, 1) - normal(v.unread, base+a.nu, 1)
	}
	return out
}

// fnrMeans returns the true sequential regressions of FNR's terms, y (the
// denominator) and y·[s < 0.5] (the numerator), under the groups of the
// later steps. With s = σ(−2 + 1.2·a + 0.9·b + 0.3·age), s < 0.5 ⇔
// marker_b < u = (2 − 1.2·marker_a − 0.3·age)/0.9, and marker_b ~ N(1.2·d,
// τ²), so the step of marker_b gives d·Φ((u − 1.2)/τ); for marker_a ~
// N(m, 1) that is d·Φ(α − β·marker_a), whose mean over marker_a is
// Φ((α − β·m)/√(1 + β²)); disease mixes it with P(d = 1 | age, site), and
// site with its level probabilities.
func fnrMeans(sh scm.Shift, recs []screeningRecord) func(term string, mech int, group func(int) int, i int) float64 {
	pr := paramsOf(sh)
	return func(term string, mech int, group func(int) int, i int) float64 {
		v := recs[i]
		// h is E[y·[s < t] | age, disease = 1] after the marker steps.
		h := func() float64 {
			tau := pr[group(scm.NodeMarkerB)].tau
			alpha, beta := (0.92-0.3*v.age)/(0.9*tau), 1.2/(0.9*tau)
			m := 1.5 + 0.3*v.age + pr[group(scm.NodeMarkerA)].kappa
			return normCDF((alpha - beta*m) / math.Sqrt(1+beta*beta))
		}
		num := term == "y1d0"
		switch mech {
		case scm.NodeMarkerB:
			tau := pr[group(scm.NodeMarkerB)].tau
			u := (2 - 1.2*v.ma - 0.3*v.age) / 0.9
			return v.dis * normCDF((u-1.2)/tau)
		case scm.NodeMarkerA:
			return v.dis * h()
		case scm.NodeDisease:
			p := pr[group(scm.NodeDisease)].diseaseP(v.age, v.site)
			if num {
				return p * h()
			}
			return p
		case scm.NodeSite:
			ps := pr[group(scm.NodeSite)]
			var s float64
			for l := 0; l < 3; l++ {
				p := pr[group(scm.NodeDisease)].diseaseP(v.age, float64(l))
				if num {
					p *= h()
				}
				s += ps.site[l] * p
			}
			return s
		}
		panic("fnrMeans: no regression at this step")
	}
}

func TestRobustDoubleRobustness(t *testing.T) {
	const n = 4000 // per group; about 5 s, mostly the ground truth
	c := gtCase(t, "combined")
	names := []string{metrics.NameFNR}
	truth, err := scm.GroundTruth(c.Model, names, 1<<19, 20260, scm.ScreeningThreshold, 1)
	if err != nil {
		t.Fatal(err)
	}
	s, mechs, err := scm.Pooled(c.Model, n, n, 42)
	if err != nil {
		t.Fatal(err)
	}
	recs := screeningRecords(s, mechs)
	right := trueLogRatios(c.Shift, recs)
	wrong := make([][]float64, len(right)) // no reweighting at all
	for m := range wrong {
		wrong[m] = make([]float64, len(recs))
	}
	rightReg := fnrMeans(c.Shift, recs)
	// The true regressions of the reference group whatever the coalition.
	wrongReg := func(term string, mech int, _ func(int) int, i int) float64 {
		return rightReg(term, mech, func(int) int { return 0 }, i)
	}
	opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 7, FoldSplits: 1, Learners: []classify.Learner{classify.NewLinear()},
		Estimator: attribution.EstimatorRobust, Reads: c.Model.Reads()}
	worstOf := func(logr [][]float64, reg func(string, int, func(int) int, int) float64) float64 {
		d, err := attribution.Decompose(s, mechs, names, attribution.WithRobustHooks(opt, logr, reg))
		if err != nil {
			t.Fatal(err)
		}
		md := d.Metrics[0]
		worst := 0.0
		for i, got := range md.Contributions {
			tol := 4*md.Influence.Contributions[i] + 4*truth[0].SE[i] + 1e-9
			worst = math.Max(worst, math.Abs(got-truth[0].Shapley[i])/tol)
		}
		t.Logf("contributions %+.4f (truth %+.4f)", md.Contributions, truth[0].Shapley)
		return worst
	}
	for _, tc := range []struct {
		name      string
		logr      [][]float64
		reg       func(string, int, func(int) int, int) float64
		wantClose bool
	}{
		{"true ratios, true regressions", right, rightReg, true},
		{"true ratios, wrong regressions", right, wrongReg, true},
		{"wrong ratios, true regressions", wrong, rightReg, true},
		{"wrong ratios, wrong regressions", wrong, wrongReg, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			worst := worstOf(tc.logr, tc.reg)
			t.Logf("largest |φ̂ − φ| / (4 SE): %.2f", worst)
			if tc.wantClose && worst > 1 {
				t.Errorf("a contribution is off by %.2f × its tolerance", worst)
			}
			// Both nuisances wrong: the bias must show, or the check
			// above could not fail.
			if !tc.wantClose && worst < 1.5 {
				t.Errorf("with both nuisances wrong the largest error is only %.2f × the tolerance", worst)
			}
		})
	}
}
