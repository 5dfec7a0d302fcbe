package fairness

import (
	"errors"
	"strings"
	"testing"
)

// TestDidYouMean: a misspelt key at every level gets the nearest known
// key; a key far from all gets none.
func TestDidYouMean(t *testing.T) {
	base := smallSpec
	for _, tc := range []struct{ spec, want string }{
		{strings.Replace(base, "threshold:", "treshold:", 1), `unknown key "treshold"; did you mean "threshold"?`},
		{strings.Replace(base, "folds: 2", "fold: 2", 1), `did you mean "folds"?`},
		{strings.Replace(base, "reference: a", "referense: a", 1), `key groups.referense: unknown key "referense"; did you mean "reference"?`},
		{strings.Replace(base, "parents: [x]", "parent: [x]", 1), `did you mean "parents"?`},
		{base + "intervals: {replicate: 5}\n", `did you mean "replicates"?`},
		{base + "colour: red\n", `unknown key "colour"`},
	} {
		_, err := ParseSpec("s.yaml", []byte(tc.spec))
		if !errors.Is(err, ErrUnknownKey) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("error %v, want %q", err, tc.want)
		}
		if strings.Contains(tc.want, "colour") && strings.Contains(err.Error(), "did you mean") {
			t.Errorf("a far key got a suggestion: %v", err)
		}
	}
}

// TestTopKeysKnown: every key suggested at the top level is one the parser
// takes (none is refused as unknown).
func TestTopKeysKnown(t *testing.T) {
	for _, k := range topKeys {
		_, err := ParseSpec("s.yaml", []byte(smallSpec+"\n"+k+": x\n"))
		if errors.Is(err, ErrUnknownKey) {
			t.Errorf("%s: %v", k, err)
		}
	}
}
