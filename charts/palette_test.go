package charts

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

type rgb [3]float64

func parseHex(t *testing.T, s string) rgb {
	t.Helper()
	s = strings.TrimPrefix(strings.ToLower(s), "#")
	if len(s) == 3 {
		s = string([]byte{s[0], s[0], s[1], s[1], s[2], s[2]})
	}
	if len(s) != 6 {
		t.Fatalf("colour %q is not #rrggbb", s)
	}
	var c rgb
	for i := range 3 {
		v, err := strconv.ParseUint(s[2*i:2*i+2], 16, 8)
		if err != nil {
			t.Fatalf("colour %q: %v", s, err)
		}
		c[i] = float64(v)
	}
	return c
}

func (c rgb) hex() string {
	return fmt.Sprintf("#%02x%02x%02x", int(c[0]), int(c[1]), int(c[2]))
}

// mix is t a + (1 - t) b per sRGB channel, rounded.
func mix(a, b rgb, t float64) rgb {
	var c rgb
	for i := range 3 {
		c[i] = math.Round(t*a[i] + (1-t)*b[i])
	}
	return c
}

// luminance is the relative luminance of an sRGB colour and contrast the
// contrast ratio (L1 + 0.05)/(L2 + 0.05), both as defined in WCAG 2.1,
// "relative luminance" and "contrast ratio" [memory; the 0.04045 threshold
// is that of IEC 61966-2-1, sRGB].
func luminance(c rgb) float64 {
	var l [3]float64
	for i, v := range c {
		v /= 255
		if v <= 0.04045 {
			l[i] = v / 12.92
		} else {
			l[i] = math.Pow((v+0.055)/1.055, 2.4)
		}
	}
	return 0.2126*l[0] + 0.7152*l[1] + 0.0722*l[2]
}

func contrast(a, b rgb) float64 {
	la, lb := luminance(a), luminance(b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

func TestContrastFormula(t *testing.T) {
	// Limits of the definition [derived]: black on white is 21:1, a colour
	// on itself 1:1, and mid grey #777777 on white about 4.48:1, just below
	// the AA threshold for text (a known borderline case).
	white, black := rgb{255, 255, 255}, rgb{0, 0, 0}
	if c := contrast(black, white); math.Abs(c-21) > 1e-12 {
		t.Errorf("black on white %v", c)
	}
	if c := contrast(white, white); c != 1 {
		t.Errorf("white on white %v", c)
	}
	if c := contrast(rgb{119, 119, 119}, white); c > 4.5 || c < 4.4 {
		t.Errorf("#777 on white %v", c)
	}
}

// TestPagePalette recomputes the page colours from the chart palette (the
// rule in palette.go), checks that page.css and the Go constants hold
// exactly those values, and that every text colour reaches WCAG AA on its
// backgrounds and on plain paper (a print without backgrounds).
func TestPagePalette(t *testing.T) {
	white, black := rgb{255, 255, 255}, rgb{0, 0, 0}
	blue, grey := parseHex(t, colBlue), parseHex(t, colGrey)
	orange, vermilion := parseHex(t, colOrange), parseHex(t, colVermilion)
	slate := mix(blue, grey, 0.25)
	want := map[string]rgb{
		"text":         mix(slate, black, 0.30),
		"muted":        slate,
		"rule":         mix(slate, white, 0.30),
		"soft":         mix(blue, white, 0.05),
		"stripe":       mix(blue, white, 0.02),
		"accent":       blue,
		"warn":         mix(orange, black, 0.50),
		"warn-bar":     orange,
		"warn-line":    mix(orange, white, 0.45),
		"warn-bg":      mix(orange, white, 0.10),
		"caution":      mix(vermilion, black, 0.70),
		"caution-line": mix(vermilion, white, 0.30),
		"caution-bg":   mix(vermilion, white, 0.07),
	}
	goConst := map[string]string{
		"text": colPageText, "muted": colMuted, "rule": colRule, "soft": colSoft, "stripe": colStripe,
		"accent": colBlue, "warn": colWarn, "warn-bar": colWarnBar, "warn-line": colWarnLine,
		"warn-bg": colWarnBg, "caution": colCaution, "caution-line": colCautionLn, "caution-bg": colCautionBg,
	}
	css, err := assets.ReadFile("assets/page.css")
	if err != nil {
		t.Fatal(err)
	}
	root := regexp.MustCompile(`(?s):root\s*\{(.*?)\}`).FindSubmatch(css)
	if root == nil {
		t.Fatal("page.css has no :root block")
	}
	vars := map[string]string{}
	for _, m := range regexp.MustCompile(`--([\w-]+):\s*(#[0-9a-fA-F]{3,6})`).FindAllSubmatch(root[1], -1) {
		vars[string(m[1])] = string(m[2])
	}
	if len(vars) != len(want) {
		t.Errorf("page.css :root has %d colours, the palette %d: %v", len(vars), len(want), vars)
	}
	for name, w := range want {
		if v, ok := vars[name]; !ok || parseHex(t, v) != w {
			t.Errorf("page.css --%s = %q, derived %s", name, v, w.hex())
		}
		if c := goConst[name]; parseHex(t, c) != w {
			t.Errorf("Go constant for %s = %s, derived %s", name, c, w.hex())
		}
	}
	for _, c := range []struct {
		name string
		got  rgb
		rule rgb
	}{
		{"axis", parseHex(t, colAxis), mix(slate, white, 0.75)},
		{"grid", parseHex(t, colGrid), mix(slate, white, 0.15)},
		{"unknown", parseHex(t, colUnknown), mix(slate, white, 0.12)},
	} {
		if c.got != c.rule {
			t.Errorf("%s = %s, derived %s", c.name, c.got.hex(), c.rule.hex())
		}
	}

	// Text on its backgrounds and on white paper: WCAG 2.1 AA, 4.5:1.
	text := []string{"text", "muted", "accent", "warn", "caution"}
	backs := map[string][]string{
		"text":    {"soft", "stripe", "warn-bg", "caution-bg"},
		"muted":   {"soft", "stripe", "warn-bg", "caution-bg"},
		"accent":  {"soft"},
		"warn":    {"warn-bg"},
		"caution": {"caution-bg"},
	}
	for _, f := range text {
		for _, b := range append([]string{"paper"}, backs[f]...) {
			bg := white
			if b != "paper" {
				bg = want[b]
			}
			c := contrast(want[f], bg)
			t.Logf("%-8s on %-10s %5.2f:1", f, b, c)
			if c < 4.5 {
				t.Errorf("%s on %s: contrast %.2f:1, below 4.5:1", f, b, c)
			}
		}
	}
	// Chart axis lines are graphics: 3:1 on white (WCAG 2.1, 1.4.11).
	if c := contrast(parseHex(t, colAxis), white); c < 3 {
		t.Errorf("axis line contrast %.2f:1, below 3:1", c)
	}
}

// TestReportColoursFromPalettes: every colour written into a report is a
// chart colour, a derived page colour or a material tint of the cross
// sections (section.go), nothing else.
func TestReportColoursFromPalettes(t *testing.T) {
	allowed := map[string]bool{"#ffffff": true, "#fff": true, "#000000": true}
	for _, c := range []string{colBlack, colOrange, colSky, colGreen, colYellow, colBlue, colVermilion, colPurple, colGrey, colText,
		colSlate, colRule, colAxis, colGrid, colUnknown, colSoft, colStripe, colWarn, colWarnLine, colWarnBg, colCaution, colCautionLn, colCautionBg} {
		allowed[strings.ToLower(c)] = true
	}
	for _, s := range familyStyles {
		allowed[strings.ToLower(s.fill)] = true
		allowed[strings.ToLower(s.ink)] = true
	}
	hexRE := regexp.MustCompile(`#[0-9a-fA-F]{6}\b|#[0-9a-fA-F]{3}\b`)
	for name, r := range map[string]func() string{
		"wall":   func() string { return render(t, wallFixture(), Options{}) },
		"ground": func() string { return render(t, groundFixture(), Options{}) },
	} {
		html := r()
		// Leave out the bundled chart library, which carries its own defaults.
		for _, sp := range scriptSpans(html) {
			body := html[sp[0]:sp[1]]
			if strings.Contains(body, "echarts") && len(body) > 100000 {
				html = html[:sp[0]] + html[sp[1]:]
				break
			}
		}
		seen := map[string]bool{}
		for _, m := range hexRE.FindAllString(html, -1) {
			m = strings.ToLower(m)
			if !allowed[m] && !seen[m] {
				seen[m] = true
				t.Errorf("%s report: colour %s is in no palette", name, m)
			}
		}
	}
}
