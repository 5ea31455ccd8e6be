import { BarController, BarElement, CategoryScale, Chart, Legend, LinearScale, Tooltip, type ChartConfiguration } from "chart.js";
import { useEffect, useId, useRef } from "react";
import { formatMoney } from "../../lib/billing/money";
import { formatVolume } from "../../lib/format";
import type { UsageChartSeries } from "../../lib/ledger/usage-chart";

// Only what a horizontal bar chart with a tooltip and a legend needs, so the rest of Chart.js is
// left out of the bundle. This module is loaded on demand (see UsageTable), never with the page.
Chart.register(BarController, BarElement, CategoryScale, LinearScale, Tooltip, Legend);

const BAR_ROW_PX = 34;
const AXES_PX = 76;

/** Decant's theme tokens (src/styles/global.css), read from the page: a canvas cannot use var(). */
function themeTokens() {
  const style = getComputedStyle(document.documentElement);
  const token = (name: string) => style.getPropertyValue(name).trim();
  return {
    volume: token("--color-teal"),
    cost: token("--color-amber"),
    ink: token("--color-ink-soft"),
    rule: token("--color-rule"),
    font: token("--font-sans"),
  };
}

function chartConfig(series: UsageChartSeries): ChartConfiguration<"bar", (number | null)[], string> {
  const theme = themeTokens();
  const cost = series.cost;
  const money = (amount: number) => (cost ? formatMoney({ amount: Math.round(amount), currency: cost.currency }) : "");
  return {
    type: "bar",
    data: {
      labels: series.labels,
      datasets: [
        { label: "Volume", data: series.volumes_mL, xAxisID: "volume", backgroundColor: theme.volume, borderRadius: 2 },
        ...(cost
          ? [{ label: `Cost (${cost.currency})`, data: cost.amounts, xAxisID: "cost", backgroundColor: theme.cost, borderRadius: 2 }]
          : []),
      ],
    },
    options: {
      indexAxis: "y",
      responsive: true,
      maintainAspectRatio: false,
      animation: { duration: 250 },
      font: { family: theme.font },
      color: theme.ink,
      scales: {
        y: { ticks: { color: theme.ink, autoSkip: false }, grid: { display: false } },
        volume: {
          type: "linear",
          position: "bottom",
          beginAtZero: true,
          title: { display: true, text: "Volume", color: theme.ink },
          ticks: { color: theme.ink, callback: (v) => formatVolume(Number(v)) },
          grid: { color: theme.rule },
        },
        ...(cost
          ? {
              cost: {
                type: "linear" as const,
                position: "top" as const,
                beginAtZero: true,
                title: { display: true, text: `Cost (${cost.currency})`, color: theme.ink },
                ticks: { color: theme.ink, callback: (v: number | string) => money(Number(v)) },
                grid: { display: false },
              },
            }
          : {}),
      },
      plugins: {
        legend: { display: cost !== null, position: "bottom", labels: { color: theme.ink, boxWidth: 14 } },
        tooltip: {
          callbacks: {
            label: (item) =>
              `${item.dataset.label}: ${item.dataset.xAxisID === "cost" ? money(item.parsed.x ?? 0) : formatVolume(item.parsed.x ?? 0)}`,
          },
        },
      },
    },
  };
}

/**
 * The usage chart: one horizontal bar per group of the table, volume on the bottom axis and
 * cost (when the groups share one currency) on the top one. Assistive technology reads the
 * same figures from the description; `data-groups` lists the bars in order.
 */
export default function UsageChart({ series, name }: { series: UsageChartSeries; name: string }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const chart = useRef<Chart<"bar", (number | null)[], string> | null>(null);
  const descriptionId = useId();

  useEffect(() => {
    const config = chartConfig(series);
    if (chart.current) {
      chart.current.data = config.data;
      chart.current.options = config.options ?? {};
      chart.current.update();
    } else if (canvas.current) {
      chart.current = new Chart(canvas.current, config);
    }
  }, [series]);
  useEffect(() => () => chart.current?.destroy(), []);

  return (
    <div
      className="relative w-full"
      style={{ height: `${series.labels.length * BAR_ROW_PX * (series.cost ? 1.4 : 1) + AXES_PX * (series.cost ? 2 : 1)}px` }}
    >
      <canvas ref={canvas} role="img" aria-label={name} aria-describedby={descriptionId} data-groups={JSON.stringify(series.labels)} />
      <p id={descriptionId} className="sr-only">
        {series.description}
      </p>
    </div>
  );
}
