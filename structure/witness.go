package structure

import "avoidcert/pattern"

// Witnesses gives, for a primitive set with exponent e, one witness per
// joint pattern r of the domain: an avoiding permutation of length m+e
// whose first m and last m entries have joint pattern r (see Joint).
// Witnesses are rebuilt on demand from one recorded predecessor per joint
// pattern and step, in O((m+e)^2) each; they are deterministic. Methods
// are safe for concurrent use.
type Witnesses struct{ run *jointRun }

// Length returns m+e, the length of every witness.
func (w *Witnesses) Length() int { return w.run.exponent + w.run.js.m }

// Count returns the number of joint patterns with a witness: those whose
// two halves are start cells (all of S_2m when every pattern of the set
// has the longest length).
func (w *Witnesses) Count() int { return w.run.js.domain.count() }

// Of returns the witness of the joint pattern with the given rank (over
// the permutations of 1..2m), or nil when the pattern is outside the
// domain.
func (w *Witnesses) Of(joint int) pattern.Perm {
	js, run := w.run.js, w.run
	if joint < 0 || joint >= js.size || !js.domain.has(joint) {
		return nil
	}
	m := js.m
	gaps := make([]int, run.exponent-m)
	r := joint
	for i := len(gaps) - 1; i >= 0; i-- {
		p := run.pred[i][r]
		gaps[i] = int(p % 16)
		r = int(p / 16)
	}
	first, digits := make([]int, js.n), make([]int, js.n)
	js.unrank(r, first, digits)
	return realise(m, first, gaps)
}

// Each calls f with every joint pattern rank of the domain, in increasing
// order, and its witness, until f returns false.
func (w *Witnesses) Each(f func(joint int, witness pattern.Perm) bool) {
	for r := range w.run.js.size {
		if p := w.Of(r); p != nil && !f(r, p) {
			return
		}
	}
}
