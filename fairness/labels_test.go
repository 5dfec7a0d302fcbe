package fairness

import (
	"errors"
	"reflect"
	"strings"
	"testing"
)

// TestPositiveLabel: with positive: the label column of words is read as
// 1 for that value and 0 for the one other value; a third value, a
// near-miss of the positive value and a positive value that never occurs
// are refused with the line and column (hand-made cases).
func TestPositiveLabel(t *testing.T) {
	const head = "clinic,sex,dx,hb,mcv,score\n"
	rows := func(labels ...string) string {
		var b strings.Builder
		b.WriteString(head)
		for i, l := range labels {
			g := "north"
			if i%2 == 1 {
				g = "south"
			}
			b.WriteString(g + ",F," + l + ",11,80,0.5\n")
		}
		return b.String()
	}
	tests := []struct {
		name, positive, csv string
		labels              []float64
		values              *LabelValues
		line                int
		msg                 string
	}{
		{"words", "died", rows("died", "alive", " alive ", "died"), []float64{1, 0, 0, 1}, &LabelValues{"died", "alive"}, 0, ""},
		{"digits", "1", rows("0", "1", "1", "0"), []float64{0, 1, 1, 0}, &LabelValues{"1", "0"}, 0, ""},
		{"only positive", "pos", rows("pos", "pos", "pos", "pos"), []float64{1, 1, 1, 1}, &LabelValues{"pos", ""}, 0, ""},
		{"third value", "pos", rows("pos", "neg", "pos", "unknown"), nil, nil, 5, `label "unknown" is a third value: with positive: "pos" the label column holds "neg" (from line 3)`},
		{"near miss", "yes", rows("yes", "no", "Yes", "no"), nil, nil, 4, `label "Yes" differs from the positive value "yes" (key positive) only in letter case`},
		{"absent", "dead", rows("died", "died", "died", "died"), nil, nil, 0, `the positive value "dead" (key positive) appears in no audited row; the label column holds only "died"`},
		{"without positive", "", rows("pos", "neg"), nil, nil, 2, `label "pos" is not 0, 1, true or false`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			extra := ""
			if tc.positive != "" {
				extra = "positive: " + tc.positive + "\n"
			}
			d, err := ReadData(strings.NewReader(tc.csv), "cohort.csv", dataSpec(t, extra))
			if tc.msg != "" {
				var de *DataError
				if !errors.Is(err, ErrNotBinary) || !errors.As(err, &de) || de.Line != tc.line || de.Column != "dx" || !strings.Contains(err.Error(), tc.msg) {
					t.Fatalf("error %v; want line %d column dx and %q", err, tc.line, tc.msg)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(d.Labels, tc.labels) || !reflect.DeepEqual(d.LabelValues, tc.values) {
				t.Errorf("labels %v values %+v; want %v %+v", d.Labels, d.LabelValues, tc.labels, tc.values)
			}
		})
	}
}

// TestRunPositiveWords: an audit whose label column holds words gives the
// same numbers as the same table with 0/1 labels (the words replace the
// digits one for one), and records how the words were read.
func TestRunPositiveWords(t *testing.T) {
	digits := smallData(200)
	var words strings.Builder
	for i, line := range strings.Split(strings.TrimSuffix(digits, "\n"), "\n") {
		f := strings.Split(line, ",")
		if i > 0 {
			f[2] = map[string]string{"1": "died", "0": "alive"}[f[2]]
		}
		words.WriteString(strings.Join(f, ",") + "\n")
	}
	a, err := Run(writeAudit(t, smallSpec, digits), RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	b, err := Run(writeAudit(t, smallSpec+"positive: died\n", words.String()), RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(a.Metrics, b.Metrics) {
		t.Errorf("metrics differ between 0/1 and word labels:\n%+v\n%+v", a.Metrics, b.Metrics)
	}
	if a.LabelValues != nil || !reflect.DeepEqual(b.LabelValues, &LabelValues{Positive: "died", Negative: "alive"}) {
		t.Errorf("label values %+v / %+v", a.LabelValues, b.LabelValues)
	}
}
