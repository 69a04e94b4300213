#!/usr/bin/env python3
"""Independent numpy/scipy peer of the bitspan pipeline, for the benchmark.

What a careful practitioner would write: vectorised byte-level CSV parsing, states packed
into uint64 words, sort-based dedupe, searchsorted lookups per flip mask, CSR + ARPACK.

usage: reference_pipeline.py --hamiltonian FILE --samples FILE.csv --weight K [--json]

JSON: energy, residual |Hv - Ev|, dimension, nonzeros, matvecs (ARPACK's), timings in seconds
(read, dedupe, filter, build incl. Hamiltonian parsing, solve incl. residual, total = their sum
as wall time), startup (imports, not in total), peakRSSMB. BITSPAN_PEER_MALLOC_TUNING=0 turns
off the glibc malloc tuning below.
"""
import os
import time

_T_START = time.perf_counter()  # to report interpreter + numpy/scipy import time separately

# Single-threaded BLAS so the comparison is per core; must precede the numpy import.
for _v in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS", "BLIS_NUM_THREADS"):
    os.environ[_v] = "1"

import argparse  # noqa: E402
import json  # noqa: E402
import resource  # noqa: E402
import sys  # noqa: E402


def _keep_freed_memory():
    """Stop glibc handing multi-MB numpy temporaries back to the kernel after each op.

    Otherwise every temporary is a fresh mmap whose pages fault (and, with transparent huge
    pages, get zeroed) again; on this machine that made elementwise ops ~10x slower.
    """
    try:
        import ctypes

        libc = ctypes.CDLL("libc.so.6")
        libc.mallopt(-3, 1 << 30)  # M_MMAP_THRESHOLD
        libc.mallopt(-1, 1 << 30)  # M_TRIM_THRESHOLD
    except (OSError, AttributeError):
        pass


if os.environ.get("BITSPAN_PEER_MALLOC_TUNING", "1") != "0":
    _keep_freed_memory()

import numpy as np  # noqa: E402
import scipy.sparse as sp  # noqa: E402
import scipy.sparse.linalg as spla  # noqa: E402

U64 = np.uint64


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


def split_words(mask, nwords):
    """Python int bit mask -> list of nwords uint64 ints, most significant word first."""
    return [(mask >> (64 * (nwords - 1 - w))) & 0xFFFFFFFFFFFFFFFF for w in range(nwords)]


# ---------------------------------------------------------------- reading samples


ASCII0 = 0x3030303030303030  # eight '0' characters read as one little-endian uint64
LOW_BITS = 0x0101010101010101
GATHER = 0x8040201008040201  # (x * GATHER) >> 56 packs the low bits of x's 8 bytes, byte 0 first


def _parse_block(area, starts, ends, width, nwords, where):
    """Rows whose bitstring/count bytes lie in `area`; returns (states (rows, W), counts)."""
    nb = 8 * nwords
    # Every byte offset as an (unaligned, overlapping) uint64: element i = bytes i..i+7.
    v8 = np.ndarray(shape=(area.size - 7,), dtype="<u8", buffer=area, strides=(1,))
    # Blocks of 8 characters ending exactly at the comma; leading blocks reach back before
    # the row start (64 bytes of padding cover the first row) and get masked to '0'.
    p0 = starts + (width - 8 * nb)
    m = v8[p0[:, None] + np.arange(0, 8 * nb, 8)]
    lead = 8 * nb - width
    for k in range(nb):
        g = min(8, max(0, lead - 8 * k))
        if g:
            low = (1 << (8 * g)) - 1
            m[:, k] = (m[:, k] & U64(~low & 0xFFFFFFFFFFFFFFFF)) | U64(ASCII0 & low)
    if np.any((m & U64(~LOW_BITS & 0xFFFFFFFFFFFFFFFF)) != U64(ASCII0)):
        raise InputError(f"{where}: bitstring characters other than 0/1, or rows of different widths")
    m -= U64(ASCII0)
    m *= U64(GATHER)
    m >>= U64(56)  # now one byte value per block, first character = most significant bit
    m = m.reshape(-1, nwords, 8) << np.arange(56, -1, -8, dtype=U64)
    states = np.bitwise_or.reduce(m, axis=2)
    # Counts: the ASCII digits after the comma, Horner-style one digit column at a time.
    if np.any(area[starts + width] != 44):
        raise InputError(f"{where}: bitstrings do not all have width {width}")
    p = starts + width + 1
    lens = ends - p
    if lens.min() < 1 or lens.max() > 18:
        raise InputError(f"{where}: missing or oversized count")
    counts = np.zeros(starts.size, dtype=np.int64)
    for d in range(int(lens.max())):
        live = d < lens
        c = area[np.where(live, p + d, p)].astype(np.int64) - 48
        if np.any(live & ((c < 0) | (c > 9))):
            raise InputError(f"{where}: count is not a non-negative integer")
        counts = np.where(live, counts * 10 + c, counts)
    return states, counts


def read_samples(path, block_bytes=8 << 20):
    """Streams the CSV in blocks; returns (states (rows, W) uint64, word 0 most significant,
    counts int64, width). Qubit 0 is the rightmost character."""
    PAD = 64
    width = None
    parts_s, parts_c = [], []
    carry = b""
    header_checked = False
    with open(path, "rb") as fh:
        while True:
            chunk = fh.read(block_bytes)
            eof = not chunk
            data = carry + chunk
            if eof:
                if not data:
                    break
                if not data.endswith(b"\n"):
                    data += b"\n"
                cut = len(data)
            else:
                cut = data.rfind(b"\n") + 1
                if cut == 0:
                    if len(data) > (1 << 26):
                        raise InputError(f"{path}: no line break in 64 MiB")
                    carry = data
                    continue
            carry = data[cut:]
            area = np.empty(PAD + cut, dtype=np.uint8)
            area[:PAD] = 48
            area[PAD:] = np.frombuffer(data, dtype=np.uint8, count=cut)
            nl = np.flatnonzero(area[PAD:] == 10) + PAD
            starts = np.empty_like(nl)
            starts[0] = PAD
            starts[1:] = nl[:-1] + 1
            ends = nl.copy()
            cr = ends > starts
            cr[cr] = area[ends[cr] - 1] == 13
            ends[cr] -= 1
            keep = ends > starts  # blank lines
            starts, ends = starts[keep], ends[keep]
            if not header_checked and starts.size:
                header_checked = True
                if area[starts[0]] not in (48, 49):  # e.g. "bitstring,count"
                    starts, ends = starts[1:], ends[1:]
            if starts.size == 0:
                if eof:
                    break
                continue
            if width is None:
                first = bytes(area[starts[0]:ends[0]])
                width = first.find(b",")
                if width <= 0:
                    raise InputError(f"{path}: first row has no comma: {first[:80]!r}")
            st, ct = _parse_block(area, starts, ends, width, (width + 63) // 64, path)
            parts_s.append(st)
            parts_c.append(ct)
            if eof:
                break
    if not parts_s:
        raise InputError(f"{path}: no sample rows")
    return np.concatenate(parts_s), np.concatenate(parts_c), width


def _dense_rank(a):
    """Rank of each value among the distinct values of a (0-based), and the number of them."""
    o = np.argsort(a)
    s = a[o]
    new = np.ones(a.size, dtype=bool)
    new[1:] = s[1:] != s[:-1]
    r = np.empty(a.size, dtype=np.int64)
    r[o] = np.cumsum(new) - 1
    return r, int(r[o[-1]]) + 1


def dedupe(states, counts):
    """Sorted distinct states with summed counts."""
    if states.shape[1] == 1:
        order = np.argsort(states[:, 0])
    elif states.shape[1] == 2:
        # Pack (rank of hi word, rank of lo word) into one int64: three fast 1-D argsorts
        # instead of a lexsort or a sort of 16-byte records.
        rh, _ = _dense_rank(states[:, 0])
        rl, nl = _dense_rank(states[:, 1])
        order = np.argsort(rh * nl + rl)
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
    cols = [np.ascontiguousarray(basis[:, w]) for w in range(nwords)]  # one 1-D array per word

    def parity(sel, zw):
        """popcount(state & z) mod 2 over the selected rows (None = all), as uint8."""
        acc = None
        for w, m in enumerate(zw):
            if m:
                x = (cols[w] if sel is None else cols[w][sel]) & U64(m)
                acc = x if acc is None else acc ^ x
        if acc is None:
            return None
        return popcount(acc) & np.uint8(1)

    # diag = sum c (1 - 2 parity) = sum c - 2 sum c parity
    diag = np.zeros(n, dtype=dtype)
    by_flip = {}
    for (x, z), c in terms.items():
        if x == 0:
            diag += cast(c)
            if z:
                diag -= (2 * cast(c)) * parity(None, split_words(z, nwords))
        else:
            by_flip.setdefault(x, []).append((split_words(z, nwords), cast(c)))

    MISS = U64(0xFFFFFFFFFFFFFFFF)
    split = 0
    if nwords == 2:
        # Two words: split the state into top = state >> b and the low b bits, with
        # 64 - b bits enough to rank every distinct top. (rank(top) << b) | low is then one
        # uint64 that is monotone in the sorted basis, and a flip that leaves the top alone
        # needs no rank search at all.
        split = 64 - max(1, n.bit_length())
        if int(cols[0].max()) >> split:
            split = 0  # too many qubits for this trick
    if nwords == 1:
        keys = cols[0]
    elif split:
        sh, bmask = U64(split), U64((1 << split) - 1)
        topv = (cols[0] << U64(64 - split)) | (cols[1] >> sh)
        new = np.ones(n, dtype=bool)
        new[1:] = topv[1:] != topv[:-1]
        uniq_top = topv[new]
        rank = (np.cumsum(new) - 1).astype(U64)
        low = cols[1] & bmask
        keys = (rank << sh) | low
    else:  # big-endian bytes compare like the numbers: lexicographic searchsorted on a void view
        keys = basis.astype(">u8").view(f"V{8 * nwords}").ravel()

    def lookup(idx, fw):
        """Positions in the basis of state[idx] ^ f, and which of them exist."""
        if nwords == 1:
            tkey = cols[0][idx] ^ U64(fw[0])
        elif split:
            if fw[0] >> split:  # sets a qubit that no basis state has
                return idx, np.zeros(idx.size, dtype=bool)
            ftop = ((fw[0] << (64 - split)) | (fw[1] >> split)) & 0xFFFFFFFFFFFFFFFF
            if ftop == 0:
                r = rank[idx]
                known = None
            else:
                qtop = topv[idx] ^ U64(ftop)
                r = np.searchsorted(uniq_top, qtop)
                np.minimum(r, uniq_top.size - 1, out=r)
                known = uniq_top[r] == qtop
                r = r.astype(U64)
            tkey = (r << sh) | (low[idx] ^ U64(fw[1] & ((1 << split) - 1)))
            if known is not None:
                tkey[~known] = MISS  # larger than every key, so a miss below
        else:
            tgt = np.empty((idx.size, nwords), dtype=">u8")
            for w in range(nwords):
                tgt[:, w] = cols[w][idx] ^ U64(fw[w])
            tkey = tgt.view(f"V{8 * nwords}").ravel()
        j = np.searchsorted(keys, tkey)
        np.minimum(j, n - 1, out=j)
        return j, keys[j] == tkey

    itype = np.int32 if n < 2**31 else np.int64  # halves the index memory of the assembly
    d = np.flatnonzero(diag).astype(itype)
    rows, colidx, vals = [d], [d], [diag[d]]
    for f, group in by_flip.items():
        fw = split_words(f, nwords)
        nflip = bin(f).count("1")
        if nflip % 2:
            continue  # an odd number of flips always changes the weight
        # Keep s < s^f (top flipped bit is 0) and flips that keep the Hamming weight.
        if nflip == 2:  # both at once: exactly the lower flipped bit is set
            lw = split_words(f & -f, nwords)
            ok = None
            for w, m in enumerate(fw):
                if m:
                    t = (cols[w] & U64(m)) == U64(lw[w])
                    ok = t if ok is None else ok & t
        else:
            top = f.bit_length() - 1
            tw, tb = nwords - 1 - top // 64, top % 64
            ok = ((cols[tw] >> U64(tb)) & U64(1)) == 0
            pc = None
            for w, m in enumerate(fw):
                if m:
                    c = popcount(cols[w] & U64(m))
                    pc = c if pc is None else pc + c
            ok &= pc == nflip // 2
        idx = np.flatnonzero(ok)
        if idx.size == 0:
            continue
        j, hit = lookup(idx, fw)
        if not hit.any():
            continue
        i, j = idx[hit].astype(itype), j[hit].astype(itype)
        # <s^f| c X^f Z^z |s> = c (-1)^{popcount(s & z)}
        v = np.zeros(i.size, dtype=dtype)
        for zw, c in group:
            v += c
            p = parity(i, zw)
            if p is not None:
                v -= (2 * c) * p
        nz = v != 0
        if not nz.all():
            i, j, v = i[nz], j[nz], v[nz]
        rows += [j, i]
        colidx += [i, j]
        vals += [v, np.conj(v) if is_complex else v]
    r = np.concatenate(rows)
    del rows
    c = np.concatenate(colidx)
    del colidx
    v = np.concatenate(vals)
    del vals
    H = sp.csr_matrix((v, (r, c)), shape=(n, n))  # coo -> csr: counting sort by row
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
    startup = time.perf_counter() - _T_START  # imports; not part of "total"
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
        "startup": startup,
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
