package metrics

// ReliabilityBin summarises the records of one equal-width score bin
// [Lower, Upper) (the last bin includes 1), for a calibration plot.
type ReliabilityBin struct {
	Lower, Upper float64
	Count        int     // records in the bin, whatever their weight
	Weight       float64 // W_b = Σ_{i∈b} w_i
	MeanScore    float64 // Σ_{i∈b} w_i·s_i / W_b
	EventRate    float64 // Σ_{i∈b} w_i·y_i / W_b
}

// ReliabilityCurve bins the scores as ExpectedCalibrationError does and
// returns, in increasing score order, each bin with positive weight; empty
// and zero-weight bins are skipped. A label equal to 1 is an event. If w is
// nil every record weighs 1. Σ_b Weight·|MeanScore − EventRate| / Σ_b Weight
// equals the ECE with the same bins. It panics if bins < 1 or if the slices
// differ in length.
func ReliabilityCurve(labels, scores []float64, bins int, w []float64) []ReliabilityBin {
	mustMatch("ReliabilityCurve", labels, scores, w)
	if bins < 1 {
		panic("metrics: ReliabilityCurve needs bins >= 1")
	}
	all := make([]ReliabilityBin, bins)
	for i, s := range scores {
		wi := weightAt(w, i)
		b := &all[ScoreBin(s, bins)]
		b.Count++
		b.Weight += wi
		b.MeanScore += wi * s
		b.EventRate += wi * event(labels[i])
	}
	var out []ReliabilityBin
	for b := range all {
		r := all[b]
		if !(r.Weight > 0) {
			continue
		}
		r.Lower = float64(b) / float64(bins)
		r.Upper = float64(b+1) / float64(bins)
		r.MeanScore /= r.Weight
		r.EventRate /= r.Weight
		out = append(out, r)
	}
	return out
}
