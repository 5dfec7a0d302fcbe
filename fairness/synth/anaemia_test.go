package synth

import (
	"math"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// truncMean is the mean of N(mu, sd²) truncated to [lo, hi]:
// mu + sd·(φ(α) − φ(β)) / (Φ(β) − Φ(α)) (Johnson, Kotz & Balakrishnan 1994,
// ch. 13; from memory), with φ and Φ from gonum.
func truncMean(mu, sd, lo, hi float64) float64 {
	al, be := (lo-mu)/sd, (hi-mu)/sd
	n := distuv.UnitNormal
	return mu + sd*(n.Prob(al)-n.Prob(be))/(n.CDF(be)-n.CDF(al))
}

// stats returns the mean and standard error of xs.
func stats(xs []float64) (mean, se float64) {
	for _, x := range xs {
		mean += x
	}
	mean /= float64(len(xs))
	var ss float64
	for _, x := range xs {
		ss += (x - mean) * (x - mean)
	}
	return mean, math.Sqrt(ss / float64(len(xs)-1) / float64(len(xs)))
}

func TestGenerateDeterministic(t *testing.T) {
	s := DefaultScenario()
	a, b := s.Generate(500, 9), s.Generate(500, 9)
	if !slices.Equal(a, b) {
		t.Fatal("same seed gave different cohorts")
	}
	if c := s.Generate(500, 10); slices.Equal(a, c) {
		t.Fatal("different seeds gave the same cohort")
	}
}

// TestGenerateFollowsParameters checks the generated records against the
// mechanisms stated in GroupParams: every check compares a sample mean with
// its analytic value within 4.5 standard errors.
func TestGenerateFollowsParameters(t *testing.T) {
	s := DefaultScenario()
	recs := s.Generate(60000, 3)
	for _, sex := range []string{SexMale, SexFemale} {
		p := s.Male
		if sex == SexFemale {
			p = s.Female
		}
		var isSex, prevResid, hbResid, mcvResid, rdwResid, bmiResid []float64
		for _, r := range recs {
			if r.Sex != sex {
				continue
			}
			isSex = append(isSex, 1)
			// E[anaemia | age] = σ(PrevLogit + PrevAgeSlope·(age − 50)): the
			// residual has mean 0 (definition of the mechanism).
			prevResid = append(prevResid, float64(r.Anaemia)-sigmoid(p.PrevLogit+p.PrevAgeSlope*(r.Age-50)))
			hbMu, mcvMu, rdwMu := p.HbHealthy, p.MCVHealthy, p.RDWHealthy
			if r.Anaemia == 1 {
				hbMu, mcvMu, rdwMu = p.HbAnaemic, p.MCVAnaemic, p.RDWAnaemic
			}
			hbResid = append(hbResid, (r.Hb-hbMu-p.HbAgeSlope*(r.Age-50))/p.HbSD)
			mcvResid = append(mcvResid, (r.MCV-mcvMu)/p.MCVSD)
			rdwResid = append(rdwResid, (r.RDW-rdwMu)/p.RDWSD)
			bmiResid = append(bmiResid, r.BMI-truncMean(p.BMIMean+p.BMIAgeSlope*(r.Age-50), p.BMISD, MinBMI, MaxBMI))
		}
		for name, xs := range map[string][]float64{"anaemia": prevResid, "hb": hbResid, "mcv": mcvResid, "rdw": rdwResid, "bmi": bmiResid} {
			m, se := stats(xs)
			if math.Abs(m) > 4.5*se {
				t.Errorf("%s %s: residual mean %.4f, want 0 ± %.4f", sex, name, m, 4.5*se)
			}
		}
		// Standardised Gaussian residuals have variance 1 (rounding to one
		// decimal adds 0.1²/12 in raw units, negligible here).
		for name, xs := range map[string][]float64{"hb": hbResid, "mcv": mcvResid, "rdw": rdwResid} {
			var ss float64
			for _, x := range xs {
				ss += x * x
			}
			v := ss / float64(len(xs))
			if math.Abs(v-1) > 5*math.Sqrt(2/float64(len(xs))) {
				t.Errorf("%s %s: residual variance %.4f, want 1", sex, name, v)
			}
		}
		share := float64(len(isSex)) / float64(len(recs))
		want := s.FemaleShare
		if sex == SexMale {
			want = 1 - want
		}
		if se := math.Sqrt(want * (1 - want) / float64(len(recs))); math.Abs(share-want) > 4.5*se {
			t.Errorf("%s share %.4f, want %.4f", sex, share, want)
		}
	}
}

func TestScoreFormula(t *testing.T) {
	m := DefaultScreeningModel()
	// At the centre of every input the linear predictor is the intercept:
	// σ(−0.3) = 1/(1+e^0.3) = 0.425557483188341 (computed by hand).
	if got := m.Score(50, 13, 86, 14); math.Abs(got-0.425557483188341) > 1e-12 {
		t.Errorf("score at the centre = %.15f, want 0.425557483188341", got)
	}
	// One g/dL below the cut-off adds HbWeight = 2 to the logit:
	// σ(1.7) = 0.845534734916465 (computed by hand).
	if got := m.Score(50, 12, 86, 14); math.Abs(got-0.845534734916465) > 1e-12 {
		t.Errorf("score at hb 12 = %.15f, want 0.845534734916465", got)
	}
	for _, r := range DefaultScenario().Generate(200, 1) {
		if want := round(m.Score(r.Age, r.Hb, r.MCV, r.RDW), 6); r.Score != want {
			t.Fatalf("record %+v: score %g, model gives %g on the recorded values", r, r.Score, want)
		}
	}
}

// TestHybridEndpoints checks that the hybrid with no female mechanism is the
// men's distribution and the one with all of them is the women's, by
// comparing prevalence and mean haemoglobin with Generate's groups.
func TestHybridEndpoints(t *testing.T) {
	s := DefaultScenario()
	gen := s.Generate(80000, 5)
	for _, tc := range []struct {
		sex  string
		from []string
	}{{SexMale, nil}, {SexFemale, AnaemiaNodes()}} {
		var a, b []float64
		var ha, hb []float64
		for _, r := range gen {
			if r.Sex == tc.sex {
				a = append(a, float64(r.Anaemia))
				ha = append(ha, r.Hb)
			}
		}
		for _, r := range s.GenerateHybrid(40000, 6, tc.from) {
			b = append(b, float64(r.Anaemia))
			hb = append(hb, r.Hb)
		}
		for _, c := range []struct {
			name string
			x, y []float64
		}{{"prevalence", a, b}, {"hb", ha, hb}} {
			mx, sx := stats(c.x)
			my, sy := stats(c.y)
			if d := math.Abs(mx - my); d > 4.5*math.Hypot(sx, sy) {
				t.Errorf("%s %s: Generate %.4f vs hybrid %.4f", tc.sex, c.name, mx, my)
			}
		}
	}
}

// TestBMIDoesNotReachTheScore: changing only the bmi mechanism changes no
// recorded input of the model, so with common random numbers every score
// and label is identical. This is why bmi's true contribution is exactly 0.
func TestBMIDoesNotReachTheScore(t *testing.T) {
	s := DefaultScenario()
	a := s.GenerateHybrid(3000, 2, []string{ColHb})
	b := s.GenerateHybrid(3000, 2, []string{ColHb, ColBMI})
	diffBMI := 0
	for i := range a {
		if a[i].Score != b[i].Score || a[i].Anaemia != b[i].Anaemia {
			t.Fatalf("record %d: bmi mechanism changed score or label", i)
		}
		if a[i].BMI != b[i].BMI {
			diffBMI++
		}
	}
	if diffBMI < len(a)/2 {
		t.Errorf("bmi differs in only %d of %d records", diffBMI, len(a))
	}
}

func TestGenerateHybridPanicsOnUnknownNode(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("no panic for an unknown node")
		}
	}()
	DefaultScenario().GenerateHybrid(1, 1, []string{"weight"})
}
