"""Command-line conventions of the post-processing commands: bad input is one line on stderr
naming the file or option and what was expected, exit code 2; argparse's own usage errors also
exit 2."""
import argparse
import math
import sys

EXIT_OK, EXIT_FAILED, EXIT_BAD_INPUT = 0, 1, 2


class InputError(Exception):
    """Bad input (file, option, run directory); the message is one line."""


class Parser(argparse.ArgumentParser):
    """argparse with the examples printed after the options and a one-line error message."""

    def __init__(self, prog, description, examples):
        super().__init__(
            prog=prog,
            description=description,
            epilog="examples:\n" + examples,
            formatter_class=argparse.RawDescriptionHelpFormatter,
        )

    def error(self, message):
        self.exit(EXIT_BAD_INPUT, f"{self.prog}: {message} (see {self.prog} --help)\n")


def run(prog, main, argv=None):
    """Runs main(argv); turns InputError into one line on stderr and exit code 2."""
    try:
        code = main(sys.argv[1:] if argv is None else argv)
    except InputError as error:
        print(f"{prog}: {error}", file=sys.stderr)
        code = EXIT_BAD_INPUT
    except BrokenPipeError:
        code = EXIT_FAILED
    sys.exit(code)


def positive_number(text):
    """argparse type: a finite number > 0."""
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a positive number, got '{text}'") from None
    if not math.isfinite(value) or value <= 0.0:
        raise argparse.ArgumentTypeError(f"expected a positive number, got '{text}'")
    return value


def positive_integer(text):
    """argparse type: an integer >= 1."""
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a positive integer, got '{text}'") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"expected a positive integer, got '{text}'")
    return value
