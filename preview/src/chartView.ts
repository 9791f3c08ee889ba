/**
 * Draws the preview's charts (added by the side panel through `charts.add`) as simple SVG line charts over
 * the grid: the first column of the source range is x, each further column one series (seriesBy Columns);
 * a text first row names the series; points with markers for XYScatterLines; the axis titles when set, and a
 * zero line where x = 0 lies inside the range (as Excel's vertical axis crosses there). Charts are redrawn
 * from the live cells on every recalculation.
 */
import type { PreviewChart, PreviewWorkbook } from './previewWorkbook';

const SVG = 'http://www.w3.org/2000/svg';
const SERIES_COLOURS = ['#2f6f4f', '#c8641e', '#3b5fa8', '#8a3f8f', '#9a8a1a', '#4c8c8c'];

function svg<K extends keyof SVGElementTagNameMap>(
  name: K,
  attributes: Record<string, string | number>,
): SVGElementTagNameMap[K] {
  const element = document.createElementNS(SVG, name);
  for (const [key, value] of Object.entries(attributes)) element.setAttribute(key, String(value));
  return element;
}

/**
 * The chart's series from a block of cell values (seriesBy Columns): the first column is x, each further
 * column one series; a text first row names the series. Non-numeric points are left out. Cost O(cells).
 * @example chartSeries([['x', 'A'], [0, 1], [1, 2]]); //=> { names: ['A'], points: [[[0, 1], [1, 2]]] }
 */
export function chartSeries(values: (number | string | boolean)[][]): {
  names: string[];
  points: [number, number][][];
} {
  const first = values[0] ?? [];
  const hasHeader = first.slice(1).some((v) => typeof v === 'string' && v !== '');
  const body = hasHeader ? values.slice(1) : values;
  const count = Math.max(0, first.length - 1);
  const names = Array.from(
    { length: count },
    (_, i) => (hasHeader ? String(first[i + 1] ?? '') : '') || `Series ${i + 1}`,
  );
  const points = names.map((_, i) =>
    body
      .map((row) => [row[0], row[i + 1]] as const)
      .filter((p): p is readonly [number, number] => typeof p[0] === 'number' && typeof p[1] === 'number')
      .map((p) => [p[0], p[1]] as [number, number]),
  );
  return { names, points };
}

/**
 * Renders one chart into an absolutely positioned box (`left/top/width/height` in px): an SVG line per
 * series, axis end labels, the title as caption and a legend. Cost: O(points). Never throws; an empty
 * source draws an empty frame with its title.
 * @example renderChart(book, chart, { left: 0, top: 0, width: 480, height: 280 }).tagName; //=> 'FIGURE'
 */
export function renderChart(
  book: PreviewWorkbook,
  chart: PreviewChart,
  box: { left: number; top: number; width: number; height: number },
): HTMLElement {
  const frame = document.createElement('figure');
  frame.className = 'chart';
  frame.dataset.chartName = chart.name;
  Object.assign(frame.style, {
    left: `${box.left}px`,
    top: `${box.top}px`,
    width: `${box.width}px`,
    height: `${box.height}px`,
  });
  const caption = document.createElement('figcaption');
  caption.textContent = chart.title || chart.name;
  frame.append(caption);

  const width = Math.max(120, box.width - 16);
  const height = Math.max(80, box.height - 56);
  const plot = svg('svg', {
    width,
    height,
    viewBox: `0 0 ${width} ${height}`,
    role: 'img',
    'aria-label': chart.title || chart.name,
  });
  const { names, points } = chartSeries(book.values(chart.source));
  const all = points.flat();
  const titles = chart.axisTitles ?? { x: '', y: '' };
  const pad = { left: titles.y ? 58 : 44, right: 8, top: 8, bottom: titles.x ? 38 : 22 };
  if (all.length > 0) {
    const xs = all.map((p) => p[0]);
    const ys = all.map((p) => p[1]);
    const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
    const [y0, y1] = [Math.min(0, ...ys), Math.max(...ys)];
    const sx = (x: number) => pad.left + ((x - x0) / (x1 - x0 || 1)) * (width - pad.left - pad.right);
    const sy = (y: number) => height - pad.bottom - ((y - y0) / (y1 - y0 || 1)) * (height - pad.top - pad.bottom);
    plot.append(
      svg('line', {
        x1: pad.left,
        y1: height - pad.bottom,
        x2: width - pad.right,
        y2: height - pad.bottom,
        class: 'axis',
      }),
    );
    plot.append(svg('line', { x1: pad.left, y1: pad.top, x2: pad.left, y2: height - pad.bottom, class: 'axis' }));
    const label = (x: number, y: number, text: string, anchor: string) => {
      const t = svg('text', { x, y, 'text-anchor': anchor, class: 'tick' });
      t.textContent = text;
      plot.append(t);
    };
    const short = (v: number) => String(Number(v.toPrecision(3)));
    label(pad.left, height - pad.bottom + 14, short(x0), 'start');
    label(width - pad.right, height - pad.bottom + 14, short(x1), 'end');
    if (!chart.valueLabelsHidden) {
      label(pad.left - 4, pad.top + 8, short(y1), 'end');
      label(pad.left - 4, height - pad.bottom, short(y0), 'end');
    }
    // The zero line: Excel's vertical axis crosses a scatter chart's x axis at 0 when 0 is in range.
    if (x0 < 0 && x1 > 0) {
      plot.append(svg('line', { x1: sx(0), y1: pad.top, x2: sx(0), y2: height - pad.bottom, class: 'axis zero-line' }));
    }
    if (titles.x) {
      const t = svg('text', { x: (pad.left + width - pad.right) / 2, y: height - 4, 'text-anchor': 'middle' });
      t.setAttribute('class', 'axis-title');
      t.textContent = titles.x;
      plot.append(t);
    }
    if (titles.y) {
      const middle = (pad.top + height - pad.bottom) / 2;
      const t = svg('text', { x: 12, y: middle, 'text-anchor': 'middle', transform: `rotate(-90 12 ${middle})` });
      t.setAttribute('class', 'axis-title');
      t.textContent = titles.y;
      plot.append(t);
    }
    points.forEach((series, i) => {
      if (series.length === 0) return;
      const colour = SERIES_COLOURS[i % SERIES_COLOURS.length] ?? '#333';
      const d = series.map((p, j) => `${j === 0 ? 'M' : 'L'}${sx(p[0]).toFixed(1)},${sy(p[1]).toFixed(1)}`).join(' ');
      plot.append(svg('path', { d, fill: 'none', stroke: colour, 'stroke-width': 2 }));
      if (chart.type === 'XYScatterLines') {
        for (const p of series) plot.append(svg('circle', { cx: sx(p[0]), cy: sy(p[1]), r: 3, fill: colour }));
      }
    });
  }
  frame.append(plot);
  const legend = document.createElement('div');
  legend.className = 'legend';
  names.forEach((name, i) => {
    const item = document.createElement('span');
    item.style.setProperty('--swatch', SERIES_COLOURS[i % SERIES_COLOURS.length] ?? '#333');
    item.textContent = name;
    legend.append(item);
  });
  frame.append(legend);
  return frame;
}
