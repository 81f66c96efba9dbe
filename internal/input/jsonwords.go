package input

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"regexp"
	"strings"

	"avoidcert/internal/brief"
)

// unknownField is how encoding/json names a member that DisallowUnknownFields
// refuses; the package has no error type for it.
var unknownField = regexp.MustCompile(`^json: unknown field "(.*)"$`)

// JSONProblem says in the tool's own words why encoding/json refused a
// file: where it stops being JSON, which member holds a value of the wrong
// kind, which member the file should not have. The words of the JSON
// package never reach the user.
func JSONProblem(err error) string {
	var syntax *json.SyntaxError
	var kind *json.UnmarshalTypeError
	switch {
	case errors.As(err, &syntax):
		return fmt.Sprintf("not valid JSON at byte %d", syntax.Offset)
	case errors.As(err, &kind):
		where := "a value"
		if kind.Field != "" {
			where = "the member " + brief.Quote(kind.Field)
		}
		return fmt.Sprintf("%s holds %s where %s belongs (byte %d)", where, jsonKind(kind.Value), goKind(kind.Type), kind.Offset)
	case errors.Is(err, io.ErrUnexpectedEOF), errors.Is(err, io.EOF):
		return "the JSON ends before its last value is closed: cut short?"
	}
	if sub := unknownField.FindStringSubmatch(err.Error()); sub != nil {
		return fmt.Sprintf("a member %s that this format does not have", brief.Quote(sub[1]))
	}
	return "not JSON of the form this version reads"
}

// jsonKind names the JSON value encoding/json found ("string", "number",
// "number 1.5", "bool", "array", "object").
func jsonKind(v string) string {
	switch {
	case v == "string":
		return "a string"
	case v == "bool":
		return "true or false"
	case v == "array":
		return "a list"
	case v == "object":
		return "an object"
	case strings.HasPrefix(v, "number"):
		return "a number"
	}
	return "another kind of value"
}

// goKind names, in JSON's terms, what a Go type expects.
func goKind(t reflect.Type) string {
	if t == nil {
		return "another kind of value"
	}
	switch t.Kind() {
	case reflect.String:
		return "a string"
	case reflect.Bool:
		return "true or false"
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return "a whole number"
	case reflect.Float32, reflect.Float64:
		return "a number"
	case reflect.Slice, reflect.Array:
		return "a list"
	case reflect.Struct, reflect.Map:
		return "an object"
	case reflect.Pointer:
		return goKind(t.Elem())
	}
	return "another kind of value"
}
