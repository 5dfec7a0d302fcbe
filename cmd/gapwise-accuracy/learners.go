package main

import (
	"fmt"

	"github.com/gapwise/gapwise/attribution/classify"
)

// learnerSet returns the candidate learners of a choice: a learner name
// (linear, expanded, boosted), several joined by "+" (Decompose picks per
// mechanism by out-of-fold log loss), or "auto" for all three
// (classify.Learners).
func learnerSet(choice string) ([]classify.Learner, error) {
	ls, err := classify.Learners(choice)
	if err != nil {
		return nil, fmt.Errorf("-learners %q: %w", choice, err)
	}
	return ls, nil
}
