// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Pieces shared by every WallLoads filter: array names, the one ghost policy,
 * typed views of arrays and cells, leaf enumeration of composite inputs, and
 * reductions across MPI ranks. Private to the module.
 */
#include "vtkCellArray.h"
#include "vtkCellType.h"
#include "vtkDataArray.h"
#include "vtkSmartPointer.h"
#include "vtkType.h"

#include <cstdint>
#include <string>
#include <vector>

class vtkAlgorithm;
class vtkDataObject;
class vtkDataObjectTreeIterator;
class vtkDataSet;
class vtkFieldData;
class vtkObject;

namespace wallloads
{
namespace names
{
// Per-face cell arrays made by Wall Traction (and read by the integrators).
constexpr const char* WallNormal = "Wall Normal";
constexpr const char* FaceArea = "Face Area";
constexpr const char* PressureTraction = "Pressure Traction";
constexpr const char* ViscousTraction = "Viscous Traction";
constexpr const char* Traction = "Traction";
constexpr const char* PressureForce = "Pressure Force";
constexpr const char* ViscousForce = "Viscous Force";
constexpr const char* Force = "Force";
constexpr const char* NormalViscousStress = "Normal Viscous Stress";
constexpr const char* PressureCoefficient = "Pressure Coefficient";
constexpr const char* SkinFrictionCoefficient = "Skin Friction Coefficient";
constexpr const char* DirectionalTraction = "Directional Traction";
// Field data.
constexpr const char* WettedArea = "Wetted Area";
constexpr const char* SkippedNonSurfaceCells = "Skipped Non-Surface Cells";
constexpr const char* SkippedDegenerateFaces = "Skipped Degenerate Faces";
constexpr const char* SkippedNonFiniteFaces = "Skipped Non-Finite Faces";
constexpr const char* InconsistentlyOrientedFaces = "Inconsistently Oriented Faces";
constexpr const char* OpenBoundaryEdges = "Open Boundary Edges";
} // namespace names

/// True for an empty selection ("", "None", "(none)").
bool IsUnsetArrayName(const char* name);

/**
 * The ghost policy of every WallLoads filter: a face is counted in totals
 * unless its vtkGhostType marks it DUPLICATECELL (owned by another rank) or
 * HIDDENCELL (blanked). Returns nullptr when the dataset has no ghost array.
 */
const unsigned char* CellGhostMask(vtkDataSet* ds);
inline bool IsCountedCell(const unsigned char* ghosts, vtkIdType cellId)
{
  // vtkDataSetAttributes::DUPLICATECELL = 1, HIDDENCELL = 32
  return ghosts == nullptr || (ghosts[cellId] & (1 | 32)) == 0;
}

/**
 * Read-only view of a float or double array without virtual calls per value.
 * Other value types are converted once to double (held by the view).
 */
struct ArrayView
{
  const void* Data = nullptr;
  bool IsFloat = false;
  int NumComponents = 0;
  bool OnPoints = false; ///< point data: values are averaged over a face's corners
  vtkSmartPointer<vtkDataArray> Holder;

  bool Valid() const { return this->Data != nullptr; }
  double Get(vtkIdType tuple, int comp) const
  {
    const vtkIdType k = tuple * this->NumComponents + comp;
    return this->IsFloat ? static_cast<const float*>(this->Data)[k]
                         : static_cast<const double*>(this->Data)[k];
  }
  /// Value for a face: the cell value, or the average over its corner points.
  template <typename I>
  double Face(vtkIdType cellId, const I* corners, int numCorners, int comp) const
  {
    if (!this->OnPoints)
    {
      return this->Get(cellId, comp);
    }
    double sum = 0;
    for (int k = 0; k < numCorners; ++k)
    {
      sum += this->Get(static_cast<vtkIdType>(corners[k]), comp);
    }
    return sum / numCorners;
  }
};
ArrayView MakeArrayView(vtkDataArray* array, bool onPoints);

/// Where a selected array lives, as given by SetInputArrayToProcess.
struct ArraySelection
{
  std::string Name;
  bool OnPoints = false;
  bool Set() const { return !this->Name.empty(); }
};

/// The array chosen with SetInputArrayToProcess(index, ...); unset if none.
ArraySelection SelectedArray(vtkAlgorithm* alg, int index);

/// The block name of the iterator's current leaf, or "#<flat index>".
std::string LeafName(vtkDataObjectTreeIterator* it);

/// A new double cell array of the dataset's cell count, added to it.
double* NewCellDoubleArray(vtkDataSet* out, const char* name, int components);

/**
 * The one validation of a selected array, used by every filter before any
 * value is read: the array must exist with the association asked for (point
 * or cell data), be numeric (a vtkDataArray, not a string array), have
 * `wantComponents` components (any when 0) and hold exactly one tuple per
 * point or cell. On failure returns nullptr, and `error` names the role (the
 * panel label), the array, the block, the problem and the arrays that exist.
 */
vtkDataArray* FindSelectedArray(vtkDataSet* ds, const ArraySelection& sel, int wantComponents,
  const std::string& role, const std::string& blockName, std::string& error);

/**
 * Ghost arrays (vtkGhostType, point or cell data) must be unsigned char, one
 * component, one value per point or cell: VTK itself reads them unchecked
 * (a short one crashes GetCellType on structured grids). Every filter calls
 * this on every leaf before anything else; false with `error` set otherwise.
 */
bool CheckGhostArrays(vtkDataSet* ds, const std::string& blockName, std::string& error);

class ValidatedCells; // WallLoadsMeshCache.h

/**
 * The cells of polydata and unstructured grids must be well formed, as VTK
 * reads them unchecked: offsets from 0, never decreasing, ending at the
 * connectivity's size; one cell type per cell; every point id (connectivity
 * and polyhedron face streams) naming a point of the dataset. False with
 * `error` set (the block, the problem, e.g. the largest id and the point
 * count) otherwise. Other dataset kinds have implicit connectivity.
 * `validated` (optional) skips the offsets of cell arrays found well formed
 * before, and remembers those found now (WallLoadsMeshCache.h).
 */
bool CheckPointIds(vtkDataSet* ds, const std::string& blockName, std::string& error,
  ValidatedCells* validated = nullptr);

/// "cell arrays: a, b; point arrays: c" for error messages.
std::string DescribeArrays(vtkDataSet* ds);

/**
 * The faces of a surface dataset as typed connectivity: polygons of a
 * vtkPolyData, or the 2D cells of an unstructured grid. `Corners` gives the
 * corner point ids of a cell, or 0 for cells that are not faces (vertices,
 * lines, strips, 3D cells).
 */
template <typename I>
struct FaceTopology
{
  const I* Offsets = nullptr;
  const I* Connectivity = nullptr;
  vtkIdType FirstCell = 0;  ///< polydata: cell id of the first polygon
  vtkIdType NumPolys = 0;   ///< polydata: number of polygons
  const unsigned char* Types = nullptr; ///< unstructured grid: cell types

  int Corners(vtkIdType cellId, const I*& ids, I buffer[4]) const;
  /// The corner count of cells c..c+W-1 when all are faces of the same 3
  /// or 4 corners (a run the lane paths take, Lanes.h), else 0.
  template <int W>
  int RunOf(vtkIdType c, const I* ids[W], I buffer[W][4]) const
  {
    const int n = this->Corners(c, ids[0], buffer[0]);
    bool same = n == 3 || n == 4;
    for (int j = 1; j < W; ++j)
    {
      same = (this->Corners(c + j, ids[j], buffer[j]) == n) && same;
    }
    return same ? n : 0;
  }
};

/// Typed point coordinates (float or double), converted once if neither.
struct PointView
{
  const void* Data = nullptr;
  bool IsFloat = false;
  vtkSmartPointer<vtkDataArray> Holder;
};
PointView MakePointView(vtkDataSet* ds);

/// Whether the face connectivity of `ds` is stored with 64-bit ids.
bool FacesUse64BitIds(vtkDataSet* ds);

/**
 * Call `fn(IdType{}, PointType{})` with the connectivity width of `ds`
 * (vtkTypeInt32 or vtkTypeInt64) and its point type (float or double), so
 * that face loops are compiled for each storage instead of branching per
 * value: `DispatchFaces(ds, [&](auto id, auto pt) { Loop<decltype(id),
 * decltype(pt)>(...); })`.
 */
template <typename Fn>
void DispatchFaces(vtkDataSet* ds, bool floatPoints, Fn&& fn)
{
  if (FacesUse64BitIds(ds))
  {
    floatPoints ? fn(vtkTypeInt64{}, float{}) : fn(vtkTypeInt64{}, double{});
  }
  else
  {
    floatPoints ? fn(vtkTypeInt32{}, float{}) : fn(vtkTypeInt32{}, double{});
  }
}
/// Fill the topology view; false if `ds` is neither polydata nor an
/// unstructured grid (or its storage is not of width I).
template <typename I>
bool MakeFaceTopology(vtkDataSet* ds, FaceTopology<I>& topology);

template <typename I>
#if defined(__GNUC__)
__attribute__((always_inline))
#endif
inline int FaceTopology<I>::Corners(vtkIdType cellId, const I*& ids, I buffer[4]) const
{
  if (!this->Types)
  {
    const vtkIdType local = cellId - this->FirstCell;
    if (local < 0 || local >= this->NumPolys)
    {
      return 0;
    }
    ids = this->Connectivity + this->Offsets[local];
    return static_cast<int>(this->Offsets[local + 1] - this->Offsets[local]);
  }
  const I* c = this->Connectivity + this->Offsets[cellId];
  const int n = static_cast<int>(this->Offsets[cellId + 1] - this->Offsets[cellId]);
  switch (this->Types[cellId])
  {
    case VTK_TRIANGLE:
    case VTK_QUAD:
    case VTK_POLYGON:
      ids = c;
      return n;
    // Higher-order faces are taken by their corner polygon.
    case VTK_QUADRATIC_TRIANGLE:
    case VTK_BIQUADRATIC_TRIANGLE:
      ids = c;
      return 3;
    case VTK_QUADRATIC_QUAD:
    case VTK_BIQUADRATIC_QUAD:
      ids = c;
      return 4;
    case VTK_PIXEL: // corners stored in raster order
      buffer[0] = c[0];
      buffer[1] = c[1];
      buffer[2] = c[3];
      buffer[3] = c[2];
      ids = buffer;
      return 4;
    default:
      return 0;
  }
}

/// A leaf of a (possibly composite) input. Composite inputs list every leaf,
/// empty or not, so that all ranks see the same list in the same order.
struct Leaf
{
  vtkDataSet* Data = nullptr; ///< nullptr for an empty leaf
  std::string Name;
  int Region = 0; ///< index of the region it belongs to
};
/// Leaves and region names: one region per leaf of a multiblock, per
/// partitioned dataset of a collection, or a single region for a dataset.
void ListLeaves(vtkDataObject* input, std::vector<Leaf>& leaves, std::vector<std::string>& regions);

/// Collective sums and extrema over all ranks (no-ops on one process).
void GlobalSum(double* values, int count);
void GlobalMin(double* values, int count);
void GlobalMax(double* values, int count);
int ProcessRank();
int ProcessCount();

/// After the ranks agreed that at least one failed: a failing rank gives its
/// reason, and rank 0 says so when the failure was elsewhere.
void ReportAgreedFailure(vtkObject* self, const std::string& localError);

/// Helpers to attach results.
void SetFieldValue(vtkFieldData* fd, const char* name, const double* values, int numComponents);

} // namespace wallloads
