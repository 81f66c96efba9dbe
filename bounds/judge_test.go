package bounds

import (
	"context"
	"math/big"
	"testing"

	"avoidcert/interval"
)

func claim(t *testing.T, s string, truncated bool) interval.Interval {
	t.Helper()
	lo, hi, err := interval.ClaimRange(s, truncated)
	if err != nil {
		t.Fatal(err)
	}
	return interval.Interval{Lo: lo, Hi: hi}
}

// TestJudge decides claims about 123 (lambda = 3 sqrt(3)/(2 pi) =
// 0.826993343132688074266989747469454..., Elizalde-Noy 2003) and 132
// (Elizalde-Noy 2003, through interval.Lambda132).
func TestJudge(t *testing.T) {
	_, sys123 := system(t, "123")
	_, sys132 := system(t, "132")
	radius132 := interval.Lambda132(200).Inverse()
	cases := []struct {
		name  string
		claim interval.Interval
		of    Quantity
		opts  Options
		want  Verdict
		stop  StopReason
	}{
		{"rounded, right", claim(t, "0.8270", false), QuantityLambda, Options{}, Proved, StopDecided},
		{"rounded, wrong last digit", claim(t, "0.8269", false), QuantityLambda, Options{}, Refuted, StopDecided},
		{"truncated, 27 digits", claim(t, "0.826993343132688074266989747", true), QuantityLambda, Options{}, Proved, StopDecided},
		{"truncated, one unit off", claim(t, "0.826993343132688074266989746", true), QuantityLambda, Options{}, Refuted, StopDecided},
		{"budget", claim(t, "0.82699334313268807426698974747", false), QuantityLambda, Options{MaxN: 12}, Undecided, StopMaxN},
	}
	for _, c := range cases {
		v, res, err := Judge(context.Background(), sys123, c.claim, c.of, c.opts)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if v != c.want || res.Stop != c.stop {
			t.Errorf("%s: %s (stop %s), want %s (%s); lambda %s", c.name, v, res.Stop, c.want, c.stop, res.Lambda.String(30))
		}
	}
	// The radius 1/lambda of 132, claimed to 15 digits cut from the
	// reference, then a wrong claim.
	cut := claim(t, interval.DecimalDown(radius132.Lo, 15), true)
	if v, res, err := Judge(context.Background(), sys132, cut, QuantityRadius, Options{}); err != nil || v != Proved {
		t.Errorf("radius of 132: %s, %v (radius %s)", v, err, res.Radius.String(20))
	}
	if v, _, err := Judge(context.Background(), sys132, claim(t, "1.27", false), QuantityRadius, Options{}); err != nil || v != Refuted {
		t.Errorf("radius 1.27 for 132 (true 1.27554...): %s, %v", v, err)
	}
	if _, _, err := Judge(context.Background(), sys132, cut, "rate", Options{}); err == nil {
		t.Error("an unknown quantity was accepted")
	}
	if _, err := ParseQuantity("radius"); err != nil {
		t.Error(err)
	}
}

// Before its first bracket a run knows only [0, inf]; a claim below 0 is
// refuted by the first bracket, never "decided" with no bracket at all.
func TestJudgeNeedsABracket(t *testing.T) {
	_, st := system(t, "123")
	v, res, err := Judge(context.Background(), st, interval.Interval{Lo: big.NewRat(-1, 1), Hi: big.NewRat(-1, 2)}, QuantityLambda, Options{MaxN: 30})
	if err != nil || v != Refuted || len(res.Brackets) == 0 {
		t.Fatalf("verdict %s, %v, brackets %v", v, err, res)
	}
}
