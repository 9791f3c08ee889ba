/**
 * The side panel's chart.js charts: the prior density with its 90% range and mean, and decision power
 * against visitors per variant. Each chart lives on its own canvas and is replaced on update.
 */
import {
  Chart,
  Filler,
  Legend,
  LinearScale,
  LineController,
  LineElement,
  PointElement,
  ScatterController,
  Tooltip,
  type ChartConfiguration,
} from 'chart.js';
import type { Curve, PriorSummary } from '../logic/priorSummary';
import type { PowerPoint } from '../logic/plan';

/** Register the chart.js pieces the panel uses (once, at start-up, from index.ts). */
export function registerChartParts(): void {
  Chart.register(LineController, ScatterController, LineElement, PointElement, LinearScale, Filler, Tooltip, Legend);
}

/** The colours of the current theme, read from Fluent's CSS tokens with fallbacks. */
function themeColours(canvas: HTMLCanvasElement): { line: string; fill: string; text: string; grid: string; accent: string } {
  const style = getComputedStyle(canvas);
  const token = (name: string, fallback: string): string => style.getPropertyValue(name).trim() || fallback;
  return {
    line: token('--colorBrandForeground1', '#0f6cbd'),
    fill: token('--colorBrandBackground2', '#ebf3fc'),
    text: token('--colorNeutralForeground2', '#424242'),
    grid: token('--colorNeutralStroke2', '#e0e0e0'),
    accent: token('--colorPaletteDarkOrangeForeground1', '#c43501'),
  };
}

/** A holder for one canvas's chart, so an update destroys the previous one. */
export interface ChartSlot {
  readonly canvas: HTMLCanvasElement;
  chart: Chart | null;
}

/**
 * A chart slot on a new canvas. Cost O(1).
 * @example const slot = chartSlot('prior-chart', 'Prior density'); section.append(slot.canvas)
 */
export function chartSlot(id: string, label: string): ChartSlot {
  const canvas = document.createElement('canvas');
  canvas.id = id;
  canvas.setAttribute('role', 'img');
  canvas.setAttribute('aria-label', label);
  canvas.height = 180;
  return { canvas, chart: null };
}

function replace(slot: ChartSlot, config: ChartConfiguration): void {
  slot.chart?.destroy();
  slot.chart = new Chart(slot.canvas, config);
}

/**
 * Draw the prior density, its central 90% range shaded and its mean as a vertical line. Cost O(points).
 * @example drawPriorChart(slot, curve, summary)
 */
export function drawPriorChart(slot: ChartSlot, curve: Curve, summary: PriorSummary): void {
  const colours = themeColours(slot.canvas);
  const points = curve.x.map((x, i) => ({ x: x * 100, y: curve.y[i] ?? 0 }));
  const inRange = points.filter((pt) => pt.x >= summary.low90 * 100 && pt.x <= summary.high90 * 100);
  const peak = Math.max(...points.map((pt) => pt.y), 0);
  replace(slot, {
    type: 'line',
    data: {
      datasets: [
        { label: 'Prior density', data: points, borderColor: colours.line, pointRadius: 0, borderWidth: 2, parsing: false },
        {
          label: 'Central 90% range',
          data: inRange,
          borderColor: 'transparent',
          backgroundColor: colours.fill,
          fill: 'origin',
          pointRadius: 0,
          parsing: false,
        },
        {
          label: 'Mean',
          data: [
            { x: summary.mean * 100, y: 0 },
            { x: summary.mean * 100, y: peak },
          ],
          borderColor: colours.accent,
          borderDash: [4, 3],
          pointRadius: 0,
          borderWidth: 1.5,
          parsing: false,
        },
      ],
    },
    options: {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      scales: {
        x: { type: 'linear', title: { display: true, text: 'conversion rate (%)', color: colours.text }, ticks: { color: colours.text }, grid: { color: colours.grid } },
        y: { type: 'linear', title: { display: true, text: 'density', color: colours.text }, ticks: { color: colours.text }, grid: { color: colours.grid }, beginAtZero: true },
      },
      plugins: { legend: { labels: { color: colours.text, boxWidth: 12 } } },
    },
  });
}

/**
 * Draw decision power against visitors per variant, with the target power as a dashed line.
 * Cost O(points).
 * @example drawPowerChart(slot, points, 0.8)
 */
export function drawPowerChart(slot: ChartSlot, points: readonly PowerPoint[], target: number): void {
  const colours = themeColours(slot.canvas);
  const data = points.map((pt) => ({ x: pt.visitorsPerVariant, y: pt.power * 100 }));
  const xs = data.map((pt) => pt.x);
  const span = xs.length > 0 ? [Math.min(...xs), Math.max(...xs)] : [0, 1];
  replace(slot, {
    type: 'line',
    data: {
      datasets: [
        { label: 'Decision power', data, borderColor: colours.line, backgroundColor: colours.line, pointRadius: 3, borderWidth: 2, parsing: false },
        {
          label: 'Target',
          data: [
            { x: span[0] ?? 0, y: target * 100 },
            { x: span[1] ?? 1, y: target * 100 },
          ],
          borderColor: colours.accent,
          borderDash: [4, 3],
          pointRadius: 0,
          borderWidth: 1.5,
          parsing: false,
        },
      ],
    },
    options: {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      scales: {
        x: { type: 'linear', title: { display: true, text: 'visitors per variant', color: colours.text }, ticks: { color: colours.text }, grid: { color: colours.grid } },
        y: { type: 'linear', min: 0, max: 100, title: { display: true, text: 'decision power (%)', color: colours.text }, ticks: { color: colours.text }, grid: { color: colours.grid } },
      },
      plugins: { legend: { labels: { color: colours.text, boxWidth: 12 } } },
    },
  });
}
