// Package icc reads ICC colour profiles (ICC.1:2001-04 "v2" and
// ICC.1:2010 "v4") and converts colours through them.
//
// It understands what printers' output profiles and display profiles use:
// the header and tag table; the curve types curv and para; the LUT types
// mft1 (lut8), mft2 (lut16), mAB (lutAToB) and mBA (lutBToA); XYZ, wtpt,
// bkpt, desc, mluc and text; the matrix/TRC model of RGB and gray profiles;
// both profile connection spaces (CIELAB and CIEXYZ, D50). A Transform links
// two profiles with the perceptual or relative colorimetric intent, with or
// without black-point compensation, and gives the same numbers as LittleCMS
// 2 does for the same profiles and settings (the tests check this with
// LittleCMS's transicc): tetrahedral interpolation in device-indexed
// tables, trilinear in tables indexed by CIELAB, and LittleCMS's black-point
// detection (Adobe's algorithm for output profiles).
//
// Parse never panics and never allocates more than a small multiple of the
// profile's own size: a truncated profile, an offset past the end, a table
// larger than the bytes that hold it or a tag type it does not know comes
// back as a *FormatError.
package icc
