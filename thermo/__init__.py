"""brakeheat's model: heat into each brake corner, the corner heat network, its solution and reports."""

__version__ = "0.1.0"

CAUTION = (
    "CAUTION: these results are engineering estimates, to be confirmed with instrumented running. "
    "The fluid, bearing and pad makers' limits and the series' technical regulations govern; "
    "a qualified engineer signs off."
)
