package charts

// The report's page colours are derived from the chart palette (the
// Okabe–Ito colours above), so the page and its charts belong together:
//
//	slate   = mix(colBlue, colGrey, 0.25)   blue-grey neutral
//	text    = mix(slate, black, 0.30)       body text
//	muted   = slate                         notes, captions, labels
//	rule    = mix(slate, white, 0.30)       table and heading rules
//	axis    = mix(slate, white, 0.75)       chart axis lines, air layers
//	grid    = mix(slate, white, 0.15)       chart grid lines, "other" fill
//	unknown = mix(slate, white, 0.12)       fill of a layer of unknown family
//	soft    = mix(colBlue, white, 0.05)     header cells, summary box
//	stripe  = mix(colBlue, white, 0.02)     every other table row
//	warn    = mix(colOrange, black, 0.50)   warning heading; bar colOrange,
//	          line mix(colOrange, white, 0.45), background mix(colOrange, white, 0.10)
//	caution = mix(colVermilion, black, 0.70) caution heading; line
//	          mix(colVermilion, white, 0.30), background mix(colVermilion, white, 0.07)
//
// mix(a, b, t) = t a + (1 - t) b per sRGB channel, rounded. page.css holds
// the same values as custom properties; palette_test.go recomputes them and
// checks the contrast of every text colour on its backgrounds and on plain
// paper (WCAG 2.1 AA: 4.5:1 for text, 3:1 for graphics).
const (
	colSlate     = "#506D7D"
	colPageText  = colText
	colMuted     = colSlate
	colRule      = "#CBD3D8"
	colAxis      = "#7C929E"
	colGrid      = "#E5E9EC"
	colUnknown   = "#EAEDEF"
	colSoft      = "#F2F8FB"
	colStripe    = "#FAFCFD"
	colWarn      = "#735000"
	colWarnBar   = colOrange
	colWarnLine  = "#F4D48C"
	colWarnBg    = "#FDF5E6"
	colCaution   = "#954200"
	colCautionLn = "#F2CFB3"
	colCautionBg = "#FCF4ED"
)
