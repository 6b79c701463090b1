// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * What Wall Traction keeps from one execution to the next (a time-step loop
 * re-executes it on the same mesh with new values):
 *
 * - MeshResultCache: per leaf, results that depend only on the mesh (the
 *   orientation check's counts), keyed on what they depend on: the points,
 *   the cell connectivity (offsets, connectivity, cell types, the polydata
 *   vertex/line/strip counts that shift polygon ids), the cell ghost array,
 *   and an optional extra array (the Wall Normal array when it decides the
 *   orientation). "Unchanged" is decided in two steps:
 *     1. the same objects (held weakly: a freed object never matches a new
 *        one at the same address) with the same modification times, the
 *        dataset's own time included (so an in-place edit followed by
 *        ds->Modified() is seen; its arrays' new values are not part of it);
 *     2. otherwise, for readers that hand over new objects with the same
 *        content on every step, the same counts and the same 64-bit content
 *        hash (ContentHash.h) of those arrays' bytes, computed threaded at
 *        memory speed. Non-contiguous arrays (implicit or
 *        structure-of-arrays) have no content hash: a new object then
 *        always counts as a new mesh.
 *   A hash is taken only where it is cheaper than what it saves (Store's
 *   `byContent`): after the exact check (hundreds of ms on a large open
 *   surface), not after the face loop's edge-balance certificate, which
 *   reads less memory than the hash does (it needs the connectivity only,
 *   already in registers in the face loop; the hash reads points and
 *   connectivity again: 8-15 ms against a median of 7 ms on two threads
 *   at 2M faces). A certified mesh is found by identity only, and new objects
 *   are certified again in their face loop.
 *   Cached state: a few dozen bytes per leaf (no per-face state).
 *
 * - OutputArrayPool: per leaf and array name, up to two double arrays reused
 *   between executions when their size matches. An array is handed out again
 *   only when the pool holds its only reference (GetReferenceCount() == 1):
 *   no output, downstream filter or script still holds it, so rewriting it
 *   cannot change data anyone else sees. In a pipeline whose downstream
 *   output (Load Integration's port 0) still holds the last step's arrays
 *   while Wall Traction runs, the pool alternates between two sets; the spare
 *   set is memory of the size of the outputs, traded for the page faults of
 *   fresh allocations. Arrays not asked for in an execution are released.
 */
#include "wallloads/LoadTotals.h"

#include "vtkSmartPointer.h"
#include "vtkType.h"
#include "vtkWeakPointer.h"

#include <cstdint>
#include <initializer_list>
#include <string>
#include <vector>

class vtkCellArray;
class vtkDataArray;
class vtkDataSet;
class vtkDoubleArray;
class vtkObject;

namespace wallloads
{

/// A 64-bit hash of the bytes of `arrays` (null entries count as empty), in
/// fixed blocks hashed threaded and combined in order (the same value for any
/// thread count). False when one array has no contiguous memory (implicit or
/// structure-of-arrays): such content has no hash.
bool HashArrayContents(const std::vector<vtkDataArray*>& arrays, std::uint64_t& hash);

/// The identity and content of the mesh arrays of one leaf.
class MeshIdentity
{
public:
  /// `extras` (entries may be null) are arrays the result also depends on.
  static MeshIdentity Of(vtkDataSet* ds, std::initializer_list<vtkDataArray*> extras);
  /// What a check of `cells` (a cell array of `ds`) depends on: its offsets
  /// and connectivity arrays, the cell array and the dataset's own time.
  /// Identity only (no content hash).
  static MeshIdentity OfCells(vtkDataSet* ds, vtkCellArray* cells);
  /// Same objects, unmodified since.
  bool SameObjects(const MeshIdentity& other) const;
  /// Content hash of the arrays (threaded); false if one is not contiguous.
  bool ComputeHash();
  /// Drop the raw array pointers kept for ComputeHash (no hash will be taken).
  void ForgetArrays() { this->Arrays.clear(); }
  bool HashKnown() const { return this->Hashed; }
  bool SameContent(const MeshIdentity& other) const
  {
    return this->Hashed && other.Hashed && this->Hash == other.Hash &&
      this->Counts == other.Counts;
  }

private:
  void Hold(vtkObject* o);
  void HoldOwnTime(vtkDataSet* ds); ///< the dataset, by its own time (not its arrays')
  void HoldArray(vtkDataArray* a, bool toHash);

  std::vector<vtkWeakPointer<vtkObject>> Objects;
  std::vector<vtkMTimeType> Times;
  std::vector<bool> Present;
  std::vector<vtkDataArray*> Arrays; ///< to hash; cleared by ComputeHash or ForgetArrays
  std::vector<vtkIdType> Counts;
  std::uint64_t Hash = 0;
  bool Hashed = false;
};

/// Per-leaf results that depend only on the mesh (see the header comment).
class MeshResultCache
{
public:
  static constexpr int NumValues = 2;
  /// True and `values` filled when leaf `slot` holds the same mesh as when stored.
  bool Find(std::size_t slot, vtkDataSet* ds, vtkDataArray* extra, double values[NumValues]);
  /// Remember `values` for leaf `slot`; `byContent`: also hash the mesh, so
  /// that new objects with the same content find them (see above).
  void Store(std::size_t slot, vtkDataSet* ds, vtkDataArray* extra,
    const double values[NumValues], bool byContent);
  /// Forget leaves from `count` on.
  void Resize(std::size_t count);

  vtkIdType Hits = 0;        ///< found by object identity and modification time
  vtkIdType ContentHits = 0; ///< found by content hash (new objects, same mesh)
  vtkIdType Builds = 0;      ///< stored (the result was computed)
  vtkIdType Hashes = 0;      ///< content hashes taken (Store and Find)

private:
  struct Entry
  {
    bool Valid = false;
    MeshIdentity Id;
    double Values[NumValues] = { 0, 0 };
    /// A mesh Find hashed and did not match (hash known, no raw pointers):
    /// Store takes its hash instead of hashing the same objects again.
    MeshIdentity Probe;
  };
  std::vector<Entry> Entries;
};

/**
 * Cell arrays whose offsets CheckPointIds (WallLoadsPipeline.h) found well
 * formed, each kept as MeshIdentity::OfCells: a filter re-executed on the
 * same mesh (a time-step loop) does not scan them again, while an edit
 * marked Modified() on the offsets, the connectivity, the cell array or the
 * dataset is scanned. (VTK's own cached array ranges, which the point-id
 * check uses, follow the array's modification time only.) Cell arrays
 * without cells are not kept (nothing to scan; polydata share one empty
 * array for their missing vertices, lines and strips). One entry per
 * offsets array, at most a few hundred (the oldest are forgotten).
 */
class ValidatedCells
{
public:
  /// True: found well formed before and unchanged since. False otherwise
  /// (the caller scans; counted in Scans when it has cells).
  bool Known(vtkDataSet* ds, vtkCellArray* cells);
  void Remember(vtkDataSet* ds, vtkCellArray* cells);
  vtkIdType Scans = 0; ///< cell arrays with cells that were not Known

private:
  struct Entry
  {
    vtkWeakPointer<vtkDataArray> Offsets; ///< the key
    MeshIdentity Id;
  };
  Entry* Find(vtkCellArray* cells);
  std::vector<Entry> Entries;
};

/// Output arrays reused between executions (see the header comment).
class OutputArrayPool
{
public:
  /// Mark the start of an execution.
  void Begin() { ++this->Generation; }
  /// A double array of `tuples` x `components` named `name` for leaf `slot`.
  vtkSmartPointer<vtkDoubleArray> Get(
    std::size_t slot, const char* name, int components, vtkIdType tuples);
  /// Release the arrays not asked for since Begin().
  void End();

  vtkIdType Reused = 0;
  vtkIdType Allocated = 0;

private:
  struct Entry
  {
    std::size_t Slot = 0;
    std::string Name;
    vtkSmartPointer<vtkDoubleArray> Array;
    std::uint64_t Asked = 0; ///< generation in which its name was asked for
    std::uint64_t Taken = 0; ///< generation in which it was handed out
  };
  std::vector<Entry> Entries;
  std::uint64_t Generation = 0;
};

/**
 * Load Integration's sums, computed by Wall Traction in its own face loop
 * (Load Integration's rule: counted faces, skipped when a force, the area or
 * the geometry is not finite; moments about the origin) and handed over in
 * memory, so that a Load Integration fed directly by Wall Traction does not
 * read every face again.
 *
 * The sums are found only for the very objects they were computed from:
 * the dataset, its points, connectivity and ghost array, and the Pressure
 * Force, Viscous Force and Face Area arrays, each the same object (held
 * weakly) with the same modification time and size (MeshIdentity). Any
 * filter in between that makes new arrays or points, a reader, a script
 * that edits an array and calls Modified(), or a copy to another process
 * breaks the match, and Load Integration then sums the faces itself.
 * Wall Traction hands over one entry per leaf and output array; entries of
 * freed arrays are dropped.
 */
void HandOverLoadSums(vtkDataSet* ds, vtkDataArray* forceP, vtkDataArray* forceV,
  vtkDataArray* area, const LoadSums<double>& sums);
/// True and `sums` filled when `ds` and its arrays are those handed over.
bool FindHandedLoadSums(vtkDataSet* ds, vtkDataArray* forceP, vtkDataArray* forceV,
  vtkDataArray* area, LoadSums<double>& sums);

} // namespace wallloads
