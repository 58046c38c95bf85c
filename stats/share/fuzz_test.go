package share

import (
	"reflect"
	"testing"
)

// FuzzDecode: no input makes Decode or DecodeFile panic, every refusal has a
// code, and whatever decodes encodes back to a payload that decodes the same.
//
//	go test -run '^$' -fuzz FuzzDecode -fuzztime 10m -parallel 1 ./stats/share/
func FuzzDecode(f *testing.F) {
	s, err := Encode(samplePayload())
	if err != nil {
		f.Fatal(err)
	}
	file, _ := EncodeFile(samplePayload())
	small, _ := Encode(Payload{Text: "5.10\n5.2\n-0.01\nNA\n"})
	for _, seed := range []string{s, string(file), small, "", "Lotl", "null", s[:len(s)/2], FileHeader} {
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, in string) {
		for _, dec := range []func(string) (Payload, error){Decode, func(s string) (Payload, error) { return DecodeFile([]byte(s)) }} {
			p, err := dec(in)
			if err != nil {
				if codeOf(err) == "" || err.Error() == "" {
					t.Fatalf("refusal without a code or message: %v", err)
				}
				continue
			}
			again, err := Encode(p)
			if err != nil {
				t.Fatalf("a decoded payload does not encode: %v", err)
			}
			q, err := Decode(again)
			if err != nil || !reflect.DeepEqual(p, q) {
				t.Fatalf("decoded payload does not round-trip: %v", err)
			}
		}
	})
}
