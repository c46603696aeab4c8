// Package sfnt assembles OpenType (sfnt) font files from their tables, for
// the PDF and SVG writers' font subsets.
package sfnt

import (
	"encoding/binary"
	"sort"
)

// Write assembles tables into an sfnt file (OpenType spec, "Organization
// of an OpenType Font"): the version tag ("OTTO" when there is CFF data,
// else 0x00010000), the table directory sorted by tag, 4-byte aligned
// tables with their checksums and, when there is a head table, its
// checkSumAdjustment, so the whole file sums to 0xB1B0AFBA.
func Write(tables map[string][]byte) []byte {
	tags := make([]string, 0, len(tables))
	for t := range tables {
		tags = append(tags, t)
	}
	sort.Strings(tags)
	n := len(tags)
	es := 0
	for 1<<(es+1) <= n {
		es++
	}
	version := uint32(0x00010000)
	if tables["CFF "] != nil || tables["CFF2"] != nil {
		version = 0x4F54544F // "OTTO"
	}
	be := binary.BigEndian
	out := be.AppendUint32(nil, version)
	out = be.AppendUint16(out, uint16(n))
	out = be.AppendUint16(out, uint16(16<<es))
	out = be.AppendUint16(out, uint16(es))
	out = be.AppendUint16(out, uint16(16*n-16<<es))
	off := 12 + 16*n
	headAt := -1
	var body []byte
	for _, tag := range tags {
		b := tables[tag]
		if tag == "head" && len(b) >= 12 {
			headAt = off + len(body)
		}
		out = append(out, tag...)
		out = be.AppendUint32(out, Checksum(b))
		out = be.AppendUint32(out, uint32(off+len(body)))
		out = be.AppendUint32(out, uint32(len(b)))
		body = append(body, b...)
		for len(body)%4 != 0 {
			body = append(body, 0)
		}
	}
	out = append(out, body...)
	if headAt >= 0 {
		be.PutUint32(out[headAt+8:], 0)
		be.PutUint32(out[headAt+8:], 0xB1B0AFBA-Checksum(out))
	}
	return out
}

// Checksum is the OpenType table checksum: the sum of the data as
// big-endian uint32s, the last one padded with zeros.
func Checksum(b []byte) uint32 {
	var sum uint32
	for i := 0; i < len(b); i += 4 {
		var w [4]byte
		copy(w[:], b[i:])
		sum += binary.BigEndian.Uint32(w[:])
	}
	return sum
}
