package certify

import "strings"

// PatternTokens splits pattern arguments as a user typed them (each one
// pattern, "1342" or "1.3.4.2", or a comma list such as "123,321") into
// one token per pattern, with the spaces around each token removed. It is
// the one splitting of CheckOptions.Expect and Counts, and the tokens are
// what a producer writes as a certificate's patterns_given.
func PatternTokens(args []string) []string {
	var tokens []string
	for _, arg := range args {
		for _, tok := range strings.Split(arg, ",") {
			tokens = append(tokens, strings.TrimSpace(tok))
		}
	}
	return tokens
}

// ParsePatterns reads pattern arguments as a user typed them with the
// checker's own parser and returns the irredundant set they name, in the
// spelling of a certificate's patterns. Its error names the first token
// the checker cannot read: callers use it to refuse an expected set
// before any check.
func ParsePatterns(args []string) ([]string, error) {
	set, err := parseSet(PatternTokens(args))
	if err != nil {
		return nil, err
	}
	return set.strings(), nil
}
