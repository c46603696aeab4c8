package main

import (
	"slices"
	"testing"
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
		if (err == nil) != tc.ok || !slices.Equal(got, tc.want) {
			t.Errorf("parseInts(%q) = %v, %v; want %v, ok=%v", tc.in, got, err, tc.want, tc.ok)
		}
	}
	if s := joinInts([]int{1917, 1944}); s != "1917,1944" {
		t.Errorf("joinInts = %q", s)
	}
}
