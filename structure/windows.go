package structure

import "avoidcert/pattern"

// Windows is the window table of a pattern set in cell form, what the
// window digraph and the joint-pattern test need: the cell length m (the
// longest pattern's length minus one), which windows of length m+1 are
// allowed, and which cells (patterns of length m) avoid the shorter
// members. A window (t, x_1..x_m) leads from the cell of
// (t, x_1..x_(m-1)) to the cell of (x_1..x_m).
type Windows struct {
	M       int    // cell length m = w-1
	Allowed []bool // over permutations of 1..m+1, by pattern.Rank
	Start   []bool // over permutations of 1..m, by pattern.Rank
}

// WindowsOf returns the window table of a pattern set: windows of length
// w that avoid it are allowed, and a cell is a start cell when its pattern
// avoids the shorter members.
func WindowsOf(s pattern.Set) Windows {
	w := s.Window()
	return Windows{M: w - 1, Allowed: s.AvoidingPerms(w), Start: s.AvoidingPerms(w - 1)}
}

// Cells returns m!, the number of order cells.
func (s Windows) Cells() int { return pattern.Factorial(s.M) }

// Ends returns the source and target cells of the window with the given
// rank.
func (s Windows) Ends(window int) (from, to int) {
	p := pattern.Unrank(s.M+1, window)
	return pattern.Rank(pattern.Standardize(p[:s.M])), pattern.Rank(pattern.Standardize(p[1:]))
}
