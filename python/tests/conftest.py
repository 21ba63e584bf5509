"""Shared pieces of the Python tests: where the repository is, and the
command-line binary, which the tests run only to compare the package's
results with what `loopwise ... --format json` prints.

The binary is $LOOPWISE_BIN, else $CARGO_TARGET_DIR/release/loopwise, else
target/release/loopwise in the repository (built by `cargo build --release`
or `cargo test --release`). A missing binary fails the comparisons loudly.
"""

from __future__ import annotations

import os
import subprocess
from pathlib import Path
from typing import List, Tuple

import pytest

import loopwise

REPO = Path(__file__).resolve().parents[2]


def _source_tree_guard() -> None:
    # Importing python/loopwise from the source tree (no native module)
    # would fail obscurely; the installed package is the one under test.
    if not hasattr(loopwise, "expand"):
        raise RuntimeError("loopwise imported without its native module: install it with `pip install ./python`")


_source_tree_guard()


def binary_path() -> Path:
    if os.environ.get("LOOPWISE_BIN"):
        return Path(os.environ["LOOPWISE_BIN"])
    target = os.environ.get("CARGO_TARGET_DIR")
    if target:
        return Path(target) / "release" / "loopwise"
    return REPO / "target" / "release" / "loopwise"


@pytest.fixture(scope="session")
def cli():
    """Runs the loopwise binary in the repository root; returns (exit code, stdout, stderr)."""
    path = binary_path()
    if not path.is_file():
        pytest.fail(
            f"the loopwise binary is not at {path}: build it with `cargo build --release` "
            "(or set LOOPWISE_BIN); the comparisons with the command line need it"
        )

    def run(*args: str) -> Tuple[int, str, str]:
        done = subprocess.run(
            [str(path), *args], cwd=REPO, capture_output=True, text=True, timeout=600
        )
        return done.returncode, done.stdout, done.stderr

    return run


@pytest.fixture
def in_repo(monkeypatch):
    """Makes the repository root the working directory, as the binary's is,
    so that both name files by the same relative path."""
    monkeypatch.chdir(REPO)
    return REPO


def cli_message(stderr: str) -> str:
    """The message of a failed run, without the program's `loopwise: ` prefix."""
    prefix = "loopwise: "
    assert stderr.startswith(prefix), stderr
    return stderr[len(prefix):].rstrip("\n")


__all__: List[str] = ["REPO", "cli_message"]
