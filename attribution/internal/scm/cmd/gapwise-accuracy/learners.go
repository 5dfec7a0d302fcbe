package main

import (
	"fmt"
	"strings"

	"github.com/gapwise/gapwise/attribution/classify"
)

// learnerSet returns the candidate learners of a choice: a learner name
// (linear, expanded, boosted), several joined by "+" (Decompose picks per
// mechanism by out-of-fold log loss), or "auto" for all three.
func learnerSet(choice string) ([]classify.Learner, error) {
	if choice == "auto" {
		choice = "linear+expanded+boosted"
	}
	var out []classify.Learner
	for _, name := range strings.Split(choice, "+") {
		switch name {
		case "linear":
			out = append(out, classify.NewLinear())
		case "expanded":
			out = append(out, classify.NewExpanded())
		case "boosted":
			out = append(out, classify.NewBoosted())
		default:
			return nil, fmt.Errorf("-learners: unknown learner %q in %q (want linear, expanded, boosted, a \"+\"-joined set, or auto)", name, choice)
		}
	}
	return out, nil
}
