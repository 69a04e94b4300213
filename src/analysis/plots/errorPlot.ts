import type { TopLevelSpec } from 'vega-lite';
import { dimensionScale, plotFrame, plotNumber } from './plotConfig.js';

/** Inputs of the error plot: per point dimension, energy, variance and PT2; a reference if known. */
export interface ErrorPlotData {
  title: string;
  dimension: number[];
  energy: number[];
  variance: number[];
  pt2: number[];
  reference?: number | null;
}

/**
 * Errors and error estimates on a log scale against subspace dimension: with a reference,
 * |E − E_ref| and |E + PT2 − E_ref| beside σ = √variance; without one, σ² and |PT2|.
 * Non-positive values cannot sit on a log axis and are left out.
 */
export function errorPlot(d: ErrorPlotData): TopLevelSpec {
  const rows: Array<Record<string, number | string>> = [];
  const push = (dim: number, v: number, series: string): void => {
    if (v > 0 && Number.isFinite(v)) rows.push({ dimension: dim, value: plotNumber(v), series });
  };
  d.dimension.forEach((dim, i) => {
    if (d.reference !== undefined && d.reference !== null) {
      push(dim, Math.abs(d.energy[i]! - d.reference), '|E0 − reference|');
      push(dim, Math.abs(d.energy[i]! + d.pt2[i]! - d.reference), '|E0 + PT2 − reference|');
      push(dim, Math.sqrt(Math.max(0, d.variance[i]!)), 'σ = √variance');
    } else {
      push(dim, d.variance[i]!, 'variance σ²');
      push(dim, Math.abs(d.pt2[i]!), '|PT2|');
    }
  });
  return {
    ...plotFrame(d.title),
    data: { values: rows },
    mark: { type: 'line', point: true },
    encoding: {
      x: { field: 'dimension', type: 'quantitative', title: 'subspace dimension (configurations)', scale: dimensionScale(d.dimension) },
      y: { field: 'value', type: 'quantitative', title: d.reference !== undefined && d.reference !== null ? 'energy error (log scale)' : 'error estimate (log scale)', scale: { type: 'log' } },
      color: { field: 'series', type: 'nominal', title: null },
    },
  } as TopLevelSpec;
}
