// Package census tabulates every symmetry class of single consecutive
// patterns of one length: exact counts, a certified growth rate with a
// certificate the checker accepted, the groups of classes with equal
// counts, and the order of the classes by growth rate.
//
// One rule binds this package as every command: everything it states as
// certified or proved is derived from certificates the independent
// checker accepted in this run, never from a table, a journal, a shard
// or a gate's output, which are untrusted input like any other file.
//
// What it guarantees:
//
//   - Every row's lambda and 1/lambda ranges, structure class and
//     asymptotic form are read from a certificate accepted by the checker
//     for exactly the row's class (the Certifier's, or a Checker's when the
//     row comes from a file); the file and its SHA-256 are kept beside the
//     tables.
//   - Verify, and Merge for each shard, trust nothing a census file says:
//     each row's certificate is read inside the folder, must match the
//     row's SHA-256 and be accepted by the Checker for the row's class;
//     every certified field of the row must equal what that certificate
//     states, every count what the checker's own counting gives
//     (certify.Counts); the row order, count groups and order statements
//     are derived again from the verified rows and must equal the file's.
//     A difference is a *RefusedError naming the row and the field.
//   - A journal is untrusted: a resumed Run re-checks the certificate of
//     every journalled class the same way and does a class again whose
//     record its certificate does not support.
//   - Paths inside a census folder stay inside it: no "..", no absolute
//     path, no symbolic link leading out (reads and writes go through
//     os.Root), for census.json, journal records and certificates.
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
// Certifier (the library call that certifies a set), a Counter and a
// Checker (CheckerOf gives the commands' one, through prove.CheckBytes).
package census
