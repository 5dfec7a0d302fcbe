package synth

import (
	"bytes"
	"math"
	"strconv"
	"testing"
)

func TestBenchTableShape(t *testing.T) {
	for _, tc := range []struct{ n, k int }{{1, 2}, {50, 2}, {300, 7}} {
		tab, err := BenchTable(tc.n, tc.k, 4)
		if err != nil {
			t.Fatal(err)
		}
		if len(tab.Header) != tc.k+2 || len(tab.Rows) != tc.n {
			t.Fatalf("n=%d k=%d: header %v, %d rows", tc.n, tc.k, tab.Header, len(tab.Rows))
		}
		again, _ := BenchTable(tc.n, tc.k, 4)
		var a, b bytes.Buffer
		if err := tab.WriteCSV(&a); err != nil {
			t.Fatal(err)
		}
		_ = again.WriteCSV(&b)
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Fatalf("n=%d k=%d: same seed, different CSV", tc.n, tc.k)
		}
		// The score is σ(−1.5 + 1.5·Σx/√(k−1)) of the written values (BenchTable doc).
		for _, row := range tab.Rows {
			var sum float64
			for _, f := range row[2 : len(row)-1] {
				x, _ := strconv.ParseFloat(f, 64)
				sum += x
			}
			want := 1 / (1 + math.Exp(1.5-1.5*sum/math.Sqrt(float64(tc.k-1))))
			got, _ := strconv.ParseFloat(row[len(row)-1], 64)
			if math.Abs(got-want) > 5e-7 {
				t.Fatalf("row %v: score %g, formula %g", row, got, want)
			}
		}
	}
}

func TestBenchTableErrors(t *testing.T) {
	for _, tc := range []struct{ n, k int }{{0, 3}, {10, 1}, {-1, 5}} {
		if _, err := BenchTable(tc.n, tc.k, 1); err == nil {
			t.Errorf("BenchTable(%d, %d): no error", tc.n, tc.k)
		}
	}
}

// TestBenchShifts checks the documented group differences: prevalence
// 0.20 vs 0.30 and x1's mean shift δ₁ = 0.1 given y.
func TestBenchShifts(t *testing.T) {
	tab, _ := BenchTable(80000, 3, 11)
	var n, y, x1 [2]float64
	for _, r := range tab.Rows {
		g := 0
		if r[0] == "b" {
			g = 1
		}
		yy, _ := strconv.ParseFloat(r[1], 64)
		xx, _ := strconv.ParseFloat(r[2], 64)
		n[g]++
		y[g] += yy
		x1[g] += xx - yy // x1 − y ~ N(δ₁·[b], 1)
	}
	for g, want := range []float64{0.20, 0.30} {
		got := y[g] / n[g]
		if se := math.Sqrt(want * (1 - want) / n[g]); math.Abs(got-want) > 4.5*se {
			t.Errorf("group %d prevalence %.4f, want %.2f", g, got, want)
		}
	}
	if d := x1[1]/n[1] - x1[0]/n[0]; math.Abs(d-0.1) > 4.5*math.Sqrt(1/n[0]+1/n[1]) {
		t.Errorf("x1 shift %.4f, want 0.1", d)
	}
}

func BenchmarkBenchTable(b *testing.B) {
	for b.Loop() {
		if _, err := BenchTable(10000, 8, 1); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkGenerate(b *testing.B) {
	s := DefaultScenario()
	for b.Loop() {
		s.Generate(12000, 1)
	}
}
