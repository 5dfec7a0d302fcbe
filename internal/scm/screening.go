package scm

import "math"

// Shift lists how the comparison group's mechanisms differ from the
// reference group's in the Screening model. The zero Shift makes the groups
// identical.
type Shift struct {
	// Age: the comparison group's mean age (standardised) minus the
	// reference's (case-mix shift of a root node).
	Age float64
	// Site: the comparison group's site mix is (0.3, 0.3, 0.4) instead of
	// (0.5, 0.3, 0.2) (shift of a categorical root node).
	Site bool
	// Prevalence is added to the disease log-odds in the comparison group.
	Prevalence float64
	// DiseasedMarker shifts marker_a's mean among the diseased only, so the
	// log density ratio of marker_a | disease, age has a disease × marker
	// interaction.
	DiseasedMarker float64
	// Spread is the comparison group's standard deviation of marker_b given
	// disease (the reference's is 1; 0 means 1). The log density ratio is
	// quadratic in marker_b. Below 1 the weights that carry the reference
	// towards the comparison are bounded; at or above √2 their second moment
	// under the reference is infinite.
	Spread float64
	// Unread shifts the mean of unread, a node with no children that the
	// model does not read: its ground-truth contribution is exactly 0.
	Unread float64
	// Baseline is added to the disease log-odds in both groups (0: the
	// usual prevalence of about a quarter; −2 makes the disease rare).
	Baseline float64
}

// Node indices of the Screening model.
const (
	NodeAge = iota
	NodeSite
	NodeDisease
	NodeMarkerA
	NodeMarkerB
	NodeUnread
)

// ScreeningThreshold is the decision threshold of the Screening model: a
// record is flagged when its score is at least 0.5.
const ScreeningThreshold = 0.5

// Screening returns a synthetic screening model with six nodes (topological
// order):
//
//	age      ~ N(μ_g, 1)                                     root, continuous
//	site     ~ Categorical(π_g) over 3 levels                root, categorical
//	disease  ~ Bernoulli(σ(−1.5 + β + 0.5·age + 0.4·[site=1] + 0.8·[site=2] + δ_g))
//	marker_a ~ N(1.5·disease + 0.3·age + κ_g·disease, 1)
//	marker_b ~ N(1.2·disease, τ_g²)
//	unread   ~ N(0.5·age + disease + ν_g, 1)                 no children
//
// with the reference group at μ=0, π=(0.5, 0.3, 0.2), δ=0, κ=0, τ=1, ν=0,
// β = sh.Baseline in both groups, and the comparison group shifted by sh; unshifted mechanisms have a nil
// Comparison equation. The fixed model reads age and the
// two markers (not site, not unread):
//
//	score = σ(−2 + 1.2·marker_a + 0.9·marker_b + 0.3·age).
//
// σ is the logistic function. All of it is invented for testing.
func Screening(name string, sh Shift) *Model {
	spread := sh.Spread
	if spread == 0 {
		spread = 1
	}
	refSite := []float64{0.5, 0.3, 0.2}
	cmpSite := []float64{0.3, 0.3, 0.4}
	disease := func(shift float64) Equation {
		return func(pa []float64, u, _ float64) float64 {
			eta := -1.5 + 0.5*pa[0] + shift
			switch int(pa[1]) {
			case 1:
				eta += 0.4
			case 2:
				eta += 0.8
			}
			if u < logistic(eta) {
				return 1
			}
			return 0
		}
	}
	markerA := func(kappa float64) Equation {
		return func(pa []float64, _, z float64) float64 {
			return 1.5*pa[0] + 0.3*pa[1] + kappa*pa[0] + z
		}
	}
	markerB := func(tau float64) Equation {
		return func(pa []float64, _, z float64) float64 { return 1.2*pa[0] + tau*z }
	}
	age := func(mu float64) Equation {
		return func(_ []float64, _, z float64) float64 { return mu + z }
	}
	unread := func(nu float64) Equation {
		return func(pa []float64, _, z float64) float64 { return 0.5*pa[0] + pa[1] + nu + z }
	}
	return &Model{
		Name: name,
		Nodes: []Node{
			{Name: "age", Kind: Continuous, Reference: age(0), Comparison: when(sh.Age != 0, age(sh.Age))},
			{Name: "site", Kind: Categorical, Levels: 3, Reference: categorical(refSite), Comparison: when(sh.Site, categorical(cmpSite))},
			{Name: "disease", Kind: Binary, Parents: []int{NodeAge, NodeSite}, Reference: disease(sh.Baseline), Comparison: when(sh.Prevalence != 0, disease(sh.Baseline+sh.Prevalence))},
			{Name: "marker_a", Kind: Continuous, Parents: []int{NodeDisease, NodeAge}, Reference: markerA(0), Comparison: when(sh.DiseasedMarker != 0, markerA(sh.DiseasedMarker))},
			{Name: "marker_b", Kind: Continuous, Parents: []int{NodeDisease}, Reference: markerB(1), Comparison: when(spread != 1, markerB(spread))},
			{Name: "unread", Kind: Continuous, Parents: []int{NodeAge, NodeDisease}, Reference: unread(0), Comparison: when(sh.Unread != 0, unread(sh.Unread))},
		},
		Label:       NodeDisease,
		ScoreInputs: []int{NodeAge, NodeMarkerA, NodeMarkerB},
		Score: func(v []float64) float64 {
			return logistic(-2 + 1.2*v[NodeMarkerA] + 0.9*v[NodeMarkerB] + 0.3*v[NodeAge])
		},
	}
}

// when returns eq if the mechanism is shifted and nil (no difference)
// otherwise.
func when(shifted bool, eq Equation) Equation {
	if shifted {
		return eq
	}
	return nil
}

// categorical returns a root equation drawing level l with probability p[l]
// by inverting the cumulative distribution at u.
func categorical(p []float64) Equation {
	return func(_ []float64, u, _ float64) float64 {
		var c float64
		for l, pl := range p[:len(p)-1] {
			c += pl
			if u < c {
				return float64(l)
			}
		}
		return float64(len(p) - 1)
	}
}

func logistic(x float64) float64 { return 1 / (1 + math.Exp(-x)) }
