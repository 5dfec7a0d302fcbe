package scm

import (
	"math"
	"math/bits"
	"testing"
)

// airport builds the airport cost game v(S) = max_{i∈S} c_i.
func airport(c []float64) []float64 {
	v := make([]float64, 1<<uint(len(c)))
	for s := range v {
		for i := range c {
			if s&(1<<uint(i)) != 0 {
				v[s] = math.Max(v[s], c[i])
			}
		}
	}
	return v
}

func TestShapley(t *testing.T) {
	tests := []struct {
		name string
		v    []float64
		want []float64
		src  string
	}{
		{
			// Airport game with costs c1 ≤ c2 ≤ c3 = 1, 3, 6: player i pays
			// Σ_{j≤i} (c_j − c_{j−1})/(k−j+1) (Littlechild & Owen 1973,
			// "A simple expression for the Shapley value in a special case",
			// Management Science; formula from memory): 1/3, 1/3+1, 1/3+1+3.
			name: "airport", v: airport([]float64{1, 3, 6}),
			want: []float64{1.0 / 3, 1.0/3 + 1, 1.0/3 + 1 + 3},
			src:  "Littlechild & Owen 1973 (from memory)",
		},
		{
			// Simple majority game of 3 players: v(S) = 1 iff |S| ≥ 2. By
			// symmetry and efficiency (Shapley 1953 axioms) each gets 1/3.
			name: "majority", v: func() []float64 {
				v := make([]float64, 8)
				for s := range v {
					if bits.OnesCount(uint(s)) >= 2 {
						v[s] = 1
					}
				}
				return v
			}(),
			want: []float64{1.0 / 3, 1.0 / 3, 1.0 / 3},
			src:  "Shapley 1953 symmetry + efficiency axioms",
		},
		{
			// Additive game v(S) = Σ_{i∈S} a_i: φ_i = a_i (Shapley 1953,
			// additivity and dummy axioms); a_2 = 0 is a null player.
			name: "additive", v: func() []float64 {
				a := []float64{0.5, -2, 0, 7}
				v := make([]float64, 16)
				for s := range v {
					for i, ai := range a {
						if s&(1<<uint(i)) != 0 {
							v[s] += ai
						}
					}
				}
				return v
			}(),
			want: []float64{0.5, -2, 0, 7},
			src:  "Shapley 1953 dummy + additivity axioms",
		},
		{
			// Glove game: player 0 holds a left glove, players 1 and 2 a
			// right glove each; a pair is worth 1. φ = (2/3, 1/6, 1/6)
			// (textbook example, from memory).
			name: "glove", v: []float64{0, 0, 0, 1, 0, 1, 0, 1},
			want: []float64{2.0 / 3, 1.0 / 6, 1.0 / 6},
			src:  "glove game textbook example (from memory)",
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := Shapley(tt.v)
			for i := range tt.want {
				if math.Abs(got[i]-tt.want[i]) > 1e-12 {
					t.Errorf("φ_%d = %v, want %v (%s)", i, got[i], tt.want[i], tt.src)
				}
			}
		})
	}
}

func TestShapleyPanicsOnBadLength(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Shapley accepted 3 values")
		}
	}()
	Shapley([]float64{0, 1, 2})
}

func BenchmarkShapley(b *testing.B) {
	v := airport([]float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12})
	for i := 0; i < b.N; i++ {
		Shapley(v)
	}
}
