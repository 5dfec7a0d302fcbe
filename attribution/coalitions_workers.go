package attribution

// splitRange returns the bounds of part p of [0, n) cut into parts nearly
// equal contiguous pieces.
func splitRange(n, parts, p int) (lo, hi int) {
	return n * p / parts, n * (p + 1) / parts
}
