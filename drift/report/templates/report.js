{% raw %}
(function () {
  "use strict";
  // Search: players and teams from the JSON index; results are links to their pages.
  var box = document.getElementById("q"), list = document.getElementById("q-results");
  var index = JSON.parse(document.getElementById("search-index").textContent);
  function item(text, href) {
    var li = document.createElement("li");
    if (href) { var a = document.createElement("a"); a.href = href; a.textContent = text; li.appendChild(a); }
    else { li.textContent = text; }
    list.appendChild(li);
  }
  function search() {
    var term = box.value.trim().toLowerCase();
    list.textContent = "";
    if (!term) { list.hidden = true; return; }
    // exact matches of a key (team code, player name or id) first, then any label containing the term
    var exact = [], partial = [];
    for (var i = 0; i < index.length; i++) {
      if ((index[i][3] || []).indexOf(term) !== -1) { exact.push(index[i]); }
      else if (partial.length < 12 && index[i][0].toLowerCase().indexOf(term) !== -1) { partial.push(index[i]); }
    }
    var shown = exact.concat(partial).slice(0, 12), hits = shown.length;
    shown.forEach(function (e) { item(e[0], "#" + e[1]); });
    if (!hits) { item("no player or team matches", null); }
    list.hidden = false;
  }
  box.addEventListener("input", search);
  box.addEventListener("keydown", function (e) {
    var first = list.querySelector("a");
    if (e.key === "Enter" && first) { e.preventDefault(); location.hash = first.getAttribute("href"); list.hidden = true; }
    if (e.key === "Escape") { list.hidden = true; }
  });
  list.addEventListener("click", function () { list.hidden = true; });

  // Sorting: any column of any data table; numbers sort as numbers (data-v holds the exact value).
  function key(cell) {
    var raw = cell.hasAttribute("data-v") ? cell.getAttribute("data-v") : cell.textContent.trim();
    var plain = raw.replace(/[,%<>]/g, "").replace("\u2212", "-");
    return /^[-+]?\d*\.?\d+(e[-+]?\d+)?$/i.test(plain) ? parseFloat(plain) : raw.toLowerCase();
  }
  function sortBy(table, col, th) {
    var down = th.getAttribute("aria-sort") === "ascending";
    table.querySelectorAll("th").forEach(function (h) { h.setAttribute("aria-sort", "none"); });
    th.setAttribute("aria-sort", down ? "descending" : "ascending");
    var body = table.tBodies[0], rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (a, b) {
      var x = key(a.cells[col]), y = key(b.cells[col]);
      if (typeof x !== typeof y) { x = String(x); y = String(y); }
      var c = x < y ? -1 : x > y ? 1 : 0;
      return down ? -c : c;
    });
    rows.forEach(function (r) { body.appendChild(r); });
  }
  document.querySelectorAll("table.data").forEach(function (table) {
    table.querySelectorAll("thead th").forEach(function (th, col) {
      th.tabIndex = 0;
      th.setAttribute("aria-sort", "none");
      th.addEventListener("click", function () { sortBy(table, col, th); });
      th.addEventListener("keydown", function (e) { if (e.key === "Enter") { sortBy(table, col, th); } });
    });
  });

  // Filters: one select per row attribute with more than one value; rows must match every choice.
  var KEYS = [["team", "every team"], ["role", "every role"], ["pair", "every season pair"],
              ["status", "every status"], ["traded", "traded or not"]];
  document.querySelectorAll(".filters[data-table]").forEach(function (bar) {
    var table = document.getElementById(bar.getAttribute("data-table"));
    if (!table || !table.tBodies.length) { return; }
    var rows = Array.prototype.slice.call(table.tBodies[0].rows), selects = [];
    var count = document.createElement("span");
    count.className = "note";
    KEYS.forEach(function (k) {
      var seen = {};
      rows.forEach(function (r) {
        (r.getAttribute("data-" + k[0]) || "").split("|").forEach(function (v) { if (v) { seen[v] = true; } });
      });
      var values = Object.keys(seen).sort();
      if (values.length < 2) { return; }
      var sel = document.createElement("select");
      sel.setAttribute("aria-label", "filter by " + k[0]);
      sel.setAttribute("data-key", k[0]);
      [""].concat(values).forEach(function (v) {
        var o = document.createElement("option"); o.value = v; o.textContent = v || k[1]; sel.appendChild(o);
      });
      sel.addEventListener("change", apply);
      bar.appendChild(sel);
      selects.push(sel);
    });
    bar.appendChild(count);
    function apply() {
      var shown = 0;
      rows.forEach(function (r) {
        var ok = selects.every(function (s) {
          return !s.value || (r.getAttribute("data-" + s.getAttribute("data-key")) || "").split("|").indexOf(s.value) !== -1;
        });
        r.hidden = !ok;
        if (ok) { shown++; }
      });
      count.textContent = shown + " of " + rows.length + " rows";
    }
    apply();
  });

  // Printing: every collapsed block opens, so the paper shows all rows.
  window.addEventListener("beforeprint", function () {
    document.querySelectorAll("details").forEach(function (d) { d.open = true; });
  });
})();
{% endraw %}
