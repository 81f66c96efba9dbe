package certify

import (
	"context"
	"fmt"
	"strings"
	"testing"
)

// TestCompareRefusesPositiveOverZero drives the refusal of a finite hi
// where G_(N+d) is positive and the elevated G_N is 0. No certificate
// reaches it (see compare), so the elevated iterate of a real bracket of
// {123} is zeroed at one coefficient where G_(N+1) is positive.
func TestCompareRefusesPositiveOverZero(t *testing.T) {
	ctx := context.Background()
	given := []string{"123"}
	b, _ := MakeBracket(given, nil, StartEmpty, 1, 5, true)
	set, _ := parseSet(given)
	ck := &checker{c: &Certificate{Evidence: Evidence{Brackets: []Bracket{b}}}, sp: newStateSpace(set)}
	sys, g := iterateTo(given, nil, StartEmpty, 5)
	h, err := sys.elevated(ctx, g, 1)
	if err != nil {
		t.Fatal(err)
	}
	n, err := sys.next(ctx, g)
	if err != nil {
		t.Fatal(err)
	}
	if err := ck.compare(ctx, 0, h, n); err != nil {
		t.Fatalf("the real bracket: %v", err)
	}
	// state 2 = (12), composition (0, 0, 4): the last two values are the
	// two least, 4 values above them, which some avoider of length 6 has
	// (for example 563412)
	r := sys.bin.rank([]int{0, 0, 4})
	if toBig(n.tables[2].at(r)).Sign() <= 0 {
		t.Fatal("G_6 is 0 at the chosen coefficient")
	}
	clear(h.tables[2].at(r))
	err = ck.compare(ctx, 0, h, n)
	if err == nil || !strings.Contains(err.Error(), "G_6 is positive where the elevated G_5 is 0 (state 2, index [0 0 4]), so hi must be infinite") {
		t.Fatalf("got %v", err)
	}
}

// A panic in one of eachState's workers is raised again on the caller's
// goroutine (where a command's recovery turns it into an internal error),
// not left to end the process from the worker.
func TestEachStateRaisesWorkerPanicOnCaller(t *testing.T) {
	defer func() {
		r := recover()
		if r == nil || !strings.Contains(fmt.Sprint(r), "state 3 is broken (in a worker of the checker)") {
			t.Fatalf("recovered %v, want the worker's panic", r)
		}
	}()
	_ = eachState(context.Background(), 2, 10, func(_, i int) error {
		if i == 3 {
			panic("state 3 is broken")
		}
		return nil
	})
	t.Fatal("eachState returned after a worker panicked")
}
