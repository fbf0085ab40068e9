{% raw %}
(function () {
  "use strict";
  // The front page is static HTML. Player and team pages are page documents (drift/report/_bundle.py)
  // in report-data/*.js, added as <script> elements when one is asked for: no server, no network.
  var SHARED = JSON.parse(document.getElementById("drift-shared").textContent);
  var ROLES = SHARED.roles, COLUMNS = SHARED.columns, NOTES = SHARED.notes, DATA = SHARED.data;
  var STATUS_ORDER = {changed: 0, unsettled: 1, shifted: 2, steady: 3};
  var NS = "http://www.w3.org/2000/svg";
  var where = {}, entries = [], pages = {}, loading = {}, view = document.getElementById("page-view");
  var indexState = "loading";

  function el(tag, cls, text) {
    var e = document.createElement(tag);
    if (cls) { e.className = cls; }
    if (text !== undefined && text !== null) { e.textContent = String(text); }
    return e;
  }
  function svg(tag, attrs) {
    var e = document.createElementNS(NS, tag);
    Object.keys(attrs || {}).forEach(function (k) { e.setAttribute(k, attrs[k]); });
    return e;
  }

  // ---- cells and blocks (the vocabulary of drift/report/__cells.py and _bundle.py) ----
  function chip(id, named) {
    var role = ROLES[id] || [id, ""], s = el("span", "role " + role[1], id);
    if (named === false) { s.title = role[0]; } else { s.appendChild(document.createTextNode(" ")); s.appendChild(el("small", "", role[0])); }
    return s;
  }
  function cell(c) {
    if (c === null || c === undefined) { return document.createTextNode(""); }
    if (typeof c !== "object") { return document.createTextNode(String(c)); }
    var k = c[0], f = document.createDocumentFragment(), s;
    if (k === "r") { f.appendChild(chip(c[1])); if (c[2]) { f.appendChild(el("span", "note", " " + c[2])); } }
    else if (k === "rr") {
      f.appendChild(chip(c[1])); f.appendChild(el("span", "note", " " + c[2] + " → "));
      f.appendChild(chip(c[3])); f.appendChild(el("span", "note", " " + c[4]));
    }
    else if (k === "s") { f.appendChild(el("span", "status " + c[1], c[1])); }
    else if (k === "a") {
      if (c[2]) { s = el("a", "", c[1]); s.href = "#" + c[2]; f.appendChild(s); } else { f.appendChild(document.createTextNode(c[1])); }
    }
    else if (k === "w") { s = el("span", "words", c[1]); s.title = c[2]; f.appendChild(s); }
    else if (k === "t") { f.appendChild(document.createTextNode(c[1])); if (c[2]) { f.appendChild(el("span", "tag", " " + c[2])); } }
    else if (k === "n") { f.appendChild(el("span", "note", c[1])); }
    else if (k === "b") { f.appendChild(el("b", "", c[1])); }
    else if (k === "bar") { s = el("i"); s.style.setProperty("--p", c[1] + "%"); f.appendChild(s); f.appendChild(document.createTextNode(c[2])); }
    else if (k === "m") { for (var i = 1; i < c.length; i++) { f.appendChild(cell(c[i])); } }
    return f;
  }
  function table(columns, rows) {
    var box = el("div", "scroll"), t = el("table", "data"), head = el("thead"), tr = el("tr"), body = el("tbody");
    (COLUMNS[columns] || columns).forEach(function (name) { tr.appendChild(el("th", "", name)); });
    head.appendChild(tr); t.appendChild(head);
    rows.forEach(function (row) {
      var r = el("tr");
      row.forEach(function (c) {
        var td = el("td", typeof c === "number" ? "n" : "");
        if (c && c[0] === "s") { td.setAttribute("data-v", STATUS_ORDER[c[1]]); }
        if (c && c[0] === "m" && c[1] && c[1][0] === "s") { td.setAttribute("data-v", STATUS_ORDER[c[1][1]]); }
        td.appendChild(cell(c)); r.appendChild(td);
      });
      body.appendChild(r);
    });
    t.appendChild(body); box.appendChild(t);
    sortable(t);
    return box;
  }
  function legend() {
    var p = el("p", "legend note");
    Object.keys(ROLES).forEach(function (id) { p.appendChild(chip(id)); p.appendChild(document.createTextNode(" ")); });
    return p;
  }
  function map(points, alt) {
    var box = el("div", "pathbox"), s = svg("svg", {"class": "path", viewBox: "0 0 320 220", role: "img", "aria-label": alt});
    var t = svg("title"); t.textContent = alt; s.appendChild(t);
    var use = svg("use", {href: "#rolemap"}); s.appendChild(use);
    s.appendChild(svg("polyline", {points: points.map(function (p) { return p[0] + "," + p[1]; }).join(" "),
                                   fill: "none", stroke: "#111", "stroke-width": "1.2"}));
    points.forEach(function (p, i) {
      var last = i === points.length - 1, dx = p[2] + 5 - p[0], dy = p[3] - 3 - p[1];
      if (dx * dx + dy * dy > 15 * 15) {  // a label set apart from a crowded marker gets a leader line
        s.appendChild(svg("line", {x1: p[0], y1: p[1], x2: p[2], y2: p[3] - 3, stroke: "#999", "stroke-width": "0.5"}));
      }
      var c = svg("circle", {cx: p[0], cy: p[1], r: last ? 4.5 : 3, fill: last ? "#111" : "#fff", stroke: "#111"});
      var tt = svg("title"); tt.textContent = p[5]; c.appendChild(tt); s.appendChild(c);
      var label = svg("text", {x: p[2], y: p[3], "font-size": "8", fill: "#111"}); label.textContent = p[4];
      s.appendChild(label);
    });
    box.appendChild(s); box.appendChild(legend());
    return box;
  }
  function mix(rows) {
    var box = el("div");
    rows.forEach(function (m) {
      var row = el("div", "mixrow"), bar = el("div", "mix"), words = [];
      row.appendChild(el("strong", "", m[0]));
      m[2].forEach(function (r) {
        var name = (ROLES[r[0]] || [r[0]])[0], s = el("span", (ROLES[r[0]] || ["", ""])[1], r[1] >= 8 ? r[0] : "");
        s.style.width = r[1] + "%"; s.title = r[0] + " " + name + ": " + r[2];
        bar.appendChild(s); words.push(r[0] + " " + r[2]);
      });
      bar.setAttribute("role", "img");
      bar.setAttribute("aria-label", m[0] + " role mix: " + m[2].map(function (r) { return r[0] + " " + (ROLES[r[0]] || [""])[0] + " " + r[2]; }).join("; "));
      row.appendChild(bar);
      row.appendChild(el("span", "note", m[1] + " players · " + words.join(", ")));
      box.appendChild(row);
    });
    box.appendChild(legend());
    return box;
  }
  function blocks(list, into) {
    list.forEach(function (b) {
      var k = b[0], e;
      if (k === "h3" || k === "h4") { e = el(k, "", b[1]); }
      else if (k === "note") { e = el("p", "note", b[1].charAt(0) === "#" ? NOTES[b[1].slice(1)] : b[1]); }
      else if (k === "p") { e = el("p"); b[1].forEach(function (c) { e.appendChild(cell(c)); }); }
      else if (k === "table") { e = table(b[1], b[2]); }
      else if (k === "grid") { e = el("div", "grid2"); [b[1], b[2]].forEach(function (side) { var s = el("section"); blocks(side, s); e.appendChild(s); }); }
      else if (k === "details") { e = el("details"); e.appendChild(el("summary", "", b[1])); blocks(b[2], e); }
      else if (k === "map") { e = map(b[1], b[2]); }
      else if (k === "mix") { e = mix(b[1]); }
      if (e) { into.appendChild(e); }
    });
  }
  function render(anchor, doc) {
    var a = el("article", "page " + doc.kind), back = el("a", "back", "← back to the review"), h = el("h2", "", doc.title);
    a.id = anchor;
    a.setAttribute("aria-label", doc.kind + " page: " + doc.title);
    back.href = "#review";
    a.appendChild(back);
    if (doc.sub) { h.appendChild(document.createTextNode(" ")); h.appendChild(el("span", "who", doc.sub)); }
    a.appendChild(h);
    blocks(doc.blocks, a);
    return a;
  }

  // ---- routing: #p-... and #t-... open a page, anything else the front page ----
  function say(text) { view.textContent = ""; view.appendChild(el("p", "note loading", text)); }
  function route() {
    var id = decodeURIComponent(location.hash.slice(1)), spot = where[id];
    if (!/^[pt]-/.test(id) || (!spot && indexState === "failed")) {
      document.body.classList.remove("paging");
      if (/^[pt]-/.test(id)) { document.body.classList.add("paging"); say("This page's index (" + DATA + "/index.js) did not load: keep report.html beside its " + DATA + " folder."); }
      return;
    }
    document.body.classList.add("paging");
    if (!spot) { say(indexState === "loading" ? "Loading…" : "No page " + id + " in this report."); return; }
    var file = spot[0] + spot[1];
    if (pages[id]) { view.textContent = ""; view.appendChild(render(id, pages[id])); window.scrollTo(0, 0); return; }
    say("Loading…");
    if (!loading[file]) {
      loading[file] = true;
      var s = document.createElement("script");
      s.src = DATA + "/" + file + ".js";
      s.onerror = function () { loading[file] = false; say("Could not read " + DATA + "/" + file + ".js: keep report.html beside its " + DATA + " folder."); };
      document.body.appendChild(s);
    }
  }
  function bisect(starts, i) { var lo = 0; while (lo + 1 < starts.length && starts[lo + 1] <= i) { lo++; } return lo; }
  window.DRIFT = {
    index: function (data) {
      var n = 0;
      data.players.forEach(function (p, i) {
        var anchor = p[3] || "p-" + p[1];
        while (n + 1 < data.pstarts.length && data.pstarts[n + 1] <= i) { n++; }
        where[anchor] = ["p", n];
        entries.push([p[0] + " · " + p[2], anchor, [p[0].toLowerCase(), String(p[1]).toLowerCase()]]);
      });
      data.teams.forEach(function (t, i) {
        var anchor = t[1] || "t-" + t[0];
        where[anchor] = ["t", bisect(data.tstarts, i)];
        entries.push(["team " + t[0] + " (team page)", anchor, [t[0].toLowerCase(), ("team " + t[0]).toLowerCase()]]);
      });
      indexState = "ready";
      search();
      route();
    },
    pages: function (kind, n, docs) {
      Object.keys(docs).forEach(function (k) { pages[k] = docs[k]; });
      route();
    },
    missing: function () { indexState = "failed"; search(); route(); }
  };
  window.addEventListener("hashchange", route);

  // ---- search: players and teams from the index; exact keys first; says how many more match ----
  var box = document.getElementById("q"), list = document.getElementById("q-results"), SHOWN = 12;
  function item(text, href) {
    var li = el("li");
    if (href) { var a = el("a", "", text); a.href = href; li.appendChild(a); } else { li.className = "note"; li.textContent = text; }
    list.appendChild(li);
  }
  function search() {
    var term = box.value.trim().toLowerCase();
    list.textContent = "";
    if (!term) { list.hidden = true; return; }
    if (indexState !== "ready") {
      item(indexState === "loading" ? "the index is loading…" : "the search index (" + DATA + "/index.js) did not load", null);
      list.hidden = false; return;
    }
    var exact = [], partial = [];
    for (var i = 0; i < entries.length; i++) {
      if (entries[i][2].indexOf(term) !== -1) { exact.push(entries[i]); }
      else if (entries[i][0].toLowerCase().indexOf(term) !== -1) { partial.push(entries[i]); }
    }
    var all = exact.concat(partial);
    all.slice(0, SHOWN).forEach(function (e) { item(e[0], "#" + e[1]); });
    if (!all.length) { item("no player or team matches", null); }
    else if (all.length > SHOWN) { item((all.length - SHOWN).toLocaleString("en") + " more match: type more of the name", null); }
    list.hidden = false;
  }
  box.addEventListener("input", search);
  box.addEventListener("keydown", function (e) {
    var first = list.querySelector("a");
    if (e.key === "Enter" && first) { e.preventDefault(); location.hash = first.getAttribute("href"); list.hidden = true; }
    if (e.key === "Escape") { list.hidden = true; }
  });
  list.addEventListener("click", function () { list.hidden = true; });

  // ---- sorting: any column of any data table; numbers sort as numbers (data-v holds the exact value) ----
  function key(c) {
    var raw = c.hasAttribute("data-v") ? c.getAttribute("data-v") : c.textContent.trim();
    var plain = raw.replace(/[,%<>]/g, "").replace("\u2212", "-");
    return /^[-+]?\d*\.?\d+(e[-+]?\d+)?$/i.test(plain) ? parseFloat(plain) : raw.toLowerCase();
  }
  function sortBy(t, col, th) {
    var down = th.getAttribute("aria-sort") === "ascending";
    t.querySelectorAll("th").forEach(function (h) { h.setAttribute("aria-sort", "none"); });
    th.setAttribute("aria-sort", down ? "descending" : "ascending");
    var body = t.tBodies[0], rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (a, b) {
      var x = key(a.cells[col]), y = key(b.cells[col]);
      if (typeof x !== typeof y) { x = String(x); y = String(y); }
      var c = x < y ? -1 : x > y ? 1 : 0;
      return down ? -c : c;
    });
    rows.forEach(function (r) { body.appendChild(r); });
  }
  function sortable(t) {
    t.querySelectorAll("thead th").forEach(function (th, col) {
      th.tabIndex = 0;
      th.setAttribute("aria-sort", "none");
      th.addEventListener("click", function () { sortBy(t, col, th); });
      th.addEventListener("keydown", function (e) { if (e.key === "Enter") { sortBy(t, col, th); } });
    });
  }
  document.querySelectorAll("table.data").forEach(sortable);

  // ---- filters: one select per row attribute with more than one value; the counter says what it counts ----
  var KEYS = [["team", "every team"], ["role", "every role"], ["pair", "every season pair"],
              ["status", "every status"], ["traded", "traded or not"]];
  document.querySelectorAll(".filters[data-table]").forEach(function (bar) {
    var t = document.getElementById(bar.getAttribute("data-table"));
    if (!t || !t.tBodies.length) { return; }
    var rows = Array.prototype.slice.call(t.tBodies[0].rows), selects = [];
    var total = parseInt(t.getAttribute("data-total") || rows.length, 10), what = t.getAttribute("data-what") || "rows";
    var count = el("span", "note count");
    KEYS.forEach(function (k) {
      var seen = {};
      rows.forEach(function (r) {
        (r.getAttribute("data-" + k[0]) || "").split("|").forEach(function (v) { if (v) { seen[v] = true; } });
      });
      var values = Object.keys(seen).sort();
      if (values.length < 2) { return; }
      var sel = el("select");
      sel.setAttribute("aria-label", "filter by " + k[0]);
      sel.setAttribute("data-key", k[0]);
      [""].concat(values).forEach(function (v) {
        var o = el("option", "", v ? (k[0] === "role" && ROLES[v] ? v + " " + ROLES[v][0] : v) : k[1]); o.value = v; sel.appendChild(o);
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
      var f = function (n) { return n.toLocaleString("en"); };
      count.textContent = total > rows.length
        ? f(shown) + " shown of the " + f(rows.length) + " " + what + " listed here (" + f(total) + " in all)"
        : f(shown) + " of " + f(rows.length) + " " + what;
    }
    apply();
  });

  // ---- printing: collapsed blocks open for the paper, and close again afterwards ----
  var closed = [];
  window.addEventListener("beforeprint", function () {
    closed = Array.prototype.filter.call(document.querySelectorAll("details"), function (d) { return !d.open; });
    closed.forEach(function (d) { d.open = true; });
  });
  window.addEventListener("afterprint", function () {
    closed.forEach(function (d) { d.open = false; });
    closed = [];
  });
  route();
})();
{% endraw %}
