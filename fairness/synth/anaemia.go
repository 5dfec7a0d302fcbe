package synth

// The anaemia screening scenario (invented). An outpatient network screens
// adults for anaemia with a model that reads a routine blood panel and the
// patient's age. The audit compares women (comparison group) with men
// (reference group). The causal graph over the recorded columns is
//
//	age                          (root: case mix)
//	anaemia  | age               (label: prevalence)
//	hb       | anaemia, age      (how haemoglobin presents)
//	panel    | anaemia           (vector node: mcv, rdw)
//	bmi      | age               (differs by sex, read by nothing)
//
// Every mechanism is a simple parametric family whose parameters differ by
// sex; GroupParams holds one sex's parameters.

// Column and node names of the anaemia cohort.
const (
	ColSex     = "sex"
	ColAge     = "age"
	ColAnaemia = "anaemia"
	ColHb      = "hb"
	ColMCV     = "mcv"
	ColRDW     = "rdw"
	ColBMI     = "bmi"
	ColScore   = "score"
	NodePanel  = "panel" // vector node: mcv, rdw

	SexMale   = "male"   // reference group
	SexFemale = "female" // comparison group
)

// AnaemiaNodes lists the mechanisms of the anaemia graph in topological order.
func AnaemiaNodes() []string {
	return []string{ColAge, ColAnaemia, ColHb, NodePanel, ColBMI}
}

// Age bounds of the screened adults, in years.
const (
	MinAge = 18
	MaxAge = 90
)

// BMI bounds of the generator, in kg/m².
const (
	MinBMI = 15
	MaxBMI = 60
)

// GroupParams are one sex's mechanism parameters. Each mechanism reads:
//
//	age      ~ N(AgeMean, AgeSD²) truncated to [MinAge, MaxAge], whole years
//	anaemia  ~ Bernoulli(σ(PrevLogit + PrevAgeSlope·(age − 50)))
//	hb       ~ N(HbHealthy or HbAnaemic + HbAgeSlope·(age − 50), HbSD²), g/dL
//	mcv      ~ N(MCVHealthy or MCVAnaemic, MCVSD²), fL
//	rdw      ~ N(RDWHealthy or RDWAnaemic, RDWSD²), % (red cell distribution width)
//	bmi      ~ N(BMIMean + BMIAgeSlope·(age − 50), BMISD²) truncated to [MinBMI, MaxBMI], kg/m²
//
// where σ is the logistic function and "healthy or anaemic" picks by the
// record's anaemia label. mcv and rdw are independent given anaemia.
type GroupParams struct {
	AgeMean, AgeSD                float64
	PrevLogit, PrevAgeSlope       float64
	HbHealthy, HbAnaemic          float64
	HbAgeSlope, HbSD              float64
	MCVHealthy, MCVAnaemic, MCVSD float64
	RDWHealthy, RDWAnaemic, RDWSD float64
	BMIMean, BMIAgeSlope, BMISD   float64
}

// Scenario is the full anaemia cohort: the two sexes' parameters, the share
// of women among screened adults, and the screening model.
type Scenario struct {
	Male, Female GroupParams
	FemaleShare  float64
	Model        ScreeningModel
}

// DefaultScenario returns the demo's scenario. The numbers are invented to
// be plausible, not estimated from any population. Their anchor is the WHO
// anaemia cut-off, which is 13 g/dL haemoglobin for adult men and 12 g/dL
// for non-pregnant adult women (WHO 2011, "Haemoglobin concentrations for
// the diagnosis of anaemia and assessment of severity"): women's healthy
// and anaemic haemoglobin are both placed about 1–1.5 g/dL below men's.
//
// The groups differ in
//   - case mix: the women screened are younger (mean 46 vs 54 years);
//   - prevalence: about 14 % of women vs 6 % of men are anaemic;
//   - haemoglobin given anaemia: lower in women, as above;
//   - red cell distribution width in healthy people: slightly wider in
//     women (13.3 % vs 13.0 %), a small shift in the panel;
//   - bmi: a shift that the model does not read and that causes nothing the
//     model reads, so its true contribution to every gap is zero.
func DefaultScenario() Scenario {
	male := GroupParams{
		AgeMean: 54, AgeSD: 15,
		PrevLogit: -2.9, PrevAgeSlope: 0.035,
		HbHealthy: 15.0, HbAnaemic: 11.8, HbAgeSlope: -0.01, HbSD: 1.0,
		MCVHealthy: 90, MCVAnaemic: 80, MCVSD: 5,
		RDWHealthy: 13.0, RDWAnaemic: 15.5, RDWSD: 1.0,
		BMIMean: 27.8, BMIAgeSlope: 0.04, BMISD: 4.5,
	}
	female := male
	female.AgeMean, female.AgeSD = 46, 16
	female.PrevLogit, female.PrevAgeSlope = -1.75, 0.01
	female.HbHealthy, female.HbAnaemic = 13.5, 10.8
	female.RDWHealthy = 13.3
	female.BMIMean, female.BMIAgeSlope = 26.2, 0.03
	return Scenario{Male: male, Female: female, FemaleShare: 0.55, Model: DefaultScreeningModel()}
}
