package main

import (
	"errors"
	"fmt"

	"github.com/gapwise/gapwise/attribution/classify"
)

// learnerSet returns the candidate learners of a choice: a learner name
// (linear, expanded, boosted), several joined by "+" (Decompose picks per
// mechanism by out-of-fold log loss), or "auto" for all three
// (classify.Learners).
func learnerSet(choice string) ([]classify.Learner, error) {
	ls, err := classify.Learners(choice)
	var unknown *classify.UnknownLearnerError
	if errors.As(err, &unknown) {
		return nil, fmt.Errorf("-learners: unknown learner %q in %q (want %s)", unknown.Name, choice, classify.Choices())
	}
	return ls, err
}
