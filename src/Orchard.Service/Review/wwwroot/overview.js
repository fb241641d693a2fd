// The manager's overview: every row with its machine hours, the hand follow-up it leaves and the
// controller's progress; a block filter, hectares or acres, the orchard's reference rates, a print view.
// Loaded before app.js (which draws a tree); it reads only the service's own JSON and runs no inline script.
"use strict";

const overview = {
  estimates: null,
  trees: [],
  sortKey: "row",
  sortDirection: 1,
  block: "",
  unit: localStorage.getItem("orchard.areaUnit") === "ac" ? "ac" : "ha",
};

// One international acre is 4046.8564224 m² exactly, i.e. 0.40468564224 ha.
const HECTARES_PER_ACRE = 0.40468564224;

const byId = (id) => document.getElementById(id);

function make(tag, attributes = {}, text) {
  const node = tag.startsWith("svg:") ? document.createElementNS("http://www.w3.org/2000/svg", tag.slice(4)) : document.createElement(tag);
  for (const [k, v] of Object.entries(attributes)) node.setAttribute(k, v);
  if (text !== undefined) node.textContent = text;
  return node;
}

async function fetchJson(path, options = {}) {
  const response = await fetch(path, { credentials: "same-origin", ...options });
  const body = response.status === 204 ? null : await response.json();
  if (!response.ok) {
    const error = new Error(body?.detail ?? `${path}: ${response.status}`);
    error.problem = body;
    throw error;
  }
  return body;
}

// Area and "per area" figures in the manager's unit.
function area(ha) { return overview.unit === "ac" ? ha / HECTARES_PER_ACRE : ha; }
function perArea(perHa) { return perHa === null ? null : overview.unit === "ac" ? perHa * HECTARES_PER_ACRE : perHa; }
function unitName() { return overview.unit === "ac" ? "acre" : "hectare"; }
function unitShort() { return overview.unit === "ac" ? "ac" : "ha"; }
const fixed = (v, digits) => (v === null || v === undefined ? "—" : v.toFixed(digits));

async function showOverview() {
  const [trees, estimates, rates] = await Promise.all([fetchJson("/api/v1/trees"), fetchJson("/api/v1/estimates"), fetchJson("/api/v1/rates")]);
  overview.trees = trees;
  overview.estimates = estimates;
  fillRates(rates);
  fillBlockFilter();
  byId("units").value = overview.unit;
  render();
  byId("overview").hidden = false;
  byId("tree").hidden = true;
}

function fillRates(rates) {
  byId("rate-manual").value = rates.manualSecondsPerTree;
  byId("rate-speed").value = rates.platformSpeedKmh;
  byId("rate-hand").value = rates.handSecondsPerCut;
  byId("rates-status").textContent = "";
  for (const input of document.querySelectorAll("#rates input")) input.removeAttribute("aria-invalid");
}

function fillBlockFilter() {
  const select = byId("block-filter");
  const blocks = overview.estimates.blocks.map((b) => b.block);
  if (overview.block && !blocks.includes(overview.block)) overview.block = "";
  select.replaceChildren(make("option", { value: "" }, "All blocks"), ...blocks.map((b) => make("option", { value: b }, b)));
  select.value = overview.block;
}

function visibleRows() {
  return overview.estimates.rows.filter((r) => !overview.block || r.block === overview.block);
}

function render() {
  const e = overview.estimates;
  const total = overview.block ? e.blocks.find((b) => b.block === overview.block) : e.orchard;
  const rows = visibleRows();
  const trees = overview.trees.filter((t) => !overview.block || t.block === overview.block);
  const planned = trees.filter((t) => t.planned);
  const where = overview.block ? `Block ${overview.block}` : "The orchard";
  byId("summary").textContent =
    `${where}: ${planned.length} of ${trees.length} scanned trees planned; ${total.trees} trees in ${rows.length} rows, ${fixed(area(total.areaHa), 2)} ${unitShort()}. ` +
    `About ${fixed(total.totalHours, 1)} hours of machine time` +
    (total.totalHoursLow !== null && total.totalHoursHigh !== null ? ` (${fixed(total.totalHoursLow, 1)}–${fixed(total.totalHoursHigh, 1)})` : "") +
    `, platform moves included, and ${fixed(total.handPersonHours, 1)} person-hours of hand follow-up. ` +
    `Progress: ${total.cutsDone} cuts done, ${total.cutsMissed} missed, ${total.replans} re-planned.`;
  const cutTimes = e.cutTimeModels.filter((m) => !overview.block || m.block === overview.block).map((m) => m.description).join(" ");
  byId("model").textContent =
    `Trees not yet planned are predicted: ${e.model} Cut times: ${cutTimes} Rates: hand pruning ${e.manualSecondsPerTree} s a tree, ` +
    `platform ${e.platformSpeedKmh} km/h, hand follow-up ${e.handSecondsPerCut} s a cut.`;
  const unregistered = rows.filter((r) => !r.registered).map((r) => `${r.block} ${r.row}`);
  const note = byId("unregistered");
  note.hidden = unregistered.length === 0;
  note.textContent = unregistered.length ? `Not in the row registry (a stand-in layout is used; an admin registers rows with PUT /api/v1/rows): ${unregistered.join(", ")}.` : "";
  for (const cell of document.querySelectorAll("[data-unit]")) cell.textContent = cell.dataset.unit === "per" ? `Hours per ${unitName()}` : `Area (${unitShort()})`;
  renderRowTable(rows);
  renderBlockTable();
  renderChart(rows);
  renderQueue(trees);
}

const columns = {
  block: (r) => r.block,
  row: (r) => r.row,
  planned: (r) => r.plannedTrees,
  plannedHours: (r) => r.plannedHours,
  hours: (r) => r.totalHours,
  low: (r) => r.totalHoursLow,
  hand: (r) => r.handPersonHours,
  done: (r) => r.cutsDone,
  missed: (r) => r.cutsMissed,
  replans: (r) => r.replans,
  area: (r) => r.areaHa,
  perArea: (r) => r.hoursPerHectare,
  manual: (r) => r.robotHoursPerManualPersonHour,
};

function renderRowTable(rows) {
  const key = columns[overview.sortKey] ?? columns.row;
  const sorted = [...rows].sort((a, b) => {
    const x = key(a) ?? 0, y = key(b) ?? 0;
    return (typeof x === "string" ? x.localeCompare(y) : x - y) * overview.sortDirection;
  });
  const range = (r) => (r.totalHoursLow === null || r.totalHoursHigh === null ? "not bounded yet" : `${fixed(r.totalHoursLow, 2)}–${fixed(r.totalHoursHigh, 2)}`);
  byId("rows").querySelector("tbody").replaceChildren(...sorted.map((r) => {
    const tr = make("tr", { "data-row": r.row, "data-block": r.block });
    const rowCell = make("td", {}, r.row);
    if (!r.registered) rowCell.append(make("span", { class: "flag", title: "not in the row registry" }, " *"));
    const cells = [
      make("td", {}, r.block), rowCell, make("td", {}, `${r.plannedTrees} / ${r.trees}`), make("td", {}, fixed(r.plannedHours, 2)),
      make("td", { class: "hours" }, fixed(r.totalHours, 2)), make("td", {}, range(r)),
      make("td", { class: "hand" }, fixed(r.handPersonHours, 2)),
      make("td", { class: "done" }, String(r.cutsDone)), make("td", { class: "missed" }, String(r.cutsMissed)), make("td", { class: "replans" }, String(r.replans)),
      make("td", { class: "area" }, fixed(area(r.areaHa), 2)), make("td", { class: "per-area" }, fixed(perArea(r.hoursPerHectare), 1)),
      make("td", {}, fixed(r.robotHoursPerManualPersonHour, 2)),
    ];
    tr.append(...cells);
    return tr;
  }));
  for (const th of document.querySelectorAll("#rows th")) {
    const sortKey = th.querySelector("button")?.dataset.sort;
    th.setAttribute("aria-sort", sortKey === overview.sortKey ? (overview.sortDirection > 0 ? "ascending" : "descending") : "none");
  }
}

function renderBlockTable() {
  const blocks = overview.estimates.blocks.filter((b) => !overview.block || b.block === overview.block);
  byId("blocks").querySelector("tbody").replaceChildren(...blocks.map((b) => {
    const tr = make("tr", { "data-block": b.block });
    for (const [v, cls] of [[b.block, ""], [`${b.plannedTrees} / ${b.trees}`, ""], [fixed(b.totalHours, 2), "hours"], [fixed(b.handPersonHours, 2), "hand"],
      [String(b.cutsDone), "done"], [String(b.cutsMissed), "missed"], [String(b.replans), "replans"], [fixed(area(b.areaHa), 2), "area"], [fixed(perArea(b.hoursPerHectare), 1), "per-area"]]) {
      tr.append(make("td", cls ? { class: cls } : {}, v));
    }
    return tr;
  }));
}

function renderChart(rows) {
  const width = 720, bar = 20, gap = 10, left = 190;
  const max = Math.max(0.001, ...rows.map((r) => r.totalHoursHigh ?? r.totalHours));
  const height = rows.length * (bar + gap) + 10;
  const svg = make("svg:svg", { width, height, viewBox: `0 0 ${width} ${height}` });
  const sx = (h) => left + ((width - left - 120) * h) / max;
  rows.forEach((r, i) => {
    const y = i * (bar + gap) + 5;
    svg.append(make("svg:text", { x: 0, y: y + bar * 0.7 }, `${r.block} ${r.row}`));
    svg.append(make("svg:rect", { x: left, y, width: Math.max(1, sx(r.totalHours) - left), height: bar, fill: "#2f5d50", stroke: "#1d2a22", class: "bar" }));
    if (r.totalHoursLow !== null && r.totalHoursHigh !== null) {
      // The range as a whisker across the bar's end.
      svg.append(make("svg:line", { x1: sx(r.totalHoursLow), y1: y + bar / 2, x2: sx(r.totalHoursHigh), y2: y + bar / 2, stroke: "#8a4b00", "stroke-width": 2, class: "interval" }));
      for (const h of [r.totalHoursLow, r.totalHoursHigh]) svg.append(make("svg:line", { x1: sx(h), y1: y + 3, x2: sx(h), y2: y + bar - 3, stroke: "#8a4b00", "stroke-width": 2 }));
    }
    svg.append(make("svg:text", { x: sx(r.totalHoursHigh ?? r.totalHours) + 6, y: y + bar * 0.7 },
      `${fixed(r.totalHours, 1)} h${r.totalHoursLow !== null ? ` (${fixed(r.totalHoursLow, 1)}–${fixed(r.totalHoursHigh, 1)})` : ""}`));
  });
  byId("chart").replaceChildren(svg);
}

function renderQueue(trees) {
  const queue = byId("queue");
  // Waiting: never planned, or scanned again since its schedule was planned (the schedule names an older scan).
  queue.replaceChildren(...trees.filter((t) => !t.planned).map((t) => make("li", {}, t.scheduleVersion === null
    ? `${t.treeId} — waiting for its plan`
    : `${t.treeId} — scanned again; waiting for the plan of its new scan (version ${t.scheduleVersion} was of scan ${t.scheduleScanId})`)));
  if (!queue.children.length) queue.append(make("li", {}, "Nothing waiting: every scanned tree is planned."));
  const list = byId("trees");
  list.replaceChildren();
  for (const r of visibleRows()) {
    const group = make("p", {}, `${r.block} ${r.row}: `);
    for (const t of trees.filter((x) => x.block === r.block && x.row === r.row)) {
      const b = make("button", { type: "button", class: "tree-button", "data-tree": t.treeId }, t.treeId);
      b.addEventListener("click", () => showTree(t.treeId));
      group.append(b);
    }
    list.append(group);
  }
}

// The page's own form endpoint (its origin and antiforgery token checked): the session cookie makes no API writes.
async function saveRates(event) {
  event.preventDefault();
  const status = byId("rates-status");
  const form = byId("rates");
  for (const input of document.querySelectorAll("#rates input")) input.removeAttribute("aria-invalid");
  try {
    const rates = await fetchJson(form.getAttribute("action"), { method: "POST", body: new URLSearchParams(new FormData(form)) });
    overview.estimates = await fetchJson("/api/v1/estimates");
    fillRates(rates);
    render();
    status.textContent = "Saved for the orchard.";
  } catch (e) {
    const errors = e.problem?.errors ?? [];
    const fields = { "$.manualSecondsPerTree": "rate-manual", "$.platformSpeedKmh": "rate-speed", "$.handSecondsPerCut": "rate-hand" };
    for (const error of errors) byId(fields[error.path])?.setAttribute("aria-invalid", "true");
    status.textContent = errors.length ? errors.map((x) => x.message).join(" ") : `Not saved: ${e.message}`;
  }
}

function wireOverview() {
  for (const button of document.querySelectorAll("#rows th button")) {
    button.addEventListener("click", () => {
      const key = button.dataset.sort;
      overview.sortDirection = key === overview.sortKey ? -overview.sortDirection : 1;
      overview.sortKey = key;
      renderRowTable(visibleRows());
    });
  }
  byId("block-filter").addEventListener("change", (e) => { overview.block = e.target.value; render(); });
  byId("units").addEventListener("change", (e) => {
    overview.unit = e.target.value === "ac" ? "ac" : "ha";
    localStorage.setItem("orchard.areaUnit", overview.unit);
    render();
  });
  byId("rates").addEventListener("submit", saveRates);
  byId("refresh").addEventListener("click", () => showOverview());
  byId("print").addEventListener("click", () => window.print());
}

wireOverview();
