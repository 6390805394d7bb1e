/**
 * The stylesheet and the script that `html.ts` inlines into report.html. They are plain text, not
 * modules: the page must work from a file, offline, under a Content-Security-Policy that allows only
 * these two blocks (by hash). The script reads the findings from the page's JSON data block and
 * writes every string from it with `textContent`; it never parses data as markup, and only
 * `http:`/`https:` IRIs become links.
 *
 * Rules for editing the script: no backticks and no `${` (it sits in a template literal), no
 * `</script` and no `<!--` (the HTML parser would end or bend the block), no `innerHTML`.
 */

export const REPORT_STYLES = String.raw`
:root {
  --paper: #f7f5ef; --panel: #fffdf8; --ink: #1f2633; --muted: #5b6472; --rule: #d9d3c4;
  --accent: #1d5e6b; --accent-ink: #f7f5ef; --ochre: #9a6a12; --brick: #a23b2a; --slate: #3b5578;
  --focus: #c77d00; --bar: #1d5e6b; --bar-low: #a23b2a;
  color-scheme: light dark;
}
@media (prefers-color-scheme: dark) {
  :root {
    --paper: #161a20; --panel: #1e232b; --ink: #e8e4da; --muted: #a3abb7; --rule: #343b46;
    --accent: #4fa3b3; --accent-ink: #10141a; --ochre: #e0a84a; --brick: #ef7f6b; --slate: #8fb0dc;
    --focus: #ffb84d; --bar: #4fa3b3; --bar-low: #ef7f6b;
  }
}
* { box-sizing: border-box; }
html { background: var(--paper); color: var(--ink); font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, Ubuntu, sans-serif; }
body { margin: 0; }
.masthead { background: var(--accent); color: var(--accent-ink); padding: 1.1rem 2rem 0.9rem; }
.masthead h1 { margin: 0; font-size: 1.45rem; letter-spacing: 0.02em; }
.masthead p { margin: 0.2rem 0 0; opacity: 0.9; font-size: 0.9rem; }
main { max-width: 84rem; margin: 0 auto; padding: 1rem 2rem 3rem; }
section { margin: 1.6rem 0; }
h2 { font-size: 1.1rem; margin: 0 0 0.6rem; padding-left: 0.6rem; border-left: 4px solid var(--ochre); }
h3 { font-size: 0.95rem; margin: 0.8rem 0 0.4rem; }
.caveat { background: var(--panel); border: 1px solid var(--rule); border-left: 6px solid var(--ochre); padding: 0.7rem 1rem; }
.caveat p { margin: 0.3rem 0; }
.tiles { display: grid; grid-template-columns: repeat(auto-fill, minmax(10.5rem, 1fr)); gap: 0.6rem; }
.tile { background: var(--panel); border: 1px solid var(--rule); padding: 0.6rem 0.8rem; }
.tile .n { font-size: 1.5rem; font-weight: 650; font-variant-numeric: tabular-nums; display: block; }
.tile .l { color: var(--muted); font-size: 0.85rem; }
.sev-error { color: var(--brick); } .sev-warning { color: var(--ochre); } .sev-note { color: var(--slate); }
.gate { padding: 0.6rem 0.9rem; border: 1px solid var(--rule); background: var(--panel); }
.gate.failed { border-left: 6px solid var(--brick); } .gate.passed { border-left: 6px solid var(--accent); }
.gate ul { margin: 0.3rem 0 0; }
table { border-collapse: collapse; width: 100%; background: var(--panel); }
th, td { text-align: left; vertical-align: top; padding: 0.3rem 0.5rem; border-bottom: 1px solid var(--rule); }
th { font-size: 0.85rem; color: var(--muted); font-weight: 600; white-space: nowrap; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
.mono, .term, .hash { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; font-size: 0.85rem; }
.hash { word-break: break-all; }
.term { overflow-wrap: anywhere; }
.term.lit { color: var(--slate); }
.term.bnode { color: var(--muted); }
a { color: var(--accent); }
.scroll { overflow-x: auto; }
.kv { display: grid; grid-template-columns: max-content 1fr; gap: 0.15rem 1rem; margin: 0; }
.kv dt { color: var(--muted); } .kv dd { margin: 0; overflow-wrap: anywhere; }
.hist svg { width: 100%; max-width: 46rem; height: auto; display: block; }
.hist .bar { fill: var(--bar); } .hist .bar.low { fill: var(--bar-low); }
.hist .axis { stroke: var(--muted); stroke-width: 1; } .hist text { fill: var(--muted); font-size: 11px; }
.controls { display: flex; flex-wrap: wrap; gap: 0.5rem 1rem; align-items: end; margin-bottom: 0.5rem; }
.controls label { display: flex; flex-direction: column; font-size: 0.8rem; color: var(--muted); gap: 0.15rem; }
select, input, button { font: inherit; color: var(--ink); background: var(--panel); border: 1px solid var(--rule); padding: 0.25rem 0.45rem; border-radius: 3px; }
select { max-width: 22rem; }
input[type=search] { min-width: 16rem; }
button { cursor: pointer; }
button:hover { border-color: var(--accent); }
button:disabled { opacity: 0.45; cursor: default; }
:focus-visible { outline: 3px solid var(--focus); outline-offset: 1px; }
th button { border: 0; background: none; padding: 0; font-weight: 600; color: inherit; }
th[aria-sort=ascending] button::after { content: " \2191"; }
th[aria-sort=descending] button::after { content: " \2193"; }
.expand { width: 1.8rem; padding: 0 0.2rem; line-height: 1.2; }
.expand[aria-expanded=true] { background: var(--accent); color: var(--accent-ink); }
tr.detail > td { background: var(--paper); padding: 0.6rem 1rem 0.9rem 2.6rem; }
tr.detail h4 { margin: 0.5rem 0 0.2rem; font-size: 0.85rem; color: var(--muted); }
tr.detail pre { white-space: pre-wrap; overflow-wrap: anywhere; margin: 0; font-size: 0.8rem; }
.badge { display: inline-block; padding: 0 0.35rem; border-radius: 2px; font-size: 0.8rem; font-weight: 600; border: 1px solid currentColor; }
.pager { display: flex; gap: 0.4rem; align-items: center; margin-top: 0.6rem; flex-wrap: wrap; }
.status { color: var(--muted); margin: 0.2rem 0 0.4rem; }
.vh { position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0 0 0 0); white-space: nowrap; }
.empty { color: var(--muted); font-style: italic; }
@media print {
  html { background: #fff; color: #000; font-size: 11pt; }
  .masthead { background: none; color: #000; border-bottom: 2px solid #000; padding: 0 0 0.4rem; }
  main { max-width: none; padding: 0; }
  .controls, .pager, .expand, .noprint { display: none !important; }
  table, .tile, .caveat, .gate { background: none; }
  tr, .tile { break-inside: avoid; }
  a { color: #000; text-decoration: none; }
  .hist .bar { fill: #555; } .hist .bar.low { fill: #000; }
}
`;

export const REPORT_SCRIPT = String.raw`
(function () {
  'use strict';
  var raw = document.getElementById('plumb-data');
  var D = JSON.parse(raw ? raw.textContent : '{"findings":[]}');
  var F = D.findings || [];
  var N = F.length;
  var SEV = { error: 0, warning: 1, note: 2 };
  var KIND = { syntax: 0, violation: 1, suspect: 2 };
  var state = { kind: '', sev: '', check: '', pred: '', q: '', key: 'order', dir: 1, page: 0, size: 100 };
  var open = new Set();
  var sortedCache = { key: 'order', dir: 1, order: null };
  var view = null;
  var haystack = null;

  function byId(id) { return document.getElementById(id); }
  function el(tag, cls, text) {
    var e = document.createElement(tag);
    if (cls) e.className = cls;
    if (text !== undefined && text !== null) e.textContent = String(text);
    return e;
  }
  function cut(s, max) {
    s = String(s);
    return s.length > max ? s.slice(0, max) + '\u2026 (' + (s.length - max) + ' more characters)' : s;
  }
  function safeUrl(s) {
    if (!/^https?:\/\//i.test(s) || /[\s"<>\\^{|}]/.test(s)) return null;
    try {
      var u = new URL(s);
      return u.protocol === 'http:' || u.protocol === 'https:' ? u.href : null;
    } catch (e) { return null; }
  }
  function term(key, max) {
    var wrap = el('bdi', 'term');
    if (key === undefined || key === null || key === '') { wrap.textContent = '\u2014'; return wrap; }
    var text = cut(key, max);
    if (key.charAt(0) === '"') { wrap.className = 'term lit'; wrap.textContent = text; return wrap; }
    if (key.slice(0, 2) === '_:') { wrap.className = 'term bnode'; wrap.textContent = text; return wrap; }
    var href = safeUrl(key);
    if (href) {
      var a = el('a', 'iri', text);
      a.setAttribute('href', href);
      a.setAttribute('rel', 'noopener noreferrer');
      wrap.appendChild(a);
    } else {
      wrap.className = 'term iri';
      wrap.textContent = text;
    }
    return wrap;
  }
  function share(x) { return typeof x === 'number' ? x.toFixed(3) : '\u2013'; }
  function where(f) { return f.f ? f.f + ':' + f.l + (f.n !== undefined ? ':' + f.n : '') : ''; }

  // Sorting: one comparator per column; ties keep the report's own (ranked) order.
  var KEYS = {
    order: function (i) { return i; },
    severity: function (i) { return SEV[F[i].v]; },
    kind: function (i) { return KIND[F[i].k]; },
    check: function (i) { return F[i].c; },
    subject: function (i) { return F[i].s; },
    predicate: function (i) { return F[i].p; },
    object: function (i) { return F[i].o; },
    plausibility: function (i) { return F[i].x; },
    source: function (i) { return F[i].f ? F[i].f : undefined; }
  };
  function sortedOrder() {
    if (sortedCache.order && sortedCache.key === state.key && sortedCache.dir === state.dir) return sortedCache.order;
    var order = new Array(N);
    for (var i = 0; i < N; i++) order[i] = i;
    if (state.key !== 'order' || state.dir !== 1) {
      var get = KEYS[state.key];
      var vals = new Array(N);
      for (var j = 0; j < N; j++) vals[j] = get(j);
      var dir = state.dir;
      var line = state.key === 'source';
      order.sort(function (a, b) {
        var va = vals[a], vb = vals[b];
        if (va === undefined || vb === undefined) {
          if (va === undefined && vb === undefined) return a - b;
          return va === undefined ? 1 : -1;
        }
        if (va < vb) return -dir;
        if (va > vb) return dir;
        if (line) { var d = (F[a].l || 0) - (F[b].l || 0); if (d !== 0) return d * dir; }
        return a - b;
      });
    }
    sortedCache = { key: state.key, dir: state.dir, order: order };
    return order;
  }
  function hay(i) {
    if (!haystack) {
      haystack = new Array(N);
      for (var j = 0; j < N; j++) {
        var f = F[j];
        haystack[j] = (f.s + '\n' + f.p + '\n' + f.o + '\n' + (f.g || '') + '\n' + f.m + '\n' + f.c + '\n' + where(f)).toLowerCase();
      }
    }
    return haystack[i];
  }
  function compute() {
    var order = sortedOrder();
    var q = state.q.toLowerCase();
    if (!state.kind && !state.sev && !state.check && !state.pred && !q) { view = order; return; }
    var out = [];
    for (var n = 0; n < order.length; n++) {
      var i = order[n], f = F[i];
      if (state.kind && f.k !== state.kind) continue;
      if (state.sev && f.v !== state.sev) continue;
      if (state.check && f.c !== state.check) continue;
      if (state.pred && f.p !== state.pred) continue;
      if (q && hay(i).indexOf(q) < 0) continue;
      out.push(i);
    }
    view = out;
  }

  function evidenceValue(v) {
    if (typeof v === 'string') return /^https?:\/\//i.test(v) ? term(v, 2000) : el('span', null, cut(v, 2000));
    if (v === null || typeof v !== 'object') return el('span', 'mono', String(v));
    if (Array.isArray(v) && v.every(function (x) { return x === null || typeof x !== 'object'; })) {
      return el('span', 'mono', cut(v.map(String).join(', '), 2000));
    }
    return el('pre', null, cut(JSON.stringify(v, null, 2), 5000));
  }
  function alternativesList(alts) {
    var ol = el('ol', 'alts');
    alts.slice(0, 50).forEach(function (a) {
      var li = el('li');
      if (typeof a === 'string') li.appendChild(term(a, 500));
      else if (a && typeof a === 'object') {
        var t = a.term || a.object || a.subject || a.value || a.key;
        if (typeof t === 'string') li.appendChild(term(t, 500));
        Object.keys(a).sort().forEach(function (k) {
          if (a[k] === t) return;
          li.appendChild(document.createTextNode(' '));
          li.appendChild(el('span', 'mono', k + ' ' + (typeof a[k] === 'number' ? (Number.isInteger(a[k]) ? a[k] : a[k].toFixed(3)) : cut(JSON.stringify(a[k]), 200))));
        });
      } else li.textContent = String(a);
      ol.appendChild(li);
    });
    return ol;
  }
  function detailRow(i, id) {
    var f = F[i];
    var tr = el('tr', 'detail');
    tr.id = id;
    var td = el('td');
    td.colSpan = 10;
    td.appendChild(el('h4', null, 'Message'));
    td.appendChild(el('p', null, f.m));
    td.appendChild(el('h4', null, 'Triple'));
    var dl = el('dl', 'kv');
    [['subject', f.s], ['predicate', f.p], ['object', f.o], ['graph', f.g]].forEach(function (row) {
      if (row[1] === undefined) return;
      dl.appendChild(el('dt', null, row[0]));
      var dd = el('dd');
      dd.appendChild(term(row[1], 20000));
      dl.appendChild(dd);
    });
    dl.appendChild(el('dt', null, 'source'));
    dl.appendChild(el('dd', 'mono', where(f) || 'not recorded'));
    if (f.x !== undefined) { dl.appendChild(el('dt', null, 'plausibility')); dl.appendChild(el('dd', 'mono', share(f.x))); }
    if (f.r !== undefined) { dl.appendChild(el('dt', null, 'suspect rank')); dl.appendChild(el('dd', 'mono', f.r)); }
    td.appendChild(dl);
    var ev = f.e || {};
    if (Array.isArray(ev.alternatives) && ev.alternatives.length > 0) {
      td.appendChild(el('h4', null, 'Preferred alternatives'));
      td.appendChild(alternativesList(ev.alternatives));
    }
    var keys = Object.keys(ev).filter(function (k) { return k !== 'alternatives'; }).sort();
    if (keys.length > 0) {
      td.appendChild(el('h4', null, 'Evidence'));
      var edl = el('dl', 'kv');
      keys.forEach(function (k) {
        edl.appendChild(el('dt', null, k));
        var dd = el('dd');
        dd.appendChild(evidenceValue(ev[k]));
        edl.appendChild(dd);
      });
      td.appendChild(edl);
    }
    tr.appendChild(td);
    return tr;
  }
  function row(i) {
    var f = F[i];
    var tr = el('tr');
    tr.setAttribute('data-index', String(i));
    var id = 'detail-' + i;
    var td0 = el('td');
    var b = el('button', 'expand', open.has(i) ? '\u2212' : '+');
    b.type = 'button';
    b.setAttribute('aria-expanded', open.has(i) ? 'true' : 'false');
    b.setAttribute('aria-controls', id);
    b.setAttribute('aria-label', 'Details of finding ' + (i + 1));
    b.setAttribute('data-index', String(i));
    td0.appendChild(b);
    tr.appendChild(td0);
    tr.appendChild(el('td', 'num', i + 1));
    var sev = el('td');
    sev.appendChild(el('span', 'badge sev-' + f.v, f.v));
    tr.appendChild(sev);
    tr.appendChild(el('td', null, f.k));
    tr.appendChild(el('td', 'mono', cut(f.c, 60)));
    ['s', 'p', 'o'].forEach(function (k) { var td = el('td'); td.appendChild(term(f[k], 120)); tr.appendChild(td); });
    tr.appendChild(el('td', 'num mono', share(f.x)));
    tr.appendChild(el('td', 'mono', cut(where(f), 80)));
    return tr;
  }
  function render() {
    var body = byId('rows');
    var pages = Math.max(1, Math.ceil(view.length / state.size));
    if (state.page >= pages) state.page = pages - 1;
    if (state.page < 0) state.page = 0;
    var start = state.page * state.size;
    var end = Math.min(view.length, start + state.size);
    var frag = document.createDocumentFragment();
    for (var n = start; n < end; n++) {
      var i = view[n];
      frag.appendChild(row(i));
      if (open.has(i)) frag.appendChild(detailRow(i, 'detail-' + i));
    }
    if (end === start) {
      var tr = el('tr');
      var td = el('td', 'empty', N === 0 ? 'No findings.' : 'No finding matches these filters.');
      td.colSpan = 10;
      tr.appendChild(td);
      frag.appendChild(tr);
    }
    body.replaceChildren(frag);
    byId('status').textContent = (view.length === N ? N + ' findings' : view.length + ' of ' + N + ' findings match') +
      (view.length > 0 ? '; showing ' + (start + 1) + '\u2013' + end : '');
    byId('p-info').textContent = 'Page ' + (state.page + 1) + ' of ' + pages;
    byId('p-first').disabled = byId('p-prev').disabled = state.page === 0;
    byId('p-next').disabled = byId('p-last').disabled = state.page >= pages - 1;
    var ths = document.querySelectorAll('#findings-table th[data-key]');
    for (var k = 0; k < ths.length; k++) {
      var th = ths[k];
      var sorted = th.getAttribute('data-key') === state.key && !(state.key === 'order' && state.dir === 1);
      th.setAttribute('aria-sort', sorted ? (state.dir === 1 ? 'ascending' : 'descending') : 'none');
    }
  }
  function update(resetPage) {
    if (resetPage) state.page = 0;
    compute();
    render();
  }
  function fillSelect(id, counts, order) {
    var sel = byId(id);
    var names = Object.keys(counts);
    names.sort(order || function (a, b) { return a < b ? -1 : a > b ? 1 : 0; });
    names.forEach(function (name) {
      var o = el('option', null, cut(name, 100) + ' (' + counts[name] + ')');
      o.value = name;
      sel.appendChild(o);
    });
  }
  function setup() {
    var kinds = {}, sevs = {}, checks = {}, preds = {};
    for (var i = 0; i < N; i++) {
      var f = F[i];
      kinds[f.k] = (kinds[f.k] || 0) + 1;
      sevs[f.v] = (sevs[f.v] || 0) + 1;
      checks[f.c] = (checks[f.c] || 0) + 1;
      if (f.p) preds[f.p] = (preds[f.p] || 0) + 1;
    }
    fillSelect('f-kind', kinds, function (a, b) { return (KIND[a] || 0) - (KIND[b] || 0); });
    fillSelect('f-sev', sevs, function (a, b) { return (SEV[a] || 0) - (SEV[b] || 0); });
    fillSelect('f-check', checks);
    fillSelect('f-pred', preds);
    [['f-kind', 'kind'], ['f-sev', 'sev'], ['f-check', 'check'], ['f-pred', 'pred']].forEach(function (pair) {
      byId(pair[0]).addEventListener('change', function (e) { state[pair[1]] = e.target.value; update(true); });
    });
    var timer = 0;
    byId('f-q').addEventListener('input', function (e) {
      var value = e.target.value;
      clearTimeout(timer);
      timer = setTimeout(function () { state.q = value; update(true); }, 120);
    });
    byId('f-size').addEventListener('change', function (e) { state.size = Number(e.target.value) || 100; update(true); });
    byId('f-reset').addEventListener('click', function () {
      ['f-kind', 'f-sev', 'f-check', 'f-pred', 'f-q'].forEach(function (id) { byId(id).value = ''; });
      state.kind = state.sev = state.check = state.pred = state.q = '';
      update(true);
    });
    byId('p-first').addEventListener('click', function () { state.page = 0; render(); });
    byId('p-prev').addEventListener('click', function () { state.page -= 1; render(); });
    byId('p-next').addEventListener('click', function () { state.page += 1; render(); });
    byId('p-last').addEventListener('click', function () { state.page = Number.MAX_SAFE_INTEGER; render(); });
    var heads = document.querySelectorAll('#findings-table th[data-key] button');
    for (var h = 0; h < heads.length; h++) {
      heads[h].addEventListener('click', function (e) {
        var key = e.currentTarget.parentNode.getAttribute('data-key');
        if (state.key === key) state.dir = -state.dir; else { state.key = key; state.dir = 1; }
        update(true);
      });
    }
    byId('rows').addEventListener('click', function (e) {
      var b = e.target.closest ? e.target.closest('button.expand') : null;
      if (!b) return;
      var i = Number(b.getAttribute('data-index'));
      if (open.has(i)) open.delete(i); else open.add(i);
      render();
      var again = document.querySelector('button.expand[data-index="' + i + '"]');
      if (again) again.focus();
    });
    byId('controls').hidden = false;
    byId('pager').hidden = false;
    update(true);
    document.documentElement.setAttribute('data-state', 'ready');
  }
  setup();
})();
`;
