// SPDX-License-Identifier: BSD-3-Clause
#include "FilterTestUtilities.h"

#include "vtkCellData.h"
#include "vtkDoubleArray.h"
#include "vtkIdList.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkShearProjection.h"
#include "vtkUnstructuredGrid.h"
#include "vtkCellType.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace wltest;

namespace
{
// Hexahedra filling [0,1] x [0,h] x [0,1], n cells a side, with the plane
// Couette velocity u = (U y/h, 0, 0) at the cell centres.
vtkSmartPointer<vtkUnstructuredGrid> CouetteBox(int n, double h, double U)
{
  auto pts = vtkSmartPointer<vtkPoints>::New();
  auto id = [n](int i, int j, int k) -> vtkIdType { return i + (n + 1) * (j + (n + 1) * k); };
  for (int k = 0; k <= n; ++k)
  {
    for (int j = 0; j <= n; ++j)
    {
      for (int i = 0; i <= n; ++i)
      {
        pts->InsertNextPoint(double(i) / n, h * j / n, double(k) / n);
      }
    }
  }
  auto ug = vtkSmartPointer<vtkUnstructuredGrid>::New();
  ug->SetPoints(pts);
  auto u = vtkSmartPointer<vtkDoubleArray>::New();
  u->SetName("velocity");
  u->SetNumberOfComponents(3);
  for (int k = 0; k < n; ++k)
  {
    for (int j = 0; j < n; ++j)
    {
      for (int i = 0; i < n; ++i)
      {
        const vtkIdType hex[8] = { id(i, j, k), id(i + 1, j, k), id(i + 1, j + 1, k),
          id(i, j + 1, k), id(i, j, k + 1), id(i + 1, j, k + 1), id(i + 1, j + 1, k + 1),
          id(i, j + 1, k + 1) };
        ug->InsertNextCell(VTK_HEXAHEDRON, 8, hex);
        const double yc = h * (j + 0.5) / n;
        u->InsertNextTuple3(U * yc / h, 0, 0);
      }
    }
  }
  ug->GetCellData()->AddArray(u);
  return ug;
}
}

// Plane Couette flow: the near-wall difference, the least-squares gradient
// and the wall fit are exact for a linear profile, tau_w = mu U / h on the
// fixed wall (e.g. White, Viscous Fluid Flow, §3-2).
TEST(ShearProjection, CouetteIsExact)
{
  const double h = 0.5, U = 3.0, mu = 0.02;
  auto box = CouetteBox(4, h, U);
  for (int method : { vtkShearProjection::NEAR_WALL_DIFFERENCE, vtkShearProjection::GRADIENT_TENSOR,
         vtkShearProjection::WALL_FIT })
  {
    auto sp = vtkSmartPointer<vtkShearProjection>::New();
    sp->SetInputDataObject(0, box);
    sp->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "velocity");
    sp->SetMethod(method);
    sp->SetViscosity(mu);
    sp->Update();
    auto* out = vtkPolyData::SafeDownCast(sp->GetOutputDataObject(0));
    ASSERT_NE(out, nullptr);
    vtkDataArray* tau = out->GetCellData()->GetArray("Wall Shear Stress");
    vtkDataArray* n = out->GetCellData()->GetArray("Wall Normal");
    vtkDataArray* d = out->GetCellData()->GetArray("Wall Distance");
    int bottom = 0;
    for (vtkIdType f = 0; f < out->GetNumberOfCells(); ++f)
    {
      if (std::abs(n->GetComponent(f, 1) - 1.0) < 1e-12)
      {
        ++bottom;
        EXPECT_NEAR(tau->GetComponent(f, 0), mu * U / h, 1e-13) << method;
        EXPECT_NEAR(tau->GetComponent(f, 1), 0.0, 1e-13);
        EXPECT_NEAR(d->GetComponent(f, 0), h / 8, 1e-15);
      }
    }
    EXPECT_EQ(bottom, 16);
  }
}

// The adjacency is built once while the mesh is unchanged: a new velocity
// on a copy sharing points and cells does not rebuild it.
TEST(ShearProjection, AdjacencyIsReused)
{
  auto box = CouetteBox(3, 1.0, 1.0);
  auto sp = vtkSmartPointer<vtkShearProjection>::New();
  sp->SetInputDataObject(0, box);
  sp->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "velocity");
  sp->Update();
  auto next = vtkSmartPointer<vtkUnstructuredGrid>::New();
  next->ShallowCopy(box);
  auto u = vtkSmartPointer<vtkDoubleArray>::New();
  u->DeepCopy(box->GetCellData()->GetArray("velocity"));
  u->SetName("velocity");
  next->GetCellData()->AddArray(u);
  sp->SetInputDataObject(0, next);
  sp->Update();
  EXPECT_EQ(sp->GetNumberOfAdjacencyBuilds(), 1);
}

TEST(ShearProjection, MissingVelocityIsAnError)
{
  auto box = CouetteBox(2, 1.0, 1.0);
  auto sp = vtkSmartPointer<vtkShearProjection>::New();
  sp->SetInputDataObject(0, box);
  sp->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "flow_velocity");
  Messages m;
  m.Watch(sp);
  sp->Update();
  EXPECT_TRUE(m.ErrorContains("'flow_velocity' not found")) << (m.Errors.empty() ? "" : m.Errors[0]);
  EXPECT_TRUE(m.ErrorContains("'velocity'"));  // the array that exists is listed
}
