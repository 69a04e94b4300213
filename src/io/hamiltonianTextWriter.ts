import { formatPauliOps, type PauliSum } from '../operators/pauliSum.js';

/**
 * The text form `readHamiltonian` reads: a `qubits N` line, the header lines as `#` comments,
 * then one `COEFF OP OP ...` term per line (the constant, if any, first). Coefficients are written
 * in shortest round-trip form, so reading the file back gives the same doubles.
 */
export function formatHamiltonianText(h: PauliSum, header: string[] = []): string {
  const lines: string[] = [`qubits ${h.qubits}`];
  for (const c of header) lines.push(`# ${c.replace(/[\r\n]+/g, ' ')}`);
  // A zero Hamiltonian still needs one term line to be readable.
  if (h.constant !== 0 || h.terms.length === 0) lines.push(String(h.constant));
  for (const t of h.terms) lines.push(`${t.coeff} ${formatPauliOps(t)}`);
  return lines.join('\n') + '\n';
}
