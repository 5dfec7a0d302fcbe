package synth

// The clinics variant of the anaemia scenario (invented): the same
// screening programme run by several clinics, audited with one clinic as
// the reference and every other clinic compared with it (spec key
// groups.comparison: every-other). It leaves DefaultScenario, and so the
// demo's default cohort, untouched.

// ColClinic is the clinics cohort's group column.
const ColClinic = "clinic"

// Clinic is one clinic of the clinics cohort: its share of the screened
// adults and the scenario its patients are drawn from.
type Clinic struct {
	Name     string
	Share    float64
	Scenario Scenario
}

// Clinics returns the clinics of the clinics cohort, the reference first.
// The numbers are invented:
//   - central: the demo's scenario (DefaultScenario), the reference;
//   - north: an older population (mean age 10 years higher in both sexes)
//     with fewer women screened (45 % instead of 55 %);
//   - harbour: its analyser reads haemoglobin 0.5 g/dL low in every
//     patient, and more women are screened (65 %);
//   - outreach: a mobile unit with 1 % of the screenings, too few records
//     for the group classifiers at the demo's size, so that the audit
//     lists it as skipped.
func Clinics() []Clinic {
	central := DefaultScenario()
	north := DefaultScenario()
	north.Male.AgeMean += 10
	north.Female.AgeMean += 10
	north.FemaleShare = 0.45
	harbour := DefaultScenario()
	for _, p := range []*GroupParams{&harbour.Male, &harbour.Female} {
		p.HbHealthy -= 0.5
		p.HbAnaemic -= 0.5
	}
	harbour.FemaleShare = 0.65
	return []Clinic{
		{Name: "central", Share: 0.5, Scenario: central},
		{Name: "north", Share: 0.3, Scenario: north},
		{Name: "harbour", Share: 0.19, Scenario: harbour},
		{Name: "outreach", Share: 0.01, Scenario: DefaultScenario()},
	}
}

// GenerateClinics draws n records of the clinics cohort, scored by model:
// each record's clinic by the clinics' shares, then its sex and every
// mechanism from that clinic's scenario (as Generate does). The same seed
// gives the same records; clinic[i] is record i's clinic.
func GenerateClinics(n int, seed uint64, model ScreeningModel) (recs []Record, clinic []string) {
	cs := Clinics()
	st := newStream(seed)
	recs, clinic = make([]Record, n), make([]string, n)
	for i := range recs {
		u, k := st.uniform(), 0
		for acc := cs[0].Share; u >= acc && k < len(cs)-1; acc += cs[k].Share {
			k++
		}
		s := cs[k].Scenario
		s.Model = model
		p, sex := &s.Male, SexMale
		if st.uniform() < s.FemaleShare {
			p, sex = &s.Female, SexFemale
		}
		recs[i] = s.draw(st, func(string) *GroupParams { return p })
		recs[i].Sex, clinic[i] = sex, cs[k].Name
	}
	return recs, clinic
}

// ClinicsTable lays the clinics cohort out as CSV: the clinic, then the
// columns of AnaemiaTable.
func ClinicsTable(recs []Record, clinic []string) *Table {
	t := AnaemiaTable(recs)
	t.Header = append([]string{ColClinic}, t.Header...)
	for i := range t.Rows {
		t.Rows[i] = append([]string{clinic[i]}, t.Rows[i]...)
	}
	return t
}

// ClinicsSpec returns the audit spec (YAML) of the clinics cohort written
// to dataFile: every clinic compared with central (groups.comparison:
// every-other), with sex a node of the graph because the clinics screen
// different shares of women, and the metrics and names of AnaemiaSpec.
func ClinicsSpec(dataFile string) []byte {
	return []byte(`# Anaemia screening audit by clinic. SYNTHETIC DATA: invented by gapwise's
# demo generator (package fairness/synth); it describes no real patients.
title: Anaemia screening by clinic (synthetic demo)
synthetic: true
data: ` + dataFile + `
label: anaemia
score: score
threshold: 0.5
groups: {column: clinic, reference: central, comparison: every-other}
metrics: [fnr, fpr, ppv]
categorical: [sex]
seed: 1
graph:
  - node: sex
  - node: age
    parents: [sex]
  - node: anaemia
    parents: [age, sex]
  - node: hb
    parents: [anaemia, age, sex]
  - node: panel
    columns: [mcv, rdw]
    parents: [anaemia, sex]
  - node: bmi
    parents: [age, sex]
names:
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
model: {name: Demo anaemia screening model, version: "1.0"}
`)
}
