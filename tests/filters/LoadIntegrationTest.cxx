// SPDX-License-Identifier: BSD-3-Clause
#include "FilterTestUtilities.h"

#include "vtkCellData.h"
#include "vtkCompositeDataSet.h"
#include "vtkDoubleArray.h"
#include "vtkInformation.h"
#include "vtkIntArray.h"
#include "vtkLoadIntegration.h"
#include "vtkMultiBlockDataSet.h"
#include "vtkPartitionedDataSet.h"
#include "vtkPartitionedDataSetCollection.h"
#include "vtkPolyData.h"
#include "vtkStringArray.h"
#include "vtkTable.h"
#include "vtkWallTraction.h"

#include <gtest/gtest.h>

#include <cmath>
#include <initializer_list>

using namespace wltest;

namespace
{
// Unit pressure on a box's faces, oriented outward: a face of area A normal to
// +x gets force -A e_x. Summed over an open set of faces this is exact.
vtkSmartPointer<vtkPolyData> PressurisedBox(const Vec& lo, const Vec& hi, double p)
{
  auto box = Box(lo, hi);
  AddCellField(box, "p", 1, [p](const Vec&, double* v) { v[0] = p; });
  return box;
}

vtkSmartPointer<vtkLoadIntegration> Integrate(vtkDataObject* input)
{
  auto wt = vtkSmartPointer<vtkWallTraction>::New();
  wt->SetInputDataObject(input);
  wt->SetOrientation(vtkWallTraction::STORED_INTO_FLUID);
  wt->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputConnection(wt->GetOutputPort());
  return li;
}

/// An integer cell array "zone" with one value per face of the box.
void AddZones(vtkPolyData* box, std::initializer_list<int> values)
{
  auto ids = vtkSmartPointer<vtkIntArray>::New();
  ids->SetName("zone");
  for (int v : values)
  {
    ids->InsertNextValue(v);
  }
  box->GetCellData()->AddArray(ids);
}

int Row(vtkTable* t, const std::string& name)
{
  auto* regions = vtkStringArray::SafeDownCast(t->GetColumnByName("Region"));
  for (vtkIdType r = 0; r < t->GetNumberOfRows(); ++r)
  {
    if (regions->GetValue(r) == name)
    {
      return static_cast<int>(r);
    }
  }
  return -1;
}

double Cell(vtkTable* t, int row, const char* column, int k = 0)
{
  return vtkDataArray::SafeDownCast(t->GetColumnByName(column))->GetComponent(row, k);
}
}

// One region per named block of a multiblock, plus the Total row.
TEST(LoadIntegration, MultiblockRegionsByName)
{
  auto mb = vtkSmartPointer<vtkMultiBlockDataSet>::New();
  mb->SetBlock(0, PressurisedBox({ 0, 0, 0 }, { 1, 2, 3 }, 1.0));
  mb->GetMetaData(0u)->Set(vtkCompositeDataSet::NAME(), "Hull");
  mb->SetBlock(1, PressurisedBox({ 5, 0, 0 }, { 6, 1, 1 }, 2.0));
  mb->GetMetaData(1u)->Set(vtkCompositeDataSet::NAME(), "Fin");
  auto li = Integrate(mb);
  li->Update();
  vtkTable* t = vtkTable::SafeDownCast(li->GetOutputDataObject(1));
  ASSERT_EQ(t->GetNumberOfRows(), 3);
  const int hull = Row(t, "Hull"), fin = Row(t, "Fin"), total = Row(t, "Total");
  ASSERT_GE(hull, 0);
  ASSERT_GE(fin, 0);
  ASSERT_GE(total, 0);
  EXPECT_DOUBLE_EQ(Cell(t, hull, "Area"), 22.0);
  EXPECT_DOUBLE_EQ(Cell(t, fin, "Area"), 6.0);
  EXPECT_DOUBLE_EQ(Cell(t, total, "Area"), 28.0);
  EXPECT_NEAR(Cell(t, total, "Force", 0), 0.0, 1e-14);
  EXPECT_DOUBLE_EQ(Cell(t, hull, "Faces"), 6);
  // Field data carries the Total row.
  EXPECT_DOUBLE_EQ(Field(li->GetOutputDataObject(0), "Area"), 28.0);
}

// A partitioned dataset collection: partitions of one dataset form one region.
TEST(LoadIntegration, PartitionedCollectionRegions)
{
  auto pdc = vtkSmartPointer<vtkPartitionedDataSetCollection>::New();
  auto a = vtkSmartPointer<vtkPartitionedDataSet>::New();
  a->SetPartition(0, PressurisedBox({ 0, 0, 0 }, { 1, 1, 1 }, 1.0));
  a->SetPartition(1, PressurisedBox({ 2, 0, 0 }, { 3, 1, 1 }, 1.0));
  auto b = vtkSmartPointer<vtkPartitionedDataSet>::New();
  b->SetPartition(0, PressurisedBox({ 0, 5, 0 }, { 1, 6, 2 }, 1.0));
  pdc->SetPartitionedDataSet(0, a);
  pdc->SetPartitionedDataSet(1, b);
  pdc->GetMetaData(0u)->Set(vtkCompositeDataSet::NAME(), "Pair");
  pdc->GetMetaData(1u)->Set(vtkCompositeDataSet::NAME(), "Single");
  auto li = Integrate(pdc);
  li->Update();
  vtkTable* t = vtkTable::SafeDownCast(li->GetOutputDataObject(1));
  ASSERT_EQ(t->GetNumberOfRows(), 3);
  EXPECT_DOUBLE_EQ(Cell(t, Row(t, "Pair"), "Area"), 12.0);
  EXPECT_DOUBLE_EQ(Cell(t, Row(t, "Single"), "Area"), 10.0);
}

// Regions from an integer array, across blocks; values no face carries are
// not listed.
TEST(LoadIntegration, RegionArray)
{
  auto box = PressurisedBox({ 0, 0, 0 }, { 1, 1, 1 }, 1.0);
  AddZones(box, { 3, 3, 7, 7, 7, 10 });
  auto li = Integrate(box);
  li->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "zone");
  li->Update();
  vtkTable* t = vtkTable::SafeDownCast(li->GetOutputDataObject(1));
  ASSERT_EQ(t->GetNumberOfRows(), 4);
  EXPECT_DOUBLE_EQ(Cell(t, Row(t, "zone 3"), "Faces"), 2);
  EXPECT_DOUBLE_EQ(Cell(t, Row(t, "zone 7"), "Faces"), 3);
  EXPECT_DOUBLE_EQ(Cell(t, Row(t, "zone 10"), "Faces"), 1);
  // Faces 0 and 1 of the box are z = 0 (normal -z) and z = 1 (normal +z):
  // their pressure forces cancel.
  EXPECT_NEAR(Cell(t, Row(t, "zone 3"), "Force", 2), 0.0, 1e-15);
}

// Coefficients, axes and line of action on a single loaded face: a unit
// square at z = 0 with outward normal -z under pressure p pushes +z with
// F = p, acting at its centroid (0.5, 0.5, 0).
TEST(LoadIntegration, AxesCoefficientsAndLineOfAction)
{
  auto box = PressurisedBox({ 0, 0, 0 }, { 1, 1, 1 }, 4.0);
  AddZones(box, { 0, 1, 1, 1, 1, 1 });
  auto li = Integrate(box);
  li->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "zone");
  li->SetFlowAngles(90.0, 0.0); // drag along +z, lift along -x
  li->SetReferenceDensity(2.0);
  li->SetReferenceSpeed(1.0); // q = 1
  li->SetReferenceArea(0.5);
  li->SetMomentCentre(2.0, 0.0, 0.0);
  li->Update();
  vtkTable* t = vtkTable::SafeDownCast(li->GetOutputDataObject(1));
  const int r = Row(t, "zone 0");
  ASSERT_GE(r, 0);
  EXPECT_NEAR(Cell(t, r, "Drag"), 4.0, 1e-15);
  EXPECT_NEAR(Cell(t, r, "Drag Coefficient"), 8.0, 1e-14);
  EXPECT_NEAR(Cell(t, r, "Lift"), 0.0, 1e-15);
  // Line of action: the vertical line through (0.5, 0.5); nearest point to
  // r0 = (2, 0, 0) is (0.5, 0.5, 0).
  EXPECT_NEAR(Cell(t, r, "Line Of Action Point", 0), 0.5, 1e-15);
  EXPECT_NEAR(Cell(t, r, "Line Of Action Point", 1), 0.5, 1e-15);
  EXPECT_NEAR(Cell(t, r, "Line Of Action Point", 2), 0.0, 1e-15);
  EXPECT_NEAR(Cell(t, r, "Residual Couple"), 0.0, 1e-15);
  // Moment about r0: (c - r0) x F = (-1.5, 0.5, 0) x (0, 0, 4) = (2, 6, 0)
  EXPECT_NEAR(Cell(t, r, "Moment", 0), 2.0, 1e-14);
  EXPECT_NEAR(Cell(t, r, "Moment", 1), 6.0, 1e-14);
}

// Missing Wall Traction arrays: an error that says what is needed.
TEST(LoadIntegration, NeedsWallTractionOutput)
{
  auto box = Box({ 0, 0, 0 }, { 1, 1, 1 });
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputDataObject(box);
  Messages m;
  m.Watch(li);
  li->Update();
  EXPECT_TRUE(m.ErrorContains("Wall Traction")) << (m.Errors.empty() ? "" : m.Errors[0]);
  EXPECT_TRUE(m.ErrorContains("'Pressure Force'"));
}

// An empty input that did not come through Wall Traction (for instance
// because Wall Traction failed and left an empty output) is an error, not a
// table of zeros.
TEST(LoadIntegration, EmptyInputWithoutWallTractionIsAnError)
{
  auto empty = vtkSmartPointer<vtkPolyData>::New();
  auto li = vtkSmartPointer<vtkLoadIntegration>::New();
  li->SetInputDataObject(empty);
  Messages m;
  m.Watch(li);
  li->Update();
  EXPECT_TRUE(m.ErrorContains("Wall Traction failed upstream"))
    << (m.Errors.empty() ? "" : m.Errors[0]);
}

// The Total row's Region Id is NaN, so it never equals a region value (-1 here).
TEST(LoadIntegration, TotalRowIdNeverCollides)
{
  auto box = PressurisedBox({ 0, 0, 0 }, { 1, 1, 1 }, 1.0);
  AddZones(box, { -1, -1, -1, 0, 0, 0 });
  auto li = Integrate(box);
  li->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "zone");
  li->Update();
  vtkTable* t = vtkTable::SafeDownCast(li->GetOutputDataObject(1));
  ASSERT_EQ(t->GetNumberOfRows(), 3);
  EXPECT_DOUBLE_EQ(Cell(t, Row(t, "zone -1"), "Region Id"), -1.0);
  EXPECT_TRUE(std::isnan(Cell(t, Row(t, "Total"), "Region Id")));
}
