package layers

import (
	"sort"
	"strings"
	"unicode/utf8"
)

// Closest returns up to max candidates that look like a misspelling of
// word, closest first, for did-you-mean messages. Comparison ignores case
// and treats "_" and "-" alike, so it serves both material keys and
// scenario-file keys ("specific-heat" finds "specific_heat").
//
// A candidate qualifies when its edit distance to word (insertions,
// deletions, substitutions and swaps of two adjacent letters, each counting
// 1: the optimal string alignment distance) is at most
// max(2, len(word)/3), or when one of its hyphen- or underscore-separated
// parts equals word ("brick" finds "clay-brick"); such matches rank after
// the edit-distance ones. Ties go to the candidate nearer in length, then
// alphabetically. An exact match is returned alone. Closest returns nil when
// nothing qualifies or max < 1.
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
		s    string
		dist int
		diff int // difference in length, for ties
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
		switch {
		case d <= limit:
			hits = append(hits, scored{c, d, diff})
		case hasPart(f, w) || hasPart(w, f):
			hits = append(hits, scored{c, limit + 1, diff})
		}
	}
	sort.Slice(hits, func(i, j int) bool {
		if hits[i].dist != hits[j].dist {
			return hits[i].dist < hits[j].dist
		}
		if hits[i].diff != hits[j].diff {
			return hits[i].diff < hits[j].diff
		}
		return hits[i].s < hits[j].s
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

// hasPart reports whether part is one of the "-"-separated parts of s.
func hasPart(s, part string) bool {
	if part == "" || len(part) < 3 {
		return false
	}
	for _, p := range strings.Split(s, "-") {
		if p == part {
			return true
		}
	}
	return false
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
