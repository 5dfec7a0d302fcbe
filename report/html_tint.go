package report

import (
	"slices"
	"strings"
)

// tint is how strongly a confusion-table cell is shaded: a CSS opacity
// written with two decimals ("0.35"). The page sets it through a class
// whose rule is in the page's style element, not through a style
// attribute, so that the Content-Security-Policy can hash the styles.
type tint string

// Class is the name of the class that gives a cell this tint.
func (t tint) Class() string { return "gw-tint-" + strings.ReplaceAll(string(t), ".", "") }

// tintRules returns the CSS rules of the tints the confusion tables use,
// one per distinct tint in a fixed order.
func tintRules(views []confusionView) string {
	var rules []string
	for _, v := range views {
		for _, t := range []tint{v.TPShade, v.FPShade, v.TNShade, v.FNShade} {
			rules = append(rules, "."+t.Class()+" { --tint: "+string(t)+"; }\n")
		}
	}
	slices.Sort(rules)
	return strings.Join(slices.Compact(rules), "")
}
