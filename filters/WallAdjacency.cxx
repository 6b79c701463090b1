// SPDX-License-Identifier: BSD-3-Clause
#include "WallAdjacency.h"

#include "wallloads/FaceGeometry.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDataArray.h"
#include "vtkDataSetSurfaceFilter.h"
#include "vtkIdList.h"
#include "vtkMath.h"
#include "vtkPointSet.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkStaticPointLocator.h"
#include "vtkUnstructuredGrid.h"

#include <limits>

namespace wallloads
{
namespace
{
const double NaN = std::numeric_limits<double>::quiet_NaN();

/// What identifies a mesh: its points and cells objects (explicit meshes)
/// and their modification times, or, for implicit ones (image data,
/// structured grids), counts and bounds. Arrays do not enter.
struct Key
{
  const void* Points;
  vtkMTimeType PointsTime;
  const void* Cells;
  vtkMTimeType CellsTime;
};

Key KeyOf(vtkDataSet* ds)
{
  auto* ps = vtkPointSet::SafeDownCast(ds);
  auto* ug = vtkUnstructuredGrid::SafeDownCast(ds);
  Key k{ nullptr, 0, nullptr, 0 };
  if (ps && ps->GetPoints())
  {
    k.Points = ps->GetPoints()->GetData();
    k.PointsTime = ps->GetPoints()->GetMTime();
  }
  if (ug && ug->GetCells())
  {
    k.Cells = ug->GetCells();
    k.CellsTime = ug->GetCells()->GetMTime();
  }
  return k;
}
} // namespace

void CellCentre(vtkDataSet* ds, vtkIdList* cellPoints, double x[3])
{
  x[0] = x[1] = x[2] = 0;
  for (vtkIdType j = 0; j < cellPoints->GetNumberOfIds(); ++j)
  {
    double p[3];
    ds->GetPoint(cellPoints->GetId(j), p);
    for (int k = 0; k < 3; ++k)
    {
      x[k] += p[k];
    }
  }
  for (int k = 0; k < 3; ++k)
  {
    x[k] /= static_cast<double>(cellPoints->GetNumberOfIds());
  }
}

bool WallAdjacency::Block::Matches(vtkDataSet* ds) const
{
  const Key k = KeyOf(ds);
  double bounds[6];
  ds->GetBounds(bounds);
  bool same = k.Points == this->Points && k.PointsTime == this->PointsTime &&
    k.Cells == this->Cells && k.CellsTime == this->CellsTime &&
    ds->GetNumberOfPoints() == this->NumPoints && ds->GetNumberOfCells() == this->NumCells;
  for (int i = 0; i < 6 && same; ++i)
  {
    same = bounds[i] == this->Bounds[i];
  }
  return same;
}

void WallAdjacency::Block::Build(vtkDataSet* ds)
{
  const Key k = KeyOf(ds);
  this->Points = k.Points;
  this->PointsTime = k.PointsTime;
  this->Cells = k.Cells;
  this->CellsTime = k.CellsTime;
  this->NumPoints = ds->GetNumberOfPoints();
  this->NumCells = ds->GetNumberOfCells();
  ds->GetBounds(this->Bounds);

  // Geometry only: the extraction must not carry the volume's arrays.
  this->Mesh.TakeReference(ds->NewInstance());
  this->Mesh->CopyStructure(ds);
  auto surface = vtkSmartPointer<vtkDataSetSurfaceFilter>::New();
  surface->SetInputData(this->Mesh);
  surface->PassThroughCellIdsOn();
  surface->SetOriginalCellIdsName("vtkOriginalCellIds");
  surface->Update();
  this->Faces = surface->GetOutput();
  vtkDataArray* ids = this->Faces->GetCellData()->GetArray("vtkOriginalCellIds");
  const vtkIdType n = this->Faces->GetNumberOfCells();
  this->Cell.assign(static_cast<std::size_t>(n), -1);
  auto centroids = vtkSmartPointer<vtkPoints>::New();
  centroids->SetDataTypeToDouble();
  centroids->SetNumberOfPoints(n);
  auto list = vtkSmartPointer<vtkIdList>::New();
  std::vector<double> xyz;
  std::vector<vtkIdType> local;
  for (vtkIdType f = 0; f < n; ++f)
  {
    this->Cell[f] = ids ? static_cast<vtkIdType>(ids->GetComponent(f, 0)) : -1;
    this->Faces->GetCellPoints(f, list);
    xyz.resize(3 * list->GetNumberOfIds());
    local.resize(list->GetNumberOfIds());
    for (vtkIdType j = 0; j < list->GetNumberOfIds(); ++j)
    {
      this->Faces->GetPoint(list->GetId(j), &xyz[3 * j]);
      local[j] = j;
    }
    FaceFrame<double> frame;
    if (ComputeFaceFrame<double>(xyz.data(), local.data(), static_cast<int>(local.size()), frame) ==
      FaceStatus::Ok)
    {
      centroids->SetPoint(f, frame.Centroid);
    }
    else
    {
      centroids->SetPoint(f, NaN, NaN, NaN);
    }
  }
  auto cloud = vtkSmartPointer<vtkPolyData>::New();
  cloud->SetPoints(centroids);
  this->Near = vtkSmartPointer<vtkStaticPointLocator>::New();
  this->Near->SetDataSet(cloud);
  this->Near->BuildLocator();
  if (auto* grid = vtkUnstructuredGrid::SafeDownCast(this->Mesh))
  {
    grid->BuildLinks(); // once, for the face neighbours of wall cells
  }
}

int WallAdjacency::Update(const std::vector<vtkDataSet*>& volumes)
{
  int built = 0;
  std::vector<Block> kept;
  for (vtkDataSet* ds : volumes)
  {
    bool found = false;
    for (Block& b : this->Blocks)
    {
      if (b.Matches(ds))
      {
        kept.push_back(b);
        found = true;
        break;
      }
    }
    if (!found)
    {
      kept.emplace_back();
      kept.back().Build(ds);
      ++built;
    }
  }
  this->Blocks = kept;
  return built;
}

WallAdjacency::Match WallAdjacency::FindAdjacentCell(const double c[3], const double normal[3],
  double tol, vtkIdList* found, vtkIdList* corners) const
{
  // Every boundary face at this centroid, over all volume blocks. Two (the
  // sides of a zero-thickness baffle) are told apart by the wall's stored
  // orientation, taken to point out of the fluid (as solvers export walls);
  // one is taken as it is.
  struct Candidate
  {
    int Block;
    vtkIdType Cell;
    double Distance2;
  };
  std::vector<Candidate> candidates;
  for (std::size_t v = 0; v < this->Blocks.size(); ++v)
  {
    const Block& b = this->Blocks[v];
    b.Near->FindPointsWithinRadius(tol, c, found);
    for (vtkIdType j = 0; j < found->GetNumberOfIds(); ++j)
    {
      const vtkIdType id = found->GetId(j);
      double x[3];
      b.Near->GetDataSet()->GetPoint(id, x);
      const double d2 = vtkMath::Distance2BetweenPoints(x, c);
      candidates.push_back({ static_cast<int>(v), b.Cell[id], d2 });
    }
  }
  const Candidate* pick = nullptr;
  bool pickFluidSide = false;
  for (const Candidate& cand : candidates)
  {
    bool better = !pick || cand.Distance2 < pick->Distance2;
    if (candidates.size() > 1 && cand.Cell >= 0)
    {
      vtkDataSet* mesh = this->Blocks[cand.Block].Mesh;
      mesh->GetCellPoints(cand.Cell, corners);
      double xP[3];
      CellCentre(mesh, corners, xP);
      const double toP[3] = { xP[0] - c[0], xP[1] - c[1], xP[2] - c[2] };
      const bool fluidSide = vtkMath::Dot(toP, normal) < 0;
      if (pick && fluidSide != pickFluidSide)
      {
        better = fluidSide;
      }
      if (better)
      {
        pickFluidSide = fluidSide;
      }
    }
    if (better)
    {
      pick = &cand;
    }
  }
  Match m;
  if (pick)
  {
    m.Block = pick->Block;
    m.Cell = pick->Cell;
  }
  return m;
}

bool WallAdjacency::IsInterface(std::size_t block, const double c[3], double tol) const
{
  for (std::size_t v = 0; v < this->Blocks.size(); ++v)
  {
    double d2;
    if (v != block && this->Blocks[v].Near->FindClosestPointWithinRadius(tol, c, d2) >= 0)
    {
      return true;
    }
  }
  return false;
}

} // namespace wallloads
