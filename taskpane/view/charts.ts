/**
 * The side panel's chart.js charts, drawn for a reader who is not a statistician: axes in percent where
 * the quantity is a percent, marked lines with words on them (the prior's mean, "no lift", the target
 * power, the planned size), and no axis of raw density numbers — a curve's height only says which values
 * are more plausible. Each chart lives on its own canvas and is replaced on update.
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
  type ChartDataset,
  type Plugin,
} from 'chart.js';
import type { Curve, PriorSummary } from '../logic/priorSummary';
import type { PowerPoint } from '../logic/plan';
import { DEFAULT_LOCALE, formatCount, formatPercent, type NumberLocale } from '../logic/inputs';

/** Register the chart.js pieces the panel uses (once, at start-up, from index.ts). */
export function registerChartParts(): void {
  Chart.register(LineController, ScatterController, LineElement, PointElement, LinearScale, Filler, Tooltip, Legend);
}

/** The colours of the current theme, read from Fluent's CSS tokens with fallbacks. */
interface Colours {
  readonly line: string;
  readonly text: string;
  readonly grid: string;
  readonly accent: string;
  readonly strong: string;
  readonly background: string;
  readonly series: readonly string[];
}

function themeColours(canvas: HTMLCanvasElement): Colours {
  // The theme's tokens live on the document; a canvas not yet placed in the page has no computed style.
  const style = getComputedStyle(canvas.isConnected ? canvas : document.documentElement);
  const token = (name: string, fallback: string): string => style.getPropertyValue(name).trim() || fallback;
  return {
    line: token('--colorBrandForeground1', '#0f6cbd'),
    text: token('--colorNeutralForeground2', '#424242'),
    grid: token('--colorNeutralStroke2', '#e0e0e0'),
    accent: token('--colorPaletteDarkOrangeForeground1', '#c43501'),
    strong: token('--colorNeutralForeground1', '#242424'),
    background: token('--colorNeutralBackground1', '#ffffff'),
    series: [
      token('--colorBrandForeground1', '#0f6cbd'),
      token('--colorPaletteDarkOrangeForeground1', '#c43501'),
      token('--colorPaletteGreenForeground1', '#107c10'),
      token('--colorPaletteBerryForeground1', '#c239b3'),
      token('--colorPaletteMarigoldForeground1', '#c77a00'),
      token('--colorPaletteTealForeground2', '#038387'),
    ],
  };
}

/** A CSS colour with an opacity, for bands drawn over a curve ("#0f6cbd" → "rgba(15, 108, 189, 0.4)"). */
export function withAlpha(colour: string, alpha: number): string {
  const hex = /^#([0-9a-f]{6})$/i.exec(colour.trim());
  if (hex?.[1] !== undefined) {
    const n = Number.parseInt(hex[1], 16);
    return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
  }
  const rgb = /^rgba?\(([^)]+)\)$/i.exec(colour.trim());
  if (rgb?.[1] !== undefined) {
    const [r, g, b] = rgb[1].split(',').map((part) => part.trim());
    return `rgba(${r}, ${g}, ${b}, ${alpha})`;
  }
  return colour;
}

/** A holder for one canvas's chart, so an update destroys the previous one. */
export interface ChartSlot {
  readonly canvas: HTMLCanvasElement;
  chart: Chart | null;
}

/**
 * A chart slot on a new canvas. Cost O(1).
 * @example const slot = chartSlot('prior-chart', 'Prior belief about the rate'); section.append(slot.canvas)
 */
export function chartSlot(id: string, label: string): ChartSlot {
  const canvas = document.createElement('canvas');
  canvas.id = id;
  canvas.setAttribute('role', 'img');
  canvas.setAttribute('aria-label', label);
  canvas.height = 180;
  return { canvas, chart: null };
}

function replace(slot: ChartSlot, config: ChartConfiguration, description: string): void {
  slot.chart?.destroy();
  slot.canvas.setAttribute('aria-label', description);
  slot.canvas.dataset.description = description;
  slot.chart = new Chart(slot.canvas, config);
}

/** A line across the plot at x (vertical) or y (horizontal), with a word on it. */
export interface Marker {
  readonly axis: 'x' | 'y';
  readonly at: number;
  readonly label: string;
  readonly colour: string;
  readonly dash?: readonly number[];
  readonly width?: number;
}

/** A chart.js plugin that draws the markers over the datasets, labels at the top (x) or at the left (y). */
function markerPlugin(markers: readonly Marker[], textColour: string, background: string): Plugin {
  return {
    id: 'liftLedgerMarkers',
    afterDatasetsDraw(chart) {
      const { ctx, chartArea, scales } = chart;
      const xScale = scales.x;
      const yScale = scales.y;
      if (!xScale || !yScale) return;
      ctx.save();
      ctx.font = '11px "Segoe UI", system-ui, sans-serif';
      for (const marker of markers) {
        ctx.strokeStyle = marker.colour;
        ctx.lineWidth = marker.width ?? 1.5;
        ctx.setLineDash([...(marker.dash ?? [])]);
        ctx.beginPath();
        if (marker.axis === 'x') {
          const x = xScale.getPixelForValue(marker.at);
          if (x < chartArea.left - 0.5 || x > chartArea.right + 0.5) continue;
          ctx.moveTo(x, chartArea.top);
          ctx.lineTo(x, chartArea.bottom);
          ctx.stroke();
          const width = ctx.measureText(marker.label).width;
          const right = x + 4 + width <= chartArea.right;
          const left = right ? x + 3 : x - 5 - width;
          ctx.fillStyle = withAlpha(background, 0.85);
          ctx.fillRect(left, chartArea.top + 1, width + 2, 14);
          ctx.fillStyle = textColour;
          ctx.textAlign = 'left';
          ctx.textBaseline = 'top';
          ctx.fillText(marker.label, left + 1, chartArea.top + 2);
        } else {
          const y = yScale.getPixelForValue(marker.at);
          if (y < chartArea.top - 0.5 || y > chartArea.bottom + 0.5) continue;
          ctx.moveTo(chartArea.left, y);
          ctx.lineTo(chartArea.right, y);
          ctx.stroke();
          const width = ctx.measureText(marker.label).width;
          ctx.fillStyle = withAlpha(background, 0.85);
          ctx.fillRect(chartArea.left + 3, y - 15, width + 2, 13);
          ctx.fillStyle = textColour;
          ctx.textAlign = 'left';
          ctx.textBaseline = 'bottom';
          ctx.fillText(marker.label, chartArea.left + 4, y - 2);
        }
      }
      ctx.restore();
    },
  };
}

/** Axis options shared by the charts. */
function axis(
  colours: Colours,
  title: string,
  format: (value: number) => string,
  extra: Record<string, unknown> = {},
): Record<string, unknown> {
  return {
    type: 'linear',
    title: { display: title !== '', text: title, color: colours.text },
    ticks: { color: colours.text, callback: (value: number | string) => format(Number(value)), maxTicksLimit: 6 },
    grid: { color: colours.grid },
    ...extra,
  };
}

/** A y axis for curve heights: no numbers (they are densities a reader cannot use), a plain title. */
function plausibilityAxis(colours: Colours): Record<string, unknown> {
  return {
    type: 'linear',
    beginAtZero: true,
    title: { display: true, text: 'more plausible ↑', color: colours.text },
    ticks: { display: false },
    grid: { color: colours.grid, drawTicks: false },
  };
}

/** "4%" or "4.5%" for an axis tick given in percent units. */
function tickPercent(value: number, locale: NumberLocale): string {
  return formatPercent(Number((value / 100).toPrecision(4)), locale)
    .replace(/([.,]\d*?)0+%$/, '$1%')
    .replace(/[.,]%$/, '%');
}

/**
 * Draw the prior belief about the rate: its curve, its middle 90% shaded, and its mean as a labelled line.
 * Cost O(points).
 * @example drawPriorChart(slot, curve, summary)
 */
export function drawPriorChart(
  slot: ChartSlot,
  curve: Curve,
  summary: PriorSummary,
  locale: NumberLocale = DEFAULT_LOCALE,
): void {
  const colours = themeColours(slot.canvas);
  const points = curve.x.map((x, i) => ({ x: x * 100, y: curve.y[i] ?? 0 }));
  const inRange = points.filter((pt) => pt.x >= summary.low90 * 100 && pt.x <= summary.high90 * 100);
  const range = `${formatPercent(summary.low90, locale)} to ${formatPercent(summary.high90, locale)}`;
  const mean = formatPercent(summary.mean, locale);
  const description = `The prior belief about the conversion rate: mean ${mean}, 90% of the belief between ${range}.`;
  replace(
    slot,
    {
      type: 'line',
      data: {
        datasets: [
          {
            label: `Middle 90%: ${range}`,
            data: inRange,
            borderColor: 'transparent',
            backgroundColor: withAlpha(colours.line, 0.35),
            fill: 'origin',
            pointRadius: 0,
            parsing: false,
          },
          {
            label: 'Prior belief',
            data: points,
            borderColor: colours.line,
            backgroundColor: colours.line,
            pointRadius: 0,
            borderWidth: 2,
            parsing: false,
          },
        ],
      },
      options: {
        animation: false,
        responsive: true,
        maintainAspectRatio: false,
        scales: {
          x: axis(colours, 'conversion rate', (v) => tickPercent(v, locale)),
          y: plausibilityAxis(colours),
        },
        plugins: {
          legend: { labels: { color: colours.text, boxWidth: 12 } },
          tooltip: { enabled: false },
        },
      },
      plugins: [
        markerPlugin(
          [{ axis: 'x', at: summary.mean * 100, label: `mean ${mean}`, colour: colours.accent, dash: [4, 3] }],
          colours.strong,
          colours.background,
        ),
      ],
    } as ChartConfiguration,
    description,
  );
}

/**
 * Draw decision power against visitors per variant, with the target power and the planned size as
 * labelled lines. Cost O(points).
 * @example drawPowerChart(slot, points, 0.8, 29541)
 */
export function drawPowerChart(
  slot: ChartSlot,
  points: readonly PowerPoint[],
  target: number,
  planned: number,
  locale: NumberLocale = DEFAULT_LOCALE,
): void {
  const colours = themeColours(slot.canvas);
  const data = points.map((pt) => ({ x: pt.visitorsPerVariant, y: pt.power * 100 }));
  const description =
    `Decision power against visitors per variant; the plan needs ${formatCount(planned, locale)} ` +
    `visitors per variant for ${formatPercent(target, locale)} power.`;
  replace(
    slot,
    {
      type: 'line',
      data: {
        datasets: [
          {
            label: 'Decision power',
            data,
            borderColor: colours.line,
            backgroundColor: colours.line,
            pointRadius: 3,
            borderWidth: 2,
            parsing: false,
          },
        ],
      },
      options: {
        animation: false,
        responsive: true,
        maintainAspectRatio: false,
        scales: {
          x: axis(colours, 'visitors per variant', (v) => formatCount(v, locale)),
          y: axis(colours, 'decision power', (v) => `${v}%`, { min: 0, max: 100 }),
        },
        plugins: { legend: { display: false } },
      },
      plugins: [
        markerPlugin(
          [
            {
              axis: 'y',
              at: target * 100,
              label: `target ${formatPercent(target, locale)}`,
              colour: colours.accent,
              dash: [4, 3],
            },
            { axis: 'x', at: planned, label: 'planned', colour: colours.text, dash: [2, 3], width: 1 },
          ],
          colours.strong,
          colours.background,
        ),
      ],
    } as ChartConfiguration,
    description,
  );
}

/** One challenger's lift curve: relative lifts (fractions) and the curve's height there. */
export interface LiftSeries {
  readonly name: string;
  readonly lift: readonly number[];
  readonly height: readonly number[];
  /** The middle 90% of its lift (fractions), shaded under the curve. */
  readonly low90: number;
  readonly high90: number;
}

/**
 * Draw each challenger's lift over the control: x in percent with a solid "no lift" line at 0, each
 * challenger's middle 90% shaded. Cost O(points × challengers).
 * @example drawLiftChart(slot, [{ name: 'Orange button', lift, height, low90: -0.02, high90: 0.25 }])
 */
export function drawLiftChart(
  slot: ChartSlot,
  series: readonly LiftSeries[],
  locale: NumberLocale = DEFAULT_LOCALE,
): void {
  const colours = themeColours(slot.canvas);
  const datasets: ChartDataset<'line', { x: number; y: number }[]>[] = [];
  series.forEach((s, i) => {
    const colour = colours.series[i % colours.series.length] ?? colours.line;
    const points = s.lift.map((x, j) => ({ x: x * 100, y: s.height[j] ?? 0 }));
    datasets.push({
      label: `${s.name}: middle 90% ${signedPercent(s.low90, locale)} to ${signedPercent(s.high90, locale)}`,
      data: points.filter((pt) => pt.x >= s.low90 * 100 && pt.x <= s.high90 * 100),
      borderColor: 'transparent',
      backgroundColor: withAlpha(colour, 0.35),
      fill: 'origin',
      pointRadius: 0,
      parsing: false,
    });
    datasets.push({
      label: s.name,
      data: points,
      borderColor: colour,
      backgroundColor: colour,
      pointRadius: 0,
      borderWidth: 2,
      parsing: false,
    });
  });
  const all = series.flatMap((s) => s.lift.map((x) => x * 100));
  const { min, max, step } = niceRange(Math.min(0, ...all), Math.max(0, ...all));
  const description =
    'Lift over the control: ' +
    series
      .map((s) => `${s.name}, 90% between ${signedPercent(s.low90, locale)} and ${signedPercent(s.high90, locale)}`)
      .join('; ') +
    '.';
  replace(
    slot,
    {
      type: 'line',
      data: { datasets },
      options: {
        animation: false,
        responsive: true,
        maintainAspectRatio: false,
        scales: {
          x: axis(
            colours,
            'lift over the control',
            (v) => (v > 0 ? `+${tickPercent(v, locale)}` : tickPercent(v, locale)),
            {
              min,
              max,
              ticks: {
                color: colours.text,
                stepSize: step,
                callback: (v: number | string) =>
                  Number(v) > 0 ? `+${tickPercent(Number(v), locale)}` : tickPercent(Number(v), locale),
              },
            },
          ),
          y: plausibilityAxis(colours),
        },
        plugins: {
          legend: {
            labels: {
              color: colours.text,
              boxWidth: 12,
              filter: (item: { text: string }) => !item.text.includes('middle 90%') || series.length === 1,
            },
          },
          tooltip: { enabled: false },
        },
      },
      plugins: [
        markerPlugin(
          [{ axis: 'x', at: 0, label: 'no lift', colour: colours.strong, width: 2 }],
          colours.strong,
          colours.background,
        ),
      ],
    } as ChartConfiguration,
    description,
  );
}

/**
 * Axis bounds on round steps (1, 2 or 5 × a power of ten) that take in [low, high], about 4–6 steps.
 * Cost O(1).
 * @example niceRange(-15.4, 38.3) //=> { min: -20, max: 40, step: 10 }
 */
export function niceRange(low: number, high: number): { min: number; max: number; step: number } {
  const span = high - low > 0 ? high - low : Math.max(1, Math.abs(high));
  const raw = span / 5;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  return { min: Math.floor(low / step) * step, max: Math.ceil(high / step) * step, step };
}

/** "+12.3%" / "−4.10%" for a lift given as a fraction. */
export function signedPercent(fraction: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  const text = formatPercent(Math.abs(fraction), locale);
  return fraction > 0 ? `+${text}` : fraction < 0 ? `−${text}` : text;
}
