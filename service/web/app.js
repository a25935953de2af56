/* The lab page: read the form, ask the API, draw what comes back. No outside scripts. */
"use strict";

const FORM_IDS = ["source", "load-kind", "load-r", "load-x", "circuit-kind", "circuit-r", "circuit-l", "circuit-c", "measured",
  "start", "stop", "spec-form", "spec", "method", "theory", "sections", "profile", "segments", "medium", "vf", "eps-r",
  "height", "thickness", "outer", "tan-d", "sigma", "rough", "junctions", "power", "y-low", "y-high"];
const FIELD_INPUTS = {
  source_ohm: "source", load: "load-r", "load.resistance_ohm": "load-r", "load.reactance_ohm": "load-x",
  band: "start", "band.start_hz": "start", "band.stop_hz": "stop", max_reflection: "spec", min_return_loss_db: "spec", max_vswr: "spec",
  sections: "sections", theory: "theory", profile: "profile", segments: "segments", velocity_factor: "vf",
  medium: "medium", "medium.velocity_factor": "vf", "medium.eps_r": "eps-r", "medium.height_m": "height",
  "medium.ground_spacing_m": "height", "medium.thickness_m": "thickness", "medium.outer_diameter_m": "outer",
  authorization: "api-key", "load.circuit": "circuit-r", "load.measured": "measured", "load.touchstone": "touchstone",
  "medium.loss_tangent": "tan-d", junction_effects: "junctions", input_power_w: "power", "medium.conductivity_s_per_m": "sigma", "medium.roughness_m": "rough",
};
// Never the spec line's red (#a8321e): a design's peaks sit on that line.
const COLORS = ["#1f6f6a", "#b8733a", "#5a4fa2", "#2b6cb0", "#3f7f2f", "#8a5a00", "#7a3b69", "#4a5568"];
const RETURN_LOSS_CEILING_DB = 80;
const LONG_TABLE_ROWS = 24;
const ANALYZE_MAX_SECTIONS = 256;
const state = { current: null, pinned: [], request: null, active: null, sequence: 0, touchstone: null };
const WIDE_FRACTION = 0.35; // the wide-band view reaches this fraction of the band beyond each edge
const VSWR_CEILING = 100;
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

// What each number field is called on the page, what blank means (null: required) and its range.
const NUMBER_FIELDS = {
  source: { label: "Source impedance", unit: "ohm", check: (v) => (v > 0 ? null : "must be above 0 ohm") },
  "load-r": { label: "Load resistance", unit: "ohm", check: (v) => (v > 0 ? null : "must be above 0 ohm (a load without resistance absorbs no power)") },
  "load-x": { label: "Load reactance", unit: "ohm", blank: 0, check: () => null },
  start: { label: "Band start", unit: "GHz", check: (v) => (v > 0 ? null : "must be above 0 GHz") },
  stop: { label: "Band stop", unit: "GHz", check: (v) => (v > 0 ? null : "must be above 0 GHz") },
  spec: { label: "Spec value", blank: null, optional: true, check: specProblem },
  sections: { label: "Sections", optional: true, check: (v) => (Number.isInteger(v) && v >= 1 && v <= 32 ? null : "must be a whole number from 1 to 32") },
  segments: { label: "Taper steps", blank: 64, check: (v) => (Number.isInteger(v) && v >= 2 && v <= 1024 ? null : "must be a whole number from 2 to 1024") },
  vf: { label: "Velocity factor", blank: 1, check: (v) => (v > 0 && v <= 1 ? null : "must be above 0 and at most 1") },
  "eps-r": { label: "Relative permittivity", check: (v) => (v >= 1 ? null : "must be at least 1") },
  height: { label: "Substrate height / ground spacing", unit: "mm", check: (v) => (v > 0 ? null : "must be above 0 mm") },
  thickness: { label: "Conductor thickness", unit: "um", check: (v) => (v >= 0 ? null : "cannot be negative") },
  outer: { label: "Outer diameter", unit: "mm", check: (v) => (v > 0 ? null : "must be above 0 mm") },
  "circuit-r": { label: "Circuit resistance", unit: "ohm", check: (v) => (v > 0 ? null : "must be above 0 ohm") },
  "circuit-l": { label: "Inductance", unit: "nH", check: (v) => (v > 0 ? null : "must be above 0 nH") },
  "circuit-c": { label: "Capacitance", unit: "pF", check: (v) => (v > 0 ? null : "must be above 0 pF") },
  "tan-d": { label: "Loss tangent", optional: true, check: (v) => (v >= 0 && v < 1 ? null : "must be from 0 to below 1") },
  sigma: { label: "Conductivity", unit: "S/m", optional: true, check: (v) => (v > 0 ? null : "must be above 0 S/m") },
  rough: { label: "Surface roughness", unit: "um", optional: true, check: (v) => (v >= 0 ? null : "cannot be negative") },
  power: { label: "Incident power", unit: "W", optional: true, check: (v) => (v > 0 && v <= 1e7 ? null : "must be above 0 and at most 10 MW") },
  "y-low": { label: "y from", optional: true, check: () => null },
  "y-high": { label: "y to", optional: true, check: () => null },
};
// API names that can appear in the service's messages, in the page's words.
const API_WORDS = [
  [/\bresistance_ohm, circuit, measured or touchstone\b/g, "load resistance"], [/\bsource_ohm\b/g, "source impedance"],
  [/\bresistance_ohm\b/g, "load resistance"], [/\breactance_ohm\b/g, "load reactance"], [/\bstart_hz\b/g, "band start"],
  [/\bstop_hz\b/g, "band stop"], [/\bmax_reflection\b/g, "largest |reflection|"], [/\bmin_return_loss_db\b/g, "smallest return loss"],
  [/\bmax_vswr\b/g, "largest VSWR"], [/\bvelocity_factor\b/g, "velocity factor"], [/\beps_r\b/g, "relative permittivity"],
  [/\bheight_m\b/g, "substrate height"], [/\bground_spacing_m\b/g, "ground spacing"], [/\bthickness_m\b/g, "conductor thickness"],
  [/\bouter_diameter_m\b/g, "outer diameter"], [/\bsegments\b/g, "taper steps"],
];

class FormProblems extends Error {
  constructor(problems) { super("form problems"); this.problems = problems; }
}

function specProblem(v) {
  const form = value("spec-form");
  if (form === "max_reflection") return v > 0 && v < 1 ? null : "a |reflection| must be above 0 and below 1";
  if (form === "min_return_loss_db") return v > 0 ? null : "a return loss must be above 0 dB";
  return v > 1 ? null : "a VSWR must be above 1";
}

const byId = (id) => document.getElementById(id);
const value = (id) => byId(id).value.trim();

/** The field's number (times scale), its documented default when blank, or a problem in the form's words. */
function number(id, scale = 1, problems = []) {
  const field = NUMBER_FIELDS[id];
  const text = value(id);
  if (text === "") {
    if (field.optional) return null;
    if (field.blank === undefined) { problems.push({ id, message: "is needed" }); return null; }
    return field.blank * scale;
  }
  if (!NUMBER.test(text)) {
    problems.push({ id, message: `"${text}" is not a number (write decimals with a point, e.g. 0.05 or 2.4)` });
    return null;
  }
  const parsed = Number(text);
  const problem = field.check(parsed);
  if (problem) { problems.push({ id, message: problem }); return null; }
  return parsed * scale;
}

/** The request the form describes, or FormProblems naming each field that cannot be read. */
function buildRequest() {
  const problems = [];
  const method = value("method");
  const body = {
    source_ohm: number("source", 1, problems),
    load: loadOf(problems),
    band: { start_hz: number("start", 1e9, problems), stop_hz: number("stop", 1e9, problems) },
    points: 201,
  };
  const { start_hz: start, stop_hz: stop } = body.band;
  if (start !== null && stop !== null && stop <= start) {
    problems.push({ id: "stop", message: `must be above the band start (${value("start")} GHz)` });
  }
  const spec = number("spec", 1, problems);
  if (spec !== null) body[value("spec-form")] = spec;
  if (method === "binomial" || method === "chebyshev") {
    body.theory = value("theory");
    const sections = number("sections", 1, problems);
    if (sections !== null) body.sections = sections;
  }
  if (method === "taper") {
    body.profile = value("profile");
    body.segments = number("segments", 1, problems);
  }
  const medium = value("medium");
  if (medium === "ideal") body.velocity_factor = number("vf", 1, problems);
  else if (medium === "coax") body.medium = { kind: "coax", eps_r: number("eps-r", 1, problems), outer_diameter_m: number("outer", 1e-3, problems) };
  else {
    body.medium = { kind: medium, eps_r: number("eps-r", 1, problems), thickness_m: number("thickness", 1e-6, problems) };
    body.medium[medium === "microstrip" ? "height_m" : "ground_spacing_m"] = number("height", 1e-3, problems);
  }
  if (medium !== "ideal" && value("junctions") !== "ignore") body.junction_effects = value("junctions");
  const power = number("power", 1, problems);
  if (power !== null) body.input_power_w = power;
  if (body.medium) {
    for (const [id, name, scale] of [["tan-d", "loss_tangent", 1], ["sigma", "conductivity_s_per_m", 1], ["rough", "roughness_m", 1e-6]]) {
      const given = number(id, scale, problems);
      if (given !== null) body.medium[name] = given;
    }
  }
  if (problems.length) throw new FormProblems(problems);
  return { method, body };
}

/** The load in the form it is given in: fixed R + jX, a lumped circuit, measured points or a file. */
function loadOf(problems) {
  const kind = value("load-kind");
  if (kind === "circuit") {
    const circuit = value("circuit-kind");
    const load = { circuit: { kind: circuit, resistance_ohm: number("circuit-r", 1, problems) } };
    if (circuit.endsWith("l")) load.circuit.inductance_h = number("circuit-l", 1e-9, problems);
    else load.circuit.capacitance_f = number("circuit-c", 1e-12, problems);
    return load;
  }
  if (kind === "measured") return { measured: measuredPoints(problems) };
  if (kind === "touchstone") {
    if (!state.touchstone) problems.push({ id: "touchstone", message: "choose a one-port Touchstone file" });
    return { touchstone: state.touchstone ? state.touchstone.text : "" };
  }
  return { resistance_ohm: number("load-r", 1, problems), reactance_ohm: number("load-x", 1, problems) };
}

/** The measured-points text as points: three numbers a line (GHz, ohm, ohm), commas or tabs between. */
function measuredPoints(problems) {
  const points = [];
  const lines = value("measured").split(/\r?\n/).map((line) => line.trim()).filter((line) => line && !line.startsWith("#"));
  for (const [index, line] of lines.entries()) {
    const cells = line.split(/\s*[,;\t]\s*|\s+/);
    if (cells.length !== 3 || !cells.every((cell) => NUMBER.test(cell))) {
      problems.push({ id: "measured", message: `line ${index + 1} ("${line}") is not three numbers: frequency (GHz), R (ohm), X (ohm)` });
      return [];
    }
    const [f, r, x] = cells.map(Number);
    points.push({ frequency_hz: f * 1e9, resistance_ohm: r, reactance_ohm: x });
  }
  if (points.length < 2) problems.push({ id: "measured", message: "give at least two points that cover the band" });
  return points;
}

/** The service's message in the page's words. */
function inPageWords(message) {
  return API_WORDS.reduce((text, [pattern, words]) => text.replace(pattern, words), message);
}

function clearErrors() {
  document.querySelectorAll(".field-error").forEach((e) => { e.textContent = ""; e.removeAttribute("id"); });
  document.querySelectorAll("[aria-invalid]").forEach((e) => {
    e.classList.remove("invalid");
    e.removeAttribute("aria-invalid");
    e.removeAttribute("aria-describedby");
  });
  byId("form-error").textContent = "";
}

/** Each problem beside its field ({id, message} from the page, {field, message} from the service). */
function showErrors(problems) {
  const general = [];
  for (const problem of problems) {
    const id = problem.id || FIELD_INPUTS[problem.field] || FIELD_INPUTS[problem.field.split(".").slice(0, 2).join(".")];
    const slot = id && document.querySelector(`.field-error[data-for="${id}"]`);
    const message = problem.id ? problem.message : inPageWords(problem.message);
    if (slot) {
      slot.textContent = message;
      slot.id = `${id}-error`;
      byId(id).classList.add("invalid");
      byId(id).setAttribute("aria-invalid", "true");
      byId(id).setAttribute("aria-describedby", slot.id);
    } else {
      general.push(message);
    }
  }
  byId("form-error").textContent = general.join(" ");
  const first = problems[0];
  const label = first && first.id ? NUMBER_FIELDS[first.id]?.label : null;
  return label ? `${label}: ${first.message}` : general[0] || "see the marked fields";
}

/** One line saying what the results show: busy, out of date (and why), or the verdict. */
function setStatus(text, kind) {
  byId("status").textContent = text;
  byId("status").className = `status ${kind || ""}`;
}

function markStale(reason) {
  if (!state.current) { setStatus(reason, "stale"); return; }
  byId("results").classList.add("stale");
  setStatus(`Out of date: ${reason}. The results below belong to the previous design.`, "stale");
}

async function post(path, body, signal) {
  const headers = { "Content-Type": "application/json" };
  const key = sessionStorage.getItem("stepline-key");
  if (key) headers.Authorization = `Bearer ${key}`;
  const response = await fetch(path, { method: "POST", headers, body: JSON.stringify(body), signal });
  return { ok: response.ok, status: response.status, response };
}

/** Why the service refused, in the page's words (a missing key and a wrong key differ). */
async function refusal(result) {
  if (result.status === 401) {
    byId("access").hidden = false;
    return sessionStorage.getItem("stepline-key")
      ? { summary: "the API key was not accepted by this server; check it", problems: [] }
      : { summary: "this server needs an API key; enter it at the top", problems: [] };
  }
  let payload = {};
  try { payload = await result.response.json(); } catch { /* not JSON: described by its status */ }
  const problems = payload.problems || [];
  return { summary: problems.length ? null : `the service answered ${result.status}`, problems };
}

async function askForKeyIfNeeded() {
  try {
    const health = await (await fetch("/v1/health")).json();
    byId("access").hidden = !health.key_required;
  } catch (error) {
    setStatus(`The service did not answer: ${error.message}`, "stale");
  }
  byId("api-key").value = sessionStorage.getItem("stepline-key") || "";
  byId("api-key").addEventListener("input", () => {
    sessionStorage.setItem("stepline-key", value("api-key"));
    markStale("the API key has changed since this design");
  });
}

/** The parts a curve's legend entry can name: what was designed, into what, over which band, in what. */
function describe(design, request) {
  const rotating = design.rotating_section ? 1 : 0;
  const count = design.sections.length - rotating;
  const sections = `${count} section${count === 1 ? "" : "s"}${rotating ? " + rotating line" : ""}`;
  return {
    design: `${design.method} (${design.profile || design.theory}), ${sections}`,
    load: loadText(request.body.load),
    band: `${request.body.band.start_hz / 1e9}-${request.body.band.stop_hz / 1e9} GHz`,
    medium: request.body.medium ? request.body.medium.kind : `line vf ${request.body.velocity_factor}`,
  };
}

function loadText(load) {
  if (load.circuit) {
    const c = load.circuit;
    const element = c.inductance_h ? `${+(c.inductance_h * 1e9).toPrecision(4)} nH` : `${+(c.capacitance_f * 1e12).toPrecision(4)} pF`;
    return `load ${c.kind} ${c.resistance_ohm} ohm ${element}`;
  }
  if (load.measured) return `load measured (${load.measured.length} points)`;
  if (load.touchstone !== undefined) return `load ${state.touchstone ? state.touchstone.name : "file"}`;
  const sign = load.reactance_ohm < 0 ? "-" : "+";
  return `load ${load.resistance_ohm}${sign}j${Math.abs(load.reactance_ohm)} ohm`;
}

/** Legend entries that name what differs between the curves on the plot. */
function legendLabels(entries) {
  const differs = (part) => new Set(entries.map((e) => e.parts[part])).size > 1;
  const extra = ["load", "band", "medium"].filter(differs);
  return entries.map((e) => [e.parts.design, ...extra.map((part) => e.parts[part])].join(", "));
}

/** The design's response and complex input reflection over a wider band than its own, from the
 * analyze endpoint: the same sections (by impedance and physical length) over a band widened
 * symmetrically, so its centre, where a physical line's widths are set, stays the design's. Where
 * the load's data do not reach that far, over the design band. */
async function wideCurve(design, request, signal) {
  const band = request.body.band;
  const reach = Math.min(WIDE_FRACTION * (band.stop_hz - band.start_hz), 0.95 * band.start_hz);
  const analysis = { ...request.body, points: 401 };
  for (const name of METHOD_ONLY_FIELDS) delete analysis[name];
  analysis.sections = design.sections.map((s) => ({ impedance_ohm: s.impedance_ohm, length_m: s.length_m }));
  for (const [wide, note] of [[true, ""], [false, "Shown over the design band: the load's data do not reach beyond it."]]) {
    const body = { ...analysis, band: wide ? { start_hz: band.start_hz - reach, stop_hz: band.stop_hz + reach } : band };
    const { ok, status, response } = await post("/v1/networks/analyze", body, signal);
    if (ok) {
      const result = await response.json();
      return { curve: result.response, reflection: result.input_reflection, note };
    }
    if (status !== 422) return { curve: design.response, reflection: null, note: `The wide-band view was refused (${status}).` };
  }
  return { curve: design.response, reflection: null, note: "The wide-band view was refused for this design." };
}

/** What the plot shows of a curve: |reflection|, return loss (dB) or VSWR, and how it is drawn. */
function view() {
  return document.querySelector('input[name="quantity"]:checked').value;
}

function viewed(reflection, which) {
  if (which === "return-loss") return Math.min(-20 * Math.log10(Math.max(reflection, 1e-15)), RETURN_LOSS_CEILING_DB);
  if (which === "vswr") return reflection >= 1 ? VSWR_CEILING : Math.min((1 + reflection) / (1 - reflection), VSWR_CEILING);
  return reflection;
}

const VIEW_NAMES = { reflection: "|reflection|", "return-loss": "return loss (dB)", vswr: "VSWR" };

function readLimits() {
  const problems = [];
  const low = number("y-low", 1, problems);
  const high = number("y-high", 1, problems);
  if (low !== null && high !== null && high <= low) problems.push({ id: "y-low", message: "'y to' must be above 'y from'" });
  if (problems.length) { showErrors(problems); return {}; }
  return { low, high };
}

/** The value of a curve at a frequency (linear between its points). */
function valueAt(curve, frequency) {
  const f = curve.frequency_hz;
  let i = f.findIndex((x) => x >= frequency);
  if (i <= 0) i = i === 0 ? 1 : f.length - 1;
  const t = (frequency - f[i - 1]) / (f[i] - f[i - 1] || 1);
  return curve.reflection_magnitude[i - 1] + t * (curve.reflection_magnitude[i] - curve.reflection_magnitude[i - 1]);
}

function drawResponse() {
  if (!state.current) return;
  const which = view();
  const entries = [...state.pinned, state.current];
  const labels = legendLabels(entries);
  const clippedAt = { "return-loss": RETURN_LOSS_CEILING_DB, vswr: VSWR_CEILING }[which];
  let clipped = false;
  const series = entries.map((entry, i) => ({
    x: entry.curve.frequency_hz.map((f) => f / 1e9),
    y: entry.curve.reflection_magnitude.map((g) => {
      const shown = viewed(g, which);
      clipped ||= clippedAt !== undefined && shown >= clippedAt;
      return shown;
    }),
    color: COLORS[i % COLORS.length], label: labels[i],
  }));
  const verified = state.current.design.verified;
  const spec = verified.spec_max_reflection;
  const band = state.request.body.band;
  const specLabels = { reflection: `spec |reflection| ${spec}`, "return-loss": `spec ${viewed(spec, "return-loss").toFixed(2)} dB`, vswr: `spec VSWR ${viewed(spec, "vswr").toFixed(3)}` };
  const curve = state.current.curve;
  const markers = [
    { x: verified.worst_frequency_hz / 1e9, y: viewed(verified.max_reflection, which), label: "worst" },
    { x: band.start_hz / 1e9, y: viewed(valueAt(curve, band.start_hz), which), label: "start" },
    { x: band.stop_hz / 1e9, y: viewed(valueAt(curve, band.stop_hz), which), label: "stop" },
  ];
  drawChart(byId("response-plot"), {
    series, xLabel: "frequency (GHz)", yLabel: VIEW_NAMES[which],
    bands: [{ x0: band.start_hz / 1e9, x1: band.stop_hz / 1e9 }], yFromZero: which === "reflection",
    levels: [{ y: viewed(spec, which), label: specLabels[which] }], yLimits: readLimits(), markers,
    readout: { element: byId("readout"), format: (x, y) => `${x.toFixed(4)} GHz: ${VIEW_NAMES[which]} ${y.toPrecision(4)}` },
  });
  byId("legend").replaceChildren(...series.map((s) => {
    const item = document.createElement("span");
    item.style.setProperty("--swatch", s.color);
    item.textContent = s.label;
    return item;
  }));
  const notes = [state.current.note];
  if (clipped) notes.push(`Values beyond ${clippedAt} are drawn at ${clippedAt}.`);
  byId("plot-note").textContent = notes.filter(Boolean).join(" ");
  drawLoss(entries, labels);
  drawSmithOf(entries);
}

function drawLoss(entries, labels) {
  const lossy = entries.filter((e) => e.curve.insertion_loss_db);
  byId("loss-box").hidden = lossy.length === 0;
  if (!lossy.length) return;
  drawChart(byId("loss-plot"), {
    series: lossy.map((e) => ({ x: e.curve.frequency_hz.map((f) => f / 1e9), y: e.curve.insertion_loss_db, color: COLORS[entries.indexOf(e) % COLORS.length], label: labels[entries.indexOf(e)] })),
    xLabel: "frequency (GHz)", yLabel: "insertion loss (dB)", height: 220, yFromZero: true,
    bands: [{ x0: state.request.body.band.start_hz / 1e9, x1: state.request.body.band.stop_hz / 1e9 }],
  });
}

function drawSmithOf(entries) {
  const curves = entries.filter((e) => e.reflection).map((e) => ({
    re: e.reflection.real, im: e.reflection.imag, color: COLORS[entries.indexOf(e) % COLORS.length],
    inBand: e.curve.frequency_hz.map((f) => f >= e.band.start_hz && f <= e.band.stop_hz),
  }));
  const current = state.current;
  const markers = [];
  if (current.reflection) {
    const f = current.curve.frequency_hz;
    for (const [edge, label] of [[current.band.start_hz, "start"], [current.band.stop_hz, "stop"]]) {
      const i = f.reduce((best, x, k) => (Math.abs(x - edge) < Math.abs(f[best] - edge) ? k : best), 0);
      markers.push({ re: current.reflection.real[i], im: current.reflection.imag[i], label });
    }
  }
  drawSmith(byId("smith-plot"), { curves, markers });
}

/** Impedance along the line: the source line, each section, and a fixed load's resistance (other
 * loads have no one impedance, so the line ends at the last section). */
function drawProfile(design, request) {
  const lengths = design.sections.map((s) => s.length_m * 1e3);
  const total = lengths.reduce((a, b) => a + b, 0);
  const load = request.body.load.resistance_ohm;
  const x = [-0.12 * total, 0];
  const y = [request.body.source_ohm, design.sections[0].impedance_ohm];
  let position = 0;
  design.sections.forEach((section, i) => {
    position += lengths[i];
    x.push(position);
    y.push(i + 1 < design.sections.length ? design.sections[i + 1].impedance_ohm : load ?? section.impedance_ohm);
  });
  if (load !== undefined) {
    x.push(1.12 * total);
    y.push(load);
  }
  drawChart(byId("profile-plot"), {
    series: [{ x, y, color: "#b8733a", step: true, label: "impedance" }],
    xLabel: "position from the source end (mm)", yLabel: "impedance (ohm)", height: 220,
  });
}

async function drawLayout(request, signal, mine) {
  const box = byId("layout-box");
  if (!request.body.medium) { box.hidden = true; return; }
  const { ok, response } = await post("/v1/drawings", { method: request.method, ...request.body }, signal);
  if (mine !== state.sequence) return;
  if (!ok) { box.hidden = true; return; }
  const image = byId("layout");
  if (image.src) URL.revokeObjectURL(image.src);
  image.src = URL.createObjectURL(await response.blob());
  box.hidden = false;
}

function verdictText(v) {
  return `${v.meets_spec ? "Meets the spec" : "Misses the spec"}: worst |reflection| ${v.max_reflection.toPrecision(4)} `
    + `(${v.min_return_loss_db.toFixed(2)} dB return loss) against ${v.spec_max_reflection}.`;
}

function fill(design, request) {
  const v = design.verified;
  const rows = [
    ["Verdict", v.meets_spec ? "meets the spec" : "misses the spec", v.meets_spec ? "pass" : "fail"],
    ["Worst |reflection|", `${v.max_reflection.toPrecision(4)} at ${(v.worst_frequency_hz / 1e9).toFixed(4)} GHz`],
    ["Worst return loss", `${v.min_return_loss_db.toFixed(2)} dB`],
    ["Worst VSWR", v.max_vswr === null ? "unbounded (total reflection)" : v.max_vswr.toFixed(4)],
    ["Spec", `|reflection| <= ${v.spec_max_reflection} (${(-20 * Math.log10(v.spec_max_reflection)).toFixed(2)} dB)`],
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
  fillSections(design, request, design.sections.length <= LONG_TABLE_ROWS);
  fillPower(design.power);
}

/** The power figures and their cautions, where power was given. */
function fillPower(power) {
  byId("power-box").hidden = !power;
  if (!power) return;
  const peak = (key) => Math.max(...power.sections.map((s) => s[key]));
  const rows = [
    ["Incident peak voltage", `${power.incident_peak_voltage_v.toPrecision(4)} V`],
    ["Largest peak voltage", `${peak("peak_voltage_v").toPrecision(4)} V`],
    ["Largest peak current", `${peak("peak_current_a").toPrecision(4)} A`],
  ];
  const margins = power.sections.map((s) => s.field_margin).filter((m) => m !== null);
  if (margins.length) rows.push(["Smallest field margin", `${Math.min(...margins).toPrecision(3)} x the breakdown field`]);
  if (power.narrowest_current_density_a_per_m2 !== null) {
    rows.push(["Current density, narrowest strip", `${(power.narrowest_current_density_a_per_m2 / 1e6).toPrecision(4)} A/mm^2`]);
  }
  byId("power-figures").replaceChildren(...rows.flatMap(([term, text]) => {
    const dt = document.createElement("dt");
    dt.textContent = term;
    const dd = document.createElement("dd");
    dd.textContent = text;
    return [dt, dd];
  }));
  byId("power-cautions").textContent = power.cautions;
}

/** The section table, or for a long design a summary with the full table on request. */
function fillSections(design, request, all) {
  const rotating = design.rotating_section ? design.sections.length - 1 : -1;
  const impedances = design.sections.map((s) => s.impedance_ohm);
  byId("table-summary").textContent = all ? "" : `${design.sections.length} sections from ${impedances[0].toFixed(2)} to `
    + `${impedances[impedances.length - 1].toFixed(2)} ohm, ${(design.total_length_m * 1e3).toFixed(3)} mm in all; `
    + `the first and last ${LONG_TABLE_ROWS / 2} are listed.`;
  byId("show-all").hidden = all;
  const shown = all ? design.sections.map((s, i) => [s, i])
    : design.sections.map((s, i) => [s, i]).filter(([, i]) => i < LONG_TABLE_ROWS / 2 || i >= design.sections.length - LONG_TABLE_ROWS / 2);
  byId("sections-table").tBodies[0].replaceChildren(...shown.map(([s, i]) => {
    const tr = document.createElement("tr");
    const size = s.width_m ?? s.inner_diameter_m;
    for (const cell of [i === rotating ? `${i + 1} (rotating line)` : i + 1, s.impedance_ohm.toFixed(3), s.electrical_length_deg.toFixed(2),
      (s.length_m * 1e3).toFixed(3), size == null ? "-" : (size * 1e3).toFixed(4), s.eps_eff.toFixed(4)]) {
      const td = document.createElement("td");
      td.textContent = cell;
      tr.appendChild(td);
    }
    return tr;
  }));
}

/** The form's fields as a query string. */
function formQuery() {
  const params = new URLSearchParams();
  for (const id of FORM_IDS) params.set(id, value(id));
  return params.toString();
}

function shareQuery() {
  const params = new URLSearchParams(state.current ? state.current.query : formQuery());
  params.set("view", view());
  if (state.pinned.length) params.set("keep", JSON.stringify(state.pinned.map((entry) => entry.query)));
  if (document.body.classList.contains("embed")) params.set("embed", "1");
  return params.toString();
}

function setBusy(busy) {
  document.body.dataset.busy = busy ? "1" : "";
  byId("results").setAttribute("aria-busy", busy ? "true" : "false");
  byId("design").textContent = busy ? "Designing..." : "Design";
  if (busy) setStatus("Designing...", "busy");
}

/** Design what the form says. One request at a time: a new one cancels the one in flight, and an
 * answer that is no longer the newest is never drawn. */
async function design(event) {
  if (event) event.preventDefault();
  clearErrors();
  let request;
  try {
    request = buildRequest();
  } catch (error) {
    if (!(error instanceof FormProblems)) throw error;
    markStale(`the form has a problem (${showErrors(error.problems)})`);
    return;
  }
  if (state.active) state.active.abort();
  const controller = new AbortController();
  state.active = controller;
  const mine = ++state.sequence;
  setBusy(true);
  try {
    const result = await post(`/v1/transformers/${request.method}`, request.body, controller.signal);
    if (mine !== state.sequence) return;
    if (!result.ok) {
      const { summary, problems } = await refusal(result);
      if (mine !== state.sequence) return;
      markStale(`the service refused this form (${summary || showErrors(problems)})`);
      return;
    }
    const payload = await result.response.json();
    const wide = await wideCurve(payload, request, controller.signal);
    if (mine !== state.sequence) return;
    state.request = request;
    state.current = {
      design: payload, parts: describe(payload, request), curve: wide.curve, reflection: wide.reflection,
      note: wide.note, band: request.body.band, query: formQuery(),
    };
    const query = shareQuery();
    history.replaceState(null, "", `?${query}`);
    byId("share").href = `${location.pathname}?${query}`;
    byId("results").classList.remove("stale");
    drawResponse();
    drawProfile(payload, request);
    fill(payload, request);
    setStatus(verdictText(payload.verified), payload.verified.meets_spec ? "pass" : "fail");
    await drawLayout(request, controller.signal, mine);
  } catch (error) {
    if (error.name === "AbortError") return;
    if (mine === state.sequence) markStale(`the service did not answer (${error.message})`);
  } finally {
    if (mine === state.sequence) {
      setBusy(false);
      state.active = null;
      document.body.dataset.ready = "1";
    }
  }
}

/** A file name that says what the file holds: method, load and band. */
function fileName(request, extension) {
  const load = request.body.load;
  const sign = load.reactance_ohm < 0 ? "m" : "p";
  const band = `${request.body.band.start_hz / 1e9}-${request.body.band.stop_hz / 1e9}GHz`;
  const name = `stepline-${request.method}-${load.resistance_ohm}${sign}j${Math.abs(load.reactance_ohm)}ohm-${band}`;
  return `${name.replace(/[^A-Za-z0-9.+-]/g, "_")}.${extension}`;
}

async function download(format) {
  if (!state.request) return;
  const request = state.request;
  try {
    const { ok, status, response } = await post(`/v1/transformers/${request.method}?format=${format}`, request.body);
    if (!ok) { setStatus(`The ${format} download was refused (${status}).`, "stale"); return; }
    let blob = await response.blob();
    if (format === "csv") {
      const header = Object.entries(request.body).map(([k, v]) => `# ${k}: ${JSON.stringify(v)}`).join("\n");
      blob = new Blob([`# Stepline ${request.method} design\n${header}\n`, blob], { type: "text/csv" });
    }
    save(blob, fileName(request, format === "csv" ? "csv" : "s2p"));
  } catch (error) {
    setStatus(`The ${format} download failed: ${error.message}.`, "stale");
  }
}

/** The shown design's copper and board outline as Gerber X2 files, in a zip. */
async function downloadLayout() {
  if (!state.request) return;
  const request = state.request;
  try {
    const { ok, status, response } = await post("/v1/layouts", { design: { method: request.method, ...request.body } });
    if (!ok) { setStatus(`The layout download was refused (${status}).`, "stale"); return; }
    save(await response.blob(), fileName(request, "zip").replace(/\.zip$/, "-gerber.zip"));
  } catch (error) {
    setStatus(`The layout download failed: ${error.message}.`, "stale");
  }
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
  const load = value("load-kind");
  for (const kind of ["fixed", "circuit", "measured", "touchstone"]) show(`.load-${kind}`, load === kind);
  show(".circuit-l", load === "circuit" && value("circuit-kind").endsWith("l"));
  show(".circuit-c", load === "circuit" && value("circuit-kind").endsWith("c"));
  const spec = NUMBER.test(value("spec")) ? Number(value("spec")) : null;
  byId("spec-hint").textContent = specHint(value("spec-form"), spec);
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

/** The form from the link; a choice the page does not offer is said at its field, not sent. */
function restoreFromUrl() {
  const params = new URLSearchParams(location.search);
  const problems = [];
  for (const id of FORM_IDS) {
    if (!params.has(id)) continue;
    const field = byId(id);
    const given = params.get(id);
    if (field.tagName === "SELECT" && ![...field.options].some((o) => o.value === given)) {
      problems.push({ id, message: `the link asked for "${given}", which is not one of the choices; "${field.value}" is used` });
      continue;
    }
    field.value = given;
  }
  const view = document.querySelector(`input[name="quantity"][value="${params.get("view")}"]`);
  if (view) view.checked = true;
  if (params.get("embed") === "1") document.body.classList.add("embed");
  return problems;
}

/** The kept curves a link names (each a form's query): designed one by one and pinned, the form
 * then put back as the link gave it. */
async function restoreKept() {
  let kept = [];
  try { kept = JSON.parse(new URLSearchParams(location.search).get("keep") || "[]"); } catch { kept = []; }
  if (!Array.isArray(kept) || !kept.length) return;
  const own = formQuery();
  for (const query of kept.filter((q) => typeof q === "string")) {
    const params = new URLSearchParams(query);
    for (const id of FORM_IDS) if (params.has(id)) byId(id).value = params.get(id);
    await design();
    if (state.current && !byId("results").classList.contains("stale")) state.pinned.push({ ...state.current });
  }
  const params = new URLSearchParams(own);
  for (const id of FORM_IDS) byId(id).value = params.get(id);
  showRelevantFields();
}

/** Save a blob under a name, as a download. */
function save(blob, name) {
  const link = document.createElement("a");
  link.href = URL.createObjectURL(blob);
  link.download = name;
  link.click();
}

async function exportPlot(kind) {
  if (!state.request) return;
  const name = fileName(state.request, kind).replace(/\.(svg|png)$/, `-${view()}.${kind}`);
  try {
    if (kind === "svg") save(new Blob([chartSvgText(byId("response-plot"))], { type: "image/svg+xml" }), name);
    else save(await chartPng(byId("response-plot")), name);
  } catch (error) {
    setStatus(`The plot could not be exported: ${error.message}.`, "stale");
  }
}

/** Read a chosen Touchstone file's text; it goes in the request's load. */
async function readTouchstone() {
  const file = byId("touchstone").files[0];
  state.touchstone = file ? { name: file.name, text: await file.text() } : null;
  byId("touchstone-name").textContent = file ? `${file.name}, ${file.size} bytes` : "";
  if (state.current) markStale("the load file has changed since this design; press Design to update");
}

document.addEventListener("DOMContentLoaded", async () => {
  await askForKeyIfNeeded();
  const linkProblems = restoreFromUrl();
  showRelevantFields();
  byId("problem").addEventListener("submit", design);
  byId("access").addEventListener("submit", design);
  byId("problem").addEventListener("input", () => {
    showRelevantFields();
    if (state.current) markStale("the form has changed since this design; press Design to update");
  });
  const relink = () => { if (state.current) byId("share").href = `${location.pathname}?${shareQuery()}`; };
  byId("keep").addEventListener("click", () => {
    if (state.current) { state.pinned.push({ ...state.current }); drawResponse(); relink(); }
  });
  byId("clear").addEventListener("click", () => { state.pinned = []; drawResponse(); relink(); });
  byId("show-all").addEventListener("click", () => fillSections(state.current.design, state.request, true));
  document.querySelectorAll('input[name="quantity"]').forEach((r) => r.addEventListener("change", () => {
    drawResponse();
    if (state.current) byId("share").href = `${location.pathname}?${shareQuery()}`;
  }));
  byId("touchstone").addEventListener("change", readTouchstone);
  byId("export-svg").addEventListener("click", () => exportPlot("svg"));
  byId("export-png").addEventListener("click", () => exportPlot("png"));
  byId("run-compare").addEventListener("click", runCompare);
  byId("run-yield").addEventListener("click", runYield);
  for (const id of ["y-low", "y-high"]) byId(id).addEventListener("change", () => { clearErrors(); drawResponse(); });
  byId("get-touchstone").addEventListener("click", () => download("touchstone"));
  byId("get-csv").addEventListener("click", () => download("csv"));
  byId("get-gerber").addEventListener("click", downloadLayout);
  window.addEventListener("resize", drawResponse);
  await restoreKept();
  await design();
  if (linkProblems.length) showErrors(linkProblems);
});
