package classify

import (
	"errors"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// TestLearners: every choice maps to the learners it names, in order, and
// each learner reports the name it was chosen by.
func TestLearners(t *testing.T) {
	cases := []struct {
		choice string
		want   []string // nil: an *UnknownLearnerError naming bad
		bad    string
	}{
		{"linear", []string{"linear"}, ""},
		{"expanded", []string{"expanded"}, ""},
		{"boosted", []string{"boosted"}, ""},
		{"auto", []string{"linear", "expanded", "boosted"}, ""},
		{"boosted+linear", []string{"boosted", "linear"}, ""},
		{"forest", nil, "forest"},
		{"linear+", nil, ""},
		{"Linear", nil, "Linear"},
	}
	for _, c := range cases {
		ls, err := Learners(c.choice)
		if c.want == nil {
			var unknown *UnknownLearnerError
			if !errors.As(err, &unknown) || unknown.Name != c.bad || !strings.Contains(err.Error(), strconv.Quote(c.bad)) {
				t.Errorf("%q: error %v, want one naming %q", c.choice, err, c.bad)
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

// TestChoices: the words for what Learners accepts, as the accuracy study's
// -learners error printed them before classify owned the names (its
// learners.go at 07b2ed3).
func TestChoices(t *testing.T) {
	if got, want := Choices(), `linear, expanded, boosted, a "+"-joined set, or auto`; got != want {
		t.Errorf("Choices() = %q, want %q", got, want)
	}
}
