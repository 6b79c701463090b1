// SPDX-License-Identifier: BSD-3-Clause
// MeshKey (WallAdjacency.h): what Shear Projection's caches depend on, by
// identity and modification time, with a content-hash fallback for readers
// that hand over new arrays with the same content at every time step.
#include "WallAdjacency.h"
#include "WallLoadsMeshCache.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDataArray.h"
#include "vtkIdTypeArray.h"
#include "vtkImageData.h"
#include "vtkMatrix3x3.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkRectilinearGrid.h"
#include "vtkStructuredGrid.h"
#include "vtkUnsignedCharArray.h"
#include "vtkUnstructuredGrid.h"

namespace wallloads
{

//------------------------------------------------------------------------------
MeshKey MeshKey::Of(vtkDataSet* ds)
{
  MeshKey k;
  if (!ds)
  {
    return k;
  }
  k.Kind = ds->GetClassName();
  auto hold = [&k](vtkObject* o) {
    k.Objects.emplace_back(o);
    k.Times.push_back(o ? o->GetMTime() : 0);
  };
  auto numbers = [&k](const double* v, int n) { k.Numbers.insert(k.Numbers.end(), v, v + n); };
  auto extent = [&](const int* e) {
    const double d[6] = { double(e[0]), double(e[1]), double(e[2]), double(e[3]), double(e[4]),
      double(e[5]) };
    numbers(d, 6);
  };
  // The ghost array decides which faces are walls.
  hold(ds->GetCellData()->GetGhostArray());
  const double counts[2] = { double(ds->GetNumberOfPoints()), double(ds->GetNumberOfCells()) };
  numbers(counts, 2);
  if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    hold(ug->GetPoints());
    hold(ug->GetPoints() ? ug->GetPoints()->GetData() : nullptr);
    vtkCellArray* cells = ug->GetCells();
    hold(cells);
    hold(cells ? cells->GetOffsetsArray() : nullptr);
    hold(cells ? cells->GetConnectivityArray() : nullptr);
    hold(ug->GetCellTypesArray());
    hold(ug->GetFaces());
    hold(ug->GetFaceLocations());
    k.Known = true;
  }
  else if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    hold(pd->GetPoints());
    hold(pd->GetPoints() ? pd->GetPoints()->GetData() : nullptr);
    for (vtkCellArray* cells : { pd->GetVerts(), pd->GetLines(), pd->GetPolys(), pd->GetStrips() })
    {
      hold(cells);
      hold(cells ? cells->GetOffsetsArray() : nullptr);
      hold(cells ? cells->GetConnectivityArray() : nullptr);
    }
    k.Known = true;
  }
  else if (auto* img = vtkImageData::SafeDownCast(ds))
  {
    extent(img->GetExtent());
    numbers(img->GetOrigin(), 3);
    numbers(img->GetSpacing(), 3);
    numbers(img->GetDirectionMatrix()->GetData(), 9);
    k.Known = true;
  }
  else if (auto* rg = vtkRectilinearGrid::SafeDownCast(ds))
  {
    extent(rg->GetExtent());
    hold(rg->GetXCoordinates());
    hold(rg->GetYCoordinates());
    hold(rg->GetZCoordinates());
    k.Known = true;
  }
  else if (auto* sg = vtkStructuredGrid::SafeDownCast(ds))
  {
    extent(sg->GetExtent());
    hold(sg->GetPoints());
    hold(sg->GetPoints() ? sg->GetPoints()->GetData() : nullptr);
    k.Known = true;
  }
  return k;
}

bool MeshKey::SameObjects(const MeshKey& other) const
{
  for (std::size_t i = 0; i < this->Objects.size(); ++i)
  {
    if (this->Objects[i] != other.Objects[i] || this->Times[i] != other.Times[i])
    {
      return false;
    }
  }
  return true;
}

void MeshKey::StoreContentHash() const
{
  if (this->HashState != 0)
  {
    return;
  }
  std::vector<vtkDataArray*> arrays;
  for (const auto& o : this->Objects)
  {
    // The arrays (points and cell arrays are represented by theirs); null
    // entries keep their place: "no ghost array" differs from an empty one.
    if (!o)
    {
      arrays.push_back(nullptr);
    }
    else if (auto* a = vtkDataArray::SafeDownCast(o))
    {
      arrays.push_back(a);
    }
  }
  this->HashState = HashArrayContents(arrays, this->Hash) ? 1 : -1;
}

bool MeshKey::SameAs(const MeshKey& other) const
{
  if (!this->Known || !other.Known || this->Kind != other.Kind ||
    this->Objects.size() != other.Objects.size() || this->Numbers != other.Numbers)
  {
    return false;
  }
  if (this->SameObjects(other))
  {
    return true;
  }
  // Which slots are null must agree (no ghost array vs a ghost array).
  for (std::size_t i = 0; i < this->Objects.size(); ++i)
  {
    if (!this->Objects[i] != !other.Objects[i])
    {
      return false;
    }
  }
  if (other.HashState != 1)
  {
    return false;
  }
  this->StoreContentHash();
  return this->HashState == 1 && this->Hash == other.Hash;
}

} // namespace wallloads
