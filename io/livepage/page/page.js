// The live page of a rollerbed run: it follows the server's event stream
// and draws each view it receives. Everything it needs comes from this
// server; it loads nothing from elsewhere.
"use strict";

(function () {
  const $ = (id) => document.getElementById(id);
  // What the page has drawn, for people reading it with a script (tests).
  window.rollerbed = { views: 0, time: null, state: "connecting" };

  function fmt(v, digits) {
    if (v === null || v === undefined || !isFinite(v)) return "–";
    if (v === Math.trunc(v) && Math.abs(v) < 1e15) return String(v);
    const a = Math.abs(v), d = digits || 4;
    if (a < 1e-3 || a >= 1e6) return Number(v).toExponential(d - 1).replace(/\.?0+e/, "e");
    return String(Number(Number(v).toPrecision(d)));
  }

  function duration(s) {
    if (s === null || s < 0 || !isFinite(s)) return "not known yet";
    s = Math.round(s);
    const h = Math.floor(s / 3600), m = Math.floor((s % 3600) / 60), r = s % 60;
    if (h > 0) return h + " h " + String(m).padStart(2, "0") + " min";
    if (m > 0) return m + " min " + String(r).padStart(2, "0") + " s";
    return r + " s";
  }

  // ticks returns about n round values from lo to hi.
  function ticks(lo, hi, n) {
    if (!(hi > lo)) return [lo];
    const raw = (hi - lo) / n, e = Math.pow(10, Math.floor(Math.log10(raw)));
    let step = e;
    for (const m of [1, 2, 2.5, 5, 10]) { if (m * e >= raw) { step = m * e; break; } }
    const out = [];
    for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
    return out;
  }

  function text(ctx, s, x, y, align, base) {
    ctx.textAlign = align || "left";
    ctx.textBaseline = base || "alphabetic";
    ctx.fillText(s, x, y);
  }

  // axes draws the ticks and labels of a plot's box b (left, top, width,
  // height in pixels): xs along the bottom at X(x) with the label xlabel,
  // zs up the left at Z(z), labelled z [m].
  function axes(ctx, b, xs, X, xlabel, zs, Z, font) {
    ctx.fillStyle = "#1b1f24";
    ctx.font = font;
    const bottom = b.T + b.h;
    for (const x of xs) { ctx.beginPath(); ctx.moveTo(X(x), bottom); ctx.lineTo(X(x), bottom + 6); ctx.stroke(); text(ctx, fmt(x, 3), X(x), bottom + 24, "center"); }
    for (const z of zs) { ctx.beginPath(); ctx.moveTo(b.L - 6, Z(z)); ctx.lineTo(b.L, Z(z)); ctx.stroke(); text(ctx, fmt(z, 3), b.L - 10, Z(z), "right", "middle"); }
    text(ctx, xlabel, b.L + b.w / 2, bottom + 48, "center");
    ctx.save();
    ctx.translate(18, b.T + b.h / 2);
    ctx.rotate(-Math.PI / 2);
    text(ctx, "z [m]", 0, 0, "center", "middle");
    ctx.restore();
  }

  const images = new Map(); // map name -> {canvas, caption}

  function mapFigure(name) {
    let f = images.get(name);
    if (f) return f;
    const fig = document.createElement("figure");
    const cv = document.createElement("canvas");
    cv.id = "map-" + name;
    cv.className = "map";
    cv.width = 1240;
    cv.height = 420;
    const cap = document.createElement("figcaption");
    fig.append(cv, cap);
    $("maps").append(fig);
    f = { canvas: cv, caption: cap };
    images.set(name, f);
    return f;
  }

  function drawMap(v, m) {
    const f = mapFigure(m.name);
    const img = new Image();
    const bar = new Image();
    let left = 2;
    const done = () => { if (--left === 0) paintMap(f, v, m, img, bar); };
    img.onload = done;
    bar.onload = done;
    img.src = m.image;
    bar.src = m.bar;
    const what = m.name === "vorticity"
      ? "Spanwise vorticity ω = ∂u/∂z − ∂w/∂x: red turns clockwise (the shear of a faster flow above), blue anticlockwise; the rollers are the red blobs along the canopy top."
      : "Concentration of " + m.name + ": pale is the lowest value on the map, dark the highest.";
    f.caption.textContent = what + " At t = " + fmt(v.t) + " s; " + v.stretch +
      (m.diverging ? "; colours end at ±" + fmt(m.hi, 3) + " (99th percentile of |ω|)" : "; colours from " + fmt(m.lo, 3) + " to " + fmt(m.hi, 3)) +
      (v.outline.length ? "; black-and-white line: the canopy edge." : ".");
  }

  function paintMap(f, v, m, img, bar) {
    const cv = f.canvas, ctx = cv.getContext("2d");
    const L = 80, R = 150, T = 14, B = 56;
    const w = cv.width - L - R;
    const h = Math.round(w * img.height / img.width);
    cv.height = h + T + B;
    ctx.fillStyle = "#fff";
    ctx.fillRect(0, 0, cv.width, cv.height);
    ctx.imageSmoothingEnabled = true;
    ctx.drawImage(img, L, T, w, h);
    const X = (x) => L + x / v.lx * w, Z = (z) => T + h - z / v.h * h;
    for (const pass of [["#fff", 3.5], ["#000", 1.5]]) {
      ctx.strokeStyle = pass[0];
      ctx.lineWidth = pass[1];
      ctx.beginPath();
      for (const s of v.outline) { ctx.moveTo(X(s[0]), Z(s[1])); ctx.lineTo(X(s[2]), Z(s[3])); }
      ctx.stroke();
    }
    ctx.strokeStyle = "#333";
    ctx.lineWidth = 1;
    ctx.strokeRect(L, T, w, h);
    axes(ctx, { L, T, w, h }, ticks(0, v.lx, 8), X, "x [m]", ticks(0, v.h, 4), Z, "18px sans-serif");
    // The colour bar.
    const bx = L + w + 24, bw = 22;
    ctx.imageSmoothingEnabled = false;
    ctx.drawImage(bar, bx, T, bw, h);
    ctx.strokeRect(bx, T, bw, h);
    const marks = m.diverging ? [m.lo, 0, m.hi] : [m.lo, m.hi];
    for (const val of marks) {
      const y = T + h - (val - m.lo) / (m.hi - m.lo) * h;
      text(ctx, fmt(val, 3), bx + bw + 6, y, "left", "middle");
    }
    ctx.save();
    ctx.translate(cv.width - 12, T + h / 2);
    ctx.rotate(-Math.PI / 2);
    text(ctx, m.label, 0, 0, "center", "middle");
    ctx.restore();
  }

  function drawProfile(v) {
    const cv = $("profile"), ctx = cv.getContext("2d");
    const L = 80, R = 20, T = 16, B = 60;
    const w = cv.width - L - R, h = cv.height - T - B;
    ctx.fillStyle = "#fff";
    ctx.fillRect(0, 0, cv.width, cv.height);
    const pts = [];
    v.profile.z.forEach((z, i) => { const u = v.profile.u[i]; if (z !== null && u !== null) pts.push([u, z]); });
    if (pts.length < 2) { ctx.fillStyle = "#5a6270"; ctx.font = "18px sans-serif"; text(ctx, "no profile yet", cv.width / 2, cv.height / 2, "center"); return; }
    let lo = Math.min(0, ...pts.map((p) => p[0])), hi = Math.max(...pts.map((p) => p[0]));
    if (!(hi > lo)) hi = lo + 1;
    const U = (u) => L + (u - lo) / (hi - lo) * w, Z = (z) => T + h - z / v.h * h;
    ctx.strokeStyle = "#333";
    ctx.lineWidth = 1;
    ctx.strokeRect(L, T, w, h);
    axes(ctx, { L, T, w, h }, ticks(lo, hi, 5), U, "U [m/s]", ticks(0, v.h, 5), Z, "17px sans-serif");
    if (v.canopy_top > 0) {
      ctx.setLineDash([8, 6]);
      ctx.strokeStyle = "#0e5a6b";
      ctx.lineWidth = 2;
      ctx.beginPath(); ctx.moveTo(L, Z(v.canopy_top)); ctx.lineTo(L + w, Z(v.canopy_top)); ctx.stroke();
      ctx.setLineDash([]);
      ctx.fillStyle = "#0e5a6b";
      text(ctx, "canopy top", L + w - 6, Z(v.canopy_top) - 6, "right");
    }
    ctx.strokeStyle = "#8a2a17";
    ctx.lineWidth = 3;
    ctx.beginPath();
    pts.forEach((p, i) => { if (i === 0) ctx.moveTo(U(p[0]), Z(p[1])); else ctx.lineTo(U(p[0]), Z(p[1])); });
    ctx.stroke();
    $("profile-caption").textContent = v.profile.what + (v.canopy_top > 0 ? " The dashed line is the canopy top; the bend of the profile there is the shear layer where the rollers form." : "");
  }

  function spark(cv, hist) {
    const ctx = cv.getContext("2d");
    ctx.clearRect(0, 0, cv.width, cv.height);
    if (hist.length < 2) return;
    const ts = hist.map((p) => p[0]), vs = hist.map((p) => p[1]);
    const t0 = Math.min(...ts), t1 = Math.max(...ts);
    let lo = Math.min(...vs), hi = Math.max(...vs);
    if (!(hi > lo)) { lo -= 1; hi += 1; }
    ctx.strokeStyle = "#0e5a6b";
    ctx.lineWidth = 2;
    ctx.beginPath();
    hist.forEach((p, i) => {
      const x = 2 + (p[0] - t0) / ((t1 - t0) || 1) * (cv.width - 4), y = cv.height - 3 - (p[1] - lo) / (hi - lo) * (cv.height - 6);
      if (i === 0) ctx.moveTo(x, y); else ctx.lineTo(x, y);
    });
    ctx.stroke();
  }

  function drawMetrics(v) {
    const body = $("metrics").tBodies[0];
    body.replaceChildren();
    for (const m of v.metrics) {
      const tr = document.createElement("tr");
      tr.dataset.key = m.key;
      const name = document.createElement("td"); name.textContent = m.label;
      const val = document.createElement("td"); val.className = "value"; val.textContent = fmt(m.value, 4);
      const unit = document.createElement("td"); unit.textContent = m.unit || "–";
      const h = document.createElement("td");
      const cv = document.createElement("canvas"); cv.width = 180; cv.height = 40;
      h.append(cv);
      tr.append(name, val, unit, h);
      body.append(tr);
      spark(cv, m.history);
    }
  }

  function list(id, box, items, make) {
    $(box).hidden = items.length === 0;
    $(id).replaceChildren(...items.map(make));
  }

  function show(v) {
    document.title = (v.title || "rollerbed") + " — " + v.state;
    $("title").textContent = v.title || "rollerbed run";
    const st = $("state");
    st.textContent = v.state;
    st.className = "state " + v.state;
    $("source").textContent = v.source;
    $("note").textContent = v.note;
    const frac = v.end > 0 ? Math.min(1, v.t / v.end) : 0;
    $("progress").value = frac;
    let clock = "t = " + fmt(v.t) + " s of " + fmt(v.end) + " s simulated (" + (100 * frac).toFixed(1) + " %)";
    if (v.steps > 0) clock += " · step " + v.steps;
    if (v.state === "running") clock += " · time left " + duration(v.eta_s);
    if (v.steps_per_s > 0) clock += " · " + fmt(v.steps_per_s, 3) + " steps/s";
    $("clock").textContent = clock;
    for (const m of v.maps) drawMap(v, m);
    drawProfile(v);
    drawMetrics(v);
    list("warnings", "warnings-box", v.warnings, (w) => { const li = document.createElement("li"); li.textContent = w; return li; });
    list("links", "links-box", v.links, (name) => {
      const li = document.createElement("li");
      const a = document.createElement("a");
      a.href = "files/" + name.split("/").map(encodeURIComponent).join("/");
      a.textContent = name;
      li.append(a);
      return li;
    });
    window.rollerbed.views++;
    window.rollerbed.time = v.t;
    window.rollerbed.state = v.state;
  }

  function connect() {
    const es = new EventSource("events");
    es.addEventListener("view", (e) => show(JSON.parse(e.data)));
    es.onerror = () => {
      const st = $("state");
      st.textContent = "connection lost — reconnecting";
      st.className = "state lost";
      window.rollerbed.state = "lost";
    };
  }
  connect();
})();
