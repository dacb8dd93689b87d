/* tempstack report: trusted chart functions and chart start-up. Part of the
   tempstack source; every function a chart option may call is defined in
   TSFN here, and nothing in a chart option is turned into code except a
   reference to one of them. */
var TSFN = (function () {
  'use strict';
  function trim(s) {
    return s.indexOf('.') >= 0 ? s.replace(/0+$/, '').replace(/\.$/, '') : s;
  }
  function minus(s) { return s.replace('-', '\u2212'); }
  function fixed(v, d) {
    var s = v.toFixed(d);
    if (/^-0(\.0*)?$/.test(s)) { s = s.slice(1); }
    return minus(s);
  }
  function seconds(v) {
    var a = Math.abs(v);
    if (a < 120) { return minus(trim(v.toPrecision(3))) + '\u00a0s'; }
    if (a < 7200) { return fixed(v / 60, 1) + '\u00a0min'; }
    if (a < 172800) { return fixed(v / 3600, 1) + '\u00a0h'; }
    return fixed(v / 86400, 1) + '\u00a0d';
  }
  // Units of tooltip values; the keys are the unit codes in the series ids.
  var UNIT = {
    degC: function (v) { return fixed(v, 1) + '\u00a0\u00b0C'; },
    wm2: function (v) { return fixed(v, 1) + '\u00a0W/m\u00b2'; },
    ratio: function (v) {
      var a = Math.abs(v);
      return (a === 0 || a >= 1e-3) ? minus(trim(v.toPrecision(3))) : minus(v.toExponential(2));
    },
    h: function (v) { return minus(trim(v.toFixed(2))) + '\u00a0h'; },
    d: function (v) { return minus(trim(v.toFixed(2))) + '\u00a0d'; },
    mm: function (v) { return minus(trim(v.toFixed(1))) + '\u00a0mm'; },
    m: function (v) { return fixed(v, 2) + '\u00a0m'; },
    s: seconds
  };
  function fmt(unit, v) {
    if (typeof v !== 'number' || !isFinite(v)) { return '\u2013'; }
    var f = UNIT[unit];
    return f ? f(v) : String(v);
  }
  function esc(s) {
    return String(s).replace(/[&<>"']/g, function (c) {
      return {'&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;'}[c];
    });
  }
  // Series ids are "xUnit;yUnit;index", set by the report generator.
  function units(p) {
    var u = String(p.seriesId || '').split(';');
    return {x: u[0], y: u[1]};
  }
  // Axis tooltip: the axis value as a heading, then one line per series
  // with its unit. along is the axis the pointer follows ('x' or 'y').
  function tip(along) {
    return function (params) {
      if (!Array.isArray(params)) { params = [params]; }
      var head = '', rows = [];
      params.forEach(function (p) {
        if (p.seriesType === 'custom') { return; }
        var u = units(p), v = Array.isArray(p.value) ? p.value : [NaN, NaN];
        if (!head) { head = fmt(along === 'y' ? u.y : u.x, Number(p.axisValue)); }
        var val = along === 'y' ? v[0] : v[1];
        rows.push(p.marker + esc(p.seriesName) + ': <b>' + esc(fmt(along === 'y' ? u.x : u.y, val)) + '</b>');
      });
      return '<div style="margin-bottom:2px;color:#506d7d">' + esc(head) + '</div>' + rows.join('<br>');
    };
  }
  // renderItem of the min/max band. Each data item holds the low and the
  // high point of one position: [xLow, yLow, xHigh, yHigh]. The first item
  // draws the whole band as one polygon per run of finite points (low
  // points forward, high points back), so the band has no seams; the
  // other items draw nothing.
  function band(params, api) {
    if (params.dataIndexInside !== 0) { return null; }
    var polys = [], lo = [], hi = [];
    function flush() {
      if (lo.length > 1) {
        polys.push({type: 'polygon', shape: {points: lo.concat(hi.reverse())},
          style: {fill: api.visual('color')}, silent: true});
      }
      lo = []; hi = [];
    }
    for (var i = 0; i < params.dataInsideLength; i++) {
      var v = [api.value(0, i), api.value(1, i), api.value(2, i), api.value(3, i)];
      if (!v.every(isFinite)) { flush(); continue; }
      lo.push(api.coord([v[0], v[1]]));
      hi.push(api.coord([v[2], v[3]]));
    }
    flush();
    // Clip to the plot area: a zoomed axis must not let the band spill
    // over the axes and the legend.
    var cs = params.coordSys;
    return {type: 'group', children: polys,
      clipPath: {type: 'rect', shape: {x: cs.x, y: cs.y, width: cs.width, height: cs.height}}};
  }
  return {tipX: tip('x'), tipY: tip('y'), band: band};
}());

// tsStart draws every chart into its fixed-size box. The canvas has at
// least two pixels per CSS pixel so that the charts stay sharp when the
// print stylesheet scales them to the page width.
function tsStart(list) {
  'use strict';
  if (typeof echarts === 'undefined') { return; }
  var ratio = Math.max(window.devicePixelRatio || 1, 2);
  list.forEach(function (c) {
    var el = document.getElementById(c.id);
    if (!el) { return; }
    var chart = echarts.init(el, null, {renderer: 'canvas', devicePixelRatio: ratio});
    chart.setOption(c.option);
  });
}
