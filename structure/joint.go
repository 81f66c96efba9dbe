package structure

import (
	"context"
	"math/bits"
)

// jointRun is the sequence R_0, R_1, ... of one set, computed until R_k
// is the domain, a set repeats, or the step limit.
type jointRun struct {
	sp      *space
	history []bitset // R_0 .. R_last
	// exponent is the least k with R_k = D, or -1.
	exponent int
	// cycleStart, cycleLength: R_cycleStart = R_(cycleStart+cycleLength),
	// the first repetition (0, 0 when there is none).
	cycleStart, cycleLength int
	// links[k][r], for r in R_k, k >= 1, is one configuration of R_(k-1)
	// that reaches r and the gap it takes: link = from<<5 | gap (only
	// with Options.Witnesses).
	links [][]uint64
}

// runJoint computes R_0, R_1, ... (docs/prefix-states.md, "The sequence
// R_0, R_1, ... and the classes"), at most maxSteps moves, and refuses
// with a *BudgetError when one more set would pass the memory budget.
func runJoint(ctx context.Context, sp *space, maxSteps int, withLinks bool, cost Cost, budget int64) (*jointRun, error) {
	ru := &jointRun{sp: sp, exponent: -1}
	cur := newBitset(sp.size)
	for _, s := range sp.rec {
		cur.set(sp.start(s))
	}
	if withLinks {
		ru.links = append(ru.links, nil)
	}
	seen := map[uint64][]int{}
	for k := 0; ; k++ {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		ru.history = append(ru.history, cur)
		if cur.equal(sp.domain) {
			ru.exponent = k
			return ru, nil
		}
		h := cur.hash()
		for _, i := range seen[h] {
			if ru.history[i].equal(cur) {
				ru.cycleStart, ru.cycleLength = i, k-i
				return ru, nil
			}
		}
		seen[h] = append(seen[h], k)
		if k >= maxSteps {
			return ru, nil
		}
		if cost.Fixed+int64(k+2)*cost.PerStep > budget {
			return nil, &BudgetError{Cost: cost, Limit: budget, Steps: k + 1}
		}
		var links []uint64
		if withLinks {
			links = make([]uint64, sp.size)
		}
		next, err := sp.step(ctx, cur, links)
		if err != nil {
			return nil, err
		}
		if withLinks {
			ru.links = append(ru.links, links)
		}
		cur = next
	}
}

// step returns the configurations one move after those of cur. With
// links, it records for each new configuration the first one of cur
// (in index order) that reaches it and its gap.
func (sp *space) step(ctx context.Context, cur bitset, links []uint64) (bitset, error) {
	next := newBitset(sp.size)
	var err error
	seen := 0
	sp.eachInBlocks(cur, func(b *pairBlock, r int) bool {
		if seen++; seen%4096 == 0 {
			if err = ctx.Err(); err != nil {
				return false
			}
		}
		for g, t := range sp.targets(b, r) {
			if t < 0 || next.has(int(t)) {
				continue
			}
			next.set(int(t))
			if links != nil {
				links[t] = uint64(r)<<5 | uint64(g)
			}
		}
		return true
	})
	return next, err
}

// eachInBlocks calls f with every element r of set, increasing, and its
// block, until f returns false.
func (sp *space) eachInBlocks(set bitset, f func(b *pairBlock, r int) bool) {
	bi := 0
	for w, word := range set {
		for word != 0 {
			r := w*64 + bits.TrailingZeros64(word)
			word &= word - 1
			for sp.blocks[bi].base+sp.blocks[bi].size <= r {
				bi++
			}
			if !f(&sp.blocks[bi], r) {
				return
			}
		}
	}
}

// last returns the index of the last set computed.
func (ru *jointRun) last() int { return len(ru.history) - 1 }

// recurs reports whether the sequence was followed to its end (R_e = D,
// or a repetition), so that at(k) is known for every k.
func (ru *jointRun) recurs() bool { return ru.exponent >= 0 || ru.cycleLength > 0 }

// loopStart and loopLength describe the part of the sequence that recurs
// for ever: R_e alone for a primitive set, the joint cycle otherwise.
func (ru *jointRun) loop() (start, length int) {
	if ru.exponent >= 0 {
		return ru.exponent, 1
	}
	return ru.cycleStart, ru.cycleLength
}

// at returns R_k for any k when the sequence recurs, else for k up to
// last().
func (ru *jointRun) at(k int) bitset {
	if k <= ru.last() {
		return ru.history[k]
	}
	start, length := ru.loop()
	return ru.history[start+(k-start)%length]
}

// predecessor returns one configuration of R_(k-1) that reaches r, k >= 1,
// with its gap.
func (ru *jointRun) predecessor(k, r int) (from, gap int) {
	if ru.links != nil && k < len(ru.links) {
		l := ru.links[k][r]
		return int(l >> 5), int(l & 31)
	}
	from, gap = -1, -1
	ru.sp.eachInBlocks(ru.at(k-1), func(b *pairBlock, q int) bool {
		for g, t := range ru.sp.targets(b, q) {
			if int(t) == r {
				from, gap = q, g
				return false
			}
		}
		return true
	})
	if from < 0 {
		panic("structure: a configuration of R_k has no predecessor in R_(k-1)")
	}
	return from, gap
}

// path returns the gaps of a walk from R_0 to configuration r of R_k, and
// the configuration of R_0 it starts from.
func (ru *jointRun) path(k, r int) (first int, gaps []int) {
	gaps = make([]int, k)
	for j := k; j >= 1; j-- {
		r, gaps[j-1] = ru.predecessor(j, r)
	}
	return r, gaps
}
