import type { KrylovReport, KrylovSolutionReport } from '../pipeline/krylov.js';

const g = (x: number | null): string => (x === null || !Number.isFinite(x) ? 'n/a' : Math.abs(x) >= 1e-3 && Math.abs(x) < 1e5 ? String(Number(x.toPrecision(6))) : x.toExponential(3));

/** Energy lines of one solution: every energy with its residual and the subspace it came from. */
function energyLines(label: string, sol: KrylovSolutionReport, r: number, threshold: string): string[] {
  return sol.energies.map(
    (e, k) => `${label}E${k} = ${e.toFixed(10)}   residual ${sol.residuals[k]!.toExponential(2)}   subspace ${sol.keptDimension} of ${r} Krylov directions (${threshold}, condition ${g(sol.condition)})`,
  );
}

/** The terminal summary of a `krylov` report. */
export function krylovSummary(r: KrylovReport): string {
  const lines: string[] = [];
  const files = r.input.matrices ?? `${r.input.h}, ${r.input.s}`;
  const errs = r.input.errors.h || r.input.errors.s ? `element errors for ${[r.input.errors.h ? 'H̃' : '', r.input.errors.s ? 'S' : ''].filter(Boolean).join(' and ')}` : 'no element errors';
  lines.push(`bitspan krylov: r = ${r.dimension} Krylov vectors (${files}), ${errs}`);
  const c = r.checks;
  lines.push(`checks: Hermitian within ${g(c.hermiticity.h)} (H̃) and ${g(c.hermiticity.s)} (S); smallest eigenvalue of S ${g(c.minOverlapEigenvalue)} (allowed ≥ −${g(c.psdTolerance)})`);
  const ev = r.overlapEigenvalues;
  lines.push(`S spectrum: ${ev[ev.length - 1]!.toExponential(2)} down to ${ev[0]!.toExponential(2)}; noise floor ${r.noiseFloor.toExponential(2)}`);
  const p = r.plateau;
  if (p) {
    lines.push(`plateau: thresholds ${p.from.toExponential(2)} to ${p.to.toExponential(2)} (${p.points} scan points${p.long ? '' : ', shorter than asked: the longest found'}), E0 within ${g(p.tolerance)}; energy ${g(p.energy)} at ${p.threshold.toExponential(2)}`);
  } else {
    lines.push('plateau: none found above the noise floor');
  }
  const how = r.thresholdSource === 'given' ? 'given' : r.thresholdSource === 'plateau' ? 'from the plateau' : 'at the noise floor (no plateau)';
  const t = `threshold ${r.threshold.toExponential(2)}`;
  lines.push(`threshold ${r.threshold.toExponential(3)} (${r.relativeThreshold.toExponential(2)} × largest eigenvalue of S), ${how}`);
  if (r.threshold < r.noiseFloor) lines.push('note: the threshold is below the noise floor; some kept directions of S cannot be told from noise');
  lines.push(...energyLines('', r, r.dimension, t));
  if (r.bootstrap) {
    const b = r.bootstrap;
    lines.push(`bootstrap (${b.samples} resamples, seed ${b.seed}, ${t}): E0 mean ${g(b.mean)}, std ${g(b.std)}, 95% of resamples in [${g(b.low)}, ${g(b.high)}]${b.empty ? `, ${b.empty} kept nothing` : ''}`);
  }
  lines.push(...energyLines('unregularised ', r.unregularised, r.dimension, 'every positive eigenvalue of S'));
  lines.push(`Krylov dimension scan (leading r′×r′ blocks, ${t}):`);
  lines.push('  r′  kept  E0                  residual');
  for (const d of r.dimensionScan) {
    lines.push(`  ${String(d.dimension).padStart(2)}  ${String(d.keptDimension).padStart(4)}  ${d.energies.length ? d.energies[0]!.toFixed(10).padStart(18) : 'none'.padStart(18)}  ${d.residuals.length ? d.residuals[0]!.toExponential(2) : ''}`);
  }
  return lines.join('\n') + '\n';
}
