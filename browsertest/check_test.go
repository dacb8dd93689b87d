package browsertest

import (
	"context"
	"encoding/base64"
	"encoding/json"
	"fmt"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"time"
)

// Thresholds for "this chart drew its data". A chart's canvas is scanned
// pixel by pixel: ink is any pixel that is not transparent and not
// near-white (titles, axes, grid lines, legend and data); colour is a
// strongly coloured pixel (max-min of R, G, B above 60), which in these
// reports means data: the palette is saturated while text and axes are
// grey. Coloured pixels are counted inside the chart's plot areas (its
// echarts grids), so legend swatches do not count. Measured on the demo
// reports (Dec 2026): every real chart has 3,500 to 15,000 coloured plot
// pixels; the same chart with its series emptied has 0 (and 728 over the
// whole canvas, from the legend). One 2-px line across the plot gives
// about 1,600.
const (
	minInk    = 2000
	minColour = 600
)

// chartResult is what the page reports about one chart container.
type chartResult struct {
	ID       string `json:"id"`
	Width    int    `json:"w"`
	Height   int    `json:"h"`
	Canvases int    `json:"canvases"`
	SVGs     int    `json:"svgs"`
	Ink      int    `json:"ink"`
	Colour   int    `json:"colour"`
	// PlotColour counts the coloured pixels inside the chart's plot
	// areas (echarts grids), where only data is coloured: the legend
	// swatches and titles lie outside. Grids is how many plot areas were
	// found; with none, Colour is used instead.
	PlotColour int  `json:"plotColour"`
	Grids      int  `json:"grids"`
	Instance   bool `json:"instance"` // an echarts instance is bound to it
}

// pageState is what the page itself reports after loading.
type pageState struct {
	Charts     []chartResult `json:"charts"`
	Pwned      bool          `json:"pwned"`
	PwnedValue string        `json:"pwnedValue"`
	Violations []string      `json:"violations"` // Content-Security-Policy violations
	Title      string        `json:"title"`
	H1         string        `json:"h1"`
	BodyText   string        `json:"bodyText"`
}

// pageResult is everything one visit of a report saw.
type pageResult struct {
	URL        string
	State      pageState
	Console    []string // console.error / console.assert and log entries at level error
	Warnings   []string // console warnings, reported but not failing
	Exceptions []string // uncaught exceptions and unhandled rejections
	Requests   []string // every request other than the report's own URL
	Dialogs    []string // alert, confirm, prompt, beforeunload
	Screenshot string   // path of the PNG, when one was asked for
}

// problems lists every way the page failed the checks; empty means it
// passed. wantCharts is the least number of chart containers the page must
// have (0 for a page with none).
func (r *pageResult) problems(wantCharts int) []string {
	var p []string
	for _, s := range r.Console {
		p = append(p, "console error: "+s)
	}
	for _, s := range r.Exceptions {
		p = append(p, "uncaught exception: "+s)
	}
	for _, s := range r.Requests {
		p = append(p, "request other than the report itself: "+s)
	}
	for _, s := range r.Dialogs {
		p = append(p, "dialog opened: "+s)
	}
	for _, s := range r.State.Violations {
		p = append(p, "content security policy violation: "+s)
	}
	if r.State.Pwned {
		p = append(p, "window.__pwned is set ("+r.State.PwnedValue+"): injected script ran")
	}
	if len(r.State.Charts) < wantCharts {
		p = append(p, fmt.Sprintf("found %d chart containers, want at least %d", len(r.State.Charts), wantCharts))
	}
	for _, c := range r.State.Charts {
		switch {
		case c.Width < 50 || c.Height < 50:
			p = append(p, fmt.Sprintf("chart %q: container is %dx%d px", c.ID, c.Width, c.Height))
		case c.Canvases+c.SVGs == 0:
			p = append(p, fmt.Sprintf("chart %q: no canvas or svg was drawn", c.ID))
		case c.Ink < minInk:
			p = append(p, fmt.Sprintf("chart %q: blank (%d ink pixels, want %d)", c.ID, c.Ink, minInk))
		case c.Grids > 0 && c.PlotColour < minColour:
			p = append(p, fmt.Sprintf("chart %q: no data drawn (%d coloured pixels in the plot area, want %d; %d ink)", c.ID, c.PlotColour, minColour, c.Ink))
		case c.Grids == 0 && c.Colour < minColour:
			p = append(p, fmt.Sprintf("chart %q: no data drawn (%d coloured pixels, want %d; %d ink)", c.ID, c.Colour, minColour, c.Ink))
		}
	}
	return p
}

// recorder collects a page's events; its methods run on the reader
// goroutine.
type recorder struct {
	b        *browser
	session  string
	allowURL string

	mu         sync.Mutex
	console    []string
	warnings   []string
	exceptions []string
	requests   []string
	dialogs    []string
	loaded     chan struct{}
	loadOnce   sync.Once
}

func (rec *recorder) add(list *[]string, s string) {
	rec.mu.Lock()
	defer rec.mu.Unlock()
	for _, x := range *list {
		if x == s {
			return
		}
	}
	*list = append(*list, s)
}

// sameDocument reports whether u is the report's own URL (ignoring a
// fragment).
func (rec *recorder) sameDocument(u string) bool {
	if i := strings.IndexByte(u, '#'); i >= 0 {
		u = u[:i]
	}
	return u == rec.allowURL
}

func (rec *recorder) handle(method string, params json.RawMessage) {
	switch method {
	case "Fetch.requestPaused":
		var e struct {
			RequestID string `json:"requestId"`
			Request   struct {
				URL string `json:"url"`
			} `json:"request"`
		}
		_ = json.Unmarshal(params, &e)
		if rec.sameDocument(e.Request.URL) {
			rec.b.post(rec.session, "Fetch.continueRequest", map[string]any{"requestId": e.RequestID})
			return
		}
		rec.add(&rec.requests, e.Request.URL)
		rec.b.post(rec.session, "Fetch.failRequest", map[string]any{"requestId": e.RequestID, "errorReason": "BlockedByClient"})
	case "Network.requestWillBeSent":
		var e struct {
			Request struct {
				URL string `json:"url"`
			} `json:"request"`
		}
		_ = json.Unmarshal(params, &e)
		if !rec.sameDocument(e.Request.URL) {
			rec.add(&rec.requests, e.Request.URL)
		}
	case "Network.webSocketCreated":
		var e struct {
			URL string `json:"url"`
		}
		_ = json.Unmarshal(params, &e)
		rec.add(&rec.requests, "websocket "+e.URL)
	case "Runtime.consoleAPICalled":
		var e struct {
			Type string `json:"type"`
			Args []struct {
				Type        string          `json:"type"`
				Value       json.RawMessage `json:"value"`
				Description string          `json:"description"`
			} `json:"args"`
		}
		_ = json.Unmarshal(params, &e)
		var parts []string
		for _, a := range e.Args {
			if a.Description != "" {
				parts = append(parts, a.Description)
			} else {
				parts = append(parts, string(a.Value))
			}
		}
		msg := e.Type + ": " + strings.Join(parts, " ")
		switch e.Type {
		case "error", "assert":
			rec.add(&rec.console, msg)
		case "warning":
			rec.add(&rec.warnings, msg)
		}
	case "Runtime.exceptionThrown":
		var e struct {
			Details struct {
				Text      string `json:"text"`
				URL       string `json:"url"`
				Line      int    `json:"lineNumber"`
				Exception struct {
					Description string `json:"description"`
				} `json:"exception"`
			} `json:"exceptionDetails"`
		}
		_ = json.Unmarshal(params, &e)
		d := e.Details
		msg := strings.TrimSpace(d.Text + " " + d.Exception.Description)
		rec.add(&rec.exceptions, fmt.Sprintf("%s (line %d)", firstLine(msg), d.Line+1))
	case "Log.entryAdded":
		var e struct {
			Entry struct {
				Level  string `json:"level"`
				Source string `json:"source"`
				Text   string `json:"text"`
				URL    string `json:"url"`
			} `json:"entry"`
		}
		_ = json.Unmarshal(params, &e)
		msg := e.Entry.Source + ": " + firstLine(e.Entry.Text)
		if e.Entry.URL != "" && !rec.sameDocument(e.Entry.URL) {
			msg += " (" + e.Entry.URL + ")"
		}
		switch e.Entry.Level {
		case "error":
			rec.add(&rec.console, msg)
		case "warning":
			rec.add(&rec.warnings, msg)
		}
	case "Page.javascriptDialogOpening":
		var e struct {
			Type    string `json:"type"`
			Message string `json:"message"`
		}
		_ = json.Unmarshal(params, &e)
		rec.add(&rec.dialogs, e.Type+": "+e.Message)
		rec.b.post(rec.session, "Page.handleJavaScriptDialog", map[string]any{"accept": false})
	case "Page.loadEventFired":
		rec.loadOnce.Do(func() { close(rec.loaded) })
	}
}

func firstLine(s string) string {
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		s = s[:i]
	}
	if len(s) > 300 {
		s = s[:300] + "…"
	}
	return s
}

// preludeJS runs before any script of the page (DevTools injects it; the
// page's Content-Security-Policy does not apply to it) and records
// policy violations, which chromium does not always send as log entries.
const preludeJS = `(function () {
  var list = [];
  Object.defineProperty(window, '__tsViolations', {value: list});
  document.addEventListener('securitypolicyviolation', function (e) {
    list.push(e.violatedDirective + ' blocked ' + (e.blockedURI || 'inline') +
      (e.sample ? ' [' + e.sample.slice(0, 60) + ']' : '') + ' at line ' + e.lineNumber);
  });
})();`

// inspectJS waits until every chart container has drawn (or 1 s has
// passed) and returns a pageState. It reads each canvas back by drawing it
// onto a scratch canvas, so it works whatever context the chart used.
const inspectJS = `(async function () {
  function frame() { return new Promise(function (r) { requestAnimationFrame(function () { r(); }); }); }
  function sleep(ms) { return new Promise(function (r) { setTimeout(r, ms); }); }
  function containers() {
    var set = new Set();
    document.querySelectorAll('.chart-box, [_echarts_instance_]').forEach(function (el) { set.add(el); });
    return Array.from(set);
  }
  // gridRects returns the plot areas of the echarts instance on el, in
  // CSS pixels, or [] when there is none (or the API is not there).
  function gridRects(el) {
    var out = [];
    try {
      var inst = window.echarts && echarts.getInstanceByDom(el);
      var model = inst && inst.getModel && inst.getModel();
      if (model) {
        model.eachComponent('grid', function (g) {
          var r = g.coordinateSystem && g.coordinateSystem.getRect();
          if (r && r.width > 0 && r.height > 0) { out.push(r); }
        });
      }
    } catch (e) { out = []; }
    return out;
  }
  function count(c, res, el) {
    var w = c.width, h = c.height;
    if (!w || !h) { return; }
    var sx = w / (c.clientWidth || w), sy = h / (c.clientHeight || h);
    var rects = gridRects(el).map(function (r) {
      return {x0: r.x * sx, y0: r.y * sy, x1: (r.x + r.width) * sx, y1: (r.y + r.height) * sy};
    });
    res.grids += rects.length;
    var s = document.createElement('canvas');
    s.width = w; s.height = h;
    var ctx = s.getContext('2d');
    ctx.drawImage(c, 0, 0);
    var d = ctx.getImageData(0, 0, w, h).data;
    for (var i = 0; i < d.length; i += 4) {
      if (d[i + 3] < 32) { continue; }
      var r = d[i], g = d[i + 1], b = d[i + 2];
      if (r > 240 && g > 240 && b > 240) { continue; }
      res.ink++;
      if (Math.max(r, g, b) - Math.min(r, g, b) > 60) {
        res.colour++;
        var px = (i / 4) % w, py = Math.floor(i / 4 / w);
        for (var k = 0; k < rects.length; k++) {
          var q = rects[k];
          if (px >= q.x0 && px <= q.x1 && py >= q.y0 && py <= q.y1) { res.plotColour++; break; }
        }
      }
    }
  }
  function measure() {
    return containers().map(function (el) {
      var res = {id: el.id || el.className, w: el.clientWidth, h: el.clientHeight,
        canvases: 0, svgs: 0, ink: 0, colour: 0, plotColour: 0, grids: 0,
        instance: !!(window.echarts && echarts.getInstanceByDom && echarts.getInstanceByDom(el))};
      el.querySelectorAll('canvas').forEach(function (c) { res.canvases++; count(c, res, el); });
      el.querySelectorAll('svg').forEach(function (svg) {
        res.svgs++;
        svg.querySelectorAll('path, polyline, polygon, line, rect, circle, text').forEach(function (n) {
          var st = getComputedStyle(n);
          if (st.visibility === 'hidden' || st.display === 'none') { return; }
          var box = n.getBBox ? n.getBBox() : {width: 0, height: 0};
          var size = Math.max(1, Math.round(box.width + box.height));
          res.ink += size;
          [st.stroke, st.fill].forEach(function (c) {
            var m = /rgba?\((\d+), *(\d+), *(\d+)/.exec(c || '');
            if (m && Math.max(+m[1], +m[2], +m[3]) - Math.min(+m[1], +m[2], +m[3]) > 60) { res.colour += size; }
          });
        });
      });
      return res;
    });
  }
  await frame(); await frame();
  var charts = measure();
  for (var t = 0; t < 10; t++) {
    var ok = charts.every(function (c) { return c.ink >= MIN_INK && (c.grids > 0 ? c.plotColour : c.colour) >= MIN_COLOUR; });
    if (ok) { break; }
    await sleep(100);
    charts = measure();
  }
  var h1 = document.querySelector('h1');
  return {
    charts: charts,
    pwned: typeof window.__pwned !== 'undefined',
    pwnedValue: String(window.__pwned),
    violations: (window.__tsViolations || []).slice(),
    title: document.title,
    h1: h1 ? h1.textContent : '',
    bodyText: document.body ? document.body.innerText : ''
  };
})()`

// visit opens the file at path in a new tab, waits for it to load and
// settle, inspects it and, when shot is not "", saves a full-page
// screenshot there. The tab is closed afterwards.
func (b *browser) visit(ctx context.Context, path, shot string) (*pageResult, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, err
	}
	u := (&url.URL{Scheme: "file", Path: abs}).String()
	ctx, cancel := context.WithTimeout(ctx, 60*time.Second)
	defer cancel()

	var target struct {
		TargetID string `json:"targetId"`
	}
	if err := b.call(ctx, "", "Target.createTarget", map[string]any{"url": "about:blank"}, &target); err != nil {
		return nil, err
	}
	defer func() {
		cctx, ccancel := context.WithTimeout(context.Background(), 5*time.Second)
		_ = b.call(cctx, "", "Target.closeTarget", map[string]any{"targetId": target.TargetID}, nil)
		ccancel()
	}()
	var att struct {
		SessionID string `json:"sessionId"`
	}
	if err := b.call(ctx, "", "Target.attachToTarget", map[string]any{"targetId": target.TargetID, "flatten": true}, &att); err != nil {
		return nil, err
	}
	s := att.SessionID
	rec := &recorder{b: b, session: s, allowURL: u, loaded: make(chan struct{})}
	b.setHandler(s, rec.handle)
	defer b.setHandler(s, nil)

	setup := []struct {
		method string
		params any
	}{
		{"Page.enable", nil},
		{"Runtime.enable", nil},
		{"Log.enable", nil},
		{"Network.enable", nil},
		{"Network.setCacheDisabled", map[string]any{"cacheDisabled": true}},
		{"Fetch.enable", map[string]any{"patterns": []map[string]any{{"urlPattern": "*"}}}},
		{"Page.addScriptToEvaluateOnNewDocument", map[string]any{"source": preludeJS}},
		{"Emulation.setDeviceMetricsOverride", map[string]any{"width": 1024, "height": 800, "deviceScaleFactor": 1, "mobile": false}},
	}
	for _, c := range setup {
		if err := b.call(ctx, s, c.method, c.params, nil); err != nil {
			return nil, err
		}
	}
	var nav struct {
		ErrorText string `json:"errorText"`
	}
	if err := b.call(ctx, s, "Page.navigate", map[string]any{"url": u}, &nav); err != nil {
		return nil, err
	}
	if nav.ErrorText != "" {
		return nil, fmt.Errorf("navigating to %s: %s", u, nav.ErrorText)
	}
	select {
	case <-rec.loaded:
	case <-ctx.Done():
		return nil, fmt.Errorf("%s did not finish loading: %w", u, ctx.Err())
	}

	res := &pageResult{URL: u}
	var ev struct {
		Result struct {
			Value json.RawMessage `json:"value"`
		} `json:"result"`
		ExceptionDetails *struct {
			Text string `json:"text"`
		} `json:"exceptionDetails"`
	}
	expr := strings.NewReplacer("MIN_INK", strconv.Itoa(minInk), "MIN_COLOUR", strconv.Itoa(minColour)).Replace(inspectJS)
	if err := b.call(ctx, s, "Runtime.evaluate", map[string]any{
		"expression": expr, "awaitPromise": true, "returnByValue": true,
	}, &ev); err != nil {
		return nil, err
	}
	if ev.ExceptionDetails != nil {
		return nil, fmt.Errorf("inspecting the page: %s", ev.ExceptionDetails.Text)
	}
	if err := json.Unmarshal(ev.Result.Value, &res.State); err != nil {
		return nil, fmt.Errorf("inspecting the page: %v: %s", err, shortJSON(ev.Result.Value))
	}

	if shot != "" {
		if err := b.screenshot(ctx, s, shot); err != nil {
			return nil, err
		}
		res.Screenshot = shot
	}
	// Let late events (a timer's error, a deferred request) arrive.
	time.Sleep(150 * time.Millisecond)
	rec.mu.Lock()
	res.Console = append(res.Console, rec.console...)
	res.Warnings = append(res.Warnings, rec.warnings...)
	res.Exceptions = append(res.Exceptions, rec.exceptions...)
	res.Requests = append(res.Requests, rec.requests...)
	res.Dialogs = append(res.Dialogs, rec.dialogs...)
	rec.mu.Unlock()
	return res, nil
}

// screenshot saves the whole page (not just the viewport) as a PNG.
func (b *browser) screenshot(ctx context.Context, session, path string) error {
	var m struct {
		Content struct {
			Width  float64 `json:"width"`
			Height float64 `json:"height"`
		} `json:"cssContentSize"`
	}
	if err := b.call(ctx, session, "Page.getLayoutMetrics", nil, &m); err != nil {
		return err
	}
	var shot struct {
		Data string `json:"data"`
	}
	if err := b.call(ctx, session, "Page.captureScreenshot", map[string]any{
		"format":                "png",
		"captureBeyondViewport": true,
		"clip": map[string]any{
			"x": 0, "y": 0, "width": m.Content.Width, "height": m.Content.Height, "scale": 1,
		},
	}, &shot); err != nil {
		return err
	}
	png, err := base64.StdEncoding.DecodeString(shot.Data)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	return os.WriteFile(path, png, 0o644)
}
