import type { SweepReport } from '../pipeline/sweep.js';
import { timingsText } from './summary.js';

const sci = (x: number | undefined): string => (x === undefined ? '-' : x.toExponential(3));

/** The terminal summary of a sweep: one line per point, then the extrapolation and files. */
export function sweepSummary(r: SweepReport, written: string[]): string {
  const lines: string[] = [];
  const sector = r.points[0]?.sector.description ?? 'none';
  lines.push(`bitspan sweep: ${r.qubits} qubits, axis ${r.axis}${r.subsample ? ` (${r.subsample} shots)` : ''}, ${r.points.length} point(s), sector ${sector}`);
  lines.push(`${'value'.padStart(10)} ${'dimension'.padStart(10)} ${'E0'.padStart(20)} ${'residual'.padStart(10)} ${'variance'.padStart(10)} ${'PT2'.padStart(11)} ${'E0 + PT2'.padStart(20)}`);
  for (const p of r.points) {
    lines.push(
      `${String(p.value).padStart(10)} ${String(p.dimension).padStart(10)} ${p.energies[0]!.toFixed(12).padStart(20)} ${p.residuals[0]!.toExponential(2).padStart(10)} ${sci(p.variance).padStart(10)} ${sci(p.pt2).padStart(11)} ${(p.estimate ? p.estimate.energyPt2.toFixed(12) : '-').padStart(20)}`,
    );
  }
  for (const s of r.skipped) lines.push(`  skipped ${s.value}: ${s.reason}`);
  if (r.best) lines.push(`best variational E0 = ${r.best.energy.toFixed(12)}   residual ${r.best.residual.toExponential(2)}   subspace ${r.best.dimension} configurations (${sector}) at ${r.axis} ${r.best.value}`);
  for (const fit of [r.extrapolations.variance, r.extrapolations.pt2]) {
    const chosen = fit.against === r.extrapolation.against ? ' (reported)' : '';
    if (fit.energy === null) lines.push(`extrapolation against ${fit.against}${chosen}: needs two points with distinct ${fit.against}`);
    else lines.push(`extrapolation against ${fit.against}${chosen}: E = ${fit.energy.toFixed(12)} ± ${fit.uncertainty!.toExponential(2)} from ${fit.points} points (slope ${fit.slope!.toPrecision(6)})${fit.error ? `, error ${sci(fit.error.absolute)}` : ''}`);
  }
  if (r.reference) lines.push(`reference ${r.reference.energy.toFixed(12)} (${r.reference.source === 'exact' ? `exact, whole sector of ${r.reference.dimension} configurations` : 'given'})`);
  const gt = r.sampling.total;
  lines.push(`samples: ${gt.shots} shots, ${gt.distinct} distinct, Good–Turing unseen mass ${gt.goodTuring.toFixed(4)}`);
  if (written.length) lines.push(`wrote: ${written.join(', ')}`);
  lines.push(`timings: ${timingsText(r.timings)}`);
  return lines.join('\n') + '\n';
}
