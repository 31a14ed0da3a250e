/* undercurrent report script: draws the charts from UC_CHARTS, sorts the overview table,
   filters themes and examples. It reads the page and never writes markup from data: all
   text changes go through textContent. */
(function () {
  "use strict";
  // The chart options are data in a JSON block, not code.
  var UC_CHARTS = JSON.parse(document.getElementById("uc-charts").textContent);
  var drawn = [];
  var byID = {};
  // Charts are drawn in slices of about 40 ms after the first paint, so that the text of
  // the page shows at once and stays responsive while a large report draws.
  function drawCharts() {
    var t0 = performance.now(), next = 0;
    function slice() {
      var start = performance.now();
      while (next < UC_CHARTS.length && performance.now() - start < 40) {
        var spec = UC_CHARTS[next++];
        var el = document.getElementById(spec.ID);
        if (!el) { continue; }
        var chart = echarts.init(el, null, { renderer: "canvas" });
        chart.setOption(spec.Option);
        drawn.push(chart);
        byID[spec.ID] = chart;
      }
      if (next < UC_CHARTS.length) { setTimeout(slice, 0); return; }
      window.__ucDrawMillis = performance.now() - t0;
      window.__ucChartsDrawn = drawn.length;
      document.documentElement.setAttribute("data-charts", String(drawn.length));
    }
    requestAnimationFrame(function () { setTimeout(slice, 0); });
  }
  function resizeAll() {
    for (var i = 0; i < drawn.length; i++) { drawn[i].resize(); }
  }

  function resizeWithin(el) {
    var cs = el.querySelectorAll(".uc-chart");
    for (var i = 0; i < cs.length; i++) { if (byID[cs[i].id]) { byID[cs[i].id].resize(); } }
  }

  function cellValue(row, col, type) {
    var cell = row.cells[col];
    var v = cell.getAttribute("data-v");
    if (v === null) { v = cell.textContent; }
    if (type === "num") { var f = parseFloat(v); return isNaN(f) ? -Infinity : f; }
    return v.toLowerCase();
  }
  function setupSort(table) {
    var buttons = table.querySelectorAll("thead button");
    for (var i = 0; i < buttons.length; i++) {
      buttons[i].addEventListener("click", function (ev) {
        var b = ev.currentTarget;
        var col = parseInt(b.getAttribute("data-col"), 10);
        var type = b.getAttribute("data-type");
        var dir = b.getAttribute("data-dir") === "asc" ? "desc" : "asc";
        for (var j = 0; j < buttons.length; j++) { buttons[j].removeAttribute("data-dir"); }
        b.setAttribute("data-dir", dir);
        var body = table.tBodies[0];
        var rows = Array.prototype.slice.call(body.rows);
        rows.sort(function (x, y) {
          var a = cellValue(x, col, type), c = cellValue(y, col, type);
          var r = a < c ? -1 : a > c ? 1 : 0;
          if (r === 0) { r = parseInt(x.getAttribute("data-theme"), 10) - parseInt(y.getAttribute("data-theme"), 10); }
          return dir === "asc" ? r : -r;
        });
        for (var k = 0; k < rows.length; k++) { body.appendChild(rows[k]); }
      });
    }
  }

  function setupSearch() {
    var input = document.getElementById("uc-search");
    var count = document.getElementById("uc-search-count");
    var none = document.getElementById("uc-none");
    var themes = document.querySelectorAll(".uc-theme");
    var rows = document.querySelectorAll("#uc-glance tbody tr");
    var heads = [];
    for (var i = 0; i < themes.length; i++) {
      var th = themes[i];
      var head = th.querySelector(".uc-theme-head").textContent + " " + th.querySelector(".uc-words").textContent;
      var desc = th.querySelectorAll(":scope > p");
      for (var d = 0; d < desc.length; d++) { head += " " + desc[d].textContent; }
      heads.push(head.toLowerCase());
    }
    function apply() {
      var q = input.value.trim().toLowerCase();
      var shown = 0, visible = {}, exMatched = 0;
      for (var i = 0; i < themes.length; i++) {
        var th = themes[i];
        var exs = th.querySelectorAll(".uc-example");
        var headHit = q === "" || heads[i].indexOf(q) >= 0;
        var exHits = 0;
        for (var e = 0; e < exs.length; e++) {
          var hit = q === "" || exs[e].textContent.toLowerCase().indexOf(q) >= 0;
          if (hit) { exHits++; exMatched++; }
          exs[e].hidden = !(hit || headHit);
        }
        var show = headHit || exHits > 0;
        var was = th.hidden;
        th.hidden = !show;
        if (was && show) { resizeWithin(th); }
        if (show) { shown++; visible[th.getAttribute("data-theme")] = true; }
      }
      for (var r = 0; r < rows.length; r++) { rows[r].hidden = !visible[rows[r].getAttribute("data-theme")]; }
      count.textContent = shown + " of " + themes.length + " themes shown" +
        (q === "" ? "" : "; " + exMatched + " example" + (exMatched === 1 ? "" : "s") + " contain it");
      none.hidden = shown > 0;
    }
    input.addEventListener("input", apply);
    apply();
  }

  window.addEventListener("resize", resizeAll);
  window.addEventListener("beforeprint", function () {
    var ds = document.querySelectorAll("details");
    for (var i = 0; i < ds.length; i++) { ds[i].open = true; }
    resizeAll();
  });
  drawCharts();
  var tables = document.querySelectorAll(".uc-sortable");
  for (var i = 0; i < tables.length; i++) { setupSort(tables[i]); }
  setupSearch();
})();

