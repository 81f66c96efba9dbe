// Package bounds turns the exact iterates of package transfer into
// certified brackets for the growth rate lambda of a consecutive-pattern
// set, to a digit or width target within time and memory budgets.
//
// # The bracket
//
// Write g_k = T^k g0 = G_k/k! (method note, sections 2-3). For a step d >= 1
// and every index a of degree k+d on every cell, let D_a be G_k raised d
// degrees (H_0 = G_k, H_{i+1}[a] = sum_t a_t H_i[a-e_t], D_a = H_d[a]) and
// R_a = G_{k+d}[a] / D_a. D_a/(k+d)! and G_{k+d}[a]/(k+d)! are the
// Bernstein coefficients of g_k and of T^d g_k in degree k+d, so with
// lo = min R_a and hi = max R_a over the indices with D_a > 0 (and
// G_{k+d}[a] = 0 wherever D_a = 0; otherwise hi is infinite at this k),
// lo g_k <= T^d g_k <= hi g_k pointwise: the Bernstein basis is nonnegative
// on its cell. T is positive, so lo^j g_k <= T^(dj) g_k <= hi^j g_k.
//
// # What is proved
//
//   - Bracket.Lo and Bracket.Hi are the exact rational extremes of R_a,
//     found by a floating-point screen whose every doubtful call is settled
//     by exact integer cross-multiplication. The screen only decides
//     comparisons whose floating-point error bound cannot change the answer.
//   - lambda^d lies in [Lo, Hi], for lambda = lim (a_n/n!)^(1/n): a_n/n! =
//     <T^(n-m) g0, 1>, so for every r the subsequence n = m+k+r+dj grows
//     between lo^(1/d) and hi^(1/d) per step (using T^r lo g_k <=
//     T^(r+d) g_k); the lower end needs a_{m+k+r} > 0, which holds whenever
//     lo > 0 and a_n > 0 for all n.
//   - Result.Lambda is [max lo_C, max hi_C] over the blocks C (one block for
//     Run), each end taken to the d-th root outward (interval.RootDown,
//     RootUp) and rounded outward to a dyadic rational of Result.Prec bits,
//     about 3.33 (Digits+10) bits for a digit target: rounding only widens.
//     Result.Radius is its outward reciprocal. For RunBlocks the proof of
//     the combination is on RunBlocks; its conditions are checked.
//   - Result.Explicit (Run with Step 1 and a finite bracket): for every
//     n >= n0 = m+k, A MuLo^(n-n0) <= a_n/n! <= A MuHi^(n-n0) with
//     A = a_{n0}/n0!; the proof is on AllN, and AllN.At evaluates both
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
// # Cost
//
// Brackets are taken at k = 4, 6, then where the observed width decay
// predicts the target (at most about twice the last k), so their cost
// stays a small part of counting to the same k; each costs about one or two
// counting steps. Steps consume their input (transfer.Engine.Advance)
// except from the G_k of a planned bracket.
//
// Aliasing: the package only reads transfer iterates; results are fresh
// and owned by the caller. Functions are safe for concurrent use on
// different inputs.
package bounds
