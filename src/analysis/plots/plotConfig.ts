/** Shared look of every bitspan plot (vega-lite config): one font, readable sizes, white background. */
export const PLOT_CONFIG = {
  font: 'DejaVu Sans',
  background: 'white',
  padding: 12,
  axis: { labelFontSize: 11, titleFontSize: 13, grid: true },
  legend: { labelFontSize: 11, titleFontSize: 12, orient: 'bottom' as const, direction: 'vertical' as const, labelLimit: 420 },
  title: { fontSize: 15, anchor: 'start' as const },
  view: { stroke: '#888' },
};

/** The top of every bitspan plot spec: schema, title, size and the shared look. */
export function plotFrame(title: string, width = 560, height = 340): { $schema: string; title: string; width: number; height: number; config: typeof PLOT_CONFIG } {
  return { $schema: 'https://vega.github.io/schema/vega-lite/v6.json', title, width, height, config: PLOT_CONFIG };
}

/** Round for plot data: 12 significant digits keep the SVG deterministic and small. */
export function plotNumber(x: number): number {
  return Number(x.toPrecision(12));
}

/** A continuous x scale for subspace dimensions: logarithmic when they span more than a decade. */
export function dimensionScale(dimension: number[]): Record<string, unknown> {
  const spread = Math.max(...dimension) / Math.max(1, Math.min(...dimension));
  return spread > 10 ? { type: 'log', nice: false, padding: 16 } : { zero: false, padding: 16 };
}
