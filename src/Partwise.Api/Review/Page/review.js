// Partwise flag review: lists a baseline's open flags (ETag and long poll), shows why each stands out and where it
// sits on the baseline's biplot, and records an analyst's review. Plain DOM, no framework; everything the service
// sends is inserted as text, never as HTML.
"use strict";

(() => {
  const KEY_STORE = "partwise.apiKey";
  const REVIEWER_STORE = "partwise.reviewer";
  const BASELINE_STORE = "partwise.baseline";
  const WAIT_SECONDS = 25;
  const SVG = "http://www.w3.org/2000/svg";

  const $ = (id) => document.getElementById(id);
  const state = {
    baselineId: "",
    flags: [],          // the open flags, in commit order
    seen: new Set(),    // flag ids already shown, to announce only new ones
    selectedId: null,
    etag: null,
    poll: null,         // AbortController of the running poll loop
    biplot: null,       // the last biplot answer
    generation: 0,      // bumped on every baseline change, so stale answers are dropped
  };

  // --- talking to the service -------------------------------------------------------------------------------------
  class ApiError extends Error {
    constructor(status, problem) {
      super(problem?.detail || problem?.title || `The service answered ${status}.`);
      this.status = status;
      this.problem = problem;
    }
  }

  async function api(path, { method = "GET", body, etag, signal } = {}) {
    const headers = { Accept: "application/json" };
    const key = sessionStorage.getItem(KEY_STORE);
    if (key) headers.Authorization = `Bearer ${key}`;
    if (etag) headers["If-None-Match"] = etag;
    if (body !== undefined) headers["Content-Type"] = "application/json";
    const response = await fetch(path, { method, headers, signal, cache: "no-store", body: body === undefined ? undefined : JSON.stringify(body) });
    if (response.status === 304) return { status: 304, etag: response.headers.get("ETag") };
    const text = await response.text();
    const json = text ? JSON.parse(text) : null;
    if (!response.ok) throw new ApiError(response.status, json);
    return { status: response.status, etag: response.headers.get("ETag"), json };
  }

  function explain(error) {
    if (error instanceof ApiError) {
      if (error.status === 401) return "The service needs an API key: enter one above.";
      if (error.status === 403) return "This API key does not have the role this needs (reader to list, reviewer to review).";
      const pointers = (error.problem?.errors || []).map((e) => `${e.pointer}: ${e.detail}`);
      return [error.message, ...pointers].join(" ");
    }
    return "The service cannot be reached; retrying.";
  }

  function showAlert(message) {
    const alert = $("alert");
    alert.textContent = message || "";
    alert.hidden = !message;
  }

  function announce(message) {
    // A fresh node per message, so that screen readers read each one.
    const line = document.createElement("p");
    line.textContent = message;
    $("announcer").append(line);
    while ($("announcer").childElementCount > 3) $("announcer").firstElementChild.remove();
  }

  function setPoll(text, kind) {
    const poll = $("poll-state");
    poll.textContent = text;
    poll.className = `poll ${kind || ""}`;
  }

  // --- formatting ---------------------------------------------------------------------------------------------------
  const fmt = (x, digits = 3) => {
    if (x === null || x === undefined || !Number.isFinite(x)) return "–";
    const a = Math.abs(x);
    if (a !== 0 && (a < 1e-3 || a >= 1e5)) return x.toExponential(2);
    return Number(x.toPrecision(digits)).toString();
  };
  const fmtP = (p) => (p === 0 ? "< 1e-300" : p < 1e-4 ? p.toExponential(1) : fmt(p, 2));
  const fmtTime = (t) => (t ? new Date(t).toLocaleString(undefined, { dateStyle: "medium", timeStyle: "short" }) : "–");

  function el(tag, attrs = {}, ...children) {
    const node = document.createElement(tag);
    for (const [k, v] of Object.entries(attrs)) {
      if (k === "class") node.className = v;
      else if (k === "text") node.textContent = v;
      else node.setAttribute(k, v);
    }
    node.append(...children);
    return node;
  }

  function svg(tag, attrs = {}, text) {
    const node = document.createElementNS(SVG, tag);
    for (const [k, v] of Object.entries(attrs)) node.setAttribute(k, String(v));
    if (text !== undefined) node.textContent = text;
    return node;
  }

  // --- baselines ----------------------------------------------------------------------------------------------------
  async function loadBaselines() {
    try {
      const { json } = await api("/v1/baselines");
      const select = $("baseline");
      for (const b of json.items) {
        const label = `${b.name} · v${b.version}${b.retiredAt ? " (retired)" : ""}`;
        select.append(el("option", { value: b.id, text: label }));
      }
      const remembered = sessionStorage.getItem(BASELINE_STORE);
      const pick = json.items.find((b) => b.id === remembered) || (json.items.length === 1 ? json.items[0] : null);
      if (pick) {
        select.value = pick.id;
        chooseBaseline(pick.id);
      }
      showAlert("");
    } catch (error) {
      showAlert(`Baselines could not be listed. ${explain(error)}`);
    }
  }

  function chooseBaseline(id) {
    state.poll?.abort();
    state.generation += 1;
    Object.assign(state, { baselineId: id, flags: [], seen: new Set(), selectedId: null, etag: null, biplot: null, poll: null });
    if (id) sessionStorage.setItem(BASELINE_STORE, id);
    renderList();
    renderDetail();
    if (!id) {
      setPoll("Not watching");
      $("flags-empty").textContent = "Choose a baseline to see its open flags.";
      return;
    }
    state.poll = new AbortController();
    pollLoop(id, state.generation, state.poll.signal);
  }

  // --- the open flags: one immediate listing, then long polls with the last ETag ------------------------------------
  async function pollLoop(baselineId, generation, signal) {
    let first = true;
    let backoff = 1000;
    while (!signal.aborted) {
      const query = new URLSearchParams({ baseline: baselineId, status: "open", limit: "500" });
      if (!first) query.set("waitSeconds", String(WAIT_SECONDS));
      try {
        setPoll(first ? "Loading…" : "Watching for new flags", first ? "" : "live");
        const answer = await api(`/v1/flags?${query}`, { etag: first ? null : state.etag, signal });
        if (generation !== state.generation) return;
        if (answer.status === 200) {
          state.etag = answer.etag;
          applyFlags(answer.json.items, !first, answer.json.hasMore);
        }
        first = false;
        backoff = 1000;
        showAlert("");
      } catch (error) {
        if (signal.aborted || generation !== state.generation) return;
        setPoll("Connection trouble; retrying", "trouble");
        showAlert(explain(error));
        await new Promise((resolve) => setTimeout(resolve, backoff));
        backoff = Math.min(backoff * 2, 15000);
      }
    }
  }

  function applyFlags(items, announceNew, hasMore) {
    const fresh = items.filter((f) => !state.seen.has(f.id));
    for (const f of items) state.seen.add(f.id);
    state.flags = items;
    if (state.selectedId && !items.some((f) => f.id === state.selectedId)) state.selectedId = null;
    if (!state.selectedId && items.length > 0) state.selectedId = items[0].id;
    renderList(announceNew ? new Set(fresh.map((f) => f.id)) : new Set(), hasMore);
    renderDetail();
    refreshBiplot();
    if (announceNew && fresh.length > 0) {
      const names = fresh.slice(0, 3).map((f) => f.sampleId).join(", ");
      announce(`${fresh.length} new flag${fresh.length > 1 ? "s" : ""}: ${names}${fresh.length > 3 ? " and more" : ""}.`);
    }
  }

  function renderList(fresh = new Set(), hasMore = false) {
    const list = $("flag-list");
    list.replaceChildren();
    const n = state.flags.length;
    $("flag-count").textContent = state.baselineId ? `(${n}${hasMore ? "+" : ""})` : "";
    $("flags-empty").hidden = n > 0;
    if (state.baselineId) $("flags-empty").textContent = "No open flags. New ones appear here as they are screened.";
    for (const f of state.flags) {
      const button = el(
        "button",
        { type: "button", "data-flag": f.id, "aria-current": String(f.id === state.selectedId) },
        el("span", { class: "sample", text: f.sampleId }),
        el("span", { class: "d", text: `d ${fmt(f.distance)}` }),
        el("span", { class: "meta", text: `${f.source ? f.source + " · " : ""}${fmtTime(f.observedAt || f.screenedAt)} · top: ${f.reasons[0]?.label ?? "–"}` }),
      );
      button.setAttribute("aria-label", `${f.sampleId}, distance ${fmt(f.distance)}, p ${fmtP(f.pValue)}`);
      button.addEventListener("click", () => select(f.id, true));
      list.append(el("li", { class: fresh.has(f.id) ? "fresh" : "" }, button));
    }
  }

  function select(id, focusDetail) {
    state.selectedId = id;
    for (const b of $("flag-list").querySelectorAll("button")) b.setAttribute("aria-current", String(b.dataset.flag === id));
    renderDetail();
    drawBiplot();
    if (focusDetail) $("detail-heading").focus();
  }

  // --- the selected flag --------------------------------------------------------------------------------------------
  function selected() {
    return state.flags.find((f) => f.id === state.selectedId) || null;
  }

  function renderDetail() {
    const flag = selected();
    $("detail").hidden = !flag;
    if (!flag) return;
    $("detail-heading").textContent = flag.sampleId;
    const facts = [
      ["Source", flag.source || "–"],
      ["Observed", fmtTime(flag.observedAt)],
      ["Screened", fmtTime(flag.screenedAt)],
      ["Distance d", fmt(flag.distance)],
      ["p-value", fmtP(flag.pValue)],
    ];
    $("facts").replaceChildren(...facts.map(([k, v]) => el("div", {}, el("dt", { text: k }), el("dd", { text: v }))));

    $("reasons").replaceChildren(...flag.reasons.map(reasonItem));
    const values = flag.values || {};
    const parts = Object.keys(values);
    const table = $("values-table");
    table.tHead.replaceChildren(el("tr", {}, ...parts.map((p) => el("th", { scope: "col", text: p }))));
    table.tBodies[0].replaceChildren(el("tr", {}, ...parts.map((p) => el("td", { text: fmt(values[p], 4) }))));
    table.closest("details").hidden = parts.length === 0;
    $("review-error").hidden = true;
  }

  function reasonItem(reason) {
    const [low, high] = reason.expected;
    const side = reason.value > high ? "above" : reason.value < low ? "below" : "within";
    const numbers = el("p", { class: "reason-numbers" });
    numbers.append("value ", el("b", { text: fmt(reason.value) }), ` · expected ${fmt(low)} to ${fmt(high)} · ${side} the range`);
    return el(
      "li",
      { class: "reason" },
      el("div", { class: "reason-head" },
        el("span", { class: "ratio", text: reason.label }),
        el("span", { class: `z ${reason.z < 0 ? "low" : ""}`, text: `z ${reason.z >= 0 ? "+" : "−"}${fmt(Math.abs(reason.z), 3)}` })),
      numbers,
      rangeBar(reason.value, low, high),
    );
  }

  // A log-scale strip: the expected 95% range as a band, the sample's value as a dot.
  function rangeBar(value, low, high) {
    const width = 360, height = 34, pad = 14;
    const logs = [value, low, high].filter((x) => x > 0).map(Math.log);
    let lo = Math.min(...logs), hi = Math.max(...logs);
    const span = Math.max(hi - lo, 1e-9);
    lo -= span * 0.08; hi += span * 0.08;
    const x = (v) => pad + ((Math.log(v) - lo) / (hi - lo)) * (width - 2 * pad);
    const root = svg("svg", { class: "range", viewBox: `0 0 ${width} ${height}`, "aria-hidden": "true", focusable: "false" });
    root.append(
      svg("rect", { class: "track", x: pad, y: 9, width: width - 2 * pad, height: 8, rx: 4 }),
      svg("rect", { class: "band", x: x(low), y: 6, width: Math.max(x(high) - x(low), 1), height: 14 }),
      svg("line", { class: "band-edge", x1: x(low), x2: x(low), y1: 4, y2: 22 }),
      svg("line", { class: "band-edge", x1: x(high), x2: x(high), y1: 4, y2: 22 }),
      svg("circle", { class: "value", cx: x(value), cy: 13, r: 6 }),
      svg("text", { class: "tick", x: x(low), y: 32, "text-anchor": "middle" }, fmt(low)),
      svg("text", { class: "tick", x: x(high), y: 32, "text-anchor": "middle" }, fmt(high)),
    );
    return root;
  }

  // --- the biplot ---------------------------------------------------------------------------------------------------
  async function refreshBiplot() {
    const generation = state.generation;
    const ids = state.flags.slice(0, 100).map((f) => f.id);
    const query = ids.length ? `?flags=${encodeURIComponent(ids.join(","))}` : "";
    try {
      const { json } = await api(`/v1/baselines/${encodeURIComponent(state.baselineId)}/biplot${query}`);
      if (generation !== state.generation) return;
      state.biplot = json;
      drawBiplot();
    } catch (error) {
      if (generation !== state.generation) return;
      $("biplot").replaceChildren();
      $("biplot-note").textContent = `The biplot could not be drawn. ${explain(error)}`;
    }
  }

  function drawBiplot() {
    const figure = $("biplot");
    const b = state.biplot;
    const flag = selected();
    if (!b || !flag) { figure.replaceChildren(); return; }
    const W = 460, H = 360, M = 34;
    const semi = [b.ellipse.semiAxes[0], b.ellipse.semiAxes[1] ?? b.ellipse.semiAxes[0] * 0.25];
    const open = new Set(state.flags.map((f) => f.id));
    const placed = b.samples.filter((s) => s.scores && open.has(s.flagId));
    const point = (s) => [s.scores[0], s.scores[1] ?? 0];
    let ex = semi[0] * 1.12, ey = semi[1] * 1.12;
    for (const s of placed) {
      const [px, py] = point(s);
      ex = Math.max(ex, Math.abs(px) * 1.1);
      ey = Math.max(ey, Math.abs(py) * 1.1);
    }
    // One scale for both axes (a biplot's angles and distances mean something), fitted to the wider need.
    const scale = Math.min((W / 2 - M) / ex, (H / 2 - M) / ey);
    const cx = W / 2, cy = H / 2;
    const X = (u) => cx + u * scale, Y = (v) => cy - v * scale;

    const titleId = "biplot-title", descId = "biplot-desc";
    const root = svg("svg", { viewBox: `0 0 ${W} ${H}`, role: "img", "aria-labelledby": `${titleId} ${descId}` });
    const me = placed.find((s) => s.flagId === flag.id);
    root.append(svg("title", { id: titleId }, `Biplot of the baseline with sample ${flag.sampleId}`));
    const desc = me
      ? `The sample lies ${me.planeSquaredDistance > b.ellipse.threshold ? "outside" : "inside"} the reference ellipse: ` +
        `${fmt(me.planeSquaredDistance)} of its squared distance ${fmt(me.squaredDistance)} is in this plane; the threshold is ${fmt(b.ellipse.threshold)}.`
      : "This flag was raised before the service kept sample values, so it cannot be placed.";
    root.append(svg("desc", { id: descId }, desc));

    // Grid lines at round steps, then the axes through the baseline's centre.
    const step = niceStep(Math.max(ex, ey) / 2.5);
    for (let u = -Math.floor(ex / step) * step; u <= ex; u += step) root.append(svg("line", { class: "grid", x1: X(u), x2: X(u), y1: M / 2, y2: H - M / 2 }));
    for (let v = -Math.floor(ey / step) * step; v <= ey; v += step) root.append(svg("line", { class: "grid", y1: Y(v), y2: Y(v), x1: M / 2, x2: W - M / 2 }));
    root.append(svg("line", { class: "axis", x1: M / 2, x2: W - M / 2, y1: cy, y2: cy }), svg("line", { class: "axis", x1: cx, x2: cx, y1: M / 2, y2: H - M / 2 }));
    root.append(svg("ellipse", { class: "ellipse", cx, cy, rx: semi[0] * scale, ry: semi[1] * scale }));

    // Part arrows: standard coordinates, all scaled by one factor so that the longest reaches 85% of the ellipse.
    const longest = Math.max(...b.partCoordinates.map((c) => Math.hypot(c[0], c[1] ?? 0)), 1e-12);
    const reach = 0.85 * Math.min(semi[0], Math.max(semi[1], semi[0] * 0.4)) / longest;
    // Parts whose tips fall within a few pixels share one label ("Na, Cl"); arrows too short to read are listed in
    // the caption instead of being labelled on top of each other at the centre.
    const tips = [];
    const short = [];
    b.parts.forEach((name, j) => {
      const [u, v] = [b.partCoordinates[j][0] * reach, (b.partCoordinates[j][1] ?? 0) * reach];
      const len = Math.hypot(u, v) * scale;
      if (len < 2) { short.push(name); return; }
      const [x1, y1] = [X(u), Y(v)];
      const ang = Math.atan2(y1 - cy, x1 - cx);
      const head = `${x1},${y1} ${x1 - 7 * Math.cos(ang - 0.4)},${y1 - 7 * Math.sin(ang - 0.4)} ${x1 - 7 * Math.cos(ang + 0.4)},${y1 - 7 * Math.sin(ang + 0.4)}`;
      root.append(svg("line", { class: "arrow", x1: cx, y1: cy, x2: x1, y2: y1 }), svg("polygon", { class: "arrow-head", points: head }));
      if (len < 22) { short.push(name); return; }
      const near = tips.find((t) => Math.hypot(t.x - x1, t.y - y1) < 12);
      if (near) near.names.push(name); else tips.push({ x: x1, y: y1, ang, names: [name] });
    });
    for (const t of tips) {
      const anchor = Math.cos(t.ang) > 0.3 ? "start" : Math.cos(t.ang) < -0.3 ? "end" : "middle";
      root.append(svg("text", { class: "part", x: t.x + 9 * Math.cos(t.ang), y: t.y + 11 * Math.sin(t.ang) + 4, "text-anchor": anchor }, t.names.join(", ")));
    }

    // The other open flags as open circles, the selected one filled and named.
    for (const s of placed) {
      if (s.flagId === flag.id) continue;
      const [px, py] = point(s);
      root.append(svg("circle", { class: "other", cx: X(px), cy: Y(py), r: 4 }));
    }
    if (me) {
      const [px, py] = point(me);
      root.append(svg("circle", { class: "halo", cx: X(px), cy: Y(py), r: 10 }), svg("circle", { class: "selected", cx: X(px), cy: Y(py), r: 6, "data-sample": me.sampleId }));
      const right = X(px) < W - 140;
      root.append(svg("text", { class: "sample-label", x: X(px) + (right ? 14 : -14), y: Y(py) - 10, "text-anchor": right ? "start" : "end" }, me.sampleId));
    }

    const pct = (f) => `${(100 * f).toFixed(1)}%`;
    root.append(svg("text", { class: "axis-label", x: W - M / 2, y: cy - 6, "text-anchor": "end" }, `axis 1 · ${pct(b.explained[0])}`));
    if (b.dimensions > 1) root.append(svg("text", { class: "axis-label", x: cx + 6, y: M / 2 + 10 }, `axis 2 · ${pct(b.explained[1])}`));

    const caption = el("figcaption", { text:
      `Principal axes of the baseline's clr scatter (${pct(b.explained.reduce((a, x) => a + x, 0))} of its log-ratio variance). ` +
      "Dashed: the threshold ellipse. Arrows: parts (directions only" +
      (short.length ? `; short, near the centre: ${short.join(", ")}` : "") + "). Open circles: other open flags." });
    figure.replaceChildren(root, caption);
    $("biplot-note").textContent = desc + " A point outside the ellipse is beyond the threshold; one inside may be beyond it along the axes not drawn.";
  }

  function niceStep(x) {
    const p = 10 ** Math.floor(Math.log10(x));
    const m = x / p;
    return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * p;
  }

  // --- review -------------------------------------------------------------------------------------------------------
  async function submitReview(event) {
    event.preventDefault();
    const flag = selected();
    if (!flag) return;
    const status = document.querySelector('input[name="status"]:checked')?.value;
    const error = $("review-error");
    if (!status) {
      error.textContent = "Choose Confirm or Dismiss.";
      error.hidden = false;
      $("status-confirmed").focus();
      return;
    }
    const note = $("note").value.trim();
    const reviewer = $("reviewer").value.trim();
    if (reviewer) sessionStorage.setItem(REVIEWER_STORE, reviewer);
    const button = $("review-submit");
    button.disabled = true;
    try {
      await api(`/v1/flags/${encodeURIComponent(flag.id)}/review`, { method: "POST", body: { status, note: note || null, reviewer: reviewer || null } });
      const index = state.flags.findIndex((f) => f.id === flag.id);
      state.flags = state.flags.filter((f) => f.id !== flag.id);
      state.selectedId = state.flags[Math.min(index, state.flags.length - 1)]?.id ?? null;
      $("review-form").reset();
      $("reviewer").value = sessionStorage.getItem(REVIEWER_STORE) || "";
      renderList();
      renderDetail();
      drawBiplot();
      announce(`${flag.sampleId} ${status}; it left the open list.`);
      const next = $("flag-list").querySelector('button[aria-current="true"]');
      (next || $("flags-heading")).focus();
    } catch (e) {
      error.textContent = `The review was not recorded. ${explain(e)}`;
      error.hidden = false;
    } finally {
      button.disabled = false;
    }
  }

  // --- start --------------------------------------------------------------------------------------------------------
  document.addEventListener("DOMContentLoaded", () => {
    $("baseline").addEventListener("change", (e) => chooseBaseline(e.target.value));
    $("baseline-form").addEventListener("submit", (e) => e.preventDefault());
    $("key-form").addEventListener("submit", (e) => {
      e.preventDefault();
      const key = $("api-key").value.trim();
      if (key) sessionStorage.setItem(KEY_STORE, key); else sessionStorage.removeItem(KEY_STORE);
      $("api-key").value = "";
      $("api-key").placeholder = key ? "key kept for this tab" : "";
      announce(key ? "API key kept for this browser tab." : "No API key.");
      chooseBaseline(state.baselineId);
      if ($("baseline").options.length <= 1) loadBaselines();
    });
    $("key-forget").addEventListener("click", () => {
      sessionStorage.removeItem(KEY_STORE);
      $("api-key").placeholder = "";
      announce("API key forgotten.");
    });
    if (sessionStorage.getItem(KEY_STORE)) $("api-key").placeholder = "key kept for this tab";
    $("review-form").addEventListener("submit", submitReview);
    $("reviewer").value = sessionStorage.getItem(REVIEWER_STORE) || "";
    loadBaselines();
  });
})();
