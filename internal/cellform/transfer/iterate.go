package celltransfer

import (
	"crypto/sha256"
	"encoding/binary"
	"math/big"

	"avoidcert/internal/words"
)

// Iterate is G_k: for every cell, the integer Bernstein coefficients of
// degree k, stored as fixed-width little-endian words. It is immutable
// unless passed to Engine.Advance, which consumes it.
type Iterate struct {
	K       int // the degree k
	M       int // cell length m
	Cells   int // m!
	PerCell int // coefficients per cell: C(k+m, m)
	Limbs   int // words per coefficient
	words   []big.Word
}

func newIterate(k, m, cells, perCell, limbs int) *Iterate {
	return &Iterate{K: k, M: m, Cells: cells, PerCell: perCell, Limbs: limbs,
		words: make([]big.Word, cells*perCell*limbs)}
}

// headroomDiv sets the spare capacity of new storage, 1/headroomDiv of its
// size: the size grows by a factor of about (k+m+1)/(k+1) per step, and by
// one word per coefficient now and then, so the spare room lets storage be
// recycled for a step or two while costing little memory at the peak.
const headroomDiv = 8

// reuseIterate returns an iterate of the given shape, in the storage of old
// when it is large enough. The words are not cleared: step writes every
// coefficient.
func reuseIterate(old *Iterate, k, m, cells, perCell, limbs int) *Iterate {
	n := cells * perCell * limbs
	if old == nil || cap(old.words) < n {
		return &Iterate{K: k, M: m, Cells: cells, PerCell: perCell, Limbs: limbs,
			words: make([]big.Word, n, n+n/headroomDiv)}
	}
	return &Iterate{K: k, M: m, Cells: cells, PerCell: perCell, Limbs: limbs, words: old.words[:n]}
}

// Words returns the words of coefficient r of a cell. The slice aliases the
// iterate's storage: callers must not modify it.
func (g *Iterate) Words(cell, r int) []big.Word {
	off := (cell*g.PerCell + r) * g.Limbs
	return g.words[off : off+g.Limbs : off+g.Limbs]
}

// Int returns coefficient r of a cell as a new big.Int.
func (g *Iterate) Int(cell, r int) *big.Int {
	return new(big.Int).SetBits(append([]big.Word(nil), g.Words(cell, r)...))
}

// Sum returns the sum of all coefficients: a_{m+k}.
func (g *Iterate) Sum() *big.Int {
	acc := make([]big.Word, g.Limbs+1)
	for off := 0; off < len(g.words); off += g.Limbs {
		words.Add(acc, g.words[off:off+g.Limbs])
	}
	return new(big.Int).SetBits(acc)
}

// CellSum returns the sum of the coefficients of one cell.
func (g *Iterate) CellSum(cell int) *big.Int {
	acc := make([]big.Word, g.Limbs+1)
	for r := range g.PerCell {
		words.Add(acc, g.Words(cell, r))
	}
	return new(big.Int).SetBits(acc)
}

// Bytes returns the memory held by the coefficients.
func (g *Iterate) Bytes() int64 { return int64(len(g.words)) * 8 }

// DigestHeader starts the canonical byte stream of an iterate; see
// docs/certificate.md.
const DigestHeader = "avoidcert-iterate-v1\n"

// Digest returns the SHA-256 of the canonical byte stream of G_k:
// DigestHeader, uvarint(m), uvarint(k), then for every cell in pattern.Rank
// order and every composition a of k in lexicographic order of
// (a_0, ..., a_m), uvarint(len(b)) followed by b, the big-endian magnitude
// of the coefficient without leading zero bytes (empty for zero).
func (g *Iterate) Digest() [32]byte {
	h := sha256.New()
	h.Write([]byte(DigestHeader))
	var buf [binary.MaxVarintLen64]byte
	h.Write(buf[:binary.PutUvarint(buf[:], uint64(g.M))])
	h.Write(buf[:binary.PutUvarint(buf[:], uint64(g.K))])
	ix := NewIndexer(g.M, g.K)
	a := make([]int, g.M+1)
	var x big.Int
	for cell := range g.Cells {
		forEachLex(a, 0, g.K, func() {
			x.SetBits(g.Words(cell, ix.Rank(a)))
			b := x.Bytes()
			h.Write(buf[:binary.PutUvarint(buf[:], uint64(len(b)))])
			h.Write(b)
		})
	}
	var out [32]byte
	h.Sum(out[:0])
	return out
}

// forEachLex calls fn for every composition of rest into a[i:], in
// lexicographic order.
func forEachLex(a []int, i, rest int, fn func()) {
	if i == len(a)-1 {
		a[i] = rest
		fn()
		return
	}
	for v := 0; v <= rest; v++ {
		a[i] = v
		forEachLex(a, i+1, rest-v, fn)
	}
}
