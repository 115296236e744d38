#!/usr/bin/env python3
"""Write reference_formulas.tsv: the molecular formula of every SMILES in ligand_sets/, as
RDKit computes it (rdMolDescriptors.CalcMolFormula; `*` atoms removed first), and its net
formal charge. nonet's own Hill formulas are checked against this file in
tests/catalogue_structures.rs. RDKit is only needed to regenerate the file:

    pip install rdkit && python3 tests/data/reference_formulas.py
"""
import pathlib
import tomllib

from rdkit import Chem, rdBase
from rdkit.Chem import rdMolDescriptors

root = pathlib.Path(__file__).resolve().parents[2]
rows = []
for path in sorted((root / "ligand_sets").glob("*.toml")):
    data = tomllib.loads(path.read_text())
    for kind in ("ligand", "substrate"):
        for entry in data.get(kind, []):
            smiles = entry.get("smiles")
            if not smiles:
                continue
            mol = Chem.MolFromSmiles(smiles, sanitize=False)
            mol.UpdatePropertyCache(strict=False)
            # freeze each atom's hydrogens, so taking the metal's `*` away adds none
            for a in mol.GetAtoms():
                a.SetNumExplicitHs(a.GetTotalNumHs())
                a.SetNoImplicit(True)
            dummies = [a.GetIdx() for a in mol.GetAtoms() if a.GetAtomicNum() == 0]
            rw = Chem.RWMol(mol)
            for i in sorted(dummies, reverse=True):
                rw.RemoveAtom(i)
            m = rw.GetMol()
            m.UpdatePropertyCache(strict=False)
            formula = rdMolDescriptors.CalcMolFormula(m)
            # CalcMolFormula appends the net charge ("+", "-2"); keep the element part
            charge = sum(a.GetFormalCharge() for a in m.GetAtoms())
            for suffix in ("+", "-"):
                i = formula.find(suffix)
                if i > 0:
                    formula = formula[:i]
            rows.append((kind, entry["key"], smiles, formula, charge))
out = root / "tests" / "data" / "reference_formulas.tsv"
with out.open("w") as f:
    f.write(f"# RDKit {rdBase.rdkitVersion}: kind, key, smiles, molecular formula (Hill), net formal charge\n")
    for r in rows:
        f.write("\t".join(str(x) for x in r) + "\n")
print(f"{len(rows)} rows -> {out}")
