package main

import (
	"context"
	"fmt"

	"avoidcert/census"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// censusCertifier certifies one class for the census through prove.Certify
// (structure, bracket, certificate, and the checker's acceptance before
// anything is returned). maxMemory is the budget of one class.
func censusCertifier(maxMemory int64) census.Certifier {
	return func(ctx context.Context, set pattern.Set, digits int) (census.Certified, error) {
		opts := censusOptions(maxMemory)
		opts.Digits, opts.Typed = digits, set.Strings()
		r, err := prove.Certify(ctx, set, opts)
		if err != nil {
			return census.Certified{}, err
		}
		if !r.Done() {
			return census.Certified{}, fmt.Errorf("%d digits not reached: %w", digits, r.Stopped())
		}
		data, err := certify.Marshal(r.Certificate)
		if err != nil {
			return census.Certified{}, err
		}
		return census.Certified{Certificate: data, Checked: r.Certificate}, nil
	}
}

// censusOptions are the budgets of one class of a census (certifying it,
// or checking its certificate again).
func censusOptions(maxMemory int64) prove.Options {
	return prove.Options{MaxMemory: maxMemory, Tool: toolName()}
}
