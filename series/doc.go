// Package series reads a numeric data series and counts the ordinal
// patterns of its windows.
//
// A series is one value a line, or one column of a CSV or TSV file chosen by
// its header name or its number. Reader streams it: memory stays bounded
// whatever the length of the file (a line longer than MaxLine is refused),
// and each value keeps the line it came from, for messages. Missing values
// (an empty field, NA, N/A, NaN, null) and fields that are not finite
// numbers are refused with their line, or skipped and counted when the
// caller asks for it.
//
// Count slides windows of each requested length k over the values, with a
// delay t (the window x_i, x_(i+t), ..., x_(i+(k-1)t)), and tallies them
// by pattern: the lexicographic rank of the window's relative order among
// the k! orders (the rank of pattern.Rank, 0 for increasing). It holds only
// the last (k-1)t+1 values, so its memory does not depend on the length of
// the series. Equal values inside a window (ties) have no relative order;
// Count tallies the tied windows and orders equal values by a Ties policy:
// by order of appearance, or by a key drawn from a seeded generator, so a
// run is reproducible from its seed. Refusing ties is the caller's
// decision, from the tally.
//
// Open accepts standard input ("-") and regular files only, through
// internal/input (a folder, FIFO, socket or device is refused at once,
// without waiting on a FIFO); the file is streamed, with memory bounded
// line by line (MaxLine), whatever its size.
//
// Values returned are fresh; the caller owns them.
package series
