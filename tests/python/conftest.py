"""Shared helpers of the Python module's tests: the tipgap executable (the CLI the module must agree
with), running it, and comparing the module's dicts with its JSON.

Run by ctest with Debian's /usr/bin/python3 -m pytest, PYTHONPATH=<build>/python and
TIPGAP_EXE=<build>/cli/tipgap."""
import json
import math
import os
import pathlib
import subprocess

import numpy
import pytest

import tipgap

# The module and the CLI call the same library functions on the same doubles, and the CLI's JSON
# prints each double so that it reads back exactly; the issue asks for agreement to 1e-12
# relative, which leaves room only for last-digit differences of unit conversions.
SAME_AS_CLI = 1e-12

SOURCE_DIR = pathlib.Path(__file__).resolve().parents[2]


def tipgap_exe():
    exe = os.environ.get("TIPGAP_EXE")
    if not exe:
        # Beside the module in the build tree: <build>/python/tipgap -> <build>/cli/tipgap.
        exe = str(pathlib.Path(tipgap.__file__).resolve().parents[2] / "cli" / "tipgap")
    if not os.access(exe, os.X_OK):
        pytest.fail("the tipgap executable is needed (TIPGAP_EXE=%s is not executable)" % exe)
    return exe


def run_cli(*args, check=True):
    """Runs the CLI; returns (exit code, stdout, stderr)."""
    p = subprocess.run([tipgap_exe(), *map(str, args)], capture_output=True, text=True)
    if check and p.returncode != 0:
        raise AssertionError("tipgap %s failed (%d): %s" % (" ".join(map(str, args)), p.returncode, p.stderr))
    return p.returncode, p.stdout, p.stderr


def cli_json(*args):
    return json.loads(run_cli(*args, "--format", "json")[1])


def cli_outcome(*args):
    """(exit code, the last line on stderr or None when it succeeded)."""
    rc, _, err = run_cli(*args, check=False)
    lines = err.strip().splitlines()
    return rc, (lines[-1] if rc != 0 and lines else None)


def cli_error(*args):
    """The one line the CLI prints on stderr for a failing command, and its exit code."""
    rc, _, err = run_cli(*args, check=False)
    assert rc != 0, "tipgap %s succeeded; expected an error" % " ".join(map(str, args))
    lines = err.strip().splitlines()
    return lines[-1], rc


def assert_same(py, js, where="", rel=SAME_AS_CLI):
    """py (the module's value) equals js (the CLI's JSON value): numbers to `rel` relative, NaN where
    the JSON has null, texts and lists exactly, dicts key by key with the same keys."""
    if isinstance(js, dict):
        assert isinstance(py, dict), "%s: %r is not a dict" % (where, py)
        assert set(py) == set(js), "%s: keys differ: only module %s, only CLI %s" % (
            where, sorted(set(py) - set(js)), sorted(set(js) - set(py)))
        for k in js:
            assert_same(py[k], js[k], "%s.%s" % (where, k), rel)
    elif js is None:
        assert py is None or (isinstance(py, (float, numpy.floating)) and math.isnan(py)), "%s: %r, CLI null" % (where, py)
    elif isinstance(js, bool) or isinstance(js, str):
        assert py == js, "%s: %r, CLI %r" % (where, py, js)
    elif isinstance(js, (int, float)):
        assert isinstance(py, (int, float, numpy.integer, numpy.floating)), "%s: %r is not a number" % (where, py)
        assert py == js or abs(py - js) <= rel * abs(js), "%s: %r, CLI %r" % (where, py, js)
    elif isinstance(js, list):
        py = list(py)
        assert len(py) == len(js), "%s: %d items, CLI %d" % (where, len(py), len(js))
        for i, (a, b) in enumerate(zip(py, js)):
            assert_same(a, b, "%s[%d]" % (where, i), rel)
    else:
        raise AssertionError("%s: unexpected JSON value %r" % (where, js))


def row(columns, i):
    """Row i of a dict of columns (arrays or lists), as plain Python values."""
    out = {}
    for k, v in columns.items():
        x = v[i]
        out[k] = x.tolist() if isinstance(x, numpy.ndarray) else (x.item() if isinstance(x, numpy.generic) else x)
    return out


@pytest.fixture
def default_config():
    return tipgap.Config.default()
