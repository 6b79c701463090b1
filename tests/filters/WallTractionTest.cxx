// SPDX-License-Identifier: BSD-3-Clause
#include "FilterTestUtilities.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkCellType.h"
#include "vtkDataSetAttributes.h"
#include "vtkDoubleArray.h"
#include "vtkFloatArray.h"
#include "vtkLoadIntegration.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkSMPTools.h"
#include "vtkTable.h"
#include "vtkUnsignedCharArray.h"
#include "vtkUnstructuredGrid.h"
#include "vtkWallTraction.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace wltest;

namespace
{
vtkSmartPointer<vtkWallTraction> Traction(vtkDataObject* input)
{
  auto wt = vtkSmartPointer<vtkWallTraction>::New();
  wt->SetInputDataObject(input);
  wt->SetOrientation(vtkWallTraction::STORED_INTO_FLUID);
  return wt;
}
}

// Archimedes: on a closed body in hydrostatic pressure p = p0 - rho g z the
// pressure force is rho g V upward (divergence theorem; e.g. White, Fluid
// Mechanics, §2.8). p is linear and each rectangle's vertex mean is its
// centroid, so point-data pressure integrates exactly: round-off only.
TEST(WallTraction, ArchimedesOnBox)
{
  const double rho = 998.2, g = 9.81, p0 = 101325.0;
  auto box = Box({ -1.0, -0.5, -2.0 }, { 2.0, 1.0, 0.5 });
  AddPointField(box, "p", 1, [&](const Vec& x, double* v) { v[0] = p0 - rho * g * x[2]; });
  auto wt = Traction(box);
  wt->SetInputArrayToProcess(vtkWallTraction::PRESSURE_ARRAY, 0, 0,
    vtkDataObject::FIELD_ASSOCIATION_POINTS, "p");
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputConnection(wt->GetOutputPort());
  li->SetMomentCentre(0.5, 0.25, -0.75); // centroid of the displaced volume
  li->Update();
  const double V = 3.0 * 1.5 * 2.5;
  vtkDataObject* out = li->GetOutputDataObject(0);
  EXPECT_NEAR(Field(out, "Force", 2), rho * g * V, 1e-12 * rho * g * V);
  EXPECT_NEAR(Field(out, "Force", 0), 0, 1e-12 * p0);
  EXPECT_NEAR(Field(out, "Force", 1), 0, 1e-12 * p0);
  for (int k = 0; k < 3; ++k)
  {
    EXPECT_NEAR(Field(out, "Moment", k), 0, 1e-12 * p0 * 10);
  }
  EXPECT_NEAR(Field(out, "Area"), 2 * (3 * 1.5 + 3 * 2.5 + 1.5 * 2.5), 1e-12);
}

// Unstructured grids: triangles, quads, pixels (raster corner order) and
// polygons are faces; a tetrahedron and a line are skipped and counted.
TEST(WallTraction, UnstructuredGridCellKinds)
{
  auto pts = vtkSmartPointer<vtkPoints>::New();
  const double xyz[][3] = { { 0, 0, 0 }, { 1, 0, 0 }, { 0, 1, 0 }, { 1, 1, 0 }, { 0, 0, 1 },
    { 2, 0, 0 }, { 2, 1, 0 } };
  for (auto& p : xyz)
  {
    pts->InsertNextPoint(p);
  }
  auto ug = vtkSmartPointer<vtkUnstructuredGrid>::New();
  ug->SetPoints(pts);
  const vtkIdType tri[3] = { 0, 1, 2 };
  const vtkIdType pixel[4] = { 0, 1, 2, 3 }; // raster order: area 1, normal +z
  const vtkIdType quad[4] = { 1, 5, 6, 3 };
  const vtkIdType poly[5] = { 0, 1, 5, 6, 2 };
  const vtkIdType tet[4] = { 0, 1, 2, 4 };
  const vtkIdType line[2] = { 0, 4 };
  ug->InsertNextCell(VTK_TRIANGLE, 3, tri);
  ug->InsertNextCell(VTK_PIXEL, 4, pixel);
  ug->InsertNextCell(VTK_QUAD, 4, quad);
  ug->InsertNextCell(VTK_POLYGON, 5, poly);
  ug->InsertNextCell(VTK_TETRA, 4, tet);
  ug->InsertNextCell(VTK_LINE, 2, line);
  auto wt = Traction(ug);
  Messages m;
  m.Watch(wt);
  wt->Update();
  vtkDataObject* out = wt->GetOutputDataObject(0);
  EXPECT_DOUBLE_EQ(Field(out, "Skipped Non-Surface Cells"), 2);
  // triangle 0.5, pixel 1, quad [1,2]x[0,1] 1, pentagon = rectangle [0,2]x[0,1] 2
  EXPECT_NEAR(Field(out, "Wetted Area"), 0.5 + 1 + 1 + 2, 1e-15);
  auto* area = vtkUnstructuredGrid::SafeDownCast(out)->GetCellData()->GetArray("Face Area");
  auto* normal = vtkUnstructuredGrid::SafeDownCast(out)->GetCellData()->GetArray("Wall Normal");
  EXPECT_DOUBLE_EQ(area->GetComponent(1, 0), 1.0);
  EXPECT_DOUBLE_EQ(normal->GetComponent(1, 2), 1.0);
  EXPECT_TRUE(std::isnan(area->GetComponent(4, 0)));
  EXPECT_TRUE(m.WarningContains("2 non-surface cells"));
}

// Float coordinates and 64-bit connectivity take other code paths; results
// must agree with the double / 32-bit path.
TEST(WallTraction, FloatPointsAndWideIds)
{
  auto sphere = Sphere(1.0, 24, 48);
  auto wt = Traction(sphere);
  wt->Update();
  const double reference = Field(wt->GetOutputDataObject(0), "Wetted Area");

  auto wide = vtkSmartPointer<vtkPolyData>::New();
  wide->DeepCopy(sphere);
  wide->GetPolys()->ConvertTo64BitStorage();
  auto wt64 = Traction(wide);
  wt64->Update();
  EXPECT_DOUBLE_EQ(Field(wt64->GetOutputDataObject(0), "Wetted Area"), reference);

  auto single = vtkSmartPointer<vtkPolyData>::New();
  single->DeepCopy(sphere);
  auto fpts = vtkSmartPointer<vtkPoints>::New();
  fpts->SetDataTypeToFloat();
  fpts->DeepCopy(sphere->GetPoints());
  single->SetPoints(fpts);
  auto wtf = Traction(single);
  wtf->Update();
  EXPECT_NEAR(Field(wtf->GetOutputDataObject(0), "Wetted Area"), reference, 1e-6 * reference);
}

// Ghost faces (DUPLICATECELL / HIDDENCELL) are never counted: wetted area
// and load totals equal those of the surface without them.
TEST(WallTraction, GhostFacesAreNotCounted)
{
  auto sphere = Sphere(1.0, 16, 32);
  AddCellField(sphere, "p", 1, [](const Vec& x, double* v) { v[0] = 1.0 + x[0] + 2 * x[2]; });
  auto ghosts = vtkSmartPointer<vtkUnsignedCharArray>::New();
  ghosts->SetName(vtkDataSetAttributes::GhostArrayName());
  ghosts->SetNumberOfTuples(sphere->GetNumberOfCells());
  ghosts->Fill(0);
  double ghostArea = 0;
  auto plain = Traction(sphere);
  plain->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  plain->Update();
  auto* areas = vtkPolyData::SafeDownCast(plain->GetOutputDataObject(0))
                  ->GetCellData()
                  ->GetArray("Face Area");
  for (vtkIdType c = 0; c < sphere->GetNumberOfCells(); c += 7)
  {
    ghosts->SetValue(c, (c % 2) ? vtkDataSetAttributes::DUPLICATECELL
                                : vtkDataSetAttributes::HIDDENCELL);
    ghostArea += areas->GetComponent(c, 0);
  }
  const double full = Field(plain->GetOutputDataObject(0), "Wetted Area");
  auto marked = vtkSmartPointer<vtkPolyData>::New();
  marked->ShallowCopy(sphere);
  marked->GetCellData()->AddArray(ghosts);
  auto wt = Traction(marked);
  wt->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  wt->Update();
  EXPECT_NEAR(Field(wt->GetOutputDataObject(0), "Wetted Area"), full - ghostArea, 1e-13 * full);
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputConnection(wt->GetOutputPort());
  li->Update();
  EXPECT_NEAR(Field(li->GetOutputDataObject(0), "Area"), full - ghostArea, 1e-13 * full);
  EXPECT_DOUBLE_EQ(Field(li->GetOutputDataObject(0), "Faces"),
    sphere->GetNumberOfCells() - (sphere->GetNumberOfCells() + 6) / 7);
}

// Sequential and threaded backends agree within 1e-12 relative.
TEST(WallTraction, SequentialAndThreadedAgree)
{
  auto sphere = Sphere(0.7, 200, 400);
  AddCellField(sphere, "p", 1, [](const Vec& x, double* v) { v[0] = 3.0 + x[0] * x[1] - x[2]; });
  AddCellField(sphere, "grad", 9, [](const Vec& x, double* v) {
    for (int k = 0; k < 9; ++k)
    {
      v[k] = std::sin(k + x[0]) * x[(k + 1) % 3];
    }
  });
  double results[2][7];
  const char* backends[2] = { "Sequential", "STDThread" };
  const std::string before = vtkSMPTools::GetBackend() ? vtkSMPTools::GetBackend() : "";
  for (int b = 0; b < 2; ++b)
  {
    ASSERT_TRUE(vtkSMPTools::SetBackend(backends[b]));
    auto wt = Traction(sphere);
    wt->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
    wt->SetInputArrayToProcess(3, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "grad");
    wt->SetShearSource(vtkWallTraction::VELOCITY_GRADIENT);
    auto li = vtkSmartPointer<vtkLoadIntegration>::New();
    li->SetInputConnection(wt->GetOutputPort());
    li->SetMomentCentre(0.1, 0.2, 0.3);
    li->Update();
    vtkDataObject* out = li->GetOutputDataObject(0);
    results[b][0] = Field(out, "Area");
    for (int k = 0; k < 3; ++k)
    {
      results[b][1 + k] = Field(out, "Force", k);
      results[b][4 + k] = Field(out, "Moment", k);
    }
  }
  vtkSMPTools::SetBackend(before.empty() ? "Sequential" : before.c_str());
  for (int k = 0; k < 7; ++k)
  {
    const double scale = std::max(std::abs(results[0][k]), 1e-3);
    EXPECT_NEAR(results[0][k], results[1][k], 1e-12 * scale) << k;
  }
}

// The input is never modified: same arrays, same modification time.
TEST(WallTraction, InputIsUntouched)
{
  auto box = Box({ 0, 0, 0 }, { 1, 1, 1 });
  AddCellField(box, "p", 1, [](const Vec&, double* v) { v[0] = 5.0; });
  const vtkMTimeType mtime = box->GetMTime();
  auto wt = Traction(box);
  wt->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  wt->Update();
  EXPECT_EQ(box->GetCellData()->GetNumberOfArrays(), 1);
  EXPECT_EQ(box->GetFieldData()->GetNumberOfArrays(), 0);
  EXPECT_EQ(box->GetMTime(), mtime);
  EXPECT_GT(vtkPolyData::SafeDownCast(wt->GetOutputDataObject(0))->GetCellData()->GetNumberOfArrays(), 10);
}

// A missing array is an error naming it and the arrays that exist.
TEST(WallTraction, MissingArrayNamesTheAlternatives)
{
  auto box = Box({ 0, 0, 0 }, { 1, 1, 1 });
  AddCellField(box, "pressure", 1, [](const Vec&, double* v) { v[0] = 1.0; });
  auto wt = Traction(box);
  wt->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  Messages m;
  m.Watch(wt);
  wt->Update();
  EXPECT_TRUE(m.ErrorContains("'p' not found")) << (m.Errors.empty() ? "" : m.Errors[0]);
  EXPECT_TRUE(m.ErrorContains("'pressure'"));
  EXPECT_EQ(vtkPolyData::SafeDownCast(wt->GetOutputDataObject(0))->GetNumberOfCells(), 0);
}

// FORCES_ONLY makes only what Load Integration needs; totals are identical.
TEST(WallTraction, ForcesOnlyGivesTheSameTotals)
{
  auto sphere = Sphere(1.0, 20, 40);
  AddCellField(sphere, "p", 1, [](const Vec& x, double* v) { v[0] = 2.0 + x[2]; });
  AddCellField(sphere, "wss", 3, [](const Vec& x, double* v) {
    v[0] = x[1];
    v[1] = -x[0];
    v[2] = 0.5;
  });
  double totals[2][7];
  for (int mode = 0; mode < 2; ++mode)
  {
    auto wt = Traction(sphere);
    wt->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
    wt->SetInputArrayToProcess(2, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "wss");
    wt->SetShearSource(vtkWallTraction::WALL_SHEAR_STRESS);
    wt->SetPerFaceArrays(mode);
    auto li = vtkSmartPointer<vtkLoadIntegration>::New();
    li->SetInputConnection(wt->GetOutputPort());
    li->SetMomentCentre(0.3, 0, 0);
    li->Update();
    vtkDataObject* out = li->GetOutputDataObject(0);
    totals[mode][0] = Field(out, "Area");
    for (int k = 0; k < 3; ++k)
    {
      totals[mode][1 + k] = Field(out, "Force", k);
      totals[mode][4 + k] = Field(out, "Moment", k);
    }
    auto* cd = vtkPolyData::SafeDownCast(wt->GetOutputDataObject(0))->GetCellData();
    EXPECT_EQ(cd->GetArray("Traction") != nullptr, mode == vtkWallTraction::ALL_ARRAYS);
    EXPECT_NE(cd->GetArray("Pressure Force"), nullptr);
  }
  for (int k = 0; k < 7; ++k)
  {
    EXPECT_EQ(totals[0][k], totals[1][k]) << k;
  }
}
