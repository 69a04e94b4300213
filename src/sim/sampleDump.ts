import { seededUniform, type UniformSource } from '../util/random.js';
import type { StateVector } from './stateVector.js';

/** Measurement noise applied to every bit of every shot: flips first, then readout error. */
export interface ShotNoise {
  /** Probability that a 0 is read as 1. */
  p01: number;
  /** Probability that a 1 is read as 0. */
  p10: number;
  /** Probability that a bit is flipped before readout (e.g. a gate error). */
  flip: number;
}

export const NO_NOISE: ShotNoise = { p01: 0, p10: 0, flip: 0 };

/** Distinct measured configurations (ascending) and how often each was seen. */
export interface Dump {
  configs: Uint32Array;
  counts: Float64Array;
}

/** Seed of the stream for time index k, so that dump k does not depend on how many were asked. */
export function timeSeed(seed: number, k: number): number {
  let h = Math.imul(seed ^ 0x5bd1e995, 0x9e3779b1) ^ Math.imul(k + 1, 0x85ebca77);
  h ^= h >>> 15;
  h = Math.imul(h, 0xc2b2ae3d);
  return (h ^ (h >>> 13)) | 0;
}

/**
 * Draw `shots` configurations from |ψ_b|² by inverse-CDF: sorted uniforms swept once against the
 * running sum (O(2^n + S log S) time, no cumulative array). Returns the indices in ascending order.
 */
export function sampleShots(state: StateVector, shots: number, rng: UniformSource): Uint32Array {
  const { re, im, dim } = state;
  let total = 0;
  for (let b = 0; b < dim; b++) total += re[b]! * re[b]! + im[b]! * im[b]!;
  const u = new Float64Array(shots);
  for (let s = 0; s < shots; s++) u[s] = rng.next() * total;
  u.sort();
  const out = new Uint32Array(shots);
  let cum = 0;
  let b = -1;
  for (let s = 0; s < shots; s++) {
    while (b < dim - 1 && cum <= u[s]!) {
      b++;
      cum += re[b]! * re[b]! + im[b]! * im[b]!;
    }
    out[s] = b;
  }
  return out;
}

/** Corrupt shots in place, bit by bit: flip with probability `flip`, then read 0→1 with p01, 1→0 with p10. */
export function corruptShots(shots: Uint32Array, qubits: number, noise: ShotNoise, rng: UniformSource): void {
  const { p01, p10, flip } = noise;
  if (p01 === 0 && p10 === 0 && flip === 0) return;
  for (let s = 0; s < shots.length; s++) {
    let b = shots[s]!;
    for (let q = 0; q < qubits; q++) {
      const bit = 1 << q;
      if (flip > 0 && rng.next() < flip) b ^= bit;
      if (b & bit) {
        if (p10 > 0 && rng.next() < p10) b &= ~bit;
      } else if (p01 > 0 && rng.next() < p01) b |= bit;
    }
    shots[s] = b >>> 0;
  }
}

/** Count equal shots: distinct configurations ascending with their counts. */
export function countShots(shots: Uint32Array): Dump {
  const sorted = Uint32Array.from(shots).sort();
  const configs: number[] = [];
  const counts: number[] = [];
  for (let s = 0; s < sorted.length; s++) {
    if (s > 0 && sorted[s] === sorted[s - 1]) counts[counts.length - 1]!++;
    else {
      configs.push(sorted[s]!);
      counts.push(1);
    }
  }
  return { configs: Uint32Array.from(configs), counts: Float64Array.from(counts) };
}

/**
 * One dump of a state: `shots` seeded draws (stream `timeSeed(seed, k)`), corrupted by `noise`,
 * then counted.
 */
export function sampleDump(state: StateVector, shots: number, noise: ShotNoise, seed: number, k: number): Dump {
  const rng = seededUniform(timeSeed(seed, k));
  const drawn = sampleShots(state, shots, rng);
  corruptShots(drawn, state.qubits, noise, rng);
  return countShots(drawn);
}
