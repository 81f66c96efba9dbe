// Package census tabulates every symmetry class of single consecutive
// patterns of one length: exact counts, a certified growth rate with a
// certificate the checker accepted, the groups of classes with equal
// counts, and the order of the classes by growth rate.
//
// What it guarantees:
//
//   - Every row's lambda and 1/lambda ranges are those of a certificate
//     that the Certifier reports as accepted by the checker; the file and
//     its SHA-256 are kept beside the tables.
//   - Groups are classes whose counts a_0..a_N agree: candidates for
//     c-Wilf equivalence, evidence and not proof. Classes in different
//     groups are proved inequivalent by the recorded first n where their
//     counts differ, so the number of groups is a proved lower bound on the
//     number of c-Wilf classes of the length.
//   - The order lists adjacent rows (by lambda, largest first) as strictly
//     ordered only when their certified ranges are disjoint.
//   - Run is resumable: each finished class is journalled by atomic
//     writes (certificate first, then its record), so a run killed at any
//     moment loses only the classes in progress, and the next run on the
//     same folder redoes none of the finished ones. The outputs hold no
//     times, host names or paths outside the folder, so a resumed run, a
//     merged set of shards and an uninterrupted run write the same bytes.
//
// The census does not orchestrate the certification itself: it calls a
// Certifier (the library call that certifies a set) and a Counter.
package census
