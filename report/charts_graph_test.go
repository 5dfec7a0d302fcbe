package report

import (
	"fmt"
	"testing"
)

func TestRampColour(t *testing.T) {
	for _, tt := range []struct {
		t    float64
		want string
	}{{0, colourNeutral}, {1, colourUp}, {-1, colourDown}, {2, colourUp}} {
		if got := rampColour(tt.t); got != tt.want {
			t.Errorf("rampColour(%v) = %s, want %s", tt.t, got, tt.want)
		}
	}
	// Halfway between #F3F0E8 and #D55E00: ((243+213)/2, (240+94)/2, (232+0)/2).
	if got, want := rampColour(0.5), fmt.Sprintf("#%02X%02X%02X", 228, 167, 116); got != want {
		t.Errorf("rampColour(0.5) = %s, want %s", got, want)
	}
}
