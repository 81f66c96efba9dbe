// Package bounds turns the exact prefix-state iterates of package transfer
// into certified brackets for the growth rate lambda of a
// consecutive-pattern set, to a digit or width target within time and
// memory budgets.
//
// # The bracket
//
// For a system of prefix states (docs/prefix-states.md), a step d >= 1 and
// an n at or above the system's start and its longest state: at every
// state p of the system and every composition a of n+d-|p|, let H be
// G_n[p] raised d degrees (H_0 = G_n[p], H_(i+1)[a] = sum_t a_t H_i[a-e_t])
// and R = G_(n+d)[p][a] / H. H/(n+d-|p|)! and G_(n+d)[p][a]/(n+d-|p|)! are
// the Bernstein coefficients of g and of T'^d g in degree n+d-|p| on the
// cell of p, g being the density of G_n (method note, section 8). With
// lo = min R and hi = max R over the indices with H > 0 (and
// G_(n+d)[p][a] = 0 wherever H = 0; otherwise hi is infinite at this n),
// lo g <= T'^d g <= hi g pointwise, since the Bernstein basis is
// nonnegative on its cell, and T' is positive.
//
// # What is proved
//
//   - Bracket.Lo and Bracket.Hi are the exact rational extremes of R,
//     found by a floating-point screen whose every doubtful call is settled
//     by exact integer cross-multiplication.
//   - Run (the whole system, started from the empty state): lambda^d lies
//     in [Lo, Hi]. The mass of T'^j g_n is a_(n+j)/(n+j)!, so the
//     subsequences n + dj grow between lo^(1/d) and hi^(1/d) per step.
//   - RunBlocks (blocks: the strongly connected components of the state
//     digraph, Blocks): every block C is iterated alone with start ones,
//     which proves lambda(T'_C)^d <= hi_C; since the blocks partition the
//     states and moves between blocks form no cycle (checked), T' is
//     block-triangular and lambda <= max hi_C^(1/d). Every block with a
//     move inside it is also iterated with start whole (the whole
//     iterate at n_s on C), which proves lo_C <= lambda^d because that
//     start is at most the whole iterate and T' >= T'_C on nonnegative
//     functions. Bracket.Upper and Bracket.Lower say which end of a
//     bracket is used.
//   - Result.Lambda is [max lo, max hi] over the brackets whose ends prove
//     something, each end taken to the d-th root outward (interval.RootDown,
//     RootUp) and rounded outward to a dyadic rational of Result.Prec bits.
//     Result.Radius is its outward reciprocal.
//   - Result.Explicit (Run with Step 1 and a finite bracket): for every
//     n >= n0 = N, A MuLo^(n-n0) <= a_n/n! <= A MuHi^(n-n0) with
//     A = a_(n0)/n0!; the proof is on AllN, and AllN.At evaluates both
//     sides outward.
//   - Judge's Proved and Refuted rest on the same certified enclosure.
//
// # What is an estimate
//
// Result.Estimates (the width decay rate, an estimate of |lambda_2|/lambda,
// and c in a_n ~ c lambda^n n!) are floating-point figures for
// orientation, labelled "estimate, not certified" wherever they are shown.
// The schedule (where to take brackets, when a budget will run out) uses
// estimates too, but they only decide how much work is done, never what is
// claimed.
//
// # Cost and budgets
//
// Brackets are taken 4 steps above the first possible n, then where the
// observed width decay predicts the target (at most about twice the
// distance so far), so their cost stays a small part of counting to the
// same n. Options.MaxN caps n; Options.MaxMemory is compared with
// transfer.Engine.Footprint and this package's workspace before every
// step; a context deadline stops the run in time to keep a bracket.
//
// Aliasing: the package only reads transfer iterates; results are fresh
// and owned by the caller. Functions are safe for concurrent use on
// different inputs.
package bounds
