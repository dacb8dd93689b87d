// Package browsertest opens tempstack's HTML reports in a real headless
// browser (Debian's chromium) and checks what a person opening the file
// would get: the page runs without console errors or uncaught exceptions,
// every chart container drew a canvas (or SVG) with visible data in it, the
// page asks for nothing but its own file:// URL, and text from a scenario
// file never runs as script, however it is shaped.
//
// The package holds tests only. The browser is driven over the Chrome
// DevTools Protocol on a pair of pipes (chromium's --remote-debugging-pipe:
// NUL-terminated JSON messages on file descriptors 3 and 4), so the test
// needs nothing beyond the Go standard library and the chromium binary.
//
// The tests skip, with a message, when chromium is not installed, unless
// the environment variable TEMPSTACK_BROWSER_TEST is "1": then a missing
// browser is a failure (CI sets it after installing chromium). The
// chromium binary is looked up as TEMPSTACK_CHROMIUM, then /usr/bin/chromium,
// then chromium and chromium-browser on PATH.
//
// Screenshots of every demo report are written to the folder named by
// TEMPSTACK_SCREENSHOTS when that is set (e.g.
// TEMPSTACK_SCREENSHOTS=$PWD/artifacts/screenshots, git-ignored), and not
// at all otherwise, so that a repeated go test ./... can use its cache: the
// test opens the sources of the tempstack binary it builds, and its cached
// result stands until one of them (or the chromium binary, or one of the
// TEMPSTACK_ variables) changes.
package browsertest
