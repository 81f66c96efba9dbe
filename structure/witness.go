package structure

import "avoidcert/pattern"

// Witnesses gives, for a primitive set with exponent e, one realisation
// per configuration of D: a permutation x t_1 .. t_e that avoids the set,
// whose first |s| entries x have the pattern of the start state s, whose
// state after each of its e moves is recurrent, and whose start values and
// current values (the last |c| entries, in state c) have the joint order
// of the configuration. Realisations are rebuilt on demand from one link
// per configuration and step; they are deterministic. A Witnesses is not
// safe for concurrent use.
type Witnesses struct{ run *jointRun }

// Witness is the realisation of one configuration.
type Witness struct {
	// Configuration is the joint order, written as the start values in
	// position order, a bar, and the current values ("13|2").
	Configuration string
	// Start and Current are the states s and c (state numbers).
	Start, Current int
	// Permutation has length |s| + e.
	Permutation pattern.Perm
}

// Count returns |D|, the number of witnesses.
func (w *Witnesses) Count() int { return w.run.sp.domain.count() }

// Each calls f with the witness of every configuration of D, in the
// order of the configurations (start state, current state, interleaving),
// until f returns false.
func (w *Witnesses) Each(f func(Witness) bool) {
	ru, sp := w.run, w.run.sp
	e := ru.exponent
	stop := false
	each(sp.domain, func(r int) {
		if stop {
			return
		}
		b := sp.block(r)
		stop = !f(Witness{Configuration: sp.describe(r), Start: b.s, Current: b.c, Permutation: ru.realise(e, r)})
	})
}
