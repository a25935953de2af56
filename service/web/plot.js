/* Small SVG line charts drawn by the page itself: axes, grid, series, marked bands and levels. */
"use strict";

const SVG_NS = "http://www.w3.org/2000/svg";

function svgElement(name, attributes, text) {
  const element = document.createElementNS(SVG_NS, name);
  for (const [key, value] of Object.entries(attributes || {})) element.setAttribute(key, value);
  if (text !== undefined) element.textContent = text;
  return element;
}

function niceTicks(low, high, count) {
  const span = high - low || Math.abs(high) || 1;
  const raw = span / count;
  const magnitude = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * magnitude).find((s) => span / s <= count) || 10 * magnitude;
  const ticks = [];
  for (let t = Math.ceil(low / step) * step; t <= high + step * 1e-9; t += step) ticks.push(Number(t.toPrecision(12)));
  return ticks;
}

/* options: {series: [{x, y, color, label, step}], xLabel, yLabel, bands: [{x0, x1}], levels: [{y, label}], height} */
function drawChart(container, options) {
  const width = Math.max(container.clientWidth || 640, 320);
  const height = options.height || 320;
  const margin = { left: 62, right: 16, top: 12, bottom: 44 };
  const xs = options.series.flatMap((s) => s.x);
  const ys = options.series.flatMap((s) => s.y).concat((options.levels || []).map((l) => l.y));
  let [x0, x1] = [Math.min(...xs), Math.max(...xs)];
  let [y0, y1] = [Math.min(...ys), Math.max(...ys)];
  if (options.yFromZero) y0 = Math.min(0, y0);
  if (y1 === y0) y1 = y0 + 1;
  const pad = (y1 - y0) * 0.06;
  y1 += pad;
  if (!options.yFromZero) y0 -= pad;
  const sx = (x) => margin.left + ((x - x0) / (x1 - x0 || 1)) * (width - margin.left - margin.right);
  const sy = (y) => height - margin.bottom - ((y - y0) / (y1 - y0)) * (height - margin.top - margin.bottom);
  const svg = svgElement("svg", { width, height, viewBox: `0 0 ${width} ${height}`, class: "chart" });
  for (const band of options.bands || []) {
    svg.appendChild(svgElement("rect", {
      x: sx(band.x0), y: margin.top, width: Math.max(sx(band.x1) - sx(band.x0), 1),
      height: height - margin.top - margin.bottom, fill: "#dcece9", class: "band",
    }));
  }
  for (const t of niceTicks(x0, x1, 8)) {
    svg.appendChild(svgElement("line", { x1: sx(t), x2: sx(t), y1: margin.top, y2: height - margin.bottom, stroke: "#ece8df" }));
    svg.appendChild(svgElement("text", { x: sx(t), y: height - margin.bottom + 16, "text-anchor": "middle", "font-size": 11 }, String(t)));
  }
  for (const t of niceTicks(y0, y1, 6)) {
    svg.appendChild(svgElement("line", { x1: margin.left, x2: width - margin.right, y1: sy(t), y2: sy(t), stroke: "#ece8df" }));
    svg.appendChild(svgElement("text", { x: margin.left - 6, y: sy(t) + 4, "text-anchor": "end", "font-size": 11 }, String(t)));
  }
  svg.appendChild(svgElement("text", { x: (width + margin.left) / 2, y: height - 6, "text-anchor": "middle", "font-size": 12 }, options.xLabel));
  svg.appendChild(svgElement("text", {
    x: 14, y: (height - margin.bottom) / 2, "text-anchor": "middle", "font-size": 12,
    transform: `rotate(-90 14 ${(height - margin.bottom) / 2})`,
  }, options.yLabel));
  for (const level of options.levels || []) {
    svg.appendChild(svgElement("line", {
      x1: margin.left, x2: width - margin.right, y1: sy(level.y), y2: sy(level.y),
      stroke: "#a8321e", "stroke-dasharray": "6 4", class: "level",
    }));
    svg.appendChild(svgElement("text", { x: width - margin.right - 4, y: sy(level.y) - 4, "text-anchor": "end", "font-size": 11, fill: "#a8321e" }, level.label));
  }
  for (const series of options.series) {
    let path = "";
    series.x.forEach((x, i) => {
      const point = `${sx(x).toFixed(2)},${sy(series.y[i]).toFixed(2)}`;
      if (i === 0) path += `M${point}`;
      else if (series.step) path += `H${sx(x).toFixed(2)}V${sy(series.y[i]).toFixed(2)}`;
      else path += `L${point}`;
    });
    svg.appendChild(svgElement("path", { d: path, fill: "none", stroke: series.color, "stroke-width": 2, class: "series" }));
  }
  container.replaceChildren(svg);
}
