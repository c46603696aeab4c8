// Package production builds and keeps a feature's production files: the
// print PDF with its proofs and contact sheet, the screen SVGs, PNGs,
// panel files and proof page, and the inserts; it keeps encoded pages in
// a cache, writes a manifest of what went in and came out and a report
// of what changed since the last build, and swaps a complete build in
// atomically. Build is the entry point; package feature prepares what it
// draws.
//
// Files a build owns in its folder DIR:
//
//	DIR/manifest.json   what went in and came out (Manifest)
//	DIR/changes.json    what changed since the last build (ChangeReport)
//	DIR/changes.txt     the same for people
//	DIR/.cache/OUTPUT/  encoded pages and text widths, for the next build
package production
