package scm

import (
	"encoding/binary"
	"math/rand/v2"
)

// BlockSize is the number of records drawn from one random stream. Record j
// lies in block j/BlockSize; its noise depends only on (seed, stream, block)
// and its position in the block, so results do not depend on how blocks are
// shared among goroutines.
const BlockSize = 4096

// Random streams: the two groups' samples and the hybrid simulation draw
// from distinct streams of the same seed.
const (
	streamReference  = 1
	streamComparison = 2
	streamHybrid     = 3
)

// blockRand returns the ChaCha8 generator of one block of one stream. The
// key packs (seed, stream, block), so distinct blocks get independent
// streams.
func blockRand(seed uint64, stream, block int) *rand.Rand {
	var key [32]byte
	binary.LittleEndian.PutUint64(key[0:], seed)
	binary.LittleEndian.PutUint64(key[8:], uint64(stream))
	binary.LittleEndian.PutUint64(key[16:], uint64(block))
	copy(key[24:], "scm-crn!")
	return rand.New(rand.NewChaCha8(key))
}

// drawNoise fills u and z (length k) with one record's noise: for every node
// in order, first z ~ N(0,1), then u ~ Uniform[0,1). Both are drawn even if
// an equation ignores one, so every node's noise is the same in every
// coalition.
func drawNoise(r *rand.Rand, u, z []float64) {
	for i := range u {
		z[i] = r.NormFloat64()
		u[i] = r.Float64()
	}
}
