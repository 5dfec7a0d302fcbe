package classify

import (
	"math/rand/v2"
	"slices"
	"sort"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func TestBoostEdges(t *testing.T) {
	cases := []struct {
		name    string
		sorted  []float64
		maxBins int
		want    []float64
	}{
		// One bin per distinct value, edges at midpoints (definition).
		{"one-hot", []float64{0, 0, 0, 1, 1}, 255, []float64{0.5}},
		{"constant", []float64{3, 3, 3}, 255, []float64{}},
		{"three values", []float64{-1, 0, 0, 2}, 255, []float64{-0.5, 1}},
		{"empty", nil, 255, nil},
		// Four distinct values, two bins: the single edge is the midpoint
		// of the order statistics around the median (m = 4, j = 2).
		{"quantile", []float64{1, 2, 3, 4}, 2, []float64{2.5}},
		// A heavy tie: edges that fall inside it merge into one.
		{"tie", []float64{0, 1, 5, 5, 5, 5, 5, 9}, 3, []float64{5}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := boostEdges(c.sorted, c.maxBins)
			if len(got) != len(c.want) || !slices.Equal(got, c.want) && len(c.want) > 0 {
				t.Errorf("boostEdges(%v, %d) = %v, want %v", c.sorted, c.maxBins, got, c.want)
			}
		})
	}
}

// TestBoostEdgesQuantiles checks that 255 quantile bins of a continuous
// sample hold equal counts: n/255 rows each up to rounding (definition of
// quantiles; the sample has no ties).
func TestBoostEdgesQuantiles(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	const n = 25500
	v := make([]float64, n)
	for i := range v {
		v[i] = rng.ExpFloat64()
	}
	slices.Sort(v)
	edges := boostEdges(v, 255)
	if len(edges) != 254 {
		t.Fatalf("%d edges, want 254", len(edges))
	}
	counts := make([]int, 255)
	for _, x := range v {
		counts[boostBinOf(edges, x)]++
	}
	for b, c := range counts {
		if c < n/255-1 || c > n/255+1 {
			t.Errorf("bin %d holds %d rows, want %d ± 1", b, c, n/255)
		}
	}
}

// TestBoostBinOf compares the branch-free search with the standard
// library's sort.SearchFloat64s (reference): the bin is the number of edges
// strictly below v.
func TestBoostBinOf(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 2))
	for _, m := range []int{0, 1, 2, 3, 7, 8, 100, 254} {
		edges := make([]float64, m)
		for i := range edges {
			edges[i] = float64(i) * 0.5
		}
		for range 2000 {
			v := float64(rng.IntN(2*m+4))*0.25 - 1 // hits edges exactly too
			want := sort.SearchFloat64s(edges, v)
			if got := boostBinOf(edges, v); int(got) != want {
				t.Fatalf("m=%d v=%v: bin %d, want %d", m, v, got, want)
			}
		}
	}
}

// TestBoostBinningPacksRows checks the packed layout against a direct
// per-feature search for a matrix with more than eight columns (two words
// per row) and that "bin ≤ b" agrees with "v ≤ edges[b]".
func TestBoostBinningPacksRows(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 3))
	const n, p = 500, 11
	x := mat.NewDense(n, p, nil)
	for i := range n {
		for j := range p {
			x.Set(i, j, float64(rng.IntN(3+j*40)))
		}
	}
	rows := make([]int32, n)
	for i := range rows {
		rows[i] = int32(i)
	}
	b := newBoostBinning(x, rows, 255, 1, 0)
	packed := b.binRows(x, rows, 0)
	W := boostWords(p)
	for i := range n {
		for f := range p {
			got := boostBinAt(packed[i*W:(i+1)*W], f)
			v := x.At(i, f)
			if want := sort.SearchFloat64s(b.edges[f], v); int(got) != want {
				t.Fatalf("row %d feature %d: bin %d, want %d", i, f, got, want)
			}
			for e, edge := range b.edges[f] {
				if (int(got) <= e) != (v <= edge) {
					t.Fatalf("row %d feature %d: bin %d vs edge %d (%v) disagrees for v=%v", i, f, got, e, edge, v)
				}
			}
		}
	}
	if b.offsets[p] != b.offsets[p-1]+len(b.edges[p-1])+1 {
		t.Errorf("offsets %v inconsistent with edges", b.offsets)
	}
}

func BenchmarkBoostBinRows(b *testing.B) {
	x, _ := boostBenchData(160_000, 6, 7)
	rows := make([]int32, 160_000)
	for i := range rows {
		rows[i] = int32(i)
	}
	for b.Loop() {
		bn := newBoostBinning(x, rows, 255, 1, 0)
		bn.binRows(x, rows, 0)
	}
}
