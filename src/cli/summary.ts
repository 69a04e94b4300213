import type { SolveReport } from '../pipeline/solve.js';
import type { SampleAccount } from '../sectors/selectSubspace.js';

const num = (x: number): string => (Number.isInteger(x) ? String(x) : x.toPrecision(6));

function droppedText(a: SampleAccount): string {
  const d = a.dropped;
  const parts: string[] = [];
  if (d.weight.configs) parts.push(`weight ${d.weight.configs}`);
  if (d.parity.configs) parts.push(`parity ${d.parity.configs}`);
  if (d.minCount.configs) parts.push(`min-count ${d.minCount.configs}`);
  if (d.maxDim.configs) parts.push(`max-dim ${d.maxDim.configs}`);
  return parts.length ? `dropped: ${parts.join(', ')}` : 'dropped: none';
}

/** Format an energy with its residual and subspace, never one without the others. */
export function energyLine(label: string, energy: number, residual: number, dimension: number, sector: string): string {
  return `${label} = ${energy.toFixed(12)}   residual ${residual.toExponential(2)}   subspace ${dimension} configurations (${sector})`;
}

/** The terminal summary of a `solve` report. */
export function solveSummary(r: SolveReport): string {
  const lines: string[] = [];
  const s = r.samples;
  lines.push(`bitspan solve: ${r.qubits} qubits, Hamiltonian ${r.hamiltonian.file} (${r.hamiltonian.terms} terms)`);
  lines.push(`samples: ${s.groups.length} dump(s), ${num(s.shots)} shots, ${s.distinct} distinct, ${s.kept} kept (${num(s.keptShots)} shots), ${droppedText(s)}`);
  for (const g of s.groups) {
    lines.push(`  ${g.file}: ${num(g.shots)} shots, ${g.distinct} distinct, ${g.kept} kept (${g.newKept} new), ${droppedText(g)}`);
  }
  lines.push(`sector: ${r.sector.description}${r.sector.minCount !== null ? `, min-count ${r.sector.minCount}` : ''}${r.sector.maxDim !== null ? `, max-dim ${r.sector.maxDim}` : ''}`);
  if (r.integrals) {
    const i = r.integrals;
    lines.push(`integrals: ${i.orbitals} orbitals, ${i.electrons[0]} spin-up + ${i.electrons[1]} spin-down electrons, core energy ${i.core}, determinant Hamiltonian ${i.storage === 'csr' ? 'stored' : 'applied matrix-free'}`);
  }
  if (r.productSpace) {
    const p = r.productSpace;
    lines.push(`product space: ${p.alphaStrings} spin-up × ${p.betaStrings} spin-down strings${p.symmetric ? ' (union of both spins)' : ''} = ${p.dimension} determinants, from ${p.sampledDimension} sampled`);
  }
  if (r.repair) {
    const rp = r.repair;
    lines.push(`repair: ${num(rp.offSector.shots)} off-sector shots (${rp.offSector.configs} distinct), ${num(rp.unrecoverable.shots)} unrecoverable; occupations from ${rp.occupationsFrom}; ${rp.converged ? 'energy settled' : 'round limit reached'}; reporting round ${rp.chosenRound}`);
    rp.rounds.forEach((round, k) => {
      lines.push(`  round ${k + 1}: recovered ${num(round.recovered)} shots (${round.recoveredConfigs} distinct, ${round.newConfigs} new configurations)`);
      lines.push(`  ${energyLine(`E0[round ${k + 1}]`, round.energy, round.residual, round.dimension, r.sector.description)}`);
    });
  }
  lines.push(`projected Hamiltonian: dimension ${r.dimension}, ${r.nonzeros} nonzeros, ${r.complex ? 'complex Hermitian' : 'real symmetric'}`);
  r.energies.forEach((e, i) => lines.push(energyLine(`E${i}`, e, r.residuals[i]!, r.dimension, r.sector.description)));
  lines.push(`Lanczos: ${r.iterations} iterations, ${r.matvecs} matrix-vector products, ${r.converged ? 'converged' : 'NOT converged'} (tol ${r.tolerance})`);
  if (r.groundState.top.length) {
    lines.push('ground state, most probable configurations:');
    for (const t of r.groundState.top) lines.push(`  ${t.bitstring}  ${t.probability.toFixed(6)}`);
  }
  const tm = Object.entries(r.timings).map(([k, v]) => `${k} ${v.toFixed(3)}s`).join(', ');
  lines.push(`timings: ${tm}`);
  return lines.join('\n') + '\n';
}
