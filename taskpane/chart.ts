/** Draws ChartData with Chart.js (MIT): curves, efficiency on a second axis, the operating point. */
import { Chart, Legend, LinearScale, LineElement, PointElement, ScatterController, Tooltip } from "chart.js";
import type { ChartData } from "./chartData";

Chart.register(ScatterController, LineElement, PointElement, LinearScale, Legend, Tooltip);

const COLOURS = ["#0e5463", "#c2571a", "#6a4c93", "#2a9d8f", "#8a1c1c", "#4a6670"];

/** A chart element that follows its container's width. */
export function drawChart(data: ChartData): HTMLElement {
  const box = document.createElement("div");
  box.className = "chart";
  box.setAttribute("role", "img");
  box.setAttribute("aria-label", `${data.title}: head against flow${data.operatingPoint ? `, operating point ${data.operatingPoint.x.toPrecision(4)} ${data.flowUnit}, ${data.operatingPoint.y.toPrecision(4)} ${data.headUnit}` : ""}`);
  if (data.operatingPoint) box.dataset.operatingPoint = `${data.operatingPoint.x},${data.operatingPoint.y}`;
  box.dataset.series = data.series.map((s) => s.name).join("|");
  const canvas = document.createElement("canvas");
  box.append(canvas);
  // A curve's points and its line share a colour; the system curve and operating point have their own.
  const palette = new Map<string, string>([["System curve", "#c2571a"], ["Operating point", "#d62828"]]);
  const others = COLOURS.filter((c) => c !== "#c2571a");
  const colourOf = (name: string) => {
    const key = name.replace(/ \(points\)$/, "");
    if (!palette.has(key)) palette.set(key, others[(palette.size - 2) % others.length]);
    return palette.get(key)!;
  };
  const datasets = data.series.map((s) => {
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
  new Chart(canvas, {
    type: "scatter",
    data: { datasets },
    options: {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      plugins: { legend: { position: "bottom", labels: { boxWidth: 12, font: { size: 10 }, filter: (item) => !item.text.endsWith("(points)") } } },
      scales: {
        x: { type: "linear", title: { display: true, text: `Flow (${data.flowUnit})` } },
        y: { type: "linear", position: "left", title: { display: true, text: `Head (${data.headUnit})` } },
        ...(data.efficiencyUnit ? { y2: { type: "linear" as const, position: "right" as const, title: { display: true, text: `Efficiency (${data.efficiencyUnit})` }, grid: { drawOnChartArea: false } } } : {}),
      },
    },
  });
  return box;
}
