"""Helpers shared by the PDF probes (run from the tests with the Python reference libraries)."""


def colour(c):
    """A pdfplumber colour as a list of floats rounded to 4 places (None stays None)."""
    if c is None:
        return None
    if isinstance(c, (int, float)):
        return [float(c)]
    return [round(float(v), 4) for v in c]


def require(*names):
    """Import the named reference libraries; if one is missing, exit 3 with a message so the
    calling test fails clearly (it must fail, not skip)."""
    import importlib
    import sys

    try:
        return tuple(importlib.import_module(n) for n in names)
    except ImportError as e:
        print(f"missing Python reference library: {e}; install with pip install -r scripts/requirements-test.txt",
              file=sys.stderr)
        sys.exit(3)
