package policy

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"github.com/gapwise/gapwise/internal/didyoumean"
	"github.com/gapwise/gapwise/metrics"
)

// Known keys and values, for the did-you-mean hint of an unknown one.
var (
	topKeys      = []string{"title", "unjudged", "rules"}
	ruleKeys     = []string{"metric", "groups", LimitMaxGap, LimitMinRatio, "judge", "preset"}
	judges       = []string{JudgeEstimate, JudgeWorstBound, JudgeBestBound}
	unjudgedKeys = []string{UnjudgedError, UnjudgedBreach}
)

// Load reads and parses the policy file at path (Parse). A missing file
// is an *Error wrapping ErrNotFound.
func Load(path string) (*Policy, error) {
	f, err := os.Open(path)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, errAt(path, 0, "", ErrNotFound, "policy file not found")
		}
		return nil, errAt(path, 0, "", ErrNotFound, "cannot read policy file: %v", err)
	}
	defer f.Close()
	src, err := io.ReadAll(io.LimitReader(f, MaxBytes+1))
	if err != nil {
		return nil, errAt(path, 0, "", ErrNotFound, "cannot read policy file: %v", err)
	}
	if len(src) > MaxBytes {
		return nil, errAt(path, 0, "", ErrTooLarge, "the policy file is larger than the limit of %d bytes", MaxBytes)
	}
	return Parse(path, src)
}

// Parse parses and validates the policy src; file names it in errors.
// Every problem is an *Error carrying the line and key involved:
// unknown keys and names (with the nearest known one when it is close),
// keys given twice, a rule without a metric or a limit, a limit outside
// its range (max_gap beyond the range of the metric's gaps, min_ratio
// outside (0, 1] or on a metric that is not a rate), and a preset mixed
// with the keys it fixes.
func Parse(file string, src []byte) (*Policy, error) {
	sum := sha256.Sum256(src)
	p := &parser{file: file}
	pol := &Policy{File: file, SHA256: hex.EncodeToString(sum[:]), Unjudged: UnjudgedError}
	var doc yaml.Node
	if err := yaml.Unmarshal(src, &doc); err != nil {
		return nil, p.syntax(err)
	}
	if len(doc.Content) == 0 {
		return nil, errAt(file, 0, "rules", ErrMissingKey, "the policy is empty; it needs a list of rules")
	}
	root := resolve(doc.Content[0])
	if root.Kind != yaml.MappingNode {
		return nil, errAt(file, root.Line, "", ErrBadValue, "the policy must be a mapping with the keys title, unjudged and rules")
	}
	var rules *yaml.Node
	err := p.eachKey(root, "", topKeys, func(k, v *yaml.Node, key string) error {
		var err error
		switch k.Value {
		case "title":
			pol.Title, err = p.str(key, v)
		case "unjudged":
			pol.Unjudged, err = p.oneOf(key, v, unjudgedKeys)
		case "rules":
			rules = v
		}
		return err
	})
	if err != nil {
		return nil, err
	}
	if rules == nil {
		return nil, errAt(file, 0, "rules", ErrMissingKey, "missing required key %q", "rules")
	}
	if rules.Kind != yaml.SequenceNode || len(rules.Content) == 0 {
		return nil, errAt(file, rules.Line, "rules", ErrBadValue, "rules must be a non-empty list of rules such as - {metric: fnr, max_gap: 0.05}")
	}
	for i, item := range rules.Content {
		r, err := p.rule(i+1, resolve(item))
		if err != nil {
			return nil, err
		}
		pol.Rules = append(pol.Rules, r)
	}
	return pol, nil
}

// parser decodes the YAML tree of one file.
type parser struct{ file string }

// rule parses entry index (1-based) of rules.
func (p *parser) rule(index int, v *yaml.Node) (Rule, error) {
	prefix := fmt.Sprintf("rules[%d]", index)
	r := Rule{Index: index, Line: v.Line, Judge: JudgeEstimate}
	if v.Kind != yaml.MappingNode {
		return r, errAt(p.file, v.Line, prefix, ErrBadValue, "each rule must be a mapping such as {metric: fnr, max_gap: 0.05}")
	}
	lines := map[string]int{}
	var gap, ratio *yaml.Node
	err := p.eachKey(v, prefix, ruleKeys, func(k, val *yaml.Node, key string) error {
		lines[k.Value] = k.Line
		var err error
		switch k.Value {
		case "metric":
			r.Metric, err = p.name(key, val, metrics.Names(), "metric")
		case "groups":
			r.Groups, err = p.strs(key, val)
		case LimitMaxGap:
			gap = val
		case LimitMinRatio:
			ratio = val
		case "judge":
			r.Judge, err = p.oneOf(key, val, judges)
		case "preset":
			r.Preset, err = p.name(key, val, presetNames(), "preset")
		}
		return err
	})
	if err != nil {
		return r, err
	}
	if r.Preset != "" {
		return p.applyPreset(r, prefix, lines, gap, ratio)
	}
	if r.Metric == "" {
		return r, errAt(p.file, v.Line, prefix+".metric", ErrMissingKey, "missing required key %q (or a preset: %s)", prefix+".metric", strings.Join(presetNames(), ", "))
	}
	if gap == nil && ratio == nil {
		return r, errAt(p.file, v.Line, prefix, ErrMissingKey, "the rule sets no limit; give max_gap, min_ratio or both")
	}
	fact, _ := metrics.FactOf(r.Metric)
	if gap != nil {
		g, err := p.number(prefix+"."+LimitMaxGap, gap)
		if err != nil {
			return r, err
		}
		if span := fact.Max - fact.Min; g < 0 || g > span {
			hint := ""
			if fact.Proportion {
				hint = fmt.Sprintf("; %s is a share, so 0.05 is 5 percentage points", r.Metric)
			}
			return r, errAt(p.file, gap.Line, prefix+"."+LimitMaxGap, ErrBadValue, "max_gap %s is outside [0, %s], the range of %s's gaps%s", gap.Value, trim(span), r.Metric, hint)
		}
		r.MaxGap = &g
	}
	if ratio != nil {
		key := prefix + "." + LimitMinRatio
		if !fact.Proportion {
			return r, errAt(p.file, ratio.Line, key, ErrBadValue, "min_ratio applies to rates (fpr, tpr, fnr, ppv, npv, selection_rate, accuracy); %s is not one, limit its gap with max_gap", r.Metric)
		}
		q, err := p.number(key, ratio)
		if err != nil {
			return r, err
		}
		if !(q > 0 && q <= 1) {
			return r, errAt(p.file, ratio.Line, key, ErrBadValue, "min_ratio %s is outside (0, 1]: it bounds the lower group's value divided by the higher one's (0.8 is four-fifths)", ratio.Value)
		}
		r.MinRatio = &q
	}
	return r, nil
}

// applyPreset fills r from its preset, refusing the keys the preset fixes.
func (p *parser) applyPreset(r Rule, prefix string, lines map[string]int, gap, ratio *yaml.Node) (Rule, error) {
	pr, _ := presetOf(r.Preset)
	for _, k := range []string{"metric", LimitMaxGap, LimitMinRatio} {
		if line, ok := lines[k]; ok {
			return r, errAt(p.file, line, prefix+"."+k, ErrBadValue, "preset %s fixes %s; drop %s here, or write the rule without the preset", r.Preset, pr.fixes(), k)
		}
	}
	r.Metric, r.MaxGap, r.MinRatio = pr.metric, pr.maxGap, pr.minRatio
	return r, nil
}

// eachKey calls fn for every key of the mapping v in order, with its full
// name (prefix.key); it refuses a key given twice and a key not in known
// (naming the nearest known one when it is close).
func (p *parser) eachKey(v *yaml.Node, prefix string, known []string, fn func(k, val *yaml.Node, key string) error) error {
	seen := map[string]int{}
	for i := 0; i+1 < len(v.Content); i += 2 {
		k, val := resolve(v.Content[i]), resolve(v.Content[i+1])
		key := k.Value
		if prefix != "" {
			key = prefix + "." + k.Value
		}
		if first, dup := seen[k.Value]; dup {
			return errAt(p.file, k.Line, key, ErrDuplicateKey, "key given twice (first on line %d)", first)
		}
		seen[k.Value] = k.Line
		if !contains(known, k.Value) {
			if s, ok := didyoumean.Nearest(k.Value, known); ok {
				return errAt(p.file, k.Line, key, ErrUnknownKey, "unknown key %q; did you mean %q?", k.Value, s)
			}
			return errAt(p.file, k.Line, key, ErrUnknownKey, "unknown key %q (known here: %s)", k.Value, strings.Join(known, ", "))
		}
		if err := fn(k, val, key); err != nil {
			return err
		}
	}
	return nil
}

// str decodes a non-empty text value.
func (p *parser) str(key string, v *yaml.Node) (string, error) {
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" || strings.TrimSpace(v.Value) == "" {
		return "", errAt(p.file, v.Line, key, ErrBadValue, "%s needs a single non-empty value", key)
	}
	return v.Value, nil
}

// strs decodes a list of non-empty text values; a single value stands
// for a list of one.
func (p *parser) strs(key string, v *yaml.Node) ([]string, error) {
	if v.Kind == yaml.ScalarNode {
		s, err := p.str(key, v)
		return []string{s}, err
	}
	if v.Kind != yaml.SequenceNode || len(v.Content) == 0 {
		return nil, errAt(p.file, v.Line, key, ErrBadValue, "%s must be a list such as [F, M]", key)
	}
	var out []string
	for i, item := range v.Content {
		s, err := p.str(fmt.Sprintf("%s[%d]", key, i+1), resolve(item))
		if err != nil {
			return nil, err
		}
		out = append(out, s)
	}
	return out, nil
}

// number decodes a finite number.
func (p *parser) number(key string, v *yaml.Node) (float64, error) {
	var f float64
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" || v.Decode(&f) != nil || math.IsNaN(f) || math.IsInf(f, 0) {
		return 0, errAt(p.file, v.Line, key, ErrBadValue, "%s must be a finite number, got %q", key, v.Value)
	}
	return f, nil
}

// oneOf decodes a value that must be one of allowed.
func (p *parser) oneOf(key string, v *yaml.Node, allowed []string) (string, error) {
	s, err := p.str(key, v)
	if err != nil || contains(allowed, s) {
		return s, err
	}
	if near, ok := didyoumean.Nearest(s, allowed); ok {
		return "", errAt(p.file, v.Line, key, ErrUnknownName, "%s must be one of %s, got %q; did you mean %q?", key, strings.Join(allowed, ", "), s, near)
	}
	return "", errAt(p.file, v.Line, key, ErrUnknownName, "%s must be one of %s, got %q", key, strings.Join(allowed, ", "), s)
}

// name decodes a value that must be one of known; what says what it is
// ("metric", "preset").
func (p *parser) name(key string, v *yaml.Node, known []string, what string) (string, error) {
	s, err := p.str(key, v)
	if err != nil || contains(known, s) {
		return s, err
	}
	if near, ok := didyoumean.Nearest(s, known); ok {
		return "", errAt(p.file, v.Line, key, ErrUnknownName, "unknown %s %q; did you mean %q?", what, s, near)
	}
	return "", errAt(p.file, v.Line, key, ErrUnknownName, "unknown %s %q (known: %s)", what, s, strings.Join(known, ", "))
}

// yamlLine matches yaml.v3's "yaml: line N: problem".
var yamlLine = regexp.MustCompile(`^yaml: line (\d+): (.*)$`)

// syntax turns a yaml.v3 parse error into an *Error with its line. The
// parser's own problems ("did not find expected key", ...) carry a
// 0-based line, the scanner's a 1-based one (gopkg.in/yaml.v3 v3.0.1,
// decode.go, parser.fail, which also omits a line 0; the spec parser in
// package fairness corrects them the same way).
func (p *parser) syntax(err error) error {
	msg := strings.TrimPrefix(err.Error(), "yaml: ")
	line := 0
	if m := yamlLine.FindStringSubmatch(err.Error()); m != nil {
		line, _ = strconv.Atoi(m[1])
		msg = m[2]
	}
	if isParserProblem(msg) {
		return errAt(p.file, line+1, "", ErrSyntax, "invalid YAML: %s (in the block that starts on this line)", msg)
	}
	return errAt(p.file, line, "", ErrSyntax, "invalid YAML: %s", msg)
}

// isParserProblem reports whether msg is one of the problems yaml.v3's
// parser, as opposed to its scanner, reports.
func isParserProblem(msg string) bool {
	for _, p := range []string{"did not find expected", "found duplicate %", "found incompatible YAML document", "found undefined tag handle"} {
		if strings.HasPrefix(msg, p) {
			return true
		}
	}
	return false
}

// resolve follows YAML aliases to the node they stand for.
func resolve(n *yaml.Node) *yaml.Node {
	for i := 0; n.Kind == yaml.AliasNode && n.Alias != nil && i < 16; i++ {
		n = n.Alias
	}
	return n
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// trim formats a limit without trailing zeros.
func trim(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
