"""Mesh convergence (`wallloads-report --convergence FINE MEDIUM COARSE`).

1. The procedure of Celik et al., J. Fluids Eng. 130(7):078001 (2008), on
   synthetic values of known order phi(h) = phi0 + C h^p: the order and the
   extrapolated value come back exactly (to round-off) for equal and unequal
   refinement ratios; the GCI is Fs e_a / (r^p - 1) with Fs = 1.25 (Roache
   1998); the paper's own worked example (Table 1, first column: phi =
   6.063, 5.972, 5.863 on 18000, 8000, 4500 cells in 2-D) gives the printed
   p = 1.53, phi_ext = 6.1685, e_a = 1.5 %, e_ext = 1.7 %, GCI = 2.2 %;
   oscillatory convergence is reported as such, divergence gives no order.
2. A real refinement through the command: Archimedes buoyancy on three
   faceted spheres refined by 2 (hydrostatic pressure at the face centroids,
   so the force is exactly rho g V of the polyhedron, whose volume error is
   O(h^2)). The observed order must be 2, and the Richardson extrapolation must
   beat the fine mesh by at least the factor r^p = 4 that one more refinement
   of order 2 would give (the h^2 term is removed; what remains is O(h^4));
   the GCI must bound the fine mesh's true error.
"""
import math
import os


import report_testing as R
import scenes as S
from wallloads import convergence as Cv

# --- 1. synthetic values of known order ------------------------------------------
for p_true, h in ((2.0, (0.1, 0.2, 0.4)), (1.0, (0.1, 0.2, 0.4)), (1.5, (0.1, 0.15, 0.2)), (2.0, (0.01, 0.013, 0.02))):
    phi0, C = 3.25, -0.8
    phi = [phi0 + C * x ** p_true for x in h]
    res = Cv.gci(phi, h)
    R.close("synthetic p = %g, h = %s: observed order" % (p_true, h), res["order"], p_true, rtol=1e-9,
            source="Celik et al. 2008 eqs. 3-5")
    R.close("synthetic p = %g: extrapolated value" % p_true, res["phi_ext"], phi0, rtol=1e-11,
            source="Celik et al. 2008 eq. 6")
    r21 = h[1] / h[0]
    R.close("synthetic p = %g: GCI = 1.25 e_a / (r^p - 1)" % p_true, res["gci"],
            1.25 * abs((phi[0] - phi[1]) / phi[0]) / (r21 ** p_true - 1), rtol=1e-9, source="Roache 1998")
    R.close("synthetic p = %g: e_ext is the fine mesh's true error" % p_true, res["e_ext"],
            abs((phi0 - phi[0]) / phi0), rtol=1e-8)
    R.expect("synthetic p = %g: monotonic" % p_true, res["behaviour"] == "monotonic", res["behaviour"])

# Celik et al. 2008, Table 1, first column (values as printed there).
h = [Cv.cell_size(1.0, n, 2) for n in (18000, 8000, 4500)]
res = Cv.gci((6.063, 5.972, 5.863), h)
R.close("Celik Table 1: apparent order", round(res["order"], 2), 1.53, atol=1e-12, source="Celik et al. 2008 Table 1")
R.close("Celik Table 1: extrapolated value", round(res["phi_ext"], 4), 6.1685, atol=1e-12)
R.close("Celik Table 1: e_a [%]", round(100 * res["e_a"], 1), 1.5, atol=1e-12)
R.close("Celik Table 1: e_ext [%]", round(100 * res["e_ext"], 1), 1.7, atol=1e-12)
R.close("Celik Table 1: GCI fine [%]", round(100 * res["gci"], 1), 2.2, atol=1e-12)

# Oscillatory convergence: the sign of the change alternates while it shrinks by r^p.
osc = Cv.gci((1.0 + 0.01, 1.0 - 0.04, 1.0 + 0.16), (0.1, 0.2, 0.4))
R.expect("alternating changes: oscillatory convergence detected", osc["behaviour"] == "oscillatory", osc["behaviour"])
R.expect("oscillatory: the note says so", "oscillatory" in osc["note"])
R.close("oscillatory: order of the shrinking changes", osc["order"], 2.0, rtol=1e-9)
div = Cv.gci((1.0, 1.1, 1.15), (0.1, 0.2, 0.4))
R.expect("growing changes: divergent, no order", div["behaviour"] == "divergent" and math.isnan(div["order"]),
         div["behaviour"])
zero = Cv.study({"Drag": (2.0, 1.9, 1.6), "Side Force": (1e-19, -3e-19, 2e-20)}, (0.1, 0.2, 0.4),
                {"Drag": "N", "Side Force": "N"})
R.expect("round-off quantity: zero, no order", zero["Side Force"]["behaviour"] == "zero")

# --- 2. Archimedes buoyancy on three faceted spheres ---------------------------------
W = R.workdir("convergence")
RADIUS, RHO, G, P0 = 0.5, 1000.0, 9.81, 1.0e5
paths = []
for n, name in ((32, "fine"), (16, "medium"), (8, "coarse")):
    pts, faces, _ = S.uv_sphere(RADIUS, n, 2 * n, ordering="into_wall")
    c = S.face_centroids(pts, faces)
    pd = S.polydata(pts, faces, cell_arrays={"static_pressure": P0 - RHO * G * c[:, 2]})
    from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter
    w = vtkXMLPolyDataWriter()
    path = os.path.join(W, "sphere_%s.vtp" % name)
    w.SetFileName(path)
    w.SetDataModeToBinary()
    w.SetInputData(pd)
    assert w.Write() == 1
    paths.append(path)

out = os.path.join(W, "out")
code, _, err = R.run(["--convergence"] + paths + ["-o", out, "--images", "no", "--shear-source", "none",
                                                  "--drag-direction", "0,0,1", "--lift-direction", "1,0,0"])
R.expect("convergence run: exit 0", code == 0, err[-1500:] if code else "")
table = R.csv_table(os.path.join(out, "convergence.csv"))
drag = table["Drag"]
exact = RHO * G * 4.0 / 3.0 * math.pi * RADIUS ** 3
R.close("buoyancy: observed order", drag["Observed Order"], 2.0, atol=0.05,
        source="faceted sphere volume error O(h^2)")
e_fine = abs(drag["Fine"] - exact) / exact
e_ext = abs(drag["Extrapolated"] - exact) / exact
r21 = drag["r21"]
factor = r21 ** drag["Observed Order"]
print("buoyancy exact %.6f N (Archimedes): fine %.6f N (error %.3e), extrapolated %.6f N (error %.3e): %.0fx better,"
      " r^p = %.2f; GCI %.3e" % (exact, drag["Fine"], e_fine, drag["Extrapolated"], e_ext, e_fine / e_ext, factor,
                                 drag["GCI Fine"]))
R.expect("buoyancy: extrapolation beats the fine mesh by at least r^p", e_ext * factor <= e_fine,
         "%.3e * %.2f vs %.3e" % (e_ext, factor, e_fine))
R.expect("buoyancy: GCI bounds the fine mesh's true error", e_fine <= drag["GCI Fine"],
         "%.3e <= %.3e" % (e_fine, drag["GCI Fine"]))
R.close("buoyancy: e_ext estimates the fine mesh's error", drag["Extrapolated Relative Error"], e_fine, rtol=0.05)
R.expect("buoyancy: monotonic", drag["Behaviour"] == "monotonic", drag["Behaviour"])
R.expect("side force is zero to round-off, no order claimed", table["Side Force"]["Behaviour"] == "zero",
         table["Side Force"]["Behaviour"])
R.expect("cases reported as fine, medium, coarse", all(os.path.exists(os.path.join(out, k, "loads.csv"))
                                                       for k in ("fine", "medium", "coarse")))
rec = R.read_json(os.path.join(out, "convergence.json"))
R.expect("convergence.json: cell size from the wetted area", rec["cell_size"] == "area")
with open(os.path.join(out, "index.html")) as handle:
    R.expect("index.html shows the convergence table", "Mesh convergence" in handle.read())

# Cell size from the volume when the cases hold one: three CGNS channels refined
# by 2, with Couette flow, whose wall loads are exact on every mesh: h =
# (V / N)^(1/3), and the loads are reported as not changing.
import scenes.formats as F  # noqa: E402
paths = []
for k, name in ((4, "fine"), (2, "medium"), (1, "coarse")):
    ch = F.channel(nx=3 * k, ny=2 * k, nz=2 * k)
    paths.append(F.write_cgns(os.path.join(W, "channel_%s.cgns" % name), ch))
out = os.path.join(W, "out-volume")
code, _, err = R.run(["--convergence"] + paths + ["-o", out, "--images", "no", "--walls", "floor,lid",
                                                  "--wall-velocity", "wall_velocity", "--viscosity", "1.5e-3"])
R.expect("volume cell size: exit 0", code == 0, err[-1500:] if code else "")
rec = R.read_json(os.path.join(out, "convergence.json"))
R.expect("convergence.json: cell size from the volume", rec["cell_size"] == "volume")
V = 2.0 * 1.0 * 0.5
for case_rec, k in zip(rec["cases"], (4, 2, 1)):
    R.close("h of the %s channel = (V / N)^(1/3)" % case_rec["name"], case_rec["h"],
            (V / (12 * k ** 3)) ** (1.0 / 3.0), rtol=1e-12, source="Celik et al. 2008 eq. 2")
table = R.csv_table(os.path.join(out, "convergence.csv"))
R.expect("exact loads on every mesh: 'no change'", table["Viscous Force X"]["Behaviour"] in ("no change", "zero")
         and table["Pressure Force Z"]["Behaviour"] == "no change",
         (table["Viscous Force X"]["Behaviour"], table["Pressure Force Z"]["Behaviour"]))
R.done(__file__)
