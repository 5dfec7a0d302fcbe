package rank

import (
	"math/bits"
	"slices"
)

// SelectKth reorders v so that v[k] is the value the k-th position of
// sorted v holds, every v[i] with i < k is ≤ v[k] and every v[i] with
// i > k is ≥ v[k], and returns v[k] (an order statistic without a full
// sort). v must hold no NaN. It is Hoare's quickselect ("Algorithm 65:
// Find", CACM 4(7), 1961, cited from memory) with a median-of-three pivot,
// which is expected O(len(v)); after 2·log₂(len(v)) partitions without
// reaching k it sorts what is left (introselect's guard; Musser 1997,
// "Introspective sorting and selection algorithms", cited from memory), so
// the worst case is O(n log n). The pivots depend only on the values, so
// the result and the reordering are deterministic. It panics if k is out
// of range.
func SelectKth(v []float64, k int) float64 {
	if k < 0 || k >= len(v) {
		panic("rank: SelectKth: k out of range")
	}
	lo, hi := 0, len(v)-1
	budget := 2 * bits.Len(uint(len(v)))
	for hi-lo > 16 {
		if budget == 0 {
			slices.Sort(v[lo : hi+1])
			return v[k]
		}
		budget--
		mid := lo + (hi-lo)/2
		// Median of three into v[mid].
		if v[mid] < v[lo] {
			v[mid], v[lo] = v[lo], v[mid]
		}
		if v[hi] < v[lo] {
			v[hi], v[lo] = v[lo], v[hi]
		}
		if v[hi] < v[mid] {
			v[hi], v[mid] = v[mid], v[hi]
		}
		pivot := v[mid]
		i, j := lo, hi
		for i <= j {
			for v[i] < pivot {
				i++
			}
			for pivot < v[j] {
				j--
			}
			if i <= j {
				v[i], v[j] = v[j], v[i]
				i++
				j--
			}
		}
		// Now v[lo..j] ≤ pivot ≤ v[i..hi] and every v[j+1..i-1] = pivot.
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return v[k]
		}
	}
	slices.Sort(v[lo : hi+1])
	return v[k]
}
