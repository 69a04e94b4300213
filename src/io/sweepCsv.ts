import type { SweepReport } from '../pipeline/sweep.js';

/**
 * One CSV row per sweep point: the axis value, subspace, energies with residuals, estimates,
 * bounds, errors and stage timings. Numbers are written at full double precision (shortest
 * round-trip form); an absent value is an empty cell.
 */
export function formatSweepCsv(r: SweepReport): string {
  const k = Math.max(1, ...r.points.map((p) => p.energies.length));
  const head = ['axis', 'value', 'dimension', 'nonzeros', 'shots', 'kept_shots', 'kept_configurations'];
  for (let i = 0; i < k; i++) head.push(`energy_${i}`, `residual_${i}`);
  head.push('converged', 'variance', 'sigma', 'pt2', 'energy_pt2', 'weinstein_lo', 'weinstein_hi', 'kato_temple_lo', 'error_abs', 'error_rel', 'error_pt2_abs', 'seconds_build', 'seconds_solve', 'seconds_estimate');
  const cell = (x: number | undefined | null): string => (x === undefined || x === null ? '' : String(x));
  const rows = [head.join(',')];
  for (const p of r.points) {
    const row = [r.axis, cell(p.value), cell(p.dimension), cell(p.nonzeros), cell(p.samples.shots), cell(p.samples.keptShots), cell(p.samples.kept)];
    for (let i = 0; i < k; i++) row.push(cell(p.energies[i]), cell(p.residuals[i]));
    row.push(
      String(p.converged),
      cell(p.variance),
      cell(p.estimate?.sigma),
      cell(p.pt2),
      cell(p.estimate?.energyPt2),
      cell(p.bounds?.weinstein[0]),
      cell(p.bounds?.weinstein[1]),
      cell(p.bounds?.katoTemple?.[0]),
      cell(p.error?.absolute),
      cell(p.error?.relative),
      cell(p.error?.pt2Corrected?.absolute),
      cell(p.timings.build),
      cell(p.timings.solve),
      cell(p.timings.estimate),
    );
    rows.push(row.join(','));
  }
  return rows.join('\n') + '\n';
}
