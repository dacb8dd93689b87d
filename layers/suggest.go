package layers

import (
	"sort"
	"strings"
	"unicode/utf8"
)

// Closest returns up to max candidates that look like a misspelling or a
// shortening of word, best first, for did-you-mean messages. Comparison
// ignores case and treats "_", "-" and spaces alike, so it serves both
// material keys and scenario-file keys ("specific-heat" finds
// "specific_heat").
//
// Candidates qualify in three tiers, ranked in this order:
//
//  1. a typo: edit distance 1 (an insertion, deletion, substitution or swap
//     of two adjacent letters; the optimal string alignment distance);
//  2. a word match: every hyphen-separated word of the one is a word of the
//     other ("brick" and "brick clay" find "clay-brick", "solid-clay-brick"
//     finds "clay-brick"), or word, at least 3 letters long, is part of a
//     candidate ("fibre" finds "fibreboard");
//  3. a larger edit distance, up to max(2, len(word)/3).
//
// Within a tier, word matches sharing more whole words come first, then fewer
// edits, then the candidate nearer in length, then alphabetical order. An
// exact match is returned alone. Closest returns nil when nothing
// qualifies or max < 1.
func Closest(word string, candidates []string, max int) []string {
	if max < 1 || len(candidates) == 0 {
		return nil
	}
	w := foldWord(word)
	if w == "" {
		return nil
	}
	limit := utf8.RuneCountInString(w) / 3
	if limit < 2 {
		limit = 2
	}
	type scored struct {
		s      string
		tier   int
		shared int // wordMatch score (tier 2), more is better
		dist   int // edit distance
		diff   int // difference in length, for ties
	}
	var hits []scored
	seen := map[string]bool{}
	for _, c := range candidates {
		if seen[c] {
			continue
		}
		seen[c] = true
		f := foldWord(c)
		if f == w {
			return []string{c}
		}
		d := editDistance(w, f)
		diff := utf8.RuneCountInString(f) - utf8.RuneCountInString(w)
		if diff < 0 {
			diff = -diff
		}
		switch shared := wordMatch(w, f); {
		case d <= 1:
			hits = append(hits, scored{c, 1, 0, d, diff})
		case shared > 0:
			hits = append(hits, scored{c, 2, shared, d, diff})
		case d <= limit:
			hits = append(hits, scored{c, 3, 0, d, diff})
		}
	}
	sort.Slice(hits, func(i, j int) bool {
		a, b := hits[i], hits[j]
		switch {
		case a.tier != b.tier:
			return a.tier < b.tier
		case a.shared != b.shared:
			return a.shared > b.shared
		case a.dist != b.dist:
			return a.dist < b.dist
		case a.diff != b.diff:
			return a.diff < b.diff
		}
		return a.s < b.s
	})
	if len(hits) > max {
		hits = hits[:max]
	}
	var out []string
	for _, h := range hits {
		out = append(out, h.s)
	}
	return out
}

// foldWord lower-cases s and writes "_" and spaces as "-".
func foldWord(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	return strings.NewReplacer("_", "-", " ", "-").Replace(s)
}

// wordMatch scores how well the folded words w and f match as words:
// twice the number of words they share when the words of one are all words
// of the other (words under 3 letters do not count: "a", "of"), else 1 when
// w of at least 3 letters is part of f, else 0.
func wordMatch(w, f string) int {
	wp, fp := words(w), words(f)
	if subset(wp, fp) || subset(fp, wp) {
		return 2 * min(len(wp), len(fp))
	}
	if utf8.RuneCountInString(w) >= 3 && strings.Contains(f, w) {
		return 1 // part of a word ranks after a whole word
	}
	return 0
}

// words returns the "-"-separated words of s of at least 3 letters.
func words(s string) []string {
	var out []string
	for _, p := range strings.Split(s, "-") {
		if utf8.RuneCountInString(p) >= 3 {
			out = append(out, p)
		}
	}
	return out
}

// subset reports whether every word of a is among b (a not empty).
func subset(a, b []string) bool {
	if len(a) == 0 {
		return false
	}
	for _, x := range a {
		found := false
		for _, y := range b {
			if x == y {
				found = true
				break
			}
		}
		if !found {
			return false
		}
	}
	return true
}

// editDistance is the optimal string alignment distance between a and b
// (Levenshtein distance plus transposition of adjacent runes), computed on
// runes with the usual dynamic programme (Damerau 1964; Wagner and Fischer
// 1974).
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	n, m := len(ra), len(rb)
	// Three rows suffice: d[i-2], d[i-1], d[i].
	prev2 := make([]int, m+1)
	prev := make([]int, m+1)
	cur := make([]int, m+1)
	for j := 0; j <= m; j++ {
		prev[j] = j
	}
	for i := 1; i <= n; i++ {
		cur[0] = i
		for j := 1; j <= m; j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			v := min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				v = min(v, prev2[j-2]+1)
			}
			cur[j] = v
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[m]
}
