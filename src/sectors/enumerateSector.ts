import { wordsFor } from '../bits/packed.js';
import { compileSector, type Sector } from './sector.js';

/**
 * The qubits split into cells that the same set of weight constraints covers, and the weight
 * assignments to cells that satisfy every constraint and the parity. A sector is the union, over
 * those assignments, of the products of "w ones among the m qubits of a cell".
 */
interface SectorCells {
  cells: number[][];
  /** Each valid assignment: weight per cell. */
  assignments: number[][];
}

function binomial(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  let r = 1;
  for (let i = 1; i <= Math.min(k, n - k); i++) r = (r * (n - Math.min(k, n - k) + i)) / i;
  return Math.round(r);
}

function sectorCells(sector: Sector, qubits: number): SectorCells {
  compileSector(sector, qubits, wordsFor(qubits)); // validates ranges and weights
  const ranges = sector.weights.map((w) => ({ lo: w.lo, hi: w.hi < 0 ? qubits - 1 : w.hi, weight: w.weight }));
  const bySignature = new Map<string, number[]>();
  for (let q = 0; q < qubits; q++) {
    const sig = ranges.map((r) => (q >= r.lo && q <= r.hi ? '1' : '0')).join('');
    const list = bySignature.get(sig);
    if (list) list.push(q);
    else bySignature.set(sig, [q]);
  }
  const signatures = [...bySignature.keys()];
  const cells = signatures.map((s) => bySignature.get(s)!);
  const covers = ranges.map((_, c) => signatures.map((s) => s[c] === '1'));
  const parity = sector.parity === undefined ? -1 : sector.parity === 'even' ? 0 : 1;
  const assignments: number[][] = [];
  const w = new Array<number>(cells.length).fill(0);
  const visit = (i: number): void => {
    if (i === cells.length) {
      for (let c = 0; c < ranges.length; c++) {
        let sum = 0;
        for (let k = 0; k < cells.length; k++) if (covers[c]![k]) sum += w[k]!;
        if (sum !== ranges[c]!.weight) return;
      }
      if (parity >= 0 && (w.reduce((a, b) => a + b, 0) & 1) !== parity) return;
      assignments.push(w.slice());
      return;
    }
    for (let x = 0; x <= cells[i]!.length; x++) {
      w[i] = x;
      // Prune: no constraint may already exceed its weight.
      let over = false;
      for (let c = 0; c < ranges.length && !over; c++) {
        let sum = 0;
        for (let k = 0; k <= i; k++) if (covers[c]![k]) sum += w[k]!;
        over = sum > ranges[c]!.weight;
      }
      if (over) break;
      visit(i + 1);
    }
  };
  visit(0);
  return { cells, assignments };
}

/** Number of configurations of `qubits` qubits in the sector (a double; may exceed 2^53 roughly). */
export function sectorDimension(sector: Sector, qubits: number): number {
  const { cells, assignments } = sectorCells(sector, qubits);
  let total = 0;
  for (const a of assignments) total += a.reduce((p, w, i) => p * binomial(cells[i]!.length, w), 1);
  return total;
}

/** Packed masks of every choice of `w` qubits out of `qubits` (lexicographic). */
function combinations(qubits: number[], w: number, nWords: number): Uint32Array {
  const count = binomial(qubits.length, w);
  const out = new Uint32Array(count * nWords);
  const idx = Array.from({ length: w }, (_, i) => i);
  for (let n = 0; n < count; n++) {
    for (const i of idx) {
      const q = qubits[i]!;
      out[n * nWords + (q >>> 5)]! |= 1 << (q & 31);
    }
    // Next combination: advance the rightmost index that can move.
    let j = w - 1;
    while (j >= 0 && idx[j] === qubits.length - w + j) j--;
    if (j < 0) break;
    idx[j]!++;
    for (let k = j + 1; k < w; k++) idx[k] = idx[k - 1]! + 1;
  }
  return out;
}

/**
 * Every configuration of the sector (all qubits free when it has no constraints), packed back to
 * back, in no particular order. The caller checks `sectorDimension` first: this allocates it all.
 */
export function enumerateSector(sector: Sector, qubits: number): { states: Uint32Array; count: number; nWords: number } {
  const nWords = wordsFor(qubits);
  const { cells, assignments } = sectorCells(sector, qubits);
  const count = sectorDimension(sector, qubits);
  const states = new Uint32Array(Math.max(1, count) * nWords);
  let at = 0;
  for (const a of assignments) {
    const lists = cells.map((cell, i) => combinations(cell, a[i]!, nWords));
    const sizes = lists.map((l) => l.length / nWords);
    const digit = new Array<number>(cells.length).fill(0);
    // Odometer over the product of the cells' combination lists.
    for (;;) {
      for (let i = 0; i < cells.length; i++) {
        const base = digit[i]! * nWords;
        for (let k = 0; k < nWords; k++) states[at * nWords + k]! |= lists[i]![base + k]!;
      }
      at++;
      let i = 0;
      while (i < cells.length && ++digit[i]! === sizes[i]) digit[i++] = 0;
      if (i === cells.length) break;
    }
  }
  return { states, count: at, nWords };
}
