package bounds

import (
	"context"
	"errors"
	"math/big"
	"strings"
	"testing"
	"time"

	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

func system(t testing.TB, set string) (pattern.Set, *transfer.States) {
	t.Helper()
	s, err := pattern.ParseSet([]string{set})
	if err != nil {
		t.Fatal(err)
	}
	return s, transfer.NewStates(s)
}

// checkContains fails unless the certified enclosure holds the reference
// enclosure (computed much narrower) and its reciprocal holds the
// reference radius.
func checkContains(t *testing.T, name string, res *Result, ref interval.Interval) {
	t.Helper()
	got, ok := res.Lambda.Interval()
	if !ok {
		t.Fatalf("%s: enclosure %s is not finite", name, res.Lambda.String(10))
	}
	if !got.ContainsInterval(ref) {
		t.Fatalf("%s: certified %s misses the reference %s", name, res.Lambda.String(40), ref.String(40))
	}
	rad, ok := res.Radius.Interval()
	if !ok || !rad.ContainsInterval(ref.Inverse()) {
		t.Fatalf("%s: radius %s misses the reference %s", name, res.Radius.String(40), ref.Inverse().String(40))
	}
}

// TestReferenceConstants brackets sets with independently known growth
// rates to the digits asked and checks the bracket holds the reference.
func TestReferenceConstants(t *testing.T) {
	cases := []struct {
		set    string
		digits int
		step   int
		ref    func(prec uint) interval.Interval
	}{
		// Elizalde and Noy, Adv. Appl. Math. 30 (2003): 3 sqrt(3)/(2 pi).
		{"123", 40, 1, interval.Lambda123},
		// Elizalde and Noy 2003: 1/lambda is the root of int_0^z exp(-t^2/2) dt = 1.
		{"132", 40, 1, interval.Lambda132},
		// David and Barton, Combinatorial Chance (1962): EGF of 12...k.
		{"1234", 20, 1, func(p uint) interval.Interval { return interval.LambdaMonotone(4, p) }},
		{"12345", 10, 1, func(p uint) interval.Interval { return interval.LambdaMonotone(5, p) }},
		{"123456", 4, 1, func(p uint) interval.Interval { return interval.LambdaMonotone(6, p) }},
		// Elizalde and Noy 2003: non-overlapping patterns, ODE with k and b.
		{"1342", 15, 1, func(p uint) interval.Interval { return interval.LambdaNonOverlapping(4, 2, p) }},
		{"1432", 15, 1, func(p uint) interval.Interval { return interval.LambdaNonOverlapping(4, 2, p) }},
		{"1243", 15, 1, func(p uint) interval.Interval { return interval.LambdaNonOverlapping(4, 3, p) }},
		{"12354", 8, 1, func(p uint) interval.Interval { return interval.LambdaNonOverlapping(5, 4, p) }},
		// Andre (1879): avoiders of {123, 321} are the alternating
		// permutations (twice), lambda = 2/pi; the window digraph has period 2.
		{"123,321", 20, 2, interval.LambdaAlternating},
	}
	for _, c := range cases {
		t.Run(c.set, func(t *testing.T) {
			_, sys := system(t, c.set)
			res, err := Run(context.Background(), sys, Options{Digits: c.digits, Step: c.step}, nil)
			if err != nil {
				t.Fatal(err)
			}
			if res.Stop != StopTarget || res.Digits < c.digits {
				t.Fatalf("stopped (%s, %s) with %d digits, want the target %d", res.Stop, res.Detail, res.Digits, c.digits)
			}
			checkContains(t, c.set, res, c.ref(uint(3.4*float64(c.digits+30))))
		})
	}
}

// TestPublishedConstants checks the certified bracket against the growth
// constants printed in OEIS entries (through interval.PublishedGrowth):
// A113228 (1324), A201692 (1423), A113229 (2143), A117226 (1243), A117156
// (1342). The printed digits are far more than asked here, so the printed
// range must lie inside the bracket.
func TestPublishedConstants(t *testing.T) {
	for _, p := range []string{"1324", "1423", "2143", "1243", "1342"} {
		c, ok := interval.PublishedGrowth(p)
		if !ok {
			t.Fatalf("no published constant for %s", p)
		}
		_, sys := system(t, p)
		res, err := Run(context.Background(), sys, Options{Digits: 12}, nil)
		if err != nil {
			t.Fatal(err)
		}
		got, _ := res.Lambda.Interval()
		if !got.ContainsInterval(c.LambdaRange()) {
			t.Errorf("%s: certified %s misses %s %s", p, res.Lambda.String(15), c.Source(), c.LambdaRange().String(20))
		}
	}
}

// TestExtremalPatterns brackets one member of each symmetry class of
// length 4 and checks Elizalde's theorem ("The most and the least avoided
// consecutive patterns", 2013): 1234 has the largest growth rate and 1243
// the smallest, strictly, so their brackets are disjoint from all others.
func TestExtremalPatterns(t *testing.T) {
	classes := pattern.SymmetryClasses(4)
	if len(classes) != 8 { // method note, section 6
		t.Fatalf("%d symmetry classes of length 4, want 8", len(classes))
	}
	brackets := map[string]interval.Interval{}
	for _, c := range classes {
		p := c.Representative.String()
		_, sys := system(t, p)
		res, err := Run(context.Background(), sys, Options{Digits: 5}, nil)
		if err != nil {
			t.Fatal(err)
		}
		brackets[p], _ = res.Lambda.Interval()
	}
	most, least := brackets["1234"], brackets["1243"]
	if most.Lo == nil || least.Lo == nil {
		t.Fatalf("1234 or 1243 is not a class representative: %v", brackets)
	}
	for p, b := range brackets {
		if p != "1234" && most.Lo.Cmp(b.Hi) <= 0 {
			t.Errorf("1234 %s does not lie above %s %s", most.String(8), p, b.String(8))
		}
		if p != "1243" && least.Hi.Cmp(b.Lo) >= 0 {
			t.Errorf("1243 %s does not lie below %s %s", least.String(8), p, b.String(8))
		}
	}
}

// TestWidthAtFixedN compares the exact bracket width at n = 32 with the
// figures a quick exact prototype saw in the cell form at k = 30, the same
// n (method note, section 4: 123 about 3.5e-9, 132 about 1.7e-12): on
// prefix states the bracket is as tight or tighter (section 8), and not
// absurdly so.
func TestWidthAtFixedN(t *testing.T) {
	for _, c := range []struct {
		set  string
		seen float64
	}{{"123", 3.5e-9}, {"132", 1.7e-12}} {
		_, sys := system(t, c.set)
		b, err := BracketAt(context.Background(), transfer.Whole(sys), 32, 1, 64)
		if err != nil {
			t.Fatal(err)
		}
		w, _ := new(big.Rat).Sub(b.Hi, b.Lo).Float64()
		if w < c.seen/1e4 || w > c.seen*10 {
			t.Errorf("%s: width %.2g at n = 32, the cell-form prototype saw about %.2g", c.set, w, c.seen)
		}
	}
}

// TestExplicitBounds checks A mu_lo^(n-n0) <= a_n/n! <= A mu_hi^(n-n0)
// for every n from n0 to 60 against the exact counts of transfer.Counts
// (themselves tested against OEIS A049774, A111004, A117156).
func TestExplicitBounds(t *testing.T) {
	for _, set := range []string{"123", "132", "1342"} {
		s, sys := system(t, set)
		res, err := Run(context.Background(), sys, Options{Digits: 6}, nil)
		if err != nil {
			t.Fatal(err)
		}
		b := res.Explicit
		if b == nil {
			t.Fatalf("%s: no explicit bounds", set)
		}
		if b.N0 > 40 {
			t.Fatalf("%s: n0 = %d leaves too few n to check", set, b.N0)
		}
		counts, err := transfer.Counts(context.Background(), s, 60, nil)
		if err != nil {
			t.Fatal(err)
		}
		if counts[b.N0].Cmp(b.AN0) != 0 {
			t.Fatalf("%s: a_%d = %s in the bounds, %s counted", set, b.N0, b.AN0, counts[b.N0])
		}
		if _, _, err := b.At(b.N0-1, 64); err == nil {
			t.Errorf("%s: At(n0-1) was accepted", set)
		}
		for n := b.N0; n <= 60; n++ {
			lo, hi, err := b.At(n, 80)
			if err != nil {
				t.Fatal(err)
			}
			v := new(big.Rat).SetFrac(counts[n], factorial(n))
			if lo.Cmp(v) > 0 || v.Cmp(hi) > 0 {
				t.Fatalf("%s n = %d: a_n/n! = %s outside [%s, %s]", set, n, interval.DecimalDown(v, 12),
					interval.DecimalDown(lo, 12), interval.DecimalUp(hi, 12))
			}
		}
	}
}

// TestBudgetStops checks that every budget stop returns a certified
// bracket (holding 3 sqrt(3)/(2 pi) for 123, Elizalde-Noy 2003, or the
// David-Barton constant for 1234) and the right reason.
func TestBudgetStops(t *testing.T) {
	ref123 := interval.Lambda123(400)
	ref1234 := interval.LambdaMonotone(4, 400)
	_, sys123 := system(t, "123")
	_, sys1234 := system(t, "1234")

	t.Run("max-n", func(t *testing.T) {
		res, err := Run(context.Background(), sys123, Options{Digits: 80, MaxN: 22}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Stop != StopMaxN || res.Brackets[0].N != 22 {
			t.Fatalf("stop %s at n = %d, want max-n at 22", res.Stop, res.Brackets[0].N)
		}
		checkContains(t, "123", res, ref123)
	})
	t.Run("certifiable", func(t *testing.T) {
		// CertN stops the run like MaxN, under its own name, and the
		// lower of the two caps binds
		res, err := Run(context.Background(), sys123, Options{Digits: 80, MaxN: 40, CertN: 22}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Stop != StopCertifiable || res.Brackets[0].N != 22 {
			t.Fatalf("stop %s at n = %d, want certifiable at 22", res.Stop, res.Brackets[0].N)
		}
		checkContains(t, "123", res, ref123)
		if res, _ := Run(context.Background(), sys123, Options{Digits: 80, MaxN: 20, CertN: 22}, nil); res.Stop != StopMaxN {
			t.Errorf("MaxN below CertN: stop %s, want max-n", res.Stop)
		}
	})
	t.Run("reserve", func(t *testing.T) {
		// time reserved after the run for certifying: a run with a whole
		// second of deadline and a reserve of almost all of it stops
		// early, and never before its first bracket
		ctx, cancel := context.WithTimeout(context.Background(), time.Second)
		defer cancel()
		start := time.Now()
		res, err := Run(ctx, sys1234, Options{Digits: 200, Reserve: func(int) time.Duration { return 900 * time.Millisecond }}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Stop != StopTimeout || time.Since(start) > 700*time.Millisecond {
			t.Fatalf("stop %s after %v, want a timeout stop well before the deadline", res.Stop, time.Since(start))
		}
	})
	t.Run("memory", func(t *testing.T) {
		const budget = 40 << 20
		var peakN int
		res, err := Run(context.Background(), sys1234, Options{Digits: 80, MaxMemory: budget}, func(e Event) { peakN = max(peakN, e.N) })
		if err != nil {
			t.Fatal(err)
		}
		if res.Stop != StopMemory || !strings.Contains(res.Detail, "memory budget") {
			t.Fatalf("stop %s (%s), want memory", res.Stop, res.Detail)
		}
		checkContains(t, "1234", res, ref1234)
		// The last bracket is taken from the last iterates the budget allows.
		if n := res.Brackets[0].N; n+1 != peakN {
			t.Errorf("last bracket at n = %d, but iterates reached %d", n, peakN)
		}
		if peak := transfer.New(transfer.Whole(sys1234)).Footprint(peakN - 1); peak > 3*budget/2 {
			t.Errorf("reached G_%d with footprint %d, far over the budget %d", peakN, peak, budget)
		}
	})
	t.Run("memory refused", func(t *testing.T) {
		_, err := Run(context.Background(), sys1234, Options{Digits: 10, MaxMemory: 100}, nil)
		if err == nil || !strings.Contains(err.Error(), "memory budget") {
			t.Fatalf("got %v, want a refusal naming the memory budget", err)
		}
		var be *BudgetError
		if !errors.Is(err, ErrBudget) || !errors.As(err, &be) || be.Stop != StopMemory {
			t.Errorf("got %#v, want a *BudgetError of StopMemory wrapping ErrBudget", err)
		}
	})
	t.Run("timeout", func(t *testing.T) {
		ctx, cancel := context.WithTimeout(context.Background(), 400*time.Millisecond)
		defer cancel()
		start := time.Now()
		res, err := Run(ctx, sys1234, Options{Digits: 200}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Stop != StopTimeout {
			t.Fatalf("stop %s, want timeout", res.Stop)
		}
		if el := time.Since(start); el > 2*time.Second {
			t.Errorf("returned %v after a 400ms deadline", el)
		}
		checkContains(t, "1234", res, ref1234)
	})
	t.Run("cancelled", func(t *testing.T) {
		ctx, cancel := context.WithCancel(context.Background())
		defer cancel()
		res, err := Run(ctx, sys123, Options{Digits: 200}, func(e Event) {
			if e.Bracket != nil && e.Bracket.N >= 18 {
				cancel()
			}
		})
		if err != nil {
			t.Fatal(err)
		}
		if res.Stop != StopCancelled {
			t.Fatalf("stop %s, want cancelled", res.Stop)
		}
		checkContains(t, "123", res, ref123)
	})
	t.Run("cancelled before any bracket", func(t *testing.T) {
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		_, err := Run(ctx, sys123, Options{Digits: 10}, nil)
		if err == nil || !strings.Contains(err.Error(), "before the first bracket") {
			t.Fatalf("got %v, want an error saying no bracket was taken", err)
		}
		if errors.Is(err, ErrBudget) {
			t.Errorf("an interrupt before the first bracket is not a budget refusal: %v", err)
		}
	})
	t.Run("deadline before any bracket", func(t *testing.T) {
		ctx, cancel := context.WithTimeout(context.Background(), time.Nanosecond)
		defer cancel()
		<-ctx.Done()
		_, err := Run(ctx, sys123, Options{Digits: 10}, nil)
		var be *BudgetError
		if !errors.Is(err, ErrBudget) || !errors.As(err, &be) || be.Stop != StopTimeout {
			t.Fatalf("got %v, want a *BudgetError of StopTimeout wrapping ErrBudget", err)
		}
	})
}

func TestBadOptions(t *testing.T) {
	_, sys := system(t, "123")
	for _, o := range []Options{{}, {Digits: -1}, {Digits: 5, Step: -1}, {Width: new(big.Rat)}, {Digits: 5, MaxN: -2}} {
		if _, err := Run(context.Background(), sys, o, nil); err == nil {
			t.Errorf("options %+v were accepted", o)
		}
	}
}

// TestWidthTarget checks the absolute width target.
func TestWidthTarget(t *testing.T) {
	_, sys := system(t, "132")
	w := big.NewRat(1, 1_000_000_000_000)
	res, err := Run(context.Background(), sys, Options{Width: w}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Stop != StopTarget || res.Lambda.Width().Cmp(w) > 0 {
		t.Fatalf("stop %s with width %s, want <= 1e-12", res.Stop, interval.DecimalUp(res.Lambda.Width(), 3))
	}
	checkContains(t, "132", res, interval.Lambda132(200)) // Elizalde-Noy 2003
}

// TestWideWidthTarget asks for a width far above lambda: the first finite
// bracket meets it. A width above hi once turned into a negative bit count
// converted to a huge unsigned precision, and the run never ended.
func TestWideWidthTarget(t *testing.T) {
	_, sys := system(t, "123")
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	res, err := Run(ctx, sys, Options{Width: big.NewRat(100_000, 1)}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Stop != StopTarget {
		t.Fatalf("stop %s, want the target met at once", res.Stop)
	}
	checkContains(t, "123", res, interval.Lambda123(60)) // Elizalde-Noy 2003
}

// reducible is a set whose state digraph has two strongly connected
// components with cycles and, as its brackets show, different growth
// rates (found by a search over random sets of length-4 patterns; no
// published source).
const reducible = "1243,1342,2314,2413,3421,4132"

// TestRunBlocks brackets a reducible set block by block and checks the
// result against the whole-system bracket, an independent computation.
func TestRunBlocks(t *testing.T) {
	_, st := system(t, reducible)
	blocks := Blocks(st)
	cyclic := 0
	for _, b := range blocks {
		if len(b) > 1 {
			cyclic++
		}
	}
	if cyclic < 2 {
		t.Fatalf("%s has %d blocks of several states (%v); the test needs a reducible set", reducible, cyclic, blocks)
	}
	res, err := RunBlocks(context.Background(), st, blocks, Options{Digits: 12}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Stop != StopTarget || res.Explicit != nil {
		t.Fatalf("stop %s, explicit %v", res.Stop, res.Explicit)
	}
	// The enclosure is [max lo over whole starts, max hi over ones starts].
	var lo, hi *big.Rat
	for _, b := range res.Brackets {
		if b.Lower() && (lo == nil || b.Lambda.Lo.Cmp(lo) > 0) {
			lo = b.Lambda.Lo
		}
		if b.Upper && (hi == nil || b.Lambda.Hi.Cmp(hi) > 0) {
			hi = b.Lambda.Hi
		}
		if b.Start == transfer.StartEmpty {
			t.Errorf("a block bracket has the whole system's start")
		}
	}
	if res.Lambda.Lo.Cmp(lo) != 0 || res.Lambda.Hi.Cmp(hi) != 0 {
		t.Errorf("enclosure %s is not [max lo, max hi] of the blocks", res.Lambda.String(15))
	}
	// The whole system is certified too, so the two must meet.
	whole, err := Run(context.Background(), st, Options{Digits: 6, MaxN: 40}, nil)
	if err != nil {
		t.Fatal(err)
	}
	a, _ := res.Lambda.Interval()
	b, ok := whole.Lambda.Interval()
	if !ok || a.Hi.Cmp(b.Lo) < 0 || b.Hi.Cmp(a.Lo) < 0 {
		t.Fatalf("blocks give %s, the whole system %s: disjoint", a.String(15), whole.Lambda.String(15))
	}

	bad := map[string][][]int{
		"overlap":   append([][]int{{0}}, blocks...),
		"uncovered": blocks[1:],
		"cycle":     splitCycle(blocks),
	}
	for name, bl := range bad {
		if _, err := RunBlocks(context.Background(), st, bl, Options{Digits: 5}, nil); err == nil {
			t.Errorf("%s blocks %v were accepted", name, bl)
		}
	}
}

// splitCycle splits the first block with several states in two, which
// cuts a cycle between blocks.
func splitCycle(blocks [][]int) [][]int {
	var out [][]int
	split := false
	for _, b := range blocks {
		if len(b) > 1 && !split {
			out = append(out, b[:1], b[1:])
			split = true
			continue
		}
		out = append(out, b)
	}
	return out
}

func TestContextErrorsAreStops(t *testing.T) {
	for err, want := range map[error]StopReason{context.DeadlineExceeded: StopTimeout, context.Canceled: StopCancelled} {
		got, _, e := stopFor(err)
		if got != want || e != nil {
			t.Errorf("stopFor(%v) = %s, %v", err, got, e)
		}
	}
	if _, _, e := stopFor(errors.New("x")); e == nil {
		t.Error("a plain error became a stop")
	}
}

// TestZeroGrowth covers sets with lambda = 0: the pattern 1 (no avoiders
// of length >= 1: the bracket is exactly [0, 0] and the radius infinite)
// and {123, 231, 312, 321}, whose upper end only creeps down (method note,
// section 5b: hi = 0.12 at k = 30 seen in a cell-form prototype; on
// prefix states it creeps down too, and stays below that).
func TestZeroGrowth(t *testing.T) {
	_, sys := system(t, "1")
	res, err := Run(context.Background(), sys, Options{Digits: 5}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Stop != StopExact || res.Lambda.Lo.Sign() != 0 || res.Lambda.Hi.Sign() != 0 || res.Radius.Lo != nil {
		t.Errorf("pattern 1: stop %s, lambda %s, radius %s", res.Stop, res.Lambda.String(5), res.Radius.String(5))
	}
	_, sys = system(t, "123,231,312,321")
	res, err = Run(context.Background(), sys, Options{Digits: 5, MaxN: 32}, nil)
	if err != nil {
		t.Fatal(err)
	}
	hi, _ := res.Lambda.Hi.Float64()
	if res.Stop != StopMaxN || res.Lambda.Lo.Sign() != 0 || hi <= 0 || hi > 0.14 || res.Radius.Hi != nil {
		t.Errorf("{123,231,312,321}: stop %s, lambda %s, radius %s", res.Stop, res.Lambda.String(5), res.Radius.String(5))
	}
}

// TestPeriodicMaxN stops a Step 2 run of {123, 321} at n = 12 and checks
// the bracket still holds 2/pi (Andre 1879).
func TestPeriodicMaxN(t *testing.T) {
	_, sys := system(t, "123,321")
	res, err := Run(context.Background(), sys, Options{Digits: 30, Step: 2, MaxN: 12}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The last bracket is within a step of MaxN (where the schedule puts
	// it: a base needs the previous bracket's G_(n+d)).
	if b := res.Brackets[0]; res.Stop != StopMaxN || b.N > 12 || b.N < 12-b.Step || b.Step != 2 || res.Explicit != nil {
		t.Fatalf("stop %s at n = %d, step %d, explicit %v", res.Stop, b.N, b.Step, res.Explicit)
	}
	checkContains(t, "123,321", res, interval.LambdaAlternating(200))
}

func TestEnclosureString(t *testing.T) {
	for _, c := range []struct {
		e    Enclosure
		want string
	}{
		{Enclosure{Lo: big.NewRat(1, 3), Hi: big.NewRat(2, 3)}, "[0.333, 0.667]"},
		{Enclosure{Lo: new(big.Rat)}, "[0, inf]"},
		{Enclosure{}, "[inf, inf]"},
	} {
		if got := c.e.String(3); got != c.want {
			t.Errorf("String = %q, want %q", got, c.want)
		}
	}
}

// TestTinyDeadline: a deadline that leaves room for a step but not for a
// bracket must not take a bracket's base below the longest state (its
// coefficients there do not exist yet); it once panicked that way.
func TestTinyDeadline(t *testing.T) {
	_, st := system(t, "1342")
	for _, d := range []time.Duration{time.Microsecond, 100 * time.Microsecond, time.Millisecond, 3 * time.Millisecond} {
		for range 20 {
			ctx, cancel := context.WithTimeout(context.Background(), d)
			res, err := Run(ctx, st, Options{Digits: 10}, nil)
			cancel()
			if err != nil {
				continue // stopped before the first bracket: a budget refusal
			}
			for _, b := range res.Brackets {
				if b.N < st.MaxLength() {
					t.Fatalf("deadline %v: bracket at n = %d below the longest state %d", d, b.N, st.MaxLength())
				}
			}
		}
	}
}

// TestScheduleNoOvershoot: the width of 36582714 barely moves between its
// early brackets (n = 23 and 25 both give 9 digits), and a schedule that
// trusted that decay jumped to n = 46 (20 digits, 8 GB, and a certificate
// whose check needed 25 GB); growing k by at most half reaches 10 digits
// by n = 26 (found on the census of length 8).
func TestScheduleNoOvershoot(t *testing.T) {
	if testing.Short() {
		t.Skip("a length-8 bracket to n = 26")
	}
	_, sys := system(t, "36582714")
	res, err := Run(context.Background(), sys, Options{Digits: 10, MaxMemory: 1 << 30}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if b := res.Brackets[0]; res.Stop != StopTarget || b.N > 30 {
		t.Errorf("stop %s with the bracket at n = %d, want 10 digits by n = 30", res.Stop, b.N)
	}
}
