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

/* options: {series: [{x, y, color, label, step}], xLabel, yLabel, bands: [{x0, x1}], levels: [{y, label}], height,
 *   yLimits: {low, high} (either may be null: fit), markers: [{x, y, label}], verticals: [{x, label}],
 *   readout: {element, format(x, y)}: a cursor over the plot reads the last series there} */
function drawChart(container, options) {
  const width = Math.max(container.clientWidth || 640, 320);
  const height = options.height || 320;
  const margin = { left: 62, right: 16, top: 12, bottom: 44 };
  const xs = options.series.flatMap((s) => s.x).concat((options.verticals || []).map((v) => v.x));
  const ys = options.series.flatMap((s) => s.y).concat((options.levels || []).map((l) => l.y));
  let [x0, x1] = [Math.min(...xs), Math.max(...xs)];
  let [y0, y1] = [Math.min(...ys), Math.max(...ys)];
  if (options.yFromZero) y0 = Math.min(0, y0);
  if (y1 === y0) y1 = y0 + 1;
  const pad = (y1 - y0) * 0.06;
  y1 += pad;
  if (!options.yFromZero) y0 -= pad;
  const limits = options.yLimits || {};
  if (limits.low != null) y0 = limits.low;
  if (limits.high != null) y1 = limits.high;
  if (y1 <= y0) y1 = y0 + 1;
  const sx = (x) => margin.left + ((x - x0) / (x1 - x0 || 1)) * (width - margin.left - margin.right);
  const sy = (y) => height - margin.bottom - ((y - y0) / (y1 - y0)) * (height - margin.top - margin.bottom);
  const svg = svgElement("svg", { width, height, viewBox: `0 0 ${width} ${height}`, class: "chart", xmlns: SVG_NS });
  const clipId = `clip-${container.id}`;
  const clip = svgElement("clipPath", { id: clipId });
  clip.appendChild(svgElement("rect", { x: margin.left, y: margin.top, width: width - margin.left - margin.right, height: height - margin.top - margin.bottom }));
  svg.appendChild(clip);
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
    svg.appendChild(svgElement("path", { d: path, fill: "none", stroke: series.color, "stroke-width": 2, class: "series", "clip-path": `url(#${clipId})` }));
  }
  for (const line of options.verticals || []) {
    svg.appendChild(svgElement("line", { x1: sx(line.x), x2: sx(line.x), y1: margin.top, y2: height - margin.bottom, stroke: "#a8321e", "stroke-dasharray": "6 4", class: "vertical" }));
    svg.appendChild(svgElement("text", { x: sx(line.x) + 4, y: margin.top + 12, "font-size": 11, fill: "#a8321e" }, line.label));
  }
  for (const marker of options.markers || []) {
    if (marker.y < y0 || marker.y > y1) continue;
    svg.appendChild(svgElement("circle", { cx: sx(marker.x), cy: sy(marker.y), r: 4, fill: "#fff", stroke: "#1c2530", "stroke-width": 1.5, class: "marker" }));
    svg.appendChild(svgElement("text", { x: sx(marker.x) + 6, y: sy(marker.y) - 6, "font-size": 11, class: "marker-label" }, marker.label));
  }
  if (options.readout && options.series.length) addReadout(svg, options, sx, sy, margin, width, height, x0, x1);
  container.replaceChildren(svg);
}

/** A cursor: moving over the plot marks the nearest point of the last series and reads it out. */
function addReadout(svg, options, sx, sy, margin, width, height, x0, x1) {
  const series = options.series[options.series.length - 1];
  const cursor = svgElement("line", { y1: margin.top, y2: height - margin.bottom, stroke: "#5a6673", visibility: "hidden", class: "cursor" });
  const dot = svgElement("circle", { r: 3.5, fill: series.color, visibility: "hidden" });
  const surface = svgElement("rect", { x: margin.left, y: margin.top, width: width - margin.left - margin.right, height: height - margin.top - margin.bottom, fill: "transparent", class: "surface" });
  svg.append(cursor, dot, surface);
  surface.addEventListener("mousemove", (event) => {
    const box = svg.getBoundingClientRect();
    const x = x0 + ((event.clientX - box.left - margin.left) / (width - margin.left - margin.right)) * (x1 - x0);
    let nearest = 0;
    series.x.forEach((value, i) => { if (Math.abs(value - x) < Math.abs(series.x[nearest] - x)) nearest = i; });
    const [px, py] = [series.x[nearest], series.y[nearest]];
    cursor.setAttribute("x1", sx(px));
    cursor.setAttribute("x2", sx(px));
    dot.setAttribute("cx", sx(px));
    dot.setAttribute("cy", sy(py));
    cursor.setAttribute("visibility", "visible");
    dot.setAttribute("visibility", "visible");
    options.readout.element.textContent = options.readout.format(px, py);
  });
  surface.addEventListener("mouseleave", () => {
    cursor.setAttribute("visibility", "hidden");
    dot.setAttribute("visibility", "hidden");
  });
}

/** The chart in a container as a standalone SVG file's text. */
function chartSvgText(container) {
  const svg = container.querySelector("svg").cloneNode(true);
  svg.querySelectorAll(".surface, .cursor").forEach((e) => e.remove());
  svg.insertBefore(svgElement("rect", { width: "100%", height: "100%", fill: "#fff" }), svg.firstChild);
  svg.setAttribute("font-family", "sans-serif");
  return new XMLSerializer().serializeToString(svg);
}

/** The chart as a PNG (drawn from its SVG through an image into a canvas), at twice its size. */
function chartPng(container) {
  const svg = container.querySelector("svg");
  const [width, height] = [Number(svg.getAttribute("width")), Number(svg.getAttribute("height"))];
  const url = URL.createObjectURL(new Blob([chartSvgText(container)], { type: "image/svg+xml" }));
  return new Promise((resolve, reject) => {
    const image = new Image();
    image.onload = () => {
      const canvas = document.createElement("canvas");
      canvas.width = 2 * width;
      canvas.height = 2 * height;
      const context = canvas.getContext("2d");
      context.fillStyle = "#fff";
      context.fillRect(0, 0, canvas.width, canvas.height);
      context.drawImage(image, 0, 0, canvas.width, canvas.height);
      URL.revokeObjectURL(url);
      canvas.toBlob(resolve, "image/png");
    };
    image.onerror = () => reject(new Error("the plot could not be drawn as an image"));
    image.src = url;
  });
}
