package input

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

// JSONProblem says what is wrong in our words for every refusal of
// encoding/json a reader of our files meets, and none of its own words.
func TestJSONProblem(t *testing.T) {
	type doc struct {
		N     int      `json:"n"`
		Names []string `json:"names"`
	}
	for _, tc := range []struct{ text, says string }{
		{`{"n": 1,}`, "not valid JSON at byte 9"},
		{`{"n": "3"}`, `the member "n" holds a string where a whole number belongs`},
		{`{"names": {"a": 1}}`, `the member "names" holds an object where a list belongs`},
		{`{"n": 1, "extra": true}`, `a member "extra" that this format does not have`},
		{`{"n": 1`, "the JSON ends before its last value is closed"},
		{`[1]`, "a value holds a list where an object belongs"},
	} {
		dec := json.NewDecoder(bytes.NewReader([]byte(tc.text)))
		dec.DisallowUnknownFields()
		var d doc
		err := dec.Decode(&d)
		if err == nil {
			t.Fatalf("%s: decoded", tc.text)
		}
		got := JSONProblem(err)
		if !strings.Contains(got, tc.says) {
			t.Errorf("%s: %q, want it to say %q", tc.text, got, tc.says)
		}
		for _, foreign := range []string{"json:", "unmarshal", "Go ", "invalid character", "unexpected", "int", "[]string"} {
			if strings.Contains(got, foreign) {
				t.Errorf("%s: %q has the JSON package's word %q", tc.text, got, foreign)
			}
		}
	}
}
