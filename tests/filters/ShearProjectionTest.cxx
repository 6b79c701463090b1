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
#include "vtkSMPTools.h"

#include <random>
#include <string>
#include <vector>

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

// Sequential and STDThread backends give the same wall values for every
// method (the face loop has no shared accumulation: each face's result is
// the same whatever thread computes it), to 1e-12 relative, here on a box of
// jittered hexahedra with a curved velocity field and a cache rebuilt for
// each backend.
TEST(ShearProjection, BackendsAgree)
{
  const int n = 12;
  auto box = CouetteBox(n, 1.0, 1.0);
  std::mt19937 rng(5);
  std::uniform_real_distribution<double> U(-0.2, 0.2);
  vtkPoints* pts = box->GetPoints();
  for (vtkIdType p = 0; p < pts->GetNumberOfPoints(); ++p)
  {
    double x[3];
    pts->GetPoint(p, x);
    const bool interior = x[0] > 0 && x[0] < 1 && x[1] > 0 && x[1] < 1 && x[2] > 0 && x[2] < 1;
    if (interior)
    {
      pts->SetPoint(p, x[0] + U(rng) / n, x[1] + U(rng) / n, x[2] + U(rng) / n);
    }
  }
  auto u = vtkSmartPointer<vtkDoubleArray>::New();
  u->SetName("curved");
  u->SetNumberOfComponents(3);
  auto ids = vtkSmartPointer<vtkIdList>::New();
  for (vtkIdType c = 0; c < box->GetNumberOfCells(); ++c)
  {
    box->GetCellPoints(c, ids);
    double x[3] = { 0, 0, 0 };
    for (vtkIdType k = 0; k < ids->GetNumberOfIds(); ++k)
    {
      double p[3];
      box->GetPoint(ids->GetId(k), p);
      for (int j = 0; j < 3; ++j)
      {
        x[j] += p[j] / ids->GetNumberOfIds();
      }
    }
    u->InsertNextTuple3(std::sin(2 * x[1]) + x[0] * x[1] * x[1], x[2] * x[1], std::cos(x[0] + x[1]) * x[1]);
  }
  box->GetCellData()->AddArray(u);
  const std::string before = vtkSMPTools::GetBackend() ? vtkSMPTools::GetBackend() : "Sequential";
  for (int method : { vtkShearProjection::NEAR_WALL_DIFFERENCE, vtkShearProjection::GRADIENT_TENSOR,
         vtkShearProjection::WALL_FIT, vtkShearProjection::WALL_LAW })
  {
    std::vector<double> results[2];
    int b = 0;
    for (const char* backend : { "Sequential", "STDThread" })
    {
      ASSERT_TRUE(vtkSMPTools::SetBackend(backend));
      auto sp = vtkSmartPointer<vtkShearProjection>::New();
      sp->SetInputDataObject(0, box);
      sp->SetInputArrayToProcess(0, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "curved");
      sp->SetMethod(method);
      sp->SetViscosity(1e-3);
      sp->Update();
      auto* out = vtkPolyData::SafeDownCast(sp->GetOutputDataObject(0));
      ASSERT_NE(out, nullptr);
      for (const char* name : { "Wall Shear Stress", "Friction Velocity", "y+" })
      {
        vtkDataArray* a = out->GetCellData()->GetArray(name);
        for (vtkIdType i = 0; i < a->GetNumberOfValues(); ++i)
        {
          results[b].push_back(a->GetVariantValue(i).ToDouble());
        }
      }
      ++b;
    }
    ASSERT_EQ(results[0].size(), results[1].size());
    double scale = 0, diff = 0;
    for (std::size_t i = 0; i < results[0].size(); ++i)
    {
      scale = std::max(scale, std::abs(results[0][i]));
      diff = std::max(diff, std::abs(results[0][i] - results[1][i]));
    }
    EXPECT_LE(diff, 1e-12 * scale) << "method " << method;
    EXPECT_GT(scale, 0.0);
  }
  vtkSMPTools::SetBackend(before.c_str());
}
