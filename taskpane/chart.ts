/** Draws ChartData with Chart.js (MIT): curves, efficiency on a second axis, the operating point; NPSH in a second panel. */
import { Chart, Legend, LinearScale, LineElement, PointElement, ScatterController, Tooltip } from "chart.js";
import type { ChartData } from "./chartData";
import { formatQuantity, formatUnit } from "../workbook/format";

Chart.register(ScatterController, LineElement, PointElement, LinearScale, Legend, Tooltip);

const COLOURS = ["#0e5463", "#c2571a", "#6a4c93", "#2a9d8f", "#8a1c1c", "#4a6670"];

/** A chart element that follows its container's width: head and efficiency, then NPSH in a panel of its own. */
export function drawChart(data: ChartData): HTMLElement {
  const box = document.createElement("div");
  box.className = "chart";
  box.setAttribute("role", "img");
  box.setAttribute("aria-label", `${data.title}: head against flow${data.operatingPoint ? `, operating point ${formatQuantity(data.operatingPoint.x, data.flowUnit)}, ${formatQuantity(data.operatingPoint.y, data.headUnit)}` : ""}`);
  if (data.operatingPoint) box.dataset.operatingPoint = `${data.operatingPoint.x},${data.operatingPoint.y}`;
  box.dataset.series = data.series.map((s) => s.name).join("|");
  // A case's system curve, operating point and NPSHa share a colour, as a curve's points and line do.
  const palette = new Map<string, string>([["System curve", "#c2571a"], ["Operating point", "#d62828"], ["BEP", "#2b2d42"], ["Preferred region (70–120 % of BEP)", "#8d99ae"]]);
  const others = COLOURS.filter((c) => c !== "#c2571a");
  const colourOf = (name: string) => {
    const key = name.replace(/ \(points\)$/, "").replace(/^(System|Point|NPSHa): /, "");
    if (!palette.has(key)) palette.set(key, others[palette.size % others.length]);
    return palette.get(key)!;
  };
  const datasets = (axes: readonly string[]) =>
    data.series
      .filter((s) => axes.includes(s.axis))
      .map((s) => {
        const c = colourOf(s.name);
        return {
          label: s.name,
          data: s.points,
          yAxisID: s.axis === "efficiency" ? "y2" : "y",
          showLine: s.style === "line" || s.style === "dashed",
          borderDash: s.style === "dashed" ? [5, 4] : [],
          borderColor: c,
          backgroundColor: c,
          pointRadius: s.style === "marker" ? 6 : s.style === "points" ? 3 : 0,
          pointStyle: s.style === "marker" ? ("rectRot" as const) : ("circle" as const),
          borderWidth: 2,
        };
      });
  // The legend is a list under the canvas, not in it: a dozen curves of an envelope would leave a
  // narrow pane's plot a strip. Every curve has an entry (a curve's points share its line's).
  const legend = { display: false };
  const legendOf = (axes: readonly string[]) => {
    const list = document.createElement("ul");
    list.className = "chart-legend";
    for (const s of data.series.filter((x) => axes.includes(x.axis) && !x.name.endsWith("(points)"))) {
      const item = document.createElement("li");
      const swatch = document.createElement("span");
      swatch.className = `swatch ${s.style}`;
      swatch.style.background = colourOf(s.name);
      item.append(swatch, document.createTextNode(s.name));
      list.append(item);
    }
    return list;
  };
  const main = document.createElement("canvas");
  box.append(main);
  // One panel: a scatter chart whose y axis starts at zero, titled in the data's units.
  const panelChart = (canvas: HTMLCanvasElement, axes: readonly string[], xTitle: string, yTitle: string, extra = {}) =>
    new Chart(canvas, {
      type: "scatter",
      data: { datasets: datasets(axes) },
      options: {
        responsive: true,
        maintainAspectRatio: false,
        animation: false,
        plugins: { legend },
        scales: { x: { type: "linear", title: { display: true, text: xTitle } }, y: { type: "linear", position: "left", min: 0, title: { display: true, text: yTitle } }, ...extra },
      },
    });
  panelChart(main, ["head", "efficiency"], `Flow (${formatUnit(data.flowUnit)})`, `Head (${formatUnit(data.headUnit)})`, data.efficiencyUnit ? { y2: { type: "linear" as const, position: "right" as const, title: { display: true, text: `Efficiency (${data.efficiencyUnit})` }, grid: { drawOnChartArea: false } } } : {});
  const figure = document.createElement("div");
  figure.className = "chart-figure";
  figure.append(box, legendOf(["head", "efficiency"]));
  if (data.series.some((s) => s.axis === "npsh")) {
    const panel = document.createElement("div");
    panel.className = "chart npsh-panel";
    panel.setAttribute("role", "img");
    panel.setAttribute("aria-label", `NPSH available and required against flow${data.npshFlowLabel ? " per pump" : ""}, on a scale of their own`);
    const canvas = document.createElement("canvas");
    panel.append(canvas);
    figure.append(panel, legendOf(["npsh"]));
    panelChart(canvas, ["npsh"], `${data.npshFlowLabel ?? "Flow"} (${formatUnit(data.flowUnit)})`, `NPSH (${formatUnit(data.headUnit)})`);
  }
  return figure;
}
