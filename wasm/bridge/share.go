package bridge

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"time"

	"lotlens/stats"
	"lotlens/stats/chart"
	"lotlens/stats/ingest"
	"lotlens/stats/share"
)

// Link sizes, in characters of the payload (the part after "#s="). From
// LinkWarn on, the page warns that mail and chat programs may cut the link
// (common practice: many break or refuse links of some thousands of
// characters); above LinkMax no link is made (Chromium opens no address
// longer than about 2 MB) and the page offers the .lotlens file instead.
const (
	LinkWarn = 8000
	LinkMax  = 2_000_000
)

// linkMax is LinkMax; tests lower it.
var linkMax = LinkMax

// The forms of a payload: a link's text, a .lotlens file, or the bare
// bytes (share.Marshal), which the page encrypts for a stored copy.
const (
	FormLink  = "link"
	FormFile  = "file"
	FormBytes = "bytes"
)

// ShareRequest is what the page sends to make a payload: the engine's
// request as the page would run it (its text for pasted data; with UseTable
// the kept file's or opened payload's bytes instead; the user's reasons for
// excluded rows are its options.excludeReasons), when it is made (unix
// seconds; 0: now) and the data's name.
type ShareRequest struct {
	Request  json.RawMessage `json:"request"`
	UseTable bool            `json:"useTable,omitempty"`
	Created  int64           `json:"created,omitempty"`
	Name     string          `json:"name,omitempty"`
}

// ShareInfo is the answer of Share (beside the bytes, for a file or bytes).
type ShareInfo struct {
	Form string `json:"form"`
	// Link is the payload text for a link (without the page's address).
	Link string `json:"link,omitempty"`
	// Size is the link's characters, or the file's or bytes' length.
	Size int `json:"size"`
	// Long: the link is at least LinkWarn characters.
	Long bool `json:"long,omitempty"`
	// FileName is a name for the .lotlens file (form "file").
	FileName    string `json:"fileName,omitempty"`
	Fingerprint string `json:"fingerprint"`
	Created     int64  `json:"created"`
}

// Shared describes an opened payload for the page's banner and settings.
type Shared struct {
	Form        string `json:"form"`
	Created     int64  `json:"created"`
	Name        string `json:"name"`
	Fingerprint string `json:"fingerprint"`
	Bytes       int    `json:"bytes"`
	Value       string `json:"value,omitempty"`
	Order       string `json:"order,omitempty"`
	Subgroup    string `json:"subgroup,omitempty"`
	Group       string `json:"group,omitempty"`
	// Options are the payload's settings, the reasons for left-out rows
	// (excludeReasons) included.
	Options share.Options `json:"options"`
}

// Share makes a payload of the current analysis in the given form. A
// payload carries everything or is not made: the request must be one the
// engine accepts as it stands (the same checks as an analysis: every
// reason must name a left-out row), and a link above LinkMax is refused (code
// too-large) so the page offers the file. It returns ShareInfo JSON or an
// error object, and for the forms "file" and "bytes" the bytes.
func (s *Session) Share(in []byte, form string) (out []byte, bin []byte) {
	defer func() {
		if r := recover(); r != nil {
			out, bin = ErrorJSON(internal("making the shared analysis", r)), nil
		}
	}()
	if form != FormLink && form != FormFile && form != FormBytes {
		return ErrorJSON(&stats.Error{Code: stats.CodeBadRequest, Msg: fmt.Sprintf("unknown form %q: link, file or bytes", form)}), nil
	}
	var sr ShareRequest
	dec := json.NewDecoder(bytes.NewReader(in))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&sr); err != nil {
		return ErrorJSON(&stats.Error{Code: stats.CodeBadRequest, Msg: "No link was made: the share request is not valid JSON of the expected shape (" + err.Error() + ")."}), nil
	}
	req, err := stats.ParseRequest(sr.Request)
	if err != nil {
		return ErrorJSON(noLink(err)), nil
	}
	if len(req.Cells) > 0 {
		return ErrorJSON(&stats.Error{Code: stats.CodeBadRequest, Field: "cells", Msg: "No link was made: a request of cells cannot be shared; paste the values as text instead."}), nil
	}
	var text, fp, name string
	if sr.UseTable {
		if s.tab == nil {
			return ErrorJSON(&stats.Error{Code: stats.CodeNoFile, Msg: "No link was made: no file is loaded; drop or pick the file again."}), nil
		}
		if s.rawOver {
			return ErrorJSON(&stats.Error{Code: stats.CodeTooLarge, Msg: fmt.Sprintf("No link was made: the file is larger than the %d MB a shared analysis holds. Send the file itself, with this report's fingerprint so the receiver can check it.", ShareBytesMax>>20)}), nil
		}
		text, fp, name = s.raw, s.fp, s.srcName
	} else {
		if strings.TrimSpace(req.Text) == "" {
			return ErrorJSON(&stats.Error{Code: stats.CodeNoData, Msg: "No link was made: there is no data; paste or open the measurements first."}), nil
		}
		text = req.Text
	}
	if sr.Name != "" {
		name = sr.Name
	}
	// The engine must accept the request as it stands: a link never drops
	// a setting the engine would refuse.
	var rep *stats.Report
	if sr.UseTable {
		rep, err = s.engine(req, s.tab, fp)
	} else {
		rep, err = s.engine(req, nil, "")
	}
	if err != nil {
		return ErrorJSON(noLink(err)), nil
	}
	var opts share.Options
	ob, _ := json.Marshal(req.Options)
	if err := json.Unmarshal(ob, &opts); err != nil {
		return ErrorJSON(internal("copying the settings", err)), nil
	}
	created := sr.Created
	if created == 0 {
		created = time.Now().Unix()
	}
	p := share.Payload{Created: created, Name: name, Text: text, Value: req.Value, Order: req.Order,
		Subgroup: req.Subgroup, Group: req.Group, Options: opts}
	info := ShareInfo{Form: form, Fingerprint: rep.Input.Fingerprint, Created: created}
	switch form {
	case FormLink:
		l, err := share.Encode(p)
		if err != nil {
			return ErrorJSON(shareMakeError(err)), nil
		}
		if len(l) > linkMax {
			return ErrorJSON(&stats.Error{Code: stats.CodeTooLarge, Msg: fmt.Sprintf("No link was made: it would hold %d characters, more than a browser opens (about %d). Save the analysis as a %s file instead and send the file.", len(l), linkMax, share.FileExt)}), nil
		}
		info.Link, info.Size, info.Long = l, len(l), len(l) >= LinkWarn
	case FormFile:
		bin, err = share.EncodeFile(p)
		if err != nil {
			return ErrorJSON(shareMakeError(err)), nil
		}
		info.Size, info.FileName = len(bin), fileName(name)
	case FormBytes:
		bin, err = share.Marshal(p)
		if err != nil {
			return ErrorJSON(shareMakeError(err)), nil
		}
		info.Size = len(bin)
	}
	return mustJSON(info), bin
}

// noLink prefixes an engine error with "No link was made", keeping its code
// and field.
func noLink(err error) *stats.Error {
	var e *stats.Error
	if !errors.As(err, &e) {
		e = &stats.Error{Code: stats.CodeInternal, Msg: err.Error()}
	}
	return &stats.Error{Code: e.Code, Field: e.Field, Msg: "No link was made, because the settings are not accepted: " + e.Msg}
}

// shareMakeError is an error of share.Encode and its variants as the
// engine's error object (share's codes become the bridge's "share-" codes).
func shareMakeError(err error) *stats.Error {
	var e *share.Error
	if errors.As(err, &e) {
		code := stats.CodeTooLarge
		if e.Code == share.CodeEmpty {
			code = stats.CodeNoData
		}
		return &stats.Error{Code: code, Msg: "No link was made: " + e.Msg}
	}
	return &stats.Error{Code: stats.CodeInternal, Msg: err.Error()}
}

// fileName is the name of a .lotlens file for data called name.
func fileName(name string) string {
	base := name
	if i := strings.LastIndexAny(base, "/\\"); i >= 0 {
		base = base[i+1:]
	}
	if i := strings.LastIndexByte(base, '.'); i > 0 {
		base = base[:i]
	}
	base = strings.Map(func(r rune) rune {
		if r < ' ' || strings.ContainsRune(`<>:"/\|?*`, r) {
			return '_'
		}
		return r
	}, base)
	if strings.TrimSpace(base) == "" {
		base = "shared-analysis"
	}
	return base + share.FileExt
}

// openError maps a share error to the engine's error object. Share's
// messages already say what is wrong and what to ask the sender for; a
// stored copy is named as such.
func openError(err error, form string) *stats.Error {
	var e *share.Error
	if !errors.As(err, &e) {
		return &stats.Error{Code: stats.CodeInternal, Msg: err.Error()}
	}
	msg := e.Msg
	if form == FormBytes {
		msg = strings.ReplaceAll(msg, "This file", "This stored copy")
		msg = strings.ReplaceAll(msg, "this file", "this stored copy")
		msg = strings.ReplaceAll(msg, "whole file", "whole link")
		msg = strings.ReplaceAll(msg, "Lotlens file", "Lotlens link")
	}
	return &stats.Error{Code: "share-" + string(e.Code), Msg: msg}
}

// Open reads a shared payload (form "link": the text after "#s=", white
// space anywhere is ignored; "file": a .lotlens file's bytes; "bytes": the
// decrypted bytes of a stored copy) and analyses it with its own columns and
// settings. The session keeps its table and bytes, as for a dropped file, so
// a change of settings re-runs only the analysis and the report can be
// shared again. It returns the report JSON (or an error object with a
// "share-" code), the Shared JSON (nil on error) and the charts.
func (s *Session) Open(in []byte, form string) (rep []byte, meta []byte, svg map[string]string) {
	defer func() {
		if r := recover(); r != nil {
			rep, meta, svg = ErrorJSON(internal("opening the shared analysis", r)), nil, nil
		}
	}()
	var p share.Payload
	var err error
	switch form {
	case FormLink:
		p, err = share.Decode(stripSpace(in))
	case FormFile:
		p, err = share.DecodeFile(in)
	case FormBytes:
		p, err = share.Unmarshal(in)
	default:
		return ErrorJSON(&stats.Error{Code: stats.CodeBadRequest, Msg: fmt.Sprintf("unknown form %q: link, file or bytes", form)}), nil, nil
	}
	if err != nil {
		return ErrorJSON(openError(err, form)), nil, nil
	}
	s.Cancel()
	s.Forget()
	// The same reader call as stats.Analyze on pasted text; a file's bytes
	// read whole give the table of the sender's chunked read.
	tab, err := ingest.ReadWith(p.Text, ingest.ReadOptions{})
	if err != nil {
		return ErrorJSON(&stats.Error{Code: stats.CodeShareSettings, Msg: "The shared data could not be read (" + err.Error() + "): ask the sender to send the data file itself."}), nil, nil
	}
	var o stats.Options
	ob, _ := json.Marshal(p.Options)
	if err := json.Unmarshal(ob, &o); err != nil {
		return ErrorJSON(internal("copying the settings", err)), nil, nil
	}
	req := stats.Request{Schema: stats.RequestSchema, Value: p.Value, Order: p.Order, Subgroup: p.Subgroup, Group: p.Group, Options: o}
	fp := p.Fingerprint()
	r, err := s.engine(req, tab, fp)
	if err != nil {
		var e *stats.Error
		msg := err.Error()
		if errors.As(err, &e) && e.Code == stats.CodeInternal {
			return ErrorJSON(err), nil, nil
		}
		return ErrorJSON(&stats.Error{Code: stats.CodeShareSettings, Msg: "The shared analysis opened, but this page does not accept its settings: " + msg + " Ask the sender to make the link again with the current Lotlens page."}), nil, nil
	}
	s.tab, s.fp, s.raw, s.rawOver, s.srcName = tab, fp, p.Text, false, p.Name
	sh := Shared{Form: form, Created: p.Created, Name: p.Name, Fingerprint: fp, Bytes: len(p.Text),
		Value: p.Value, Order: p.Order, Subgroup: p.Subgroup, Group: p.Group, Options: p.Options}
	return stats.ReportJSON(r, nil), mustJSON(sh), chart.All(r)
}

// stripSpace drops every ASCII white-space byte (mail programs wrap long
// links) and returns the rest as a string.
func stripSpace(b []byte) string {
	if bytes.IndexAny(b, " \t\r\n\f\v") < 0 {
		return string(b)
	}
	out := make([]byte, 0, len(b))
	for _, c := range b {
		switch c {
		case ' ', '\t', '\r', '\n', '\f', '\v':
		default:
			out = append(out, c)
		}
	}
	return string(out)
}
