package main

import (
	"context"

	"avoidcert/census"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// censusCertifier certifies one class for the census through prove.Certify
// (structure, bracket, certificate, and the checker's acceptance before
// anything is returned), or for 0 digits through prove.Classify (the
// structure test's own certificate, its lambda range coarse). maxMemory is
// the budget of one class; a bracket it stops early is still certified,
// and said to be short.
func censusCertifier(maxMemory int64) census.Certifier {
	return func(ctx context.Context, set pattern.Set, digits int) (census.Certified, error) {
		opts := censusOptions(maxMemory)
		opts.Digits, opts.Typed = digits, set.Strings()
		certifier := prove.Certify
		if digits == 0 {
			certifier = prove.Classify
		}
		r, err := certifier(ctx, set, opts)
		if err != nil {
			return census.Certified{}, err
		}
		data, err := certify.Marshal(r.Certificate)
		if err != nil {
			return census.Certified{}, err
		}
		c := census.Certified{Certificate: data, Checked: r.Certificate}
		if digits > 0 && !r.Done() {
			c.Short = r.Stopped()
		}
		return c, nil
	}
}

// censusOptions are the budgets of one class of a census (certifying it,
// or checking its certificate again).
func censusOptions(maxMemory int64) prove.Options {
	return prove.Options{MaxMemory: maxMemory, Tool: toolName()}
}
