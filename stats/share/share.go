package share

import (
	"bytes"
	"encoding/base64"
	"encoding/binary"
	"encoding/hex"
	"fmt"
	"hash/crc32"
	"io"
	"strings"
	"sync"

	"compress/flate"

	"lotlens/stats/digest"
)

// Version is the format version this package writes, and the newest it reads.
const Version = 1

// MaxDecoded is the largest decoded size accepted: the inflated body and the
// data text each. It protects the receiver against a small link that would
// unpack to gigabytes (a decompression bomb). Encode refuses larger data.
const MaxDecoded = 64 << 20

// LinkPrefix is how every payload string starts: the base64url form of the
// three magic bytes.
const LinkPrefix = "Lotl"

// FileExt is the file extension of the payload as a file.
const FileExt = ".lotlens"

// FileHeader is the text line a payload file starts with (FileHeaderPrefix
// is what a reader checks; the rest of the line is for people).
const (
	FileHeaderPrefix = "Lotlens shared analysis"
	FileHeader       = FileHeaderPrefix + ", format 1: open this file in the Lotlens page\n"
)

var magic = [3]byte{0x2E, 0x8B, 0x65} // base64url "Lotl"

const (
	headerLen  = 16 // magic 3, version 1, body length 4, inflated length 4, header CRC 4
	trailerLen = 4  // CRC-32C of everything before it
)

// castagnoli is made on first use: the engine starts without it (start-up time
// counts on the page; most sessions make no link).
var castagnoli = sync.OnceValue(func() *crc32.Table { return crc32.MakeTable(crc32.Castagnoli) })

var b64 = base64.RawURLEncoding.Strict()

// Payload is one shared analysis: the data exactly as read, the column
// choices, the settings and the user's exclusions with their reasons.
type Payload struct {
	// Created is when the sender made the payload (unix seconds, from the caller).
	Created int64
	// Name is the file name the data came from ("" for pasted text).
	Name string
	// Text is the input exactly as the engine read it: the pasted text, or a
	// file's bytes (any encoding: the reader detects it). Its SHA-256 is the
	// report's fingerprint, and the payload gives back these very bytes.
	Text string
	// Column choices, as in the engine's request ("" for the default or none).
	Value, Order, Subgroup, Group string
	// Options are the request's settings, the user's reasons for the rows
	// left out (Options.ExcludeReasons) included.
	Options Options
}

// Options mirror the engine's request options (stats.Options) field for
// field with the same JSON names, so the bridge can copy them or pass them
// through JSON. This package does not import stats, so that stats may import
// it; a test in this package fails when stats gains an option not carried here.
type Options struct {
	Unit         string   `json:"unit,omitempty"`
	Target       *float64 `json:"target,omitempty"`
	LSL          *float64 `json:"lsl,omitempty"`
	USL          *float64 `json:"usl,omitempty"`
	Confidence   float64  `json:"confidence,omitempty"`
	Quantile     string   `json:"quantile,omitempty"`
	PopulationSD bool     `json:"populationSD,omitempty"`
	Exclude      []int    `json:"exclude,omitempty"`
	// ExcludeReasons travels in the body's reasons section (row -> text).
	ExcludeReasons map[int]string `json:"excludeReasons,omitempty"`
	DecimalMark    string         `json:"decimalMark,omitempty"`
	WithinSigma    string         `json:"withinSigma,omitempty"`
	Coverage       float64        `json:"coverage,omitempty"`
	CpkGoal        float64        `json:"cpkGoal,omitempty"`
	// Over time: baseline rows, check switches, EWMA and CUSUM parameters,
	// the spread chart.
	Baseline    string          `json:"baseline,omitempty"`
	Signals     map[string]bool `json:"signals,omitempty"`
	EWMALambda  float64         `json:"ewmaLambda,omitempty"`
	EWMAL       float64         `json:"ewmaL,omitempty"`
	CUSUMK      float64         `json:"cusumK,omitempty"`
	CUSUMH      float64         `json:"cusumH,omitempty"`
	ChartSpread string          `json:"chartSpread,omitempty"`
}

// Fingerprint is the hex SHA-256 of Text: the fingerprint the engine reports
// for this input.
func (p Payload) Fingerprint() string {
	h := digest.SumString(p.Text)
	return hex.EncodeToString(h[:])
}

// Code says what kind of problem a payload has.
type Code string

// The error codes. Each Error's message says what is wrong and what to ask
// the sender for.
const (
	CodeEmpty     Code = "empty"     // nothing given, or no data in what is to be encoded
	CodeTruncated Code = "truncated" // cut short
	CodeCorrupt   Code = "corrupt"   // changed or damaged (checksum or structure)
	CodeVersion   Code = "version"   // made by a newer version of the format
	CodeForeign   Code = "foreign"   // not a Lotlens payload at all
	CodeTooLarge  Code = "too-large" // would decode to more than MaxDecoded
)

// Error is the error of Encode, Decode and their variants.
type Error struct {
	Code Code
	Msg  string
}

func (e *Error) Error() string { return e.Msg }

// what names the carrier in messages: "link" or "file".
func errOf(code Code, what string, detail string) *Error {
	var m string
	switch code {
	case CodeEmpty:
		m = "This " + what + " holds no data: ask the sender to copy the whole " + what + " again."
	case CodeTruncated:
		m = "This " + what + " is cut short" + detail + ": ask the sender to send it again in full"
		if what == "link" {
			m += ", or to send it as a " + FileExt + " file (long links are often cut by mail and chat programs)."
		} else {
			m += "."
		}
	case CodeCorrupt:
		m = "This " + what + " was changed or damaged on the way" + detail + ", so it is not opened: ask the sender to send it again"
		if what == "link" {
			m += ", or to send it as a " + FileExt + " file."
		} else {
			m += "."
		}
	case CodeVersion:
		m = "This " + what + " was made by a newer version of Lotlens" + detail + ": reload the page to get the newest version, or ask the sender for the data file itself."
	case CodeForeign:
		m = "This is not a Lotlens " + what + detail + ": check that the whole " + what + " was copied, or ask the sender for the Lotlens " + what + " again."
	case CodeTooLarge:
		m = "This " + what + " would unpack to more than 64 MB" + detail + ", more than this page opens: ask the sender for a smaller extract of the data."
	}
	return &Error{Code: code, Msg: m}
}

// Marshal gives the payload as binary bytes (the frame described in the
// package comment): what a link carries before base64url and what a file
// carries after its header line. An encrypted stored link would encrypt
// these bytes.
func Marshal(p Payload) ([]byte, error) {
	if len(p.Text) == 0 {
		return nil, &Error{CodeEmpty, "There is no data to share: paste or open the measurements first."}
	}
	if len(p.Text) > MaxDecoded {
		return nil, &Error{CodeTooLarge, fmt.Sprintf("The data are %d MB, more than the 64 MB a shared analysis can hold: share a smaller extract.", len(p.Text)>>20)}
	}
	body, zbody, _ := build(p)
	if len(body) > MaxDecoded {
		return nil, &Error{CodeTooLarge, "The shared analysis would be larger than 64 MB: share a smaller extract."}
	}
	z := bytes.NewBuffer(make([]byte, headerLen, headerLen+len(zbody)+trailerLen))
	z.Write(zbody)
	out := z.Bytes()
	copy(out, magic[:])
	out[3] = Version
	binary.BigEndian.PutUint32(out[4:], uint32(len(out)-headerLen))
	binary.BigEndian.PutUint32(out[8:], uint32(len(body)))
	binary.BigEndian.PutUint32(out[12:], crc32.Checksum(out[:12], castagnoli()))
	out = binary.BigEndian.AppendUint32(out, crc32.Checksum(out, castagnoli()))
	return out, nil
}

// Unmarshal reads the binary frame made by Marshal.
func Unmarshal(b []byte) (Payload, error) { return unmarshal(b, "file") }

// Encode gives the payload as a base64url string (no padding) for the
// fragment of a link. It starts with LinkPrefix.
func Encode(p Payload) (string, error) {
	b, err := Marshal(p)
	if err != nil {
		return "", err
	}
	return b64.EncodeToString(b), nil
}

// Decode reads a string made by Encode. The string must be exact: callers
// strip the link's address part and any white space a mail program added.
// Every damaged, cut or foreign string is refused with an *Error; a payload is
// returned only when its checksums match and its text gives back the
// SHA-256 it was sent with.
func Decode(s string) (Payload, error) {
	const what = "link"
	if s == "" {
		return Payload{}, errOf(CodeEmpty, what, "")
	}
	if k := min(len(s), len(LinkPrefix)); s[:k] != LinkPrefix[:k] {
		if len(s) >= 24 && damagedMagic(LinkPrefix+s[4:24]) {
			return Payload{}, errOf(CodeCorrupt, what, " (its first characters are changed)")
		}
		return Payload{}, errOf(CodeForeign, what, " (it does not start with \""+LinkPrefix+"\")")
	}
	if len(s) < len(LinkPrefix) {
		return Payload{}, errOf(CodeTruncated, what, "")
	}
	// Only the 64 characters of base64url (the decoder would skip line breaks).
	for i := 0; i < len(s); i++ {
		if !isB64(s[i]) {
			return Payload{}, errOf(CodeCorrupt, what, " (it holds a character a link never has)")
		}
	}
	// Decode the complete groups of four characters strictly; a last
	// partial group may be the cut end of a longer link.
	full := len(s) - len(s)%4
	b := make([]byte, b64.DecodedLen(len(s)))
	n, err := base64.RawURLEncoding.Decode(b, []byte(s[:full]))
	if err != nil {
		return Payload{}, errOf(CodeCorrupt, what, " (it holds a character a link never has)")
	}
	ragged := false
	if r := s[full:]; len(r) > 0 {
		if len(r) == 1 {
			ragged = true
		} else {
			m, err := b64.Decode(b[n:], []byte(r))
			if err != nil {
				ragged = true
				m, _ = base64.RawURLEncoding.Decode(b[n:], []byte(r))
			}
			n += m
		}
	}
	b = b[:n]
	if len(b) >= headerLen && checkHeader(b) {
		total := headerLen + int(binary.BigEndian.Uint32(b[4:])) + trailerLen
		if len(b) == total && (ragged || b64.EncodedLen(total) != len(s)) {
			return Payload{}, errOf(CodeCorrupt, what, " (its last characters are changed)")
		}
	}
	return unmarshal(b, what)
}

func isB64(c byte) bool {
	return c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '-' || c == '_'
}

// damagedMagic reports whether the first 24 characters of a string whose
// first four were replaced by LinkPrefix hold a valid header: a Lotlens link
// whose start was changed, not a foreign one.
func damagedMagic(s string) bool {
	var b [18]byte
	n, err := base64.RawURLEncoding.Decode(b[:], []byte(s))
	return err == nil && n >= headerLen && checkHeader(b[:])
}

func checkHeader(b []byte) bool {
	return [3]byte(b[:3]) == magic && binary.BigEndian.Uint32(b[12:]) == crc32.Checksum(b[:12], castagnoli())
}

// EncodeFile gives the payload as the contents of a file (FileExt): the
// FileHeader line, then the binary frame.
func EncodeFile(p Payload) ([]byte, error) {
	b, err := Marshal(p)
	if err != nil {
		return nil, err
	}
	return append([]byte(FileHeader), b...), nil
}

// DecodeFile reads a file made by EncodeFile. A file holding a link's
// payload string (starting with LinkPrefix) is read too.
func DecodeFile(b []byte) (Payload, error) {
	const what = "file"
	if len(b) == 0 {
		return Payload{}, errOf(CodeEmpty, what, "")
	}
	if k := min(len(b), len(FileHeaderPrefix)); string(b[:k]) != FileHeaderPrefix[:k] {
		if t := strings.TrimSpace(string(b[:min(len(b), 64)])); strings.HasPrefix(t, LinkPrefix) {
			return Decode(strings.TrimSpace(string(b)))
		}
		// A file whose first words were changed but whose frame is whole.
		if n := len(FileHeader); len(b) >= n+headerLen && b[n-1] == '\n' && checkHeader(b[n:]) {
			return Payload{}, errOf(CodeCorrupt, what, " (its first line is changed)")
		}
		return Payload{}, errOf(CodeForeign, what, " (it does not start with \""+FileHeaderPrefix+"\")")
	}
	if len(b) < len(FileHeader) && string(b) == FileHeader[:len(b)] {
		return Payload{}, errOf(CodeTruncated, what, "")
	}
	i := bytes.IndexByte(b[:min(len(b), 256)], '\n')
	if i < 0 {
		return Payload{}, errOf(CodeCorrupt, what, " (its first line is changed)")
	}
	v, ok := fileVersion(string(b[:i+1]))
	if !ok {
		return Payload{}, errOf(CodeCorrupt, what, " (its first line is changed)")
	}
	p, err := unmarshal(b[i+1:], what)
	if err != nil {
		return Payload{}, err
	}
	if v != Version {
		return Payload{}, errOf(CodeCorrupt, what, " (its first line is changed)")
	}
	return p, nil
}

// fileVersion reads N from a header line of the form of FileHeader
// ("..., format N: ...\n").
func fileVersion(line string) (int, bool) {
	head, tail, ok := strings.Cut(FileHeader, "1")
	if !ok || !strings.HasPrefix(line, head) || !strings.HasSuffix(line, tail) || len(line) < len(head)+len(tail)+1 {
		return 0, false
	}
	d := line[len(head) : len(line)-len(tail)]
	if len(d) > 3 || d[0] == '0' {
		return 0, false
	}
	v := 0
	for i := 0; i < len(d); i++ {
		if d[i] < '0' || d[i] > '9' {
			return 0, false
		}
		v = v*10 + int(d[i]-'0')
	}
	return v, true
}

// unmarshal checks the frame in this order: magic, length (truncated),
// header and whole checksums (corrupt), version, inflated size (too-large),
// then the body and the text's SHA-256.
func unmarshal(b []byte, what string) (Payload, error) {
	if len(b) == 0 {
		return Payload{}, errOf(CodeTruncated, what, "")
	}
	if k := min(len(b), 3); !bytes.Equal(b[:k], magic[:k]) {
		if len(b) >= headerLen {
			var h [headerLen]byte
			copy(h[:], b)
			copy(h[:], magic[:])
			if checkHeader(h[:]) {
				return Payload{}, errOf(CodeCorrupt, what, " (its start is changed)")
			}
		}
		return Payload{}, errOf(CodeForeign, what, "")
	}
	if len(b) < headerLen {
		return Payload{}, errOf(CodeTruncated, what, "")
	}
	if !checkHeader(b) {
		return Payload{}, errOf(CodeCorrupt, what, " (the checksum of its start does not match)")
	}
	zlen := int64(binary.BigEndian.Uint32(b[4:]))
	total := headerLen + zlen + trailerLen
	if int64(len(b)) < total {
		return Payload{}, errOf(CodeTruncated, what, fmt.Sprintf(" (it holds %d of its %d bytes)", len(b), total))
	}
	if int64(len(b)) > total {
		return Payload{}, errOf(CodeCorrupt, what, " (it has more at its end than it should)")
	}
	if binary.BigEndian.Uint32(b[total-trailerLen:]) != crc32.Checksum(b[:total-trailerLen], castagnoli()) {
		return Payload{}, errOf(CodeCorrupt, what, " (its checksum does not match)")
	}
	if v := b[3]; v != Version {
		if v > Version {
			return Payload{}, errOf(CodeVersion, what, fmt.Sprintf(" (format %d; this page reads format %d)", v, Version))
		}
		return Payload{}, errOf(CodeCorrupt, what, fmt.Sprintf(" (format %d does not exist)", v))
	}
	size := int64(binary.BigEndian.Uint32(b[8:]))
	if size > MaxDecoded {
		return Payload{}, errOf(CodeTooLarge, what, "")
	}
	body := make([]byte, size)
	zr := flate.NewReader(bytes.NewReader(b[headerLen : total-trailerLen]))
	if _, err := io.ReadFull(zr, body); err != nil {
		return Payload{}, errOf(CodeCorrupt, what, " (its data do not unpack)")
	}
	var one [1]byte
	if k, err := zr.Read(one[:]); k != 0 || err != io.EOF {
		// More than the header said: never inflate past it.
		return Payload{}, errOf(CodeCorrupt, what, " (its data are longer than it says)")
	}
	p, err := decodeBody(body)
	if err != nil {
		if e, ok := err.(*Error); ok && e.Code == CodeTooLarge {
			return Payload{}, errOf(CodeTooLarge, what, "")
		}
		return Payload{}, errOf(CodeCorrupt, what, " ("+err.Error()+")")
	}
	return p, nil
}
