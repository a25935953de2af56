/* The page's two tools beside a design: every method side by side, and a Monte Carlo yield run.
 * Both work on the design shown (state.request, from app.js), and their results go out of date with it. */
"use strict";

const METHOD_ONLY_FIELDS = ["theory", "sections", "profile", "segments"];

/** The shown design's problem as a comparison request (the method's own fields left out). */
function compareBody(request) {
  const body = { ...request.body, include_tapers: true };
  for (const name of METHOD_ONLY_FIELDS) delete body[name];
  return body;
}

async function runCompare() {
  if (!state.request) return;
  const button = byId("run-compare");
  button.disabled = true;
  setStatus("Comparing every method...", "busy");
  try {
    const { ok, status, response } = await post("/v1/transformers/compare", compareBody(state.request));
    if (!ok) { setStatus(`The comparison was refused (${status}).`, "stale"); return; }
    const comparison = await response.json();
    byId("compare-table").tBodies[0].replaceChildren(...comparison.candidates.map((c) => {
      const tr = document.createElement("tr");
      for (const cell of [c.rank, c.method, c.profile || c.theory, c.section_count, (c.total_length_m * 1e3).toFixed(2),
        c.verified.max_reflection.toPrecision(4), c.meets_spec ? "yes" : "no"]) {
        const td = document.createElement("td");
        td.textContent = cell;
        tr.appendChild(td);
      }
      return tr;
    }));
    byId("compare-table").hidden = false;
    setStatus(`Compared ${comparison.candidates.length} designs; the best is ${comparison.candidates[0]?.method ?? "none"}.`, "");
  } catch (error) {
    setStatus(`The comparison failed: ${error.message}.`, "stale");
  } finally {
    button.disabled = false;
  }
}

/** The tolerance inputs as the API's one-sigma errors (metres), or a problem at the first bad one. */
function tolerances() {
  const read = (id, scale) => {
    const text = value(id) || "0";
    if (!NUMBER.test(text) || Number(text) < 0) throw new FormProblems([{ id: "tol-width", message: `"${text}" is not a tolerance (a number, at least 0)` }]);
    return Number(text) * scale;
  };
  return { width_m: read("tol-width", 1e-6), etch_bias_m: read("tol-etch", 1e-6), eps_r: read("tol-eps", 1), height_m: read("tol-height", 1e-6) };
}

async function runYield() {
  if (!state.request) return;
  let body;
  try {
    const trials = Number(value("trials") || "1000");
    if (!Number.isInteger(trials) || trials < 1) throw new FormProblems([{ id: "tol-width", message: "trials must be a whole number above 0" }]);
    body = { design: { method: state.request.method, ...state.request.body }, tolerances: tolerances(), trials, seed: 1 };
  } catch (error) {
    if (!(error instanceof FormProblems)) throw error;
    showErrors(error.problems);
    return;
  }
  const button = byId("run-yield");
  button.disabled = true;
  setStatus("Running the yield trials...", "busy");
  try {
    const { ok, status, response } = await post("/v1/yield", body);
    if (!ok) {
      const problems = (await response.json()).problems || [];
      setStatus(`The yield run was refused (${status}): ${problems.map((p) => inPageWords(p.message)).join(" ")}`, "stale");
      return;
    }
    const result = await response.json();
    const [low, high] = result.interval_95;
    byId("yield-summary").textContent = `Yield ${(100 * result.yield_fraction).toFixed(1)}% of ${result.trials} trials `
      + `(95% interval ${(100 * low).toFixed(1)}-${(100 * high).toFixed(1)}%); worst |reflection| median `
      + `${result.percentiles.p50.toPrecision(3)}, 95th percentile ${result.percentiles.p95.toPrecision(3)}, spec ${result.spec_max_reflection}.`;
    const { edges, counts } = result.histogram;
    drawChart(byId("yield-plot"), {
      series: [{ x: edges, y: [...counts, counts[counts.length - 1]], color: COLORS[0], step: true, label: "trials" }],
      xLabel: "worst in-band |reflection|", yLabel: "trials", height: 220, yFromZero: true,
      verticals: [{ x: result.spec_max_reflection, label: "spec" }],
    });
    setStatus(`Yield ${(100 * result.yield_fraction).toFixed(1)}% under the given tolerances.`, "");
  } catch (error) {
    setStatus(`The yield run failed: ${error.message}.`, "stale");
  } finally {
    button.disabled = false;
  }
}
