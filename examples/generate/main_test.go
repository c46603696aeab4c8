package main

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestParseInts(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want []int
		ok   bool
	}{
		{"1917,1918, 1943,1944", []int{1917, 1918, 1943, 1944}, true},
		{"", nil, true},
		{"1917,,1918,", []int{1917, 1918}, true},
		{"1917,nineteen", nil, false},
	} {
		got, err := parseInts(tc.in)
		if tc.ok {
			assert.NoError(t, err, "parseInts(%q)", tc.in)
		} else {
			assert.Error(t, err, "parseInts(%q)", tc.in)
		}
		assert.Equal(t, tc.want, got, "parseInts(%q)", tc.in)
	}
	assert.Equal(t, "1917,1944", joinInts([]int{1917, 1944}), "joinInts")
}
