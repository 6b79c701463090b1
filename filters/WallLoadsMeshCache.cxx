// SPDX-License-Identifier: BSD-3-Clause
#include "WallLoadsMeshCache.h"

#include "wallloads/ContentHash.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkDataArray.h"
#include "vtkDataSet.h"
#include "vtkDoubleArray.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkSMPTools.h"
#include "vtkUnstructuredGrid.h"

#include <algorithm>
#include <cstdlib>
#include <mutex>
#ifdef _WIN32
#include <malloc.h>
#endif

namespace wallloads
{

void MeshIdentity::Hold(vtkObject* o)
{
  this->Objects.emplace_back(o);
  this->Times.push_back(o ? o->GetMTime() : 0);
  this->Present.push_back(o != nullptr);
}

void MeshIdentity::HoldOwnTime(vtkDataSet* ds)
{
  // The dataset's own modification time (not the one that includes its
  // arrays, which change every step): a caller that edits connectivity or
  // points in place and calls ds->Modified() is seen.
  this->Objects.emplace_back(ds);
  this->Times.push_back(ds->vtkObject::GetMTime());
  this->Present.push_back(true);
}

void MeshIdentity::HoldArray(vtkDataArray* a, bool toHash)
{
  this->Hold(a);
  if (toHash)
  {
    this->Arrays.push_back(a);
  }
  this->Counts.push_back(a ? a->GetNumberOfValues() : -1);
}

MeshIdentity MeshIdentity::OfCells(vtkDataSet* ds, vtkCellArray* cells)
{
  MeshIdentity id;
  id.HoldOwnTime(ds);
  id.Hold(cells);
  id.HoldArray(cells ? cells->GetOffsetsArray() : nullptr, false);
  id.HoldArray(cells ? cells->GetConnectivityArray() : nullptr, false);
  return id;
}

MeshIdentity MeshIdentity::Of(vtkDataSet* ds, std::initializer_list<vtkDataArray*> extras)
{
  MeshIdentity id;
  id.HoldOwnTime(ds);
  id.Counts.push_back(ds->GetNumberOfPoints());
  id.Counts.push_back(ds->GetNumberOfCells());
  vtkPoints* points = nullptr;
  if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    points = pd->GetPoints();
    // Vertex, line and strip counts shift the ids of the polygons.
    for (vtkCellArray* cells : { pd->GetVerts(), pd->GetLines(), pd->GetStrips() })
    {
      id.Counts.push_back(cells ? cells->GetNumberOfCells() : 0);
    }
    vtkCellArray* polys = pd->GetPolys();
    id.Hold(polys);
    id.HoldArray(polys ? polys->GetOffsetsArray() : nullptr, true);
    id.HoldArray(polys ? polys->GetConnectivityArray() : nullptr, true);
  }
  else if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    points = ug->GetPoints();
    vtkCellArray* cells = ug->GetCells();
    id.Hold(cells);
    id.HoldArray(cells ? cells->GetOffsetsArray() : nullptr, true);
    id.HoldArray(cells ? cells->GetConnectivityArray() : nullptr, true);
    id.HoldArray(ug->GetCellTypesArray(), true);
  }
  id.Hold(points);
  id.HoldArray(points ? points->GetData() : nullptr, true);
  id.HoldArray(ds->GetCellData()->GetGhostArray(), true);
  for (vtkDataArray* extra : extras)
  {
    id.HoldArray(extra, true);
  }
  return id;
}

bool MeshIdentity::SameObjects(const MeshIdentity& other) const
{
  if (this->Objects.size() != other.Objects.size() || this->Counts != other.Counts)
  {
    return false;
  }
  for (std::size_t i = 0; i < this->Objects.size(); ++i)
  {
    // A weak pointer turns null when its object is freed: a new object at
    // the same address is never taken for the old one.
    vtkObject* a = this->Objects[i];
    vtkObject* b = other.Objects[i];
    if (a != b || this->Times[i] != other.Times[i] || this->Present[i] != other.Present[i] ||
      (this->Present[i] && !a))
    {
      return false;
    }
  }
  return true;
}

bool HashArrayContents(const std::vector<vtkDataArray*>& arrays, std::uint64_t& hash)
{
  // Fixed 1 MiB blocks, hashed in parallel and combined in order: the same
  // value for any thread count.
  constexpr std::size_t Block = std::size_t(1) << 20;
  struct Span
  {
    const unsigned char* Data;
    std::size_t Size;
  };
  std::vector<Span> spans;
  std::uint64_t h = 0x57A11;
  for (vtkDataArray* a : arrays)
  {
    if (!a)
    {
      h = HashCombine(h, 0);
      continue;
    }
    if (!a->HasStandardMemoryLayout())
    {
      return false;
    }
    const std::size_t bytes =
      static_cast<std::size_t>(a->GetNumberOfValues()) * static_cast<std::size_t>(a->GetDataTypeSize());
    h = HashCombine(h, static_cast<std::uint64_t>(a->GetDataType()));
    spans.push_back(Span{ static_cast<const unsigned char*>(a->GetVoidPointer(0)), bytes });
  }
  std::vector<std::pair<std::size_t, std::size_t>> blocks; // (span, offset)
  for (std::size_t s = 0; s < spans.size(); ++s)
  {
    for (std::size_t off = 0; off < spans[s].Size || off == 0; off += Block)
    {
      blocks.emplace_back(s, off);
      if (spans[s].Size == 0)
      {
        break;
      }
    }
  }
  std::vector<std::uint64_t> hashes(blocks.size());
  vtkSMPTools::For(0, static_cast<vtkIdType>(blocks.size()), [&](vtkIdType b0, vtkIdType b1) {
    for (vtkIdType b = b0; b < b1; ++b)
    {
      const Span& s = spans[blocks[b].first];
      const std::size_t off = blocks[b].second;
      hashes[b] = HashBytes(s.Data + off, std::min(Block, s.Size - off), off);
    }
  });
  for (std::uint64_t v : hashes)
  {
    h = HashCombine(h, v);
  }
  hash = h;
  return true;
}

bool MeshIdentity::ComputeHash()
{
  this->Hashed = HashArrayContents(this->Arrays, this->Hash);
  this->Arrays.clear(); // no raw pointer outlives the call
  return this->Hashed;
}

bool MeshResultCache::Find(
  std::size_t slot, vtkDataSet* ds, vtkDataArray* extra, double values[NumValues])
{
  if (slot >= this->Entries.size() || !this->Entries[slot].Valid)
  {
    return false;
  }
  Entry& e = this->Entries[slot];
  MeshIdentity now = MeshIdentity::Of(ds, { extra });
  bool found = false;
  if (now.SameObjects(e.Id))
  {
    ++this->Hits;
    found = true;
  }
  else if (e.Id.HashKnown()) // else stored by identity only (Store's byContent)
  {
    const bool hashed = now.ComputeHash();
    this->Hashes += hashed;
    if (hashed && now.SameContent(e.Id))
    {
      ++this->ContentHits;
      e.Id = now; // the new objects: the next step takes the fast path
      found = true;
    }
    else if (hashed)
    {
      e.Probe = now; // a changed mesh: Store, after the check, takes this hash
    }
  }
  if (found)
  {
    std::copy(e.Values, e.Values + NumValues, values);
  }
  return found;
}

void MeshResultCache::Store(std::size_t slot, vtkDataSet* ds, vtkDataArray* extra,
  const double values[NumValues], bool byContent)
{
  if (slot >= this->Entries.size())
  {
    this->Entries.resize(slot + 1);
  }
  Entry& e = this->Entries[slot];
  e.Id = MeshIdentity::Of(ds, { extra });
  if (byContent && e.Probe.HashKnown() && e.Probe.SameObjects(e.Id))
  {
    e.Id = e.Probe; // hashed by Find in this execution, the same objects unchanged since
  }
  else if (byContent)
  {
    this->Hashes += e.Id.ComputeHash();
  }
  else
  {
    e.Id.ForgetArrays(); // identity only: no raw pointer is kept
  }
  e.Probe = MeshIdentity();
  std::copy(values, values + NumValues, e.Values);
  e.Valid = true;
  ++this->Builds;
}

void MeshResultCache::Resize(std::size_t count)
{
  if (count < this->Entries.size())
  {
    this->Entries.resize(count);
  }
}

ValidatedCells::Entry* ValidatedCells::Find(vtkCellArray* cells)
{
  vtkDataArray* offsets = cells->GetOffsetsArray();
  for (Entry& e : this->Entries)
  {
    // A weak pointer turns null when its array is freed: a new array at the
    // same address never matches.
    if (e.Offsets && e.Offsets == offsets)
    {
      return &e;
    }
  }
  return nullptr;
}

bool ValidatedCells::Known(vtkDataSet* ds, vtkCellArray* cells)
{
  if (!cells || cells->GetNumberOfCells() <= 0)
  {
    return false; // nothing to scan, nothing kept
  }
  const Entry* e = this->Find(cells);
  if (e && e->Id.SameObjects(MeshIdentity::OfCells(ds, cells)))
  {
    return true;
  }
  ++this->Scans;
  return false;
}

void ValidatedCells::Remember(vtkDataSet* ds, vtkCellArray* cells)
{
  if (!cells || cells->GetNumberOfCells() <= 0)
  {
    return;
  }
  if (Entry* e = this->Find(cells))
  {
    e->Id = MeshIdentity::OfCells(ds, cells); // edited, and found well formed again
    return;
  }
  // Freed arrays first, then the oldest entries beyond the bound.
  this->Entries.erase(std::remove_if(this->Entries.begin(), this->Entries.end(),
                        [](const Entry& e) { return !e.Offsets; }),
    this->Entries.end());
  constexpr std::size_t Bound = 256;
  if (this->Entries.size() >= Bound)
  {
    this->Entries.erase(this->Entries.begin());
  }
  this->Entries.push_back(Entry{ cells->GetOffsetsArray(), MeshIdentity::OfCells(ds, cells) });
}

namespace
{
/// `count` doubles, 64-byte aligned, to be freed as VTK frees an array
/// given with VTK_DATA_ARRAY_ALIGNED_FREE; null when out of memory.
double* AllocateAligned(std::size_t count)
{
#ifdef _WIN32
  return static_cast<double*>(_aligned_malloc(count * sizeof(double), 64));
#else
  void* data = nullptr;
  return posix_memalign(&data, 64, count * sizeof(double)) == 0 ? static_cast<double*>(data) : nullptr;
#endif
}
} // namespace

vtkSmartPointer<vtkDoubleArray> OutputArrayPool::Get(
  std::size_t slot, const char* name, int components, vtkIdType tuples)
{
  int mine = 0;
  Entry* replace = nullptr;
  for (Entry& e : this->Entries)
  {
    if (e.Slot == slot && e.Name == name)
    {
      e.Asked = this->Generation; // kept, even if held elsewhere now
    }
  }
  for (Entry& e : this->Entries)
  {
    if (e.Slot != slot || e.Name != name)
    {
      continue;
    }
    ++mine;
    // Only the pool holds it: nobody can see it change.
    const bool free = e.Array->GetReferenceCount() == 1;
    if (free && e.Taken != this->Generation && e.Array->GetNumberOfComponents() == components &&
      e.Array->GetNumberOfTuples() == tuples)
    {
      e.Taken = this->Generation;
      e.Array->Modified(); // cached ranges are stale
      ++this->Reused;
      return e.Array;
    }
    if (!replace || (free && replace->Array->GetReferenceCount() != 1))
    {
      replace = &e;
    }
  }
  auto a = vtkSmartPointer<vtkDoubleArray>::New();
  a->SetName(name);
  a->SetNumberOfComponents(components);
  // 64-byte aligned (a cache line, an AVX-512 register), so that the face
  // loop may write it with streaming stores (WallTractionTypes.h,
  // StreamOutputs); freed by VTK with free().
  const vtkIdType values = tuples * components;
  if (double* data = values > 0 ? AllocateAligned(static_cast<std::size_t>(values)) : nullptr)
  {
    a->SetArray(data, values, 0, vtkAbstractArray::VTK_DATA_ARRAY_ALIGNED_FREE);
  }
  else
  {
    a->SetNumberOfTuples(tuples);
  }
  ++this->Allocated;
  if (mine < 2)
  {
    this->Entries.push_back(Entry{ slot, name, a, this->Generation, this->Generation });
  }
  else if (replace)
  {
    replace->Array = a;
    replace->Taken = this->Generation;
  }
  return a;
}

void OutputArrayPool::End()
{
  this->Entries.erase(std::remove_if(this->Entries.begin(), this->Entries.end(),
                        [this](const Entry& e) { return e.Asked != this->Generation; }),
    this->Entries.end());
}

} // namespace wallloads

namespace wallloads
{
namespace
{
struct HandedSums
{
  vtkWeakPointer<vtkDataArray> Key; ///< the Pressure Force array
  MeshIdentity Id;
  LoadSums<double> Sums;
};
std::mutex HandedMutex;
std::vector<HandedSums> Handed;
}

void HandOverLoadSums(vtkDataSet* ds, vtkDataArray* forceP, vtkDataArray* forceV,
  vtkDataArray* area, const LoadSums<double>& sums)
{
  if (!ds || !forceP || !forceV || !area)
  {
    return;
  }
  std::lock_guard<std::mutex> lock(HandedMutex);
  // Drop the entries of freed arrays and the last one of this array.
  Handed.erase(std::remove_if(Handed.begin(), Handed.end(),
                 [forceP](const HandedSums& h) { return !h.Key || h.Key == forceP; }),
    Handed.end());
  HandedSums h;
  h.Key = forceP;
  h.Id = MeshIdentity::Of(ds, { forceP, forceV, area });
  h.Sums = sums;
  Handed.push_back(std::move(h));
}

bool FindHandedLoadSums(vtkDataSet* ds, vtkDataArray* forceP, vtkDataArray* forceV,
  vtkDataArray* area, LoadSums<double>& sums)
{
  if (!ds || !forceP || !forceV || !area)
  {
    return false;
  }
  const MeshIdentity now = MeshIdentity::Of(ds, { forceP, forceV, area });
  std::lock_guard<std::mutex> lock(HandedMutex);
  for (const HandedSums& h : Handed)
  {
    if (h.Key == forceP && h.Id.SameObjects(now))
    {
      sums = h.Sums;
      return true;
    }
  }
  return false;
}
} // namespace wallloads
