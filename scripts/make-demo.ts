/**
 * Dev tool: `npm run make-demo` regenerates fixtures/demo/ from DEMO_SCENARIO with the library
 * itself (model → simulate), so the shipped demo data is reproducible byte for byte.
 */
import { mkdir, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { writeFileAtomic } from '../src/io/atomicWrite.js';
import { formatHamiltonianText } from '../src/io/hamiltonianTextWriter.js';
import { buildModel } from '../src/operators/models/buildModel.js';
import { DEMO_SCENARIO } from '../src/pipeline/demoScenario.js';
import type { DemoManifest } from '../src/pipeline/demo.js';
import { simulate } from '../src/pipeline/simulate.js';

async function main(dir: string): Promise<void> {
  const s = DEMO_SCENARIO;
  await rm(dir, { recursive: true, force: true });
  await mkdir(dir, { recursive: true });
  const model = buildModel(s.model);
  const hamiltonian = 'hamiltonian.txt';
  await writeFileAtomic(join(dir, hamiltonian), formatHamiltonianText(model.hamiltonian, [`demo scenario: ${s.title}`, 'regenerate with: npm run make-demo', ...model.header]));
  const report = await simulate({
    hamiltonian: join(dir, hamiltonian),
    initial: s.initial,
    dt: s.dt,
    steps: s.steps,
    shots: s.shots,
    evolution: s.evolution,
    trotterSteps: s.trotterSteps,
    noise: s.noise,
    seed: s.seed,
    out: dir,
  });
  // simulate.json carries timings; the manifest keeps only what is reproducible.
  await rm(join(dir, 'simulate.json'));
  const manifest: DemoManifest = {
    scenario: s,
    hamiltonian,
    dumps: report.dumps.map((d) => ({ file: `t${report.dumps.indexOf(d)}.csv`, time: d.time })),
  };
  await writeFileAtomic(join(dir, 'scenario.json'), JSON.stringify(manifest, null, 2) + '\n');
  process.stdout.write(`make-demo: wrote ${report.dumps.length} dumps of ${report.qubits} qubits to ${dir} (evolve ${report.timings.evolve.toFixed(1)}s)\n`);
}

main(process.argv[2] ?? 'fixtures/demo').catch((e: Error) => {
  process.stderr.write(`make-demo: ${e.message}\n`);
  process.exit(1);
});
