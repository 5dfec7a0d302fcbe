package classify

import (
	"slices"
	"strings"
	"testing"
)

// TestLearners: every choice maps to the learners it names, in order, and
// each learner reports the name it was chosen by.
func TestLearners(t *testing.T) {
	cases := []struct {
		choice string
		want   []string // nil: an error naming bad
		bad    string
	}{
		{"linear", []string{"linear"}, ""},
		{"expanded", []string{"expanded"}, ""},
		{"boosted", []string{"boosted"}, ""},
		{"auto", []string{"linear", "expanded", "boosted"}, ""},
		{"boosted+linear", []string{"boosted", "linear"}, ""},
		{"forest", nil, `"forest"`},
		{"linear+", nil, `""`},
		{"Linear", nil, `"Linear"`},
	}
	for _, c := range cases {
		ls, err := Learners(c.choice)
		if c.want == nil {
			if err == nil || !strings.Contains(err.Error(), c.bad) {
				t.Errorf("%q: error %v, want one naming %s", c.choice, err, c.bad)
			}
			continue
		}
		if err != nil {
			t.Fatalf("%q: %v", c.choice, err)
		}
		if got := NamesOf(ls); !slices.Equal(got, c.want) {
			t.Errorf("%q: learners %v, want %v", c.choice, got, c.want)
		}
	}
	if auto, _ := Learners(Auto); !slices.Equal(NamesOf(auto), Names()) {
		t.Errorf("auto offers %v, want Names() %v", NamesOf(auto), Names())
	}
}
