package synth

import (
	"fmt"
	"math"
	"strconv"
)

// Record is one screened adult of the anaemia cohort.
type Record struct {
	Sex     string  // SexMale, SexFemale, or "hybrid" from GenerateHybrid
	Age     float64 // whole years
	Anaemia int     // 1 if anaemic (the label)
	Hb      float64 // g/dL, one decimal
	MCV     float64 // fL, one decimal
	RDW     float64 // %, one decimal
	BMI     float64 // kg/m², one decimal
	Score   float64 // the screening model's output, six decimals
}

// Generate draws n records: each record's sex is female with probability
// FemaleShare, then every mechanism of that sex in topological order.
// The same seed gives the same records.
func (s Scenario) Generate(n int, seed uint64) []Record {
	st := newStream(seed)
	out := make([]Record, n)
	for i := range out {
		p, sex := &s.Male, SexMale
		if st.uniform() < s.FemaleShare {
			p, sex = &s.Female, SexFemale
		}
		out[i] = s.draw(st, func(string) *GroupParams { return p })
		out[i].Sex = sex
	}
	return out
}

// GenerateHybrid draws n records from the hybrid distribution P_S that uses
// women's mechanism for every node in fromFemale and men's for the others
// (node names from AnaemiaNodes). With the same seed, records of different
// hybrids share their random draws (common random numbers), so differences
// of a metric between hybrids have little Monte Carlo noise. It panics on
// an unknown node name.
func (s Scenario) GenerateHybrid(n int, seed uint64, fromFemale []string) []Record {
	female := map[string]bool{}
	known := map[string]bool{}
	for _, nd := range AnaemiaNodes() {
		known[nd] = true
	}
	for _, nd := range fromFemale {
		if !known[nd] {
			panic(fmt.Sprintf("synth: unknown node %q", nd))
		}
		female[nd] = true
	}
	pick := func(node string) *GroupParams {
		if female[node] {
			return &s.Female
		}
		return &s.Male
	}
	st := newStream(seed)
	out := make([]Record, n)
	for i := range out {
		st.uniform() // the sex draw of Generate, kept so both consume alike
		out[i] = s.draw(st, pick)
		out[i].Sex = "hybrid"
	}
	return out
}

// draw samples one record, taking each node's parameters from pick(node).
// It always consumes six uniforms.
func (s Scenario) draw(st stream, pick func(node string) *GroupParams) Record {
	uAge, uAn, uHb, uMCV, uRDW, uBMI := st.uniform(), st.uniform(), st.uniform(), st.uniform(), st.uniform(), st.uniform()
	var r Record

	p := pick(ColAge)
	r.Age = math.Round(truncNormal(uAge, p.AgeMean, p.AgeSD, MinAge, MaxAge))

	p = pick(ColAnaemia)
	if uAn < sigmoid(p.PrevLogit+p.PrevAgeSlope*(r.Age-50)) {
		r.Anaemia = 1
	}

	p = pick(ColHb)
	mu := p.HbHealthy
	if r.Anaemia == 1 {
		mu = p.HbAnaemic
	}
	r.Hb = round(mu+p.HbAgeSlope*(r.Age-50)+p.HbSD*normalQuantile(uHb), 1)

	p = pick(NodePanel)
	mcv, rdw := p.MCVHealthy, p.RDWHealthy
	if r.Anaemia == 1 {
		mcv, rdw = p.MCVAnaemic, p.RDWAnaemic
	}
	r.MCV = round(mcv+p.MCVSD*normalQuantile(uMCV), 1)
	r.RDW = round(rdw+p.RDWSD*normalQuantile(uRDW), 1)

	p = pick(ColBMI)
	r.BMI = round(truncNormal(uBMI, p.BMIMean+p.BMIAgeSlope*(r.Age-50), p.BMISD, MinBMI, MaxBMI), 1)

	r.Score = round(s.Model.Score(r.Age, r.Hb, r.MCV, r.RDW), 6)
	return r
}

// AnaemiaTable lays records out as the demo's CSV table with columns
// sex, age, anaemia, hb, mcv, rdw, bmi, score.
func AnaemiaTable(recs []Record) *Table {
	t := &Table{Header: []string{ColSex, ColAge, ColAnaemia, ColHb, ColMCV, ColRDW, ColBMI, ColScore}}
	t.Rows = make([][]string, len(recs))
	f := func(x float64, d int) string { return strconv.FormatFloat(x, 'f', d, 64) }
	for i, r := range recs {
		t.Rows[i] = []string{r.Sex, f(r.Age, 0), strconv.Itoa(r.Anaemia), f(r.Hb, 1), f(r.MCV, 1), f(r.RDW, 1), f(r.BMI, 1), f(r.Score, 6)}
	}
	return t
}
