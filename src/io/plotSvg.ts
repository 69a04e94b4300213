import type { TopLevelSpec } from 'vega-lite';
import { renderSvg } from './plotRender.js';

/** One named line of a chart. */
export interface LineSeries {
  name: string;
  points: Array<{ x: number; y: number }>;
  /** Draw the points without joining them. */
  unjoined?: boolean;
}

/** A line chart: series, axis titles and optional highlights, all in data coordinates. */
export interface LineChart {
  title?: string;
  /** Lines under the title. */
  subtitle?: string[];
  xTitle: string;
  yTitle: string;
  xLog?: boolean;
  series: LineSeries[];
  /** Visible y range; points outside are clipped. */
  yDomain?: [number, number];
  /** Shaded x intervals. */
  bands?: Array<{ from: number; to: number; label: string }>;
  /** Vertical lines. */
  rules?: Array<{ x: number; label: string; dashed?: boolean }>;
  /** Single labelled points. */
  markers?: Array<{ x: number; y: number; label: string }>;
  width?: number;
  height?: number;
}

/** Significant digits of the data written into a chart, so the SVG is deterministic and diffable. */
const DIGITS = 10;
const round = (v: number): number => Number(v.toPrecision(DIGITS));

/**
 * Render one line chart, or several stacked top to bottom, to a standalone SVG string with
 * vega-lite (compile) and vega (headless view); non-finite points are dropped.
 */
export async function lineChartSvg(charts: LineChart | LineChart[]): Promise<string> {
  const panels = (Array.isArray(charts) ? charts : [charts]).map(panelSpec);
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    background: 'white',
    config: {
      font: 'DejaVu Sans, Arial, sans-serif',
      axis: { labelFontSize: 11, titleFontSize: 13 },
      legend: { labelFontSize: 11, orient: 'bottom', labelLimit: 400 },
      title: { anchor: 'start', fontSize: 14, subtitleFontSize: 11 },
    },
    ...(panels.length === 1 ? panels[0] : { vconcat: panels, spacing: 30 }),
  } as unknown as TopLevelSpec;
  return renderSvg(spec);
}

function panelSpec(chart: LineChart): object {
  const xScale = { type: chart.xLog ? ('log' as const) : ('linear' as const) };
  const yScale = chart.yDomain ? { domain: chart.yDomain.map(round), zero: false } : { zero: false };
  const valuesOf = (list: LineSeries[]): object[] =>
    list.flatMap((s) => s.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y) && (!chart.xLog || p.x > 0)).map((p) => ({ series: s.name, x: round(p.x), y: round(p.y) })));
  // Both layers share one colour scale, so joined and unjoined series get distinct legend entries.
  const colour = { field: 'series', type: 'nominal', title: null, sort: chart.series.map((s) => s.name), legend: { labelLimit: 320 } };
  const layers: object[] = [];
  for (const b of chart.bands ?? []) {
    layers.push({
      data: { values: [{ from: round(b.from), to: round(b.to), label: b.label }] },
      mark: { type: 'rect', opacity: 0.18, color: '#2a9d8f' },
      encoding: { x: { field: 'from', type: 'quantitative', scale: xScale }, x2: { field: 'to' }, tooltip: { field: 'label' } },
    });
    layers.push({
      data: { values: [{ at: round(Math.sqrt(b.from * b.to)), label: b.label }] },
      mark: { type: 'text', baseline: 'top', dy: 4, fontSize: 11, color: '#1d6f65' },
      encoding: { x: { field: 'at', type: 'quantitative', scale: xScale }, y: { value: 0 }, text: { field: 'label' } },
    });
  }
  for (const r of chart.rules ?? []) {
    layers.push({
      data: { values: [{ x: round(r.x), label: r.label }] },
      mark: { type: 'rule', color: '#555', strokeDash: r.dashed ? [5, 4] : [], strokeWidth: 1.2 },
      encoding: { x: { field: 'x', type: 'quantitative', scale: xScale } },
    });
    layers.push({
      data: { values: [{ x: round(r.x), label: r.label }] },
      mark: { type: 'text', angle: 270, align: 'right', baseline: 'bottom', dx: -4, dy: -3, fontSize: 10, color: '#444' },
      encoding: { x: { field: 'x', type: 'quantitative', scale: xScale }, y: { value: 0 }, text: { field: 'label' } },
    });
  }
  const encoding = {
    x: { field: 'x', type: 'quantitative', scale: xScale, title: chart.xTitle, axis: { format: chart.xLog ? '.0e' : '~g' } },
    y: { field: 'y', type: 'quantitative', scale: yScale, title: chart.yTitle },
    color: colour,
  };
  layers.push({ data: { values: valuesOf(chart.series.filter((s) => !s.unjoined)) }, mark: { type: 'line', point: { size: 18 }, clip: true, strokeWidth: 1.5 }, encoding });
  const unjoined = chart.series.filter((s) => s.unjoined);
  if (unjoined.length > 0) layers.push({ data: { values: valuesOf(unjoined) }, mark: { type: 'point', shape: 'triangle-down', size: 30, filled: true, clip: true }, encoding });
  for (const m of chart.markers ?? []) {
    layers.push({
      data: { values: [{ x: round(m.x), y: round(m.y), label: m.label }] },
      mark: { type: 'point', shape: 'diamond', size: 120, filled: true, color: '#e76f51', clip: true },
      encoding: { x: { field: 'x', type: 'quantitative', scale: xScale }, y: { field: 'y', type: 'quantitative', scale: yScale } },
    });
    layers.push({
      data: { values: [{ x: round(m.x), y: round(m.y), label: m.label }] },
      mark: { type: 'text', align: 'left', dx: 8, dy: -8, fontSize: 11, color: '#b5462b' },
      encoding: { x: { field: 'x', type: 'quantitative', scale: xScale }, y: { field: 'y', type: 'quantitative', scale: yScale }, text: { field: 'label' } },
    });
  }
  return {
    width: chart.width ?? 640,
    height: chart.height ?? 300,
    ...(chart.title ? { title: { text: chart.title, subtitle: chart.subtitle ?? [] } } : {}),
    layer: layers,
  };
}
