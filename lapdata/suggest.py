"""The one "did you mean" of the project: close matches for a mistyped name, as a phrase."""
from __future__ import annotations

import difflib


def did_you_mean(word, known, n: int = 1, cutoff: float = 0.6) -> str:
    """`` (did you mean 'a'?)`` (or ``'a' or 'b'``, ``'a', 'b' or 'c'``) for up to ``n`` close
    matches of ``word`` among ``known``; an empty string when nothing is close enough.

    >>> did_you_mean("mas_kg", ["mass_kg", "fuel_kg"])
    " (did you mean 'mass_kg'?)"
    >>> did_you_mean("LSDOA", ["LSODA", "BDF", "Radau", "fast"], n=3, cutoff=0.3)
    " (did you mean 'LSODA'?)"
    >>> did_you_mean("zzz", ["mass_kg"])
    ''
    """
    close = difflib.get_close_matches(str(word), [str(k) for k in known], n=n, cutoff=cutoff)
    if not close:
        return ""
    quoted = [f"'{c}'" for c in close]
    words = quoted[0] if len(quoted) == 1 else ", ".join(quoted[:-1]) + " or " + quoted[-1]
    return f" (did you mean {words}?)"
