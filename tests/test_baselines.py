import pytest
from pyscf import cc, ci, fci, gto, mp, scf

import groundkit as gk
from groundkit import baselines, chemistry

NH2_XYZ = "N 0 0 0\nH 0.8018 0 0.6370\nH -0.8018 0 0.6370"


def _mf(spec):
    mol = gto.M(atom=list(zip(spec.symbols, spec.coordinates)), basis=spec.basis, spin=spec.multiplicity - 1,
                verbose=0)
    mf = (scf.RHF(mol) if mol.spin == 0 else scf.ROHF(mol))
    mf.conv_tol = 1e-10
    return mf.run()


def test_frozen_core_baselines_match_pyscf(h2o):
    b = h2o.pipeline().active_space(frozen_core=True).problem().baselines
    mf = _mf(h2o)
    ccsd = cc.CCSD(mf, frozen=1).run(conv_tol=1e-9)
    assert b["hf"] == pytest.approx(mf.e_tot, abs=1e-8)  # PySCF RHF
    assert b["mp2"] == pytest.approx(mp.MP2(mf, frozen=1).run().e_tot, abs=1e-8)  # PySCF MP2
    assert b["cisd"] == pytest.approx(ci.CISD(mf, frozen=1).run().e_tot, abs=1e-7)  # PySCF CISD
    assert b["ccsd"] == pytest.approx(ccsd.e_tot, abs=1e-7)  # PySCF CCSD
    assert b["ccsd(t)"] == pytest.approx(ccsd.e_tot + ccsd.ccsd_t(), abs=1e-7)  # PySCF CCSD(T)
    assert b["fci"] == pytest.approx(fci.FCI(mf).kernel()[0], abs=1e-8)  # PySCF FCI, full space


def test_active_space_baselines_freeze_dropped_orbitals(h2o):
    problem = h2o.pipeline().active_space(electrons=4, orbitals=4).problem()
    mf = _mf(h2o)
    e_ccsd = cc.CCSD(mf, frozen=[0, 1, 2]).run(conv_tol=1e-9).e_tot
    assert problem.baselines["ccsd"] == pytest.approx(e_ccsd, abs=1e-7)  # PySCF CCSD, same frozen orbitals
    assert problem.baselines["casci"] == problem.reference.energy
    assert problem.baselines.space("ccsd") == "active" and problem.baselines.space("fci") == "full"


def test_open_shell_baselines_use_rohf_orbitals():
    nh2 = gk.MoleculeSpec.from_xyz(NH2_XYZ, multiplicity=2)
    b = nh2.pipeline().active_space(frozen_core=True).problem().baselines
    mf = _mf(nh2)
    assert b["ccsd"] == pytest.approx(cc.CCSD(mf, frozen=1).run(conv_tol=1e-9).e_tot, abs=1e-7)  # PySCF UCCSD/ROHF


def test_fci_above_limit_is_missing_with_reason(h2o, monkeypatch):
    problem = h2o.pipeline().active_space(electrons=4, orbitals=4).problem()
    monkeypatch.setattr(baselines, "FCI_DETERMINANT_LIMIT", 10)
    fresh = baselines.Baselines(problem)
    assert fresh["fci"] is None
    assert "limit" in fresh.reason("fci") and "441" in fresh.reason("fci")  # C(7,5)^2 = 441 determinants


def test_non_converging_method_is_missing_not_fatal(monkeypatch):
    spec = gk.MoleculeSpec(symbols=("N", "N"), coordinates=((0, 0, 0), (0, 0, 1.6)))
    problem = spec.pipeline().active_space(frozen_core=True).problem()
    monkeypatch.setattr(chemistry, "CC_MAX_CYCLE", 2)
    fresh = baselines.Baselines(problem)
    assert fresh["ccsd"] is None and "did not converge" in fresh.reason("ccsd")
    assert fresh["ccsd(t)"] is None
    assert fresh["mp2"] is not None  # the others still come
    assert "did not converge" in fresh.table(("mp2", "ccsd"))


def test_unknown_baseline_lists_the_accepted_names(h2o):
    b = h2o.pipeline().active_space(electrons=4, orbitals=4).problem().baselines
    with pytest.raises(KeyError, match="ccsd"):
        b["b3lyp"]
    assert list(b) == list(baselines.METHODS)
