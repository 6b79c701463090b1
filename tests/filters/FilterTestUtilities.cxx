// SPDX-License-Identifier: BSD-3-Clause
#include "FilterTestUtilities.h"

#include "vtkAlgorithm.h"
#include "vtkCallbackCommand.h"
#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkCommand.h"
#include "vtkDataArray.h"
#include "vtkDoubleArray.h"
#include "vtkFieldData.h"
#include "vtkIdList.h"
#include "vtkPointData.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkUnsignedCharArray.h"

#include <cmath>

namespace wltest
{
vtkSmartPointer<vtkPolyData> Box(const Vec& lo, const Vec& hi)
{
  auto pts = vtkSmartPointer<vtkPoints>::New();
  pts->SetDataTypeToDouble();
  for (int k = 0; k < 2; ++k)
  {
    for (int j = 0; j < 2; ++j)
    {
      for (int i = 0; i < 2; ++i)
      {
        pts->InsertNextPoint(i ? hi[0] : lo[0], j ? hi[1] : lo[1], k ? hi[2] : lo[2]);
      }
    }
  }
  // point id = i + 2j + 4k
  const vtkIdType faces[6][4] = { { 0, 2, 3, 1 }, { 4, 5, 7, 6 }, { 0, 1, 5, 4 }, { 2, 6, 7, 3 },
    { 0, 4, 6, 2 }, { 1, 3, 7, 5 } };
  auto polys = vtkSmartPointer<vtkCellArray>::New();
  for (auto& f : faces)
  {
    polys->InsertNextCell(4, f);
  }
  auto pd = vtkSmartPointer<vtkPolyData>::New();
  pd->SetPoints(pts);
  pd->SetPolys(polys);
  return pd;
}

vtkSmartPointer<vtkPolyData> Sphere(double r, int nPolar, int nAzimuth)
{
  auto pts = vtkSmartPointer<vtkPoints>::New();
  pts->SetDataTypeToDouble();
  pts->InsertNextPoint(0, 0, r);
  for (int i = 1; i < nPolar; ++i)
  {
    const double t = M_PI * i / nPolar;
    for (int j = 0; j < nAzimuth; ++j)
    {
      const double p = 2 * M_PI * j / nAzimuth;
      pts->InsertNextPoint(r * std::sin(t) * std::cos(p), r * std::sin(t) * std::sin(p),
        r * std::cos(t));
    }
  }
  const vtkIdType south = pts->InsertNextPoint(0, 0, -r);
  auto ring = [nAzimuth](int i, int j) -> vtkIdType {
    return 1 + (i - 1) * nAzimuth + ((j % nAzimuth) + nAzimuth) % nAzimuth;
  };
  auto polys = vtkSmartPointer<vtkCellArray>::New();
  for (int j = 0; j < nAzimuth; ++j)
  {
    const vtkIdType tri[3] = { 0, ring(1, j), ring(1, j + 1) };
    polys->InsertNextCell(3, tri);
  }
  for (int i = 1; i + 1 < nPolar; ++i)
  {
    for (int j = 0; j < nAzimuth; ++j)
    {
      const vtkIdType q[4] = { ring(i, j), ring(i + 1, j), ring(i + 1, j + 1), ring(i, j + 1) };
      polys->InsertNextCell(4, q);
    }
  }
  for (int j = 0; j < nAzimuth; ++j)
  {
    const vtkIdType tri[3] = { south, ring(nPolar - 1, j + 1), ring(nPolar - 1, j) };
    polys->InsertNextCell(3, tri);
  }
  auto pd = vtkSmartPointer<vtkPolyData>::New();
  pd->SetPoints(pts);
  pd->SetPolys(polys);
  return pd;
}

void AddCellField(vtkPolyData* pd, const std::string& name, int comps,
  const std::function<void(const Vec&, double*)>& f)
{
  auto a = vtkSmartPointer<vtkDoubleArray>::New();
  a->SetName(name.c_str());
  a->SetNumberOfComponents(comps);
  a->SetNumberOfTuples(pd->GetNumberOfCells());
  auto ids = vtkSmartPointer<vtkIdList>::New();
  std::vector<double> v(comps);
  for (vtkIdType c = 0; c < pd->GetNumberOfCells(); ++c)
  {
    pd->GetCellPoints(c, ids);
    Vec m = { 0, 0, 0 };
    for (vtkIdType k = 0; k < ids->GetNumberOfIds(); ++k)
    {
      double x[3];
      pd->GetPoint(ids->GetId(k), x);
      for (int d = 0; d < 3; ++d)
      {
        m[d] += x[d] / ids->GetNumberOfIds();
      }
    }
    f(m, v.data());
    a->SetTypedTuple(c, v.data());
  }
  pd->GetCellData()->AddArray(a);
}

void AddPointField(vtkPolyData* pd, const std::string& name, int comps,
  const std::function<void(const Vec&, double*)>& f)
{
  auto a = vtkSmartPointer<vtkDoubleArray>::New();
  a->SetName(name.c_str());
  a->SetNumberOfComponents(comps);
  a->SetNumberOfTuples(pd->GetNumberOfPoints());
  std::vector<double> v(comps);
  for (vtkIdType p = 0; p < pd->GetNumberOfPoints(); ++p)
  {
    Vec x;
    pd->GetPoint(p, x.data());
    f(x, v.data());
    a->SetTypedTuple(p, v.data());
  }
  pd->GetPointData()->AddArray(a);
}

void MarkGhost(vtkDataSet* ds, long long cell)
{
  vtkUnsignedCharArray* ghosts = ds->GetCellData()->GetGhostArray();
  if (!ghosts)
  {
    auto made = vtkSmartPointer<vtkUnsignedCharArray>::New();
    made->SetName(vtkDataSetAttributes::GhostArrayName());
    made->SetNumberOfTuples(ds->GetNumberOfCells());
    made->FillValue(0);
    ds->GetCellData()->AddArray(made);
    ghosts = made;
  }
  ghosts->SetValue(cell, vtkDataSetAttributes::DUPLICATECELL);
}

double Field(vtkDataObject* d, const char* name, int k)
{
  vtkDataArray* a = d->GetFieldData()->GetArray(name);
  return a ? a->GetComponent(0, k) : std::nan("");
}

namespace
{
void Collect(vtkObject*, unsigned long event, void* clientData, void* callData)
{
  auto* m = static_cast<Messages*>(clientData);
  const std::string text = callData ? static_cast<const char*>(callData) : "";
  (event == vtkCommand::ErrorEvent ? m->Errors : m->Warnings).push_back(text);
}
}

void Messages::Watch(vtkAlgorithm* alg)
{
  auto cb = vtkSmartPointer<vtkCallbackCommand>::New();
  cb->SetCallback(Collect);
  cb->SetClientData(this);
  alg->AddObserver(vtkCommand::ErrorEvent, cb);
  alg->AddObserver(vtkCommand::WarningEvent, cb);
}

bool Messages::ErrorContains(const std::string& s) const
{
  for (const auto& e : this->Errors)
  {
    if (e.find(s) != std::string::npos)
    {
      return true;
    }
  }
  return false;
}

bool Messages::WarningContains(const std::string& s) const
{
  for (const auto& e : this->Warnings)
  {
    if (e.find(s) != std::string::npos)
    {
      return true;
    }
  }
  return false;
}
}
