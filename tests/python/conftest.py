"""Shared helpers of the Python tests: paths, the command-line program, reference transforms.

ctest sets PYTHONPATH to the built module, QFTPLAN_BINARY to the built program and QFTPLAN_SOURCE_DIR
to the repository (tests/CMakeLists.txt)."""

import os
import pathlib
import shlex
import subprocess
import sys

import numpy as np
import pytest

sys.path.insert(0, str(pathlib.Path(__file__).parent))

SOURCE_DIR = pathlib.Path(os.environ.get("QFTPLAN_SOURCE_DIR", pathlib.Path(__file__).resolve().parents[2]))
BINARY = os.environ.get("QFTPLAN_BINARY", "qftplan")
TOPOLOGIES = SOURCE_DIR / "topologies"
SCHEMAS = SOURCE_DIR / "schemas"


def run_cli(*args, check=False):
    """Runs the qftplan program; returns (exit status, stdout, stderr)."""
    proc = subprocess.run([BINARY, *map(str, args)], capture_output=True, text=True)
    if check and proc.returncode != 0:
        raise AssertionError(f"qftplan {shlex.join(map(str, args))} failed: {proc.stderr}")
    return proc.returncode, proc.stdout, proc.stderr


def qft_matrix(n, inverse=False):
    """The QFT on n qubits from numpy's FFT. numpy.fft.ifft computes a_m = (1/N) sum_k A_k exp(2 pi i m k / N)
    (numpy documentation, numpy.fft module, "Implementation details"), so sqrt(N) * ifft of the basis
    vector e_j is 2^(-n/2) sum_y exp(2 pi i j y / 2^n) e_y: the QFT of Nielsen & Chuang (2000), section 5.1,
    eq. 5.2. The inverse QFT is fft / sqrt(N) (numpy's fft has the opposite sign). Column j is the image of |j>."""
    dim = 2 ** n
    eye = np.eye(dim)
    if inverse:
        return np.fft.fft(eye, axis=0) / np.sqrt(dim)
    return np.sqrt(dim) * np.fft.ifft(eye, axis=0)


def aqft_matrix(n, degree, inverse=False):
    """The approximate QFT of degree M straight from its definition, not from a circuit: the exact QFT's
    phase 2 pi j y / 2^n = 2 pi sum_{a,b} j_a y_b 2^(a+b-n) loses its integer terms (a+b >= n), and the
    AQFT keeps only the terms with 1 <= n-a-b <= M, i.e. rotations of angle at least 2 pi / 2^M
    (Coppersmith, IBM research report RC19642, 1994; Barenco, Ekert, Suominen and Torma, Phys. Rev. A
    54, 139, 1996, section II)."""
    dim = 2 ** n
    j = np.arange(dim)
    phase = np.zeros((dim, dim))
    for a in range(n):
        for b in range(n):
            d = n - a - b
            if 1 <= d <= degree:
                phase += np.outer((j >> b) & 1, (j >> a) & 1) / 2.0 ** d  # [y, j]
    u = np.exp(2j * np.pi * phase) / np.sqrt(dim)
    return u.conj().T if inverse else u


@pytest.fixture(scope="session")
def qftplan():
    import qftplan as module
    return module
