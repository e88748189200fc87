"""Helpers of the tests of the post-processing commands (tools/post): where things are (from the
environment CTest sets), running a command, running wallrans on a small case, reading PNG sizes."""
import os
import struct
import subprocess
import sys
import tempfile
import unittest
from pathlib import Path

import yaml

SOURCE_DIR = Path(os.environ.get("WALLRANS_SOURCE_DIR", Path(__file__).resolve().parents[2]))
POST_DIR = SOURCE_DIR / "tools" / "post"
PROGRAM = os.environ.get("WALLRANS_PROGRAM", str(SOURCE_DIR / "build" / "wallrans"))
BUILD_DIR = os.environ.get("WALLRANS_BUILD_DIR", str(SOURCE_DIR / "build"))
MPIEXEC = os.environ.get("WALLRANS_MPIEXEC", "mpiexec")
sys.path.insert(0, str(POST_DIR))


def run_command(script, *args, env=None):
    """Runs tools/post/<script> with Debian's python; returns (exit code, stdout, stderr)."""
    done = subprocess.run(
        [sys.executable, str(POST_DIR / script), *map(str, args)],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
        env=env,
    )
    return done.returncode, done.stdout, done.stderr


def run_wallrans(case, folder, ranks=1):
    """Writes `case` (a dict) to folder/case.yaml and runs it into folder/out; returns (exit code, out)."""
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "case.yaml").write_text(yaml.safe_dump(case, sort_keys=False), encoding="utf-8")
    command = [PROGRAM, "run", str(folder / "case.yaml"), "--output-dir", str(folder / "out"), "--quiet"]
    if ranks > 1:
        command = [MPIEXEC, "-n", str(ranks)] + command
    done = subprocess.run(command, stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)
    return done.returncode, folder / "out"


def shipped_case(name):
    with open(SOURCE_DIR / "configs" / f"{name}.yaml", encoding="utf-8") as stream:
        return yaml.safe_load(stream)


def png_size(path):
    """(width, height) from the PNG header (signature, then the IHDR chunk)."""
    with open(path, "rb") as stream:
        head = stream.read(24)
    if head[:8] != b"\x89PNG\r\n\x1a\n" or head[12:16] != b"IHDR":
        raise AssertionError(f"{path}: not a PNG file")
    return struct.unpack(">II", head[16:24])


class TempDirTest(unittest.TestCase):
    """A test case with a temporary folder, self.tmp, removed afterwards."""

    def setUp(self):
        self._tmp = tempfile.TemporaryDirectory(prefix="wallrans_tools_")
        self.tmp = Path(self._tmp.name)

    def tearDown(self):
        self._tmp.cleanup()

    def assert_help(self, script, *texts):
        """--help exits 0 and shows the options and sections named."""
        code, out, _ = run_command(script, "--help")
        self.assertEqual(code, 0)
        for text in texts:
            self.assertIn(text, out)

    def assert_bad_input(self, script, prog, cases):
        """Each (arguments, fragment): exit code 2, nothing on stdout, one line on stderr naming it."""
        for args, fragment in cases:
            code, out, err = run_command(script, *args)
            self.assertEqual(code, 2, args)
            self.assertEqual(out, "", args)
            self.assert_one_line_error(err, prog, fragment)

    def assert_one_line_error(self, stderr, *fragments):
        """A bad input: exactly one line on stderr, naming what was wrong."""
        lines = [line for line in stderr.splitlines() if line.strip()]
        self.assertEqual(len(lines), 1, f"expected one line, got: {stderr!r}")
        for fragment in fragments:
            self.assertIn(fragment, lines[0])
