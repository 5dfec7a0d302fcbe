package attribution

// WithRobustHooks returns opt with the robust estimator's nuisances
// replaced (tests of double robustness): logr, if non-nil, the log-ratios
// [mechanism][record]; reg, if non-nil, every regression: reg(term, mech,
// group, i) is μ_r at record i for the step of mechanism mech, term named
// as termID.String, group(j) the group (0 reference, 1 comparison) of
// mechanism j for the steps from mech on.
func WithRobustHooks(opt Options, logr [][]float64, reg func(term string, mech int, group func(int) int, i int) float64) Options {
	h := &robustHooks{LogRatios: logr}
	if reg != nil {
		h.Regression = func(t termID, mech int, group func(int) int, i int) float64 { return reg(t.String(), mech, group, i) }
	}
	opt.robustHooks = h
	return opt
}
