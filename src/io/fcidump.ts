import { BitspanError } from '../errors.js';
import { eriIndex, makeIntegrals, setOneElectron, setTwoElectron, type Integrals } from '../operators/integrals.js';
import { checkReadable, readLines } from './lines.js';

/** An FCIDUMP file: the integrals and what the namelist header says about the system. */
export interface Fcidump {
  file: string;
  integrals: Integrals;
  /** NELEC, when the header gives it. */
  electrons: number | undefined;
  /** MS2 = N_up − N_down (0 when absent). */
  ms2: number;
  /** ORBSYM (irrep label of each orbital), empty when absent. */
  orbsym: number[];
  /** ISYM (irrep of the wanted state), 1 when absent. */
  isym: number;
  /** Integral lines read (including the core-energy and orbital-energy lines). */
  integralLines: number;
}

interface Token {
  text: string;
  line: number;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$/;
const INTEGER = /^[+-]?\d+$/;
/** Two integrals that should be equal by symmetry may differ by file rounding up to this much. */
const CONFLICT_TOL = 1e-8;

/**
 * Read an FCIDUMP file: the `&FCI ... &END` (or `/`) namelist header with NORB, NELEC, MS2,
 * ORBSYM, ISYM and UHF, then lines `value i j k l` (1-based orbitals): all four > 0 is (ij|kl) in
 * chemists' notation with the 8-fold symmetry of real orbitals, k = l = 0 is h_ij, all zero is the
 * core energy, and i > 0 with j = k = l = 0 (an orbital energy) is ignored. Throws `bad-integrals`
 * with the line for anything else, and refuses UHF files.
 */
export async function readFcidump(file: string): Promise<Fcidump> {
  const size = await checkReadable(file, 'integrals');
  if (size === 0) throw new BitspanError('file-empty', 'integrals file is empty', 'give an FCIDUMP file starting with the &FCI header', { file });
  const bad = (message: string, hint: string, line?: number): BitspanError => new BitspanError('bad-integrals', message, hint, { file, line });

  const header: Token[] = [];
  let headerLine = 0;
  let state: 'before' | 'header' | 'body' = 'before';
  let ints: Integrals | undefined;
  let meta: ReturnType<typeof parseHeader> | undefined;
  let integralLines = 0;

  for await (const { text, line } of readLines(file)) {
    if (state === 'body') {
      const t = text.trim();
      if (t.length === 0) continue;
      parseIntegralLine(t, line, ints!, bad);
      integralLines++;
      continue;
    }
    let rest = text;
    if (state === 'before') {
      const t = text.trim();
      if (t.length === 0) continue;
      const m = /^[&$]FCI\b/i.exec(t);
      if (!m) throw bad(`expected the '&FCI' namelist header, found '${clip(t)}'`, 'an FCIDUMP file starts with &FCI NORB=..., NELEC=..., MS2=..., closed by &END or /', line);
      state = 'header';
      headerLine = line;
      rest = t.slice(m[0].length);
    }
    // The namelist ends at &END, $END or a lone '/'; anything after it on the line is ignored.
    const end = /[&$]END\b|\//i.exec(rest);
    tokenize(end ? rest.slice(0, end.index) : rest, line, header);
    if (end) {
      meta = parseHeader(header, headerLine, bad);
      ints = makeIntegrals(meta.norb);
      state = 'body';
    }
  }
  if (state === 'before') throw new BitspanError('file-empty', 'integrals file holds only blank lines', 'give an FCIDUMP file starting with the &FCI header', { file });
  if (state === 'header') throw bad("the '&FCI' header is never closed", "close the namelist with '&END' or '/' before the integral lines", headerLine);
  if (integralLines === 0) throw bad('no integral lines after the header', "write one 'value i j k l' line per integral", headerLine);
  const { electrons, ms2, orbsym, isym } = meta!;
  return { file, integrals: ints!, electrons, ms2, orbsym, isym, integralLines };
}

function tokenize(text: string, line: number, out: Token[]): void {
  for (const raw of text.replace(/=/g, ' = ').split(/[\s,]+/)) if (raw.length > 0) out.push({ text: raw, line });
}

type Bad = (message: string, hint: string, line?: number) => BitspanError;

function parseHeader(tokens: Token[], headerLine: number, bad: Bad): { norb: number; electrons: number | undefined; ms2: number; orbsym: number[]; isym: number } {
  const values = new Map<string, { items: Token[]; line: number }>();
  let current: { items: Token[]; line: number } | undefined;
  for (let i = 0; i < tokens.length; i++) {
    const t = tokens[i]!;
    if (tokens[i + 1]?.text === '=') {
      if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(t.text)) throw bad(`'${clip(t.text)}' is not a namelist key`, 'header entries look like NORB=4, NELEC=2', t.line);
      current = { items: [], line: t.line };
      values.set(t.text.toUpperCase(), current);
      i++;
      continue;
    }
    if (t.text === '=') throw bad("'=' without a key in the header", 'header entries look like NORB=4, NELEC=2', t.line);
    if (!current) throw bad(`'${clip(t.text)}' before any key in the header`, 'header entries look like NORB=4, NELEC=2', t.line);
    current.items.push(t);
  }
  const integer = (key: string, fallback?: number): number | undefined => {
    const v = values.get(key);
    if (!v) return fallback;
    if (v.items.length !== 1 || !INTEGER.test(v.items[0]!.text)) {
      throw bad(`${key} should be one whole number, found '${clip(v.items.map((x) => x.text).join(','))}'`, `e.g. ${key}=4`, v.line);
    }
    return Number(v.items[0]!.text);
  };
  const uhfEntry = values.get('UHF') ?? values.get('IUHF');
  if (uhfEntry) {
    const flag = uhfEntry.items.map((x) => x.text.toUpperCase()).join('');
    if (!/^(\.?(TRUE|FALSE|T|F)\.?|[01])$/.test(flag)) throw bad(`UHF should be .TRUE. or .FALSE., found '${clip(flag)}'`, 'write UHF=.FALSE. for restricted orbitals', uhfEntry.line);
    if (flag === '1' || flag.replace(/\./g, '').startsWith('T')) {
      throw bad('unrestricted (UHF) integrals are not supported', 'bitspan reads restricted orbitals only (one set of spatial orbitals for both spins); write the FCIDUMP from RHF or ROHF orbitals', uhfEntry.line);
    }
  }
  const norb = integer('NORB');
  if (norb === undefined) throw bad('the header has no NORB', 'give the number of orbitals, e.g. NORB=4', headerLine);
  if (norb < 1) throw bad(`NORB=${norb} is not a positive orbital count`, 'NORB is the number of spatial orbitals', values.get('NORB')!.line);
  const electrons = integer('NELEC');
  if (electrons !== undefined && (electrons < 0 || electrons > 2 * norb)) {
    throw bad(`NELEC=${electrons} does not fit in ${norb} orbitals`, `0 <= NELEC <= ${2 * norb}`, values.get('NELEC')!.line);
  }
  const ms2 = integer('MS2', 0)!;
  const isym = integer('ISYM', 1)!;
  const orbsym: number[] = [];
  const os = values.get('ORBSYM');
  if (os) {
    for (const item of os.items) {
      // Fortran namelists may write repeats as n*value.
      const rep = /^(\d+)\*([+-]?\d+)$/.exec(item.text);
      if (rep) for (let k = 0; k < Number(rep[1]); k++) orbsym.push(Number(rep[2]));
      else if (INTEGER.test(item.text)) orbsym.push(Number(item.text));
      else throw bad(`ORBSYM entry '${clip(item.text)}' is not a whole number`, 'ORBSYM lists one irrep label per orbital, e.g. ORBSYM=1,1,2,3', item.line);
    }
    if (orbsym.length !== norb) throw bad(`ORBSYM lists ${orbsym.length} labels for NORB=${norb} orbitals`, 'give one irrep label per orbital', os.line);
  }
  return { norb, electrons, ms2, orbsym, isym };
}

function parseIntegralLine(t: string, line: number, ints: Integrals, bad: Bad): void {
  const parts = t.split(/\s+/);
  if (parts.length !== 5) {
    throw bad(`expected 'value i j k l', found ${parts.length} field${parts.length === 1 ? '' : 's'} in '${clip(t)}'`, 'each integral line holds a value and four orbital indices', line);
  }
  if (!NUMBER.test(parts[0]!)) throw bad(`integral value '${clip(parts[0]!)}' is not a number`, 'values are decimal numbers such as -1.2528 or 0.1813E+00', line);
  const value = Number(parts[0]!.replace(/[dD]/, 'e'));
  if (!Number.isFinite(value)) throw bad(`integral value '${clip(parts[0]!)}' overflows`, 'values must be finite', line);
  const m = ints.orbitals;
  const idx = new Array<number>(4);
  for (let k = 0; k < 4; k++) {
    const s = parts[k + 1]!;
    if (!INTEGER.test(s) || Number(s) < 0 || Number(s) > m) {
      throw bad(`orbital index '${clip(s)}' is not between 0 and NORB=${m}`, 'indices are 1-based orbitals; 0 marks one-electron, orbital-energy and core lines', line);
    }
    idx[k] = Number(s);
  }
  const [i, j, k, l] = idx as [number, number, number, number];
  const conflict = (old: number, what: string): void => {
    if (old !== 0 && Math.abs(old - value) > CONFLICT_TOL * Math.max(1, Math.abs(value))) {
      throw bad(`${what} is ${value} here but ${old} on an earlier line (the same integral up to the symmetry of real orbitals)`, 'give each integral once, or check that the orbitals are real', line);
    }
  };
  if (i > 0 && j > 0 && k > 0 && l > 0) {
    conflict(ints.eri[eriIndex(m, i - 1, j - 1, k - 1, l - 1)]!, `(${i}${j}|${k}${l})`);
    setTwoElectron(ints, i - 1, j - 1, k - 1, l - 1, value);
  } else if (i > 0 && j > 0 && k === 0 && l === 0) {
    conflict(ints.h1[(i - 1) * m + (j - 1)]!, `h(${i},${j})`);
    setOneElectron(ints, i - 1, j - 1, value);
  } else if (i === 0 && j === 0 && k === 0 && l === 0) {
    conflict(ints.core, 'the core energy');
    ints.core = value;
  } else if (i > 0 && j === 0 && k === 0 && l === 0) {
    // An orbital energy: not part of the Hamiltonian.
  } else {
    throw bad(`index pattern ${i} ${j} ${k} ${l} is none of (ij|kl), h_ij (i j 0 0), orbital energy (i 0 0 0) or core (0 0 0 0)`, 'check the column order: value first, then four indices', line);
  }
}

function clip(s: string): string {
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}
