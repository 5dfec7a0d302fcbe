package attribution

import (
	"fmt"

	"github.com/gapwise/gapwise/metrics"
)

// Features accumulated per cell; they mirror the fields of metrics.Stats.
const (
	featW   = iota // Σ w
	featWS         // Σ w·s
	featWS2        // Σ w·s²
	featWL         // Σ w·ℓ(y, s)
	numFeatures
)

// metricPlan records which cells and features the requested metrics read,
// so that the engine accumulates nothing else.
type metricPlan struct {
	names  []string
	bins   int   // score bins of the cells: ECE's bins if requested, else 1
	combos uint8 // bit j set: cells with (y, d) = (j>>1, j&1) are needed
	feats  []int // needed features, ascending
	stat   []int // indices into names of metrics computed from Stats
	auc    int   // index into names of AUC, or −1
	cells  []int // needed cells, ascending
	slot   []int // slot[cell] = position in cells, or −1
}

// Cell classes by (y, d), as bit masks over j = 2y + d.
const (
	comboNeg    = 1<<0 | 1<<1 // y = 0
	comboPos    = 1<<2 | 1<<3 // y = 1
	comboDecNeg = 1<<0 | 1<<2 // d = 0
	comboDecPos = 1<<1 | 1<<3 // d = 1
	comboAll    = 0xf
)

// recordCombos maps the records a metric counts (metrics.Fact.Counts) to
// the cell classes it needs.
var recordCombos = map[metrics.Records]uint8{
	metrics.AllRecords:      comboAll,
	metrics.Negatives:       comboNeg,
	metrics.Positives:       comboPos,
	metrics.DecidedPositive: comboDecPos,
	metrics.DecidedNegative: comboDecNeg,
	metrics.BothClasses:     comboAll,
}

func newMetricPlan(names []string, eceBins int) (metricPlan, error) {
	p := metricPlan{names: names, bins: 1, auc: -1}
	var feats [numFeatures]bool
	for m, name := range names {
		fact, ok := metrics.FactOf(name)
		if !ok {
			return p, fmt.Errorf("attribution: metric %q: %w", name, ErrUnsupportedMetric)
		}
		combos, fs := recordCombos[fact.Counts], []int{featW}
		switch name {
		case metrics.NameBrier:
			fs = []int{featW, featWS, featWS2}
		case metrics.NameLogLoss:
			fs = []int{featW, featWL}
		case metrics.NameCalibrationInTheLarge:
			fs = []int{featW, featWS}
		case metrics.NameECE:
			fs = []int{featW, featWS}
			p.bins = eceBins
		case metrics.NameAUC:
			if p.auc >= 0 {
				return p, fmt.Errorf("attribution: metric %q requested twice", name)
			}
			p.auc = m
			continue
		}
		p.combos |= combos
		for _, f := range fs {
			feats[f] = true
		}
		p.stat = append(p.stat, m)
	}
	for f, ok := range feats {
		if ok {
			p.feats = append(p.feats, f)
		}
	}
	p.slot = make([]int, metrics.CellCount(p.bins))
	for c := range p.slot {
		p.slot[c] = -1
		if p.combos&(1<<(c&3)) != 0 {
			p.slot[c] = len(p.cells)
			p.cells = append(p.cells, c)
		}
	}
	return p, nil
}

// statMetrics is the number of metrics computed from Stats.
func (p *metricPlan) statMetrics() int { return len(p.stat) }

// featureValue is the per-record factor of feature f.
func featureValue(f int, label, score float64) float64 {
	switch f {
	case featWS:
		return score
	case featWS2:
		return score * score
	case featWL:
		return metrics.LogLossTerm(label, score)
	}
	return 1
}

// targets returns, for every needed (cell slot, feature) pair in the order
// slot·len(p.feats) + fi, a pointer to the matching entry of st. Writing
// through them fills st; entries outside the plan stay zero.
func (p *metricPlan) targets(st *metrics.Stats) []*float64 {
	t := make([]*float64, 0, len(p.cells)*len(p.feats))
	for _, c := range p.cells {
		for _, f := range p.feats {
			switch f {
			case featW:
				t = append(t, &st.W[c])
			case featWS:
				t = append(t, &st.WS[c])
			case featWS2:
				t = append(t, &st.WS2[c])
			case featWL:
				t = append(t, &st.WL[c])
			}
		}
	}
	return t
}
