package main

import (
	"context"
	"fmt"

	"avoidcert/census"
	"avoidcert/certify"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// censusCertifier certifies one class for the census through prove.Certify
// (structure, bracket, certificate, and the checker's acceptance before
// anything is returned). maxMemory is the budget of one class.
func censusCertifier(maxMemory int64) census.Certifier {
	return func(ctx context.Context, set pattern.Set, digits int) (census.Certified, error) {
		r, err := prove.Certify(ctx, set, prove.Options{Digits: digits, MaxMemory: maxMemory, Tool: "avoidcert " + version})
		if err != nil {
			return census.Certified{}, err
		}
		if !r.Done() {
			return census.Certified{}, fmt.Errorf("%d digits not reached: %s", digits, stopWords(r.Bracket))
		}
		data, err := certify.Marshal(r.Certificate)
		if err != nil {
			return census.Certified{}, err
		}
		st := r.Certificate.Statement
		return census.Certified{
			Lambda:      outward(st.Lambda),
			Radius:      outward(st.Radius),
			Class:       string(r.Certificate.Structure.Class),
			Form:        classLine(r.Certificate.Structure),
			Certificate: data,
		}, nil
	}
}

// outward prints a certificate's range rounded outward at its digits.
func outward(r certify.Range) census.Range {
	out := census.Range{Lo: interval.DecimalDown(r.Lo, r.Digits)}
	if r.Hi != nil {
		out.Hi = interval.DecimalUp(r.Hi, r.Digits)
	}
	return out
}
