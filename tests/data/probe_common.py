"""Helpers shared by the PDF probes (run from the tests with the Python reference libraries)."""


def colour(c):
    """A pdfplumber colour as a list of floats rounded to 4 places (None stays None)."""
    if c is None:
        return None
    if isinstance(c, (int, float)):
        return [float(c)]
    return [round(float(v), 4) for v in c]
