import type { Basis } from '../bits/basis.js';
import { hashConfig, lookupConfigHashed } from '../bits/hashIndex.js';
import { popcount32 } from '../bits/packed.js';
import type { SectorFlipTest } from '../build/projectedHamiltonian.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { CompiledSector } from '../sectors/sector.js';

/**
 * Per-Hamiltonian tables for walking H|ψ⟩ out of the subspace: for each flip group, the diagonal
 * (Z-only) terms whose sign changes under that flip, so H_aa of a = b ⊕ flip follows from H_bb
 * in a few operations instead of a sum over every diagonal term.
 */
export interface ExternalPlan {
  groups: FlipGroups;
  /** Index of the all-Z flip group, or −1. */
  diagonalGroup: number;
  /** count + 1 offsets into `shiftTerm`. */
  shiftStart: Int32Array;
  /** Term indices (into the group arrays) of diagonal terms anticommuting with the flip. */
  shiftTerm: Int32Array;
  /** When set, flips that leave the sector are skipped (expansion works within the sector). */
  sectorTest?: SectorFlipTest;
}

/** How each source row weighs its flips: by ψ (H|ψ⟩) or by |matrix element| (connectivity). */
export type AccumulateMode = 'amplitude' | 'connect';

/**
 * The distinct configurations a ∉ S that H reaches from the basis, with ⟨a|H|ψ⟩ (or the summed
 * |⟨a|H|b⟩| in `connect` mode) and H_aa. Entry i is `basis.states[row] ⊕ flipMasks[group]` with
 * `sources[i] = row · groups.count + group` (the first source that reached it), so no key words
 * are stored. Only the first `size` entries are meaningful.
 */
export interface ExternalAmplitudes {
  complex: boolean;
  size: number;
  sources: Uint32Array | Float64Array;
  /** Amplitudes, interleaved (re, im) when complex. */
  values: Float64Array;
  /** ⟨a|H|a⟩ of each entry (empty unless asked for with `keepDiagonal`). */
  diagonal: Float64Array;
}

/**
 * Flip records are grouped by the top bits of the target's hash: this many bits. 256 buckets keep
 * the scattered writes within the TLB's reach, while each bucket's merge table still fits in cache.
 */
export const BUCKET_BITS = 8;
const BUCKETS = 1 << BUCKET_BITS;
const BUCKET_SHIFT = 32 - BUCKET_BITS;

/** What the flip walk reads: the basis, the Hamiltonian plan, ψ and the rows' H_bb. */
export interface FlipSource {
  basis: Basis;
  plan: ExternalPlan;
  /** ψ over the basis (interleaved when complex); ignored in `connect` mode. */
  psi: Float64Array | null;
  rowDiagonal: Float64Array;
  mode: AccumulateMode;
}

/**
 * Flip records written by `collectFlips`: the source `row · groups.count + group` (Uint32 when it
 * fits, 12 bytes a record with the value; Float64 otherwise) and the contribution.
 */
export interface FlipRecords {
  sources: Uint32Array | Float64Array;
  values: Float64Array;
}

/** Empty records for `total` flips of a basis of `dim` rows and `groupCount` flip groups. */
export function allocateFlipRecords(total: number, dim: number, groupCount: number, complex: boolean): FlipRecords {
  const sources = dim * groupCount < 2 ** 32 ? new Uint32Array(total) : new Float64Array(total);
  return { sources, values: new Float64Array(complex ? 2 * total : total) };
}

/** Precompute the diagonal-shift tables of `groups` (and optionally restrict flips to a sector). */
export function externalPlan(groups: FlipGroups, sectorTest?: SectorFlipTest): ExternalPlan {
  const nWords = groups.nWords;
  let diagonalGroup = -1;
  if (groups.count > 0) {
    let zero = true;
    for (let k = 0; k < nWords; k++) if (groups.flipMasks[k] !== 0) zero = false;
    if (zero) diagonalGroup = 0;
  }
  const shiftStart = new Int32Array(groups.count + 1);
  const shifts: number[] = [];
  for (let g = 0; g < groups.count; g++) {
    shiftStart[g] = shifts.length;
    if (g === diagonalGroup || diagonalGroup < 0) continue;
    for (let t = groups.termStart[diagonalGroup]!; t < groups.termStart[diagonalGroup + 1]!; t++) {
      let par = 0;
      for (let k = 0; k < nWords; k++) par ^= popcount32(groups.flipMasks[g * nWords + k]! & groups.zMasks[t * nWords + k]!);
      if (par & 1) shifts.push(t);
    }
  }
  shiftStart[groups.count] = shifts.length;
  return { groups, diagonalGroup, shiftStart, shiftTerm: Int32Array.from(shifts), sectorTest };
}

/** ⟨b|H|b⟩ for every basis configuration b: the constant plus the signed diagonal terms. */
export function diagonalEnergies(basis: Basis, plan: ExternalPlan): Float64Array {
  const { groups, diagonalGroup } = plan;
  const nWords = basis.nWords;
  const out = new Float64Array(basis.dim).fill(groups.constant);
  if (diagonalGroup < 0) return out;
  const t0 = groups.termStart[diagonalGroup]!;
  const t1 = groups.termStart[diagonalGroup + 1]!;
  for (let r = 0; r < basis.dim; r++) {
    const off = r * nWords;
    let e = out[r]!;
    for (let t = t0; t < t1; t++) {
      let par = 0;
      for (let k = 0; k < nWords; k++) par ^= popcount32(basis.states[off + k]! & groups.zMasks[t * nWords + k]!);
      e += par & 1 ? -groups.phaseRe[t]! : groups.phaseRe[t]!;
    }
    out[r] = e;
  }
  return out;
}

/**
 * Walk the flips of rows r0..r1 with a nonzero matrix element whose target hashes into buckets
 * [b0, b1). Without `records`, count them into `cursor[bucket]`; with `records`, write each at
 * `cursor[bucket]++` (cursor starting at the bucket offsets). Targets inside the subspace are
 * kept here and dropped by `mergeFlips`, which looks up each distinct target once.
 */
export function collectFlips(src: FlipSource, r0: number, r1: number, b0: number, b1: number, cursor: Float64Array, records: FlipRecords | null): void {
  const { basis, plan, psi } = src;
  const { groups, diagonalGroup, sectorTest } = plan;
  const nWords = basis.nWords;
  const states = basis.states;
  const { flipMasks, termStart, zMasks, phaseRe, phaseIm } = groups;
  const complex = groups.complex;
  const connect = src.mode === 'connect';
  const nc = sectorTest ? sectorTest.constraints : 0;
  const b = new Uint32Array(nWords);
  const sources = records ? records.sources : null;
  const vals = records ? records.values : null;
  const G = groups.count;

  for (let r = r0; r < r1; r++) {
    const aOff = r * nWords;
    let pr = 1;
    let pi = 0;
    if (!connect) {
      pr = complex ? psi![2 * r]! : psi![r]!;
      pi = complex ? psi![2 * r + 1]! : 0;
      if (pr === 0 && pi === 0) continue;
    }
    for (let g = 0; g < groups.count; g++) {
      if (g === diagonalGroup) continue;
      if (sectorTest) {
        if (!sectorTest.groupAllowed[g]) continue;
        let stays = true;
        for (let c = 0; c < nc && stays; c++) {
          let w = 0;
          const mOff = (g * nc + c) * nWords;
          for (let k = 0; k < nWords; k++) w += popcount32(states[aOff + k]! & sectorTest.flipMasked[mOff + k]!);
          stays = 2 * w === sectorTest.flipWeight[g * nc + c];
        }
        if (!stays) continue;
      }
      // ⟨b|P|a⟩ = coeff · i^{#Y} · (−1)^{popcount(a & z)} for b = a ⊕ flip; many vanish (e.g.
      // XX + YY on parallel spins), so the element comes before the hash.
      let mr = 0;
      let mi = 0;
      for (let t = termStart[g]!; t < termStart[g + 1]!; t++) {
        let par = 0;
        for (let k = 0; k < nWords; k++) par ^= popcount32(states[aOff + k]! & zMasks[t * nWords + k]!);
        if (par & 1) {
          mr -= phaseRe[t]!;
          mi -= phaseIm[t]!;
        } else {
          mr += phaseRe[t]!;
          mi += phaseIm[t]!;
        }
      }
      if (mr === 0 && mi === 0) continue;
      for (let k = 0; k < nWords; k++) b[k] = states[aOff + k]! ^ flipMasks[g * nWords + k]!;
      const bucket = hashConfig(b, 0, nWords) >>> BUCKET_SHIFT;
      if (bucket < b0 || bucket >= b1) continue;
      if (!sources) {
        cursor[bucket]!++;
        continue;
      }
      const at = cursor[bucket]!++;
      sources[at] = r * G + g;
      if (connect) vals![at] = Math.sqrt(mr * mr + mi * mi);
      else if (complex) {
        vals![2 * at] = mr * pr - mi * pi;
        vals![2 * at + 1] = mr * pi + mi * pr;
      } else vals![at] = mr * pr;
    }
  }
}

/** Where `mergeFlips` puts what it learns about each distinct external configuration. */
export interface MergeTarget {
  /** Energy E of the PT2 denominators E − H_aa. */
  energy: number;
  /** |E − H_aa| at or below this counts as singular and is left out of PT2. */
  tiny: number;
  /** When given, weight on configurations outside this sector is summed apart. */
  sector?: CompiledSector;
  /** Accumulated: [Σ|v|², Σ|v|²/(E − H_aa), singular count, Σ|v|² outside the sector]. */
  sums: Float64Array;
  /** When given, H_aa of each kept entry is written at its compacted index. */
  diagonal?: Float64Array;
}

/**
 * Merge records with the same target within each bucket of [b0, b1) (a small hash table per bucket,
 * so it stays in cache), drop targets inside the subspace and exact cancellations, compact the
 * survivors to the front of the range, and add their weight, PT2 terms and H_aa to `target`.
 * Returns how many distinct external targets remain.
 */
export function mergeFlips(src: FlipSource, records: FlipRecords, offsets: Float64Array, b0: number, b1: number, target: MergeTarget): number {
  const { basis, plan, rowDiagonal } = src;
  const { shiftStart, shiftTerm } = plan;
  const { zMasks, phaseRe } = plan.groups;
  const { energy, tiny, sector, sums, diagonal } = target;
  const nc = sector ? sector.count : 0;
  let weight = 0;
  let pt2 = 0;
  let singular = 0;
  let outside = 0;
  const nWords = basis.nWords;
  const { states, slots: bSlots } = basis;
  const flipMasks = plan.groups.flipMasks;
  // Connectivity weights are real even for a complex Hamiltonian.
  const complex = plan.groups.complex && src.mode === 'amplitude';
  const { sources, values } = records;
  const G = plan.groups.count;
  const key = new Uint32Array(nWords);
  let slots = new Int32Array(1024);
  let hashes = new Int32Array(1024);
  const bloom = basisBloom(basis);
  const bloomMask = bloom.length * 32 - 1;
  const start = offsets[b0]!;
  let w = start;
  for (let bucket = b0; bucket < b1; bucket++) {
    const s = offsets[bucket]!;
    const e = offsets[bucket + 1]!;
    if (e === s) continue;
    let cap = 16;
    while (cap < 2 * (e - s)) cap *= 2;
    if (slots.length < cap) slots = new Int32Array(cap);
    if (hashes.length < e - s) hashes = new Int32Array(cap);
    slots.fill(-1, 0, cap);
    const mask = cap - 1;
    const first = w;
    // Pass A: sum the contributions of equal targets into the first record that reached them.
    for (let i = s; i < e; i++) {
      const si = sources[i]!;
      const ri = Math.floor(si / G);
      const ro = ri * nWords;
      const go = (si - ri * G) * nWords;
      for (let k = 0; k < nWords; k++) key[k] = states[ro + k]! ^ flipMasks[go + k]!;
      const h = hashConfig(key, 0, nWords);
      let slot = h & mask;
      let found = -1;
      for (;;) {
        const j = slots[slot]!;
        if (j === -1) break;
        const sj = sources[j]!;
        const rowJ = Math.floor(sj / G);
        const rj = rowJ * nWords;
        const gj = (sj - rowJ * G) * nWords;
        let k = 0;
        while (k < nWords && ((states[rj + k]! ^ flipMasks[gj + k]!) >>> 0) === key[k]) k++;
        if (k === nWords) {
          found = j;
          break;
        }
        slot = (slot + 1) & mask;
      }
      if (found >= 0) {
        if (complex) {
          values[2 * found]! += values[2 * i]!;
          values[2 * found + 1]! += values[2 * i + 1]!;
        } else values[found]! += values[i]!;
      } else {
        sources[w] = si;
        if (complex) {
          values[2 * w] = values[2 * i]!;
          values[2 * w + 1] = values[2 * i + 1]!;
        } else values[w] = values[i]!;
        slots[slot] = w;
        hashes[w - first] = h;
        w++;
      }
    }
    // Pass B: keep targets outside the basis with a nonzero total.
    const end = w;
    w = first;
    for (let j = first; j < end; j++) {
      const vr = complex ? values[2 * j]! : values[j]!;
      const vi = complex ? values[2 * j + 1]! : 0;
      if (vr === 0 && vi === 0) continue;
      const sj = sources[j]!;
      const r = Math.floor(sj / G);
      const g = sj - r * G;
      const ro = r * nWords;
      const go = g * nWords;
      for (let k = 0; k < nWords; k++) key[k] = states[ro + k]! ^ flipMasks[go + k]!;
      const h = hashes[j - first]!;
      const bit = (h >>> 5) & bloomMask;
      // Most targets are not in the basis: the small bitset answers that from cache.
      if (((bloom[bit >>> 5]! >>> (bit & 31)) & 1) !== 0 && lookupConfigHashed(states, bSlots, nWords, key, 0, h >>> 0) >= 0) continue;
      // H_aa from the source row's H_bb: the diagonal terms anticommuting with the flip change sign.
      let d = rowDiagonal[r]!;
      for (let q = shiftStart[g]!; q < shiftStart[g + 1]!; q++) {
        const t = shiftTerm[q]!;
        let par = 0;
        for (let k = 0; k < nWords; k++) par ^= popcount32(states[ro + k]! & zMasks[t * nWords + k]!);
        d -= par & 1 ? -2 * phaseRe[t]! : 2 * phaseRe[t]!;
      }
      const wt = vr * vr + vi * vi;
      weight += wt;
      const denom = energy - d;
      if (Math.abs(denom) <= tiny) {
        if (wt > 0) singular++;
      } else pt2 += wt / denom;
      if (sector) {
        let fits = true;
        for (let c = 0; c < nc && fits; c++) {
          let cnt = 0;
          for (let k = 0; k < nWords; k++) cnt += popcount32(key[k]! & sector.masks[c * nWords + k]!);
          fits = cnt === sector.targets[c];
        }
        if (fits && sector.parity >= 0) {
          let p = 0;
          for (let k = 0; k < nWords; k++) p ^= popcount32(key[k]!) & 1;
          fits = p === sector.parity;
        }
        if (!fits) outside += wt;
      }
      if (diagonal) diagonal[w] = d;
      sources[w] = sj;
      if (complex) {
        values[2 * w] = vr;
        values[2 * w + 1] = vi;
      } else values[w] = vr;
      w++;
    }
  }
  sums[0]! += weight;
  sums[1]! += pt2;
  sums[2]! += singular;
  sums[3]! += outside;
  return w - start;
}

/**
 * A one-hash Bloom bitset of the basis (about 16 bits a configuration, so it stays in cache): a
 * clear bit proves a configuration is not in the basis.
 */
export function basisBloom(basis: Basis): Uint32Array {
  let bits = 1024;
  while (bits < 16 * basis.dim) bits *= 2;
  const out = new Uint32Array(bits >>> 5);
  const mask = bits - 1;
  for (let i = 0; i < basis.dim; i++) {
    const bit = (hashConfig(basis.states, i * basis.nWords, basis.nWords) >>> 5) & mask;
    out[bit >>> 5]! |= 1 << (bit & 31);
  }
  return out;
}

/** Options of `externalAmplitudes`. */
export interface ExternalOptions {
  mode?: AccumulateMode;
  /** Energy for the PT2 denominators (default 0). */
  energy?: number;
  /** |E − H_aa| at or below this is singular (default 1e-12 · max(1, |E|)). */
  tiny?: number;
  sector?: CompiledSector;
  /** Keep H_aa of every entry (needed by expansion by importance). */
  keepDiagonal?: boolean;
  /** Process only hash partition `part` of `parts` (bounded memory, or one partition per worker). */
  part?: number;
  parts?: number;
}

/**
 * The external components of H|ψ⟩ (or the connectivity of the basis) in two cache-friendly phases:
 * count and write flip records grouped by target hash, then merge equal targets bucket by bucket.
 * Both phases are free functions over row and bucket ranges so they can be split over workers.
 */
export function externalAmplitudes(
  basis: Basis,
  plan: ExternalPlan,
  psi: Float64Array | null,
  rowDiagonal: Float64Array,
  options: ExternalOptions = {},
): { external: ExternalAmplitudes; weight: number; pt2: number; singular: number; outsideSector: number } {
  const parts = Math.max(1, options.parts ?? 1);
  const part = options.part ?? 0;
  const b0 = Math.floor((part * BUCKETS) / parts);
  const b1 = Math.floor(((part + 1) * BUCKETS) / parts);
  const src: FlipSource = { basis, plan, psi, rowDiagonal, mode: options.mode ?? 'amplitude' };
  const complex = plan.groups.complex && src.mode === 'amplitude';
  const counts = new Float64Array(BUCKETS);
  collectFlips(src, 0, basis.dim, b0, b1, counts, null);
  const offsets = new Float64Array(BUCKETS + 1);
  for (let k = 0; k < BUCKETS; k++) offsets[k + 1] = offsets[k]! + counts[k]!;
  const total = offsets[BUCKETS]!;
  const records = allocateFlipRecords(total, basis.dim, plan.groups.count, complex);
  const cursor = offsets.slice(0, BUCKETS);
  collectFlips(src, 0, basis.dim, b0, b1, cursor, records);
  const energy = options.energy ?? 0;
  const diagonal = options.keepDiagonal ? new Float64Array(total) : new Float64Array(0);
  const target: MergeTarget = {
    energy,
    tiny: options.tiny ?? 1e-12 * Math.max(1, Math.abs(energy)),
    sector: options.sector,
    sums: new Float64Array(4),
    diagonal: options.keepDiagonal ? diagonal : undefined,
  };
  const size = mergeFlips(src, records, offsets, b0, b1, target);
  const [weight, pt2, singular, outsideSector] = target.sums;
  return {
    external: { complex, size, sources: records.sources, values: records.values, diagonal },
    weight: weight!,
    pt2: pt2!,
    singular: singular!,
    outsideSector: outsideSector!,
  };
}

/** Write the packed configuration of external entry `i` into `out[offset..]`. */
export function externalConfig(ext: ExternalAmplitudes, basis: Basis, plan: ExternalPlan, i: number, out: Uint32Array, offset = 0): void {
  const nWords = basis.nWords;
  const G = plan.groups.count;
  const src = ext.sources[i]!;
  const row = Math.floor(src / G);
  const ro = row * nWords;
  const go = (src - row * G) * nWords;
  for (let k = 0; k < nWords; k++) out[offset + k] = basis.states[ro + k]! ^ plan.groups.flipMasks[go + k]!;
}
