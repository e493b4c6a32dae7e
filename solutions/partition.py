"""Preservative partition in an oil-in-water emulsion: Nernst distribution with ionization and
micellar binding.

A preservative added to an emulsion spreads over three places: the oil droplets, the water phase
(free un-ionized molecules, free ions) and the surfactant micelles in the water. Only the free
un-ionized molecules in the water are usually held to act on microbes (Bean, Heman-Ackah & Thomas
1965; Kazmi & Mitchell 1978), so the number a formulator needs is that concentration, and its
inverse: how much to add so that it reaches a target.

Model (per m³ of emulsion; ``phi`` = oil volume fraction; ``u`` = free un-ionized concentration in
the water phase [kg/m³ of water phase]):

* Nernst: only the un-ionized form enters the oil, ``c_oil = K u`` (``K`` the oil/water partition
  coefficient of the un-ionized form, by volume concentrations);
* Henderson–Hasselbalch: the water phase holds ``u / f`` free preservative, with the un-ionized
  fraction ``f = 1 / (1 + 10^(pH − pKa))`` for an acid and ``1 / (1 + 10^(pKa − pH))`` for a base
  (pKa of its conjugate acid);
* micellar binding of the un-ionized form (Garrett 1966; Bean 1972; Kazmi & Mitchell 1978):
  bound = ``u k S`` with ``S`` the surfactant concentration in the water phase and ``k`` the
  binding constant, so that total/free = ``R = 1 + k S`` for an un-ionized preservative;
* mass balance: ``c = (1 − phi) u (1/f + k S) + phi K u``.

With ``f = 1`` and ``k = 0`` this is Bean's expression ``C_w = C (θ + 1) / (K θ + 1)`` with the
oil:water ratio ``θ = phi / (1 − phi)``; with binding, ``C_w = C (θ + 1) / (K θ + R)`` (Bean 1972).

Data (``data/partition.csv``): log K_ow, pKa, kind (acid/base/neutral), parent acid of a salt and,
where cited, the intrinsic water solubility, each with its source. Oil/water coefficients come from
a measured ``K`` or from log K_ow through a published linear free-energy relation
(``data/oil_lfer.csv``); octanol itself is the documented default and carries a warning, because
real oils differ from it by orders of magnitude (Bean 1972, Table VII: methylparaben 0.02 in liquid
paraffin, 7.5 in soya oil).

A computed free concentration does not prove preservation: preservative efficacy testing per the
pharmacopoeia decides (see :data:`EFFICACY_CAUTION`).

References
----------
Bean, H. S., Heman-Ackah, S. M. & Thomas, J. (1965) The activity of antibacterials in two-phase
systems. J. Soc. Cosmet. Chem. 16, 15–30. (Author names from memory; title, journal and tables
read on the journal's online library pages.)
Bean, H. S. (1972) Preservatives for pharmaceuticals. J. Soc. Cosmet. Chem. 23, 703–720.
Garrett, E. R. (1966) J. Pharm. Pharmacol. 18, 589 (form of the binding term; from memory).
Kazmi, S. J. & Mitchell, A. G. (1978) J. Pharm. Sci. 67, 1260–1266.
"""
from __future__ import annotations

import csv
import math
from dataclasses import dataclass, field
from functools import cache
from importlib import resources

import numpy as np

from .errors import Caveat, OutOfRangeError, SolutionsError, TargetError, merge_caveats

__all__ = ["PartitionEntry", "OilRelation", "PartitionResult", "PartitionDataError",
           "partition_data", "partition_rows", "partition_entry", "oil_relations",
           "fraction_unionized",
           "oil_partition_coefficient", "free_unionized_water", "total_for_free", "distribute",
           "total_needed", "phase_profile", "EFFICACY_CAUTION", "BINDING_UNIT_KG_PER_M3",
           "DEFAULT_OIL"]

#: the reference oil used when none is named (the octanol/water system itself)
DEFAULT_OIL = "octanol"

#: a binding constant is given per % w/v of surfactant (Bean 1972; Kazmi & Mitchell 1978);
#: 1 % w/v = 10 kg/m³
BINDING_UNIT_KG_PER_M3 = 10.0

#: the caution every partition result carries
EFFICACY_CAUTION = (
    "Preservative efficacy: a computed free concentration does not prove that a product is "
    "preserved. Partition coefficients, binding and pKa shift with oil type, surfactant, "
    "temperature and other ingredients, and the ionized form may still act. Preservative "
    "efficacy testing (challenge test) per the pharmacopoeia (e.g. Ph. Eur. 5.1.3, USP <51>) "
    "on the finished product decides; use permitted preservative levels for the product's "
    "market and defer to licensed practice.")

_KINDS = ("acid", "base", "neutral")


class PartitionDataError(SolutionsError, KeyError):
    """A preservative or oil has no entry, or lacks the value a calculation needs."""

    def __init__(self, name: str, reason: str):
        self.name, self.reason = name, reason
        super().__init__(f"{name!r}: {reason}")

    def __str__(self) -> str:
        return self.args[0]


# ------------------------------------------------------------------------------- data
@dataclass(frozen=True)
class PartitionEntry:
    """One row of ``data/partition.csv`` (values at 25 °C).

    M : molar mass of the ingredient as weighed [kg/mol]
    solubility : intrinsic water solubility of the un-ionized form [kg/m³], ``None`` if not cited
    """

    key: str
    name: str
    formula: str
    kind: str
    parent: str
    log_Kow: float | None
    log_Kow_source: str
    pKa: float | None
    pKa_source: str
    M: float
    solubility: float | None
    solubility_source: str
    solubility_T_C: float | None = None

    @property
    def is_salt(self) -> bool:
        return bool(self.parent)


@dataclass(frozen=True)
class OilRelation:
    """log10 K_oil/water = a log10 K_ow + b, fitted over log K_ow in [lo, hi] (None: not stated)."""

    oil: str
    label: str
    a: float
    b: float
    log_Kow_min: float | None
    log_Kow_max: float | None
    source: str


def _rows(name: str) -> list[dict]:
    path = resources.files("solutions.data") / name
    with path.open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(ln for ln in fh if not ln.startswith("#")))


def _opt(text: str) -> float | None:
    t = (text or "").strip()
    return float(t) if t else None


def _molar_mass(key: str, formula: str) -> float:
    """Molar mass [kg/mol]: the ingredient library's when it has the key, else from the formula."""
    from .ingredients import default_library, molar_mass_from_formula
    lib = default_library()
    if key in lib:
        return lib.get(key).M
    return molar_mass_from_formula(formula)


@cache
def partition_data() -> dict[str, PartitionEntry]:
    """Every preservative row of ``data/partition.csv``, keyed by ingredient key (loaded once)."""
    out = {}
    for r in _rows("partition.csv"):
        kind = r["kind"].strip()
        if kind not in _KINDS:
            raise PartitionDataError(r["key"], f"kind must be one of {_KINDS}, got {kind!r}")
        sol = _opt(r["solubility_g_per_L"])  # g/L = kg/m³
        out[r["key"]] = PartitionEntry(
            key=r["key"], name=r["name"], formula=r["formula"], kind=kind,
            parent=r["parent"].strip(), log_Kow=_opt(r["log_Kow"]),
            log_Kow_source=r["log_Kow_source"], pKa=_opt(r["pKa"]), pKa_source=r["pKa_source"],
            M=_molar_mass(r["key"], r["formula"]), solubility=sol,
            solubility_source=r["solubility_source"],
            solubility_T_C=_opt(r["solubility_T_C"]))
    return out


def partition_rows() -> list[dict]:
    """The partition data as plain rows (for ingredient listings): key, log_Kow, pKa, kind…"""
    return [{"key": e.key, "name": e.name, "kind": e.kind, "parent": e.parent or None,
             "log_Kow": e.log_Kow, "pKa": e.pKa,
             "solubility_g_per_L": e.solubility, "log_Kow_source": e.log_Kow_source,
             "pKa_source": e.pKa_source} for e in partition_data().values()]


def partition_entry(name: str) -> PartitionEntry:
    """The entry for an ingredient key or name (looked up through the ingredient library when it
    knows the name, else by this table's own keys and names)."""
    data = partition_data()
    from .errors import IngredientError
    from .ingredients import default_library
    key = None
    try:
        key = default_library().get(name).key
    except IngredientError:
        pass
    if key not in data:
        norm = str(name).strip().lower().replace("-", "").replace(" ", "").replace("_", "")
        for e in data.values():
            if norm in (e.key.replace("_", ""), e.name.lower().replace(" ", "").replace("-", "")):
                key = e.key
                break
    if key not in data:
        raise PartitionDataError(str(name), "no partition data (log K_ow, pKa) for this "
                                 "ingredient; known: " + ", ".join(sorted(data)))
    return data[key]


@cache
def oil_relations() -> dict[str, OilRelation]:
    """The oil/octanol relations of ``data/oil_lfer.csv``, keyed by oil name."""
    return {r["oil"]: OilRelation(r["oil"], r["label"], float(r["a"]), float(r["b"]),
                                  _opt(r["log_Kow_min"]), _opt(r["log_Kow_max"]), r["source"])
            for r in _rows("oil_lfer.csv")}


# ---------------------------------------------------------------------------- physics
def fraction_unionized(pH, pKa, kind: str = "acid"):
    """Fraction of the dissolved preservative in its un-ionized form [1].

    pH : pH of the water phase [1]; ``None`` ignores ionization (returns 1)
    pKa : acid dissociation constant of the acid, or of a base's conjugate acid [1]
    kind : ``"acid"``, ``"base"`` or ``"neutral"``

    Henderson–Hasselbalch: acid ``f = 1 / (1 + 10^(pH − pKa))``, base
    ``f = 1 / (1 + 10^(pKa − pH))``; neutral ``f = 1``. Broadcasts over arrays.

    >>> round(float(fraction_unionized(4.204, 4.204)), 12)
    0.5
    """
    if kind not in _KINDS:
        raise ValueError(f"kind must be one of {_KINDS}, got {kind!r}")
    if pH is None or kind == "neutral" or pKa is None:
        return np.ones_like(np.asarray(pH if pH is not None else 1.0, dtype=float))
    pH = np.asarray(pH, dtype=float)
    e = (pH - pKa) if kind == "acid" else (pKa - pH)
    from scipy.special import expit  # imported here: heavy, and only this needs it

    # 1/(1+10^e) as a logistic function: no overflow, and the small tail keeps its digits
    return expit(-math.log(10.0) * e)


def oil_partition_coefficient(log_Kow, a: float = 1.0, b: float = 0.0):
    """Oil/water partition coefficient of the un-ionized form [1] from log K_ow by a linear
    free-energy relation ``log10 K = a log10 K_ow + b`` (Collander form)."""
    return 10.0 ** (a * np.asarray(log_Kow, dtype=float) + b)


def _denominator(phi, K, f, kS):
    return (1.0 - phi) * (1.0 / f + kS) + phi * K


def free_unionized_water(c, phi, K, f=1.0, kS=0.0):
    """Free un-ionized concentration in the water phase [kg/m³ of water phase].

    c : total concentration per volume of emulsion [kg/m³]
    phi : oil volume fraction of the emulsion [1], 0 ≤ phi < 1
    K : oil/water partition coefficient of the un-ionized form [1]
    f : un-ionized fraction in the water phase [1] (:func:`fraction_unionized`)
    kS : binding constant × surfactant concentration in the water phase [1] (R − 1)

    ``u = c / ((1 − phi)(1/f + kS) + phi K)`` (mass balance over oil, water and micelles).
    """
    return np.asarray(c, dtype=float) / _denominator(phi, K, f, kS)


def total_for_free(u, phi, K, f=1.0, kS=0.0):
    """Total per volume of emulsion [kg/m³] that leaves ``u`` [kg/m³] free and un-ionized in the
    water phase; the exact inverse of :func:`free_unionized_water`."""
    return np.asarray(u, dtype=float) * _denominator(phi, K, f, kS)


# ------------------------------------------------------------------------ the result
@dataclass
class PartitionResult:
    """Where a preservative goes in an emulsion. Concentrations [kg/m³] (= g/L) of the partitioning
    (parent) form; ``None`` where a value cannot exist (with a caveat saying why)."""

    ingredient: str
    parent: str
    phi: float
    c_total: float                       # as weighed, per volume of emulsion [kg/m³]
    c_total_parent: float                # as the parent acid [kg/m³]
    log_Kow: float | None
    K: float
    K_source: str
    D: float                             # oil / total water phase concentration [1]
    pKa: float | None
    kind: str
    pH: float | None
    f_unionized: float
    R_binding: float                     # total/free un-ionized in the water phase, 1 + kS [1]
    c_water: float | None                # all forms in the water phase, bound included [kg/m³]
    c_oil: float | None                  # [kg/m³ of oil]
    u_free: float | None                 # free un-ionized in water [kg/m³ of water]
    fraction_in_oil: float | None
    solubility: float | None
    c_total_needed: float | None = None  # inverse answer, as weighed [kg/m³ of emulsion]
    target_free: float | None = None
    caveats: list = field(default_factory=list)
    cautions: list = field(default_factory=list)

    def to_dict(self) -> dict:
        cav = merge_caveats(self.caveats)
        d = {"ingredient": self.ingredient, "partitions_as": self.parent,
             "ingredient_name": _display_name(self.ingredient),
             "partitions_as_name": _display_name(self.parent),
             "oil_volume_fraction": self.phi,
             "total_g_per_L": self.c_total, "total_as_parent_g_per_L": self.c_total_parent,
             "log_Kow": self.log_Kow, "partition_coefficient_unionized": self.K,
             "partition_coefficient_source": self.K_source,
             "distribution_ratio": self.D, "pKa": self.pKa, "kind": self.kind, "pH": self.pH,
             "fraction_unionized": self.f_unionized, "binding_ratio_R": self.R_binding,
             "water_phase_g_per_L": self.c_water, "oil_phase_g_per_L": self.c_oil,
             "free_unionized_water_g_per_L": self.u_free, "fraction_in_oil": self.fraction_in_oil,
             "water_solubility_g_per_L": self.solubility}
        if self.target_free is not None:
            d["target_free_unionized_water_g_per_L"] = self.target_free
            d["total_needed_g_per_L"] = self.c_total_needed
        d["warnings"] = [c.message for c in cav]
        d["warnings_detail"] = [c.to_dict() for c in cav]
        d["cautions"] = list(self.cautions)
        return d


def _check(name, x, lo, hi, unit="", closed_hi=True):
    if x is None or not math.isfinite(x) or x < lo or (x > hi if closed_hi else x >= hi):
        raise OutOfRangeError(name, float("nan") if x is None else x, lo, hi, unit)


def _resolve_K(entry: PartitionEntry, log_Kow, K, oil):
    """(log_Kow, K, source text, caveats) for the un-ionized parent form."""
    cav = []
    if K is not None:
        _check("partition coefficient", K, 1e-12, 1e12)
        return log_Kow, float(K), "measured value given by the user", cav
    if log_Kow is None:
        log_Kow = entry.log_Kow
        if log_Kow is None:
            raise PartitionDataError(entry.key, "no cited log K_ow in the data; give a measured "
                                     "oil/water partition coefficient or a log K_ow")
    _check("log K_ow", log_Kow, -5.0, 10.0)
    rels = oil_relations()
    oil = oil or DEFAULT_OIL
    if oil not in rels:
        raise PartitionDataError(oil, "no published octanol-to-oil relation for this oil; known: "
                                 + ", ".join(sorted(rels)) + "; or give a measured partition "
                                 "coefficient")
    rel = rels[oil]
    if oil == DEFAULT_OIL:
        cav.append(Caveat("octanol-default", (
            "Oil phase taken as 1-octanol (K = K_ow): real oils differ by orders of magnitude "
            "(e.g. methylparaben 0.02 in liquid paraffin, 7.5 in soya oil, Bean 1972); name the "
            "oil or give a measured partition coefficient."), entry.key, about="partition"))
    elif rel.log_Kow_min is None:
        cav.append(Caveat("model-range", (
            f"The {rel.label} relation (log K = {rel.a:g} log K_ow {rel.b:+g}) is used without a "
            "stated log K_ow range; treat K as an estimate within a factor of about 3 (phenol in "
            "arachis oil: 2.0 predicted, 5.6 measured, Bean et al. 1965)."),
            entry.key, about="partition"))
    elif not (rel.log_Kow_min <= log_Kow <= rel.log_Kow_max):
        cav.append(Caveat("model-range", (
            f"log K_ow {log_Kow:g} lies outside the {rel.log_Kow_min:g}…{rel.log_Kow_max:g} "
            f"range of the {rel.label} relation."), entry.key, about="partition"))
    K = float(oil_partition_coefficient(log_Kow, rel.a, rel.b))
    return log_Kow, K, f"{rel.label}: log K = {rel.a:g} log K_ow {rel.b:+g} ({rel.source})", cav


def distribute(ingredient: str, phi: float, c_total: float, *, pH: float | None = None,
               log_Kow: float | None = None, K: float | None = None, oil: str | None = None,
               surfactant: float | None = None, binding: float | None = None,
               target_free: float | None = None) -> PartitionResult:
    """Distribution of a preservative between the oil and water of an emulsion.

    ingredient : ingredient key or name (a salt partitions as its parent acid)
    phi : oil volume fraction [1], 0 ≤ phi < 1
    c_total : total concentration as weighed, per volume of emulsion [kg/m³]
    pH : pH of the water phase [1]; ``None`` ignores ionization (with a warning)
    log_Kow : overrides the table's log K_ow [1]
    K : a measured oil/water partition coefficient of the un-ionized form [1] (overrides oil and
        log_Kow)
    oil : a key of ``data/oil_lfer.csv`` (default octanol, with a warning)
    surfactant : surfactant concentration in the water phase [kg/m³]
    binding : binding constant of the un-ionized form per % w/v of surfactant [1/(% w/v)]
    target_free : wanted free un-ionized water-phase concentration [kg/m³]; adds the total to add

    Raises :class:`TargetError` when ``target_free`` exceeds a cited solubility.
    """
    entry = partition_entry(ingredient)
    parent = partition_data()[entry.parent] if entry.is_salt else entry
    _check("oil volume fraction", phi, 0.0, 1.0, closed_hi=False)
    _check("total concentration", c_total, 0.0, 1000.0, "g/L")
    if pH is not None:
        _check("pH", pH, 0.0, 14.0)
    cav: list[Caveat] = []
    log_Kow, K, K_src, kc = _resolve_K(parent, log_Kow, K, oil)
    cav += kc
    # a salt's mass as its parent acid
    to_parent = parent.M / entry.M
    c_parent = c_total * to_parent
    if entry.is_salt:
        cav.append(Caveat("salt", (
            f"{entry.name} partitions as {parent.name}; concentrations are given as "
            f"{parent.name} (mass × {to_parent:.4f}, ratio of molar masses)."), entry.key,
            about="partition"))
    if pH is None and parent.kind != "neutral":
        cav.append(Caveat("ionization-ignored", (
            f"No pH given: ionization of {parent.name} (pKa {parent.pKa:g}) is ignored, so the "
            "free un-ionized concentration is an upper bound; give the water phase's pH."),
            parent.key, about="partition"))
    f = float(fraction_unionized(pH, parent.pKa, parent.kind))
    if surfactant is None or binding is None:
        if (surfactant is None) != (binding is None):
            raise SolutionsError("micellar binding needs both the surfactant concentration "
                                 "and the binding constant")
        kS = 0.0
        cav.append(Caveat("binding-ignored", (
            "Micellar binding is ignored (no surfactant concentration and binding constant "
            "given); nonionic surfactants can bind much of a preservative and lower the free "
            "concentration."), parent.key, about="partition"))
    else:
        _check("surfactant concentration", surfactant, 0.0, 500.0, "kg/m³")
        _check("binding constant", binding, 0.0, 1e4, "per % w/v")
        kS = binding * surfactant / BINDING_UNIT_KG_PER_M3
    u = float(free_unionized_water(c_parent, phi, K, f, kS))
    c_water = u * (1.0 / f + kS)
    c_oil = K * u
    frac_oil = phi * c_oil / c_parent if c_parent > 0 else 0.0
    D = K / (1.0 / f + kS)
    sol = parent.solubility
    res = PartitionResult(
        ingredient=entry.key, parent=parent.key, phi=phi, c_total=c_total,
        c_total_parent=c_parent, log_Kow=log_Kow, K=K, K_source=K_src, D=D, pKa=parent.pKa,
        kind=parent.kind, pH=pH, f_unionized=f, R_binding=1.0 + kS, c_water=c_water, c_oil=c_oil,
        u_free=u, fraction_in_oil=frac_oil, solubility=sol, cautions=[EFFICACY_CAUTION])
    if sol is not None and u > sol:
        cav.append(Caveat("solubility", (
            f"The free un-ionized {parent.name} in the water phase would be {u:.4g} g/L, above "
            f"its water solubility {sol:g} g/L at {parent.solubility_T_C:g} °C: it cannot all "
            "dissolve, and this model "
            "has no solid phase; phase concentrations are not given."), parent.key,
            about="partition"))
        res.c_water = res.c_oil = res.u_free = res.fraction_in_oil = None
    elif sol is None:
        cav.append(Caveat("solubility-unchecked", (
            f"No cited water solubility of {parent.name} is in the data: no solubility limit "
            "was checked."), parent.key, about="partition"))
    if target_free is not None:
        _check("target free concentration", target_free, 0.0, 1000.0, "g/L")
        if sol is not None and target_free > sol:
            raise TargetError(
                f"a free un-ionized {parent.name} concentration of {target_free:g} g/L in the "
                f"water phase is above its water solubility ({sol:g} g/L at "
                f"{parent.solubility_T_C:g} °C)",
                nearest=float(total_for_free(sol, phi, K, f, kS)) / to_parent, unit="g/L total")
        res.target_free = target_free
        res.c_total_needed = float(total_for_free(target_free, phi, K, f, kS)) / to_parent
    res.caveats = merge_caveats(cav)
    return res


def total_needed(ingredient: str, phi: float, target_free: float, **kw) -> float:
    """Total as weighed per volume of emulsion [kg/m³] for a free un-ionized water-phase
    concentration ``target_free`` [kg/m³] (see :func:`distribute` for the other arguments)."""
    return distribute(ingredient, phi, 0.0, target_free=target_free, **kw).c_total_needed


def phase_profile(ingredient: str, phi: float, c_total: float, pH_values, **kw) -> dict:
    """Concentrations in each phase against pH (one vectorized call): arrays [kg/m³] keyed
    ``pH``, ``water``, ``oil``, ``free_unionized``; for the dashboard's chart."""
    base = distribute(ingredient, phi, c_total, pH=None, **kw)
    entry = partition_data()[base.parent]
    pH = np.asarray(pH_values, dtype=float)
    f = fraction_unionized(pH, entry.pKa, entry.kind)
    kS = base.R_binding - 1.0
    u = free_unionized_water(base.c_total_parent, phi, base.K, f, kS)
    return {"pH": pH, "water": u * (1.0 / f + kS), "oil": base.K * u, "free_unionized": u}


def _display_name(key: str) -> str:
    """The library's name for a partition-table key (the key itself if the library lacks it)."""
    from .ingredients import default_library
    lib = default_library()
    return next((i.name for i in lib if i.key == key), key)
