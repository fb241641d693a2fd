// The review page: sign-in and the drill-down into each tree (the rows overview is overview.js, loaded first).
// Plain script against the service's own JSON endpoints; nothing is fetched from elsewhere.
"use strict";

const $ = (id) => document.getElementById(id);
const svgNs = "http://www.w3.org/2000/svg";

async function getJson(path) {
  const response = await fetch(path, { credentials: "same-origin" });
  if (!response.ok) throw new Error(`${path}: ${response.status}`);
  return response.json();
}

// The tree's current schedule; while its newest scan is being planned (404) an empty one, so the scan still draws.
async function getSchedule(treeId) {
  const path = `/api/v1/trees/${encodeURIComponent(treeId)}/schedule`;
  const response = await fetch(path, { credentials: "same-origin" });
  if (response.status === 404) return { version: null, pending: true, status: "planning", totalSeconds: 0, armSeconds: 0, platformSeconds: 0, stops: [], unscheduled: [], problems: [] };
  if (!response.ok) throw new Error(`${path}: ${response.status}`);
  return response.json();
}

function el(tag, attributes = {}, text) {
  const node = tag.startsWith("svg:") ? document.createElementNS(svgNs, tag.slice(4)) : document.createElement(tag);
  for (const [k, v] of Object.entries(attributes)) node.setAttribute(k, v);
  if (text !== undefined) node.textContent = text;
  return node;
}

async function start() {
  const session = await getJson("/review/session");
  // Sign-in and sign-out send the page's antiforgery token back with the form.
  for (const input of document.querySelectorAll("input[name=_af]")) input.value = session.antiforgery;
  if (!session.signedIn) {
    $("sign-in").hidden = false;
    $("sign-in-failed").hidden = !location.search.includes("signin=failed");
    return;
  }
  $("sign-out").hidden = false;
  await showOverview();
}

async function showTree(treeId) {
  const [scan, schedule] = await Promise.all([getJson(`/api/v1/trees/${encodeURIComponent(treeId)}/scan`), getSchedule(treeId)]);
  $("overview").hidden = true;
  $("tree").hidden = false;
  $("tree-title").textContent = `Tree ${scan.treeId} — ${scan.block}, row ${scan.row}, position ${scan.positionInRow}`;
  const steps = schedule.stops.flatMap((s) => s.steps);
  const travelSeconds = steps.reduce((sum, s) => sum + s.travelSeconds, 0);
  $("tree-summary").textContent = schedule.pending
    ? "Not planned yet: this scan of the tree is being planned; its cut order appears here when it is ready."
    : `Schedule version ${schedule.version} (${schedule.status}): ${steps.length} cuts from ${schedule.stops.length} stop${schedule.stops.length === 1 ? "" : "s"} in ${schedule.totalSeconds.toFixed(1)} s `
      + `(${travelSeconds.toFixed(1)} s moving between cuts, ${schedule.platformSeconds.toFixed(1)} s moving the platform).`;
  $("tree-problems").replaceChildren(...schedule.problems.map((p) => el("li", { class: "problem" }, `${p.code}: ${p.message}`)));
  $("stop-list").replaceChildren(...schedule.stops.map((s) => el("li", {},
    `Stop S${s.sequence}, ${s.side === "near" ? "near side" : "far side (worked from the next alley)"}: ${signed(s.alongRowOffsetM)} m along the row, ${signed(s.intoAlleyOffsetM)} m into the alley from the tablet's stand; `
    + `${s.steps.length} cuts, platform move ${s.platformMoveSeconds.toFixed(1)} s, back to stow ${s.returnSeconds.toFixed(1)} s.`)));
  const nodes = new Map(scan.nodes.map((n) => [n.id, n]));
  const branches = new Map(scan.branches.map((b) => [b.id, b]));
  const cutPoint = (cut) => {
    const b = branches.get(cut.branchId), f = nodes.get(b.fromNode), t = nodes.get(b.toNode), s = cut.positionAlong;
    return { x: f.xM + (t.xM - f.xM) * s, y: f.yM + (t.yM - f.yM) * s, z: f.zM + (t.zM - f.zM) * s };
  };
  const order = new Map(steps.map((s) => [s.cutId, s.sequence]));
  const left = new Map(schedule.unscheduled.map((u) => [u.cutId, u]));
  $("front").replaceChildren(drawTree(scan, nodes, cutPoint, order, left, schedule, "x"));
  $("side").replaceChildren(drawTree(scan, nodes, cutPoint, order, left, schedule, "y"));
  $("timeline").replaceChildren(drawTimeline(schedule));
  $("cut-list").replaceChildren(...steps.map((s) => el("li", {}, `${s.cutId} (stop S${stopOf(schedule, s).sequence}): starts at ${s.startSecond.toFixed(1)} s — travel ${s.travelSeconds.toFixed(2)} s, approach ${s.approachSeconds.toFixed(2)} s, cut ${s.cutSeconds.toFixed(2)} s, retract ${s.retractSeconds.toFixed(2)} s`
    + (s.dependsOnCuts.length > 0 ? `; the move needs the wood of ${s.dependsOnCuts.join(", ")} gone` : ""))));
  $("left-out").replaceChildren(...schedule.unscheduled.map((u) => el("li", {}, `${u.cutId}: ${u.status}${u.reason ? " (" + u.reason + ")" : ""}`
    + `${u.nearestStop ? `, nearest stop S${u.nearestStop}` : ""}${u.shortfallMm ? `, ${u.shortfallMm.toFixed(0)} mm short` : ""}${u.blockedBy ? `, blocked: ${u.blockedBy}` : ""} — ${u.detail}`)));
  $("back").focus();
}

const signed = (v) => (v > 0 ? "+" : v < 0 ? "−" : "") + Math.abs(v).toFixed(2);
const stopOf = (schedule, step) => schedule.stops.find((s) => s.steps.includes(step));

// Places text labels so that none overlaps another: each label tries its spot, then spots around it.
function labelPlacer() {
  const boxes = [];
  const overlaps = (a) => boxes.some((b) => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h);
  return (x, y, w, h) => {
    const tries = [[0, 0], [0, -h - 2], [0, h + 2], [w / 2 + 6, 0], [-w / 2 - 6, 0], [w / 2 + 6, -h], [-w / 2 - 6, -h], [w / 2 + 6, h], [-w / 2 - 6, h], [0, -2 * h - 4], [0, 2 * h + 4]];
    for (const [dx, dy] of tries) {
      const box = { x: x + dx - w / 2, y: y + dy - h / 2, w, h };
      if (!overlaps(box)) { boxes.push(box); return { x: x + dx, y: y + dy, moved: dx !== 0 || dy !== 0 }; }
    }
    boxes.push({ x: x - w / 2, y: y - h / 2, w, h });
    return { x, y, moved: false };
  };
}

function drawTree(scan, nodes, cutPoint, order, left, schedule, axis) {
  const w = 380, h = 500, pad = 24;
  const stands = schedule.stops.map((s) => s.armBase.positionM);
  const xs = scan.nodes.map((n) => n[axis + "M"]).concat(stands.map((p) => p[axis])), zs = scan.nodes.map((n) => n.zM);
  const minX = Math.min(...xs, -1) - 0.15, maxX = Math.max(...xs, 1) + 0.15, maxZ = Math.max(...zs, 3);
  const scale = Math.min((w - 2 * pad) / (maxX - minX), (h - 2 * pad) / maxZ);
  const px = (v) => pad + (v - minX) * scale, pz = (z) => h - pad - z * scale;
  const svg = el("svg:svg", { width: w, height: h, viewBox: `0 0 ${w} ${h}`, class: `tree-view view-${axis}`, role: "img", "aria-label": `Tree ${scan.treeId}, ${axis === "x" ? "front" : "side"} view` });
  svg.append(el("svg:line", { x1: 0, y1: pz(0), x2: w, y2: pz(0), stroke: "#8a7d5c", "stroke-width": 2 }));
  for (const o of scan.obstacles) {
    svg.append(el("svg:line", { x1: px(o.startM[axis]), y1: pz(o.startM.z), x2: px(o.endM[axis]), y2: pz(o.endM.z), stroke: "#777", "stroke-dasharray": o.kind === "wire" ? "6 4" : "none", "stroke-width": o.kind === "post" ? 6 : 1.5 }));
  }
  for (const b of scan.branches) {
    const f = nodes.get(b.fromNode), t = nodes.get(b.toNode);
    svg.append(el("svg:line", { x1: px(f[axis + "M"]), y1: pz(f.zM), x2: px(t[axis + "M"]), y2: pz(t.zM), stroke: "#6b4f2a", "stroke-width": Math.max(1, (b.fromRadiusM + b.toRadiusM) * scale * 0.8), "stroke-linecap": "round" }));
  }
  // The stops: where the arm base stands (a square, hatched for the far side), numbered S1, S2, …
  const place = labelPlacer();
  for (const stop of schedule.stops) {
    const p = stop.armBase.positionM, x = px(p[axis]), y = pz(p.z);
    const g = el("svg:g", { class: "stop-mark", "data-stop": stop.sequence, "data-side": stop.side });
    g.append(el("svg:rect", { x: x - 7, y: y - 7, width: 14, height: 14, fill: stop.side === "near" ? "#e8e2cf" : "white", stroke: "#1d2a22", "stroke-width": 1.5, "stroke-dasharray": stop.side === "near" ? "none" : "3 2" }));
    const at = place(x, y + 18, 22, 12);
    g.append(el("svg:text", { x: at.x, y: at.y + 4, "text-anchor": "middle", class: "stop-label" }, `S${stop.sequence}`));
    svg.append(g);
  }
  // The tool path between cuts, stop by stop, in schedule order.
  for (const stop of schedule.stops) {
    const path = stop.steps.map((s) => cutPoint(scan.cuts.find((c) => c.id === s.cutId)));
    if (path.length > 1) svg.append(el("svg:polyline", { points: path.map((p) => `${px(p[axis])},${pz(p.z)}`).join(" "), fill: "none", stroke: "#2f5d50", "stroke-width": 1.2, "stroke-dasharray": stop.side === "near" ? "2 3" : "6 3", class: "tool-path" }));
  }
  for (const cut of scan.cuts) {
    const p = cutPoint(cut), x = px(p[axis]), y = pz(p.z);
    if (order.has(cut.id)) {
      const g = el("svg:g", { class: "cut-mark", "data-cut": cut.id });
      g.append(el("svg:circle", { cx: x, cy: y, r: 3, fill: "#1d2a22" }));
      const label = String(order.get(cut.id));
      const at = place(x, y, 8 + 6 * label.length, 14);
      if (at.moved) g.append(el("svg:line", { x1: x, y1: y, x2: at.x, y2: at.y, stroke: "#1d2a22", "stroke-width": 0.6 }));
      g.append(el("svg:rect", { x: at.x - (4 + 3 * label.length), y: at.y - 7, width: 8 + 6 * label.length, height: 14, rx: 7, fill: "white", stroke: "#1d2a22", "stroke-width": 1.2 }));
      g.append(el("svg:text", { x: at.x, y: at.y + 4, "text-anchor": "middle" }, label));
      svg.append(g);
    } else if (left.get(cut.id)?.status === "unreachable") {
      const g = el("svg:g", { class: "cut-unreachable", "data-cut": cut.id });
      g.append(el("svg:text", { x, y: y + 4, "text-anchor": "middle", "font-weight": "bold" }, "✕"));
      const text = `${cut.id} unreachable`;
      const at = place(x + 8 + 3 * text.length, y, 6 * text.length, 12);
      g.append(el("svg:text", { x: at.x, y: at.y + 4, "text-anchor": "middle", class: "unreachable-label" }, text));
      svg.append(g);
    }
  }
  return svg;
}

// The schedule against a time axis: per stop the platform move and any retreat, each cut's travel,
// approach, cut and retract, and the return to stow. Patterns as well as colours tell the phases apart.
function drawTimeline(schedule) {
  const w = 920, rowH = 14, left = 110, total = Math.max(1, schedule.totalSeconds);
  const phases = [["platform", "#f4f1e6", "2 2"], ["retreat", "#f1d9c4", "5 2 1 2"], ["travel", "#d9d3c3", "4 2"], ["approach", "#9fc5b8", "1 2"], ["cut", "#1d2a22", "none"], ["retract", "#c6e0d7", "6 2"], ["return", "#e3dcc8", "8 3"]];
  const style = Object.fromEntries(phases.map(([name, fill, dash]) => [name, { fill, dash }]));
  const lines = [];
  for (const stop of schedule.stops) {
    const head = [];
    if (stop.platformMoveSeconds > 0) head.push(["platform", stop.startSecond - stop.platformMoveSeconds, stop.platformMoveSeconds]);
    if (stop.retreatSeconds > 0) head.push(["retreat", stop.startSecond, stop.retreatSeconds]);
    if (head.length > 0) lines.push({ label: `S${stop.sequence} start`, bars: head });
    for (const s of stop.steps) {
      let t = s.startSecond;
      const bars = [];
      for (const name of ["travel", "approach", "cut", "retract"]) { bars.push([name, t, s[name + "Seconds"]]); t += s[name + "Seconds"]; }
      lines.push({ label: `${s.sequence}. ${s.cutId}`, bars });
    }
    lines.push({ label: `S${stop.sequence} to stow`, bars: [["return", stop.endSecond - stop.returnSeconds, stop.returnSeconds]] });
  }
  const axisY = lines.length * (rowH + 2) + 6;
  const svg = el("svg:svg", { width: w, height: axisY + 60, role: "img", "aria-label": "Schedule timeline" });
  const sx = (t) => left + ((w - left - 20) * t) / total;
  lines.forEach((line, i) => {
    const y = i * (rowH + 2);
    svg.append(el("svg:text", { x: 0, y: y + rowH - 3 }, line.label));
    for (const [name, t, d] of line.bars) {
      svg.append(el("svg:rect", { x: sx(t), y, width: Math.max(0.5, sx(t + d) - sx(t)), height: rowH, fill: style[name].fill, stroke: "#1d2a22", "stroke-dasharray": style[name].dash, class: `phase-${name}` }));
    }
  });
  // The time axis, in seconds from the schedule's start.
  svg.append(el("svg:line", { x1: sx(0), y1: axisY, x2: sx(total), y2: axisY, stroke: "#1d2a22", class: "time-axis" }));
  const step = [1, 2, 5, 10, 15, 20, 30, 60, 120, 300].find((s) => total / s <= 12) ?? 600;
  for (let t = 0; t <= total + 1e-9; t += step) {
    svg.append(el("svg:line", { x1: sx(t), y1: axisY, x2: sx(t), y2: axisY + 5, stroke: "#1d2a22" }));
    svg.append(el("svg:text", { x: sx(t), y: axisY + 17, "text-anchor": "middle", class: "tick" }, `${t} s`));
  }
  const legendY = axisY + 42;
  phases.forEach(([name, fill, dash], i) => {
    svg.append(el("svg:rect", { x: left + i * 115, y: legendY - 10, width: 14, height: 12, fill, stroke: "#1d2a22", "stroke-dasharray": dash }));
    svg.append(el("svg:text", { x: left + 20 + i * 115, y: legendY }, name === "platform" ? "platform move" : name === "return" ? "back to stow" : name));
  });
  return svg;
}

$("back").addEventListener("click", () => showOverview());
start().catch((e) => { document.querySelector("main").prepend(el("p", { class: "error" }, `Could not load: ${e.message}`)); });
