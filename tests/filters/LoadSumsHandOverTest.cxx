// SPDX-License-Identifier: BSD-3-Clause
// Wall Traction hands Load Integration the sums it made in its own face loop
// (WallLoadsMeshCache.h, issue 11). They must be taken only for the very
// objects they were made from, and give what Load Integration's own
// summation gives. The reference here is Load Integration summing a deep
// copy of Wall Traction's output (new objects, the same values), which never
// matches a handed entry.
#include "FilterTestUtilities.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDataArray.h"
#include "vtkLoadIntegration.h"
#include "vtkMultiBlockDataSet.h"
#include "vtkPolyData.h"
#include "vtkPoints.h"
#include "vtkUnsignedCharArray.h"
#include "vtkWallTraction.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

using namespace wltest;

namespace
{
vtkSmartPointer<vtkPolyData> Body()
{
  auto s = Sphere(0.8, 16, 24);
  AddCellField(s, "p", 1, [](const Vec& x, double* v) { v[0] = 2e5 + 40 * x[0] + 9 * x[1] * x[2]; });
  AddCellField(s, "grad", 9, [](const Vec& x, double* v) {
    for (int k = 0; k < 9; ++k)
    {
      v[k] = std::cos(0.3 * k + x[0] - 2 * x[2]);
    }
  });
  return s;
}

vtkSmartPointer<vtkWallTraction> Traction(vtkDataObject* input)
{
  auto wt = vtkSmartPointer<vtkWallTraction>::New();
  wt->SetInputDataObject(input);
  wt->SetOrientation(vtkWallTraction::STORED_INTO_FLUID);
  wt->SetInputArrayToProcess(
    vtkWallTraction::PRESSURE_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  wt->SetShearSource(vtkWallTraction::VELOCITY_GRADIENT);
  wt->SetInputArrayToProcess(vtkWallTraction::VELOCITY_GRADIENT_ARRAY, 0, 0,
    vtkDataObject::FIELD_ASSOCIATION_CELLS, "grad");
  wt->SetViscosity(2e-3);
  return wt;
}

vtkSmartPointer<vtkLoadIntegration> Integrate(vtkDataObject* input)
{
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputDataObject(input);
  li->SetMomentCentre(0.7, -0.4, 1.9);
  li->Update();
  return li;
}

vtkSmartPointer<vtkLoadIntegration> Integrate(vtkAlgorithm* upstream)
{
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputConnection(upstream->GetOutputPort());
  li->SetMomentCentre(0.7, -0.4, 1.9);
  li->Update();
  return li;
}

vtkSmartPointer<vtkDataObject> DeepCopy(vtkDataObject* d)
{
  vtkSmartPointer<vtkDataObject> c;
  c.TakeReference(d->NewInstance());
  c->DeepCopy(d);
  return c;
}

/// Every summed field of a and b agrees to round-off of the largest term:
/// |F| is summed from terms of size p A ~ 2e5 * 1e-2 with a datum that
/// cancels over the closed body, moments from terms |c| as large again.
void ExpectSameLoads(vtkLoadIntegration* a, vtkLoadIntegration* b)
{
  const double scale = 2e5 * Field(a->GetOutputDataObject(0), "Area") * 3;
  for (const char* name : { "Pressure Force", "Viscous Force", "Force", "Pressure Moment",
         "Viscous Moment", "Moment" })
  {
    for (int k = 0; k < 3; ++k)
    {
      EXPECT_NEAR(Field(a->GetOutputDataObject(0), name, k), Field(b->GetOutputDataObject(0), name, k),
        1e-14 * scale)
        << name << " " << k;
    }
  }
  for (const char* name : { "Area", "Faces", "Skipped Faces" })
  {
    EXPECT_NEAR(Field(a->GetOutputDataObject(0), name), Field(b->GetOutputDataObject(0), name),
      1e-13 * std::fabs(Field(b->GetOutputDataObject(0), name)))
      << name;
  }
}
} // namespace

TEST(LoadSumsHandOver, DirectlyFedSumsEqualItsOwnSummation)
{
  auto body = Body();
  // A ghost face, a face with a NaN pressure and one whose viscous traction
  // overflows: the same faces are counted and skipped either way.
  MarkGhost(body, 33);
  body->GetCellData()->GetArray("p")->SetComponent(50, 0, std::nan(""));
  body->GetCellData()->GetArray("grad")->SetComponent(71, 1, 1e308);
  body->GetCellData()->GetArray("grad")->SetComponent(71, 3, -1e308);
  body->GetCellData()->GetArray("grad")->SetComponent(71, 0, std::numeric_limits<double>::infinity());
  auto wt = Traction(body);
  auto li = Integrate(wt);
  EXPECT_EQ(li->GetLeavesHandedOver(), 1);
  EXPECT_EQ(li->GetLeavesSummed(), 0);
  auto own = Integrate(DeepCopy(wt->GetOutputDataObject(0)));
  EXPECT_EQ(own->GetLeavesHandedOver(), 0);
  EXPECT_EQ(own->GetLeavesSummed(), 1);
  ExpectSameLoads(li, own);
  EXPECT_EQ(Field(li->GetOutputDataObject(0), "Skipped Faces"), 2);
  EXPECT_EQ(Field(li->GetOutputDataObject(0), "Faces"), body->GetNumberOfCells() - 3);
}

TEST(LoadSumsHandOver, EveryLeafOfAMultiblock)
{
  auto blocks = vtkSmartPointer<vtkMultiBlockDataSet>::New();
  blocks->SetNumberOfBlocks(3);
  blocks->SetBlock(0, Body());
  blocks->SetBlock(2, Body()); // block 1 empty
  auto wt = Traction(blocks);
  auto li = Integrate(wt);
  EXPECT_EQ(li->GetLeavesHandedOver(), 2);
  EXPECT_EQ(li->GetLeavesSummed(), 0);
  ExpectSameLoads(li, Integrate(DeepCopy(wt->GetOutputDataObject(0))));
}

// What a filter in between that moves the points makes: a new dataset with
// new points and the same cell arrays. The handed sums (made for the old
// points) must not be taken.
TEST(LoadSumsHandOver, MovedPointsAreSummedAgain)
{
  auto wt = Traction(Body());
  wt->Update();
  auto moved = vtkSmartPointer<vtkPolyData>::New();
  moved->ShallowCopy(wt->GetOutputDataObject(0));
  auto points = vtkSmartPointer<vtkPoints>::New();
  points->DeepCopy(moved->GetPoints());
  for (vtkIdType i = 0; i < points->GetNumberOfPoints(); ++i)
  {
    double x[3];
    points->GetPoint(i, x);
    x[0] += 3;
    points->SetPoint(i, x);
  }
  moved->SetPoints(points);
  auto li = Integrate(moved.GetPointer());
  EXPECT_EQ(li->GetLeavesHandedOver(), 0);
  EXPECT_EQ(li->GetLeavesSummed(), 1);
  // The moment changed with the arms: M' = M + (3, 0, 0) x F.
  auto still = Integrate(wt);
  EXPECT_EQ(still->GetLeavesHandedOver(), 1);
  const double Fy = Field(still->GetOutputDataObject(0), "Force", 1);
  const double Fz = Field(still->GetOutputDataObject(0), "Force", 2);
  EXPECT_NEAR(Field(li->GetOutputDataObject(0), "Moment", 1),
    Field(still->GetOutputDataObject(0), "Moment", 1) - 3 * Fz, 1e-9);
  EXPECT_NEAR(Field(li->GetOutputDataObject(0), "Moment", 2),
    Field(still->GetOutputDataObject(0), "Moment", 2) + 3 * Fy, 1e-9);
}

// An edited array (Modified() called) is not the array Wall Traction made.
TEST(LoadSumsHandOver, AnEditedArrayIsSummedAgain)
{
  auto wt = Traction(Body());
  auto li = Integrate(wt);
  EXPECT_EQ(li->GetLeavesHandedOver(), 1);
  vtkDataArray* fp =
    vtkDataSet::SafeDownCast(wt->GetOutputDataObject(0))->GetCellData()->GetArray("Pressure Force");
  const double before = Field(li->GetOutputDataObject(0), "Pressure Force", 0);
  fp->SetComponent(5, 0, fp->GetComponent(5, 0) + 1.0);
  fp->Modified();
  li->Modified();
  li->Update();
  EXPECT_EQ(li->GetLeavesSummed(), 1);
  EXPECT_NEAR(Field(li->GetOutputDataObject(0), "Pressure Force", 0), before + 1.0, 1e-9);
}

// Re-executed steps are handed over every time; a Region Array always sums.
TEST(LoadSumsHandOver, TimeStepsAndRegionArray)
{
  auto body = Body();
  auto wt = Traction(body);
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputConnection(wt->GetOutputPort());
  for (int step = 0; step < 3; ++step)
  {
    vtkDataArray* p = body->GetCellData()->GetArray("p");
    for (vtkIdType c = 0; c < p->GetNumberOfTuples(); ++c)
    {
      p->SetComponent(c, 0, p->GetComponent(c, 0) + 10.0 * c);
    }
    p->Modified();
    li->Update();
    auto own = Integrate(DeepCopy(wt->GetOutputDataObject(0)));
    li->SetMomentCentre(0.7, -0.4, 1.9);
    li->Update();
    ExpectSameLoads(li, own);
  }
  EXPECT_EQ(li->GetLeavesHandedOver(), 4);
  EXPECT_EQ(li->GetLeavesSummed(), 0);
  AddCellField(body, "zone", 1, [](const Vec& x, double* v) { v[0] = x[2] > 0 ? 1 : 2; });
  body->Modified();
  li->SetInputArrayToProcess(
    vtkLoadIntegration::REGION_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "zone");
  li->Update();
  EXPECT_EQ(li->GetLeavesSummed(), 1);
}

TEST(LoadSumsHandOver, OwnSummationScansUnchangedOffsetsOnce)
{
  // Load Integration summing the faces itself (a copy of Wall Traction's
  // output) keeps the cell arrays it found well formed (ValidatedCells): a
  // re-execution does not scan them again; an edit marked Modified() is
  // scanned and reported.
  auto wt = Traction(Body());
  wt->Update();
  auto copy = DeepCopy(wt->GetOutputDataObject(0));
  auto li = Integrate(copy.Get());
  EXPECT_EQ(li->GetLeavesSummed(), 1);
  EXPECT_EQ(li->GetCellOffsetScans(), 1);
  const double fx = Field(li->GetOutputDataObject(0), "Pressure Force", 0);
  li->SetMomentCentre(0, 0, 0);
  li->Update();
  EXPECT_EQ(li->GetLeavesSummed(), 2);
  EXPECT_EQ(li->GetCellOffsetScans(), 1);
  // The same faces summed again (a force does not depend on the moment
  // centre), to round-off of the terms (2e5 Pa datum over the body's area).
  const double scale = 2e5 * Field(li->GetOutputDataObject(0), "Area") * 3;
  EXPECT_NEAR(Field(li->GetOutputDataObject(0), "Pressure Force", 0), fx, 1e-14 * scale);
  Messages m;
  m.Watch(li);
  vtkPolyData* pd = vtkPolyData::SafeDownCast(copy);
  ASSERT_NE(pd, nullptr);
  vtkDataArray* offsets = pd->GetPolys()->GetOffsetsArray();
  const vtkIdType n = offsets->GetNumberOfValues();
  offsets->SetComponent(n / 2, 0, offsets->GetComponent(n / 2 - 2, 0)); // decreasing
  offsets->Modified();
  li->Modified();
  li->Update();
  EXPECT_EQ(li->GetCellOffsetScans(), 2);
  EXPECT_TRUE(m.ErrorContains("are malformed"));
}
