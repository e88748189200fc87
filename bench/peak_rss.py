#!/usr/bin/python3
"""Runs a command and writes its peak resident set size in KiB to PREFIX.<MPI rank>.

Usage (under mpirun, one wrapper per rank): peak_rss.py PREFIX COMMAND [ARGS...]
The rank comes from OpenMPI's environment (0 without mpirun). The exit code is the command's.
"""
import os
import resource
import signal
import subprocess
import sys


def main():
    if len(sys.argv) < 3:
        sys.exit(__doc__)
    prefix, command = sys.argv[1], sys.argv[2:]
    rank = os.environ.get("OMPI_COMM_WORLD_RANK", "0")
    child = subprocess.Popen(command)
    # The launcher signals this wrapper, not the program: pass termination on.
    for sig in (signal.SIGTERM, signal.SIGINT):
        signal.signal(sig, lambda number, _frame: child.send_signal(number))
    code = child.wait()
    kib = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss  # KiB on Linux
    with open(f"{prefix}.{rank}", "w") as out:
        out.write(f"{kib}\n")
    sys.exit(code if code >= 0 else 128 - code)


if __name__ == "__main__":
    main()
