// SPDX-License-Identifier: BSD-3-Clause
// vtkLoadDistribution on hand-made Wall Traction arrays: the exact share of
// each face's force among the bins (fractions derived beside each check),
// the moments of the parts, ghost faces left out, cell kinds (quad, triangle,
// pixel) and both connectivity widths and point types.
#include "FilterTestUtilities.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDataSetAttributes.h"
#include "vtkDoubleArray.h"
#include "vtkLoadDistribution.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkTable.h"
#include "vtkUnsignedCharArray.h"
#include "vtkUnstructuredGrid.h"

#include <gtest/gtest.h>

#include <vector>

using namespace wltest;

namespace
{
struct Face
{
  int Type;
  std::vector<Vec> Corners;
  Vec ForceP, ForceV;
  double Area;
  bool Ghost;
};

// A quad x in [0, 2] at z = 0 (area 2), a triangle x in [2, 4] at z = 1
// whose width across x is 4 - x (area 2), a unit pixel x in [0, 1] at z = 2,
// and a ghost quad over the whole range (must not count).
std::vector<Face> Faces()
{
  return {
    { VTK_QUAD, { { 0, 0, 0 }, { 2, 0, 0 }, { 2, 1, 0 }, { 0, 1, 0 } }, { 0, 0, -2 }, { 1, 0, 0 }, 2.0,
      false },
    { VTK_TRIANGLE, { { 2, 0, 1 }, { 4, 0, 1 }, { 2, 2, 1 } }, { 0, 0, 4 }, { 0, 0, 0 }, 2.0, false },
    { VTK_PIXEL, { { 0, 0, 2 }, { 1, 0, 2 }, { 0, 1, 2 }, { 1, 1, 2 } }, { 0, 1, 0 }, { 0, 0, 0 }, 1.0,
      false },
    { VTK_QUAD, { { 0, 0, 5 }, { 4, 0, 5 }, { 4, 1, 5 }, { 0, 1, 5 } }, { 9, 9, 9 }, { 9, 9, 9 }, 4.0,
      true },
  };
}

void AddArrays(vtkDataSet* ds, const std::vector<Face>& faces)
{
  auto fp = vtkSmartPointer<vtkDoubleArray>::New();
  auto fv = vtkSmartPointer<vtkDoubleArray>::New();
  auto area = vtkSmartPointer<vtkDoubleArray>::New();
  auto ghosts = vtkSmartPointer<vtkUnsignedCharArray>::New();
  fp->SetName("Pressure Force");
  fv->SetName("Viscous Force");
  area->SetName("Face Area");
  ghosts->SetName(vtkDataSetAttributes::GhostArrayName());
  fp->SetNumberOfComponents(3);
  fv->SetNumberOfComponents(3);
  for (const Face& f : faces)
  {
    fp->InsertNextTuple(f.ForceP.data());
    fv->InsertNextTuple(f.ForceV.data());
    area->InsertNextValue(f.Area);
    ghosts->InsertNextValue(f.Ghost ? vtkDataSetAttributes::DUPLICATECELL : 0);
  }
  ds->GetCellData()->AddArray(fp);
  ds->GetCellData()->AddArray(fv);
  ds->GetCellData()->AddArray(area);
  ds->GetCellData()->AddArray(ghosts);
}

vtkSmartPointer<vtkUnstructuredGrid> Grid(bool floatPoints)
{
  const auto faces = Faces();
  auto points = vtkSmartPointer<vtkPoints>::New();
  points->SetDataType(floatPoints ? VTK_FLOAT : VTK_DOUBLE);
  auto ug = vtkSmartPointer<vtkUnstructuredGrid>::New();
  ug->SetPoints(points);
  ug->Allocate(4);
  for (const Face& f : faces)
  {
    std::vector<vtkIdType> ids;
    for (const Vec& c : f.Corners)
    {
      ids.push_back(points->InsertNextPoint(c.data()));
    }
    ug->InsertNextCell(f.Type, static_cast<vtkIdType>(ids.size()), ids.data());
  }
  AddArrays(ug, faces);
  return ug;
}

// The same faces without the pixel, as polydata with 32-bit connectivity.
vtkSmartPointer<vtkPolyData> Poly()
{
  auto faces = Faces();
  faces.erase(faces.begin() + 2);
  auto points = vtkSmartPointer<vtkPoints>::New();
  auto polys = vtkSmartPointer<vtkCellArray>::New();
  polys->Use32BitStorage();
  for (const Face& f : faces)
  {
    std::vector<vtkIdType> ids;
    for (const Vec& c : f.Corners)
    {
      ids.push_back(points->InsertNextPoint(c.data()));
    }
    polys->InsertNextCell(static_cast<vtkIdType>(ids.size()), ids.data());
  }
  auto pd = vtkSmartPointer<vtkPolyData>::New();
  pd->SetPoints(points);
  pd->SetPolys(polys);
  AddArrays(pd, faces);
  return pd;
}

vtkTable* Distribute(vtkLoadDistribution* ld, vtkDataObject* input)
{
  ld->SetInputDataObject(input);
  ld->SetAxisDirection(2, 0, 0); // x, given unnormalised
  ld->SetNumberOfBins(4);
  ld->SetUseCustomRange(1);
  ld->SetRange(0, 4);
  ld->Update();
  return vtkTable::SafeDownCast(ld->GetOutputDataObject(0));
}

double At(vtkTable* t, const char* column, int row, int k = 0)
{
  return vtkDataArray::SafeDownCast(t->GetColumnByName(column))->GetComponent(row, k);
}
}

// Shares (derivation): the quad is 1 wide across x, so each of bins 0 and 1
// holds half of it; the triangle's width across x is 4 - x, so bin 2 holds
// int_2^3 (4 - x) dx / 2 = 3/4 of it and bin 3 the other 1/4; the pixel lies
// in bin 0. The ghost quad is left out. Bin widths are 1, so force per
// length = the bin's force.
TEST(LoadDistribution, ExactSharesOfEachFace)
{
  for (bool floatPoints : { false, true })
  {
    auto ld = vtkSmartPointer<vtkLoadDistribution>::New();
    Messages msgs;
    msgs.Watch(ld);
    vtkTable* t = Distribute(ld, Grid(floatPoints));
    ASSERT_EQ(t->GetNumberOfRows(), 4);
    EXPECT_TRUE(msgs.Errors.empty() && msgs.Warnings.empty());
    const double area[4] = { 1 + 1, 1, 1.5, 0.5 };
    const double fpz[4] = { -1, -1, 3, 1 };
    const double fvx[4] = { 0.5, 0.5, 0, 0 };
    const double fpy[4] = { 1, 0, 0, 0 };
    for (int b = 0; b < 4; ++b)
    {
      EXPECT_NEAR(At(t, "Start", b), b, 1e-15);
      EXPECT_NEAR(At(t, "End", b), b + 1, 1e-15);
      EXPECT_NEAR(At(t, "Centre", b), b + 0.5, 1e-15);
      EXPECT_NEAR(At(t, "Area", b), area[b], 1e-15);
      EXPECT_NEAR(At(t, "Pressure Force Per Length", b, 2), fpz[b], 1e-15);
      EXPECT_NEAR(At(t, "Pressure Force Per Length", b, 1), fpy[b], 1e-15);
      EXPECT_NEAR(At(t, "Viscous Force Per Length", b, 0), fvx[b], 1e-15);
      EXPECT_NEAR(At(t, "Force Per Length", b, 2), fpz[b], 1e-15);
    }
    // Cumulative force along z from the first bin: -1, -2, 1, 2.
    const double cumulative[4] = { -1, -2, 1, 2 };
    for (int b = 0; b < 4; ++b)
    {
      EXPECT_NEAR(At(t, "Cumulative Force", b, 2), cumulative[b], 1e-15);
    }
    // Default load axes (no Load Direction in the input): drag +x, lift +z.
    EXPECT_NEAR(At(t, "Drag Per Length", 0), 0.5, 1e-15);
    EXPECT_NEAR(At(t, "Lift Per Length", 2), 3, 1e-15);
    EXPECT_NEAR(At(t, "Side Force Per Length", 0), 1, 1e-15); // +y = lift x drag
    // Moments about the origin, each part's force at its area centroid:
    // bin 0: the quad's half (centroid (0.5, 0.5, 0), force (0.5, 0, -1))
    // gives (-0.5, 0.5, -0.25); the pixel (centroid (0.5, 0.5, 2), force
    // (0, 1, 0)) gives (-2, 0, 0.5). Bin 3: the triangle's tip, x in [3, 4],
    // centroid (10/3, 1/3, 1), force (0, 0, 1): (1/3, -10/3, 0).
    const double m0[3] = { -2.5, 0.5, 0.25 };
    const double m3[3] = { 1.0 / 3, -10.0 / 3, 0 };
    for (int k = 0; k < 3; ++k)
    {
      EXPECT_NEAR(At(t, "Moment", 0, k), m0[k], 1e-14);
      EXPECT_NEAR(At(t, "Moment", 3, k), m3[k], 1e-14);
    }
    EXPECT_EQ(At(t, "Bin", 3), 3);
  }
}

// Polydata with 32-bit connectivity: the same shares (without the pixel).
TEST(LoadDistribution, PolyData32BitIds)
{
  auto ld = vtkSmartPointer<vtkLoadDistribution>::New();
  vtkTable* t = Distribute(ld, Poly());
  ASSERT_EQ(t->GetNumberOfRows(), 4);
  const double area[4] = { 1, 1, 1.5, 0.5 };
  for (int b = 0; b < 4; ++b)
  {
    EXPECT_NEAR(At(t, "Area", b), area[b], 1e-15);
  }
  EXPECT_NEAR(At(t, "Force Per Length", 2, 2), 3, 1e-15);
}

// The default range is the extent of the counted faces (the ghost quad at
// z = 5 spans x in [0, 4] too, so the triangle is moved to show it: here
// the extent is that of the quad and triangle only, [0, 4]).
TEST(LoadDistribution, DefaultRangeIsTheFacesExtent)
{
  auto ld = vtkSmartPointer<vtkLoadDistribution>::New();
  auto pd = Poly();
  // Stretch the ghost quad beyond: x in [-3, 9]; it must not widen the range.
  pd->GetPoints()->SetPoint(7, -3, 0, 5);
  pd->GetPoints()->SetPoint(8, 9, 0, 5);
  pd->GetPoints()->SetPoint(9, 9, 1, 5);
  pd->GetPoints()->SetPoint(10, -3, 1, 5);
  ld->SetInputDataObject(pd);
  ld->SetAxisDirection(1, 0, 0);
  ld->SetNumberOfBins(2);
  ld->Update();
  vtkTable* t = vtkTable::SafeDownCast(ld->GetOutputDataObject(0));
  ASSERT_EQ(t->GetNumberOfRows(), 2);
  EXPECT_EQ(At(t, "Start", 0), 0);
  EXPECT_EQ(At(t, "End", 1), 4);
  EXPECT_NEAR(At(t, "Area", 0), 2, 1e-15);
  EXPECT_NEAR(At(t, "Area", 1), 2, 1e-15);
  EXPECT_EQ(Field(t, "Bin Width"), 2);
}
