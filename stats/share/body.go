package share

import (
	"bytes"
	"compress/flate"
	"encoding/binary"
	"errors"
	"maps"
	"math"
	"slices"

	"lotlens/stats/digest"
)

// Forms of the text in the body.
const (
	formRaw   = 0 // the bytes as they are (compressed with the body)
	formTable = 1 // lines, cells and fixed-point columns (table.go)
)

// build makes the body of p and its compressed form: the table form of the
// text when it gives back the text byte for byte (checked here, not assumed)
// and compresses smaller, else the raw form.
func build(p Payload) (body, z []byte, form byte) {
	head := encodeBody(p, nil)
	raw := func() ([]byte, []byte) {
		body := append(append(head[:len(head):len(head)], formRaw), p.Text...)
		return body, compress(body, nil, false)
	}
	tab, streams, ok := encodeTableStreams(p.Text)
	if ok {
		if back, err := decodeTable(tab, len(p.Text)); err != nil || back != p.Text {
			ok = false
		}
	}
	if !ok {
		body, z = raw()
		return body, z, formRaw
	}
	body = append(append(head[:len(head):len(head)], formTable), tab...)
	z = compress(body, streams, true)
	// The table form is usually far smaller; compress the raw form too
	// only when it is not clearly so.
	if len(tab) < len(p.Text)/2 {
		return body, z, formTable
	}
	if rb, rz := raw(); len(rz) < len(z) {
		return rb, rz, formRaw
	}
	return body, z, formTable
}

// compress deflates body as one stream of segments: the part before the
// tail streams, then each stream (streams of under 1 KB join the segment
// before). Each segment is compressed alone, with Lempel-Ziv matching
// (best compression) or, when smaller, with Huffman coding only: readings
// scattered about a centre have no repeats worth matching, and matching
// costs them about 10 %. Segments but the last end in a sync flush, which
// leaves the stream byte-aligned, so that the next starts a new block.
func compress(body []byte, streams []int, tryHuffman bool) []byte {
	tail := 0
	for _, n := range streams {
		tail += n
	}
	cuts := []int{len(body) - tail}
	for _, n := range streams {
		if n < 1024 {
			cuts[len(cuts)-1] += n
		} else {
			cuts = append(cuts, n)
		}
	}
	var out []byte
	for i, n := range cuts {
		seg := body[:n]
		body = body[n:]
		last := i == len(cuts)-1
		z := deflateSeg(seg, flate.BestCompression, last)
		if tryHuffman {
			if h := deflateSeg(seg, flate.HuffmanOnly, last); len(h) < len(z) {
				z = h
			}
		}
		out = append(out, z...)
	}
	return out
}

func deflateSeg(b []byte, level int, last bool) []byte {
	var z bytes.Buffer
	w, _ := flate.NewWriter(&z, level)
	w.Write(b)
	if last {
		w.Close()
	} else {
		w.Flush()
	}
	return z.Bytes()
}

// encodeBody writes the body (see the package comment) with the text form
// already chosen.
func encodeBody(p Payload, form []byte) []byte {
	b := make([]byte, 0, 64+len(p.Name)+len(form))
	b = binary.AppendVarint(b, p.Created)
	for _, s := range []string{p.Name, p.Value, p.Order, p.Subgroup, p.Group} {
		b = appendString(b, s)
	}
	o := p.Options
	var flags byte
	if o.Target != nil {
		flags |= 1
	}
	if o.LSL != nil {
		flags |= 2
	}
	if o.USL != nil {
		flags |= 4
	}
	if o.PopulationSD {
		flags |= 8
	}
	b = append(b, flags)
	for _, v := range []*float64{o.Target, o.LSL, o.USL, &o.Confidence, &o.Coverage, &o.CpkGoal} {
		if v != nil {
			b = binary.LittleEndian.AppendUint64(b, math.Float64bits(*v))
		}
	}
	for _, s := range []string{o.Quantile, o.Unit, o.DecimalMark, o.WithinSigma, o.Baseline, o.ChartSpread} {
		b = appendString(b, s)
	}
	for _, v := range []float64{o.EWMALambda, o.EWMAL, o.CUSUMK, o.CUSUMH} {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
	}
	codes := slices.Sorted(maps.Keys(o.Signals))
	b = binary.AppendUvarint(b, uint64(len(codes)))
	for _, c := range codes {
		b = appendString(b, c)
		on := byte(0)
		if o.Signals[c] {
			on = 1
		}
		b = append(b, on)
	}
	b = binary.AppendUvarint(b, uint64(len(o.Exclude)))
	prev := int64(0)
	for _, r := range o.Exclude {
		b = binary.AppendVarint(b, int64(r)-prev)
		prev = int64(r)
	}
	rows := make([]int, 0, len(o.ExcludeReasons))
	for r := range o.ExcludeReasons {
		rows = append(rows, r)
	}
	slices.Sort(rows)
	b = binary.AppendUvarint(b, uint64(len(rows)))
	for i, r := range rows {
		if i == 0 {
			b = binary.AppendVarint(b, int64(r))
		} else {
			b = binary.AppendUvarint(b, uint64(int64(r))-uint64(int64(rows[i-1])))
		}
		b = appendString(b, o.ExcludeReasons[r])
	}
	b = binary.AppendUvarint(b, uint64(len(p.Text)))
	sum := digest.SumString(p.Text)
	b = append(b, sum[:]...)
	return append(b, form...)
}

func appendString(b []byte, s string) []byte {
	b = binary.AppendUvarint(b, uint64(len(s)))
	return append(b, s...)
}

// errBody is any structural error in a body whose checksum matched (a
// hand-made or buggy payload).
var errBody = errors.New("its contents are not in order")

// reader reads the body; the first error sticks.
type reader struct {
	b   []byte
	bad bool
}

func (r *reader) byte() byte {
	if len(r.b) == 0 {
		r.bad = true
		return 0
	}
	c := r.b[0]
	r.b = r.b[1:]
	return c
}

func (r *reader) uvarint() uint64 {
	v, n := binary.Uvarint(r.b)
	if n <= 0 {
		r.bad = true
		return 0
	}
	r.b = r.b[n:]
	return v
}

func (r *reader) varint() int64 {
	v, n := binary.Varint(r.b)
	if n <= 0 {
		r.bad = true
		return 0
	}
	r.b = r.b[n:]
	return v
}

// count reads a count no larger than limit.
func (r *reader) count(limit int) int {
	v := r.uvarint()
	if v > uint64(limit) {
		r.bad = true
		return 0
	}
	return int(v)
}

func (r *reader) bytes(n int) []byte {
	if n < 0 || n > len(r.b) {
		r.bad = true
		return nil
	}
	s := r.b[:n:n]
	r.b = r.b[n:]
	return s
}

func (r *reader) str() string { return string(r.bytes(r.count(len(r.b)))) }

func (r *reader) f64() float64 {
	s := r.bytes(8)
	if s == nil {
		return 0
	}
	return math.Float64frombits(binary.LittleEndian.Uint64(s))
}

// decodeBody reads a body written by encodeBody. Its errors are errBody or
// an *Error with CodeTooLarge.
func decodeBody(body []byte) (Payload, error) {
	r := &reader{b: body}
	var p Payload
	p.Created = r.varint()
	p.Name, p.Value, p.Order, p.Subgroup, p.Group = r.str(), r.str(), r.str(), r.str(), r.str()
	flags := r.byte()
	if flags&^15 != 0 {
		return Payload{}, errBody
	}
	o := &p.Options
	for i, v := range []**float64{&o.Target, &o.LSL, &o.USL} {
		if flags&(1<<i) != 0 {
			f := r.f64()
			*v = &f
		}
	}
	o.PopulationSD = flags&8 != 0
	o.Confidence = r.f64()
	o.Coverage = r.f64()
	o.CpkGoal = r.f64()
	o.Quantile, o.Unit, o.DecimalMark, o.WithinSigma = r.str(), r.str(), r.str(), r.str()
	o.Baseline, o.ChartSpread = r.str(), r.str()
	o.EWMALambda, o.EWMAL, o.CUSUMK, o.CUSUMH = r.f64(), r.f64(), r.f64(), r.f64()
	if n := r.count(len(r.b)); n > 0 {
		o.Signals = make(map[string]bool, n)
		prev := ""
		for i := range n {
			c, on := r.str(), r.byte()
			if on > 1 || (i > 0 && c <= prev) {
				return Payload{}, errBody // one byte 0 or 1 each, codes ascending
			}
			o.Signals[c], prev = on == 1, c
		}
	}
	// Rows are 64-bit ints on every target (amd64, js/wasm): the deltas
	// wrap the same way in both directions, so any row comes back.
	if n := r.count(len(r.b)); n > 0 {
		o.Exclude = make([]int, n)
		prev := int64(0)
		for i := range o.Exclude {
			prev += r.varint()
			o.Exclude[i] = int(prev)
		}
	}
	if n := r.count(len(r.b)); n > 0 {
		o.ExcludeReasons = make(map[int]string, n)
		prev := r.varint()
		o.ExcludeReasons[int(prev)] = r.str()
		for i := 1; i < n; i++ {
			next := int64(uint64(prev) + r.uvarint())
			if next <= prev {
				return Payload{}, errBody // rows strictly increasing
			}
			prev = next
			o.ExcludeReasons[int(prev)] = r.str()
		}
	}
	tlen := r.uvarint()
	if tlen > MaxDecoded {
		return Payload{}, &Error{Code: CodeTooLarge}
	}
	if tlen == 0 {
		r.bad = true
	}
	sum := r.bytes(digest.Size)
	form := r.byte()
	if r.bad {
		return Payload{}, errBody
	}
	var err error
	switch form {
	case formRaw:
		if uint64(len(r.b)) != tlen {
			return Payload{}, errBody
		}
		p.Text = string(r.b)
	case formTable:
		p.Text, err = decodeTable(r.b, int(tlen))
		if err != nil {
			return Payload{}, err
		}
	default:
		return Payload{}, errBody
	}
	if got := digest.SumString(p.Text); string(got[:]) != string(sum) {
		return Payload{}, errors.New("its data do not give back the fingerprint they were sent with")
	}
	return p, nil
}
