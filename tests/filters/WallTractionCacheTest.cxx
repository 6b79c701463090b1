// SPDX-License-Identifier: BSD-3-Clause
// What Wall Traction keeps between executions (issue 11): the orientation
// check's result while the mesh is unchanged (by identity and modification
// time, or by content for new objects), and output arrays reused only when
// nothing else holds them. Results must be those of a fresh filter.
#include "FilterTestUtilities.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDoubleArray.h"
#include "vtkLoadIntegration.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkWallTraction.h"

#include <gtest/gtest.h>

#include <vector>

using namespace wltest;

namespace
{
vtkSmartPointer<vtkWallTraction> Traction(vtkDataObject* input)
{
  auto wt = vtkSmartPointer<vtkWallTraction>::New();
  wt->SetInputDataObject(input);
  wt->SetOrientation(vtkWallTraction::STORED_INTO_FLUID);
  wt->SetInputArrayToProcess(
    vtkWallTraction::PRESSURE_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  return wt;
}

vtkSmartPointer<vtkPolyData> PressureSphere(double p0)
{
  auto s = Sphere(1.0, 12, 16);
  AddCellField(s, "p", 1, [&](const Vec& x, double* v) { v[0] = p0 + x[2]; });
  return s;
}

/// The sphere with one face removed (four open edges): an open surface,
/// which takes the exact check and whose result is hashed.
vtkSmartPointer<vtkPolyData> OpenPressureSphere(double p0)
{
  auto s = PressureSphere(p0);
  s->BuildCells();
  s->DeleteCell(40);
  s->RemoveDeletedCells();
  return s;
}

vtkSmartPointer<vtkPolyData> Copy(vtkPolyData* pd)
{
  auto c = vtkSmartPointer<vtkPolyData>::New();
  c->DeepCopy(pd); // new point, cell and array objects, same content
  return c;
}

double Inconsistent(vtkWallTraction* wt)
{
  return Field(wt->GetOutputDataObject(0), "Inconsistently Oriented Faces");
}
double OpenEdges(vtkWallTraction* wt)
{
  return Field(wt->GetOutputDataObject(0), "Open Boundary Edges");
}
}

TEST(WallTractionCache, ReExecutionReusesTheOrientationCheck)
{
  auto s = PressureSphere(10);
  auto wt = Traction(s);
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 1);
  EXPECT_EQ(wt->GetMeshCacheHits(), 0);
  // New values on the same mesh (a time step): the check is not run again.
  vtkDoubleArray::SafeDownCast(s->GetCellData()->GetArray("p"))->SetValue(3, 99.0);
  s->GetCellData()->GetArray("p")->Modified();
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 1);
  EXPECT_EQ(wt->GetMeshCacheHits(), 1);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 0);
  EXPECT_EQ(Inconsistent(wt), 0);
  EXPECT_EQ(OpenEdges(wt), 0);
}

TEST(WallTractionCache, NewObjectsWithTheSameMeshAreFoundByContent)
{
  // An open surface (one face removed: four open edges) takes the exact
  // check, and its result is hashed for later steps.
  auto s = OpenPressureSphere(10);
  auto wt = Traction(s);
  wt->Update();
  EXPECT_EQ(OpenEdges(wt), 4);
  EXPECT_EQ(wt->GetMeshContentHashes(), 1);
  // A reader hands over new objects each step: found by the content hash,
  // then by identity on the next step.
  auto step = Copy(s);
  wt->SetInputDataObject(step);
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 1);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 1);
  EXPECT_EQ(wt->GetMeshContentHashes(), 2);
  EXPECT_EQ(OpenEdges(wt), 4);
  wt->Modified();
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 1);
  EXPECT_EQ(wt->GetMeshCacheHits(), 2);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 1);
  EXPECT_EQ(wt->GetMeshContentHashes(), 2);
}

TEST(WallTractionCache, AChangedOpenMeshIsHashedOnce)
{
  // New objects with a different mesh (a moved point): Find hashes them to
  // compare, the exact check runs, and Store keeps that hash instead of
  // hashing the same objects a second time.
  auto s = OpenPressureSphere(10);
  auto wt = Traction(s);
  wt->Update();
  EXPECT_EQ(wt->GetMeshContentHashes(), 1);
  auto moved = Copy(s);
  double p[3];
  moved->GetPoint(7, p);
  p[0] *= 1.01;
  moved->GetPoints()->SetPoint(7, p);
  wt->SetInputDataObject(moved);
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 2);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 0);
  EXPECT_EQ(wt->GetMeshContentHashes(), 2);
  EXPECT_EQ(OpenEdges(wt), 4);
  // The kept hash is the moved mesh's: its next step (new objects, the same
  // content) is found by content.
  wt->SetInputDataObject(Copy(moved));
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 2);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 1);
  EXPECT_EQ(wt->GetMeshContentHashes(), 3);
  EXPECT_EQ(OpenEdges(wt), 4);
}

TEST(WallTractionCache, ACertifiedMeshIsNotHashed)
{
  // A closed, consistent surface is certified in the face loop; a hash
  // would cost more than certifying new objects again, so none is taken.
  auto s = PressureSphere(10);
  auto wt = Traction(s);
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 1);
  EXPECT_EQ(wt->GetMeshContentHashes(), 0);
  wt->Modified();
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheHits(), 1);
  auto step = Copy(s);
  wt->SetInputDataObject(step);
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 2);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 0);
  EXPECT_EQ(wt->GetMeshContentHashes(), 0);
  EXPECT_EQ(Inconsistent(wt), 0);
  EXPECT_EQ(OpenEdges(wt), 0);
  wt->Modified();
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 2);
  EXPECT_EQ(wt->GetMeshCacheHits(), 2);
}

TEST(WallTractionCache, OffsetsEditedInPlaceAreValidatedAgain)
{
  // Re-executions on the same cell arrays skip the scan of their offsets
  // (ValidatedCells); an edit marked Modified() on the offsets, the cell
  // array or the dataset is scanned again, and so are new objects.
  for (int marked = 0; marked < 3; ++marked)
  {
    auto s = PressureSphere(10);
    auto wt = Traction(s);
    Messages m;
    m.Watch(wt);
    wt->Update();
    EXPECT_EQ(wt->GetCellOffsetScans(), 1); // the polygons (no other cells)
    wt->Modified();
    wt->Update();
    EXPECT_EQ(wt->GetCellOffsetScans(), 1);
    EXPECT_TRUE(m.Errors.empty());
    vtkCellArray* polys = s->GetPolys();
    vtkDataArray* offsets = polys->GetOffsetsArray();
    const vtkIdType n = offsets->GetNumberOfValues();
    offsets->SetComponent(n / 2, 0, offsets->GetComponent(n / 2 - 2, 0)); // decreasing
    vtkObject* edited[3] = { offsets, polys, s };
    edited[marked]->Modified();
    wt->Modified();
    wt->Update();
    EXPECT_EQ(wt->GetCellOffsetScans(), 2) << "marked " << marked;
    EXPECT_TRUE(m.ErrorContains("are malformed")) << "marked " << marked;
    // New objects (a reader's next step) are scanned.
    wt->SetInputDataObject(Copy(PressureSphere(10)));
    wt->Update();
    EXPECT_EQ(wt->GetCellOffsetScans(), 3);
    EXPECT_EQ(Inconsistent(wt), 0);
  }
}

TEST(WallTractionCache, AChangedMeshIsCheckedAgain)
{
  auto s = PressureSphere(10);
  auto wt = Traction(s);
  wt->Update();
  EXPECT_EQ(Inconsistent(wt), 0);
  // Same objects, connectivity changed in place (one face reversed).
  s->BuildCells();
  s->ReverseCell(20);
  s->Modified();
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 2);
  EXPECT_EQ(Inconsistent(wt), 1);
  // New objects whose content differs (one face reversed back, and a point
  // moved): the content hash differs too.
  auto moved = Copy(s);
  moved->BuildCells();
  moved->ReverseCell(20);
  double x[3];
  moved->GetPoint(5, x);
  x[0] *= 1.01;
  moved->GetPoints()->SetPoint(5, x);
  wt->SetInputDataObject(moved);
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 3);
  EXPECT_EQ(wt->GetMeshCacheContentHits(), 0);
  EXPECT_EQ(Inconsistent(wt), 0);
  // The Wall Normal array decides the orientation: it is part of the key.
  wt->SetOrientation(vtkWallTraction::WALL_NORMAL_ARRAY);
  AddCellField(moved, "Wall Normal", 3, [](const Vec& c, double* n) {
    for (int k = 0; k < 3; ++k)
    {
      n[k] = c[k];
    }
  });
  wt->Update();
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 4);
}

TEST(WallTractionCache, ResultsEqualAFreshFilter)
{
  // An open, partly inconsistent surface takes the exact check; re-executed
  // with the cache and on new objects it gives what a fresh filter gives.
  auto s = PressureSphere(10);
  s->BuildCells();
  s->ReverseCell(7);
  s->DeleteCell(40);
  s->RemoveDeletedCells();
  auto fresh = Traction(s);
  fresh->Update();
  EXPECT_EQ(Inconsistent(fresh), 1);
  EXPECT_EQ(OpenEdges(fresh), 4);
  auto wt = Traction(s);
  for (int i = 0; i < 3; ++i)
  {
    wt->SetInputDataObject(i == 2 ? Copy(s).GetPointer() : s.GetPointer());
    wt->Modified();
    wt->Update();
    EXPECT_EQ(Inconsistent(wt), 1);
    EXPECT_EQ(OpenEdges(wt), 4);
    EXPECT_EQ(Field(wt->GetOutputDataObject(0), "Wetted Area"),
      Field(fresh->GetOutputDataObject(0), "Wetted Area"));
  }
  EXPECT_EQ(wt->GetMeshCacheBuilds(), 1);
  EXPECT_EQ(wt->GetMeshCacheHits(), 2);
}

TEST(WallTractionCache, OutputArraysReusedOnlyWhenNobodyHoldsThem)
{
  auto s = PressureSphere(10);
  auto wt = Traction(s);
  wt->SetPerFaceArrays(vtkWallTraction::FORCES_ONLY); // 3 arrays
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputConnection(wt->GetOutputPort());
  li->Update();
  EXPECT_EQ(wt->GetOutputArraysAllocated(), 3);
  // Load Integration's output still holds the first set while Wall Traction
  // runs again: a second set is made, then the two alternate.
  for (int step = 0; step < 4; ++step)
  {
    wt->Modified();
    li->Update();
  }
  EXPECT_EQ(wt->GetOutputArraysAllocated(), 6);
  EXPECT_EQ(wt->GetOutputArraysReused(), 9);
  // A script keeps the forces of one step: that array is never rewritten.
  vtkSmartPointer<vtkDataArray> kept =
    vtkPolyData::SafeDownCast(wt->GetOutputDataObject(0))->GetCellData()->GetArray("Pressure Force");
  std::vector<double> values(static_cast<std::size_t>(kept->GetNumberOfValues()));
  for (vtkIdType i = 0; i < kept->GetNumberOfValues(); ++i)
  {
    values[i] = kept->GetComponent(i / 3, i % 3);
  }
  auto* p = vtkDoubleArray::SafeDownCast(s->GetCellData()->GetArray("p"));
  for (int step = 0; step < 4; ++step)
  {
    for (vtkIdType c = 0; c < p->GetNumberOfTuples(); ++c)
    {
      p->SetValue(c, p->GetValue(c) + 1.0);
    }
    p->Modified();
    li->Update();
    vtkDataArray* now =
      vtkPolyData::SafeDownCast(wt->GetOutputDataObject(0))->GetCellData()->GetArray("Pressure Force");
    EXPECT_NE(now, kept.GetPointer());
  }
  for (vtkIdType i = 0; i < kept->GetNumberOfValues(); ++i)
  {
    ASSERT_EQ(kept->GetComponent(i / 3, i % 3), values[i]);
  }
  // The same totals as a fresh pipeline on the last step.
  auto wt2 = Traction(s);
  wt2->SetPerFaceArrays(vtkWallTraction::FORCES_ONLY);
  auto li2 = vtkSmartPointer<vtkLoadIntegration>::New();
  li2->SetInputConnection(wt2->GetOutputPort());
  li2->Update();
  for (int k = 0; k < 3; ++k)
  {
    EXPECT_EQ(Field(li->GetOutputDataObject(0), "Force", k),
      Field(li2->GetOutputDataObject(0), "Force", k));
    EXPECT_EQ(Field(li->GetOutputDataObject(0), "Moment", k),
      Field(li2->GetOutputDataObject(0), "Moment", k));
  }
}
