package attribution

import (
	"gonum.org/v1/gonum/mat"
)

// Regression learners of the robust estimator's steps, chosen per step,
// branch and term by held-out squared error over every fold, as the ratio
// learners are chosen by held-out log loss: least squares with a unit
// ridge penalty on the standardised terms (the intercept unpenalised) on
//
//   - regLinear: the linear basis of the step's regressors, or
//   - regExpanded: the expanded basis (squares and pairwise products;
//     regBasis).
//
// The linear design is the leading block of the expanded one, so one set
// of moments serves both. Predictions are not clamped to the range of the
// term, so that every fit stays linear in its response (robust_moments.go)
// and the next step regresses exactly what this step's correction uses.
const (
	regLinear = iota
	regExpanded
	numRegLearners
)

// RegressionLearnerNames names the regression learners of the robust
// estimator, in the order of the counts in RobustSteps.
var RegressionLearnerNames = [numRegLearners]string{"linear", "expanded"}

// regRidge is the ridge penalty λ of the least-squares learners on the
// standardised terms, the scale of classify.DefaultLambda.
const regRidge = 1.0

// stepSolver holds, per fold and group, the Cholesky factors of the
// training Gram matrix H + λI (intercept unpenalised) of a step's
// expanded design and of its linear leading block.
type stepSolver struct {
	nLin int
	fac  [][2][numRegLearners]*mat.Cholesky // nil where factorisation failed
}

// newStepSolver factorises the training Gram matrices of moments m; with
// pooling, group g's regression also reads the other group's records
// carried to g's mechanism (trainGram).
func newStepSolver(m *stepMoments, nLin, folds int) *stepSolver {
	sv := &stepSolver{nLin: nLin, fac: make([][2][numRegLearners]*mat.Cholesky, folds)}
	for j := 0; j < folds; j++ {
		for g := 0; g < 2; g++ {
			H := m.trainGram(j, g)
			for l, size := range [numRegLearners]int{nLin, m.d} {
				sym := mat.NewSymDense(size, nil)
				for p := 0; p < size; p++ {
					for q := p; q < size; q++ {
						v := H[p*m.d+q]
						if p == q && p > 0 {
							v += regRidge
						}
						sym.SetSym(p, q, v)
					}
				}
				var ch mat.Cholesky
				if ch.Factorize(sym) {
					sv.fac[j][g][l] = &ch
				}
			}
		}
	}
	return sv
}

// solve returns learner l's coefficients (length d, zero beyond the
// linear block for regLinear) for fold j and group g from the training
// moments xz = Σ x z over the training rows, or nil when the Gram matrix
// could not be factorised.
func (sv *stepSolver) solve(j, g, l int, xz []float64) []float64 {
	ch := sv.fac[j][g][l]
	if ch == nil {
		return nil
	}
	rhs := xz
	if l == regLinear {
		rhs = xz[:sv.nLin]
	}
	var beta mat.VecDense
	if err := ch.SolveVecTo(&beta, mat.NewVecDense(len(rhs), append([]float64(nil), rhs...))); err != nil {
		return nil
	}
	out := make([]float64, len(xz))
	copy(out, beta.RawVector().Data)
	return out
}

// trainGram returns the Gram matrix of group g's regression on fold j's
// training records: Σ x xᵀ over group g, plus, with pooling, Σ ρ x xᵀ
// over the other group (its records carried to g's mechanism).
func (m *stepMoments) trainGram(j, g int) []float64 {
	H := trainSum(m.H, j, g)
	if m.HR != nil {
		for p, v := range trainSum(m.HR, j, 1-g) {
			H[p] += v
		}
	}
	return H
}

// trainCross is trainGram for the cross moments K.
func (m *stepMoments) trainCross(j, g int) []float64 {
	K := trainSum(m.K, j, g)
	if m.KR != nil {
		for p, v := range trainSum(m.KR, j, 1-g) {
			K[p] += v
		}
	}
	return K
}
