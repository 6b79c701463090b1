"""Bad and awkward input for Load Distribution: clear errors, no crash or
hang, never a partial table passed off as a result, and the filter recovers
when the setting is corrected. Also: faces skipped upstream (NaN) are counted
and warned about, a custom range reports the area outside it, non-surface
cells are left out, and the input is never modified.
"""
import math

import numpy as np

from vtkmodules.util.numpy_support import vtk_to_numpy
from vtkmodules.vtkCommonDataModel import vtkPolyData

import wl_testing as T
import scenes as S

simple = T.load_plugin()
expect, contains_all, Capture = T.expect, T.contains_all, T.Capture

SP, SF, _ = S.uv_sphere(1.0, 10, 16, center=(0.0, 0.0, 0.5))
SC = S.face_centroids(SP, SF)
NS = len(SF)


def rows(ld):
    return T.output_of(ld).GetNumberOfRows()


def column(ld, name):
    return vtk_to_numpy(T.output_of(ld).GetColumnByName(name))


# (a) not the output of Wall Traction: the error names the array and lists those that exist.
print("\n== (a) no force arrays ==")
plain = T.producer(S.polydata(SP, SF, cell_arrays={"p": SC[:, 2].copy()}))
ld = simple.LoadDistribution(Input=plain)
cap = Capture(ld)
expect("no force arrays: no table", rows(ld) == 0)
expect("no force arrays: one error", len(cap.errors) == 1, str(cap.errors))
contains_all("no force arrays: names the array, the filter it needs and the arrays present", cap.errors[0],
             ["Pressure Force", "Wall Traction", "p"])

# A Wall Traction output to work with from here on.
wt = simple.WallTraction(Input=plain, Pressure=["CELLS", "p"])
li = simple.LoadIntegration(Input=wt)
ld = simple.LoadDistribution(Input=wt, NumberOfBins=8)
cap = Capture(ld)
expect("good input: 8 rows, no message", rows(ld) == 8 and not cap.errors and not cap.warnings,
       str(cap.errors + cap.warnings))

# (b) axis direction zero or not finite; (c) bins < 1 or too many; (d) bad custom range.
bad_settings = [
    ("zero axis", {"AxisDirection": [0, 0, 0]}, ["Axis Direction", "non-zero"]),
    ("NaN axis", {"AxisDirection": [math.nan, 0, 1]}, ["Axis Direction", "finite"]),
    ("NaN origin", {"AxisOrigin": [0, math.nan, 0]}, ["Axis Origin", "finite"]),
    ("0 bins", {"NumberOfBins": 0}, ["Number Of Bins is 0", "from 1 to 100000"]),
    ("negative bins", {"NumberOfBins": -3}, ["Number Of Bins is -3"]),
    ("too many bins", {"NumberOfBins": 100001}, ["Number Of Bins is 100001"]),
    ("NaN range", {"UseCustomRange": 1, "Range": [math.nan, 1.0]}, ["Range", "finite"]),
    ("infinite range", {"UseCustomRange": 1, "Range": [0.0, math.inf]}, ["Range", "finite"]),
    ("reversed range", {"UseCustomRange": 1, "Range": [1.0, 0.0]}, ["Range", "second above the first"]),
    ("empty range", {"UseCustomRange": 1, "Range": [0.5, 0.5]}, ["Range"]),
    ("parallel drag and lift", {"DragDirection": [0, 0, 1], "LiftDirection": [0, 0, 2]},
     ["Drag Direction", "Lift Direction", "not parallel"]),
]
good = {"AxisDirection": [0, 0, 1], "AxisOrigin": [0, 0, 0], "NumberOfBins": 8, "UseCustomRange": 0,
        "Range": [0, 1], "DragDirection": [0, 0, 0], "LiftDirection": [0, 0, 0]}
print("\n== (b, c, d) bad settings ==")
for label, settings, parts in bad_settings:
    for key, value in settings.items():
        setattr(ld, key, value)
    cap.errors.clear()
    n = rows(ld)
    expect("%s: no table" % label, n == 0, "%d rows" % n)
    expect("%s: one error" % label, len(cap.errors) == 1, str(cap.errors))
    contains_all("%s: the error says what is wrong" % label, cap.errors[0], parts)
    for key, value in good.items():
        setattr(ld, key, value)
    cap.errors.clear()
    expect("%s corrected: the table is back" % label, rows(ld) == 8 and not cap.errors, str(cap.errors))

# Extreme but valid axis directions (found by the fuzz driver): a direction
# whose norm overflows or underflows is the same axis as (0, 0, 1).
reference = column(ld, "Force Per Length").copy()
for direction in ([0, 0, 1e200], [0, 0, 1e-200], [1e-300, 0, 3e-170]):
    ld.AxisDirection = direction
    cap.errors.clear()
    got = column(ld, "Force Per Length")
    same = direction[0] == 0 and not cap.errors and np.array_equal(got, reference)
    expect("axis direction %s: %s" % (direction, "the table of (0, 0, 1)" if direction[0] == 0 else "no error"),
           same if direction[0] == 0 else not cap.errors, str(cap.errors))
ld.AxisDirection = [0, 0, 1]

# (e) faces that span no length along the axis (a flat disc across it).
print("\n== (e) no length along the axis ==")
disc_pts = np.array([[math.cos(t), math.sin(t), 2.0] for t in np.linspace(0, 2 * math.pi, 9)[:-1]])
disc = T.producer(S.polydata(disc_pts, [tuple(range(8))], cell_arrays={"p": np.ones(1)}))
ld_disc = simple.LoadDistribution(Input=simple.WallTraction(Input=disc, Pressure=["CELLS", "p"]))
cap_disc = Capture(ld_disc)
expect("flat disc across the axis: no table", rows(ld_disc) == 0)
contains_all("flat disc across the axis: the error says so and what to do", cap_disc.errors[0],
             ["span no length", "Axis Direction", "Range"])
ld_disc.UseCustomRange = 1
ld_disc.Range = [1.5, 2.5]
ld_disc.NumberOfBins = 4
cap_disc.errors.clear()
area = column(ld_disc, "Area")
# The disc lies in the plane z = 2, the edge between bins 1 and 2: it is in
# bin 2 (a face in a bin plane belongs to the bin above it).
expect("flat disc with a custom range: whole disc in the bin above its plane",
       not cap_disc.errors and area[2] > 0 and area[0] == area[1] == area[3] == 0, str(area))

# (f) faces Wall Traction skipped (NaN pressure) are counted and warned about.
print("\n== (f) NaN faces ==")
p = SC[:, 2].copy()
p[[3, 40, 77]] = math.nan
wt_nan = simple.WallTraction(Input=T.producer(S.polydata(SP, SF, cell_arrays={"p": p})), Pressure=["CELLS", "p"])
ld_nan = simple.LoadDistribution(Input=wt_nan, NumberOfBins=5)
li_nan = simple.LoadIntegration(Input=wt_nan)
cap_nan = Capture(ld_nan)
tab = T.output_of(ld_nan)
expect("NaN faces: a table", tab.GetNumberOfRows() == 5)
expect("NaN faces: 3 skipped faces recorded", T.field(tab, "Skipped Faces") == 3, str(T.field(tab, "Skipped Faces")))
expect("NaN faces: one warning with the count", len(cap_nan.warnings) == 1 and "3 faces" in cap_nan.warnings[0],
       str(cap_nan.warnings))
expect("NaN faces: the table is finite", np.all(np.isfinite(vtk_to_numpy(tab.GetColumnByName("Force Per Length")))))
T.check_close("NaN faces: bins add up to Load Integration's area (which skips them too)",
              column(ld_nan, "Area").sum(), T.field(T.output_of(li_nan), "Area"), rtol=1e-12)

# (g) a custom range narrower than the body: the area outside is reported.
print("\n== (g) custom range ==")
ld.UseCustomRange = 1
ld.Range = [0.0, 1.0]  # the sphere spans z in [-0.5, 1.5]
cap.warnings.clear()
tab = T.output_of(ld)
inside = column(ld, "Area").sum()
total = T.field(T.output_of(li), "Area")
T.check_close("custom range: area inside + Area Outside Range = wetted area",
              inside + T.field(tab, "Area Outside Range"), total, rtol=1e-12)
expect("custom range: a warning names the area outside", len(cap.warnings) == 1 and
       "outside the Range" in cap.warnings[0], str(cap.warnings))
T.check_close("custom range: Start of the first bin, End of the last", [column(ld, "Start")[0], column(ld, "End")[-1]],
              [0.0, 1.0], atol=0)
ld.UseCustomRange = 0

# (h) empty inputs.
print("\n== (h) empty input ==")
empty = T.producer(vtkPolyData())
ld_empty = simple.LoadDistribution(Input=empty)
cap_empty = Capture(ld_empty)
expect("empty input, not from Wall Traction: no table", rows(ld_empty) == 0)
contains_all("empty input, not from Wall Traction: error", cap_empty.errors[0], ["no faces", "Wetted Area"])

# (i) vertices and lines among the faces are left out.
print("\n== (i) non-surface cells ==")
from vtkmodules.vtkCommonDataModel import vtkCellArray  # noqa: E402
mixed = S.polydata(SP, SF, cell_arrays={"p": SC[:, 2].copy()})
verts, lines = vtkCellArray(), vtkCellArray()
verts.InsertNextCell(1, [0])
lines.InsertNextCell(2, [0, 5])
mixed_all = vtkPolyData()
mixed_all.DeepCopy(mixed)
mixed_all.SetVerts(verts)
mixed_all.SetLines(lines)
from vtkmodules.util.numpy_support import numpy_to_vtk  # noqa: E402
pa = numpy_to_vtk(np.concatenate([[0.0, 0.0], SC[:, 2]]), deep=1)
pa.SetName("p")
mixed_all.GetCellData().RemoveArray("p")
mixed_all.GetCellData().AddArray(pa)
wt_mixed = simple.WallTraction(Input=T.producer(mixed_all), Pressure=["CELLS", "p"])
ld_mixed = simple.LoadDistribution(Input=wt_mixed, NumberOfBins=6)
li_mixed = simple.LoadIntegration(Input=wt_mixed)
T.check_close("vertices and lines: not in the bins", column(ld_mixed, "Area").sum(),
              T.field(T.output_of(li_mixed), "Area"), rtol=1e-12)

# (j) the input is never modified.
before = T.output_of(wt)
names = [before.GetCellData().GetArrayName(i) for i in range(before.GetCellData().GetNumberOfArrays())]
fields = [before.GetFieldData().GetArrayName(i) for i in range(before.GetFieldData().GetNumberOfArrays())]
ld.NumberOfBins = 9
T.output_of(ld)
after = T.output_of(wt)
expect("the input is never modified", names == [after.GetCellData().GetArrayName(i)
                                                  for i in range(after.GetCellData().GetNumberOfArrays())]
       and fields == [after.GetFieldData().GetArrayName(i) for i in range(after.GetFieldData().GetNumberOfArrays())])
T.done("test_load_distribution_bad_input")
