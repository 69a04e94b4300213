/**
 * Dev tool: `node dist/bench/make-case.js DIR [--side 8] [--distinct 100000] [--seed 1] [--qubits 100]`
 * writes DIR/heisenberg.txt and DIR/samples.csv and prints the case as JSON.
 */
import { writeBenchCase } from './cases.js';

function main(argv: string[]): void {
  let dir: string | undefined;
  const num: Record<string, number> = { side: 8, distinct: 100000, seed: 1 };
  let qubits: number | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a.startsWith('--')) {
      const name = a.slice(2);
      const v = Number(argv[++i]);
      if (!Number.isFinite(v)) throw new Error(`${a} needs a number`);
      if (name === 'qubits') qubits = v;
      else if (name in num) num[name] = v;
      else throw new Error(`unknown option ${a}`);
    } else if (dir === undefined) {
      dir = a;
    } else {
      throw new Error(`unexpected argument ${a}`);
    }
  }
  if (dir === undefined) throw new Error('usage: make-case DIR [--side L] [--distinct N] [--seed S] [--qubits Q]');
  const t0 = performance.now();
  const c = writeBenchCase(dir, { side: num.side!, distinct: num.distinct!, seed: num.seed!, qubits });
  process.stdout.write(JSON.stringify({ ...c, distinct: num.distinct, seconds: (performance.now() - t0) / 1000 }) + '\n');
}

try {
  main(process.argv.slice(2));
} catch (e) {
  process.stderr.write(`make-case: ${(e as Error).message}\n`);
  process.exit(2);
}
