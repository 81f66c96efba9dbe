package series

import (
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
)

// MaxLength is the longest window Count tallies (7! = 5040 patterns).
const MaxLength = 7

// Ties says how equal values inside a window are ordered.
type Ties int

const (
	// TiesRefuse orders equal values by appearance, like TiesOrder; the
	// caller refuses a series whose Tally has tied windows.
	TiesRefuse Ties = iota
	// TiesOrder puts the earlier of two equal values below the later.
	TiesOrder
	// TiesRandom orders equal values by keys drawn from a generator seeded
	// with Options.Seed: at random, and the same for the same seed.
	TiesRandom
)

// String is the policy's name on the command line.
func (t Ties) String() string {
	return [...]string{"refuse", "order", "random"}[t]
}

// Options say which windows Count tallies.
type Options struct {
	Lengths []int // window lengths, each 1..MaxLength
	Delay   int   // t >= 1: windows x_i, x_(i+t), ..., x_(i+(k-1)t)
	Ties    Ties
	Seed    uint64 // for TiesRandom
}

// Tally is what Count found.
type Tally struct {
	Values int64
	// Patterns[k][r] is the number of windows of length k whose pattern
	// has lexicographic rank r (pattern.Rank), r = 0..k!-1.
	Patterns map[int][]int64
	// Windows[k] is the number of windows of length k.
	Windows map[int]int64
	// Tied[k] is the number of windows of length k holding two equal
	// values.
	Tied map[int]int64
	// FirstTie is the first pair of equal values inside a window, in the
	// order the windows end; nil when there is none.
	FirstTie *Tie
}

// Tie is a pair of equal values in one window.
type Tie struct {
	Lines [2]int // the lines of the two values, earlier first
	Value float64
}

// slot is one value held for the windows.
type slot struct {
	x    float64
	key  uint64 // orders equal values
	line int
}

// Count reads every value of r and tallies the windows. It holds the last
// (k-1)*Delay+1 values only.
func Count(r *Reader, o Options) (*Tally, error) {
	if o.Delay < 1 {
		return nil, fmt.Errorf("series: delay %d is below 1", o.Delay)
	}
	longest := 0
	t := &Tally{Patterns: map[int][]int64{}, Windows: map[int]int64{}, Tied: map[int]int64{}}
	// by length, for the loop; the maps are filled at the end
	var patterns [MaxLength + 1][]int64
	var windows, tied [MaxLength + 1]int64
	for _, k := range o.Lengths {
		if k < 1 || k > MaxLength {
			return nil, fmt.Errorf("series: window length %d is outside 1..%d", k, MaxLength)
		}
		longest = max(longest, k)
		patterns[k] = make([]int64, factorial(k))
	}
	span := (longest-1)*o.Delay + 1
	size := 1
	for size < span {
		size <<= 1
	}
	ring := make([]slot, size)
	mask := int64(size - 1)
	var rng *rand.Rand
	if o.Ties == TiesRandom {
		rng = rand.New(rand.NewPCG(o.Seed, 0x5eed5eed5eed5eed))
	}
	var w [MaxLength]slot
	for e := int64(0); ; e++ {
		v, err := r.Next()
		if errors.Is(err, io.EOF) {
			t.Values = e
			for _, k := range o.Lengths {
				t.Patterns[k], t.Windows[k], t.Tied[k] = patterns[k], windows[k], tied[k]
			}
			return t, nil
		}
		if err != nil {
			return nil, err
		}
		s := slot{x: v.X, key: uint64(e), line: v.Line}
		if rng != nil {
			s.key = rng.Uint64()
		}
		ring[e&mask] = s
		for _, k := range o.Lengths {
			start := e - int64((k-1)*o.Delay)
			if start < 0 {
				continue
			}
			for i := range k {
				w[i] = ring[(start+int64(i*o.Delay))&mask]
			}
			rank, tie := rankOf(w[:k])
			patterns[k][rank]++
			windows[k]++
			if tie >= 0 {
				tied[k]++
				if t.FirstTie == nil {
					t.FirstTie = firstTie(w[:k])
				}
			}
		}
	}
}

// rankOf returns the lexicographic rank of the window's order (equal values
// ordered by key) and whether it holds a tie (>= 0) or not (-1).
func rankOf(w []slot) (rank int, tie int) {
	tie = -1
	for i, a := range w {
		smaller := 0
		for _, b := range w[i+1:] {
			switch {
			case b.x < a.x:
				smaller++
			case b.x == a.x:
				tie = i
				if b.key < a.key {
					smaller++
				}
			}
		}
		rank = rank*(len(w)-i) + smaller
	}
	return rank, tie
}

// firstTie returns the earliest pair of equal values of a tied window.
func firstTie(w []slot) *Tie {
	for i, a := range w {
		for _, b := range w[i+1:] {
			if a.x == b.x {
				return &Tie{Lines: [2]int{a.line, b.line}, Value: a.x}
			}
		}
	}
	return nil
}

func factorial(k int) int {
	f := 1
	for i := 2; i <= k; i++ {
		f *= i
	}
	return f
}
