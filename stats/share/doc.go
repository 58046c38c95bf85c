// Package share is the payload of a shared analysis: the data exactly as
// read, the column choices, the settings and the exclusions with their
// reasons, in a versioned binary format of our own with checksums. A link
// carries it as base64url text (Encode, Decode), a file as a header line
// and the bytes (EncodeFile, DecodeFile); Marshal and Unmarshal give the
// bare bytes, for any other carrier (an encrypted stored copy, say).
//
// The receiver gets back the very bytes the sender's engine read, so the
// reader builds the identical table, every figure is identical, and the
// SHA-256 of the text (the report's fingerprint) is the sender's.
//
// This package does not import stats (stats or the bridge may import it);
// Options mirrors stats.Options, and a test fails when they drift apart.
//
// # Format 1
//
// Integers: "uvarint" is an unsigned LEB128 varint, "varint" a zig-zag
// signed one (encoding/binary's Uvarint and Varint); "str" is a uvarint
// byte length then the bytes; "f64" is IEEE-754 binary64 bits, little-endian;
// u32 is big-endian.
//
// The frame (what Marshal returns):
//
//	offset  size  content
//	0       3     magic 0x2E 0x8B 0x65 (base64url "Lotl")
//	3       1     format version: 1
//	4       4     u32 Z: bytes of the compressed body
//	8       4     u32 B: bytes of the body once inflated (at most 64 MiB)
//	12      4     u32 CRC-32C (Castagnoli) of bytes 0..11
//	16      Z     the body, raw DEFLATE (RFC 1951)
//	16+Z    4     u32 CRC-32C of bytes 0..16+Z-1
//
// Every version keeps the magic, the version byte, the header CRC and the
// trailing CRC where they are, so a reader can tell a payload of a newer
// version (CodeVersion) from a damaged one (CodeCorrupt). Settings are
// never "optional extras": a new setting is a new version, and an older page
// refuses the payload instead of silently showing other figures.
//
// Why CRC-32C: it detects every change of up to 32 consecutive bits
// for certain (one changed character of a link touches at most 6), the
// lengths in the header make every truncation visible, and it is fast on
// every target. A checksum inside a link cannot stop a deliberate edit (SHA-256
// would not either: whoever edits recomputes it); against that the receiver
// compares the fingerprint, recomputed from the data, with the sender's
// printout, and an encrypted link adds AES-GCM's authentication. The body also
// holds the SHA-256 of the text, checked after the text is rebuilt.
//
// The body (inflated), in order:
//
//	varint  created (unix seconds)
//	str     name (file name, "" for pasted text)
//	str×4   value, order, subgroup, group column choices
//	byte    flags: 1 target, 2 lsl, 4 usl, 8 populationSD (other bits 0)
//	f64     target, lsl, usl: each only when its flag is set
//	f64     confidence, coverage, cpkGoal (0: the default)
//	str×6   quantile, unit, decimalMark, withinSigma, baseline, chartSpread
//	f64×4   ewmaLambda, ewmaL, cusumK, cusumH (0: the default)
//	uvarint count of check switches (options.signals), then each as its
//	        code (str, codes strictly ascending) and a byte, 1 on or 0 off
//	uvarint count of excluded rows, then each row as a varint difference
//	        from the previous one (the first from 0), in the request's order
//	uvarint count of reasons, then the first row as a varint and each next
//	        row as a uvarint step (at least 1, rows ascending), each row
//	        followed by its reason (str)
//	uvarint T, the text's length in bytes (1..64 MiB)
//	32      SHA-256 of the text
//	byte    form of the text: 0 raw, 1 table
//	...     raw: the T bytes of the text; table: as below
//
// The table form cuts the text into lines and cells and codes each
// column's plain decimals as fixed-point integers. A plain decimal is an
// optional "-", an integer part ("0" or not starting with 0), and
// optionally the column's decimal mark and at least one digit; at most 18
// digits, and never a negative zero. Every other cell (missing markers,
// words, times, exponent form, "+5", " 5", "5.1 g", quoted cells) is kept
// as its bytes. Decimals are kept per cell: "5.10" and "5.1" stay apart.
//
//	byte     line end: 0 "\n", 1 "\r\n" (every "\n" follows "\r"), 2 "\r"
//	         (no "\n" in the text); other "\r" stay in the cells
//	byte     1 when the text ends with a line end
//	byte     cell separator: 0 (one cell a line), or '\t' ';' ',' '|' ' '
//	uvarint  L, lines (the text less a final line end, cut at every line end)
//	uvarint  R, then R pairs (fields, lines) of uvarints: runs of lines with
//	         the same number of cells (at least 1; at most 10,000 columns)
//	then for each column j (cells: the lines with more than j cells):
//	  byte     decimal mark '.' or ',' (not the separator)
//	  uvarint  K, then K run lengths: runs of text cells and number cells,
//	           alternately, the first of text (it alone may be 0)
//	  uvarint  bytes of the column's text section
//	  when the column has numbers:
//	    uvarint  D, then D pairs (decimals byte 0..18, count uvarint):
//	             the decimals of the numbers, run by run
//	    byte     coding: 0 differences from the previous value (the first
//	             from 0), 1 offsets from a base
//	    varint   the base (coding 1 only)
//	    uvarint  bytes of the column's value section
//	  the text section: each text cell as a uvarint, the bytes it shares
//	  with the start of the column's previous text cell, then a str, the rest
//	then the value sections of the columns with numbers, in column order:
//	each number as a varint, in units of the column's largest decimals
//	(12.3 in a column with up to 2 decimals is 1230; it is written back with
//	its own decimals, from the run above)
//
// The encoder chooses the separator that codes the first 64 KB cheapest,
// each column's mark (the one more of its cells read as decimals with),
// and each column's coding (the one whose bytes have the lower entropy). It
// uses the table form only when decoding it gives back the text byte for
// byte, and only when it compresses smaller than the raw form. The body is
// compressed as consecutive segments (the part before the value sections,
// then each value section of 1 KB or more), each with best-compression
// DEFLATE or Huffman-only DEFLATE, whichever is smaller; every segment but the
// last ends in a sync flush, so the whole is one ordinary DEFLATE stream.
//
// A link carries the frame as base64url without padding (RFC 4648 §5);
// it starts with "Lotl". A file (extension .lotlens) is the ASCII line
//
//	Lotlens shared analysis, format 1: open this file in the Lotlens page\n
//
// then the frame. Decoding checks, in order: empty input; the magic (a
// string or file that does not start like ours is CodeForeign, unless its
// header checksum shows only its start was changed); only base64url
// characters; the header CRC; the length (shorter: CodeTruncated; longer:
// CodeCorrupt); the trailing CRC; the version (newer: CodeVersion); B at
// most 64 MiB (CodeTooLarge), inflating never past B; the body's structure;
// T at most 64 MiB; the rebuilt text's length and SHA-256.
package share
