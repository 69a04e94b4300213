import type { TopLevelSpec } from 'vega-lite';
import { dimensionScale, plotFrame, plotNumber } from './plotConfig.js';

/** Inputs of the energy-versus-dimension plot. */
export interface EnergyPlotData {
  title: string;
  dimension: number[];
  energy: number[];
  /** E + PT2 per point (optional series). */
  energyPt2?: number[];
  extrapolation?: { energy: number; uncertainty: number; against: string } | null;
  reference?: number | null;
}

/**
 * Lowest energy against subspace dimension (log axis when the dimensions span more than a decade),
 * with E + PT2, the extrapolated energy (dashed, ± its uncertainty as a band) and the reference.
 */
export function energyPlot(d: EnergyPlotData): TopLevelSpec {
  const rows: Array<Record<string, number | string>> = [];
  d.dimension.forEach((dim, i) => {
    rows.push({ dimension: dim, energy: plotNumber(d.energy[i]!), series: 'variational E0' });
    if (d.energyPt2) rows.push({ dimension: dim, energy: plotNumber(d.energyPt2[i]!), series: 'E0 + PT2' });
  });
  const extrapolated: Array<Record<string, number | string>> = [];
  const against = d.extrapolation ? `extrapolated (vs ${d.extrapolation.against})` : '';
  if (d.extrapolation) {
    const { energy, uncertainty } = d.extrapolation;
    extrapolated.push({ energy: plotNumber(energy), lo: plotNumber(energy - uncertainty), hi: plotNumber(energy + uncertainty), series: against });
  }
  const hasReference = d.reference !== undefined && d.reference !== null;
  const domain = ['variational E0', ...(d.energyPt2 ? ['E0 + PT2'] : []), ...(d.extrapolation ? [against] : []), ...(hasReference ? ['reference'] : [])];
  const palette: Record<string, string> = { 'variational E0': '#1f77b4', 'E0 + PT2': '#ff7f0e', reference: '#d62728' };
  const color = { field: 'series', type: 'nominal' as const, title: null, scale: { domain, range: domain.map((k) => palette[k] ?? '#2ca02c') } };
  const layers: unknown[] = [
    {
      data: { values: rows },
      mark: { type: 'line', point: true },
      encoding: {
        x: { field: 'dimension', type: 'quantitative', title: 'subspace dimension (configurations)', scale: dimensionScale(d.dimension) },
        y: { field: 'energy', type: 'quantitative', title: 'energy', scale: { zero: false } },
        color,
      },
    },
  ];
  if (extrapolated.length) {
    layers.push({ data: { values: extrapolated }, mark: { type: 'rect', opacity: 0.15 }, encoding: { y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' }, color } });
    layers.push({ data: { values: extrapolated }, mark: { type: 'rule', strokeDash: [6, 4], strokeWidth: 1.5 }, encoding: { y: { field: 'energy', type: 'quantitative' }, color } });
  }
  if (hasReference) {
    layers.push({ data: { values: [{ energy: plotNumber(d.reference!), series: 'reference' }] }, mark: { type: 'rule', strokeWidth: 1.5 }, encoding: { y: { field: 'energy', type: 'quantitative' }, color } });
  }
  return {
    ...plotFrame(d.title),
    layer: layers,
  } as TopLevelSpec;
}
