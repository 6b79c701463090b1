"""Configuration of ``wallloads-report``: one table of options, read from a TOML
file (Python 3.11's ``tomllib``) and from the command line.

Every option has a dotted TOML key (``pressure.reference``) and a flag
(``--reference-pressure``); a flag given on the command line overrides the
file.  The table :data:`OPTIONS` is the single source of the keys, their types,
defaults, units and help: the parser, the ``--help`` text, the validation and
the record of the configuration written into ``loads.json`` all read it.

This module is plain Python (no ParaView): it can be imported and tested by any
Python 3.11.
"""
import argparse
import difflib
import math
import os
import sys

__all__ = ["OPTIONS", "ConfigError", "Option", "parse", "help_text", "to_toml", "defaults"]


class ConfigError(Exception):
    """A bad command line or configuration file (exit code 2)."""


class Option:
    """One configuration key.

    kind: 'float', 'int', 'str', 'bool', 'choice', 'vec3', 'strlist',
    'range' (two floats, or empty), 'size' (two positive ints),
    'float?' (a float or unset), 'time' ("last" or a float), 'paths'.
    """

    def __init__(self, key, kind, default, help, unit="", choices=None, flag=None, check=None,
                 metavar=None, nargs=None):
        self.key = key
        self.kind = kind
        self.default = default
        self.help = help
        self.unit = unit
        self.choices = choices
        self.flag = flag or "--" + key.replace(".", "-").replace("_", "-")
        self.check = check
        self.metavar = metavar
        self.nargs = nargs

    @property
    def dest(self):
        return self.key.replace(".", "__")


def _positive(v):
    return None if v > 0 and math.isfinite(v) else "must be a finite number > 0"


def _non_negative(v):
    return None if v >= 0 and math.isfinite(v) else "must be a finite number >= 0"


def _finite(v):
    return None if math.isfinite(v) else "must be finite"


def _at_least_one(v):
    return None if v >= 1 else "must be >= 1"


def _nonzero_vec(v):
    if not all(math.isfinite(x) for x in v):
        return "must be finite"
    return None if sum(x * x for x in v) > 0 else "must not be the zero vector"


def _finite_vec(v):
    return None if all(math.isfinite(x) for x in v) else "must be finite"


def _factor(v):
    return None if v >= 1 and math.isfinite(v) else "must be >= 1"


#: Every option of the command, in the order --help lists them.
OPTIONS = [
    # -- what to read ------------------------------------------------------
    Option("cases", "paths", [], "case files to report on (any format ParaView opens: .vtm .vtp .vtu "
           ".pvd .vtpc .cgns .exo/.e ...); the command line's CASE arguments are added to these",
           flag="CASE"),
    Option("walls.blocks", "strlist", [], "wall blocks: block names or glob patterns (fnmatch: * ? [..]) "
           "matched against each block's name and its path 'parent/child'; empty: every block "
           "holding surface cells (boundary patches, side sets, surface files)", flag="--walls",
           metavar="NAME[,NAME...]"),
    Option("walls.region_array", "str", "", "integer cell array giving one region per value across the "
           "walls (empty: one region per wall block)", flag="--region-array", metavar="ARRAY"),
    Option("walls.orientation", "choice", "auto",
           "how stored face normals point: 'into-wall' (solver boundary faces, extracted faces), "
           "'into-fluid', 'wall-normal-array' (the 'Wall Normal' array); 'auto': 'wall-normal-array' "
           "when the shear comes from the volume, else 'into-wall'",
           choices=["auto", "into-wall", "into-fluid", "wall-normal-array"], flag="--orientation"),
    # -- pressure ----------------------------------------------------------
    Option("pressure.array", "str", "auto", "pressure array on the walls (cell data before point data); "
           "'auto': the first 1-component floating-point array whose name contains 'press', else the "
           "first such array; 'none': no pressure load", flag="--pressure", metavar="ARRAY"),
    Option("pressure.kind", "choice", "static", "'static' (Pa) or 'per-unit-density' (m^2/s^2, "
           "multiplied by the density)", choices=["static", "per-unit-density"], flag="--pressure-kind"),
    Option("pressure.reference", "float", 0.0, "pressure datum p_ref subtracted from the pressure "
           "(after the density product)", unit="Pa", check=_finite, flag="--reference-pressure"),
    # -- fluid -------------------------------------------------------------
    Option("fluid.density", "float", 1.0, "fluid density: multiplies per-unit-density pressure and "
           "shear stress and kinematic viscosity", unit="kg/m^3", check=_positive, flag="--density"),
    Option("fluid.density_array", "str", "", "density array used instead of fluid.density",
           flag="--density-array", metavar="ARRAY"),
    Option("fluid.viscosity", "float", 1.8e-5, "molecular viscosity (dynamic, Pa s; or kinematic, "
           "m^2/s, see fluid.viscosity_kind)", unit="Pa s | m^2/s", check=_non_negative,
           flag="--viscosity"),
    Option("fluid.viscosity_kind", "choice", "dynamic", "kind of every viscosity value and array",
           choices=["dynamic", "kinematic"], flag="--viscosity-kind"),
    Option("fluid.viscosity_array", "str", "", "molecular viscosity array used instead of "
           "fluid.viscosity", flag="--viscosity-array", metavar="ARRAY"),
    Option("fluid.turbulent_viscosity_array", "str", "", "turbulent viscosity array added to the "
           "molecular viscosity (mu_eff = mu + mu_t)", flag="--turbulent-viscosity-array", metavar="ARRAY"),
    # -- wall shear --------------------------------------------------------
    Option("shear.source", "choice", "auto",
           "where the viscous load comes from: 'array' (a wall shear stress array on the walls), "
           "'gradient' (a velocity gradient array on the walls, with the viscosity), 'volume' "
           "(reconstructed from the velocity in the fluid volume next to the walls), 'none'; 'auto': "
           "'array' if the walls hold a 3-component array whose name contains 'shear', else 'gradient' "
           "if they hold a 9-component array, else 'volume' if the case holds a volume with a "
           "3-component cell array, else 'none' (with a warning)",
           choices=["auto", "none", "array", "gradient", "volume"], flag="--shear-source"),
    Option("shear.array", "str", "auto", "wall shear stress array (3 components, the tangential "
           "traction of the fluid on the wall); 'auto' as in shear.source", flag="--shear-array",
           metavar="ARRAY"),
    Option("shear.kind", "choice", "static", "kind of the wall shear stress array: 'static' (Pa) or "
           "'per-unit-density' (m^2/s^2)", choices=["static", "per-unit-density"], flag="--shear-kind"),
    Option("shear.gradient", "str", "auto", "velocity gradient array (9 components, du_i/dx_j "
           "row-major, 1/s)", flag="--velocity-gradient", metavar="ARRAY"),
    Option("shear.velocity", "str", "auto", "velocity array of the volume (m/s) for shear.source = "
           "'volume'; 'auto': the 3-component cell array whose name contains 'vel', else the only one",
           flag="--velocity", metavar="ARRAY"),
    Option("shear.wall_velocity", "str", "", "velocity of moving walls (an array on the walls, m/s) "
           "for shear.source = 'volume'; empty: the walls are at rest", flag="--wall-velocity",
           metavar="ARRAY"),
    Option("shear.method", "choice", "near-wall-difference", "reconstruction from the volume: "
           "'near-wall-difference' (first order), 'gradient-tensor', 'wall-fit' (second order), "
           "'wall-law' (Spalding)",
           choices=["near-wall-difference", "gradient-tensor", "wall-fit", "wall-law"],
           flag="--shear-method"),
    Option("shear.include_normal_stress", "bool", False, "add the normal viscous stress (tau n).n to "
           "the viscous force", flag="--include-normal-stress"),
    # -- reference values --------------------------------------------------
    Option("reference.density", "float?", None, "reference density rho_ref of q = 0.5 rho_ref U_ref^2 "
           "(unset: fluid.density)", unit="kg/m^3", check=_positive, flag="--reference-density"),
    Option("reference.speed", "float", 0.0, "reference speed U_ref; 0 gives no coefficients",
           unit="m/s", check=_non_negative, flag="--reference-speed"),
    Option("reference.area", "float", 1.0, "reference area A_ref of the force coefficients",
           unit="m^2", check=_positive, flag="--reference-area"),
    Option("reference.length", "float", 1.0, "reference length of the pitching moment coefficient "
           "(and of the Strouhal number)", unit="m", check=_positive, flag="--reference-length"),
    Option("reference.span", "float", 1.0, "reference span of the rolling and yawing moment "
           "coefficients", unit="m", check=_positive, flag="--reference-span"),
    # -- axes ----------------------------------------------------------------
    Option("axes.drag", "vec3", [1.0, 0.0, 0.0], "drag direction e_D", check=_nonzero_vec,
           flag="--drag-direction", metavar="X,Y,Z"),
    Option("axes.lift", "vec3", [0.0, 0.0, 1.0], "lift direction e_L (made orthogonal to e_D); side "
           "e_S = e_L x e_D", check=_nonzero_vec, flag="--lift-direction", metavar="X,Y,Z"),
    Option("axes.angle_of_attack", "float?", None, "angle of attack alpha (with x the free stream and "
           "z the lift direction at zero incidence, alpha turns the stream from x toward z); replaces "
           "axes.drag and axes.lift", unit="deg", check=_finite, flag="--angle-of-attack"),
    Option("axes.sideslip", "float?", None, "sideslip angle beta (turns the stream toward +y); with "
           "axes.angle_of_attack", unit="deg", check=_finite, flag="--sideslip"),
    Option("axes.moment_centre", "vec3", [0.0, 0.0, 0.0], "moment centre r0", unit="m",
           check=_finite_vec, flag="--moment-centre", metavar="X,Y,Z"),
    Option("axes.load_direction", "vec3", [], "direction of the 'Directional Traction' the surface "
           "picture is coloured by (unset: the drag direction)", check=_nonzero_vec,
           flag="--load-direction", metavar="X,Y,Z"),
    # -- time ----------------------------------------------------------------
    Option("time.range", "range", [], "first and last time of the history (unset: every step)",
           unit="s", flag="--time-range", metavar="T0,T1"),
    Option("time.stride", "int", 1, "use every n-th time step of the history", check=_at_least_one,
           flag="--time-stride"),
    Option("time.report", "time", "last", "time of the loads table: 'last' (the last selected step) "
           "or a time (the nearest step)", unit="s", flag="--report-time", metavar="last|T"),
    Option("time.statistics_start", "float?", None, "start of the statistics window (unset: found "
           "by start-up truncation)", unit="s", check=_finite, flag="--statistics-start"),
    # -- distribution --------------------------------------------------------
    Option("distribution.axis_origin", "vec3", [0.0, 0.0, 0.0], "origin of the distribution axis",
           unit="m", check=_finite_vec, flag="--distribution-origin", metavar="X,Y,Z"),
    Option("distribution.axis_direction", "vec3", [], "direction of the distribution axis (unset: "
           "the drag direction)", check=_nonzero_vec, flag="--distribution-axis", metavar="X,Y,Z"),
    Option("distribution.bins", "int", 50, "number of bins along the axis", check=_at_least_one,
           flag="--bins"),
    Option("distribution.range", "range", [], "start and end along the axis, distances from the "
           "origin (unset: the extent of the walls)", unit="m", flag="--distribution-range",
           metavar="S0,S1"),
    # -- output ----------------------------------------------------------------
    Option("output.directory", "str", "wallloads-report", "output folder: one sub-folder per case, "
           "index.html and summary.csv", flag="-o", metavar="DIR"),
    Option("output.images", "choice", "auto", "PNG pictures rendered by ParaView: 'auto' (when an X "
           "display is available), 'yes' (fail without one), 'no'", choices=["auto", "yes", "no"],
           flag="--images"),
    Option("output.image_size", "size", [900, 650], "size of the pictures in pixels", unit="px",
           flag="--image-size", metavar="W,H"),
    Option("output.title", "str", "", "title of the reports (default: the case name)", flag="--title",
           metavar="TEXT"),
    # -- mesh convergence ------------------------------------------------------
    Option("convergence.cases", "paths", [], "three cases of one geometry on systematically refined "
           "meshes, FINE MEDIUM COARSE: observed order, Richardson extrapolation and Grid Convergence "
           "Index (Celik et al. 2008) of every total load and coefficient", flag="--convergence",
           metavar="FINE MEDIUM COARSE", nargs=3),
    Option("convergence.cell_size", "choice", "auto", "representative cell size h: 'area' "
           "(sqrt(wetted area / faces)), 'volume' ((volume / cells)^(1/3) of the fluid volume); 'auto': "
           "'volume' when the case holds a volume", choices=["auto", "area", "volume"],
           flag="--cell-size"),
    Option("convergence.safety_factor", "float", 1.25, "factor of safety of the GCI (1.25 for three "
           "meshes, Roache 1998)", check=_factor, flag="--safety-factor"),
    # -- run ---------------------------------------------------------------------
    Option("run.smp_backend", "choice", "STDThread", "threads of the per-face loops: 'STDThread' or "
           "'Sequential'", choices=["STDThread", "Sequential"], flag="--smp-backend"),
]

BY_KEY = {o.key: o for o in OPTIONS}


def defaults():
    return {o.key: _copy(o.default) for o in OPTIONS}


def _copy(v):
    return list(v) if isinstance(v, list) else v


# ---------------------------------------------------------------------------
# Values: one converter per kind, shared by TOML and flags
# ---------------------------------------------------------------------------

def _bad(opt, value, expected, where):
    return ConfigError("%s: %s = %r: expected %s" % (where, opt.key, value, expected))


def _number(opt, value, where, integer=False):
    if isinstance(value, bool):
        raise _bad(opt, value, "an integer" if integer else "a number", where)
    if isinstance(value, str):
        try:
            value = int(value) if integer else float(value)
        except ValueError:
            raise _bad(opt, value, "an integer" if integer else "a number", where) from None
    if integer:
        if isinstance(value, float) and value.is_integer():
            value = int(value)
        if not isinstance(value, int):
            raise _bad(opt, value, "an integer", where)
        return value
    if not isinstance(value, (int, float)):
        raise _bad(opt, value, "a number", where)
    return float(value)


def _split(value):
    if isinstance(value, str):
        parts = [p for p in value.replace(",", " ").split()]
        return parts
    return value


def convert(opt, value, where):
    """The value of `opt` from a TOML value or a flag's string, checked."""
    k = opt.kind
    if k == "float":
        out = _number(opt, value, where)
    elif k == "float?":
        out = None if value in (None, "", "none", "unset") else _number(opt, value, where)
    elif k == "int":
        out = _number(opt, value, where, integer=True)
    elif k == "str":
        if not isinstance(value, str):
            raise _bad(opt, value, "a string", where)
        out = value
    elif k == "bool":
        if isinstance(value, str):
            low = value.strip().lower()
            if low in ("1", "true", "yes", "on"):
                value = True
            elif low in ("0", "false", "no", "off"):
                value = False
        if not isinstance(value, bool):
            raise _bad(opt, value, "true or false", where)
        out = value
    elif k == "choice":
        if isinstance(value, bool) and set(opt.choices) >= {"yes", "no"}:
            value = "yes" if value else "no"
        if not isinstance(value, str) or value not in opt.choices:
            close = difflib.get_close_matches(str(value), opt.choices, n=1)
            raise _bad(opt, value, "one of %s%s" % (", ".join(opt.choices),
                                                    " (did you mean %r?)" % close[0] if close else ""),
                       where)
        out = value
    elif k in ("vec3", "range", "size"):
        parts = _split(value)
        if not isinstance(parts, (list, tuple)):
            raise _bad(opt, value, "a list of numbers", where)
        want = {"vec3": 3, "range": 2, "size": 2}[k]
        if len(parts) == 0 and k in ("range", "vec3") and opt.default == []:
            return []
        if len(parts) != want:
            raise _bad(opt, value, "%d numbers" % want, where)
        out = [_number(opt, p, where, integer=(k == "size")) for p in parts]
        if k == "range":
            if not all(math.isfinite(x) for x in out) or out[0] >= out[1]:
                raise _bad(opt, value, "two finite numbers, first < second", where)
        if k == "size" and not all(16 <= x <= 8192 for x in out):
            raise _bad(opt, value, "two integers from 16 to 8192", where)
    elif k == "strlist":
        if isinstance(value, str):
            value = [p.strip() for p in value.split(",") if p.strip()]
        if not isinstance(value, list) or not all(isinstance(p, str) for p in value):
            raise _bad(opt, value, "a list of strings", where)
        out = list(value)
    elif k == "paths":
        if isinstance(value, str):
            value = [value]
        if not isinstance(value, list) or not all(isinstance(p, str) for p in value):
            raise _bad(opt, value, "a list of file names", where)
        out = list(value)
    elif k == "time":
        if isinstance(value, str) and value.strip().lower() == "last":
            out = "last"
        else:
            try:
                out = _number(opt, value, where)
            except ConfigError:
                raise _bad(opt, value, "'last' or a time in s", where) from None
            if not math.isfinite(out):
                raise _bad(opt, value, "'last' or a finite time in s", where)
    else:  # pragma: no cover - table error
        raise AssertionError("unknown option kind %s" % k)
    if opt.check is not None and out is not None and out != []:
        problem = opt.check(out)
        if problem:
            raise ConfigError("%s: %s = %r %s" % (where, opt.key, value, problem))
    return out


# ---------------------------------------------------------------------------
# TOML file
# ---------------------------------------------------------------------------

def _flatten(table, prefix=""):
    for name, value in table.items():
        key = prefix + name
        if isinstance(value, dict):
            yield from _flatten(value, key + ".")
        else:
            yield key, value


def load_toml(path):
    """{key: value} from a TOML file, every key known and every value checked.

    Relative case paths are taken relative to the file's folder."""
    import tomllib
    try:
        with open(path, "rb") as handle:
            raw = tomllib.load(handle)
    except FileNotFoundError:
        raise ConfigError("config file %s not found" % path) from None
    except OSError as exc:
        raise ConfigError("config file %s cannot be read: %s" % (path, exc.strerror)) from None
    except tomllib.TOMLDecodeError as exc:
        raise ConfigError("config file %s is not valid TOML: %s" % (path, exc)) from None
    out = {}
    base = os.path.dirname(os.path.abspath(path))
    for key, value in _flatten(raw):
        opt = BY_KEY.get(key)
        if opt is None:
            close = difflib.get_close_matches(key, list(BY_KEY), n=1)
            raise ConfigError("%s: unknown key '%s'%s (the keys are listed by --help)"
                              % (path, key, "; did you mean '%s'?" % close[0] if close else ""))
        value = convert(opt, value, path)
        if opt.kind == "paths":
            value = [p if os.path.isabs(p) else os.path.normpath(os.path.join(base, p)) for p in value]
        out[key] = value
    return out


# ---------------------------------------------------------------------------
# Command line
# ---------------------------------------------------------------------------

class _Parser(argparse.ArgumentParser):
    def error(self, message):
        raise ConfigError("command line: %s (see --help)" % message)


def _parser():
    p = _Parser(prog="wallloads-report", add_help=False, allow_abbrev=False,
                usage="wallloads-report [--config FILE] [-o DIR] [options] CASE...")
    p.add_argument("-h", "--help", action="store_true")
    p.add_argument("--version", action="store_true")
    p.add_argument("--config", metavar="FILE")
    p.add_argument("--print-config", action="store_true")
    for opt in OPTIONS:
        if opt.key == "cases":
            p.add_argument("cases", nargs="*", metavar="CASE")
            continue
        flags = [opt.flag] + (["--output"] if opt.flag == "-o" else [])
        kw = dict(dest=opt.dest, default=None, metavar=opt.metavar or opt.kind.upper().rstrip("?"))
        if opt.kind == "bool":
            kw.update(nargs="?", const="true")
        if opt.nargs:
            kw.update(nargs=opt.nargs)
        p.add_argument(*flags, **kw)
    return p


def parse(argv):
    """(settings dict, flags) from the command line (and the config file it names).

    Raises ConfigError on anything wrong.  flags holds help/version/print_config."""
    ns = _parser().parse_args(argv)
    flags = {"help": ns.help, "version": ns.version, "print_config": ns.print_config,
             "config": ns.config}
    settings = defaults()
    if ns.help or ns.version:
        return settings, flags
    if ns.config:
        settings.update(load_toml(ns.config))
    for opt in OPTIONS:
        if opt.key == "cases":
            continue
        value = getattr(ns, opt.dest)
        if value is not None:
            settings[opt.key] = convert(opt, value, "command line " + opt.flag)
    settings["cases"] = list(settings["cases"]) + [os.path.abspath(c) for c in ns.cases]
    settings["cases"] = [os.path.abspath(c) for c in settings["cases"]]
    settings["convergence.cases"] = [os.path.abspath(c) for c in settings["convergence.cases"]]
    _cross_check(settings)
    return settings, flags


def _cross_check(s):
    """Checks that involve several keys."""
    angles = s["axes.angle_of_attack"] is not None or s["axes.sideslip"] is not None
    if not angles:
        d, l = s["axes.drag"], s["axes.lift"]
        dd = math.sqrt(sum(x * x for x in d))
        ll = math.sqrt(sum(x * x for x in l))
        cos = abs(sum(a * b for a, b in zip(d, l))) / (dd * ll)
        if cos > 1.0 - 1e-9:
            raise ConfigError("axes.lift = %r is parallel to axes.drag = %r: the lift direction must "
                              "have a part normal to the drag direction" % (l, d))
    if s["convergence.cases"] and s["cases"]:
        raise ConfigError("give either cases or --convergence FINE MEDIUM COARSE, not both")
    if not s["cases"] and not s["convergence.cases"]:
        raise ConfigError("no case given: wallloads-report [--config FILE] [-o DIR] [options] CASE... "
                          "(see --help)")
    if s["convergence.cases"]:
        if len(set(s["convergence.cases"])) != 3:
            raise ConfigError("--convergence needs three different cases, FINE MEDIUM COARSE")


def effective_axes(s):
    """Drag and lift directions after the angles (if given)."""
    if s["axes.angle_of_attack"] is not None or s["axes.sideslip"] is not None:
        a = math.radians(s["axes.angle_of_attack"] or 0.0)
        b = math.radians(s["axes.sideslip"] or 0.0)
        return ([math.cos(a) * math.cos(b), math.sin(b), math.sin(a) * math.cos(b)],
                [-math.sin(a), 0.0, math.cos(a)])
    return list(s["axes.drag"]), list(s["axes.lift"])


# ---------------------------------------------------------------------------
# Help and TOML output
# ---------------------------------------------------------------------------

def _fmt_default(opt):
    v = opt.default
    if v is None or v == []:
        return "unset"
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, list):
        return ",".join(repr(x) if isinstance(x, str) else "%g" % x for x in v)
    if isinstance(v, float):
        return "%g" % v
    return str(v)


def help_text(version=""):
    import textwrap
    lines = [
        "usage: wallloads-report [--config FILE] [-o DIR] [options] CASE...",
        "       wallloads-report [--config FILE] [-o DIR] [options] --convergence FINE MEDIUM COARSE",
        "",
        "Surface loads of flow-simulation results, case by case: loads.csv, loads.json, history,",
        "statistics and distribution CSV, PNG pictures and a self-contained report.html per case;",
        "index.html and summary.csv over all cases. Runs on pvbatch: `mpirun -np N wallloads-report`",
        "runs it on N ranks. The results support, and do not replace, engineering judgement, local",
        "codes and licensed practice.",
        "",
        "Settings come from a TOML file (--config) whose every key can also be given as a flag; a",
        "flag overrides the file. Vectors and lists are written 1,0,0 on the command line and",
        "[1, 0, 0] in TOML. SI units.",
        "",
        "general:",
        "  -h, --help            this text",
        "  --version             the WallLoads version",
        "  --config FILE         TOML configuration file (keys below; relative case paths are",
        "                        relative to the file)",
        "  --print-config        print the resolved configuration as TOML and exit",
        "",
        "exit codes: 0 every case done, 1 a case failed (the others are still reported),",
        "            2 bad command line or configuration",
        "",
        "keys (TOML key, flag, default, unit):",
    ]
    section = None
    for opt in OPTIONS:
        sect = opt.key.split(".")[0] if "." in opt.key else ""
        if sect != section:
            section = sect
            lines.append("")
            lines.append("  [%s]" % sect if sect else "  (top level)")
        head = "  %s   %s%s   default %s%s" % (
            opt.key, opt.flag, (" " + opt.metavar) if opt.metavar else "", _fmt_default(opt),
            ("   [%s]" % opt.unit) if opt.unit else "")
        lines.append(head)
        body = opt.help
        if opt.choices:
            body += " (choices: %s)" % ", ".join(opt.choices)
        lines.extend(textwrap.wrap(body, width=96, initial_indent="      ", subsequent_indent="      "))
    lines += ["", "A commented example configuration: examples/report.toml (installed in "
              "share/wallloads/examples)."]
    if version:
        lines.insert(0, "wallloads-report %s" % version)
    return "\n".join(lines) + "\n"


def _toml_value(v):
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, (int, float)):
        return repr(v)
    if isinstance(v, str):
        return '"' + v.replace("\\", "\\\\").replace('"', '\\"') + '"'
    if isinstance(v, list):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    raise TypeError(v)


def to_toml(settings):
    """The settings as TOML text (unset values as comments)."""
    out, section = [], None
    for opt in OPTIONS:
        value = settings.get(opt.key)
        if "." in opt.key:
            sect, name = opt.key.split(".", 1)
        else:
            sect, name = "", opt.key
        if sect != section:
            section = sect
            out.append("\n[%s]" % sect if sect else "")
        if value is None:
            out.append("# %s = (unset)" % name)
        else:
            out.append("%s = %s" % (name, _toml_value(value)))
    return "\n".join(out).lstrip("\n") + "\n"


def as_record(settings):
    """The settings as a JSON-ready dict nested by section, with units."""
    rec = {}
    for opt in OPTIONS:
        parts = opt.key.split(".")
        node = rec
        for p in parts[:-1]:
            node = node.setdefault(p, {})
        node[parts[-1]] = settings.get(opt.key)
    return rec


if __name__ == "__main__":  # pragma: no cover
    sys.stdout.write(help_text())
