import type { Plateau } from '../analysis/plateau.js';
import type { ScanPoint } from '../analysis/thresholdScan.js';
import type { LineChart, LineSeries } from './plotSvg.js';

const short = (x: number): string => (Math.abs(x) >= 1e-3 && Math.abs(x) < 1e5 ? String(Number(x.toPrecision(6))) : x.toExponential(3));

/**
 * The charts of a threshold scan, energies against the absolute threshold (log axis) with the
 * plateau shaded, the chosen threshold marked and the noise floor dashed: an overview whose energy
 * axis spans the points above the noise floor, and a zoom of ±8 plateau tolerances around the
 * chosen energy. Energies outside a panel's range are drawn on its edge as a separate series.
 */
export function thresholdScanChart(scan: ScanPoint[], plateau: Plateau | null, floor: number, eigs: number): LineChart[] {
  const visible = scan.filter((p) => p.threshold >= floor && p.energies.length > 0).flatMap((p) => p.energies.slice(0, eigs));
  const all = scan.flatMap((p) => p.energies.slice(0, eigs));
  const source = visible.length > 0 ? visible : all;
  const panels: LineChart[] = [];
  if (source.length > 0) {
    const lo = Math.min(...source);
    const hi = Math.max(...source);
    const pad = 0.08 * (hi - lo || Math.max(1e-12, Math.abs(lo) * 1e-6));
    panels.push(panel(scan, plateau, floor, eigs, [lo - pad, hi + pad], 'Thresholded Krylov energies against the threshold', [
      plateau
        ? `plateau: E0 = ${short(plateau.energy)} at threshold ${short(plateau.threshold)}, ${plateau.keptDimension} directions of S kept`
        : 'no plateau found above the noise floor',
      'energy axis spans the thresholds above the noise floor',
    ]));
    if (plateau) {
      const half = 8 * plateau.tolerance;
      panels.push(panel(scan, plateau, floor, 1, [plateau.energy - half, plateau.energy + half], 'Zoom on the plateau', [`lowest energy within ±${short(half)} (8 plateau tolerances) of the chosen value`]));
    }
  }
  return panels;
}

function panel(scan: ScanPoint[], plateau: Plateau | null, floor: number, eigs: number, yDomain: [number, number], title: string, subtitle: string[]): LineChart {
  const series: LineSeries[] = [];
  const outside: LineSeries = { name: 'off the axis (drawn on edge)', points: [], unjoined: true };
  for (let k = 0; k < eigs; k++) {
    const points: LineSeries['points'] = [];
    for (const p of scan) {
      if (p.energies.length <= k) continue;
      const y = p.energies[k]!;
      if (y < yDomain[0] || y > yDomain[1]) outside.points.push({ x: p.threshold, y: y < yDomain[0] ? yDomain[0] : yDomain[1] });
      points.push({ x: p.threshold, y });
    }
    series.push({ name: k === 0 ? 'lowest energy E0' : `E${k}`, points });
  }
  if (outside.points.length > 0) series.push(outside);
  const chart: LineChart = {
    title,
    subtitle,
    xTitle: 'threshold on the eigenvalues of S (absolute)',
    yTitle: 'energy',
    xLog: true,
    series,
    yDomain,
    rules: floor > 0 && scan.length > 0 && floor >= scan[0]!.threshold ? [{ x: floor, label: 'noise floor', dashed: true }] : [],
  };
  if (plateau) {
    chart.bands = [{ from: plateau.from, to: plateau.to, label: 'plateau' }];
    chart.markers = [{ x: plateau.threshold, y: plateau.energy, label: `chosen: ${short(plateau.energy)}` }];
  }
  return chart;
}
