#!/usr/bin/env python3
"""Checks bench/reference_pipeline.py against full-space diagonalisation built from Kronecker
products of 2x2 Paulis (a construction that shares no code with the peer). Exits 1 on mismatch.

1. 4x4 periodic Heisenberg, H = sum over bonds of XX + YY + ZZ, every weight-8 configuration
   sampled (12870, with split rows and off-sector rows): energy = full-space ground energy.
2. The same, embedded in 100, 128 and 160 qubits with bonds across 64-bit word boundaries.
3. A complex Hamiltonian (odd numbers of Y, a constant, repeated like terms) on a random
   subset of configurations: energy = lowest eigenvalue of the dense projection P H P.
4. If dist/bench/make-case.js exists: the TypeScript generator's 4x4 case gives the same energy.
"""
import itertools
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla

HERE = os.path.dirname(os.path.abspath(__file__))
PEER = os.path.join(HERE, "reference_pipeline.py")
PAULI = {
    "I": sp.identity(2, dtype=complex, format="csr"),
    "X": sp.csr_matrix(np.array([[0, 1], [1, 0]], dtype=complex)),
    "Y": sp.csr_matrix(np.array([[0, -1j], [1j, 0]], dtype=complex)),
    "Z": sp.csr_matrix(np.array([[1, 0], [0, -1]], dtype=complex)),
}
# 4x4 periodic Heisenberg ground energy per S.S bond convention, from memory (-0.70178 J per
# site x 16); sigma.sigma = 4 S.S. Only a loose sanity check: the Kronecker result is the reference.
LITERATURE_E_S = -11.2285

failures = []


def check(name, got, want, tol):
    ok = abs(got - want) <= tol
    print(f"{'ok  ' if ok else 'FAIL'} {name}: got {got:.12f} want {want:.12f} (|diff| {abs(got - want):.2e}, tol {tol:.0e})")
    if not ok:
        failures.append(name)


def bonds(L):
    out = set()
    for r in range(L):
        for c in range(L):
            a = r * L + c
            for b in (r * L + (c + 1) % L, ((r + 1) % L) * L + c):
                out.add((min(a, b), max(a, b)))
    return sorted(out)


def pauli_string_matrix(ops, n):
    """ops: {qubit: letter}; qubit 0 is the least significant bit of the basis index."""
    m = sp.identity(1, dtype=complex, format="csr")
    for q in range(n - 1, -1, -1):
        m = sp.kron(m, PAULI[ops.get(q, "I")], format="csr")
    return m


def full_matrix(terms, n):
    """terms: list of (coeff, [(letter, qubit), ...]); repeated qubits multiply in order."""
    H = sp.csr_matrix((2**n, 2**n), dtype=complex)
    for coeff, ops in terms:
        m = sp.identity(2**n, dtype=complex, format="csr")
        for letter, q in ops:
            m = m @ pauli_string_matrix({q: letter}, n)
        H = H + coeff * m
    return H


def heisenberg_terms(L, relabel=lambda q: q):
    t = []
    for a, b in bonds(L):
        for P in "XYZ":
            t.append((1.0, [(P, relabel(a)), (P, relabel(b))]))
    return t


def hamiltonian_text(terms, qubits):
    lines = [f"qubits {qubits}", "# written by check_reference.py"]
    for coeff, ops in terms:
        lines.append(" ".join([repr(coeff)] + [f"{P}{q}" for P, q in ops]))
    return "\n".join(lines) + "\n"


def write_csv(path, states, width, rng, off_fraction=0.2):
    """states: python ints; splits some over rows, adds off-sector rows, shuffles."""
    rows = []
    for s in states:
        c = 1 + int(rng.geometric(0.5))
        if c >= 2 and rng.random() < 0.3:
            k = int(rng.integers(1, c))
            rows += [(s, k), (s, c - k)]
        else:
            rows.append((s, c))
    for _ in range(int(off_fraction * len(rows))):
        s = states[int(rng.integers(len(states)))] ^ (1 << int(rng.integers(width)))
        rows.append((s, 1 + int(rng.geometric(0.6))))
    order = rng.permutation(len(rows))
    with open(path, "w") as fh:
        fh.write("bitstring,count\n")
        for i in order:
            s, c = rows[i]
            fh.write(f"{s:0{width}b},{c}\n")


def run_peer(ham, csv, weight):
    out = subprocess.run(
        [sys.executable, PEER, "--hamiltonian", ham, "--samples", csv, "--weight", str(weight), "--json"],
        check=True, capture_output=True, text=True,
    )
    return json.loads(out.stdout)


def weight_states(n, k):
    return [sum(1 << q for q in combo) for combo in itertools.combinations(range(n), k)]


def main():
    rng = np.random.default_rng(2024)
    tmp = tempfile.mkdtemp(prefix="bitspan-check-")
    L, n = 4, 16
    heis = heisenberg_terms(L)
    Hfull = full_matrix(heis, n)
    assert abs(Hfull - Hfull.getH()).max() < 1e-12
    e_full = float(spla.eigsh(Hfull, k=1, which="SA", tol=1e-12)[0][0].real)
    print(f"full-space 4x4 ground energy (sigma convention) {e_full:.12f}, per S.S {e_full / 4:.10f}")
    check("literature sanity (from memory, loose)", e_full / 4, LITERATURE_E_S, 1e-3)

    # 1. all weight-8 configurations of 16 qubits
    sector = weight_states(n, n // 2)
    assert len(sector) == 12870
    ham = os.path.join(tmp, "h16.txt")
    csv = os.path.join(tmp, "s16.csv")
    with open(ham, "w") as fh:
        fh.write(hamiltonian_text(heis, n))
    write_csv(csv, sector, n, rng)
    r = run_peer(ham, csv, n // 2)
    check("4x4 all 12870 configurations, dimension", r["dimension"], 12870, 0)
    check("4x4 all 12870 configurations", r["energy"], e_full, 1e-7)
    print(f"     residual {r['residual']:.2e}, matvecs {r['matvecs']}, nonzeros {r['nonzeros']}")

    # 2. embedded in wider registers: active qubit q sits at stride*q + offset, so bonds straddle
    #    word boundaries; 100 takes the two-word split path, 128 and 160 the byte-record path.
    for width, stride, offset in ((100, 6, 3), (128, 8, 7), (160, 10, 9)):
        pos = [stride * q + offset for q in range(n)]
        spare = [p for p in range(width) if p not in pos]
        fixed = sum(1 << p for p in spare[::7])
        kw = n // 2 + bin(fixed).count("1")
        big = [fixed | sum(1 << pos[q] for q in range(n) if (s >> q) & 1) for s in sector]
        ham = os.path.join(tmp, f"h{width}.txt")
        csv = os.path.join(tmp, f"s{width}.csv")
        with open(ham, "w") as fh:
            fh.write(hamiltonian_text(heisenberg_terms(L, lambda q: pos[q]), width))
        write_csv(csv, big, width, rng)
        r = run_peer(ham, csv, kw)
        check(f"{width}-qubit embedding, dimension", r["dimension"], 12870, 0)
        check(f"{width}-qubit embedding", r["energy"], e_full, 1e-7)

    # 3. complex Hamiltonian on a sampled subset; reference = dense P H P from the Kronecker H
    extra = [
        (0.3, [("X", 0), ("Y", 1)]),
        (-0.45, [("Y", 5), ("Z", 6), ("X", 9)]),
        (0.2, [("Z", 3)]),
        (0.1, [("Z", 3)]),  # like terms combine
        (0.25, [("X", 2), ("X", 2), ("Z", 7)]),  # X X = I on qubit 2
        (1.5, []),  # constant
    ]
    terms = heis + extra
    Hc = full_matrix(terms, n)
    assert abs(Hc - Hc.getH()).max() < 1e-12
    subset = sorted(rng.choice(sector, size=3000, replace=False).tolist())
    P = Hc[subset][:, subset].toarray()
    e_sub = float(np.linalg.eigvalsh(P)[0])
    ham = os.path.join(tmp, "hc.txt")
    csv = os.path.join(tmp, "sc.csv")
    with open(ham, "w") as fh:
        fh.write(hamiltonian_text(terms, n))
    write_csv(csv, subset, n, rng)
    r = run_peer(ham, csv, n // 2)
    check("complex Hamiltonian, 3000 sampled configurations, dimension", r["dimension"], 3000, 0)
    check("complex Hamiltonian, 3000 sampled configurations", r["energy"], e_sub, 1e-7)
    if not r["complex"]:
        print("FAIL complex Hamiltonian was not treated as complex")
        failures.append("complex flag")
    # The spectrum cannot see a global complex conjugation (H vs H^T), so compare entries too.
    sys.path.insert(0, HERE)
    import reference_pipeline as peer

    states, _, _ = peer.read_samples(csv)
    basis, _ = peer.dedupe(states, np.ones(states.shape[0], dtype=np.int64))
    basis = basis[peer.popcount(basis[:, 0]) == n // 2]
    terms_p, _, _ = peer.parse_hamiltonian(ham)
    Hp, _ = peer.build_matrix(basis, terms_p, 1)
    assert basis[:, 0].tolist() == subset
    check("complex Hamiltonian, max |entry difference| vs P H P", float(abs(Hp.toarray() - P).max()), 0.0, 1e-12)

    # 4. the TypeScript generator's own files, when built
    js = os.environ.get("MAKE_CASE_JS") or os.path.join(HERE, "..", "dist", "bench", "make-case.js")
    if os.path.exists(js):
        d = os.path.join(tmp, "ts4")
        out = subprocess.run(["node", js, d, "--side", "4", "--distinct", "12870", "--seed", "7"],
                             check=True, capture_output=True, text=True)
        case = json.loads(out.stdout)
        r = run_peer(case["hamiltonian"], case["samples"], case["weight"])
        check("bench/cases.ts 4x4 case, all 12870 configurations", r["energy"], e_full, 1e-7)
    else:
        print("skip bench/cases.ts check (dist/bench/make-case.js not built)")

    if failures:
        print(f"{len(failures)} check(s) failed: {', '.join(failures)}")
        return 1
    print("all reference checks passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
