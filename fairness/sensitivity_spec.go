package fairness

import (
	"slices"

	"gopkg.in/yaml.v3"

	"github.com/gapwise/gapwise/attribution"
)

// HiddenFactorSpec is the spec key hidden_factor: the sensitivity
// analysis for an unrecorded factor (see attribution.Decomposition.Sensitivity).
//
//	hidden_factor: off                               # no analysis
//	hidden_factor: {factors: [1.1, 1.5], max_factor: 5}
//
// Without the key the analysis runs with attribution.DefaultSensitivityFactors
// and attribution.DefaultMaxSensitivityFactor.
type HiddenFactorSpec struct {
	Off bool
	// Factors are the Λ ≥ 1 at which every contribution is bounded,
	// ascending; nil means attribution.DefaultSensitivityFactors.
	Factors []float64
	// MaxFactor is the largest Λ searched for a sign or lead change; 0
	// means attribution.DefaultMaxSensitivityFactor.
	MaxFactor float64
}

// Limits of the hidden_factor key: at most MaxHiddenFactors factors, each
// at most MaxHiddenFactor (a factor of 100 on the odds of group membership
// is far beyond any plausible unrecorded factor).
const (
	MaxHiddenFactors = 10
	MaxHiddenFactor  = 100
)

var hiddenFactorKeys = []string{"factors", "max_factor"}

// hiddenFactor decodes the hidden_factor key: off (or false), or a mapping
// of factors and max_factor.
func (p *specParser) hiddenFactor(s *Spec, v *yaml.Node) error {
	const key = "hidden_factor"
	if v.Kind == yaml.ScalarNode && (v.Value == "off" || v.Value == "false") {
		s.HiddenFactor.Off = true
		return nil
	}
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, key, ErrBadValue, "hidden_factor must be off or a mapping such as {factors: [1.1, 1.25, 1.5, 2], max_factor: 10}")
	}
	_, err := p.eachKey(v, key, func(k, val *yaml.Node, path string) error {
		switch k.Value {
		case "factors":
			return p.hiddenFactors(s, val, path)
		case "max_factor":
			f, err := p.float(path, val)
			if err == nil && !(f > 1 && f <= MaxHiddenFactor) {
				err = specErr(p.file, val.Line, path, ErrBadValue, "%s must be above 1 and at most %d, got %s", path, MaxHiddenFactor, val.Value)
			}
			s.HiddenFactor.MaxFactor = f
			return err
		}
		return p.unknownKey(k.Line, path, k.Value, hiddenFactorKeys)
	})
	return err
}

func (p *specParser) hiddenFactors(s *Spec, v *yaml.Node, path string) error {
	if v.Kind != yaml.SequenceNode || len(v.Content) == 0 || len(v.Content) > MaxHiddenFactors {
		return specErr(p.file, v.Line, path, ErrBadValue, "%s must list 1 to %d factors, such as [1.1, 1.25, 1.5, 2]", path, MaxHiddenFactors)
	}
	fs := make([]float64, 0, len(v.Content))
	for _, c := range v.Content {
		f, err := p.float(path, c)
		if err != nil {
			return err
		}
		if !(f >= 1 && f <= MaxHiddenFactor) {
			return specErr(p.file, c.Line, path, ErrBadValue, "%s: factor %s must be at least 1 and at most %d", path, c.Value, MaxHiddenFactor)
		}
		fs = append(fs, f)
	}
	slices.Sort(fs)
	s.HiddenFactor.Factors = slices.Compact(fs)
	return nil
}

// sensitivityOptions are the engine's options for the spec's key.
func (h HiddenFactorSpec) sensitivityOptions() attribution.SensitivityOptions {
	return attribution.SensitivityOptions{Factors: h.Factors, MaxFactor: h.MaxFactor}
}
