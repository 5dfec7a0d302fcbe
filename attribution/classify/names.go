package classify

import (
	"fmt"
	"strings"
)

// The names of the built-in learners, as specs and diagnostics write them,
// and the choice that stands for all of them.
const (
	NameLinear   = "linear"   // Linear
	NameExpanded = "expanded" // Expanded
	NameBoosted  = "boosted"  // Boosted
	// Auto stands for every built-in learner, in the order of Names; the
	// caller picks among them per column set by out-of-fold log loss.
	Auto = "auto"
)

// Names lists the built-in learners' names, in the order Auto offers them.
func Names() []string { return []string{NameLinear, NameExpanded, NameBoosted} }

// Learners returns the learners a choice stands for: one learner name,
// several joined by "+" (e.g. "linear+boosted"), or Auto for all of
// Names. Each learner has its default settings. An unknown name is an
// *UnknownLearnerError naming it.
func Learners(choice string) ([]Learner, error) {
	if choice == Auto {
		choice = strings.Join(Names(), "+")
	}
	var out []Learner
	for _, name := range strings.Split(choice, "+") {
		switch name {
		case NameLinear:
			out = append(out, NewLinear())
		case NameExpanded:
			out = append(out, NewExpanded())
		case NameBoosted:
			out = append(out, NewBoosted())
		default:
			return nil, &UnknownLearnerError{Name: name}
		}
	}
	return out, nil
}

// UnknownLearnerError is the error of Learners for a name that is neither
// a built-in learner nor Auto.
type UnknownLearnerError struct {
	Name string // the name as given
}

func (e *UnknownLearnerError) Error() string {
	return fmt.Sprintf("classify: unknown learner %q (want %s)", e.Name, Choices())
}

// Choices describes in words what Learners accepts, e.g. for an error
// message: `linear, expanded, boosted, a "+"-joined set, or auto`.
func Choices() string {
	return strings.Join(Names(), ", ") + `, a "+"-joined set, or ` + Auto
}

// NamesOf returns the names of ls, in order.
func NamesOf(ls []Learner) []string {
	out := make([]string, len(ls))
	for i, l := range ls {
		out[i] = l.Name()
	}
	return out
}
