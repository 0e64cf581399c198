// CourseSim race viewer: draws a replay (or a race as it runs) on a canvas. No libraries; data format: docs/viewer.md.
(function () {
  "use strict";
  const $ = (id) => document.getElementById(id);
  const canvas = $("water"), ctx = canvas.getContext("2d");
  const chart = $("speed-chart"), cctx = chart.getContext("2d");
  // Board colours: our own set, spread in hue and in lightness so neighbours differ for colour-blind viewers too;
  // every board also carries its number.
  const HUES = ["#1b5e8c", "#d08a1e", "#5a2d82", "#2f8f5b", "#c2413b", "#6b8e23", "#8c564b", "#0f8f9a",
                "#b5367a", "#44546a", "#9a7a00", "#3a6fd8"];
  const KN = 1 / 0.514444;
  const view = { data: null, n: 0, frame: 0, playing: false, speed: 4, selected: -1, follow: false,
                 scale: 1, ox: 0, oy: 0, hover: -1, error: null, last: 0, acc: 0, ready: false };
  window.__viewer = {
    get ready() { return view.ready; }, get error() { return view.error; }, get frame() { return view.frame; },
    get frames() { return view.data ? view.data.frames : 0; }, get selected() { return view.selected; },
    positions() { return view.data ? [...Array(view.n).keys()].map((b) => [val("x_m", view.frame, b), val("y_m", view.frame, b)]) : []; },
    screenOf(b) { const p = toScreen(val("x_m", view.frame, b), val("y_m", view.frame, b)); return [p[0], p[1]]; },
  };

  function fail(message) {
    view.error = message;
    const p = $("problem"); p.hidden = false;
    p.textContent = "This race cannot be shown:\n" + message;
    $("title").textContent = "error";
  }

  function val(col, k, b) { const c = view.data.columns[col]; return c[k * view.n + b]; }
  function flag(k, b) { return view.data.flags[k * view.n + b] || 0; }
  function timeOf(k) { return view.data.start_s + k * view.data.interval_s; }

  // ---- loading -------------------------------------------------------------------------------------------------
  function check(d) {
    if (!d || d.format !== "coursesim-viewer/1") throw new Error("not CourseSim viewer data (format " + (d && d.format) + ")");
    for (const c of ["x_m", "y_m", "heading_deg", "speed_ms"]) if (!Array.isArray(d.columns[c])) throw new Error("column " + c + " missing");
    if (d.columns.x_m.length !== d.frames * d.boards.length) throw new Error("the replay is truncated: " + d.columns.x_m.length + " values for " + d.frames + " frames of " + d.boards.length + " boards");
    return d;
  }

  function start(d) {
    view.data = check(d); view.n = d.boards.length;
    $("title").textContent = `${d.scenario || "race"}${d.venue ? " · " + d.venue : ""} · ${view.n} boards · seed ${d.seed}`;
    fit(); resize();
    $("scrub").max = Math.max(0, d.frames - 1);
    view.ready = true;
    requestAnimationFrame(tick);
  }

  function load() {
    const src = window.COURSESIM_SOURCE || { mode: "server" };
    try {
      if (src.mode === "embedded") { start(JSON.parse($("coursesim-data").textContent)); return; }
      if (src.mode === "live") { live(); return; }
      fetch("replay.json").then(async (r) => {
        const body = await r.json().catch(() => null);
        if (!r.ok) throw new Error((body && body.error) || ("the server answered " + r.status));
        start(body);
      }).catch((e) => fail(e.message));
    } catch (e) { fail(e.message); }
  }

  function live() {
    const es = new EventSource("live");
    es.addEventListener("setup", (ev) => { try { start(JSON.parse(ev.data)); view.follow = true; view.playing = false; } catch (e) { fail(e.message); } });
    es.onmessage = (ev) => {
      let m; try { m = JSON.parse(ev.data); } catch (e) { fail("a bad message from the race: " + e.message); return; }
      if (m.type === "error") { fail(m.message); es.close(); return; }
      const d = view.data; if (!d) return;
      for (const c in m.columns) for (const v of m.columns[c]) d.columns[c].push(v);
      for (const v of m.flags) d.flags.push(v);
      for (const v of m.next_step) d.next_step.push(v);
      d.frames = m.to;
      if (d.wind && m.wind_speed_ms.length) { for (const v of m.wind_speed_ms) d.wind.speed_ms.push(v); for (const v of m.wind_from_deg) d.wind.from_deg.push(v);
        d.wind.frames = d.wind.speed_ms.length / (d.wind.nx * d.wind.ny); }
      for (const e of m.events) d.events.push(e);
      if (m.type === "end") { d.incidents = m.incidents; d.results = m.results; es.close(); $("title").textContent += " · finished"; }
      $("scrub").max = Math.max(0, d.frames - 1);
      if (view.follow) view.frame = Math.max(0, d.frames - 1);
    };
    es.onerror = () => { if (!view.data || !view.data.results.length) $("title").textContent = (view.data ? view.data.scenario : "race") + " · waiting for the race..."; };
  }

  // ---- geometry ------------------------------------------------------------------------------------------------
  function fit() {
    const d = view.data;
    let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
    const take = (x, y) => { x0 = Math.min(x0, x); y0 = Math.min(y0, y); x1 = Math.max(x1, x); y1 = Math.max(y1, y); };
    const s = d.start_line; take(s[0], s[1]); take(s[2], s[3]);
    for (const st of d.steps) for (let i = 0; i + 1 < st.points.length; i += 2) take(st.points[i], st.points[i + 1]);
    const xs = d.columns.x_m, ys = d.columns.y_m;
    for (let i = 0; i < xs.length; i += Math.max(1, Math.floor(xs.length / 4000))) take(xs[i], ys[i]);
    view.box = [x0 - 60, y0 - 60, x1 + 60, y1 + 60];
  }

  function resize() {
    const r = canvas.getBoundingClientRect(), dpr = window.devicePixelRatio || 1;
    canvas.width = Math.max(1, Math.round(r.width * dpr)); canvas.height = Math.max(1, Math.round(r.height * dpr));
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    if (!view.box) return;
    const [x0, y0, x1, y1] = view.box;
    view.scale = Math.min(r.width / (x1 - x0), r.height / (y1 - y0));
    view.ox = r.width / 2 - view.scale * (x0 + x1) / 2; view.oy = r.height / 2 + view.scale * (y0 + y1) / 2;
  }
  function toScreen(x, y) { return [view.ox + view.scale * x, view.oy - view.scale * y]; }
  function toWorld(px, py) { return [(px - view.ox) / view.scale, (view.oy - py) / view.scale]; }

  // ---- drawing -------------------------------------------------------------------------------------------------
  // Wind speed from sand (light) to deep plum (strong): an ordered ramp readable without hue discrimination.
  function windColour(ms) {
    const t = Math.max(0, Math.min(1, (ms * KN - 4) / 22));
    const a = [244, 236, 214], b = [201, 160, 150], c = [92, 44, 86];
    const m = t < 0.5 ? a.map((v, i) => v + (b[i] - v) * t * 2) : b.map((v, i) => v + (c[i] - v) * (t - 0.5) * 2);
    return `rgb(${m.map(Math.round).join(",")})`;
  }

  function drawWind(t) {
    const w = view.data.wind; if (!w || !w.frames) return;
    const f = Math.max(0, Math.min(w.frames - 1, Math.round((t - w.start_s) / w.interval_s)));
    const base = f * w.nx * w.ny;
    const cs = w.cell_m * view.scale;
    for (let j = 0; j < w.ny; j++) for (let i = 0; i < w.nx; i++) {
      const [sx, sy] = toScreen(w.x0_m + i * w.cell_m, w.y0_m + (j + 1) * w.cell_m);
      ctx.fillStyle = windColour(w.speed_ms[base + j * w.nx + i]);
      ctx.globalAlpha = 0.55; ctx.fillRect(sx, sy, cs + 1, cs + 1);
    }
    ctx.globalAlpha = 0.6; ctx.strokeStyle = "#3b3345"; ctx.lineWidth = 1;
    for (let j = 1; j < w.ny; j += 3) for (let i = 1; i < w.nx; i += 3) {
      const k = base + j * w.nx + i, from = w.from_deg[k] * Math.PI / 180, len = Math.min(26, 0.9 * cs * 3) * 0.5;
      const [cx, cy] = toScreen(w.x0_m + (i + 0.5) * w.cell_m, w.y0_m + (j + 0.5) * w.cell_m);
      const dx = -Math.sin(from), dy = Math.cos(from); // the way the wind blows, on screen (y down)
      ctx.beginPath(); ctx.moveTo(cx - dx * len, cy - dy * len); ctx.lineTo(cx + dx * len, cy + dy * len);
      ctx.moveTo(cx + dx * len, cy + dy * len); ctx.lineTo(cx + dx * len * 0.4 - dy * len * 0.35, cy + dy * len * 0.4 + dx * len * 0.35);
      ctx.moveTo(cx + dx * len, cy + dy * len); ctx.lineTo(cx + dx * len * 0.4 + dy * len * 0.35, cy + dy * len * 0.4 - dx * len * 0.35);
      ctx.stroke();
    }
    ctx.globalAlpha = 1;
  }

  function drawCourse() {
    const d = view.data;
    ctx.lineWidth = 2; ctx.strokeStyle = "#1f2430"; ctx.setLineDash([6, 4]);
    const s = d.start_line, a = toScreen(s[0], s[1]), b = toScreen(s[2], s[3]);
    ctx.beginPath(); ctx.moveTo(a[0], a[1]); ctx.lineTo(b[0], b[1]); ctx.stroke(); ctx.setLineDash([]);
    ctx.font = "11px system-ui"; ctx.fillStyle = "#1f2430"; ctx.fillText("start", (a[0] + b[0]) / 2 - 12, (a[1] + b[1]) / 2 + 14);
    d.steps.forEach((st, i) => {
      const p = st.points;
      if (st.kind === "finish" || (st.kind === "gate" && p.length >= 4)) {
        const u = toScreen(p[0], p[1]), v = toScreen(p[2], p[3]);
        ctx.strokeStyle = st.kind === "finish" ? "#2f6b2f" : "#1f2430"; ctx.setLineDash(st.kind === "finish" ? [2, 3] : []);
        ctx.beginPath(); ctx.moveTo(u[0], u[1]); ctx.lineTo(v[0], v[1]); ctx.stroke(); ctx.setLineDash([]);
      }
      for (let q = 0; q + 1 < p.length; q += 2) {
        const m = toScreen(p[q], p[q + 1]);
        ctx.fillStyle = st.kind === "finish" ? "#2f6b2f" : "#e2572b"; ctx.strokeStyle = "#1f2430"; ctx.lineWidth = 1.5;
        // Marks are triangles (not circles) with their step number.
        ctx.beginPath(); ctx.moveTo(m[0], m[1] - 7); ctx.lineTo(m[0] + 6, m[1] + 5); ctx.lineTo(m[0] - 6, m[1] + 5); ctx.closePath(); ctx.fill(); ctx.stroke();
        ctx.fillStyle = "#1f2430"; ctx.fillText(`${st.name === String(i + 1) ? "mark " + st.name : (i + 1) + " " + st.name}${st.rounding && st.kind === "mark" ? " (" + st.rounding + ")" : ""}`, m[0] + 8, m[1] - 6);
      }
    });
  }

  function drawLaylines(b, k) {
    const d = view.data, next = d.next_step[k * view.n + b];
    if (next === undefined || next >= d.steps.length) return;
    const st = d.steps[next], p = st.points; if (p.length < 2) return;
    const from = val("twd_deg", k, b);
    // The selected board's own close-hauled angle: its true wind angle when beating now, else 45 deg.
    let twa = Math.abs(val("twa_deg", k, b)); if (!(twa > 25 && twa < 80)) twa = 45;
    const m = toScreen(p[0], p[1]);
    ctx.strokeStyle = HUES[b % HUES.length]; ctx.lineWidth = 1.2; ctx.setLineDash([10, 6]); ctx.globalAlpha = 0.9;
    for (const side of [-1, 1]) {
      // A board on a layline fetches the mark sailing close-hauled (heading from +- twa): the line runs back from the
      // mark the opposite way.
      const dir = (from + side * twa + 180) * Math.PI / 180, len = 900 * view.scale;
      ctx.beginPath(); ctx.moveTo(m[0], m[1]); ctx.lineTo(m[0] + Math.sin(dir) * len, m[1] - Math.cos(dir) * len); ctx.stroke();
    }
    ctx.setLineDash([]); ctx.globalAlpha = 1;
  }

  function drawBoards(k) {
    const d = view.data, n = view.n, trailFrames = Math.round(60 / d.interval_s);
    // Fading trails.
    for (let b = 0; b < n; b++) {
      ctx.strokeStyle = HUES[b % HUES.length]; ctx.lineWidth = b === view.selected ? 2.2 : 1.2;
      let prev = null;
      for (let j = Math.max(0, k - trailFrames); j <= k; j++) {
        const p = toScreen(val("x_m", j, b), val("y_m", j, b));
        if (prev) { ctx.globalAlpha = 0.08 + 0.8 * (j - (k - trailFrames)) / trailFrames; ctx.beginPath(); ctx.moveTo(prev[0], prev[1]); ctx.lineTo(p[0], p[1]); ctx.stroke(); }
        prev = p;
      }
    }
    ctx.globalAlpha = 1;
    for (let b = 0; b < n; b++) {
      const x = val("x_m", k, b), y = val("y_m", k, b), h = val("heading_deg", k, b) * Math.PI / 180;
      const awa = val("awa_deg", k, b), fl = flag(k, b);
      const [sx, sy] = toScreen(x, y);
      const L = Math.max(12, 2.4 * view.scale), fx = Math.sin(h), fy = -Math.cos(h);
      // Wind shadow: a faint wedge downwind of the sail along the apparent wind.
      if (!(fl & 16) && !(fl & 32)) {
        const appFrom = h + awa * Math.PI / 180, ax = -Math.sin(appFrom), ay = Math.cos(appFrom), sl = Math.max(24, 30 * view.scale);
        ctx.fillStyle = "rgba(40, 40, 70, 0.10)"; ctx.beginPath(); ctx.moveTo(sx, sy);
        ctx.lineTo(sx + ax * sl - ay * sl * 0.25, sy + ay * sl + ax * sl * 0.25); ctx.lineTo(sx + ax * sl + ay * sl * 0.25, sy + ay * sl - ax * sl * 0.25); ctx.closePath(); ctx.fill();
      }
      // Hull.
      ctx.fillStyle = fl & 32 ? "#8a8a8a" : HUES[b % HUES.length]; ctx.strokeStyle = b === view.selected ? "#000" : "#fff"; ctx.lineWidth = b === view.selected ? 2 : 1;
      const px = -fy, py = fx, w = L * 0.16;
      ctx.beginPath(); ctx.moveTo(sx + fx * L / 2, sy + fy * L / 2);
      ctx.lineTo(sx - fx * L / 2 + px * w, sy - fy * L / 2 + py * w); ctx.lineTo(sx - fx * L / 2 - px * w, sy - fy * L / 2 - py * w); ctx.closePath(); ctx.fill(); ctx.stroke();
      // Sail: from the mast, aft and to leeward (the side away from the apparent wind), boom angle from the trim.
      if (!(fl & 16)) {
        const side = awa >= 0 ? -1 : 1; // wind over starboard (awa > 0): sail to port
        const boom = (Math.max(8, Math.min(80, Math.abs(awa) - 12 - 6 * (1 - val("sheet", k, b))))) * Math.PI / 180;
        const mx = sx + fx * L * 0.15, my = sy + fy * L * 0.15;
        const bx = -fx * Math.cos(boom) + side * px * Math.sin(boom), by = -fy * Math.cos(boom) + side * py * Math.sin(boom);
        ctx.strokeStyle = "#1f2430"; ctx.lineWidth = 2; ctx.beginPath(); ctx.moveTo(mx, my); ctx.lineTo(mx + bx * L * 0.7, my + by * L * 0.7); ctx.stroke();
      } else { ctx.fillStyle = "#1f2430"; ctx.fillText("in the water", sx + 8, sy + 12); }
      ctx.fillStyle = "#1f2430"; ctx.font = "10px system-ui"; ctx.fillText(String(b + 1), sx + 7, sy - 6);
    }
  }

  function drawContacts(t) {
    for (const c of view.data.incidents || []) {
      if (c.time_s > t || c.time_s < t - 20) continue;
      const [sx, sy] = toScreen(c.x_m, c.y_m);
      ctx.strokeStyle = "#a3361c"; ctx.lineWidth = 2; ctx.beginPath(); ctx.arc(sx, sy, 12, 0, 2 * Math.PI); ctx.stroke();
      ctx.fillStyle = "#a3361c"; ctx.fillText("rule " + c.rule, sx + 14, sy + 4);
    }
  }

  // ---- panel ---------------------------------------------------------------------------------------------------
  function progressOf(k, b) {
    // Course progress for standings: steps done, then closeness to the next step's point.
    const d = view.data, next = d.next_step[k * view.n + b] || 0, fl = flag(k, b);
    const res = (d.results || []).find((r) => r.board === b);
    if ((fl & 32) && res && res.place) return 1e9 - res.place;
    const st = d.steps[Math.min(next, d.steps.length - 1)], p = st.points;
    const dx = val("x_m", k, b) - p[0], dy = val("y_m", k, b) - p[1];
    return next * 1e5 - Math.sqrt(dx * dx + dy * dy);
  }

  function panel(k) {
    const d = view.data, t = timeOf(k);
    const order = [...Array(view.n).keys()].sort((a, b) => progressOf(k, b) - progressOf(k, a));
    const ol = $("standings"); ol.innerHTML = "";
    order.forEach((b) => { const li = document.createElement("li"); li.textContent = `${b + 1} ${d.boards[b].name}`; if (b === view.selected) li.className = "sel"; ol.appendChild(li); });
    const ul = $("contacts"); ul.innerHTML = "";
    for (const c of d.incidents || []) {
      if (c.time_s > t) continue;
      const li = document.createElement("li");
      const who = (i) => (i >= 0 ? d.boards[i].name : "-");
      li.textContent = `${fmt(c.time_s)} rule ${c.rule}: ${who(c.keep_clear)} / ${who(c.right_of_way)}${c.penalty ? ", penalty" : ""}`;
      ul.appendChild(li);
    }
    const b = view.selected;
    if (b < 0) return;
    const fl = flag(k, b), heel = val("heel_use", k, b), res = val("reserve", k, b);
    $("panel-name").textContent = `${b + 1}. ${d.boards[b].name}`;
    $("panel-sub").textContent = `${d.boards[b].equipment} · ${d.boards[b].sail_m2} m² · ${d.boards[b].rider_kg} kg`;
    const rows = [
      ["speed", (val("speed_ms", k, b) * KN).toFixed(1) + " kn"],
      ["true wind", (val("tws_ms", k, b) * KN).toFixed(1) + " kn from " + Math.round(val("twd_deg", k, b)) + "°"],
      ["true wind angle", Math.round(val("twa_deg", k, b)) + "°"],
      ["apparent wind angle", Math.round(val("awa_deg", k, b)) + "°"],
      ["attack angle", val("attack_deg", k, b).toFixed(1) + "°"],
      ["heeling moment used", Math.round(100 * heel) + " %"],
      ["leeway", val("leeway_deg", k, b).toFixed(1) + "°"],
      ["planing", fl & 1 ? "yes" : "no"],
      ["pumping", fl & 2 ? "yes" : "no"],
      ["energy reserve", Math.round(100 * res) + " %"],
      ["place", String(order.indexOf(b) + 1) + " of " + view.n],
      ["state", fl & 32 ? "finished" : fl & 16 ? "in the water" : fl & 4 ? "tacking" : fl & 8 ? "gybing" : fl & 64 ? "returning (early start)" : "racing"],
    ];
    const dl = $("panel-values"); dl.innerHTML = "";
    for (const [name, v] of rows) { const dt = document.createElement("dt"); dt.textContent = name; const dd = document.createElement("dd"); dd.textContent = v; dd.dataset.key = name; dl.append(dt, dd); }
    speedChart(k, b);
  }

  function speedChart(k, b) {
    const w = chart.width, h = chart.height, d = view.data, span = Math.round(90 / d.interval_s);
    cctx.clearRect(0, 0, w, h);
    let max = 1; for (let j = Math.max(0, k - span); j <= k; j++) max = Math.max(max, val("speed_ms", j, b) * KN);
    max = Math.ceil(max / 5) * 5;
    cctx.strokeStyle = "#ddd"; cctx.fillStyle = "#6a6252"; cctx.font = "10px system-ui";
    for (let g = 0; g <= max; g += 5) { const y = h - 14 - (h - 24) * g / max; cctx.beginPath(); cctx.moveTo(24, y); cctx.lineTo(w, y); cctx.stroke(); cctx.fillText(g + "", 4, y + 3); }
    cctx.fillText("kn, last 90 s", w - 70, h - 2);
    cctx.strokeStyle = HUES[b % HUES.length]; cctx.lineWidth = 2; cctx.beginPath();
    for (let j = Math.max(0, k - span), first = true; j <= k; j++) {
      const x = 24 + (w - 28) * (j - (k - span)) / span, y = h - 14 - (h - 24) * (val("speed_ms", j, b) * KN) / max;
      if (first) { cctx.moveTo(x, y); first = false; } else cctx.lineTo(x, y);
    }
    cctx.stroke();
  }

  function fmt(t) { const s = Math.abs(t), m = Math.floor(s / 60); return (t < 0 ? "-" : "") + m + ":" + String(Math.floor(s % 60)).padStart(2, "0"); }

  // ---- loop and input ------------------------------------------------------------------------------------------
  function render() {
    const d = view.data; if (!d || !d.frames) return;
    const k = Math.max(0, Math.min(d.frames - 1, view.frame)), t = timeOf(k);
    const r = canvas.getBoundingClientRect();
    ctx.clearRect(0, 0, r.width, r.height);
    ctx.fillStyle = "#e4e9ec"; ctx.fillRect(0, 0, r.width, r.height);
    drawWind(t); drawCourse();
    if (view.selected >= 0) drawLaylines(view.selected, k);
    drawBoards(k); drawContacts(t);
    $("clock").textContent = (t < 0 ? "start in " + fmt(-t) : fmt(t)) + (view.playing ? "  ▶ x" + view.speed : "");
    $("scrub").value = k;
    panel(k);
  }

  function tick(now) {
    const d = view.data;
    if (view.playing && d && d.frames) {
      const dt = view.last ? (now - view.last) / 1000 : 0;
      view.acc += dt * view.speed / d.interval_s;
      const step = Math.floor(view.acc); view.acc -= step;
      view.frame = Math.min(d.frames - 1, view.frame + step);
      if (view.frame >= d.frames - 1 && !d.live) view.playing = false;
    }
    view.last = now;
    render();
    $("play").textContent = view.playing ? "Pause" : "Play";
    requestAnimationFrame(tick);
  }

  function pick(px, py) {
    let best = -1, bd = 14 * 14;
    for (let b = 0; b < view.n; b++) {
      const [sx, sy] = toScreen(val("x_m", view.frame, b), val("y_m", view.frame, b));
      const d2 = (sx - px) ** 2 + (sy - py) ** 2; if (d2 < bd) { bd = d2; best = b; }
    }
    return best;
  }

  // Drag to pan (a press that moves more than a few pixels is a drag, not a click); double-click to fit the course.
  let drag = null;
  canvas.addEventListener("mousedown", (e) => { drag = { x: e.clientX, y: e.clientY, ox: view.ox, oy: view.oy, moved: false }; });
  window.addEventListener("mouseup", () => { setTimeout(() => { drag = null; }, 0); });
  canvas.addEventListener("mousemove", (e) => {
    if (!drag || !(e.buttons & 1)) return;
    const dx = e.clientX - drag.x, dy = e.clientY - drag.y;
    if (Math.abs(dx) + Math.abs(dy) > 4) drag.moved = true;
    if (drag.moved) { view.ox = drag.ox + dx; view.oy = drag.oy + dy; }
  });
  canvas.addEventListener("dblclick", () => resize());
  canvas.addEventListener("click", (e) => {
    if (!view.data || (drag && drag.moved)) return;
    const r = canvas.getBoundingClientRect(); const b = pick(e.clientX - r.left, e.clientY - r.top); if (b >= 0) view.selected = b;
  });
  canvas.addEventListener("mousemove", (e) => {
    if (!view.data) return;
    const r = canvas.getBoundingClientRect(), b = pick(e.clientX - r.left, e.clientY - r.top), tip = $("tip");
    if (b < 0) { tip.hidden = true; return; }
    tip.hidden = false; tip.textContent = `${b + 1}. ${view.data.boards[b].name}`;
    tip.style.left = (e.clientX - r.left + 12) + "px"; tip.style.top = (e.clientY - r.top - 8) + "px";
  });
  canvas.addEventListener("wheel", (e) => {
    if (!view.box) return; e.preventDefault();
    const r = canvas.getBoundingClientRect(), [wx, wy] = toWorld(e.clientX - r.left, e.clientY - r.top), f = e.deltaY < 0 ? 1.2 : 1 / 1.2;
    view.scale *= f; view.ox = e.clientX - r.left - view.scale * wx; view.oy = e.clientY - r.top + view.scale * wy;
  }, { passive: false });
  $("play").addEventListener("click", () => toggle());
  $("speed").addEventListener("change", (e) => { view.speed = Number(e.target.value); });
  $("scrub").addEventListener("input", (e) => { view.frame = Number(e.target.value); view.follow = false; });
  function toggle() { const d = view.data; if (!d) return; if (!view.playing && view.frame >= d.frames - 1 && !d.live) view.frame = 0; view.playing = !view.playing; view.follow = false; }
  function setSpeed(dir) { const opts = [1, 2, 4, 8, 16, 32]; let i = opts.indexOf(view.speed) + dir; i = Math.max(0, Math.min(opts.length - 1, i)); view.speed = opts[i]; $("speed").value = String(view.speed); }
  document.addEventListener("keydown", (e) => {
    const d = view.data; if (!d) return;
    const per = Math.round(5 / d.interval_s);
    switch (e.key) {
      case " ": e.preventDefault(); toggle(); break;
      case "ArrowRight": view.frame = Math.min(d.frames - 1, view.frame + per); break;
      case "ArrowLeft": view.frame = Math.max(0, view.frame - per); break;
      case "+": case "=": setSpeed(1); break;
      case "-": setSpeed(-1); break;
      case "]": view.selected = (view.selected + 1) % view.n; break;
      case "[": view.selected = (view.selected - 1 + view.n) % view.n; break;
      case "Home": view.frame = 0; break;
      case "End": view.frame = d.frames - 1; break;
      default: return;
    }
  });
  window.addEventListener("resize", resize);
  load();
})();
