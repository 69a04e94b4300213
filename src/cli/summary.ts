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
  lines.push(`projected Hamiltonian: dimension ${r.dimension}, ${r.storage === 'stored' ? '' : '~'}${r.nonzeros} nonzeros, ${r.complex ? 'complex Hermitian' : 'real symmetric'}, ${r.storage} (${r.memory.reason})`);
  r.energies.forEach((e, i) => lines.push(energyLine(`E${i}`, e, r.residuals[i]!, r.dimension, r.sector.description)));
  lines.push(`Lanczos: ${r.iterations} iterations, ${r.matvecs} matrix-vector products, ${r.converged ? 'converged' : 'NOT converged'} (tol ${r.tolerance})`);
  if (r.groundState.top.length) {
    lines.push('ground state, most probable configurations:');
    for (const t of r.groundState.top) lines.push(`  ${t.bitstring}  ${t.probability.toFixed(6)}`);
  }
  lines.push(...analysisLines(r));
  const tm = timingsText(r.timings);
  lines.push(`timings: ${tm}`);
  return lines.join('\n') + '\n';
}

const sci = (x: number): string => x.toExponential(3);

/** Summary lines of the analysis keys a report carries (estimates, bounds, errors, observables...). */
export function analysisLines(r: SolveReport): string[] {
  const lines: string[] = [];
  const where = `residual ${r.residuals[0]!.toExponential(2)}, subspace ${r.dimension} configurations (${r.sector.description})`;
  if (r.expansion) {
    const e = r.expansion;
    lines.push(`expansion (${e.mode}${e.threshold !== null ? `, threshold ${e.threshold}` : ''}${e.max !== null ? `, max ${e.max}` : ''}): sampled ${e.sampledDimension} configurations`);
    for (const st of e.steps) lines.push(`  step ${st.step}: ${st.candidates} connected, ${st.added} added, dimension ${st.dimension}`);
  }
  if (r.startState) lines.push(`start vector: ${r.startState.used ? 'saved state' : 'random (saved state has no weight in this subspace)'} ${r.startState.file} (${r.startState.matched} of ${r.startState.configurations} configurations in the subspace)`);
  if (r.variance !== undefined && r.estimate && r.bounds) {
    const b = r.bounds;
    lines.push(`energy variance σ² = ${sci(r.variance)} (σ = ${sci(r.estimate.sigma)}; inside the subspace ${sci(r.estimate.internalVariance)}, from ${r.estimate.external} external configurations ${sci(r.estimate.externalWeight)})`);
    lines.push(`PT2 (Epstein–Nesbet) = ${sci(r.pt2!)}   E0 + PT2 = ${r.estimate.energyPt2.toFixed(12)}   (${where})`);
    if (r.estimate.singular > 0) lines.push(`  ${r.estimate.singular} external configurations with E0 = H_aa left out of PT2`);
    if (r.estimate.outsideSector > 0) lines.push(`  note: ${sci(r.estimate.outsideSector)} of the variance lies outside the sector (the Hamiltonian does not conserve it)`);
    lines.push(`bounds on the ground energy: upper ${b.upper.toFixed(12)}; Weinstein (an eigenvalue lies in) [${b.weinstein[0].toFixed(12)}, ${b.weinstein[1].toFixed(12)}]`);
    if (b.katoTemple) {
      const how = b.betaFrom === 'gap' ? `from --gap, β = ${b.beta!.toFixed(9)}; certified if E0 lies within half the gap of the ground energy` : `ESTIMATE: β = second Ritz value ${b.beta!.toFixed(9)}, not a proven bound on E1`;
      lines.push(`  Kato–Temple [${b.katoTemple[0].toFixed(12)}, ${b.katoTemple[1].toFixed(12)}] (${how})`);
    } else if (b.katoTempleNote) lines.push(`  Kato–Temple: ${b.katoTempleNote}`);
  }
  if (r.reference && r.error) {
    const ref = r.reference;
    lines.push(`reference ${ref.energy.toFixed(12)} (${ref.source === 'exact' ? `exact, whole sector of ${ref.dimension} configurations` : 'given'}): E0 error ${sci(r.error.absolute)} (relative ${sci(r.error.relative)})${r.error.pt2Corrected ? `, E0 + PT2 error ${sci(r.error.pt2Corrected.absolute)}` : ''}`);
  }
  if (r.observables) {
    const o = r.observables;
    const zs = o.z.map((z) => z.toFixed(3));
    lines.push(`<Z> per qubit (0..${o.z.length - 1}): ${zs.length > 32 ? zs.slice(0, 32).join(' ') + ' ...' : zs.join(' ')}`);
    for (const p of o.pauli ?? []) lines.push(`  <${p.coeff} ${p.ops || 'I'}> = ${p.value.toFixed(10)}${p.diagonal ? '' : '  (off-diagonal)'}`);
    lines.push(`  caveat: ${o.caveat}`);
  }
  if (r.sampling) {
    lines.push('sampling per dump: shots, distinct, duplicate rate, Good–Turing unseen mass, new configurations (new weight)');
    for (const g of r.sampling.groups) {
      lines.push(`  ${g.file}: ${num(g.shots)}, ${g.distinct}, ${g.duplicateRate.toFixed(4)}, ${g.goodTuring.toFixed(4)}, ${g.newConfigs} (${(100 * g.newWeightFraction).toFixed(1)}%)`);
    }
    const t = r.sampling.total;
    lines.push(`  all dumps: ${num(t.shots)} shots, ${t.distinct} distinct, Good–Turing unseen mass ${t.goodTuring.toFixed(4)}`);
  }
  if (r.batches) {
    const b = r.batches;
    lines.push(
      `batches: ${b.count} subspaces of ${Math.min(...b.dimensions)}–${Math.max(...b.dimensions)} configurations (seed ${b.seed}): E0 mean ${b.mean.toFixed(10)}, spread σ ${sci(b.std)}, range [${b.min.toFixed(10)}, ${b.max.toFixed(10)}], residuals ≤ ${Math.max(...b.residuals).toExponential(2)}`,
    );
  }
  return lines;
}

/** `read 0.120s, …, peak memory 364 MiB`: times in seconds, the process peak in MiB. */
export function timingsText(timings: Record<string, number>): string {
  return Object.entries(timings)
    .map(([k, v]) => (k === 'peakRSSMB' ? `peak memory ${v.toFixed(0)} MiB` : `${k} ${v.toFixed(3)}s`))
    .join(', ');
}
