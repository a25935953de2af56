/* A Smith chart drawn by the page itself: the reflection plane with circles of constant normalized
 * resistance and arcs of constant normalized reactance, and the input reflection over frequency. */
"use strict";

const SMITH_RESISTANCES = [0.2, 0.5, 1, 2, 5];
const SMITH_REACTANCES = [0.2, 0.5, 1, 2, 5];

/* options: {curves: [{re, im, inBand, color, label}], markers: [{re, im, label}]} */
function drawSmith(container, options) {
  const size = Math.min(Math.max(container.clientWidth || 360, 240), 420);
  const radius = size / 2 - 14;
  const centre = size / 2;
  const px = (re) => centre + re * radius;
  const py = (im) => centre - im * radius;
  const svg = svgElement("svg", { width: size, height: size, viewBox: `0 0 ${size} ${size}`, class: "chart smith-chart", xmlns: SVG_NS });
  const clip = svgElement("clipPath", { id: "smith-clip" });
  clip.appendChild(svgElement("circle", { cx: centre, cy: centre, r: radius }));
  svg.appendChild(clip);
  const grid = svgElement("g", { "clip-path": "url(#smith-clip)", stroke: "#d9d4c8", fill: "none" });
  for (const r of SMITH_RESISTANCES) {  // circle of constant resistance r: centre r/(1+r), radius 1/(1+r)
    grid.appendChild(svgElement("circle", { cx: px(r / (1 + r)), cy: centre, r: radius / (1 + r) }));
  }
  for (const x of SMITH_REACTANCES) {  // arc of constant reactance +-x: centre (1, +-1/x), radius 1/x
    for (const sign of [1, -1]) grid.appendChild(svgElement("circle", { cx: px(1), cy: py(sign / x), r: radius / x }));
  }
  grid.appendChild(svgElement("line", { x1: px(-1), x2: px(1), y1: centre, y2: centre }));
  svg.appendChild(grid);
  svg.appendChild(svgElement("circle", { cx: centre, cy: centre, r: radius, fill: "none", stroke: "#5a6673" }));
  for (const r of SMITH_RESISTANCES) {
    svg.appendChild(svgElement("text", { x: px((r - 1) / (r + 1)) + 2, y: centre - 3, "font-size": 9, fill: "#5a6673" }, String(r)));
  }
  for (const curve of options.curves) {
    const points = (keep) => curve.re.map((re, i) => (keep(i) ? `${px(re).toFixed(2)},${py(curve.im[i]).toFixed(2)}` : null));
    svg.appendChild(svgElement("polyline", { points: points(() => true).join(" "), fill: "none", stroke: curve.color, "stroke-width": 1, opacity: 0.6, class: "wide" }));
    const inBand = points((i) => curve.inBand[i]).filter(Boolean).join(" ");
    svg.appendChild(svgElement("polyline", { points: inBand, fill: "none", stroke: curve.color, "stroke-width": 3, class: "in-band" }));
  }
  for (const marker of options.markers || []) {
    svg.appendChild(svgElement("circle", { cx: px(marker.re), cy: py(marker.im), r: 4, fill: "#fff", stroke: "#1c2530", class: "marker" }));
    svg.appendChild(svgElement("text", { x: px(marker.re) + 6, y: py(marker.im) - 6, "font-size": 11 }, marker.label));
  }
  container.replaceChildren(svg);
}
