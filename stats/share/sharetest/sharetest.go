// Package sharetest makes damaged or foreign share payloads for the tests
// of the packages that open links (wasm/bridge, site). Test helper only:
// nothing in the product imports it. The layout is stats/share's (doc.go).
package sharetest

import (
	"encoding/binary"
	"hash/crc32"
)

// Reframe returns a copy of the raw payload with its version byte set
// (and, when inflated > 0, its declared inflated size) and both CRC-32C
// checksums made right again: a payload as a newer or a lying encoder
// would write it, which only the version or size check can refuse.
func Reframe(raw []byte, version byte, inflated uint32) []byte {
	c := append([]byte(nil), raw...)
	tab := crc32.MakeTable(crc32.Castagnoli)
	c[3] = version
	if inflated > 0 {
		binary.BigEndian.PutUint32(c[8:12], inflated)
	}
	binary.BigEndian.PutUint32(c[12:16], crc32.Checksum(c[:12], tab))
	n := len(c) - 4
	binary.BigEndian.PutUint32(c[n:], crc32.Checksum(c[:n], tab))
	return c
}
