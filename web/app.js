// lode's search page: talks to /api/v1 only; builds every element with
// textContent (never innerHTML), so document text cannot inject markup.
"use strict";

const $ = (id) => document.getElementById(id);
const PAGE = 10;
const DEFAULTS = { model: "bm25", k1: "1.2", b: "0.75", weighting: "lnc.ltc", title_weight: "2", body_weight: "1" };
// The metadata filters of the query syntax, each with its control (id f-NAME).
const FILTERS = ["kind", "in", "since", "until", "by", "pages"];
const state = { q: "", ...DEFAULTS, page: 1, filters: {} };
let lastResults = null;
let inflight = null;
let retune = 0;

// ---- URL <-> state: the query lives in the address, so a search can be shared.
function readUrl() {
  const u = new URLSearchParams(location.search);
  state.q = u.get("q") || "";
  state.model = u.get("model") === "tfidf" ? "tfidf" : "bm25";
  state.k1 = u.get("k1") || DEFAULTS.k1;
  state.b = u.get("b") || DEFAULTS.b;
  state.weighting = u.get("weighting") || DEFAULTS.weighting;
  state.title_weight = u.get("title_weight") || DEFAULTS.title_weight;
  state.body_weight = u.get("body_weight") || DEFAULTS.body_weight;
  state.filters = {};
  for (const f of FILTERS) if (u.get(f)) state.filters[f] = u.get(f);
  state.page = Math.max(1, parseInt(u.get("page") || "1", 10) || 1);
}

function writeUrl(push) {
  const u = new URLSearchParams();
  if (state.q) u.set("q", state.q);
  if (state.model !== "bm25") u.set("model", state.model);
  if (state.model === "bm25") {
    if (state.k1 !== DEFAULTS.k1) u.set("k1", state.k1);
    if (state.b !== DEFAULTS.b) u.set("b", state.b);
  } else if (state.weighting !== DEFAULTS.weighting) u.set("weighting", state.weighting);
  for (const w of ["title_weight", "body_weight"]) if (state[w] !== DEFAULTS[w]) u.set(w, state[w]);
  for (const f of FILTERS) if (state.filters[f]) u.set(f, state.filters[f]);
  if (state.page > 1) u.set("page", String(state.page));
  const url = "/" + (u.toString() ? "?" + u.toString() : "");
  if (url === location.pathname + location.search) return;
  if (push) history.pushState(null, "", url); else history.replaceState(null, "", url);
}

function showState() {
  $("q").value = state.q;
  for (const r of document.querySelectorAll('input[name="model"]')) r.checked = r.value === state.model;
  $("k1").value = state.k1; $("k1-out").value = Number(state.k1).toFixed(2);
  $("b").value = state.b; $("b-out").value = Number(state.b).toFixed(2);
  $("weighting").value = state.weighting;
  for (const w of ["title_weight", "body_weight"]) {
    $(w).value = state[w];
    $(w + "-out").value = Number(state[w]).toFixed(2);
  }
  for (const f of FILTERS) $("f-" + f).value = state.filters[f] || "";
  document.body.dataset.model = state.model;
}

// The query sent: the words typed plus one @name:value item per filter set.
function fullQuery() {
  const items = FILTERS.filter((f) => state.filters[f]).map((f) => "@" + f + ":" + state.filters[f].replace(/\s+/g, ""));
  return [state.q, ...items].join(" ").trim();
}

// ---- API
function apiParams(extra) {
  const p = new URLSearchParams({ q: fullQuery(), model: state.model, ...extra });
  p.set("title_weight", state.title_weight);
  p.set("body_weight", state.body_weight);
  if (state.model === "bm25") { p.set("k1", state.k1); p.set("b", state.b); }
  else p.set("weighting", state.weighting);
  return p;
}

async function getJson(path, params, signal) {
  const res = await fetch(path + "?" + params.toString(), { signal, headers: { Accept: "application/json" } });
  const body = await res.json().catch(() => ({}));
  if (!res.ok) throw new Error(body.detail || body.title || ("HTTP " + res.status));
  return body;
}

// ---- text with byte-offset marks (the API counts UTF-8 bytes)
const enc = new TextEncoder();
const dec = new TextDecoder();
function markedText(parent, text, marks) {
  const bytes = enc.encode(text);
  let at = 0;
  for (const [b, e] of marks) {
    if (b > at) parent.append(dec.decode(bytes.subarray(at, b)));
    const m = document.createElement("mark");
    m.textContent = dec.decode(bytes.subarray(b, e));
    parent.append(m);
    at = e;
  }
  if (at < bytes.length) parent.append(dec.decode(bytes.subarray(at)));
}

function el(tag, cls, text) {
  const e = document.createElement(tag);
  if (cls) e.className = cls;
  if (text !== undefined) e.textContent = text;
  return e;
}

// ---- terms and their colours, in order of first appearance on the page
function termOrder(hits) {
  const order = [];
  for (const h of hits) for (const c of h.breakdown || []) if (!order.includes(c.term)) order.push(c.term);
  return order;
}
const termClass = (order, term) => "t" + (order.indexOf(term) % 6);

function termShares(hit) {
  const by = new Map();
  for (const c of hit.breakdown || []) by.set(c.term, (by.get(c.term) || 0) + c.contribution);
  return by;
}

// The word a reader knows for an index term (the API's `words`); the
// breakdown table keeps the terms themselves, as that is analysis.
let words = {};
const wordOf = (term) => words[term] || term;

function renderLegend(order) {
  const ol = $("legend");
  ol.replaceChildren();
  for (const t of order) {
    const li = el("li", termClass(order, t));
    li.title = "index term: " + t;
    li.append(el("span", "swatch"), el("span", "", wordOf(t)));
    ol.append(li);
  }
}

const fmt = (x, d) => (typeof x === "number" ? x.toFixed(d) : String(x));

function breakdownTable(hit, order) {
  const tfidf = state.model === "tfidf";
  const heads = ["term", "field", "tf", "df", "idf", "length / avg", tfidf ? "doc weight" : "tf part",
                 tfidf ? "query weight" : "query tf", "field weight", "contribution", "share"];
  const table = el("table", "breakdown");
  const thead = el("thead");
  const hr = el("tr");
  for (const h of heads) hr.append(el("th", "", h));
  thead.append(hr);
  const tbody = el("tbody");
  for (const c of hit.breakdown) {
    const tr = el("tr");
    const term = el("td", "term");
    term.append(el("span", "swatch " + termClass(order, c.term)), el("span", "", c.term));
    tr.append(term, el("td", "", c.field), el("td", "", c.tf), el("td", "", c.df), el("td", "", fmt(c.idf, 4)),
              el("td", "", c.doc_length + " / " + fmt(c.avg_length, 1)), el("td", "", fmt(c.tf_part, 4)),
              el("td", "", fmt(c.query_weight, 4)), el("td", "", fmt(c.field_weight, 2)),
              el("td", "", fmt(c.contribution, 4)),
              el("td", "", hit.score > 0 ? Math.round((100 * c.contribution) / hit.score) + "%" : "–"));
    tbody.append(tr);
  }
  const foot = el("tfoot");
  const fr = el("tr");
  const sum = el("td", "", "sum = score");
  sum.colSpan = 9;
  fr.append(sum, el("td", "", fmt(hit.score, 4)), el("td", "", "100%"));
  foot.append(fr);
  table.append(thead, tbody, foot);
  const wrap = el("div", "table-wrap");
  wrap.append(table);
  return wrap;
}

function renderHit(hit, order) {
  const li = el("li", "hit");
  li.tabIndex = -1;
  li.dataset.doc = hit.doc;
  const rail = el("div", "rail");
  rail.append(el("span", "rank", String(hit.rank)), el("span", "score", fmt(hit.score, 3)));
  const main = el("div", "main");
  const h3 = el("h3");
  const open = el("a", "open", hit.title || hit.doc);
  open.href = "#";
  open.addEventListener("click", (ev) => { ev.preventDefault(); openDocument(hit.doc); });
  h3.append(open);
  const meta = el("p", "meta");
  meta.append(el("span", "source", hit.doc), el("span", "kind", hit.kind));
  const snippet = el("p", "snippet");
  markedText(snippet, hit.snippet.text, hit.snippet.marks);
  const bar = el("div", "shares");
  const shares = termShares(hit);
  const label = [];
  for (const [term, part] of shares) {
    const pct = hit.score > 0 ? (100 * part) / hit.score : 0;
    const seg = el("span", termClass(order, term));
    seg.style.width = pct.toFixed(2) + "%";
    seg.title = wordOf(term) + " " + pct.toFixed(0) + "%";
    bar.append(seg);
    label.push(wordOf(term) + " " + pct.toFixed(0) + "%");
  }
  bar.setAttribute("role", "img");
  bar.setAttribute("aria-label", "share of the score: " + label.join(", "));
  const why = el("button", "why", "why this rank");
  why.type = "button";
  why.setAttribute("aria-expanded", "false");
  why.addEventListener("click", () => toggleWhy(li));
  main.append(h3, meta, snippet, bar, why);
  li.append(rail, main);
  li._hit = hit;
  li._order = order;
  return li;
}

// The breakdown table is built only when asked for.
function toggleWhy(li) {
  const btn = li.querySelector("button.why");
  let box = li.querySelector(".table-wrap");
  if (box) { box.remove(); btn.setAttribute("aria-expanded", "false"); btn.textContent = "why this rank"; return; }
  box = breakdownTable(li._hit, li._order);
  li.querySelector(".main").append(box);
  btn.setAttribute("aria-expanded", "true");
  btn.textContent = "hide the breakdown";
}

function render(res) {
  lastResults = res;
  words = res.words || {};
  const hits = res.hits;
  const order = termOrder(hits);
  renderLegend(order);
  const ol = $("hits");
  ol.replaceChildren(...hits.map((h) => renderHit(h, order)));
  const first = res.offset + 1, last = res.offset + hits.length;
  const model = res.model.name === "bm25" ? `BM25 k1 ${fmt(res.model.k1, 2)} b ${fmt(res.model.b, 2)}`
                                          : `TF-IDF ${res.model.weighting}`;
  const notes = res.warnings.length ? " · " + res.warnings.join("; ") : "";
  const count = res.matched_exact ? `${res.matched}` : `at least ${res.matched}`;
  $("status").textContent = res.matched === 0 ? `No document matches (${model}).${notes}`
    : `${first}–${last} of ${count} matching documents · ${model}${notes}`;
  const pages = knownPages(res);
  $("pager").hidden = pages <= 1;
  $("page-of").textContent = res.matched_exact ? `page ${state.page} of ${pages}` : `page ${state.page}`;
  $("prev").disabled = state.page <= 1;
  $("next").disabled = state.page >= pages;
  document.body.dataset.ready = "1";
}

async function search() {
  showState();
  if (!fullQuery()) {
    $("hits").replaceChildren(); $("legend").replaceChildren(); $("pager").hidden = true;
    $("status").textContent = "Type a query and press Enter.";
    return;
  }
  if (inflight) inflight.abort();
  inflight = new AbortController();
  document.body.dataset.ready = "0";
  $("status").textContent = "Searching…";
  try {
    const params = apiParams({ top: String(PAGE), offset: String((state.page - 1) * PAGE) });
    render(await getJson("/api/v1/search", params, inflight.signal));
  } catch (e) {
    if (e.name === "AbortError") return;
    $("hits").replaceChildren(); $("legend").replaceChildren(); $("pager").hidden = true;
    $("status").textContent = "The search failed: " + e.message;
    document.body.dataset.ready = "1";
  }
}

// ---- the document reader
async function openDocument(doc) {
  const box = $("reader");
  $("reader-title").textContent = "Loading…";
  $("reader-meta").textContent = "";
  $("reader-text").replaceChildren();
  box.hidden = false;
  try {
    const d = await getJson("/api/v1/document", new URLSearchParams({ doc, q: state.q }));
    const title = $("reader-title");
    title.replaceChildren();
    markedText(title, d.fields.title.text || d.doc, d.fields.title.text ? d.fields.title.marks : []);
    $("reader-meta").textContent = `${d.doc} · ${d.kind} · ${d.lengths.body} words` +
      (d.fields.body.truncated ? " · shown in part" : "");
    for (const para of splitParagraphs(d.fields.body)) $("reader-text").append(para);
  } catch (e) {
    $("reader-title").textContent = "Could not open the document";
    $("reader-meta").textContent = e.message;
  }
  $("reader-close").focus();
}

// Paragraphs at blank lines, keeping each mark with the paragraph it falls in.
function splitParagraphs(field) {
  const bytes = enc.encode(field.text);
  const out = [];
  let start = 0, mi = 0;
  const cut = (end) => {
    const p = el("p");
    const marks = [];
    while (mi < field.marks.length && field.marks[mi][1] <= end) {
      marks.push([field.marks[mi][0] - start, field.marks[mi][1] - start]);
      mi++;
    }
    markedText(p, dec.decode(bytes.subarray(start, end)), marks);
    out.push(p);
  };
  for (let i = 0; i + 1 < bytes.length; i++) {
    if (bytes[i] === 10 && bytes[i + 1] === 10 && (mi >= field.marks.length || field.marks[mi][0] >= i)) {
      cut(i);
      while (i < bytes.length && bytes[i] === 10) i++;
      start = i;
    }
  }
  cut(bytes.length);
  return out;
}

function closeDocument() {
  $("reader").hidden = true;
  const current = document.querySelector(".hit.current");
  if (current) current.focus();
}

// ---- keyboard
function moveFocus(step) {
  const hits = [...document.querySelectorAll(".hit")];
  if (!hits.length) return;
  let i = hits.findIndex((h) => h.classList.contains("current"));
  i = i < 0 ? 0 : Math.min(hits.length - 1, Math.max(0, i + step));
  for (const h of hits) h.classList.remove("current");
  hits[i].classList.add("current");
  hits[i].focus();
}

// Pages known to exist: all of them when the count is exact; when pruned
// retrieval left it a lower bound, one more after every full page.
function knownPages(res) {
  const counted = Math.max(1, Math.ceil(res.matched / PAGE));
  return res.matched_exact ? counted : Math.max(counted, state.page + (res.hits.length === PAGE ? 1 : 0));
}

function turnPage(step) {
  if (!lastResults) return;
  const pages = knownPages(lastResults);
  const next = Math.min(pages, Math.max(1, state.page + step));
  if (next === state.page) return;
  state.page = next;
  writeUrl(true);
  search();
  window.scrollTo(0, 0);
}

function setModel(model) {
  state.model = model;
  state.page = 1;
  writeUrl(false);
  search();
}

document.addEventListener("keydown", (ev) => {
  const typing = ev.target instanceof HTMLInputElement || ev.target instanceof HTMLSelectElement;
  if (ev.key === "Escape") {
    if (!$("reader").hidden) closeDocument(); else if (typing) ev.target.blur();
    return;
  }
  if (ev.key === "ArrowDown" && ev.target === $("q") && document.querySelector(".hit")) {
    ev.preventDefault();  // from the query box straight to the hits
    moveFocus(0);
    return;
  }
  if (typing || ev.ctrlKey || ev.metaKey || ev.altKey) return;
  const current = document.querySelector(".hit.current");
  switch (ev.key) {
    case "/": ev.preventDefault(); $("q").focus(); $("q").select(); break;
    case "j": case "ArrowDown": ev.preventDefault(); moveFocus(1); break;
    case "k": case "ArrowUp": ev.preventDefault(); moveFocus(-1); break;
    case "w": if (current) toggleWhy(current); break;
    case "o": if (current) openDocument(current.dataset.doc); break;
    case "Enter": if (current && ev.target === current) openDocument(current.dataset.doc); break;
    case "m": setModel(state.model === "bm25" ? "tfidf" : "bm25"); break;
    case "[": turnPage(-1); break;
    case "]": turnPage(1); break;
  }
});

// ---- controls
$("ask").addEventListener("submit", (ev) => {
  ev.preventDefault();
  state.q = $("q").value.trim();
  state.page = 1;
  writeUrl(true);
  search();
});
for (const r of document.querySelectorAll('input[name="model"]')) r.addEventListener("change", () => setModel(r.value));
for (const id of ["k1", "b", "title_weight", "body_weight"]) {
  $(id).addEventListener("input", () => {
    state[id] = $(id).value;
    $(id + "-out").value = Number($(id).value).toFixed(2);
    clearTimeout(retune);  // re-rank live, but not on every pixel of a drag
    retune = setTimeout(() => { state.page = 1; writeUrl(false); search(); }, 120);
  });
}
$("weighting").addEventListener("change", () => { state.weighting = $("weighting").value; setModel("tfidf"); });
$("defaults").addEventListener("click", () => { Object.assign(state, DEFAULTS, { page: 1 }); writeUrl(false); search(); });
for (const f of FILTERS) {
  $("f-" + f).addEventListener("change", () => {
    const v = $("f-" + f).value.trim();
    if (v) state.filters[f] = v; else delete state.filters[f];
    state.page = 1;
    writeUrl(true);
    search();
  });
}
$("prev").addEventListener("click", () => turnPage(-1));
$("next").addEventListener("click", () => turnPage(1));
$("reader-close").addEventListener("click", closeDocument);
window.addEventListener("popstate", () => { readUrl(); search(); });

readUrl();
search();
if (!state.q) $("q").focus();
