/* The lab page: read the form, ask the API, draw what comes back. No outside scripts. */
"use strict";

const FORM_IDS = ["source", "load-r", "load-x", "start", "stop", "spec-form", "spec", "method", "theory", "sections",
  "profile", "segments", "medium", "vf", "eps-r", "height", "thickness", "outer"];
const FIELD_INPUTS = {
  source_ohm: "source", load: "load-r", "load.resistance_ohm": "load-r", "load.reactance_ohm": "load-x",
  band: "start", "band.start_hz": "start", "band.stop_hz": "stop", max_reflection: "spec", min_return_loss_db: "spec", max_vswr: "spec",
  sections: "sections", theory: "theory", profile: "profile", segments: "segments", velocity_factor: "vf",
  medium: "medium", "medium.velocity_factor": "vf", "medium.eps_r": "eps-r", "medium.height_m": "height",
  "medium.ground_spacing_m": "height", "medium.thickness_m": "thickness", "medium.outer_diameter_m": "outer",
  authorization: "api-key",
};
const COLORS = ["#1f6f6a", "#b8733a", "#5a4fa2", "#a8321e", "#3f7f2f", "#8a5a00"];
const state = { current: null, pinned: [], request: null };

const byId = (id) => document.getElementById(id);
const value = (id) => byId(id).value.trim();

function number(id, scale = 1) {
  const text = value(id);
  if (text === "") return null;
  const parsed = Number(text);
  return Number.isFinite(parsed) ? parsed * scale : text;
}

function buildRequest() {
  const method = value("method");
  const body = {
    source_ohm: number("source"),
    load: { resistance_ohm: number("load-r"), reactance_ohm: number("load-x") ?? 0 },
    band: { start_hz: number("start", 1e9), stop_hz: number("stop", 1e9) },
    points: 201,
  };
  const spec = number("spec");
  if (spec !== null) body[value("spec-form")] = spec;
  if (method === "binomial" || method === "chebyshev") {
    body.theory = value("theory");
    if (number("sections") !== null) body.sections = number("sections");
  }
  if (method === "taper") {
    body.profile = value("profile");
    body.segments = number("segments");
  }
  const medium = value("medium");
  if (medium === "ideal") body.velocity_factor = number("vf");
  else if (medium === "coax") body.medium = { kind: "coax", eps_r: number("eps-r"), outer_diameter_m: number("outer", 1e-3) };
  else {
    body.medium = { kind: medium, eps_r: number("eps-r"), thickness_m: number("thickness", 1e-6) };
    body.medium[medium === "microstrip" ? "height_m" : "ground_spacing_m"] = number("height", 1e-3);
  }
  return { method, body };
}

function clearErrors() {
  document.querySelectorAll(".field-error").forEach((e) => { e.textContent = ""; });
  document.querySelectorAll("input.invalid, select.invalid").forEach((e) => e.classList.remove("invalid"));
  byId("form-error").textContent = "";
}

function showErrors(problems) {
  const general = [];
  for (const problem of problems) {
    const id = FIELD_INPUTS[problem.field] || FIELD_INPUTS[problem.field.split(".").slice(0, 2).join(".")];
    const slot = id && document.querySelector(`.field-error[data-for="${id}"]`);
    if (slot) {
      slot.textContent = problem.message;
      byId(id).classList.add("invalid");
    } else {
      general.push(`${problem.field}: ${problem.message}`);
    }
  }
  byId("form-error").textContent = general.join(" ");
}

async function post(path, body) {
  const headers = { "Content-Type": "application/json" };
  const key = sessionStorage.getItem("stepline-key");
  if (key) headers.Authorization = `Bearer ${key}`;
  const response = await fetch(path, { method: "POST", headers, body: JSON.stringify(body) });
  return { ok: response.ok, status: response.status, response };
}

async function askForKeyIfNeeded() {
  try {
    const health = await (await fetch("/v1/health")).json();
    byId("access").hidden = !health.key_required;
  } catch (error) {
    byId("form-error").textContent = `The service did not answer: ${error}`;
  }
  byId("api-key").value = sessionStorage.getItem("stepline-key") || "";
  byId("api-key").addEventListener("change", () => sessionStorage.setItem("stepline-key", value("api-key")));
}

function labelOf(design) {
  const theory = design.profile ? design.profile : design.theory;
  return `${design.method} (${theory}), ${design.sections.length} section${design.sections.length === 1 ? "" : "s"}`;
}

async function wideCurve(design, request) {
  if (request.body.medium) return design.response;
  const band = request.body.band;
  const span = band.stop_hz - band.start_hz;
  const analysis = {
    source_ohm: request.body.source_ohm, load: request.body.load, velocity_factor: request.body.velocity_factor,
    band: { start_hz: Math.max(band.start_hz - 0.35 * span, band.start_hz * 0.05), stop_hz: band.stop_hz + 0.35 * span },
    sections: design.sections.map((s) => ({ impedance_ohm: s.impedance_ohm, length_m: s.length_m })), points: 401,
  };
  const { ok, response } = await post("/v1/networks/analyze", analysis);
  return ok ? (await response.json()).response : design.response;
}

function drawResponse() {
  if (!state.current) return;
  const returnLoss = document.querySelector('input[name="quantity"]:checked').value === "return-loss";
  const entries = [...state.pinned, state.current];
  const series = entries.map((entry, i) => ({
    x: entry.curve.frequency_hz.map((f) => f / 1e9),
    y: returnLoss ? entry.curve.return_loss_db.map((v) => Math.min(v, 80)) : entry.curve.reflection_magnitude,
    color: COLORS[i % COLORS.length], label: entry.label,
  }));
  const spec = state.current.design.verified.spec_max_reflection;
  const band = state.request.body.band;
  drawChart(byId("response-plot"), {
    series, xLabel: "frequency (GHz)", yLabel: returnLoss ? "return loss (dB)" : "|reflection|",
    bands: [{ x0: band.start_hz / 1e9, x1: band.stop_hz / 1e9 }], yFromZero: !returnLoss,
    levels: [{ y: returnLoss ? -20 * Math.log10(spec) : spec, label: `spec ${spec}` }],
  });
  byId("legend").replaceChildren(...series.map((s) => {
    const item = document.createElement("span");
    item.style.setProperty("--swatch", s.color);
    item.textContent = s.label;
    return item;
  }));
}

function drawProfile(design, request) {
  const lengths = design.sections.map((s) => s.length_m * 1e3);
  const total = lengths.reduce((a, b) => a + b, 0);
  const x = [-0.12 * total, 0];
  const y = [request.body.source_ohm, design.sections[0].impedance_ohm];
  let position = 0;
  design.sections.forEach((section, i) => {
    position += lengths[i];
    x.push(position);
    y.push(i + 1 < design.sections.length ? design.sections[i + 1].impedance_ohm : request.body.load.resistance_ohm);
  });
  x.push(1.12 * total);
  y.push(request.body.load.resistance_ohm);
  drawChart(byId("profile-plot"), {
    series: [{ x, y, color: "#b8733a", step: true, label: "impedance" }],
    xLabel: "position from the source end (mm)", yLabel: "impedance (ohm)", height: 220,
  });
}

async function drawLayout(request) {
  const box = byId("layout-box");
  if (!request.body.medium) { box.hidden = true; return; }
  const { ok, response } = await post("/v1/drawings", { method: request.method, ...request.body });
  if (!ok) { box.hidden = true; return; }
  const image = byId("layout");
  if (image.src) URL.revokeObjectURL(image.src);
  image.src = URL.createObjectURL(await response.blob());
  box.hidden = false;
}

function fill(design) {
  const v = design.verified;
  const rows = [
    ["Verdict", v.meets_spec ? "meets the spec" : "misses the spec", v.meets_spec ? "pass" : "fail"],
    ["Worst |reflection|", `${v.max_reflection.toPrecision(4)} at ${(v.worst_frequency_hz / 1e9).toFixed(4)} GHz`],
    ["Worst return loss", `${v.min_return_loss_db.toFixed(2)} dB`],
    ["Worst VSWR", v.max_vswr.toFixed(4)],
    ["Spec", `|reflection| <= ${v.spec_max_reflection}`],
    ["Theory predicted", design.predicted.max_reflection.toPrecision(4)],
    ["Total length", `${(design.total_length_m * 1e3).toFixed(3)} mm`],
  ];
  if (v.max_insertion_loss_db !== null) rows.push(["Worst insertion loss", `${v.max_insertion_loss_db.toFixed(3)} dB`]);
  byId("verdict").replaceChildren(...rows.flatMap(([term, text, cls]) => {
    const dt = document.createElement("dt");
    dt.textContent = term;
    const dd = document.createElement("dd");
    dd.textContent = text;
    if (cls) dd.className = cls;
    return [dt, dd];
  }));
  byId("warnings").replaceChildren(...design.warnings.map((w) => {
    const li = document.createElement("li");
    li.textContent = w;
    return li;
  }));
  byId("sections-table").tBodies[0].replaceChildren(...design.sections.map((s, i) => {
    const tr = document.createElement("tr");
    const size = s.width_m ?? s.inner_diameter_m;
    for (const cell of [i + 1, s.impedance_ohm.toFixed(3), s.electrical_length_deg.toFixed(2), (s.length_m * 1e3).toFixed(3),
      size == null ? "-" : (size * 1e3).toFixed(4), s.eps_eff.toFixed(4)]) {
      const td = document.createElement("td");
      td.textContent = cell;
      tr.appendChild(td);
    }
    return tr;
  }));
}

function shareQuery() {
  const params = new URLSearchParams();
  for (const id of FORM_IDS) params.set(id, value(id));
  if (document.body.classList.contains("embed")) params.set("embed", "1");
  return params.toString();
}

async function design(event) {
  if (event) event.preventDefault();
  clearErrors();
  const request = buildRequest();
  let result;
  try {
    result = await post(`/v1/transformers/${request.method}`, request.body);
  } catch (error) {
    byId("form-error").textContent = `The service did not answer: ${error}`;
    return;
  }
  const payload = await result.response.json();
  if (!result.ok) { showErrors(payload.problems || []); return; }
  state.request = request;
  state.current = { design: payload, label: labelOf(payload), curve: await wideCurve(payload, request) };
  const query = shareQuery();
  history.replaceState(null, "", `?${query}`);
  byId("share").href = `${location.pathname}?${query}`;
  drawResponse();
  drawProfile(payload, request);
  fill(payload);
  await drawLayout(request);
  document.body.dataset.ready = "1";
}

async function download(format) {
  if (!state.request) return;
  const { ok, response } = await post(`/v1/transformers/${state.request.method}?format=${format}`, state.request.body);
  if (!ok) return;
  const link = document.createElement("a");
  link.href = URL.createObjectURL(await response.blob());
  link.download = `stepline-${state.request.method}.${format === "csv" ? "csv" : "s2p"}`;
  link.click();
}

function showRelevantFields() {
  const method = value("method");
  const medium = value("medium");
  const show = (selector, visible) => document.querySelectorAll(selector).forEach((e) => { e.hidden = !visible; });
  show(".stepped-only", method === "binomial" || method === "chebyshev");
  show(".taper-only", method === "taper");
  show(".medium-ideal", medium === "ideal");
  show(".medium-physical", medium !== "ideal");
  show(".medium-board", medium === "microstrip" || medium === "stripline");
  show(".medium-coax", medium === "coax");
  byId("spec-hint").textContent = specHint(value("spec-form"), number("spec"));
}

/** The spec in the two forms it was not given in, as a hint beside the field. */
function specHint(form, spec) {
  if (typeof spec !== "number") return "";
  let reflection = null;
  if (form === "max_reflection" && spec > 0 && spec < 1) reflection = spec;
  if (form === "min_return_loss_db" && spec > 0) reflection = 10 ** (-spec / 20);
  if (form === "max_vswr" && spec > 1) reflection = (spec - 1) / (spec + 1);
  if (reflection === null) return "";
  const returnLoss = (-20 * Math.log10(reflection)).toFixed(2);
  const vswr = ((1 + reflection) / (1 - reflection)).toFixed(3);
  return `= |reflection| ${reflection.toPrecision(4)}, ${returnLoss} dB return loss, VSWR ${vswr}`;
}

function restoreFromUrl() {
  const params = new URLSearchParams(location.search);
  for (const id of FORM_IDS) if (params.has(id)) byId(id).value = params.get(id);
  if (params.get("embed") === "1") document.body.classList.add("embed");
}

document.addEventListener("DOMContentLoaded", async () => {
  await askForKeyIfNeeded();
  restoreFromUrl();
  showRelevantFields();
  byId("problem").addEventListener("submit", design);
  byId("problem").addEventListener("input", showRelevantFields);
  byId("keep").addEventListener("click", () => {
    if (state.current) { state.pinned.push({ ...state.current }); drawResponse(); }
  });
  byId("clear").addEventListener("click", () => { state.pinned = []; drawResponse(); });
  document.querySelectorAll('input[name="quantity"]').forEach((r) => r.addEventListener("change", drawResponse));
  byId("get-touchstone").addEventListener("click", () => download("touchstone"));
  byId("get-csv").addEventListener("click", () => download("csv"));
  window.addEventListener("resize", drawResponse);
  design();
});
