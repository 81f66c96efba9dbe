package interval

import (
	"fmt"
	"math/big"
)

// searchLimit is the right end of the scan for the smallest positive root z0
// of a reciprocal generating function. For the patterns served here z0 lies
// in (1, 1.3]: lambda = 1/z0 lies between the growth rates of the least and
// the most avoided patterns, both in [0.78, 1) from length 3 on.
var searchLimit = big.NewRat(2, 1)

// Lambda123 returns an enclosure of the growth rate of the consecutive
// pattern 123, lambda = 3*sqrt(3)/(2*pi), of relative width about 2^-prec.
// Source: Elizalde and Noy, "Consecutive patterns in permutations",
// Adv. Appl. Math. 30 (2003).
func Lambda123(prec uint) Interval {
	p := prec + 8
	root3 := Sqrt(big.NewRat(3, 1), p)
	num := root3.Mul(Point(big.NewRat(3, 2)))
	return num.Mul(Pi(p).Inverse()).Round(prec + 4)
}

// LambdaAlternating returns an enclosure of the growth rate of the pattern
// set {123, 321}, lambda = 2/pi: its avoiders are the alternating
// permutations (twice the Euler zigzag numbers), whose e.g.f. sec z + tan z
// has its first pole at pi/2. Source: D. Andre (1879), alternating
// permutations.
func LambdaAlternating(prec uint) Interval {
	p := prec + 8
	return Point(big.NewRat(2, 1)).Mul(Pi(p).Inverse()).Round(prec + 4)
}

// Lambda132 returns an enclosure of the growth rate of the consecutive
// pattern 132: lambda = 1/z0, z0 the root of integral_0^z exp(-t^2/2) dt = 1.
// Source: Elizalde and Noy, "Consecutive patterns in permutations",
// Adv. Appl. Math. 30 (2003).
//
// Method (independent of LambdaNonOverlapping(3, 2), which expands the same
// function directly): with F(z) = integral_0^z exp(-t^2/2) dt and
// g(z) = sum_m z^(2m+1)/(2m+1)!!, g' = 1 + z g, so (exp(-z^2/2) g)' =
// exp(-z^2/2) and F = exp(-z^2/2) g. Hence z0 is the root of
// h(z) = exp(z^2/2) - g(z) = exp(z^2/2) (1 - F(z)), whose coefficients obey
// c_0 = 1, c_1 = -1, c_n = c_(n-2)/n. With m_n = |c_n|,
// m_(n'+2) X^2 / m_(n') = X^2/(n'+2) <= X^2/(n+2) for n' >= n, which bounds
// the tail. F is increasing, so z0 is the only positive root.
func Lambda132(prec uint) Interval {
	return lambdaFromSeries(&kummerSeries{}, prec)
}

// LambdaMonotone returns an enclosure of the growth rate of the consecutive
// pattern 12...k, k >= 2: lambda = 1/z0, z0 the smallest positive root of
// w(z) = sum_j (z^(jk)/(jk)! - z^(jk+1)/(jk+1)!), the reciprocal of the
// exponential generating function. Source: F. N. David and D. E. Barton,
// Combinatorial Chance (1962). The tail uses |c_n| <= 1/n!, whose ratio is
// X/(n'+1) <= X/(n+1). For k = 2, w = exp(-z) has no root and lambda = 0
// (only the decreasing permutation avoids 12); the result is [0, 0].
// It panics for k < 2 or k > 64.
func LambdaMonotone(k int, prec uint) Interval {
	if k < 2 || k > 64 {
		panic(fmt.Sprintf("interval: LambdaMonotone needs 2 <= k <= 64, got %d", k))
	}
	if k == 2 {
		return Interval{Lo: new(big.Rat), Hi: new(big.Rat)}
	}
	return lambdaFromSeries(&monotoneSeries{k: k}, prec)
}

// LambdaNonOverlapping returns an enclosure of the growth rate of a
// non-overlapping consecutive pattern of length k whose first entry is 1 and
// last entry is b (132: k=3, b=2; 1342 and 1432: k=4, b=2; 1243: k=4, b=3;
// 12354: k=5, b=4). The caller vouches that the pattern is non-overlapping
// with these ends; the constant depends on k and b alone. Source: Elizalde
// and Noy, "Consecutive patterns in permutations", Adv. Appl. Math. 30
// (2003): the reciprocal of the e.g.f. is the solution w of
// w^(b) + z^(k-b)/(k-b)! w' = 0, w(0) = 1, w'(0) = -1, w^(i)(0) = 0 for
// 2 <= i < b, and lambda = 1/z0 for its smallest positive root z0.
// It panics unless 3 <= k <= 64 and 2 <= b <= k-1.
//
// Recurrence (derived here). Write q = k-b and w = sum c_n z^n. The
// coefficient of z^n in w^(b) is (n+b)!/n! c_(n+b); in z^q/q! w' it is
// (n-q+1) c_(n-q+1)/q! for n >= q and 0 below. So for N = n+b >= b:
//
//	c_N = -(N-b)! (N-k+1) / (N! q!) * c_(N-k+1)   for N >= k,
//	c_N = 0                                        for b <= N < k,
//
// with c_0 = 1, c_1 = -1, c_i = 0 (2 <= i < b). Only c_0 and the indices
// N = 1 + j(k-1) are nonzero (c_(k-1) = 0, and the class of 0 stays 0), and
// their signs alternate.
//
// Tail bound (proved here). For N = n'+k-1 >= k,
// |c_N| / |c_(n')| = (N-k+1) / (q! N (N-1)...(N-b+1)); as (N-k+1)/N <= 1 and
// each of the b-1 factors N-i (1 <= i < b) is >= N-b+1 = n'+k-b,
// |c_(n'+k-1)| X^(k-1) <= X^(k-1) / (q! (n+k-b)^(b-1)) * |c_(n')| for all
// n' >= n, the bound the series evaluation needs (step k-1).
func LambdaNonOverlapping(k, b int, prec uint) Interval {
	if k < 3 || k > 64 || b < 2 || b > k-1 {
		panic(fmt.Sprintf("interval: LambdaNonOverlapping needs 3 <= k <= 64 and 2 <= b <= k-1, got k = %d, b = %d", k, b))
	}
	return lambdaFromSeries(newNonOverlappingSeries(k, b), prec)
}

// lambdaFromSeries encloses 1/z0 for the first positive root z0 of w.
func lambdaFromSeries(w powerSeries, prec uint) Interval {
	ew := newEvaluator(w, searchLimit)
	a, b, err := smallestPositiveRoot(ew, newEvaluator(derivative{w}, searchLimit))
	if err != nil {
		panic(err) // the parameter checks above exclude this; it would be a bug
	}
	point := func(x *big.Rat, p uint) Interval { return ew.eval(x, x, p) }
	z, err := Bisect(point, a, b, prec+4)
	if err != nil {
		panic(err)
	}
	return z.Inverse().Round(prec + 4)
}

// factorials memoises n! for the series below.
type factorials []*big.Int

func (f *factorials) get(n int) *big.Int {
	if len(*f) == 0 {
		*f = append(*f, big.NewInt(1))
	}
	for len(*f) <= n {
		m := len(*f)
		*f = append(*f, new(big.Int).Mul((*f)[m-1], big.NewInt(int64(m))))
	}
	return (*f)[n]
}

// monotoneSeries is sum_j (z^(jk)/(jk)! - z^(jk+1)/(jk+1)!).
type monotoneSeries struct {
	k    int
	fact factorials
}

func (s *monotoneSeries) coef(n int) *big.Rat {
	switch n % s.k {
	case 0:
		return s.majorant(n)
	case 1:
		return new(big.Rat).Neg(s.majorant(n))
	}
	return new(big.Rat)
}

func (s *monotoneSeries) majorant(n int) *big.Rat {
	return new(big.Rat).SetFrac(big.NewInt(1), s.fact.get(n))
}

func (s *monotoneSeries) step() int { return 1 }

func (s *monotoneSeries) ratio(n int, x *big.Rat) *big.Rat {
	return new(big.Rat).Quo(x, big.NewRat(int64(n+1), 1))
}

// kummerSeries is exp(z^2/2) - sum_m z^(2m+1)/(2m+1)!! (see Lambda132).
type kummerSeries struct{ c []*big.Rat }

func (s *kummerSeries) coef(n int) *big.Rat {
	if len(s.c) == 0 {
		s.c = []*big.Rat{big.NewRat(1, 1), big.NewRat(-1, 1)}
	}
	for len(s.c) <= n {
		m := len(s.c)
		s.c = append(s.c, new(big.Rat).Quo(s.c[m-2], big.NewRat(int64(m), 1)))
	}
	return s.c[n]
}

func (s *kummerSeries) majorant(n int) *big.Rat { return new(big.Rat).Abs(s.coef(n)) }

func (s *kummerSeries) step() int { return 2 }

func (s *kummerSeries) ratio(n int, x *big.Rat) *big.Rat {
	r := new(big.Rat).Mul(x, x)
	return r.Quo(r, big.NewRat(int64(n+2), 1))
}

// nonOverlappingSeries is the reciprocal e.g.f. of LambdaNonOverlapping.
type nonOverlappingSeries struct {
	k, b  int
	qFact *big.Int
	fact  factorials
	c     []*big.Rat
}

func newNonOverlappingSeries(k, b int) *nonOverlappingSeries {
	s := &nonOverlappingSeries{k: k, b: b}
	s.qFact = new(big.Int).Set(s.fact.get(k - b))
	return s
}

func (s *nonOverlappingSeries) coef(n int) *big.Rat {
	if len(s.c) == 0 {
		s.c = []*big.Rat{big.NewRat(1, 1), big.NewRat(-1, 1)}
	}
	for len(s.c) <= n {
		N := len(s.c)
		if N < s.k {
			s.c = append(s.c, new(big.Rat))
			continue
		}
		num := new(big.Int).Mul(s.fact.get(N-s.b), big.NewInt(int64(N-s.k+1)))
		den := new(big.Int).Mul(s.fact.get(N), s.qFact)
		c := new(big.Rat).SetFrac(num, den)
		c.Mul(c, s.c[N-s.k+1])
		s.c = append(s.c, c.Neg(c))
	}
	return s.c[n]
}

func (s *nonOverlappingSeries) majorant(n int) *big.Rat { return new(big.Rat).Abs(s.coef(n)) }

func (s *nonOverlappingSeries) step() int { return s.k - 1 }

func (s *nonOverlappingSeries) ratio(n int, x *big.Rat) *big.Rat {
	r := ratPow(x, s.k-1)
	d := new(big.Int).Exp(big.NewInt(int64(n+s.k-s.b)), big.NewInt(int64(s.b-1)), nil)
	d.Mul(d, s.qFact)
	return r.Quo(r, new(big.Rat).SetInt(d))
}
