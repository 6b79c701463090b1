"""Mesh convergence of a computed quantity on three systematically refined meshes.

The procedure of Celik, Ghia, Roache, Freitas, Coleman and Raad, "Procedure
for Estimation and Reporting of Uncertainty Due to Discretization in CFD
Applications", J. Fluids Eng. 130(7):078001 (2008), which builds on Roache,
"Verification and Validation in Computational Science and Engineering",
Hermosa (1998):

1. representative cell size h = (A / N)^(1/2) of a surface mesh (N faces of
   total area A) or h = (V / N)^(1/3) of a volume mesh (N cells of total volume
   V) (Celik et al., eqs. 1-2);
2. h1 < h2 < h3 (fine, medium, coarse), r21 = h2/h1, r32 = h3/h2;
3. eps32 = phi3 - phi2, eps21 = phi2 - phi1, s = sign(eps32/eps21); the
   apparent order p solves p = |ln|eps32/eps21| + q(p)| / ln r21 with
   q(p) = ln((r21^p - s) / (r32^p - s)) (eqs. 3-5), by fixed-point iteration
   (q = 0 when r21 = r32, and p is then explicit);
4. extrapolated value phi_ext = (r21^p phi1 - phi2) / (r21^p - 1) (eq. 6);
5. approximate relative error e_a = |(phi1 - phi2)/phi1|, extrapolated relative
   error e_ext = |(phi_ext - phi1)/phi_ext|, and the fine-grid convergence index
   GCI = Fs e_a / (r21^p - 1) with Fs = 1.25 for three meshes (eqs. 7-9; Roache
   1998 for the factor of safety).

Celik et al. read eps32/eps21 < 0 as oscillatory convergence; a ratio
|eps21/eps32| >= 1 means the changes do not shrink with the mesh (divergence),
where no order is reported.  Quantities that are zero to round-off on all
three meshes get no order either.

Plain Python (math only): testable without ParaView.
"""
import math

__all__ = ["cell_size", "gci", "study"]


def cell_size(total, count, dimension):
    """Representative cell size: (total / count)^(1/dimension) (Celik et al. 2008, eqs. 1-2).

    total: wetted area (dimension 2) or fluid volume (dimension 3); count: faces or cells."""
    if dimension not in (2, 3):
        raise ValueError("dimension must be 2 (area) or 3 (volume)")
    if not (count > 0 and total > 0 and math.isfinite(total)):
        raise ValueError("cell size needs a positive %s and count, got %r and %r"
                         % ("area" if dimension == 2 else "volume", total, count))
    return (total / count) ** (1.0 / dimension)


def _apparent_order(r21, r32, e21, e32, s, max_iter=500, tol=1e-14):
    """Celik et al. 2008 eqs. 3-5 by fixed-point iteration; None if it does not settle."""
    ln_ratio = math.log(abs(e32 / e21))
    p = abs(ln_ratio) / math.log(r21)  # the value for equal ratios, a good start
    for _ in range(max_iter):
        a, b = r21 ** p - s, r32 ** p - s
        if a <= 0 or b <= 0:
            return None
        q = math.log(a / b)
        p_new = abs(ln_ratio + q) / math.log(r21)
        if not math.isfinite(p_new):
            return None
        if abs(p_new - p) <= tol * max(1.0, p_new):
            return p_new
        p = p_new
    return None


def gci(phi, h, safety_factor=1.25, zero_scale=None):
    """Grid convergence of one quantity.

    phi: (phi1, phi2, phi3) on the fine, medium and coarse meshes; h: their
    representative cell sizes (h1 < h2 < h3).  zero_scale: a magnitude of the
    same unit below which the quantity counts as zero to round-off (default
    1e-300).  Returns a dict: behaviour ('monotonic', 'oscillatory',
    'divergent', 'oscillatory divergent', 'no change', 'zero'), r21, r32,
    order p, phi_ext, e_a, e_ext, gci (relative, fine mesh), gci_abs (the same
    band in the quantity's unit) and a note.
    """
    phi1, phi2, phi3 = (float(v) for v in phi)
    h1, h2, h3 = (float(v) for v in h)
    if not (0 < h1 < h2 < h3):
        raise ValueError("cell sizes must grow from fine to coarse: h = %r" % (tuple(h),))
    r21, r32 = h2 / h1, h3 / h2
    nan = float("nan")
    out = {"phi": [phi1, phi2, phi3], "h": [h1, h2, h3], "r21": r21, "r32": r32, "order": nan,
           "phi_ext": nan, "e_a": nan, "e_ext": nan, "gci": nan, "gci_abs": nan,
           "behaviour": "", "note": ""}
    if not all(math.isfinite(v) for v in (phi1, phi2, phi3)):
        out.update(behaviour="undefined", note="a value is not finite")
        return out
    scale = max(abs(phi1), abs(phi2), abs(phi3))
    if scale <= (zero_scale if zero_scale is not None else 1e-300):
        out.update(behaviour="zero", note="zero to round-off on all three meshes")
        return out
    e21, e32 = phi2 - phi1, phi3 - phi2
    out["e_a"] = abs(e21 / phi1) if phi1 != 0 else nan
    round_off = 64 * 2.220446049250313e-16 * scale
    if abs(e21) <= round_off and abs(e32) <= round_off:
        out.update(behaviour="no change", note="the same on all three meshes (to round-off)",
                   phi_ext=phi1, e_ext=0.0, gci=0.0, gci_abs=0.0)
        return out
    if abs(e21) <= round_off:
        out.update(behaviour="undefined", note="fine and medium agree to round-off while the coarse "
                   "differs: no order can be computed")
        return out
    ratio = e32 / e21
    s = 1.0 if ratio > 0 else -1.0
    converging = abs(ratio) > 1.0   # the change shrinks from (coarse, medium) to (medium, fine)
    if not converging:
        out.update(behaviour="divergent" if s > 0 else "oscillatory divergent",
                   note="the change between meshes does not shrink with refinement "
                        "(|eps21/eps32| = %.3g >= 1): no order" % abs(1.0 / ratio))
        return out
    out["behaviour"] = "monotonic" if s > 0 else "oscillatory"
    p = _apparent_order(r21, r32, e21, e32, s)
    if p is None or p <= 0:
        out["note"] = "the order equation has no solution"
        return out
    rp = r21 ** p
    phi_ext = (rp * phi1 - phi2) / (rp - 1.0)
    out.update(order=p, phi_ext=phi_ext, e_ext=abs((phi_ext - phi1) / phi_ext) if phi_ext != 0 else nan,
               gci=safety_factor * out["e_a"] / (rp - 1.0),
               gci_abs=safety_factor * abs(e21) / (rp - 1.0))
    if s < 0:
        out["note"] = ("oscillatory convergence (eps32/eps21 < 0, Celik et al. 2008): the order and "
                       "the GCI are less reliable")
    return out


def study(values, sizes, units=None, safety_factor=1.25):
    """Convergence of many quantities.

    values: {name: (phi1, phi2, phi3)}; sizes: (h1, h2, h3); units: {name: unit}.
    Quantities whose magnitude is below 1e-9 of the largest quantity of the same
    unit count as zero to round-off.  Returns {name: gci dict + 'unit'}.
    """
    units = units or {}
    largest = {}
    for name, phi in values.items():
        u = units.get(name, "")
        m = max((abs(v) for v in phi if math.isfinite(v)), default=0.0)
        largest[u] = max(largest.get(u, 0.0), m)
    out = {}
    for name, phi in values.items():
        u = units.get(name, "")
        res = gci(phi, sizes, safety_factor=safety_factor, zero_scale=1e-9 * largest.get(u, 0.0))
        res["unit"] = u
        out[name] = res
    return out
