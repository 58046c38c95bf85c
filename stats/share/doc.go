// Package share is the payload of a shared analysis: the data exactly as
// read, the column choices, the settings and the exclusions, in a versioned
// binary format of our own, with checksums. The format is described in
// DEVELOPERS.md ("The share payload") and below.
package share
