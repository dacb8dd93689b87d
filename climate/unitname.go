package climate

import (
	"strings"
	"unicode"
	"unicode/utf8"
)

// LooksFahrenheit reports whether a column name says its values are in
// degrees Fahrenheit: "temp_F", "air-f", "T (F)", "degF", "°F", "tempF",
// "Fahrenheit". A reader that reads such a column as degC has most likely
// forgotten the unit (a plausibility check; the name is not proof).
func LooksFahrenheit(name string) bool {
	low := strings.ToLower(strings.TrimSpace(name))
	if low == "" {
		return false
	}
	if strings.Contains(low, "fahrenheit") || strings.Contains(low, "°f") || strings.Contains(low, "ºf") {
		return true
	}
	// A word of its own: "f", "degf", "deg_f" (split at anything that is not
	// a letter or digit).
	words := strings.FieldsFunc(low, func(r rune) bool { return !unicode.IsLetter(r) && !unicode.IsDigit(r) })
	for i, w := range words {
		if w == "f" || w == "degf" || (w == "deg" && i+1 < len(words) && words[i+1] == "f") {
			return true
		}
	}
	// camelCase: a capital F ending the name after a small letter ("tempF").
	trimmed := strings.TrimSpace(name)
	r, n := utf8.DecodeLastRuneInString(trimmed)
	p, _ := utf8.DecodeLastRuneInString(trimmed[:len(trimmed)-n])
	return r == 'F' && unicode.IsLower(p)
}
