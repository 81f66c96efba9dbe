package prove_test

import (
	"context"
	"slices"
	"strings"
	"testing"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/internal/settest"
	"avoidcert/prove"
)

// The set the engine works on is {123}, as a parser that dropped the last
// token of "123,321" would read it; the user typed {123, 321}. The checker
// is bound to what was typed, so no answer comes back for {123}.
func TestTypedSetBindsTheChecker(t *testing.T) {
	ctx := context.Background()
	misread := settest.Must(t, "123")
	typed := []string{"123,321"}
	opts := prove.Options{Digits: 4, Typed: typed}
	if r, err := prove.Certify(ctx, misread, opts); err == nil || !strings.Contains(err.Error(), "did not pass the checker") {
		t.Errorf("Certify: %v, %v; want a refusal by the checker", r, err)
	}
	if j, err := prove.Judge(ctx, misread, claimOf(t, "0.83"), bounds.QuantityLambda, opts); err == nil {
		t.Errorf("Judge answered %s for the misread set", j.Verdict)
	}
	if c, err := prove.Counts(ctx, misread, 6, opts); err == nil || !strings.Contains(err.Error(), "disagree") {
		t.Errorf("Counts: %v, %v; want the engine and the checker to disagree", c, err)
	}
	good, err := prove.Certify(ctx, settest.Must(t, "123"), prove.Options{Digits: 4})
	if err != nil {
		t.Fatal(err)
	}
	if err := prove.Recheck(ctx, good.Certificate, misread, opts); err == nil || !strings.Contains(err.Error(), "not for the expected set") {
		t.Errorf("Recheck of a certificate of {123} against the typed {123, 321}: %v", err)
	}
	first, second := settest.Must(t, "1342"), settest.Must(t, "1324")
	if _, err := prove.Compare(ctx, first, second, prove.Options{Typed: []string{"1342"}, TypedOther: []string{"1234"}}); err == nil {
		t.Error("Compare answered although the second set was typed as 1234")
	}
}

// Typed tokens are what the certificate states as given (split at commas,
// spaces removed), and the counts and checks rest on them.
func TestTypedTokensAreGiven(t *testing.T) {
	ctx := context.Background()
	opts := prove.Options{Digits: 4, Typed: []string{" 321, 123"}}
	r, err := prove.Certify(ctx, settest.Must(t, "321,123"), opts)
	if err != nil {
		t.Fatal(err)
	}
	if got := r.Certificate.Statement.Given; !slices.Equal(got, []string{"321", "123"}) {
		t.Errorf("patterns_given %q, want the typed tokens", got)
	}
	data, err := certify.Marshal(r.Certificate)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := prove.CheckBytes(ctx, data, []string{"123", "321"}, prove.Options{}); err != nil {
		t.Errorf("CheckBytes for the same set typed otherwise: %v", err)
	}
	if _, err := prove.CheckBytes(ctx, data, []string{"123"}, prove.Options{}); err == nil {
		t.Error("CheckBytes accepted the certificate of {123, 321} for {123}")
	}
	if _, err := prove.CheckBytes(ctx, data, nil, prove.Options{}); err == nil {
		t.Error("CheckBytes accepted a certificate bound to no set")
	}
	counts, err := prove.Counts(ctx, settest.Must(t, "123,321"), 6, opts)
	if err != nil || counts[6].String() != "122" { // OEIS A001250
		t.Errorf("Counts: %v, %v; want a_6 = 122", counts, err)
	}
}
