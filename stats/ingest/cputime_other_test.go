//go:build js || wasip1 || windows

package ingest

import "time"

func cpuTime() time.Duration { return 0 }

func maxRSS() int64 { return 0 }
