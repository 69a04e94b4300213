import { Command } from 'commander';
import { resolve } from 'node:path';
import { collect, type Collected, type CollectRow } from '../../batch/collect.js';
import { collectTable } from '../../batch/collectTable.js';
import { jobPlan, readJobPlan } from '../../batch/jobPlan.js';
import { readManifest } from '../../batch/manifest.js';
import { BitspanError } from '../../errors.js';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { formatCsv } from '../../io/formatCsv.js';
import { commandCatalog } from '../commandCatalog.js';
import type { CliIo } from '../io.js';

interface CollectFlags {
  manifest?: string;
  json?: boolean;
  csv?: string;
  timings: boolean;
}

/** `bitspan collect`: gather a batch's result files into one table and list missing and failed jobs. */
export function collectCommand(io: CliIo): Command {
  const cmd = new Command('collect')
    .description('gather the results of a batch into one table (JSON or CSV); exit 3 if any job is missing or failed')
    .argument('<dir>', 'output folder of the batch')
    .option('--manifest <file>', 'the manifest, to know every job (default: the job list batch saved in DIR)')
    .option('--json', 'print {"rows": [...], "missing": [...], "failed": [...]} on stdout')
    .option('--csv <file>', 'also write the table as CSV to FILE (atomically)')
    .option('--no-timings', 'leave out the timings, so tables of the same jobs run anywhere are identical');
  cmd.action(async (dirArg: string, f: CollectFlags) => {
    const dir = resolve(dirArg);
    const jobs = f.manifest ? jobPlan(await readManifest(f.manifest, commandCatalog(cmd.parent ?? cmd)), dir).jobs : (await readJobPlan(dir))?.jobs;
    const c = await collect(dir, jobs);
    if (!f.timings) for (const r of c.rows) delete r.timings;
    if (f.csv) {
      const t = collectTable(c);
      await writeFileAtomic(resolve(f.csv), formatCsv(t.columns, t.rows));
    }
    io.stdout(f.json ? JSON.stringify(c, null, 2) + '\n' : collectSummary(c, jobs !== undefined));
    if (!jobs) io.stderr(`bitspan collect: no manifest and no job list in ${dir}; missing jobs cannot be known (give --manifest)\n`);
    if (c.missing.length || c.failed.length) {
      const parts = [c.missing.length && `${c.missing.length} missing (${listNames(c.missing)})`, c.failed.length && `${c.failed.length} failed (${listNames(c.failed)})`].filter(Boolean);
      throw new BitspanError('incomplete', `${parts.join(', ')} of ${c.rows.length} jobs`, 'rerun the batch (--all, or resubmit the array): only missing and failed jobs run again');
    }
  });
  return cmd;
}

function listNames(names: string[]): string {
  return names.length > 10 ? `${names.slice(0, 10).join(', ')}, …` : names.join(', ');
}

/** A terminal table: every energy with its residual and the subspace it came from. */
function collectSummary(c: Collected, known: boolean): string {
  const cells = c.rows.map((r) => [r.name, r.status, ...resultCells(r)]);
  const header = ['job', 'status', 'dimension', 'energy', 'residual', 'subspace'];
  const widths = header.map((h, i) => Math.max(h.length, ...cells.map((row) => row[i]!.length)));
  const fmt = (row: string[]): string => row.map((s, i) => (i === row.length - 1 ? s : s.padEnd(widths[i]!))).join('  ').trimEnd();
  const lines = [fmt(header), ...cells.map(fmt)];
  const ok = c.rows.filter((r) => r.status === 'ok').length;
  lines.push(`${c.rows.length} jobs: ${ok} ok, ${c.failed.length} failed${known ? `, ${c.missing.length} missing` : ''}`);
  for (const r of c.rows) if (r.status === 'failed') lines.push(`failed: ${r.name}: ${r.error?.code}: ${r.error?.message}`);
  if (c.missing.length) lines.push(`missing: ${c.missing.join(', ')}`);
  return lines.join('\n') + '\n';
}

function resultCells(r: CollectRow): string[] {
  if (r.status !== 'ok') return ['', '', '', ''];
  const e = Array.isArray(r.energies) ? r.energies[0] : undefined;
  const res = Array.isArray(r.residuals) ? r.residuals[0] : undefined;
  const sector = (r.sector as { description?: unknown } | undefined)?.description;
  return [
    typeof r.dimension === 'number' ? String(r.dimension) : '',
    typeof e === 'number' ? e.toFixed(12) : '',
    typeof res === 'number' ? res.toExponential(2) : '',
    typeof r.dimension === 'number' ? `${r.dimension} configurations${typeof sector === 'string' ? ` (${sector})` : ''}` : '',
  ];
}
