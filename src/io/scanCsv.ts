import type { ScanPoint } from '../analysis/thresholdScan.js';

/**
 * A threshold scan as CSV: one row per threshold with `threshold`, `relative_threshold`,
 * `kept_dimension`, `condition`, `energy_error`, then `energy_k` and `residual_k` for k < eigs.
 * Numbers in shortest round-trip form; a missing value is an empty field.
 */
export function scanCsv(scan: ScanPoint[], eigs: number): string {
  const cols = ['threshold', 'relative_threshold', 'kept_dimension', 'condition', 'energy_error'];
  for (let k = 0; k < eigs; k++) cols.push(`energy_${k}`);
  for (let k = 0; k < eigs; k++) cols.push(`residual_${k}`);
  const num = (x: number | null | undefined): string => (x === null || x === undefined || !Number.isFinite(x) ? '' : String(x));
  const lines = [cols.join(',')];
  for (const p of scan) {
    const row = [num(p.threshold), num(p.relativeThreshold), String(p.keptDimension), num(p.condition), num(p.energyError)];
    for (let k = 0; k < eigs; k++) row.push(num(p.energies[k]));
    for (let k = 0; k < eigs; k++) row.push(num(p.residuals[k]));
    lines.push(row.join(','));
  }
  return lines.join('\n') + '\n';
}
