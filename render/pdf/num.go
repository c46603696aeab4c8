package pdf

import (
	"math"
	"strconv"
)

// appendNum appends v rounded to 0.001 with no trailing zeros and no
// exponent, as PDF numbers must be (ISO 32000-1 §7.3.3 has no exponent
// form). 0.001 pt is 0.35 µm: far below any press's resolution. Values
// beyond ±1e12 cannot occur on a valid page; they are clamped so the
// integer arithmetic below cannot overflow (validation rejects them first).
func appendNum(b []byte, v float64) []byte {
	if v > 1e12 {
		v = 1e12
	} else if v < -1e12 {
		v = -1e12
	}
	n := int64(math.Round(v * 1000))
	if n == 0 {
		return append(b, '0')
	}
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	b = strconv.AppendInt(b, n/1000, 10)
	frac := n % 1000
	if frac == 0 {
		return b
	}
	d := [3]byte{byte('0' + frac/100), byte('0' + frac/10%10), byte('0' + frac%10)}
	k := 3
	for d[k-1] == '0' {
		k--
	}
	b = append(b, '.')
	return append(b, d[:k]...)
}

// appendNums appends the values separated by single spaces.
func appendNums(b []byte, vs ...float64) []byte {
	for i, v := range vs {
		if i > 0 {
			b = append(b, ' ')
		}
		b = appendNum(b, v)
	}
	return b
}

// finite reports whether every value is a finite number.
func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}
