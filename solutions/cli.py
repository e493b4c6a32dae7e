"""Command line: ``python -m solutions <command> …``.

Commands
--------
evaluate RECIPE      every basis and property of a recipe (table, or ``--json``)
target RECIPE        the amount of one ingredient that hits a property target
scale RECIPE         weigh-out sheet for a batch
dilute STOCK         how much stock and diluent make a target concentration
gas RECIPE           dissolved gas: carbonation, dissolved oxygen, sealed headspace pressure
ingredients [TEXT]   list the ingredient library, or search it and show what data it holds
partition            where a preservative goes in an emulsion (oil, water, free un-ionized)
fit-vapor-pressure   Clausius–Clapeyron and Antoine fits of measured vapor pressures
serve                the dashboard for a team: several page servers behind one address

Exit status: 0 success, 2 bad input (message on stderr), 3 target not reachable.
Temperatures are °C and pressures kPa on the command line; the library is SI inside.
"""
from __future__ import annotations

import argparse
import os
import sys

from .report import dumps
from .errors import NumberError, OptionError, SolutionsError, TargetError, UnitParseError

EXIT_INPUT, EXIT_UNREACHABLE = 2, 3


def _common(p: argparse.ArgumentParser) -> None:
    p.add_argument("recipe", help="recipe file (CSV, TSV or XLSX) with ingredient, amount, unit")
    p.add_argument("--temperature", "-T", default="25",
                   help="temperature of the solution (default 25 °C; a bare number is °C, "
                        "or give a unit: '298.15 K', '77 °F')")
    p.add_argument("--pressure", "-P", default="101.325",
                   help="external pressure, absolute (default 101.325 kPa; a bare number is "
                        "kPa, or give a unit: '1 bar', '760 mmHg', '0.5 barg' for gauge)")
    p.add_argument("--model", default="nonideal", choices=["nonideal", "ideal", "dilute"],
                   help="activity model (default nonideal)")
    p.add_argument("--density", default=None,
                   help="measured solution density, g/mL (replaces the model)")
    p.add_argument("--volume-temperature", default="20",
                   help="temperature at which the recipe's volumes are read (default 20 °C)")
    p.add_argument("--use", default="any", choices=["any", "technical"],
                   help="'technical' states the product is not for the body (no tonicity "
                        "cautions); default 'any' keeps them")
    p.add_argument("--library", default=None, help="your own ingredient library CSV")
    p.add_argument("--decimal-comma", action="store_true",
                   help="the recipe writes decimals with a comma (0,9)")
    p.add_argument("--json", action="store_true", help="print one JSON object")


def build_parser() -> argparse.ArgumentParser:
    ap = argparse.ArgumentParser(prog="python -m solutions",
                                 description="Formulation solution properties from a recipe.")
    sub = ap.add_subparsers(dest="command", required=True)
    ev = sub.add_parser("evaluate", help="every basis and property of a recipe")
    _common(ev)
    ev.add_argument("--batch", default=None, help="scale to a batch, e.g. '5 L' or '20 kg'")

    tg = sub.add_parser("target", help="solve for the amount of one ingredient")
    _common(tg)
    tg.add_argument("--vary", required=True, help="the ingredient to adjust (as in the recipe)")
    g = tg.add_mutually_exclusive_group(required=True)
    from .properties import targets
    for name, prop in targets().items():
        unit = f", {prop.unit}" if prop.unit else ""
        extra = " or 'isotonic'" if name == "osmolality" else ""
        g.add_argument(prop.flag, dest=f"target_{name}", metavar="VALUE",
                       help=f"target {prop.label.lower()}{unit}{extra}".replace("%", "%%"))
    g.add_argument("--concentration", nargs=2, metavar=("INGREDIENT", "VALUE_UNIT"),
                   help="target concentration of another ingredient, e.g. NaCl '0.9 %% w/v'")
    tg.add_argument("--isotonic-mOsm", default="290",
                    help="osmolality taken as isotonic, mOsm/kg (default 290)")

    sc = sub.add_parser("scale", help="weigh-out sheet for a batch")
    _common(sc)
    sc.add_argument("--batch", required=True, help="batch size, e.g. '5 L' or '20 kg'")

    dl = sub.add_parser("dilute", help="make a target concentration from a stock")
    _common(dl)
    dl.add_argument("--ingredient", required=True, help="the ingredient whose concentration is set")
    dl.add_argument("--to", required=True, dest="to", help="target concentration, e.g. '0.9 %% w/v'")
    dl.add_argument("--final", required=True, help="final amount, e.g. '500 mL' or '1 kg'")

    gs = sub.add_parser("gas", help="dissolved gas: carbonation, oxygen, sealed headspaces")
    gs.add_argument("recipe", help="recipe file (CSV, TSV or XLSX) with ingredient, amount, unit")
    gs.add_argument("--gas", required=True,
                    help="carbon-dioxide, oxygen, nitrogen, argon, helium, … (or CO2, O2, N2)")
    gs.add_argument("--temperature", "-T", default="25",
                    help="temperature of the liquid (at filling, for a sealed container), "
                         "e.g. 4, '4 °C', '39 F' (bare number: °C; default 25)")
    gq = gs.add_mutually_exclusive_group(required=True)
    gq.add_argument("--partial-pressure", help="partial pressure of the gas, e.g. '250 kPa' "
                    "or '1.5 barg' (bare number: kPa absolute)")
    gq.add_argument("--air", action="store_true",
                    help="in equilibrium with air at --pressure (total)")
    gq.add_argument("--volumes", help="carbonation: litres of gas (0 °C, 101.325 kPa) per "
                    "litre of liquid; gives the pressure that holds it")
    gs.add_argument("--pressure", "-P", default="101.325",
                    help="total pressure of the air for --air (bare number: kPa; default "
                         "101.325)")
    gs.add_argument("--headspace-fraction", help="sealed container: headspace volume / "
                    "container volume at filling, between 0 and 1 (e.g. 0.05)")
    gs.add_argument("--warm-to", help="sealed container: the temperature it reaches, e.g. 35")
    gs.add_argument("--trapped-air", default=None, help="sealed container: partial pressure "
                    "of air trapped in the headspace at sealing (bare number: kPa; default 0)")
    gs.add_argument("--rating", help="container rating, gauge (bare number: kPa gauge; "
                    "'6 barg', '90 psig' also read)")
    gs.add_argument("--ambient", default="101.325",
                    help="ambient pressure for gauge figures (bare number: kPa; default "
                         "101.325)")
    gs.add_argument("--model", default="nonideal", choices=["nonideal", "ideal", "dilute"],
                    help="activity model for the solution's vapor pressure")
    gs.add_argument("--library", default=None, help="your own ingredient library CSV")
    gs.add_argument("--decimal-comma", action="store_true",
                    help="the recipe writes decimals with a comma (0,9)")
    gs.add_argument("--json", action="store_true", help="print one JSON object")

    ing = sub.add_parser("ingredients", help="list or search the ingredient library")
    ing.add_argument("text", nargs="?", default=None, metavar="TEXT",
                     help="part of a name, synonym, key or formula (case, spaces and dashes "
                          "ignored): shows each match with its forms and the data held for it")
    ing.add_argument("--library", default=None, help="your own ingredient library CSV")
    ing.add_argument("--json", action="store_true",
                     help="print every field of every matching ingredient as JSON")

    pt = sub.add_parser("partition", help="preservative distribution between oil and water of "
                                          "an emulsion")
    pt.add_argument("--ingredient", required=True, help="preservative (library key or name)")
    pt.add_argument("--oil-fraction", required=True,
                    help="oil volume fraction of the emulsion, 0–1 (or e.g. '20 %%')")
    pt.add_argument("--total", required=True,
                    help="total concentration per volume of emulsion, e.g. '0.2 %% w/v' or '2 g/L'")
    pt.add_argument("--ph", default=None, help="pH of the water phase (without it ionization "
                                                "is ignored)")
    kg = pt.add_mutually_exclusive_group()
    kg.add_argument("--log-kow", default=None, help="log K_ow of the un-ionized form "
                                                     "(overrides the data table)")
    kg.add_argument("--partition", default=None, dest="partition_K",
                    help="measured oil/water partition coefficient of the un-ionized form")
    pt.add_argument("--oil", default=None,
                    help="oil type for the octanol-to-oil relation (default octanol, with a "
                         "warning); known: octanol, vegetable_oil")
    pt.add_argument("--surfactant", default=None,
                    help="surfactant concentration in the water phase, e.g. '2 %% w/v'")
    pt.add_argument("--binding", default=None,
                    help="micellar binding constant of the un-ionized form, per %% w/v of "
                         "surfactant (R = 1 + K·S)")
    pt.add_argument("--target-free", default=None,
                    help="wanted free un-ionized concentration in the water phase, e.g. "
                         "'0.05 %% w/v': adds the total needed")
    pt.add_argument("--json", action="store_true")

    vp = sub.add_parser("fit-vapor-pressure", help="fit measured vapor pressures")
    vp.add_argument("data", help="CSV with temperature_C|K|F and pressure_kPa|mmHg|bar|psi… "
                                 "columns")
    vp.add_argument("--at-pressure", default=None,
                    help="also give the boiling point at this pressure, e.g. '50 kPa' "
                         "(bare number: kPa)")
    vp.add_argument("--json", action="store_true")

    sv = sub.add_parser("serve", help="the dashboard for a team: several page servers "
                                      "behind one address")
    sv.add_argument("--workers", default="2",
                    help="page servers to start (default 2: one per core of a 2-core "
                         "machine; 1 to 8)")
    sv.add_argument("--port", default="8501", help="port of the page (default 8501)")
    sv.add_argument("--address", default="127.0.0.1",
                    help="address to listen on (default 127.0.0.1: this machine only; "
                         "0.0.0.0 lets the lab network in — your site's rules apply)")
    return ap


def _load(args):
    from .ingredients import default_library
    from .recipe import read_recipe
    lib = default_library()
    if getattr(args, "library", None):
        lib = lib.with_file(args.library)
    recipe = read_recipe(args.recipe, lib, decimal="," if args.decimal_comma else ".",
                         name=os.path.splitext(os.path.basename(args.recipe))[0])
    return lib, recipe


#: temperatures at which the tool computes a liquid solution [K]: −100 °C to water's critical point
T_RANGE = (173.15, 647.096)


def _temperature(option: str, text) -> float:
    from .units import parse_temperature
    try:
        T = parse_temperature(text)
    except (UnitParseError, NumberError) as exc:
        raise OptionError(option, text, exc.reason) from None
    if not (T_RANGE[0] <= T <= T_RANGE[1]):
        raise OptionError(option, text, "the tool computes liquid solutions from −100 °C to "
                                        "374 °C (water's critical point)")
    return T


def _pressure(option: str, text) -> float:
    from .units import parse_pressure
    try:
        P = parse_pressure(text)
    except (UnitParseError, NumberError) as exc:
        raise OptionError(option, text, exc.reason) from None
    if P > 1e8:
        raise OptionError(option, text, "above 100 MPa, outside every model here")
    return P


def _density(text) -> float | None:
    """A measured solution density typed in g/mL → kg/m³, with physical checks."""
    from .units import read_number
    if text is None:
        return None
    try:
        rho = read_number(text)
    except NumberError as exc:
        raise OptionError("--density", text, exc.reason) from None
    if rho is None:
        return None
    from .units import LIQUID_DENSITY_G_PER_ML
    lo, hi = LIQUID_DENSITY_G_PER_ML
    if 1e3 * lo <= rho <= 1e3 * hi:
        raise OptionError("--density", text, f"looks like kg/m³; the option is in g/mL — "
                                             f"did you mean {rho / 1000:g}?")
    if not (lo <= rho <= hi):
        raise OptionError("--density", text,
                          f"a solution density is between {lo:g} and {hi:g} g/mL")
    return rho * 1e3


def _conditions(args) -> dict:
    return dict(T=_temperature("--temperature", args.temperature),
                P=_pressure("--pressure", args.pressure), model=args.model,
                rho_measured=_density(args.density),
                T_prep=_temperature("--volume-temperature", args.volume_temperature))


def cmd_evaluate(args) -> int:
    from .evaluate import evaluate
    from .recipe import parse_batch
    _, recipe = _load(args)
    batch = parse_batch(args.batch) if args.batch else None
    ev = evaluate(recipe, batch=batch, use=args.use, **_conditions(args))
    if args.json:
        print(dumps(ev.to_dict()))
    else:
        from .report import text_report
        print(text_report(ev.to_dict()))
    return 0


def _number(option: str, text) -> float:
    from .units import read_number
    try:
        x = read_number(text)
    except NumberError as exc:
        raise OptionError(option, text, exc.reason) from None
    if x is None:
        raise OptionError(option, text, "a number is needed")
    return x


def _target(args):
    """The target asked for on the command line, read through the property registry (°C and
    kPa options accept other units; the rest are numbers in the registry's display unit)."""
    from .properties import targets
    from .targeting import Target
    iso = _number("--isotonic-mOsm", args.isotonic_mOsm)
    if not 100 <= iso <= 1000:
        raise OptionError("--isotonic-mOsm", args.isotonic_mOsm, "isotonic is taken as "
                          "100–1000 mOsm/kg (290 by default, common practice)")
    iso *= 1e-3
    for name, prop in targets().items():
        text = getattr(args, f"target_{name}", None)
        if text is None:
            continue
        if name == "osmolality" and str(text).strip().lower() in ("isotonic", "iso"):
            return Target.osmolality("isotonic", iso)
        if prop.unit == "°C":
            value = _temperature(prop.flag, text)
        elif prop.unit == "kPa":
            value = _pressure(prop.flag, text)
        else:
            value = prop.to_si(_number(prop.flag, text))
        return Target(name, value, isotonic=(name == "osmolality"
                                             and abs(value - iso) <= 1e-12))
    comp, text = args.concentration
    return Target.concentration(comp, text)


def cmd_target(args) -> int:
    from .targeting import solve_target
    from .report import text_report
    lib, recipe = _load(args)
    cond = _conditions(args)
    target = _target(args)
    result = solve_target(recipe, args.vary, target, library=lib, **cond)
    out = result.to_dict()
    if args.json:
        print(dumps(out))
    else:
        print(result.summary_text())
        print()
        print(text_report(out))
    return 0


def cmd_scale(args) -> int:
    from .batch import weigh_out
    from .recipe import parse_batch
    _, recipe = _load(args)
    cond = _conditions(args)
    sheet = weigh_out(recipe, parse_batch(args.batch), **cond)
    if args.json:
        print(dumps(sheet.to_dict()))
    else:
        print(sheet.text())
    return 0


def cmd_dilute(args) -> int:
    from .batch import dilution_plan
    lib, recipe = _load(args)
    cond = _conditions(args)
    plan = dilution_plan(recipe, args.ingredient, args.to, args.final, library=lib, **cond)
    print(dumps(plan.to_dict()) if args.json else plan.text())
    return 0


def _number_option(text, name: str) -> float:
    from .units import read_number
    x = read_number(text)
    if x is None:
        raise SolutionsError(f"{name} needs a number")
    return x


def cmd_gas(args) -> int:
    from .gas import dissolved_gas
    from .units import parse_pressure, parse_temperature
    _, recipe = _load(args)
    ambient = parse_pressure(args.ambient)
    T = parse_temperature(args.temperature)
    kw = dict(ambient=ambient, model=args.model)
    if args.partial_pressure is not None:
        kw["partial_pressure"] = parse_pressure(args.partial_pressure, ambient=ambient)
    elif args.volumes is not None:
        kw["volumes"] = _number_option(args.volumes, "--volumes")
    else:
        kw["air"] = True
        kw["total_pressure"] = parse_pressure(args.pressure, ambient=ambient)
    if args.headspace_fraction is not None:
        kw["headspace_fraction"] = _number_option(args.headspace_fraction, "--headspace-fraction")
    if args.warm_to is not None:
        kw["warm_to"] = parse_temperature(args.warm_to)
    if args.trapped_air is not None:
        kw["trapped_air"] = parse_pressure(args.trapped_air, ambient=ambient)
    if args.rating is not None:
        # the rating is a gauge pressure: a gauge spelling or a bare number is read as gauge
        kw["rating"] = parse_pressure(args.rating, ambient=0.0)
    res = dissolved_gas(recipe, args.gas, T, **kw)
    out = res.to_dict()
    if args.json:
        print(dumps(out))
    else:
        print(gas_text(out))
    return 0


def gas_text(d: dict) -> str:
    """A short plain-text summary of a gas result's dict."""
    def f(x, fmt=".4g"):
        return "—" if x is None else format(x, fmt)
    lines = [f"{d['gas_name']} ({d['formula']}) at {f(d['temperature_C'])} °C",
             f"  Henry's constant in water   {f(d['henry_constant_GPa'])} GPa  ({d['henry_model']})",
             f"  salting-out factor          {f(d['salting_out_factor'])}  ({d['salting_out_model']})",
             f"  partial pressure            {f(d['partial_pressure_kPa'])} kPa",
             f"  total pressure              {f(d['total_pressure_kPa'])} kPa"
             f"  (gauge {f(d['gauge_pressure_kPa'])} kPa over {f(d['ambient_pressure_kPa'])} kPa)",
             f"  dissolved                   {f(d['dissolved_mg_per_L'])} mg/L, "
             f"{f(d['dissolved_mmol_per_kg'])} mmol/kg water, mole fraction "
             f"{f(d['dissolved_mole_fraction'])}",
             f"  volumes                     {f(d['volumes'])} L/L"]
    if "warm_temperature_C" in d:
        lines += [f"sealed container, headspace {f(d['headspace_fraction'])} of the volume",
                  f"  at filling                  {f(d['fill_total_pressure_kPa'])} kPa "
                  f"(gauge {f(d['fill_gauge_pressure_kPa'])} kPa)",
                  f"  at {f(d['warm_temperature_C'])} °C"
                  f"{' ' * max(1, 23 - len(f(d['warm_temperature_C'])))}"
                  f"{f(d['warm_pressure_kPa'])} kPa (gauge {f(d['warm_gauge_pressure_kPa'])} kPa)"]
    for w in d["warnings"]:
        lines.append(f"warning: {w}")
    for c in d["cautions"]:
        lines.append(f"caution: {c}")
    return "\n".join(lines)


def cmd_ingredients(args) -> int:
    from .ingredients import default_library
    lib = default_library()
    if args.library:
        lib = lib.with_file(args.library)
    text = args.text
    if text is not None and not text.strip():
        raise OptionError("TEXT", text, "give part of a name, synonym, key or formula")
    if text is None and not args.json:
        rows = list(lib)
        w = max(len(i.name) for i in rows)
        for i in rows:
            print(f"{i.name:<{w}}  {i.formula or '-':<18} {i.M * 1e3:>9.3f} g/mol"
                  f"  ions {i.ions:g}")
        return 0
    from .catalog import close_names, find_ingredients, ingredient_record
    hits = list(lib) if text is None else find_ingredients(lib, text)
    if not hits:
        close = close_names(lib, text)
        hint = (f"; close names: {', '.join(close)}" if close else
                "; 'python -m solutions ingredients' lists the whole library")
        print(f"error: no ingredient matches {text!r} (key, name, synonym or formula){hint}",
              file=sys.stderr)
        return EXIT_INPUT
    recs = [ingredient_record(i, lib) for i in hits]
    if args.json:
        print(dumps(recs))
    else:
        print("\n\n".join(ingredient_text(r) for r in recs))
    return 0


def ingredient_text(r: dict) -> str:
    """A plain-text block for one record of :func:`solutions.catalog.ingredient_record`."""
    def line(label: str, value) -> str:
        return f"  {label:<16} {value}"
    particles = "particle" if r["ions"] == 1 else "particles"
    mine = ", your library" if r["custom"] else ""
    out = [f"{r['name']}  (key {r['key']}{mine})",
           line("formula", f"{r['formula'] or '-'}, {r['molar_mass_g_per_mol']:.3f} g/mol; "
                           f"{r['kind']}, {r['ions']:g} {particles} per formula unit")]
    if r["hydrate_water"] and r["solution_pct_w_w"] is None:
        out.append(line("crystal water", f"{r['hydrate_water']:g} H2O per formula unit"))
    if r["solution_pct_w_w"] is not None:
        out.append(line("stock solution", f"{r['solution_pct_w_w']:g} % w/w in water"))
    if r["density_g_per_mL"] is not None:
        out.append(line("pure density", f"{r['density_g_per_mL']:g} g/mL at 20 °C"))
    if r["forms"]:
        out.append(line("other forms", "; ".join(f"{f['name']} ({f['key']}), "
                                                 f"{f['molar_mass_g_per_mol']:.2f} g/mol"
                                                 for f in r["forms"])))
    if r["synonyms"]:
        out.append(line("synonyms", ", ".join(r["synonyms"])))
    out.append(line("activity model", r["activity_model"]))
    out.append(line("density data", r["density_data"]))
    out.append(line("vapor pressure", "pure-liquid equation" if r["vapor_pressure"]
                    else "no data (treated as non-volatile)"))
    s = r["solubility"]
    out.append(line("solubility", "no data" if s is None else
                    f"{s['g_per_100g_water_at_25C']:.4g} g {r['solute']} per 100 g water at 25 °C"
                    f" (data {s['T_min_C']:g}–{s['T_max_C']:g} °C"
                    f"{', extrapolated' if s['extrapolated'] else ''})"))
    e = r["eutectic"]
    out.append(line("eutectic", "no data" if e is None else
                    f"{e['T_C']:g} °C at {e['mass_pct']:g} % w/w"))
    out.append(line("E-value", "no data" if r["E_value"] is None else f"{r['E_value']:.3g}"))
    if r["partition_data"]:
        out.append(line("partition", "log K_ow " + ("no data" if r["log_Kow"] is None else
                                                    f"{r['log_Kow']:g}")
                        + ", pKa " + ("none" if r["pKa"] is None else f"{r['pKa']:g}")))
    else:
        out.append(line("partition", "no data"))
    if r["caution"]:
        out.append(line("caution", r["caution"]))
    return "\n".join(out)


def _mass_per_volume(text: str, option: str) -> float:
    """A typed concentration such as '0.2 % w/v' or '2 g/L' in kg/m³ (mass per volume only)."""
    import re
    from .units import Basis, parse_unit
    m = re.match(r"^\s*([-+]?[0-9.,eE+-]*[0-9])\s*(.*?)\s*$", str(text))
    if not m:
        raise SolutionsError(f"{option}: write a number and a unit, e.g. '0.2 % w/v', got "
                             f"{text!r}")
    x = _number(option, m.group(1))
    if not m.group(2):
        raise SolutionsError(f"{option}: {text!r} has no unit; write e.g. '0.2 % w/v' or '2 g/L'")
    amt = parse_unit(m.group(2))
    if amt.basis is not Basis.MASS_PER_VOLUME:
        raise SolutionsError(f"{option}: {text!r} is {amt.basis.value}; give a mass per volume "
                             "(% w/v, g/L, mg/mL)")
    if x < 0:
        raise SolutionsError(f"{option}: a concentration cannot be negative, got {text!r}")
    return x * amt.value_si


def cmd_partition(args) -> int:
    from .partition import distribute
    frac = str(args.oil_fraction).strip()
    phi = _number("--oil-fraction", frac[:-1]) / 100.0 if frac.endswith("%") else \
        _number("--oil-fraction", frac)
    res = distribute(
        args.ingredient, phi, _mass_per_volume(args.total, "--total"),
        pH=None if args.ph is None else _number("--ph", args.ph),
        log_Kow=None if args.log_kow is None else _number("--log-kow", args.log_kow),
        K=None if args.partition_K is None else _number("--partition", args.partition_K),
        oil=args.oil,
        surfactant=None if args.surfactant is None else _mass_per_volume(args.surfactant,
                                                                         "--surfactant"),
        binding=None if args.binding is None else _number("--binding", args.binding),
        target_free=None if args.target_free is None else _mass_per_volume(args.target_free,
                                                                           "--target-free"))
    out = res.to_dict()
    if args.json:
        print(dumps(out))
        return 0

    def g(x, unit=" g/L"):
        return "not given (see warnings)" if x is None else f"{x:.4g}{unit}"
    lines = [f"{out['ingredient_name']} in an emulsion with oil volume fraction "
             f"{out['oil_volume_fraction']:g}",
             f"  partitions as               {out['partitions_as_name']}",
             f"  log K_ow                    {g(out['log_Kow'], '')}",
             f"  K oil/water (un-ionized)    {out['partition_coefficient_unionized']:.4g}",
             f"  pKa / pH / un-ionized       {g(out['pKa'], '')} / {g(out['pH'], '')} / "
             f"{out['fraction_unionized']:.4g}",
             f"  distribution ratio D        {out['distribution_ratio']:.4g}",
             f"  water phase (all forms)     {g(out['water_phase_g_per_L'])}",
             f"  oil phase                   {g(out['oil_phase_g_per_L'])}",
             f"  free un-ionized in water    {g(out['free_unionized_water_g_per_L'])}",
             f"  fraction in the oil         {g(out['fraction_in_oil'], '')}"]
    if "total_needed_g_per_L" in out:
        lines.append(f"  total to add for {out['target_free_unionized_water_g_per_L']:.4g} g/L "
                     "free: "
                     f"{g(out['total_needed_g_per_L'])} ({out['ingredient']} as weighed)")
    for w in out["warnings"]:
        lines.append(f"warning: {w}")
    for c in out["cautions"]:
        lines.append(f"CAUTION: {c}")
    print("\n".join(lines))
    return 0


def cmd_fit_vapor_pressure(args) -> int:
    from .units import parse_pressure
    from .vpfit import fit_vapor_pressure, read_vapor_pressure_table
    data = read_vapor_pressure_table(args.data)
    P_at = None
    if args.at_pressure is not None:
        try:
            P_at = parse_pressure(args.at_pressure)
        except ValueError as exc:
            raise SolutionsError(f"--at-pressure: {exc}") from None
    fit = fit_vapor_pressure(data.T, data.P, rows=data.rows, at_pressure=P_at, gauge=data.gauge)
    out = fit.to_dict()
    if args.json:
        print(dumps(out))
        return 0

    def g(x, f=".2f", unit=" °C"):
        return "not given (see warnings)" if x is None else f"{x:{f}}{unit}"
    lo, hi = out["dH_vap_ci95_kJ_per_mol"]
    lines = [f"{out['n_points']} points",
             f"  ΔH_vap (Clausius–Clapeyron)  {out['dH_vap_kJ_per_mol']:.3f} ± "
             f"{out['dH_vap_stderr_kJ_per_mol']:.3f} kJ/mol (95 %: {lo:.3f}…{hi:.3f})"]
    a = out["antoine"]
    if a:
        lines.append(f"  Antoine  log10(p/kPa) = {a['A']:.6g} − {a['B']:.6g}/({a['C']:.6g} + t/°C)"
                     f", valid {a['T_min_C']:.1f}…{a['T_max_C']:.1f} °C")
        lines.append(f"  normal boiling point         {g(out['normal_boiling_point_C'])}")
    if "boiling_point_at_pressure_C" in out:
        lines.append(f"  boiling point at {out['at_pressure_kPa']:g} kPa     "
                     f"{g(out['boiling_point_at_pressure_C'])}")
    if out["outliers"]:
        lines.append("  outliers (rows)              " + ", ".join(map(str, out["outliers"])))
    lines.append("note: " + out["notes"][0])
    lines += [f"warning: {w}" for w in out["warnings"]]
    print("\n".join(lines))
    return 0


def cmd_serve(args) -> int:
    workers, port = _number("--workers", args.workers), _number("--port", args.port)
    if workers != int(workers) or not 1 <= workers <= 8:
        raise OptionError("--workers", args.workers, "a whole number from 1 to 8 is needed")
    if port != int(port) or not 1 <= port <= 65535:
        raise OptionError("--port", args.port, "a port number from 1 to 65535 is needed")
    from .ui.serve import serve
    return serve(int(workers), int(port), args.address)


COMMANDS = {"evaluate": cmd_evaluate, "target": cmd_target, "scale": cmd_scale,
            "dilute": cmd_dilute, "gas": cmd_gas, "ingredients": cmd_ingredients,
            "partition": cmd_partition, "fit-vapor-pressure": cmd_fit_vapor_pressure,
            "serve": cmd_serve}


def main(argv=None) -> int:
    args = build_parser().parse_args(argv)
    if not os.environ.get("SOLUTIONS_DEBUG"):
        # numpy's notes on a division by zero or an overflow inside the library are not for
        # the user: every such value is withheld or refused with its reason
        import warnings
        warnings.filterwarnings("ignore", category=RuntimeWarning, module=r"solutions(\.|$)")
    try:
        return COMMANDS[args.command](args)
    except TargetError as exc:
        print(f"error: target not reachable: {exc}", file=sys.stderr)
        return EXIT_UNREACHABLE
    except SolutionsError as exc:
        print(f"error: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except (OSError, UnicodeDecodeError) as exc:
        print(f"error: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except Exception as exc:  # a bug: say so in one line, full trace only on request
        if os.environ.get("SOLUTIONS_DEBUG"):
            raise
        print(f"error: internal error ({type(exc).__name__}: {exc}); rerun with "
              "SOLUTIONS_DEBUG=1 for details and please report it", file=sys.stderr)
        return 1


if __name__ == "__main__":
    sys.exit(main())
