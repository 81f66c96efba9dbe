// Package transfer runs the exact integer form of the transfer operator of
// a consecutive-pattern set.
//
// For a set whose longest pattern has length w = m+1, the operator acts on
// functions on the cube [0,1]^m, split into m! order cells (one per
// permutation sigma of 1..m, indexed by pattern.Rank). On each cell a
// polynomial of degree D is stored by its Bernstein coefficients, indexed
// by compositions a = (a_0..a_m) of D: a_i is the weight of the i-th gap
// between the sorted coordinates.
//
// Iterate k holds G_k = k! T^k g0. Its coefficients are non-negative
// integers with a combinatorial meaning that the tests check by
// enumeration: G_k[sigma][a] is the number of avoiding permutations of
// length m+k whose last m entries have pattern sigma and whose other k
// values fall a_0, ..., a_m into the gaps of those entries. Hence
// a_{m+k} is the sum of all coefficients of G_k.
//
// Guarantees: all arithmetic is exact (fixed-width multi-word integers
// sized from (m+k)!, which bounds every coefficient and partial sum); the
// result does not depend on GOMAXPROCS; an Iterate is not modified after it
// is returned, so it may be read from several goroutines, with one
// exception: Engine.Advance consumes the iterate it is given (and the one it
// recycles), for runs that cannot afford to keep both. Engine methods may be
// called concurrently on different iterates.
package celltransfer
