import type { Command } from 'commander';
import { BitspanError } from '../errors.js';
import type { ExpandOptions } from '../pipeline/expand.js';
import type { PointEstimates } from '../pipeline/sweep.js';
import { nonNegativeInt, positiveInt, positiveNumber, realNumber } from './parse.js';

/** Flags for expansion by steps of H (solve, and sweep's expand axis). */
export function addExpandOptions(cmd: Command, withSteps: boolean): Command {
  if (withSteps) cmd.option('--expand <n>', 'add the configurations H connects to the subspace, N times (within the sector)', nonNegativeInt('--expand'));
  return cmd
    .option('--expand-threshold <t>', 'expand only by configurations with first-order amplitude |<a|H|psi>/(E - H_aa)| >= T', positiveNumber('--expand-threshold'))
    .option('--expand-max <m>', 'expand by at most M configurations per step, the largest first-order amplitudes first', positiveInt('--expand-max'));
}

/** Flags for error estimates against references and observables (solve and sweep). */
export function addEstimateOptions(cmd: Command): Command {
  return cmd
    .option('--gap <g>', 'a lower bound on E1 - E0, for the Kato-Temple lower bound', positiveNumber('--gap'))
    .option('--reference <E>', 'a known ground energy: report absolute and relative errors', realNumber('--reference'))
    .option('--exact', 'diagonalise the whole sector for the reference energy (small systems)')
    .option('--exact-max-dim <d>', 'largest sector --exact enumerates', positiveInt('--exact-max-dim'))
    .option('--observables <file>', 'Pauli strings to evaluate in the lowest state, one per line (Hamiltonian text format)')
    .option('--observe', 'report per-qubit <Z>, occupations and <Z_i Z_j> of the lowest state');
}

export interface ExpandFlags {
  expand?: number;
  expandThreshold?: number;
  expandMax?: number;
}

/** The estimate flags, as the pipeline takes them. */
export type EstimateFlags = PointEstimates;

/** Expansion options from the flags (undefined when no expansion was asked for). */
export function expandFromFlags(f: ExpandFlags, steps = f.expand): ExpandOptions | undefined {
  if (steps === undefined) {
    if (f.expandThreshold !== undefined || f.expandMax !== undefined) {
      throw new BitspanError('bad-argument', '--expand-threshold and --expand-max need --expand N (or --axis expand)', 'e.g. --expand 1 --expand-threshold 1e-3');
    }
    return undefined;
  }
  return { steps, threshold: f.expandThreshold, max: f.expandMax };
}

/** The estimate flags both `solve` and `sweep` pass on unchanged. */
export function estimateFromFlags(f: EstimateFlags): EstimateFlags {
  return { gap: f.gap, reference: f.reference, exact: f.exact, exactMaxDim: f.exactMaxDim, observables: f.observables, observe: f.observe };
}

/** Refuse flags that contradict each other. */
export function checkEstimateFlags(f: EstimateFlags): void {
  if (f.exact && f.reference !== undefined) throw new BitspanError('bad-argument', '--exact and --reference both give the reference energy', 'use one of them');
}

/** Parse `--values 1,2,4` into numbers. */
export function numberList(flag: string): (v: string) => number[] {
  return (v) => {
    const parts = v.split(',').map((p) => p.trim()).filter((p) => p.length > 0);
    const nums = parts.map(Number);
    if (parts.length === 0 || nums.some((x) => !Number.isFinite(x))) throw new BitspanError('bad-argument', `${flag} '${v}' is not a comma-separated list of numbers`, `e.g. ${flag} 1,2,4`);
    return nums;
  };
}
