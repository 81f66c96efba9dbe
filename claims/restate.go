package claims

import (
	"fmt"
	"math/big"
	"strings"

	"avoidcert/bounds"
	"avoidcert/internal/brief"
)

// Quantity names what a claim is about: "count" (count and equal-counts
// claims), "lambda" or "radius" (growth claims; order claims compare
// lambda), "form" and "probability" (a_n/n!).
func (c Claim) Quantity() string {
	switch c.Kind {
	case KindCount, KindEqualCounts:
		return "count"
	case KindGrowth:
		return string(c.Of)
	case KindOrder:
		return string(bounds.QuantityLambda)
	case KindForm:
		return "form"
	}
	return "probability"
}

// Statement restates the claim in one line, as the manifest states it
// (long numbers by their first and last digits): "a_12(123) = 74207209",
// "lambda(1342) = 0.954612 (rounded)", "lambda(1342) < lambda(1324)".
func (c Claim) Statement() string {
	set := c.Set.String()
	switch c.Kind {
	case KindCount:
		if len(c.Counts) == 1 {
			return fmt.Sprintf("a_%d(%s) = %s", c.From, set, brief.Digits(c.Counts[0].String()))
		}
		shown := make([]string, 0, 4)
		for i, v := range c.Counts {
			if i == 3 && len(c.Counts) > 4 {
				shown = append(shown, fmt.Sprintf("... (%d counts)", len(c.Counts)))
				break
			}
			shown = append(shown, brief.Digits(v.String()))
		}
		return fmt.Sprintf("a_%d..a_%d(%s) = %s", c.From, c.From+len(c.Counts)-1, set, strings.Join(shown, ", "))
	case KindGrowth:
		if strings.HasPrefix(c.Stated, "[") {
			return fmt.Sprintf("%s(%s) in %s", c.Of, set, brief.Digits(c.Stated))
		}
		return fmt.Sprintf("%s(%s) = %s", c.Of, set, readingOf(brief.Digits(c.Stated)))
	case KindForm:
		if c.Period > 0 {
			return fmt.Sprintf("%s is periodic with period %d", set, c.Period)
		}
		return fmt.Sprintf("%s is %s", set, c.Form)
	case KindOrder:
		return fmt.Sprintf("lambda(%s) < lambda(%s)", set, c.Other)
	case KindEqualCounts:
		return fmt.Sprintf("a_n(%s) = a_n(%s) for every n <= %d", set, c.Other, c.To)
	}
	if c.Exact != nil {
		return fmt.Sprintf("a_%d(%s)/%d! = %s", c.N, set, c.N, brief.Digits(c.Stated))
	}
	return fmt.Sprintf("a_%d(%s)/%d! = %s", c.N, set, c.N, readingOf(brief.Digits(c.Stated)))
}

// readingOf names how a claimed decimal is read: Stated carries
// " (truncated)" for a truncated one.
func readingOf(stated string) string {
	if strings.HasSuffix(stated, " (truncated)") {
		return stated
	}
	return stated + " (rounded)"
}

// claimedEnds is the closed interval a growth claim, or a probability
// claim given as a decimal, is read as: exact decimals (a claimed decimal
// has at most interval.MaxDigits digits, and its ends one more).
func (c Claim) claimedEnds() (lo, hi string, ok bool) {
	if c.Claimed.Lo == nil || c.Claimed.Hi == nil {
		return "", "", false
	}
	return exactDecimal(c.Claimed.Lo), exactDecimal(c.Claimed.Hi), true
}

// exactDecimal writes a decimal fraction (a denominator of 2s and 5s) in
// full, with as many places as it has.
func exactDecimal(r *big.Rat) string {
	d := new(big.Int).Set(r.Denom())
	twos := int(d.TrailingZeroBits())
	d.Rsh(d, uint(twos))
	fives := 0
	five, q, rem := big.NewInt(5), new(big.Int), new(big.Int)
	for d.Cmp(big.NewInt(1)) > 0 {
		if q.QuoRem(d, five, rem); rem.Sign() != 0 {
			break
		}
		d.Set(q)
		fives++
	}
	return r.FloatString(max(twos, fives))
}
