// lode's page, the tools beyond one page of hits: "why not" (where a document
// ranks and why not higher), "what moved" (this query under a pinned setting
// and the current one) and "sift" (judge batch after batch until the stopping
// rule says enough). Reads the query and model from the page's own controls,
// talks to /api/v1 only and builds every element with textContent.
"use strict";

(() => {
  const byId = (id) => document.getElementById(id);
  const make = (tag, cls, text) => {
    const e = document.createElement(tag);
    if (cls) e.className = cls;
    if (text !== undefined) e.textContent = text;
    return e;
  };
  const num = (x, d) => (typeof x === "number" ? x.toFixed(d) : "–");

  // The model as the page's controls set it, as API parameters (prefix for the pinned one).
  function currentModel() {
    const model = (document.querySelector('input[name="model"]:checked') || {}).value || "bm25";
    const m = { model };
    if (model === "bm25") { m.k1 = byId("k1").value; m.b = byId("b").value; }
    else m.weighting = byId("weighting").value;
    return m;
  }
  const query = () => byId("q").value.trim();

  async function call(method, path, params) {
    const opts = { method, headers: { Accept: "application/json" } };
    let url = path;
    if (method === "GET") url += "?" + new URLSearchParams(params).toString();
    else { opts.body = JSON.stringify(params); opts.headers["Content-Type"] = "application/json"; }
    const res = await fetch(url, opts);
    const body = await res.json().catch(() => ({}));
    if (!res.ok) throw new Error(body.detail || body.title || ("HTTP " + res.status));
    return body;
  }

  // ---- the panel: three tabs under the model controls
  const panel = make("section", "tools");
  panel.id = "tools";
  panel.setAttribute("aria-label", "Beyond the first page");
  const tabs = make("div", "tool-tabs");
  const bodies = {};
  for (const [key, label] of [["whynot", "why not…"], ["moved", "what moved"], ["sift", "sift: find all of it"]]) {
    const b = make("button", "quiet", label);
    b.type = "button";
    b.dataset.tool = key;
    b.addEventListener("click", () => toggle(key));
    tabs.append(b);
    bodies[key] = make("div", "tool-body");
    bodies[key].id = "tool-" + key;
    bodies[key].hidden = true;
  }
  panel.append(tabs, ...Object.values(bodies));
  (byId("tuning") || document.body).after(panel);
  let open = null;
  function toggle(key) {
    open = open === key ? null : key;
    for (const [k, b] of Object.entries(bodies)) b.hidden = k !== open;
    for (const t of tabs.children) t.classList.toggle("on", t.dataset.tool === open);
    if (open === "sift") refreshSifts();
  }

  // ---- why not
  const wnForm = make("form", "tool-row");
  const wnDoc = make("input");
  wnDoc.id = "whynot-doc";
  wnDoc.placeholder = "document id (as the hits show it)";
  const wnGo = make("button", "", "find its rank");
  wnGo.type = "submit";
  const wnOut = make("div", "tool-out");
  wnOut.id = "whynot-out";
  wnForm.append(wnDoc, wnGo);
  bodies.whynot.append(wnForm, wnOut);
  wnForm.addEventListener("submit", async (ev) => {
    ev.preventDefault();
    wnOut.replaceChildren(make("p", "", "…"));
    try {
      const j = await call("GET", "/api/v1/whynot", { q: query(), doc: wnDoc.value.trim(), ...currentModel() });
      renderWhyNot(j);
    } catch (e) { wnOut.replaceChildren(make("p", "error", e.message)); }
  });
  function renderWhyNot(j) {
    const head = j.rank ? `ranks ${j.rank} of ${j.matched}` : j.matches ? `matches, below rank ${j.searched_to}` : "is not retrieved";
    const out = [make("p", "verdict", `${j.doc} ${head}`)];
    const words = make("ul", "words");
    for (const w of j.words) {
      const where = [w.in_title && "title", w.in_body && "body"].filter(Boolean).join(" and ");
      words.append(make("li", w.lacking ? "lacking" : "present",
        `${w.term}: ${!w.in_index ? "no document has it" : w.lacking ? "lacking" + (where ? " where asked (in " + where + ")" : "") : "in " + where}`));
    }
    out.push(words);
    for (const d of j.dropped) out.push(make("p", "note", d));
    for (const c of j.clauses) out.push(make("p", c.holds ? "holds" : "removes", `${c.kind} ${c.text}: ${c.why}`));
    const cmp = make("table", "breakdown");
    const hr = make("tr");
    for (const h of ["", "score", "terms (contribution)"]) hr.append(make("th", "", h));
    cmp.append(hr);
    for (const [label, hit] of [["this", j.hit], ["#" + j.k, j.kth]]) {
      const tr = make("tr");
      tr.append(make("td", "", label), make("td", "", hit ? num(hit.score, 4) : "fewer match"),
        make("td", "", hit ? hit.breakdown.map((c) => `${c.field}:${c.term} ${num(c.contribution, 3)}`).join(" · ") : ""));
      cmp.append(tr);
    }
    out.push(cmp);
    wnOut.replaceChildren(...out);
  }

  // ---- what moved: pin a setting, move the knobs, see the difference
  let pinned = null;
  const mvRow = make("div", "tool-row");
  const pin = make("button", "", "pin this setting");
  pin.type = "button";
  const mvNote = make("span", "note", "pin a setting, then change the model controls");
  const mvOut = make("div", "tool-out");
  mvOut.id = "moved-out";
  mvRow.append(pin, mvNote);
  bodies.moved.append(mvRow, mvOut);
  pin.addEventListener("click", () => {
    pinned = currentModel();
    mvNote.textContent = "pinned: " + Object.entries(pinned).map(([k, v]) => k + " " + v).join(", ");
    compare();
  });
  for (const id of ["k1", "b", "weighting"]) byId(id) && byId(id).addEventListener("change", () => compare());
  for (const r of document.querySelectorAll('input[name="model"]')) r.addEventListener("change", () => compare());
  async function compare() {
    if (!pinned || open !== "moved" || !query()) return;
    const params = { q: query(), ...currentModel() };
    for (const [k, v] of Object.entries(pinned)) params["before_" + k] = v;
    try { renderMoved(await call("GET", "/api/v1/moved", params)); }
    catch (e) { mvOut.replaceChildren(make("p", "error", e.message)); }
  }
  function renderMoved(j) {
    const c = j.counts;
    const t = make("table", "moved");
    const hr = make("tr");
    for (const h of ["pinned", "now", "", "document", "score pinned → now", "changed terms"]) hr.append(make("th", "", h));
    t.append(hr);
    for (const d of j.docs) {
      const tr = make("tr", "change-" + d.change);
      const arrow = { entered: "new", left: "out", up: "▲", down: "▼", same: "=" }[d.change];
      tr.append(make("td", "", d.rank_before ?? "–"), make("td", "", d.rank_after ?? "–"), make("td", "", arrow),
        make("td", "", d.title || d.doc), make("td", "", `${num(d.score_before, 3)} → ${num(d.score_after, 3)}`),
        make("td", "", d.shifts.slice(0, 3).map((s) => `${s.field}:${s.term} ${num(s.after - s.before, 3)}`).join(" · ")));
      t.append(tr);
    }
    mvOut.replaceChildren(make("p", "verdict",
      `top ${j.depth}: ${c.entered} entered, ${c.left} left, ${c.up} up, ${c.down} down, ${c.same} same`), t);
  }

  // ---- sift: review mode with keyboard judging (y relevant, n not, Esc leaves)
  let sift = null;        // name of the sift being judged
  let judging = false;    // the server records judgments
  let queue = [];         // pending items of the open batch
  const sfList = make("div", "tool-row");
  const sfName = make("input");
  sfName.id = "sift-name";
  sfName.placeholder = "name for a new sift";
  const sfStart = make("button", "", "start from this query");
  sfStart.type = "button";
  const sfSelect = make("select");
  sfSelect.id = "sift-pick";
  sfList.append(sfSelect, sfName, sfStart);
  const sfStatus = make("p", "verdict");
  sfStatus.id = "sift-status";
  const sfCard = make("article", "sift-card");
  sfCard.id = "sift-card";
  sfCard.tabIndex = -1;
  const sfKeys = make("p", "keys", "y relevant · n not relevant · Esc leave review");
  bodies.sift.append(sfList, sfStatus, sfCard, sfKeys);

  async function refreshSifts() {
    try {
      const l = await call("GET", "/api/v1/sifts", {});
      judging = l.judging;
      sfStart.disabled = !judging;
      sfSelect.replaceChildren(make("option", "", "— pick a sift —"));
      for (const s of l.sifts) {
        const o = make("option", "", `${s.name} (${s.judged} judged, ${s.relevant} relevant)`);
        o.value = s.name;
        if (s.name === sift) o.selected = true;
        sfSelect.append(o);
      }
      if (!judging) sfStatus.textContent = "This server records no judgments (start it with --allow-judging to judge here).";
    } catch (e) { sfStatus.textContent = e.message; }
  }
  sfSelect.addEventListener("change", () => { sift = sfSelect.value || null; load(); });
  sfStart.addEventListener("click", async () => {
    try {
      await call("POST", "/api/v1/sift/start", { name: sfName.value.trim(), q: query() });
      sift = sfName.value.trim();
      await refreshSifts();
      await load();
    } catch (e) { sfStatus.textContent = e.message; }
  });

  function describe(s) {
    const st = s.stop;
    const rec = s.recall ? ` · recall ≈ ${Math.round(100 * s.recall.estimate)}% (95%: ${Math.round(100 * s.recall.low)}–${Math.round(100 * s.recall.high)}%)` : "";
    return `${s.name}: ${s.judged} judged, ${s.relevant} relevant, ${s.unjudged} left in scope · ` +
      (st.advice ? "the stopping rule says: enough" : `keep going (slope ratio ${num(st.slope_ratio, 1)} of ${num(st.needed, 0)})`) + rec;
  }

  async function load() {
    if (!sift) return;
    try {
      const s = await call("GET", "/api/v1/sift", { name: sift });
      sfStatus.textContent = describe(s);
      let batch;
      if (s.open_batch !== null) batch = await call("GET", "/api/v1/sift/batch", { name: sift });
      else if (judging && !s.stop.advice) batch = await call("POST", "/api/v1/sift/next", { name: sift });
      queue = batch ? batch.items.filter((it) => it.judged === null && it.present) : [];
      await show();
    } catch (e) { sfStatus.textContent = e.message; }
  }

  async function show() {
    if (!queue.length) {
      sfCard.replaceChildren(make("p", "", judging ? "Nothing to judge now." : "Read-only: nothing to judge."));
      return;
    }
    const it = queue[0];
    const d = await call("GET", "/api/v1/document", { doc: it.doc, q: query() });
    const text = d.fields.body.text;
    sfCard.replaceChildren(make("h3", "", it.title || it.doc), make("p", "note", it.doc),
      make("p", "excerpt", text.length > 1200 ? text.slice(0, 1200) + "…" : text));
    sfCard.dataset.doc = it.doc;
    sfCard.focus();
  }

  async function judge(relevant) {
    if (!queue.length || !judging) return;
    const it = queue.shift();
    try {
      const s = await call("POST", "/api/v1/sift/mark", { name: sift, doc: it.doc, relevant });
      sfStatus.textContent = describe(s);
      if (queue.length) await show(); else await load();
    } catch (e) { sfStatus.textContent = e.message; }
  }

  // Capture phase: while reviewing, y / n / Esc belong to the review, not the hit list.
  window.addEventListener("keydown", (ev) => {
    if (open !== "sift" || !sift || ev.ctrlKey || ev.metaKey || ev.altKey) return;
    if (ev.target instanceof HTMLInputElement || ev.target instanceof HTMLSelectElement) return;
    if (ev.key === "y" || ev.key === "n") { ev.stopPropagation(); ev.preventDefault(); judge(ev.key === "y"); }
    else if (ev.key === "Escape") { ev.stopPropagation(); toggle("sift"); }
  }, true);
})();
