package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"strings"
	"testing"

	"avoidcert/internal/settest"
	"avoidcert/prove"
)

// failure picks the exit code from the error's chain, never from its
// wording: budgets are 3 (naming the flag to raise), a certificate the
// checker refused is 4 with the reason, an interrupt is 4.
func TestFailureExitCodes(t *testing.T) {
	ctx := context.Background()
	// a real memory refusal, wrapped as prove returns it
	_, memory := prove.Certify(ctx, settest.Must(t, "1342"), prove.Options{MaxMemory: 1024})
	for _, tc := range []struct {
		name string
		err  error
		code int
		say  string
	}{
		{"usage", usagef("bound: --digits 0 is out of range"), exitUsage, "--digits 0"},
		{"memory budget", memory, exitUndecided, "raise --max-memory"},
		{"max-k budget", fmt.Errorf("x: %w", &prove.BudgetError{Budget: prove.BudgetMaxK, What: "the bracket at n = 9 (k = 6)", Limit: 6}), exitUndecided, "is the last that --max-k 6 allows; raise --max-k"},
		{"checker limits", fmt.Errorf("checking: %w", prove.ErrBudget), exitUndecided, "raise the budget"},
		{"deadline", fmt.Errorf("x: %w", context.DeadlineExceeded), exitUndecided, "raise --timeout"},
		{"interrupt", fmt.Errorf("x: %w", context.Canceled), exitAborted, "interrupted"},
		{"checker refusal", errors.New("prove: the certificate built for 132 did not pass the checker: lambda.lo too high"), exitAborted, "did not pass the checker: lambda.lo too high"},
		// the wording of a budget without the sentinel is not a budget
		{"wording only", errors.New("the memory budget of 1 KiB; stopped before the first bracket"), exitAborted, "memory budget"},
	} {
		var stderr bytes.Buffer
		code := failure(&env{stdout: &bytes.Buffer{}, stderr: &stderr}, tc.err)
		if code != tc.code || !strings.Contains(stderr.String(), tc.say) {
			t.Errorf("%s: exit %d, %q; want exit %d saying %q", tc.name, code, stderr.String(), tc.code, tc.say)
		}
	}
}

// A panic is an internal error: exit 4 with a line asking for a report,
// never the usage code 2 (which is what the Go runtime gives a crash).
func TestGuardedPanic(t *testing.T) {
	var stderr bytes.Buffer
	code := guarded(&stderr, func() int { panic("index out of range [3] with length 3") })
	first, _, _ := strings.Cut(stderr.String(), "\n")
	if code != exitAborted || first != `avoidcert: internal error, please report it with the lines below: "index out of range [3] with length 3"` {
		t.Fatalf("exit %d, %q", code, first)
	}
	if code := guarded(&stderr, func() int { return exitUndecided }); code != exitUndecided {
		t.Fatalf("guarded changed an exit code: %d", code)
	}
}

// cancellable returns at once when the context is cancelled, and passes
// a panic of the work on to the caller (where guarded reports it).
func TestCancellable(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	block := make(chan struct{})
	defer close(block)
	cancel()
	if _, err := cancellable(ctx, func() (int, error) { <-block; return 1, nil }); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled work: %v, want context.Canceled", err)
	}
	if v, err := cancellable(context.Background(), func() (int, error) { return 7, nil }); v != 7 || err != nil {
		t.Fatalf("finished work: %d, %v", v, err)
	}
	var stderr bytes.Buffer
	code := guarded(&stderr, func() int {
		cancellable(context.Background(), func() (int, error) { panic("in the work") })
		return 0
	})
	if code != exitAborted || !strings.Contains(stderr.String(), "internal error") {
		t.Fatalf("a panic in the work: exit %d, %q", code, stderr.String())
	}
}

// Messages lose the prefixes of internal packages, and keep the command's
// name where a command shares a package's name.
func TestOwnWords(t *testing.T) {
	for in, want := range map[string]string{
		"prove: the certificate built for 123 did not pass the checker": "the certificate built for 123 did not pass the checker",
		"claim: --value: interval: cannot read \"x\" as a decimal":      "claim: --value: cannot read \"x\" as a decimal",
		"census: cannot create the census folder x":                     "census: cannot create the census folder x",
		"report: a.json: bounds: stopped before the first bracket":      "report: a.json: stopped before the first bracket",
		"census merge: shard x: census: not a census file":              "census merge: shard x: not a census file",
		"structure: bounds: prove: over the budget":                     "structure: over the budget",
		"lambda.lo: 0.5, but its checked certificate states 0.6":        "lambda.lo: 0.5, but its checked certificate states 0.6",
	} {
		if got := ownWords(in); got != want {
			t.Errorf("ownWords(%q) = %q, want %q", in, got, want)
		}
	}
}
