package report

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// WeightsCSV renders record weights as CSV: one row per record of the
// source group, in file order, with its position in the data file (column
// position: the CSV line or, for a Parquet file, the row), its group value,
// its weight (shortest round-trip decimal) and whether its log-ratio was
// clipped (true or false). Records of the other group get no row.
func WeightsCSV(w *fairness.RecordWeights, position string) []byte {
	var b bytes.Buffer
	cw := csv.NewWriter(&b)
	cw.Write([]string{position, "group", "weight", "clipped"})
	for a, line := range w.Lines {
		cw.Write([]string{strconv.Itoa(line), w.Source, strconv.FormatFloat(w.Weights[a], 'g', -1, 64), strconv.FormatBool(w.Clipped[a])})
	}
	cw.Flush()
	return b.Bytes()
}

// WeightsSummary writes what a weights run produced: the mechanism, the
// direction, the records weighted, Kish's effective sample size, the
// clipped records, the learners and the file written, with the caution
// that the weights move one mechanism under the graph's assumptions.
func WeightsSummary(out io.Writer, w *fairness.RecordWeights, file string) error {
	var b strings.Builder
	fmt.Fprintf(&b, "Weights for the mechanism %s\n", Printable(w.Mechanism))
	fmt.Fprintf(&b, "  %s records reweighted to follow the %s group's mechanism: %d\n", Printable(w.Source), Printable(w.Target), len(w.Weights))
	ratio := 0.0
	if n := len(w.Weights); n > 0 {
		ratio = w.ESS / float64(n)
	}
	fmt.Fprintf(&b, "  effective sample size (Kish): %.1f (%.0f%% of the records)\n", w.ESS, 100*ratio)
	if w.ClipRatios > 0 {
		fmt.Fprintf(&b, "  clipped: %d records (clip_ratios %g)\n", w.NClipped, w.ClipRatios)
	} else {
		fmt.Fprintf(&b, "  clipped: none (clip_ratios not set)\n")
	}
	fmt.Fprintf(&b, "  learners: %s for (node, parents), %s for the parents\n", Printable(w.Learner), Printable(w.ParentLearner))
	fmt.Fprintf(&b, "  written: %s (mean weight 1 over these records; the other group's records have no row)\n", Printable(file))
	b.WriteString("The weights move only this mechanism, under the graph's assumptions (no hidden\n" +
		"confounders, overlap of the groups); they are statistical estimates, not a\n" +
		"clinical intervention, and local regulation and institutional review govern their use.\n")
	_, err := io.WriteString(out, b.String())
	return err
}
