package fairness

import (
	"math/rand/v2"
	"testing"
)

// planned runs a planning step and returns the reason of each path it
// withholds.
func planned(plan func(add adder)) map[string]string {
	out := map[string]string{}
	plan(func(path string, m mark, zero func()) {
		if m.hidden() {
			out[path] = m.reason()
		}
	})
	return out
}

// TestConfusionNoCountRecoverable: a reader who knows a group's records,
// events and records decided positive (all shown, or given by the shown
// rates) and the labels of the withheld confusion counts ("<T": 1 to T−1;
// "withheld": any count, zeros included, since a table is withheld whole)
// tries every table with those margins: each "<T" count stays free over
// all of 1 to T−1 and no withheld table is left with one candidate,
// unless its margins alone leave one (a group of a single record, say).
// Tables are drawn at random (seeded), thresholds 5 and 10.
func TestConfusionNoCountRecoverable(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	draw := func() int {
		if rng.IntN(2) == 0 {
			return rng.IntN(12)
		}
		return rng.IntN(200)
	}
	tables := 0
	for range 2000 {
		c := ConfusionCounts{TP: float64(draw()), FN: float64(draw()), FP: float64(draw()), TN: float64(draw())}
		for _, th := range []int{5, 10} {
			got := planned(func(add adder) { cc := c; planConfusion("reference", &cc, th, add) })
			if len(got) == 0 {
				for _, v := range []float64{c.TP, c.FN, c.FP, c.TN} {
					if small(int(v), th) {
						t.Fatalf("T=%d %+v: a small count is shown", th, c)
					}
				}
				continue
			}
			tables++
			if len(got) != 4 {
				t.Fatalf("T=%d %+v: %d counts withheld, want the whole table", th, c, len(got))
			}
			bounds := func(name string) (int, int) {
				if got[ConfusionPath("reference", name)] == WithheldBelow {
					return 1, th - 1
				}
				return 0, 1 << 30
			}
			e, p, n := int(c.TP+c.FN), int(c.TP+c.FP), int(c.TP+c.FN+c.FP+c.TN)
			seen := map[string]map[int]bool{"tp": {}, "fn": {}, "fp": {}, "tn": {}}
			candidates := 0
			for x := 0; x <= min(e, p); x++ {
				cells := map[string]int{"tp": x, "fn": e - x, "fp": p - x, "tn": n - e - p + x}
				ok := true
				for name, v := range cells {
					lo, hi := bounds(name)
					ok = ok && v >= lo && v <= hi
				}
				if !ok {
					continue
				}
				candidates++
				for name, v := range cells {
					seen[name][v] = true
				}
			}
			if candidates < 2 && min(e, p) > max(0, e+p-n) {
				t.Errorf("T=%d %+v: the withheld table can be worked out from its margins (%d candidates)", th, c, candidates)
			}
			for name, vs := range seen {
				if got[ConfusionPath("reference", name)] != WithheldBelow {
					continue
				}
				for x := 1; x < th; x++ {
					if !vs[x] {
						t.Errorf("T=%d %+v: %s shown as <%d cannot be %d", th, c, name, th, x)
						break
					}
				}
			}
		}
	}
	if tables < 500 {
		t.Fatalf("only %d tables had a small count", tables)
	}
}

// TestReliabilityBinsWithheld: a score bin whose records, events or
// non-events are small is withheld whole (records, mean score, event
// rate), and then at least one more, so that no withheld bin's records
// or events are the group's total less the shown bins'. Curves are drawn
// at random (seeded: 2–3 bins of 1–25 records), threshold 10; a reader who tries every split of the
// withheld records and events over the withheld bins (events at most the
// records) finds at least two values for each bin's records and events
// unless they are zero.
func TestReliabilityBinsWithheld(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	const th = 10
	curves := 0
	for range 150 {
		k := 2 + rng.IntN(2)
		curve := make([]ReliabilityBin, k)
		for j := range curve {
			n := 1 + rng.IntN(25)
			ev := rng.IntN(n + 1)
			curve[j] = ReliabilityBin{Count: n, EventRate: float64(ev) / float64(n), MeanScore: 0.5}
		}
		got := planned(func(add adder) { planReliability("reference", curve, th, add) })
		var hidden []int
		for j, b := range curve {
			ev := int(b.EventRate*float64(b.Count) + 0.5)
			_, h := got[ReliabilityPath("reference", j, "count")]
			if !h && (small(b.Count, th) || small(ev, th) || small(b.Count-ev, th)) {
				t.Fatalf("%+v: bin %d with a small count is shown", curve, j)
			}
			for _, f := range []string{"mean_score", "event_rate"} {
				if _, hf := got[ReliabilityPath("reference", j, f)]; hf != h {
					t.Fatalf("%+v: bin %d's %s is not withheld with its records", curve, j, f)
				}
			}
			if h {
				hidden = append(hidden, j)
			}
		}
		if len(hidden) == 0 {
			continue
		}
		curves++
		if len(hidden) < 2 && len(curve) >= 2 {
			t.Errorf("%+v: only bin %v withheld", curve, hidden)
		}
		// The withheld bins' records and events: their sums are known.
		sumN, sumE := 0, 0
		for _, j := range hidden {
			sumN += curve[j].Count
			sumE += int(curve[j].EventRate*float64(curve[j].Count) + 0.5)
		}
		anyBelow := false
		for _, j := range hidden {
			anyBelow = anyBelow || got[ReliabilityPath("reference", j, "count")] == WithheldBelow
		}
		countBounds := func(j int) (int, int) {
			switch {
			case got[ReliabilityPath("reference", j, "count")] == WithheldBelow:
				return 1, th - 1
			case anyBelow:
				return th, 1 << 30
			}
			return 1, 1 << 30
		}
		seenN := make([]map[int]bool, len(hidden))
		seenE := make([]map[int]bool, len(hidden))
		for i := range hidden {
			seenN[i], seenE[i] = map[int]bool{}, map[int]bool{}
		}
		shown := make([]int, len(hidden))
		for i := range shown {
			shown[i] = -1
		}
		compositions(shown, sumN, func(ns []int) {
			for i, j := range hidden {
				lo, hi := countBounds(j)
				if ns[i] < lo || ns[i] > hi {
					return
				}
			}
			compositions(shown, sumE, func(es []int) {
				for i := range es {
					if es[i] > ns[i] {
						return
					}
				}
				for i := range hidden {
					seenN[i][ns[i]] = true
					seenE[i][es[i]] = true
				}
			})
		})
		if sumN == len(hidden) {
			continue // bins of one record each: listed bins are never empty, so no rule can hide them
		}
		for i, j := range hidden {
			if len(seenN[i]) < 2 {
				t.Errorf("%+v: bin %d's records can be worked out (%v)", curve, j, seenN[i])
			}
			if sumE > 0 && len(seenE[i]) < 2 {
				t.Errorf("%+v: bin %d's events can be worked out (%v)", curve, j, seenE[i])
			}
		}
	}
	if curves < 50 {
		t.Fatalf("only %d curves had a withheld bin", curves)
	}
}
