package prove

import (
	"context"
	"errors"
	"math/big"
	"strings"
	"testing"

	"avoidcert/bounds"
	"avoidcert/internal/settest"
)

// A run whose claimed interval the brackets do not support gives a
// certificate the checker refuses: finish returns that refusal as an
// error (not a budget), never a Result.
func TestFinishRefusedCertificate(t *testing.T) {
	ctx := context.Background()
	p, err := planFor(ctx, settest.Must(t, "132"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	opts := Options{Digits: 6}
	bo, err := p.options(ctx, opts, endBits(6))
	if err != nil {
		t.Fatal(err)
	}
	bo.Digits = 6
	res, err := p.bracket(ctx, bo, nil)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := p.finish(ctx, res, 9, opts); err != nil {
		t.Fatalf("the untouched run: %v", err)
	}
	lifted := *res
	lifted.Lambda = bounds.Enclosure{Lo: new(big.Rat).Add(res.Lambda.Hi, big.NewRat(1, 100)), Hi: new(big.Rat).Add(res.Lambda.Hi, big.NewRat(1, 50))}
	r, err := p.finish(ctx, &lifted, 9, opts)
	if err == nil || r != nil {
		t.Fatal("a certificate with a lambda interval above the brackets was returned")
	}
	if !strings.Contains(err.Error(), "did not pass the checker") || errors.Is(err, ErrBudget) {
		t.Errorf("got %v, want a checker refusal that is not a budget", err)
	}
}
