package transfer

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"math/big"

	"avoidcert/internal/par"
	"avoidcert/internal/words"
)

// block is the coefficient array of one state (or a scratch array of the
// same kind): the compositions of deg into l+1 parts in storage order,
// limbs little-endian words each.
type block struct {
	l, deg, limbs int
	count         int
	words         []big.Word
}

// at returns the words of coefficient r (aliasing the block).
func (b *block) at(r int) []big.Word {
	off := r * b.limbs
	return b.words[off : off+b.limbs : off+b.limbs]
}

// Iterate is G_n of one system: for every state of the system, the
// coefficients G_n[p][a] over the compositions a of n - |p|, stored as
// fixed-width words. States outside the system hold nothing (their
// coefficients are 0). An Iterate is immutable unless passed to
// Engine.Advance as the storage to recycle.
type Iterate struct {
	N      int // the length n
	Limbs  int // words per coefficient
	states *States
	blocks []block // per state; empty outside the system or when |p| > n
	words  []big.Word
}

// Count returns the number of coefficients stored for state p.
func (g *Iterate) Count(p int) int { return g.blocks[p].count }

// Words returns the words of coefficient r (storage order) of state p. The
// slice aliases the iterate: callers must not modify it.
func (g *Iterate) Words(p, r int) []big.Word { return g.blocks[p].at(r) }

// Int returns coefficient r of state p as a new big.Int.
func (g *Iterate) Int(p, r int) *big.Int {
	return new(big.Int).SetBits(append([]big.Word(nil), g.Words(p, r)...))
}

// At returns G_n[p][a] for a composition a of n - |p| (0 outside the
// system).
func (g *Iterate) At(p int, a []int) *big.Int {
	b := &g.blocks[p]
	if b.count == 0 {
		return new(big.Int)
	}
	return g.Int(p, NewIndexer(b.l, b.deg).Rank(a))
}

// States returns the states the iterate is indexed by.
func (g *Iterate) States() *States { return g.states }

// Sum returns the sum of all coefficients: a_n for the whole system. The
// coefficients are added in parallel parts (integer sums do not depend on
// the order).
func (g *Iterate) Sum() *big.Int {
	const part = 1 << 14 // coefficients per task
	n := len(g.words) / max(g.Limbs, 1)
	sums := make([][]big.Word, (n+part-1)/part)
	_ = par.Run(context.Background(), len(sums), func() func(int) {
		return func(i int) {
			acc := make([]big.Word, g.Limbs+1)
			for c := i * part; c < min((i+1)*part, n); c++ {
				words.Add(acc, g.words[c*g.Limbs:(c+1)*g.Limbs])
			}
			sums[i] = acc
		}
	})
	total := new(big.Int)
	var x big.Int
	for _, s := range sums {
		total.Add(total, x.SetBits(s))
	}
	return total
}

// StateSum returns the sum of the coefficients of state p.
func (g *Iterate) StateSum(p int) *big.Int {
	acc := make([]big.Word, g.Limbs+1)
	b := &g.blocks[p]
	for r := range b.count {
		words.Add(acc, b.at(r))
	}
	return new(big.Int).SetBits(acc)
}

// Bytes returns the memory held by the coefficients' storage, spare
// capacity included.
func (g *Iterate) Bytes() int64 { return int64(cap(g.words)) * 8 }

// DigestHeader starts the byte stream of an iterate
// (docs/prefix-states.md).
const DigestHeader = "avoidcert-iterate-v3\n"

// Digest returns the SHA-256 of the iterate's byte stream
// (docs/prefix-states.md): DigestHeader, uvarint(number of states),
// uvarint(n), then for every state in state order (all states of the set)
// with |p| <= n, and every composition a of n - |p| in lexicographic order,
// uvarint(len(b)) and b, the big-endian bytes of G_n[p][a] without leading
// zeros (empty for 0, which is every coefficient outside the system).
func (g *Iterate) Digest() [32]byte {
	h := sha256.New()
	h.Write([]byte(DigestHeader))
	var buf [binary.MaxVarintLen64]byte
	h.Write(buf[:binary.PutUvarint(buf[:], uint64(g.states.Len()))])
	h.Write(buf[:binary.PutUvarint(buf[:], uint64(g.N))])
	var x big.Int
	for p := range g.states.Len() {
		L := g.states.Length(p)
		if L > g.N {
			continue
		}
		b := &g.blocks[p]
		ix := NewIndexer(L, g.N-L)
		a := make([]int, L+1)
		forEachLex(a, 0, g.N-L, func() {
			var mag []byte
			if b.count > 0 {
				mag = x.SetBits(b.at(ix.Rank(a))).Bytes()
			}
			h.Write(buf[:binary.PutUvarint(buf[:], uint64(len(mag)))])
			h.Write(mag)
		})
	}
	var out [32]byte
	h.Sum(out[:0])
	return out
}
