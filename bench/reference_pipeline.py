#!/usr/bin/env python3
"""Independent numpy/scipy peer of the bitspan pipeline, for the benchmark.

What a careful practitioner would write: vectorised byte-level CSV parsing, states packed
into uint64 words, sort-based dedupe, searchsorted lookups per flip mask, CSR + ARPACK.

usage: reference_pipeline.py --hamiltonian FILE --samples FILE.csv --weight K [--json]
"""
import os

# Single-threaded BLAS so the comparison is per core; must precede the numpy import.
for _v in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS", "BLIS_NUM_THREADS"):
    os.environ[_v] = "1"

import argparse  # noqa: E402
import json  # noqa: E402
import resource  # noqa: E402
import sys  # noqa: E402
import time  # noqa: E402

import numpy as np  # noqa: E402
import scipy.sparse as sp  # noqa: E402
import scipy.sparse.linalg as spla  # noqa: E402

U64 = np.uint64
ROWS_PER_CHUNK = 1 << 18  # bounds the (rows x width) byte gather to a few tens of MB


class InputError(Exception):
    pass


# ---------------------------------------------------------------- bit helpers

if hasattr(np, "bitwise_count"):  # numpy >= 2.0

    def popcount(x):
        return np.bitwise_count(x)

else:  # older numpy: SWAR popcount on uint64

    def popcount(x):
        x = x - ((x >> U64(1)) & U64(0x5555555555555555))
        x = (x & U64(0x3333333333333333)) + ((x >> U64(2)) & U64(0x3333333333333333))
        x = (x + (x >> U64(4))) & U64(0x0F0F0F0F0F0F0F0F)
        return ((x * U64(0x0101010101010101)) >> U64(56)).astype(np.uint8)


def parity_and(states, mask_words):
    """Parity of popcount(state & mask) for each row of states (n, W); returns uint8 0/1."""
    acc = None
    for w, m in enumerate(mask_words):
        if m == 0:
            continue
        x = states[:, w] & U64(m)
        acc = x if acc is None else acc ^ x
    if acc is None:
        return np.zeros(states.shape[0], dtype=np.uint8)
    return popcount(acc) & np.uint8(1)


def split_words(mask, nwords):
    """Python int bit mask -> list of nwords uint64 ints, most significant word first."""
    return [(mask >> (64 * (nwords - 1 - w))) & 0xFFFFFFFFFFFFFFFF for w in range(nwords)]


# ---------------------------------------------------------------- reading samples


def read_samples(path):
    """Returns (states (rows, W) uint64 most significant word first, counts int64, width)."""
    buf = np.fromfile(path, dtype=np.uint8)
    if buf.size == 0:
        raise InputError(f"{path}: empty file")
    nl = np.flatnonzero(buf == 10)
    if nl.size == 0 or nl[-1] != buf.size - 1:
        nl = np.append(nl, buf.size)  # last line without newline
    starts = np.empty_like(nl)
    starts[0] = 0
    starts[1:] = nl[:-1] + 1
    ends = nl.copy()
    cr = ends > starts
    cr[cr] = buf[ends[cr] - 1] == 13
    ends[cr] -= 1
    keep = ends > starts  # blank lines
    starts, ends = starts[keep], ends[keep]
    if starts.size == 0:
        raise InputError(f"{path}: no rows")
    if buf[starts[0]] not in (48, 49):  # header line such as "bitstring,count"
        starts, ends = starts[1:], ends[1:]
    if starts.size == 0:
        raise InputError(f"{path}: header only")
    first = bytes(buf[starts[0]:ends[0]])
    width = first.find(b",")
    if width <= 0:
        raise InputError(f"{path}: first row has no comma: {first[:80]!r}")
    nwords = (width + 63) // 64
    pad = 64 * nwords - width
    if np.any(ends - starts < width + 2) or np.any(buf[starts + width] != 44):
        raise InputError(f"{path}: bitstrings do not all have width {width}")

    rows = starts.size
    states = np.empty((rows, nwords), dtype=U64)
    counts = np.zeros(rows, dtype=np.int64)
    col = np.arange(width, dtype=np.int64)
    for a in range(0, rows, ROWS_PER_CHUNK):
        s = starts[a:a + ROWS_PER_CHUNK]
        e = ends[a:a + ROWS_PER_CHUNK]
        chars = buf[s[:, None] + col]
        chars -= 48
        if np.any(chars > 1):
            raise InputError(f"{path}: bitstring characters other than 0/1")
        if pad:
            chars = np.concatenate([np.zeros((chars.shape[0], pad), np.uint8), chars], axis=1)
        packed = np.packbits(chars, axis=1, bitorder="big")  # char 0 = highest qubit
        states[a:a + ROWS_PER_CHUNK] = packed.view(">u8").astype(U64)
        # Counts: up to maxlen ASCII digits after the comma, Horner-style per column.
        p0 = s + width + 1
        lens = e - p0
        maxlen = int(lens.max())
        if maxlen > 18:
            raise InputError(f"{path}: count field too long")
        val = np.zeros(s.size, dtype=np.int64)
        for d in range(maxlen):
            live = d < lens
            c = buf[np.where(live, p0 + d, p0)].astype(np.int64) - 48
            if np.any(live & ((c < 0) | (c > 9))):
                raise InputError(f"{path}: count is not a non-negative integer")
            val = np.where(live, val * 10 + c, val)
        counts[a:a + ROWS_PER_CHUNK] = val
    return states, counts, width


def dedupe(states, counts):
    """Sorted distinct states with summed counts."""
    if states.shape[1] == 1:
        order = np.argsort(states[:, 0])
    else:
        order = np.lexsort(states.T[::-1])  # last key is primary: word 0
    s = states[order]
    new = np.ones(s.shape[0], dtype=bool)
    new[1:] = np.any(s[1:] != s[:-1], axis=1)
    first = np.flatnonzero(new)
    return s[first], np.add.reduceat(counts[order], first)


# ---------------------------------------------------------------- Hamiltonian


def parse_hamiltonian(path):
    """Returns (terms {(xmask, zmask): complex coeff}, declared qubits or None, max qubit index).

    Each term is coeff * X^x Z^z; Y = i X Z, so a Y contributes i and sets both bits.
    """
    terms = {}
    declared = None
    maxq = -1
    with open(path, "r", encoding="utf-8") as fh:
        for ln, raw in enumerate(fh, 1):
            line = raw.split("#", 1)[0].strip()
            if not line:
                continue
            tok = line.split()
            if tok[0].lower() == "qubits":
                if declared is not None or terms or len(tok) != 2:
                    raise InputError(f"{path}:{ln}: 'qubits N' must be the first directive")
                declared = int(tok[1])
                continue
            try:
                coeff = complex(float(tok[0]))
            except ValueError:
                raise InputError(f"{path}:{ln}: bad coefficient {tok[0]!r}") from None
            x = z = 0
            for op in tok[1:]:
                letter = op[:1].upper()
                if letter not in ("X", "Y", "Z") or not op[1:].isdigit():
                    raise InputError(f"{path}:{ln}: bad operator {op!r}")
                q = int(op[1:])
                maxq = max(maxq, q)
                b = 1 << q
                a_bit = b if letter in ("X", "Y") else 0
                z_bit = b if letter in ("Z", "Y") else 0
                # (X^x Z^z)(X^a Z^b') = (-1)^{z.a} X^{x^a} Z^{z^b'}: repeated qubits multiply.
                if z & a_bit:
                    coeff = -coeff
                if letter == "Y":
                    coeff *= 1j
                x ^= a_bit
                z ^= z_bit
            terms[(x, z)] = terms.get((x, z), 0) + coeff
    # A Hermitian Pauli string is real * i^{#Y} X^x Z^z, #Y = popcount(x & z).
    out = {}
    for (x, z), c in terms.items():
        c = c / (1j ** (bin(x & z).count("1") % 4))
        if abs(c.imag) > 1e-12 * max(1.0, abs(c.real)):
            raise InputError(f"{path}: term X{x:#x} Z{z:#x} is not Hermitian after combining")
        if c.real != 0:
            out[(x, z)] = c.real * (1j ** (bin(x & z).count("1") % 4))
    return out, declared, maxq


# ---------------------------------------------------------------- projected matrix


def build_matrix(basis, terms, nwords):
    n = basis.shape[0]
    is_complex = any(c.imag != 0 for c in terms.values())
    dtype = np.complex128 if is_complex else np.float64
    cast = (lambda c: c) if is_complex else (lambda c: c.real)

    diag = np.zeros(n, dtype=dtype)
    by_flip = {}
    for (x, z), c in terms.items():
        if x == 0:
            if z == 0:
                diag += cast(c)
            else:
                diag += cast(c) * (1.0 - 2.0 * parity_and(basis, split_words(z, nwords)))
        else:
            by_flip.setdefault(x, []).append((split_words(z, nwords), cast(c)))

    if nwords == 1:
        keys = basis[:, 0]
    else:  # big-endian bytes compare like the numbers: lexicographic searchsorted on a void view
        keys = basis.astype(">u8").view(f"V{8 * nwords}").ravel()

    rows, cols, vals = [np.arange(n)], [np.arange(n)], [diag]
    for f, group in by_flip.items():
        fw = split_words(f, nwords)
        top = f.bit_length() - 1
        tw, tb = nwords - 1 - top // 64, top % 64
        half2 = bin(f).count("1")
        # Only s < s^f (top flipped bit is 0) and flips that keep the Hamming weight.
        ok = ((basis[:, tw] >> U64(tb)) & U64(1)) == 0
        pc = None
        for w, m in enumerate(fw):
            if m:
                c = popcount(basis[:, w] & U64(m)).astype(np.int16)
                pc = c if pc is None else pc + c
        ok &= 2 * pc == half2
        idx = np.flatnonzero(ok)
        if idx.size == 0:
            continue
        src = basis[idx]
        tgt = src ^ np.array(fw, dtype=U64)
        if nwords == 1:
            tkey = tgt[:, 0]
        else:
            tkey = tgt.astype(">u8").view(f"V{8 * nwords}").ravel()
        j = np.searchsorted(keys, tkey)
        jc = np.minimum(j, n - 1)
        hit = keys[jc] == tkey
        if not hit.any():
            continue
        i, j, src = idx[hit], jc[hit], src[hit]
        # <s^f| c X^f Z^z |s> = c (-1)^{popcount(s & z)}
        v = np.zeros(i.size, dtype=dtype)
        for zw, c in group:
            v += c * (1.0 - 2.0 * parity_and(src, zw))
        nz = v != 0
        i, j, v = i[nz], j[nz], v[nz]
        rows += [j, i]
        cols += [i, j]
        vals += [v, np.conj(v) if is_complex else v]
    r = np.concatenate(rows)
    c = np.concatenate(cols)
    v = np.concatenate(vals)
    keep = v != 0
    H = sp.csr_matrix((v[keep], (r[keep], c[keep])), shape=(n, n))
    return H, is_complex


def solve(H):
    n = H.shape[0]
    count = [0]
    if n <= 64:  # ARPACK needs k < n and a few Lanczos vectors; tiny spaces go dense
        w, V = np.linalg.eigh(H.toarray())
        lam, v = float(w[0]), V[:, 0]
    else:

        def mv(x):
            count[0] += 1
            return H @ x

        op = spla.LinearOperator((n, n), matvec=mv, dtype=H.dtype)
        v0 = np.random.default_rng(12345).standard_normal(n).astype(H.dtype)
        w, V = spla.eigsh(op, k=1, which="SA", tol=1e-8, v0=v0)
        lam, v = float(w[0]), V[:, 0]
    v = v / np.linalg.norm(v)
    residual = float(np.linalg.norm(H @ v - lam * v))
    return lam, residual, count[0]


# ---------------------------------------------------------------- driver


def run(hamiltonian, samples, weight):
    T = {}
    t_all = t = time.perf_counter()
    states, counts, width = read_samples(samples)
    nrows = states.shape[0]
    T["read"] = time.perf_counter() - t

    t = time.perf_counter()
    uniq, ucounts = dedupe(states, counts)
    del states, counts
    T["dedupe"] = time.perf_counter() - t

    t = time.perf_counter()
    w = popcount(uniq[:, 0]).astype(np.int32)
    for k in range(1, uniq.shape[1]):
        w += popcount(uniq[:, k])
    keep = w == weight
    basis = np.ascontiguousarray(uniq[keep])
    kept_shots = int(ucounts[keep].sum())
    distinct = uniq.shape[0]
    del uniq, ucounts, w
    T["filter"] = time.perf_counter() - t
    if basis.shape[0] == 0:
        raise InputError(f"no sampled configuration has Hamming weight {weight}")

    t = time.perf_counter()
    terms, declared, maxq = parse_hamiltonian(hamiltonian)
    if declared is not None and declared != width:
        raise InputError(f"Hamiltonian declares {declared} qubits, samples have {width}")
    if maxq >= width:
        raise InputError(f"Hamiltonian acts on qubit {maxq}, samples have {width} qubits")
    H, is_complex = build_matrix(basis, terms, basis.shape[1])
    T["build"] = time.perf_counter() - t

    t = time.perf_counter()
    energy, residual, matvecs = solve(H)
    T["solve"] = time.perf_counter() - t
    T["total"] = time.perf_counter() - t_all

    peak_kb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss  # KiB on Linux
    return {
        "energy": energy,
        "residual": residual,
        "dimension": int(H.shape[0]),
        "nonzeros": int(H.nnz),
        "matvecs": matvecs,
        "timings": T,
        "peakRSSMB": peak_kb / 1024.0,
        "qubits": width,
        "rows": int(nrows),
        "distinct": int(distinct),
        "keptShots": kept_shots,
        "complex": is_complex,
        "terms": len(terms),
    }


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.strip().splitlines()[0])
    ap.add_argument("--hamiltonian", required=True)
    ap.add_argument("--samples", required=True)
    ap.add_argument("--weight", type=int, required=True)
    ap.add_argument("--json", action="store_true", help="print one JSON object")
    a = ap.parse_args(argv)
    try:
        res = run(a.hamiltonian, a.samples, a.weight)
    except (InputError, OSError) as e:
        print(f"reference_pipeline: {e}", file=sys.stderr)
        return 2
    if a.json:
        print(json.dumps(res))
    else:
        print(f"energy     {res['energy']:.12f}")
        print(f"residual   {res['residual']:.3e}")
        print(f"dimension  {res['dimension']}  nonzeros {res['nonzeros']}  matvecs {res['matvecs']}")
        print("timings    " + "  ".join(f"{k} {v:.3f}s" for k, v in res["timings"].items()))
        print(f"peak RSS   {res['peakRSSMB']:.1f} MB")
    return 0


if __name__ == "__main__":
    sys.exit(main())
