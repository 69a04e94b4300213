import type { ComplexMatrix } from '../solvers/complexMatrix.js';

/** What a Krylov matrices file holds: H̃, S, optional element errors, and free-form provenance. */
export interface KrylovMatricesDocument {
  h: ComplexMatrix;
  s: ComplexMatrix;
  hErr?: ComplexMatrix | null;
  sErr?: ComplexMatrix | null;
  /** Extra keys written after the matrices (the reader ignores them). */
  info?: Record<string, unknown>;
}

/**
 * Render H̃ and S (and errors) in the JSON format `bitspan krylov --matrices` reads: one row per
 * line, entries `[re, im]` at full double precision, so the text round-trips exactly.
 */
export function krylovMatricesJson(doc: KrylovMatricesDocument): string {
  const rows = (m: ComplexMatrix): string =>
    '[\n' +
    Array.from({ length: m.n }, (_, j) => '    [' + Array.from({ length: m.n }, (_, k) => `[${num(m.re[j * m.n + k]!)}, ${num(m.im[j * m.n + k]!)}]`).join(', ') + ']').join(',\n') +
    '\n  ]';
  const parts = [`  "h": ${rows(doc.h)}`, `  "s": ${rows(doc.s)}`];
  if (doc.hErr) parts.push(`  "hErr": ${rows(doc.hErr)}`);
  if (doc.sErr) parts.push(`  "sErr": ${rows(doc.sErr)}`);
  for (const [key, value] of Object.entries(doc.info ?? {})) parts.push(`  ${JSON.stringify(key)}: ${JSON.stringify(value)}`);
  return '{\n' + parts.join(',\n') + '\n}\n';
}

/** A finite double as JSON (−0 as 0). */
function num(x: number): string {
  return Object.is(x, -0) ? '0' : JSON.stringify(x);
}
