package main

import (
	"bytes"
	"context"
	"fmt"

	"avoidcert/bounds"
	"avoidcert/census"
	"avoidcert/certify"
	"avoidcert/certify/produce"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/structure"
)

// censusCertifier certifies one class for the census with the same plan
// as 'bound' (structure, bracket, certificate) and the checker's verdict
// on the certificate's bytes. Interim: it is to be replaced by the
// library call that certifies a set, which serves bound, claim and the
// census alike. maxMemory is the budget of one class.
func censusCertifier(maxMemory int64) census.Certifier {
	return func(ctx context.Context, set pattern.Set, digits int) (census.Certified, error) {
		p, err := planFor(ctx, set)
		if err != nil {
			return census.Certified{}, err
		}
		opts := bounds.Options{Digits: digits, Step: p.step, MaxK: certify.MaxK, MaxMemory: maxMemory, Digests: true}
		res, err := p.bracket(ctx, opts, nil)
		if err == nil {
			err = ctx.Err() // an interrupt ends the bracket early, without an error
		}
		if err != nil {
			return census.Certified{}, err
		}
		if res.Stop != bounds.StopTarget && res.Stop != bounds.StopExact && p.rep.Class != structure.Subexponential {
			return census.Certified{}, fmt.Errorf("%d digits not reached: %s", digits, stopWords(res))
		}
		cert, err := produce.Certificate(ctx, "avoidcert "+version, p.rep, p.sys, res, printDigits(opts))
		if err != nil {
			return census.Certified{}, err
		}
		data, err := certify.Marshal(cert)
		if err != nil {
			return census.Certified{}, err
		}
		// The verdict is on the file's bytes, read back as any reader would.
		checked, err := certify.Read(bytes.NewReader(data))
		if err == nil {
			err = certify.Check(checked, certify.CheckOptions{Expect: set, MaxWork: checkWork, MaxMemory: maxMemory})
		}
		if err != nil {
			return census.Certified{}, fmt.Errorf("the checker refused the certificate: %v", err)
		}
		st := checked.Statement
		return census.Certified{
			Lambda:      outward(st.Lambda),
			Radius:      outward(st.Radius),
			Class:       string(p.rep.Class),
			Form:        classLine(p.rep),
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
