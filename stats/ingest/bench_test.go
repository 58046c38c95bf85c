package ingest

import (
	"bytes"
	"fmt"
	"math/rand"
	"strconv"
	"sync"
	"testing"
	"time"
)

// Speed goal: at least 150 MB/s of numeric text natively. Each reader
// benchmark has a baseline on the same bytes in the same run (split into
// lines and fields with bytes.Split, parse with strconv.ParseFloat): compare
// the MB/s of the pairs, the machine is shared and noisy.
//
//	go test -run '^$' -bench . -benchmem ./stats/ingest/

const benchBytes = 16 << 20

var benchOnce sync.Once
var benchCol, benchCSV []byte

func benchInputs() {
	benchOnce.Do(func() {
		r := rand.New(rand.NewSource(11))
		var b bytes.Buffer
		b.WriteString("Weight (g)\n")
		for b.Len() < benchBytes {
			fmt.Fprintf(&b, "%d.%03d\n", 480+r.Intn(40), r.Intn(1000))
		}
		benchCol = b.Bytes()
		b = bytes.Buffer{}
		b.WriteString("Diameter (mm),Torque (Nm),Weight (g)\n")
		for b.Len() < benchBytes {
			fmt.Fprintf(&b, "%d.%03d,%d.%02d,%d.%d\n", 24+r.Intn(2), r.Intn(1000), 11+r.Intn(3), r.Intn(100), 480+r.Intn(40), r.Intn(10))
		}
		benchCSV = b.Bytes()
	})
}

func benchRead(b *testing.B, in []byte, chunk int) {
	b.SetBytes(int64(len(in)))
	b.ReportAllocs()
	defer reportCPU(b, len(in), cpuTime())
	for b.Loop() {
		var tab *Table
		var err error
		if chunk == 0 {
			tab, err = ReadBytes(in, ReadOptions{})
		} else {
			s := NewStream(ReadOptions{SizeHint: int64(len(in))})
			for p := in; len(p) > 0; {
				n := min(chunk, len(p))
				s.Write(p[:n])
				p = p[n:]
			}
			tab, err = s.Finish()
		}
		if err != nil || tab.Columns[0].Bad != 0 {
			b.Fatal(err)
		}
	}
}

// baseline: bytes.Split + strconv.ParseFloat, values appended to slices
func benchBaseline(b *testing.B, in []byte, sep byte) {
	b.SetBytes(int64(len(in)))
	b.ReportAllocs()
	defer reportCPU(b, len(in), cpuTime())
	for b.Loop() {
		if baselineOnce(in, sep) == 0 {
			b.Fatal("nothing read")
		}
	}
}

func BenchmarkReadColumn(b *testing.B)          { benchInputs(); benchRead(b, benchCol, 0) }
func BenchmarkReadColumnChunks64K(b *testing.B) { benchInputs(); benchRead(b, benchCol, 64<<10) }
func BenchmarkBaselineColumn(b *testing.B)      { benchInputs(); benchBaseline(b, benchCol, 0) }
func BenchmarkReadCSV3(b *testing.B)            { benchInputs(); benchRead(b, benchCSV, 0) }
func BenchmarkReadCSV3Chunks64K(b *testing.B)   { benchInputs(); benchRead(b, benchCSV, 64<<10) }
func BenchmarkBaselineCSV3(b *testing.B)        { benchInputs(); benchBaseline(b, benchCSV, ',') }

// reportCPU adds the throughput per CPU second ("cpu-MB/s").
func reportCPU(b *testing.B, n int, start time.Duration) {
	if d := cpuTime() - start; d > 0 {
		b.ReportMetric(float64(n)*float64(b.N)/1e6/d.Seconds(), "cpu-MB/s")
	}
}

// BenchmarkRatio times the reader and the baseline alternately in each
// iteration, so that both see the same machine load, and reports the
// reader's speed as a multiple of the baseline's ("x-baseline") with the
// reader's MB/s of wall and CPU time.
func BenchmarkRatioColumn(b *testing.B) { benchInputs(); benchRatio(b, benchCol, 0) }
func BenchmarkRatioCSV3(b *testing.B)   { benchInputs(); benchRatio(b, benchCSV, ',') }

func benchRatio(b *testing.B, in []byte, sep byte) {
	var read, base, readCPU time.Duration
	var sink int
	for b.Loop() {
		c0 := cpuTime()
		t0 := time.Now()
		tab, err := ReadBytes(in, ReadOptions{})
		t1 := time.Now()
		c1 := cpuTime()
		if err != nil {
			b.Fatal(err)
		}
		sink += tab.Columns[0].Numbers
		sink += baselineOnce(in, sep)
		read += t1.Sub(t0)
		readCPU += c1 - c0
		base += time.Since(t1)
	}
	if sink == 0 {
		b.Fatal("nothing read")
	}
	mb := float64(len(in)) * float64(b.N) / 1e6
	b.ReportMetric(base.Seconds()/read.Seconds(), "x-baseline")
	b.ReportMetric(mb/read.Seconds(), "reader-MB/s")
	if readCPU > 0 {
		b.ReportMetric(mb/readCPU.Seconds(), "reader-cpu-MB/s")
	}
}

func baselineOnce(in []byte, sep byte) int {
	var vals []float64
	for _, l := range bytes.Split(in, []byte{'\n'})[1:] {
		if len(l) == 0 {
			continue
		}
		fields := [][]byte{l}
		if sep != 0 {
			fields = bytes.Split(l, []byte{sep})
		}
		for _, f := range fields {
			v, err := strconv.ParseFloat(string(f), 64)
			if err != nil {
				panic(err)
			}
			vals = append(vals, v)
		}
	}
	return len(vals)
}
