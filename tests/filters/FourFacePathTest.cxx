// SPDX-License-Identifier: BSD-3-Clause
// Wall Traction and Load Integration take runs of like faces at once
// (Lanes.h: four in the AVX2 loops, eight in Wall Traction's AVX-512 loop)
// and single faces otherwise. The two paths must give every face the same
// values: the same surface is given once as faces only (runs of like faces)
// and once with a vertex cell after every face (no run of like faces, so
// every face takes the one-face path), and the per-face arrays are
// compared exactly (the same binary, the same IEEE operations) and the
// totals to round-off (the faces are summed in a different order).
#include "FilterTestUtilities.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDoubleArray.h"
#include "vtkFloatArray.h"
#include "vtkLoadIntegration.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkSMPTools.h"
#include "vtkUnsignedCharArray.h"
#include "vtkUnstructuredGrid.h"
#include "vtkWallTraction.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <string>
#include <vector>

using namespace wltest;

namespace
{
/// The sphere's faces as an unstructured grid; with `vertices`, a vertex
/// cell after each face (its cell data: the face's values).
vtkSmartPointer<vtkUnstructuredGrid> AsGrid(vtkPolyData* pd, bool vertices, bool floatPoints)
{
  auto grid = vtkSmartPointer<vtkUnstructuredGrid>::New();
  auto points = vtkSmartPointer<vtkPoints>::New();
  points->SetDataType(floatPoints ? VTK_FLOAT : VTK_DOUBLE);
  points->DeepCopy(pd->GetPoints());
  grid->SetPoints(points);
  grid->Allocate(2 * pd->GetNumberOfCells());
  vtkCellData* in = pd->GetCellData();
  vtkCellData* out = grid->GetCellData();
  out->CopyAllocate(in, 2 * pd->GetNumberOfCells());
  for (vtkIdType c = 0; c < pd->GetNumberOfCells(); ++c)
  {
    vtkIdType n = 0;
    const vtkIdType* ids = nullptr;
    pd->GetCellPoints(c, n, ids);
    out->CopyData(in, c, grid->InsertNextCell(n == 3 ? VTK_TRIANGLE : VTK_QUAD, n, ids));
    if (vertices)
    {
      out->CopyData(in, c, grid->InsertNextCell(VTK_VERTEX, 1, ids));
    }
  }
  return grid;
}

vtkSmartPointer<vtkPolyData> Surface(int nPolar = 18, int nAzimuth = 28)
{
  auto s = Sphere(1.5, nPolar, nAzimuth); // quads and pole triangles: runs of both
  AddCellField(s, "p", 1, [](const Vec& x, double* v) { v[0] = 1e5 + 30 * x[0] - 7 * x[2]; });
  AddCellField(s, "rho", 1, [](const Vec& x, double* v) { v[0] = 1.2 + 0.1 * x[1]; });
  AddCellField(s, "mu_t", 1, [](const Vec& x, double* v) { v[0] = 1e-4 * (2 + x[0]); });
  AddCellField(s, "grad", 9, [](const Vec& x, double* v) {
    for (int k = 0; k < 9; ++k)
    {
      v[k] = std::sin(1.0 + k + 2 * x[0] - x[1] + 0.5 * k * x[2]);
    }
  });
  AddCellField(s, "tau", 3, [](const Vec& x, double* v) {
    v[0] = x[1] - x[2];
    v[1] = 0.5 * x[0];
    v[2] = x[0] * x[1];
  });
  return s;
}

struct Case
{
  std::string Name;
  int Shear;
  int Arrays;
  bool Kinematic;
  bool FloatPoints;
  double Speed;
};

vtkSmartPointer<vtkWallTraction> Traction(vtkDataObject* input, const Case& k)
{
  auto wt = vtkSmartPointer<vtkWallTraction>::New();
  wt->SetInputDataObject(input);
  wt->SetOrientation(vtkWallTraction::STORED_INTO_FLUID);
  wt->SetInputArrayToProcess(
    vtkWallTraction::PRESSURE_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "p");
  wt->SetShearSource(k.Shear);
  if (k.Shear == vtkWallTraction::VELOCITY_GRADIENT)
  {
    wt->SetInputArrayToProcess(vtkWallTraction::VELOCITY_GRADIENT_ARRAY, 0, 0,
      vtkDataObject::FIELD_ASSOCIATION_CELLS, "grad");
    wt->SetInputArrayToProcess(vtkWallTraction::TURBULENT_VISCOSITY_ARRAY, 0, 0,
      vtkDataObject::FIELD_ASSOCIATION_CELLS, "mu_t");
    wt->SetViscosity(1.8e-5);
  }
  else
  {
    wt->SetInputArrayToProcess(vtkWallTraction::WALL_SHEAR_STRESS_ARRAY, 0, 0,
      vtkDataObject::FIELD_ASSOCIATION_CELLS, "tau");
  }
  if (k.Kinematic)
  {
    wt->SetInputArrayToProcess(
      vtkWallTraction::DENSITY_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "rho");
    wt->SetPressureKind(vtkWallTraction::PER_UNIT_DENSITY);
    wt->SetShearStressKind(vtkWallTraction::PER_UNIT_DENSITY);
    wt->SetViscosityKind(vtkWallTraction::PER_UNIT_DENSITY);
  }
  wt->SetReferencePressure(99000);
  wt->SetReferenceSpeed(k.Speed);
  wt->SetLoadDirection(0.6, 0, 0.8);
  wt->SetPerFaceArrays(k.Arrays);
  wt->Update();
  return wt;
}

// The wetted area of positive face areas summed in another order (by
// lanes, then merged): the compensated sums (Neumaier 1974) of both orders
// are within a relative 2u + O(n u^2) of the exact sum, so they agree to a
// few units in the last place (often exactly).
void ExpectSameSum(double a, double b)
{
  EXPECT_NEAR(a, b, 4 * std::numeric_limits<double>::epsilon() * std::abs(a));
}

/// Every per-face array of `a` (faces only) equals, bit for bit, that of
/// `b` (the same faces, each followed by a vertex); the number compared.
int ExpectSameFaces(vtkWallTraction* a, vtkWallTraction* b)
{
  vtkCellData* ca = vtkDataSet::SafeDownCast(a->GetOutputDataObject(0))->GetCellData();
  vtkCellData* cb = vtkDataSet::SafeDownCast(b->GetOutputDataObject(0))->GetCellData();
  int compared = 0;
  for (int i = 0; i < ca->GetNumberOfArrays(); ++i)
  {
    vtkDataArray* x = ca->GetArray(i);
    vtkDataArray* y = cb->GetArray(x->GetName());
    EXPECT_NE(y, nullptr) << x->GetName();
    if (!y || y->GetNumberOfTuples() != 2 * x->GetNumberOfTuples())
    {
      ADD_FAILURE() << x->GetName() << ": not the vertex grid's counterpart";
      return compared;
    }
    for (vtkIdType f = 0; f < x->GetNumberOfTuples(); ++f)
    {
      for (int c = 0; c < x->GetNumberOfComponents(); ++c)
      {
        const double u = x->GetComponent(f, c);
        const double v = y->GetComponent(2 * f, c);
        if (std::memcmp(&u, &v, sizeof u) != 0)
        {
          ADD_FAILURE() << x->GetName() << " face " << f << ": " << u << " " << v;
          return compared;
        }
      }
    }
    ++compared;
  }
  return compared;
}
} // namespace

TEST(FourFacePath, EveryFaceGetsTheOneFaceValues)
{
  const Case cases[] = {
    { "gradient, all arrays, coefficients", vtkWallTraction::VELOCITY_GRADIENT,
      vtkWallTraction::ALL_ARRAYS, false, false, 12.0 },
    { "gradient, forces only, per unit density, float points", vtkWallTraction::VELOCITY_GRADIENT,
      vtkWallTraction::FORCES_ONLY, true, true, 0.0 },
    { "shear array, all arrays, per unit density", vtkWallTraction::WALL_SHEAR_STRESS,
      vtkWallTraction::ALL_ARRAYS, true, false, 3.0 },
    { "shear array, forces only", vtkWallTraction::WALL_SHEAR_STRESS,
      vtkWallTraction::FORCES_ONLY, false, false, 0.0 },
  };
  auto surface = Surface();
  for (const Case& k : cases)
  {
    SCOPED_TRACE(k.Name);
    auto runs = AsGrid(surface, false, k.FloatPoints);
    auto single = AsGrid(surface, true, k.FloatPoints);
    auto a = Traction(runs, k);
    auto b = Traction(single, k);
    EXPECT_GE(ExpectSameFaces(a, b), k.Arrays == vtkWallTraction::ALL_ARRAYS ? 12 : 8);
    ExpectSameSum(Field(a->GetOutputDataObject(0), "Wetted Area"),
      Field(b->GetOutputDataObject(0), "Wetted Area"));

    // Load Integration over both: the same faces in another order.
    auto la = vtkSmartPointer<vtkLoadIntegration>::New();
    la->SetInputConnection(a->GetOutputPort());
    la->SetMomentCentre(0.3, -0.2, 0.1);
    la->Update();
    auto lb = vtkSmartPointer<vtkLoadIntegration>::New();
    lb->SetInputConnection(b->GetOutputPort());
    lb->SetMomentCentre(0.3, -0.2, 0.1);
    lb->Update();
    for (const char* name : { "Pressure Force", "Viscous Force", "Pressure Moment",
           "Viscous Moment" })
    {
      for (int c = 0; c < 3; ++c)
      {
        const double u = Field(la->GetOutputDataObject(0), name, c);
        const double v = Field(lb->GetOutputDataObject(0), name, c);
        const double scale = Field(la->GetOutputDataObject(0), "Area") * 1e5;
        EXPECT_NEAR(u, v, 1e-15 * scale) << name << " " << c;
      }
    }
  }
}

// A face outside the common case in a run of four (here a NaN pressure, and
// a ghost face) sends only that run to the one-face path: the other faces
// keep their values and the tallies are those of the one-face path.
TEST(FourFacePath, AnUncommonFaceInARun)
{
  auto surface = Surface();
  const Case k = { "gradient", vtkWallTraction::VELOCITY_GRADIENT, vtkWallTraction::ALL_ARRAYS,
    false, false, 0.0 };
  auto runs = AsGrid(surface, false, false);
  auto single = AsGrid(surface, true, false);
  runs->GetCellData()->GetArray("p")->SetComponent(61, 0, std::nan(""));
  single->GetCellData()->GetArray("p")->SetComponent(122, 0, std::nan(""));
  MarkGhost(runs, 90);
  MarkGhost(single, 180);
  auto a = Traction(runs, k);
  auto b = Traction(single, k);
  vtkDataArray* x = vtkDataSet::SafeDownCast(a->GetOutputDataObject(0))->GetCellData()->GetArray("Force");
  vtkDataArray* y = vtkDataSet::SafeDownCast(b->GetOutputDataObject(0))->GetCellData()->GetArray("Force");
  ASSERT_TRUE(x && y);
  EXPECT_TRUE(std::isnan(x->GetComponent(61, 0)));
  for (vtkIdType f = 0; f < x->GetNumberOfTuples(); ++f)
  {
    for (int c = 0; c < 3; ++c)
    {
      const double u = x->GetComponent(f, c);
      const double v = y->GetComponent(2 * f, c);
      ASSERT_TRUE(std::memcmp(&u, &v, sizeof u) == 0 || (std::isnan(u) && std::isnan(v))) << f;
    }
  }
  ExpectSameSum(Field(a->GetOutputDataObject(0), "Wetted Area"),
    Field(b->GetOutputDataObject(0), "Wetted Area"));
  auto la = vtkSmartPointer<vtkLoadIntegration>::New();
  la->SetInputConnection(a->GetOutputPort());
  la->Update();
  auto lb = vtkSmartPointer<vtkLoadIntegration>::New();
  lb->SetInputConnection(b->GetOutputPort());
  lb->Update();
  for (const char* name : { "Pressure Force", "Pressure Moment" })
  {
    for (int c = 0; c < 3; ++c)
    {
      EXPECT_NEAR(Field(la->GetOutputDataObject(0), name, c),
        Field(lb->GetOutputDataObject(0), name, c), 1e-9)
        << name;
    }
  }
  EXPECT_EQ(Field(la->GetOutputDataObject(0), "Faces"), Field(lb->GetOutputDataObject(0), "Faces"));
  EXPECT_EQ(Field(la->GetOutputDataObject(0), "Skipped Faces"), 1);
  EXPECT_EQ(Field(lb->GetOutputDataObject(0), "Skipped Faces"), 1);
}

// Outputs larger than the last-level cache are written past the caches
// (streaming stores, eight faces at a time, from runs that start on a
// multiple of eight faces: WallTractionTypes.h, StreamOutputs). Surfaces
// above that threshold (32 MiB of outputs: 190 000 faces with all arrays,
// 600 000 with forces only), on one thread and on several (whose parts start
// anywhere: the faces before a multiple of eight go one by one), give every
// face the one-face values; the output arrays are 64-byte aligned.
TEST(FourFacePath, StreamedOutputsGetTheOneFaceValues)
{
  const Case cases[] = {
    { "gradient, all arrays, coefficients", vtkWallTraction::VELOCITY_GRADIENT,
      vtkWallTraction::ALL_ARRAYS, false, false, 12.0 },
    { "gradient, forces only, float points", vtkWallTraction::VELOCITY_GRADIENT,
      vtkWallTraction::FORCES_ONLY, false, true, 0.0 },
  };
  const std::string backend = vtkSMPTools::GetBackend();
  for (const Case& k : cases)
  {
    const bool all = k.Arrays == vtkWallTraction::ALL_ARRAYS;
    // 26 doubles per face with all arrays and coefficients, 7 forces only.
    auto surface = all ? Surface(220, 900) : Surface(500, 1250);
    const double outputBytes = (all ? 26.0 : 7.0) * 8 * surface->GetNumberOfCells();
    ASSERT_GT(outputBytes, 33.0 * 1024 * 1024) << "below the streaming threshold";
    auto runs = AsGrid(surface, false, k.FloatPoints);
    auto single = AsGrid(surface, true, k.FloatPoints);
    for (const char* smp : { "Sequential", "STDThread" })
    {
      SCOPED_TRACE(k.Name + ", " + smp);
      vtkSMPTools::SetBackend(smp);
      auto a = Traction(runs, k);
      auto b = Traction(single, k);
      EXPECT_GE(ExpectSameFaces(a, b), all ? 12 : 3);
      vtkCellData* cd = vtkDataSet::SafeDownCast(a->GetOutputDataObject(0))->GetCellData();
      for (const char* name : { "Face Area", "Pressure Force", "Viscous Force" })
      {
        ASSERT_NE(cd->GetArray(name), nullptr) << name;
        EXPECT_EQ(reinterpret_cast<std::uintptr_t>(cd->GetArray(name)->GetVoidPointer(0)) % 64, 0u)
          << name;
      }
      ExpectSameSum(Field(a->GetOutputDataObject(0), "Wetted Area"),
        Field(b->GetOutputDataObject(0), "Wetted Area"));
    }
  }
  vtkSMPTools::SetBackend(backend.c_str());
}
