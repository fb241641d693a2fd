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

function el(tag, attributes = {}, text) {
  const node = tag.startsWith("svg:") ? document.createElementNS(svgNs, tag.slice(4)) : document.createElement(tag);
  for (const [k, v] of Object.entries(attributes)) node.setAttribute(k, v);
  if (text !== undefined) node.textContent = text;
  return node;
}

async function start() {
  const session = await getJson("/review/session");
  if (!session.signedIn) {
    $("sign-in").hidden = false;
    $("sign-in-failed").hidden = !location.search.includes("signin=failed");
    return;
  }
  $("sign-out").hidden = false;
  await showOverview();
}

async function showTree(treeId) {
  const [scan, schedule] = await Promise.all([getJson(`/api/v1/trees/${encodeURIComponent(treeId)}/scan`), getJson(`/api/v1/trees/${encodeURIComponent(treeId)}/schedule`)]);
  $("overview").hidden = true;
  $("tree").hidden = false;
  $("tree-title").textContent = `Tree ${scan.treeId} — ${scan.block}, row ${scan.row}, position ${scan.positionInRow}`;
  schedule.steps = schedule.stops.flatMap((s) => s.steps);
  const travelSeconds = schedule.steps.reduce((sum, s) => sum + s.travelSeconds, 0);
  $("tree-summary").textContent = `Schedule version ${schedule.version}: ${schedule.steps.length} cuts in ${schedule.totalSeconds.toFixed(1)} s (${travelSeconds.toFixed(1)} s moving between cuts).`;
  const nodes = new Map(scan.nodes.map((n) => [n.id, n]));
  const branches = new Map(scan.branches.map((b) => [b.id, b]));
  const cutPoint = (cut) => {
    const b = branches.get(cut.branchId), f = nodes.get(b.fromNode), t = nodes.get(b.toNode), s = cut.positionAlong;
    return { x: f.xM + (t.xM - f.xM) * s, y: f.yM + (t.yM - f.yM) * s, z: f.zM + (t.zM - f.zM) * s };
  };
  const order = new Map(schedule.steps.map((s) => [s.cutId, s.sequence]));
  const left = new Map(schedule.unscheduled.map((u) => [u.cutId, u]));
  $("front").replaceChildren(drawTree(scan, nodes, cutPoint, order, left, schedule, "x"));
  $("side").replaceChildren(drawTree(scan, nodes, cutPoint, order, left, schedule, "y"));
  $("timeline").replaceChildren(drawTimeline(schedule));
  $("cut-list").replaceChildren(...schedule.steps.map((s) => el("li", {}, `${s.cutId}: starts at ${s.startSecond.toFixed(1)} s — travel ${s.travelSeconds.toFixed(2)} s, approach ${s.approachSeconds.toFixed(2)} s, cut ${s.cutSeconds.toFixed(2)} s, retract ${s.retractSeconds.toFixed(2)} s`)));
  $("left-out").replaceChildren(...schedule.unscheduled.map((u) => el("li", {}, `${u.cutId}: ${u.status}${u.reason ? " (" + u.reason + ")" : ""} — ${u.detail}`)));
  $("back").focus();
}

function drawTree(scan, nodes, cutPoint, order, left, schedule, axis) {
  const w = 360, h = 480, pad = 20;
  const xs = scan.nodes.map((n) => n[axis + "M"]), zs = scan.nodes.map((n) => n.zM);
  const minX = Math.min(...xs, -1), maxX = Math.max(...xs, 1), maxZ = Math.max(...zs, 3);
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
  // The tool path between cuts, in schedule order.
  const path = schedule.steps.map((s) => cutPoint(scan.cuts.find((c) => c.id === s.cutId)));
  if (path.length > 1) svg.append(el("svg:polyline", { points: path.map((p) => `${px(p[axis])},${pz(p.z)}`).join(" "), fill: "none", stroke: "#2f5d50", "stroke-width": 1.2, "stroke-dasharray": "2 3", class: "tool-path" }));
  for (const cut of scan.cuts) {
    const p = cutPoint(cut), x = px(p[axis]), y = pz(p.z);
    if (order.has(cut.id)) {
      const g = el("svg:g", { class: "cut-mark", "data-cut": cut.id });
      g.append(el("svg:circle", { cx: x, cy: y, r: 8, fill: "white", stroke: "#1d2a22", "stroke-width": 1.5 }));
      g.append(el("svg:text", { x, y: y + 4, "text-anchor": "middle" }, String(order.get(cut.id))));
      svg.append(g);
    } else if (left.get(cut.id)?.status === "unreachable") {
      const g = el("svg:g", { class: "cut-unreachable", "data-cut": cut.id });
      g.append(el("svg:text", { x, y: y + 4, "text-anchor": "middle", "font-weight": "bold" }, "✕"));
      g.append(el("svg:text", { x: x + 9, y: y + 4 }, "unreachable"));
      svg.append(g);
    }
  }
  return svg;
}

function drawTimeline(schedule) {
  const w = 900, rowH = 14, total = Math.max(1, schedule.totalSeconds);
  const phases = [["travel", "#d9d3c3", "4 2"], ["approach", "#9fc5b8", "1 2"], ["cut", "#1d2a22", "none"], ["retract", "#9fc5b8", "1 2"]];
  const svg = el("svg:svg", { width: w, height: schedule.steps.length * (rowH + 2) + 40, role: "img", "aria-label": "Schedule timeline" });
  const sx = (t) => 60 + ((w - 80) * t) / total;
  schedule.steps.forEach((s, i) => {
    const y = i * (rowH + 2);
    svg.append(el("svg:text", { x: 0, y: y + rowH - 3 }, `${s.sequence}. ${s.cutId}`));
    let t = s.startSecond;
    for (const [name, fill, dash] of phases) {
      const d = s[name + "Seconds"];
      svg.append(el("svg:rect", { x: sx(t), y, width: Math.max(0.5, sx(t + d) - sx(t)), height: rowH, fill, stroke: "#1d2a22", "stroke-dasharray": dash, class: `phase-${name}` }));
      t += d;
    }
  });
  const legendY = schedule.steps.length * (rowH + 2) + 20;
  phases.forEach(([name, fill, dash], i) => {
    svg.append(el("svg:rect", { x: 60 + i * 120, y: legendY - 10, width: 14, height: 12, fill, stroke: "#1d2a22", "stroke-dasharray": dash }));
    svg.append(el("svg:text", { x: 80 + i * 120, y: legendY }, name));
  });
  return svg;
}

$("back").addEventListener("click", () => showOverview());
start().catch((e) => { document.querySelector("main").prepend(el("p", { class: "error" }, `Could not load: ${e.message}`)); });
