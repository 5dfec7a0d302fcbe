package attribution

import "testing"

// The default cap on a fit's training records grows with the sample from
// ten times DefaultMaxFitRows records on, as a tenth of them.
func TestFitRowsFor(t *testing.T) {
	for _, tc := range []struct{ n, want int }{
		{0, DefaultMaxFitRows},
		{100_000, DefaultMaxFitRows},
		{500_000, DefaultMaxFitRows},
		{500_009, DefaultMaxFitRows},
		{500_010, 50_001},
		{1_000_000, 100_000},
		{5_000_000, 500_000},
	} {
		if got := FitRowsFor(tc.n); got != tc.want {
			t.Errorf("FitRowsFor(%d) = %d, want %d", tc.n, got, tc.want)
		}
	}
}
