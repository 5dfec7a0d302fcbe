package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// The what-if panel appears when a metric has its coalitions, and
// otherwise each metric says why not, by its coalitions_omitted reason;
// writing the page leaves the caller's coalitions in place.
func TestHTMLWhatIf(t *testing.T) {
	for _, tc := range []struct {
		name   string
		reason string
		games  bool
		want   string
	}{
		{"with coalitions", "", true, `id="whatif-panel"`},
		{"above the limit", fairness.OmittedAboveLimit, false, "all 16 sets of the 4 mechanisms are kept only up to the coalition limit (12 mechanisms by default; decompose --coalition-limit raises it up to 16)"},
		{"sampled", fairness.OmittedSampled, false, "its Shapley values were sampled"},
		{"per mechanism", fairness.OmittedPerMechanism, false, "combine_sides: mechanism"},
		{"read without --coalitions", "", false, "written without --coalitions"},
	} {
		res := handResult()
		if tc.games {
			withGames(res)
		}
		for i := range res.Metrics {
			res.Metrics[i].CoalitionsOmitted = tc.reason
		}
		var buf bytes.Buffer
		if err := WriteHTML(&buf, res); err != nil {
			t.Fatal(err)
		}
		page := buf.String()
		if !strings.Contains(page, tc.want) {
			t.Errorf("%s: page lacks %q", tc.name, tc.want)
		}
		if got := strings.Contains(page, `id="whatif-panel"`); got != tc.games {
			t.Errorf("%s: panel shown %v, want %v", tc.name, got, tc.games)
		}
		if got := strings.Contains(page, `"whatif":{"brier":{"values":[0,`); got != tc.games {
			t.Errorf("%s: the script's data holds the game: %v, want %v", tc.name, got, tc.games)
		}
		if tc.games && len(res.Metrics[0].Coalitions) != 16 {
			t.Errorf("WriteHTML took the caller's coalitions (%d left)", len(res.Metrics[0].Coalitions))
		}
	}
}
