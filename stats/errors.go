package stats

import (
	"encoding/json"
	"errors"
	"fmt"
)

// Error codes of the JSON error object {"error": "...", "code": "...",
// "field": "..."}. They are stable: scripts and the page branch on them;
// the message is for people and may change.
const (
	CodeBadRequest = "bad-request"   // not JSON, an unknown key, a value of the wrong type
	CodeSchema     = "schema"        // a request schema this engine does not speak
	CodeBadOption  = "bad-option"    // an option out of range or contradicting another
	CodeNoData     = "no-data"       // nothing to analyse
	CodeColumn     = "column"        // a column choice that does not fit the data
	CodeUnused     = "column-unused" // a column the request names but no section uses
	CodeRead       = "read"          // the reader refused the input
	CodeInternal   = "internal"      // a fault of the engine: please report it
	CodeCancelled  = "cancelled"     // the user stopped the work
	CodeNoFile     = "no-file"       // the page asked for a file that is not (or no longer) read
	CodeTooLarge   = "too-large"     // the data are too large for what was asked (a link)

	// A shared analysis (link, .lotlens file or stored copy) that cannot be
	// opened: "share-" and the code of stats/share (the bridge maps them).
	CodeShareEmpty     = "share-empty"     // the link or file holds nothing
	CodeShareTruncated = "share-truncated" // cut short
	CodeShareCorrupt   = "share-corrupt"   // changed or damaged on the way
	CodeShareVersion   = "share-version"   // made by a newer Lotlens
	CodeShareForeign   = "share-foreign"   // not a Lotlens link or file at all
	CodeShareTooLarge  = "share-too-large" // would unpack to more than 64 MB
	CodeShareSettings  = "share-settings"  // it opened, but the engine refuses its settings or columns
)

// Error is an error the engine reports to the user: a stable code, the
// request field it concerns (a JSON path such as "options.confidence", or
// ""), and a message saying what was wrong and what to do.
type Error struct {
	Code  string `json:"code"`
	Field string `json:"field,omitempty"`
	Msg   string `json:"error"`
}

func (e *Error) Error() string { return e.Msg }

// errorf builds an *Error.
func errorf(code, field, format string, args ...any) *Error {
	return &Error{Code: code, Field: field, Msg: fmt.Sprintf(format, args...)}
}

// CodeOf returns the code of err: its own when it is an *Error, else
// CodeInternal.
func CodeOf(err error) string {
	var e *Error
	if errors.As(err, &e) {
		return e.Code
	}
	return CodeInternal
}

// ErrorJSON is the error object every JSON entry point returns:
// {"error": "message", "code": "...", "field": "..."}. An error that is not
// an *Error is reported with code "internal".
func ErrorJSON(err error) []byte {
	var e *Error
	if !errors.As(err, &e) {
		e = &Error{Code: CodeInternal, Msg: err.Error()}
	} else if e.Msg != err.Error() {
		// a wrapped *Error: keep the outer context in the message
		e = &Error{Code: e.Code, Field: e.Field, Msg: err.Error()}
	}
	b, _ := json.Marshal(e)
	return b
}
