// Package input reads every file the tool is given, and standard input, so
// that no input can hang it, exhaust its memory or crash a parser.
//
// Guarantees of ReadFile:
//   - only a regular file is read: a folder, a FIFO, a socket or a device
//     (also behind a symbolic link) is refused at once, without waiting for
//     a writer on a FIFO (the file is examined before it is opened, and
//     opened without blocking);
//   - at most the Kind's Limit bytes are read: a larger file is refused,
//     and nothing more than Limit+1 bytes is ever held;
//   - the read stops when the context is cancelled, returning ctx.Err().
//
// ReadStream bounds standard input the same way (a pipe is allowed there).
//
// CheckTOML and CheckJSON refuse, in one pass over the bytes and before a
// parsing library sees them, nesting deeper than the documented limits:
// the TOML library's memory grows with the square of nesting depth and of
// the number of parts of a dotted key.
//
// Every refusal is an *Error whose message names the file and what to do,
// in the tool's own words; a missing file's error also matches
// fs.ErrNotExist.
package input
