#!/usr/bin/env python3
"""Checks Tinct's colouring refutations with an outside DRAT checker (dratify, from PyPI).

Usage:
    pip install dratify
    TINCT_PROOF_DIR=/tmp/tinct-proofs cargo test --no-default-features --test tests \
        colouring::proof_files_for_outside_checkers
    python3 tests/scripts/check_drat.py /tmp/tinct-proofs

Every NAME.cnf in the folder must have a NAME.drat beside it, and dratify must accept the pair.
Formulas that fall to unit propagation (any K4 with its colours fixed) accept any proof, so the
script reports them apart and demands at least one formula that needs real lemmas. The Rust test suite does not depend
on this script.
"""

import pathlib
import sys

from dratify import check_proof, parse_dimacs


def main() -> int:
    if len(sys.argv) != 2:
        print(__doc__)
        return 2
    folder = pathlib.Path(sys.argv[1])
    cnfs = sorted(folder.glob("*.cnf"))
    if not cnfs:
        print(f"no .cnf files in {folder}")
        return 2
    failures = 0
    nontrivial = 0
    for cnf_path in cnfs:
        drat_path = cnf_path.with_suffix(".drat")
        formula_text = cnf_path.read_text()
        proof_text = drat_path.read_text()
        result = check_proof(parse_dimacs(formula_text), proof_text)
        lemmas = [l for l in proof_text.splitlines() if l.strip() and not l.startswith("d")]
        # A formula refuted by unit propagation alone accepts any proof, so it proves nothing
        # about the proof pipeline; for the others, a proof with every lemma removed must fail.
        trivial = check_proof(parse_dimacs(formula_text), "0\n").ok
        status = "ok" if result.ok else "REJECTED"
        if trivial:
            print(f"{cnf_path.name}: {status} ({len(lemmas)} lemmas; refuted by unit "
                  f"propagation alone)")
            failures += 0 if result.ok else 1
            continue
        nontrivial += 1
        print(f"{cnf_path.name}: {status} ({len(lemmas)} lemmas); empty proof rejected")
        if not result.ok:
            failures += 1
    if nontrivial == 0:
        print("no proof needed more than unit propagation: nothing was really tested")
        return 1
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
