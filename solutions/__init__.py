"""solutions: from a formulation recipe to every concentration basis and the solution's
density, water activity, vapor pressure, freezing and boiling points and osmolality.

Data flow, one way: recipe table → :mod:`solutions.recipe` (parse, resolve) →
:class:`solutions.composition.Composition` → :mod:`solutions.density`,
:mod:`solutions.activity`, :mod:`solutions.colligative` → :mod:`solutions.evaluate` →
command line, dashboard and report files.
"""
from ._version import __version__  # noqa: E402
from .errors import (Caveat, IngredientError, OutOfRangeError, RecipeError,  # noqa: E402
                     SolutionsError, TargetError, UnitParseError)

__all__ = ["__version__", "Caveat", "IngredientError", "OutOfRangeError", "RecipeError",
           "SolutionsError", "TargetError", "UnitParseError", "read_recipe", "resolve",
           "evaluate"]


def __getattr__(name):  # lazy: keep `import solutions` light for the command line
    if name in ("read_recipe", "resolve"):
        from . import recipe
        return getattr(recipe, name)
    if name == "evaluate":
        from .evaluate import evaluate
        return evaluate
    raise AttributeError(name)
