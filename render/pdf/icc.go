package pdf

import "sheaf/palette/icc"

// ProfileDescription is the description tag of the embedded sRGB profile.
const ProfileDescription = icc.SRGBDescription

// SRGBProfile returns the bytes of the ICC v4 sRGB display profile that
// every RGB colour in the documents is tagged with (built by palette/icc,
// which also uses it as the source of press conversions).
func SRGBProfile() []byte { return icc.SRGBBytes() }
