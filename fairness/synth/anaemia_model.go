package synth

// ScreeningModel is the fixed model under audit: a logistic function of the
// recorded panel and age,
//
//	score = σ(Intercept + HbWeight·(HbCutoff − hb) + MCVWeight·(MCVCentre − mcv)
//	          + RDWWeight·(rdw − RDWCentre) + AgeWeight·(age − 50)).
//
// It does not read sex or bmi.
type ScreeningModel struct {
	Intercept float64
	HbCutoff  float64 // g/dL
	HbWeight  float64 // per g/dL below the cut-off
	MCVCentre float64 // fL
	MCVWeight float64 // per fL below the centre
	RDWCentre float64 // %
	RDWWeight float64 // per % above the centre
	AgeWeight float64 // per year above 50
}

// DefaultScreeningModel is the demo's model, built as if fitted on a cohort
// of mostly men with a single haemoglobin cut-off of 13 g/dL, the men's WHO
// cut-off (WHO 2011, see DefaultScenario). Its coefficients:
//
//	Intercept −0.3, HbCutoff 13, HbWeight 2.0,
//	MCVCentre 86, MCVWeight 0.08, RDWCentre 14, RDWWeight 0.4,
//	AgeWeight 0.005.
//
// Women's healthy haemoglobin sits near the single cut-off, so the model
// flags many healthy women (a higher false-positive rate) and misses fewer
// anaemic women (a lower false-negative rate).
func DefaultScreeningModel() ScreeningModel {
	return ScreeningModel{
		Intercept: -0.3,
		HbCutoff:  13, HbWeight: 2.0,
		MCVCentre: 86, MCVWeight: 0.08,
		RDWCentre: 14, RDWWeight: 0.4,
		AgeWeight: 0.005,
	}
}

// Score returns the model's probability of anaemia for one record's inputs.
func (m ScreeningModel) Score(age, hb, mcv, rdw float64) float64 {
	z := m.Intercept +
		m.HbWeight*(m.HbCutoff-hb) +
		m.MCVWeight*(m.MCVCentre-mcv) +
		m.RDWWeight*(rdw-m.RDWCentre) +
		m.AgeWeight*(age-50)
	return sigmoid(z)
}

// SecondScreeningModel is the demo's second model version (2.0), as if
// retrained after an audit of version 1.0: the same form and
// coefficients with the haemoglobin cut-off lowered to 12.5 g/dL, between
// the WHO cut-offs for men (13) and non-pregnant women (12; WHO 2011, see
// DefaultScenario). It flags fewer healthy women than version 1.0 and
// misses more anaemic men. Invented, like the rest of the demo.
func SecondScreeningModel() ScreeningModel {
	m := DefaultScreeningModel()
	m.HbCutoff = 12.5
	return m
}

// DemoModel returns the screening model of the demo's model version 1 or
// 2 and its version string ("1.0", "2.0"); ok is false for any other.
func DemoModel(version int) (m ScreeningModel, name string, ok bool) {
	switch version {
	case 1:
		return DefaultScreeningModel(), "1.0", true
	case 2:
		return SecondScreeningModel(), "2.0", true
	}
	return ScreeningModel{}, "", false
}
