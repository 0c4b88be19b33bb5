"""Every example script runs (each well under a minute) and prints what it promises."""

import math
import subprocess
import sys
from pathlib import Path

import pytest

EXAMPLES = Path(__file__).resolve().parents[2] / "examples"


def run(name, *args):
    out = subprocess.run(
        [sys.executable, str(EXAMPLES / name), *args], capture_output=True, text=True, timeout=120
    )
    assert out.returncode == 0, out.stderr
    return out.stdout


def test_compare_throats(tmp_path):
    text = run("compare_throats.py", str(tmp_path))
    assert "ember" in text and "lantern" in text
    assert (tmp_path / "compare_throats.png").stat().st_size > 10_000


def test_calibrate_soft_wall():
    text = run("calibrate_soft_wall.py")
    # c = m_rho^2/4 with m_rho = 0.775 GeV (KKSS hep-ph/0602229; PDG mass, from memory)
    assert f"c = {0.775**2 / 4:.6f}" in text
    # T_c = 0.4917 sqrt(c) (Herzog hep-th/0608151) = 190.5 MeV for this c
    tc = 0.49172780155 * math.sqrt(0.775**2 / 4) * 1000
    assert f"T_c = {tc:.1f} MeV" in text


@pytest.mark.parametrize("name", ["quartic_hard_wall.py"])
def test_quartic_hard_wall(name):
    text = run(name)
    # first zero of J_2 = 5.1356223 (scipy.special.jn_zeros; Boschi-Filho & Braga hep-th/0209080)
    assert "5.135622" in text
    assert "0 failed" in text
