// Package rank orders and selects float64 values without a full
// comparison sort: the stable ascending order of keys by least-significant-
// digit radix sort (Ascending) and the k-th smallest value by quickselect
// (SelectKth). Both are deterministic: the result depends only on the
// values, never on timing or the number of goroutines.
package rank
