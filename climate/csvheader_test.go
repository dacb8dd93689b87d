package climate

import (
	"slices"
	"testing"
)

// TestCSVHeader: the header is split at the separator ReadCSV detects
// (quoted fields as in RFC 4180; with a decimal comma a comma does not
// count), after a byte-order mark and comment lines.
func TestCSVHeader(t *testing.T) {
	cases := []struct {
		data string
		dec  rune
		want []string
	}{
		{"# c\n\ntime, air\n2024-01-01,1\n", '.', []string{"time", "air"}},
		{"\xEF\xBB\xBFtime;air;sun\n", '.', []string{"time", "air", "sun"}},
		{"time\tair\n", '.', []string{"time", "air"}},
		{"time;air\n2024-01-01;1,5\n", ',', []string{"time", "air"}},
		{"\"a,b\",c\r\n", '.', []string{"a,b", "c"}},
		{"# only a comment\n", '.', nil},
	}
	for _, c := range cases {
		if got := CSVHeader([]byte(c.data), c.dec); !slices.Equal(got, c.want) {
			t.Errorf("%q: %q, want %q", c.data, got, c.want)
		}
	}
}
