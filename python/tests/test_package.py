"""The installed package: typed (py.typed and the native module's stubs),
documented, and free of a sympy import until sympy is asked for."""

from __future__ import annotations

import inspect
import subprocess
import sys
from pathlib import Path

import loopwise
from loopwise import _native


def test_the_package_ships_its_type_information():
    folder = Path(loopwise.__file__).parent
    assert (folder / "py.typed").is_file()
    stub = (folder / "_native.pyi").read_text()
    for name in ("expand", "at", "scan", "check", "origin", "identify", "evaluate", "status", "tree"):
        assert f"def {name}(" in stub, name


def test_every_public_name_and_native_function_has_a_docstring():
    for name in loopwise.__all__:
        obj = getattr(loopwise, name)
        assert inspect.getdoc(obj), name
    for name in ("expand", "at", "scan", "check", "origin", "identify", "evaluate", "status", "tree"):
        assert inspect.getdoc(getattr(_native, name)), name
    assert loopwise.__version__ == _native.__version__


def test_importing_loopwise_does_not_import_sympy():
    code = "import sys, loopwise; loopwise.expand('cusp', 2); print('sympy' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip() == "False"
