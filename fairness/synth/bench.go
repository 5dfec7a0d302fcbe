package synth

import (
	"fmt"
	"math"
	"strconv"
)

// BenchTable generates a benchmark cohort of n records with k mechanisms
// (k ≥ 2): a group column "group" (values "a", reference, and "b",
// comparison, half each), a label y and findings x1 … x(k−1), plus the
// model's "score". The graph is a chain hanging off the label:
//
//	y            ~ Bernoulli(0.20 in group a, 0.30 in group b)
//	x1 | y       ~ N(y + δ₁·[b], 1)
//	xj | y, xj−1 ~ N(y + 0.3·xj−1 + δj·[b], 1),  j ≥ 2
//	δj           = 0.1 · (j mod 3)
//	score        = σ(−1.5 + 1.5·Σ xj / √(k−1))
//
// Values are written with four decimals and the score is computed from the
// written values. It returns an error if n < 1 or k < 2.
func BenchTable(n, k int, seed uint64) (*Table, error) {
	if n < 1 {
		return nil, fmt.Errorf("synth: benchmark needs at least 1 row, got %d", n)
	}
	if k < 2 {
		return nil, fmt.Errorf("synth: benchmark needs at least 2 mechanisms, got %d", k)
	}
	t := &Table{Header: []string{"group", "y"}}
	for j := 1; j < k; j++ {
		t.Header = append(t.Header, "x"+strconv.Itoa(j))
	}
	t.Header = append(t.Header, "score")
	st := newStream(seed)
	scale := 1.5 / math.Sqrt(float64(k-1))
	t.Rows = make([][]string, n)
	for i := range t.Rows {
		row := make([]string, 0, k+2)
		b := st.uniform() < 0.5
		prev, g := 0.20, "a"
		if b {
			prev, g = 0.30, "b"
		}
		y := 0.0
		if st.uniform() < prev {
			y = 1
		}
		row = append(row, g, strconv.Itoa(int(y)))
		var x, sum float64
		for j := 1; j < k; j++ {
			mu := y
			if j >= 2 {
				mu += 0.3 * x
			}
			if b {
				mu += 0.1 * float64(j%3)
			}
			x = round(mu+normalQuantile(st.uniform()), 4)
			sum += x
			row = append(row, strconv.FormatFloat(x, 'f', 4, 64))
		}
		row = append(row, strconv.FormatFloat(round(sigmoid(-1.5+scale*sum), 6), 'f', 6, 64))
		t.Rows[i] = row
	}
	return t, nil
}

// benchParents lists the parents of node xj in the benchmark graph.
func benchParents(j int) []string {
	if j == 1 {
		return []string{"y"}
	}
	return []string{"y", "x" + strconv.Itoa(j-1)}
}
