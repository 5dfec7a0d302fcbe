package scm

// Node indices of the ScoreNode model.
const (
	ScoreNodeAge = iota
	ScoreNodeDisease
	ScoreNodeMarker
	ScoreNodeScore
)

// ScoreNode returns a synthetic model whose score is a node: the audited
// model reads a recorded marker and an input the table lacks (a hidden
// finding, such as an image reading), so the score's mechanism
// P(score | age, disease, marker) carries the shift in that input. Nodes
// (topological order):
//
//	age     ~ N(μ_g, 1)                                   root, continuous
//	disease ~ Bernoulli(σ(−1.2 + 0.6·age))
//	marker  ~ N(1.5·disease + 0.3·age, 1)
//	score   = σ(−2.2 + marker + 0.3·age + h),              a probability
//	          h = (1.2 + κ_g)·disease + z,  z ~ N(0, 1)    the unrecorded input
//
// with the reference group at μ = 0, κ = 0 and the comparison group at
// μ = age, κ = hidden. logit(score) given its parents is normal with unit
// variance, so the log density ratio of the score's mechanism is
//
//	log r = disease·(κ·(logit(score) − m) − κ²/2),
//	m = −2.2 + marker + 0.3·age + 1.2·disease,
//
// linear in logit(score) with a disease interaction, and far from linear in
// the score itself near 0 and 1. The model's decision is score ≥
// ScreeningThreshold. All of it is invented for testing.
func ScoreNode(name string, age, hidden float64) *Model {
	ageEq := func(mu float64) Equation {
		return func(_ []float64, _, z float64) float64 { return mu + z }
	}
	disease := func(pa []float64, u, _ float64) float64 {
		if u < logistic(-1.2+0.6*pa[0]) {
			return 1
		}
		return 0
	}
	marker := func(pa []float64, _, z float64) float64 { return 1.5*pa[0] + 0.3*pa[1] + z }
	score := func(kappa float64) Equation {
		return func(pa []float64, _, z float64) float64 {
			a, d, m := pa[0], pa[1], pa[2]
			return logistic(-2.2 + m + 0.3*a + (1.2+kappa)*d + z)
		}
	}
	return &Model{
		Name: name,
		Nodes: []Node{
			{Name: "age", Kind: Continuous, Reference: ageEq(0), Comparison: when(age != 0, ageEq(age))},
			{Name: "disease", Kind: Binary, Parents: []int{ScoreNodeAge}, Reference: disease},
			{Name: "marker", Kind: Continuous, Parents: []int{ScoreNodeDisease, ScoreNodeAge}, Reference: marker},
			{Name: "score", Kind: Probability, Parents: []int{ScoreNodeAge, ScoreNodeDisease, ScoreNodeMarker}, Reference: score(0), Comparison: when(hidden != 0, score(hidden))},
		},
		Label:       ScoreNodeDisease,
		ScoreInputs: []int{ScoreNodeScore},
		Score:       func(v []float64) float64 { return v[ScoreNodeScore] },
	}
}
