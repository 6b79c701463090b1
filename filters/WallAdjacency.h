// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Face-to-cell adjacency of Shear Projection, built once per volume block and
 * kept while the block's geometry does not change. Private to the module.
 *
 * For one volume block (any vtkDataSet) it holds:
 * - the boundary faces of the block's owned 3-D cells: a face of an owned
 *   cell (not a DUPLICATECELL/HIDDENCELL ghost, the one ghost policy of
 *   WallLoadsPipeline.h) that no other 3-D cell of the block, owned or ghost,
 *   shares. Faces between an owned cell and a ghost layer (partition faces)
 *   and the ghost layer's own outer faces are therefore not boundary faces.
 *   Faces are found from the cells' corner points with a point-to-cell index,
 *   by face tables of our own per cell kind; quadratic and higher-order cells
 *   are taken by their corner points (VTK 9.2's surface extraction reports
 *   face indices instead of cell ids for them, so it is not used). Each face
 *   keeps its corners ordered out of the volume, its area centroid and its
 *   adjacent cell;
 * - for every cell with a boundary face (a "wall cell"), its neighbours: the
 *   cells sharing a face with it, then the other cells sharing a corner point
 *   (the nearest MaxStencil, never splitting cells at equal distance), with
 *   their centres (mean
 *   of the cell's points) and point ids, so that the per-face loop reads
 *   plain arrays and calls no VTK cell API (thread-safe, no allocation);
 * - a uniform-grid index of the face centroids, for matching wall faces that
 *   have their own points.
 *
 * The cache key (MeshKey) is the geometry itself: for explicit meshes the
 * point, connectivity, cell-type, polyhedron-face and ghost arrays by
 * identity and modification time (the entry holds references, so an address
 * cannot be reused by another array); for image data the extent, origin,
 * spacing and direction; for rectilinear grids the extent and the three
 * coordinate arrays; for structured grids the extent and the points. Other
 * dataset kinds are rebuilt on every execution. Readers of file series hand
 * over new arrays with the same content on every time step: when the objects
 * differ, the key falls back to a 64-bit content hash of the same arrays
 * (HashArrayContents, at memory speed: milliseconds for meshes whose
 * adjacency takes seconds to build), so a transient series on a fixed mesh
 * builds its adjacency once.
 */
#include "vtkObject.h"
#include "vtkSmartPointer.h"
#include "vtkType.h"

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

class vtkDataSet;
class vtkPolyData;

namespace wallloads
{

/// What an adjacency depends on (see the header comment).
class MeshKey
{
public:
  static MeshKey Of(vtkDataSet* ds);
  /// The same objects unmodified since, or else (for readers that hand over
  /// new objects with the same content every time step) the same numbers and
  /// the same content hash of the arrays; `other` is a stored key whose hash
  /// was taken by StoreContentHash when it was stored.
  bool SameAs(const MeshKey& other) const;
  bool Cacheable() const { return this->Known; }
  /// Hash the arrays now (a stored key must, since they may be edited in place later).
  void StoreContentHash() const;

private:
  bool SameObjects(const MeshKey& other) const;

  bool Known = false;
  std::string Kind;
  std::vector<vtkSmartPointer<vtkObject>> Objects;
  std::vector<vtkMTimeType> Times;
  std::vector<double> Numbers;
  // Content hash of the arrays among Objects: 0 not yet taken, 1 taken, -1 none
  // (an array without contiguous memory). Taken lazily for a key being looked up.
  mutable int HashState = 0;
  mutable std::uint64_t Hash = 0;
};

/// Uniform grid of points (face centroids) for radius queries; thread-safe to query.
class CentroidIndex
{
public:
  void Build(const std::vector<double>& xyz, double cellSize);
  /// Ids of the points (`xyz`, as given to Build) within `radius` of x, appended to `out`.
  void Within(const std::vector<double>& xyz, const double x[3], double radius,
    std::vector<vtkIdType>& out) const;

private:
  double Origin[3] = { 0, 0, 0 };
  double Size = 1;
  int Dims[3] = { 0, 0, 0 };
  std::vector<vtkIdType> Offsets; ///< per bucket, into Ids
  std::vector<vtkIdType> Ids;
};

class WallAdjacency
{
public:
  /// Neighbours kept per wall cell (face neighbours always are): the nearest
  /// MaxStencil, and up to TieRoom more at the same distance as the last.
  static constexpr int MaxStencil = 40;
  static constexpr int TieRoom = 12;

  struct Block
  {
    MeshKey Key;
    std::uint64_t BuildId = 0;      ///< unique per build (for caches that depend on it)
    vtkIdType NumVolumeCells = 0;   ///< 3-D cells, owned and ghost
    vtkIdType NumUnsupported = 0;   ///< 3-D cells of a kind without faces (convex point sets)
    vtkIdType NumOwnedVolumeCells = 0;

    // Boundary faces of the owned cells.
    std::vector<vtkIdType> FaceOffsets; ///< CSR into FaceCorners (size faces + 1)
    std::vector<vtkIdType> FaceCorners; ///< volume point ids, ordered out of the volume
    std::vector<double> FaceCentroid;   ///< 3 per face
    std::vector<int> FaceWallCell;      ///< wall-cell record of each face

    // Wall cells: cells with at least one boundary face.
    std::vector<vtkIdType> WallCellId;
    std::vector<int> WallCellSample;  ///< sample index of the cell itself
    std::vector<int> StencilOffsets;  ///< CSR into Stencil (size wall cells + 1)
    std::vector<int> Stencil;         ///< sample indices, face neighbours first
    std::vector<int> FaceNeighbours;  ///< how many of a record's stencil share a face

    // Sample cells (wall cells and their neighbours), each once.
    std::vector<vtkIdType> SampleCell;
    std::vector<double> SampleCentre;          ///< 3 per sample: mean of the cell's points
    std::vector<vtkIdType> SamplePointOffsets; ///< CSR into SamplePoints
    std::vector<vtkIdType> SamplePoints;       ///< all point ids of the cell

    CentroidIndex Index; ///< on FaceCentroid

    vtkSmartPointer<vtkPolyData> Surface;     ///< the boundary faces (compact points, no arrays)
    std::vector<vtkIdType> SurfacePointIds;   ///< volume point id of each surface point

    vtkIdType NumberOfFaces() const { return static_cast<vtkIdType>(this->FaceWallCell.size()); }
    void Build(vtkDataSet* ds);
  };

  /// Entries for these volume blocks, in order: cached ones are reused,
  /// the others built. Returns how many were built.
  int Update(const std::vector<vtkDataSet*>& volumes);

  std::size_t Size() const { return this->Blocks.size(); }
  const Block& operator[](std::size_t i) const { return this->Blocks[i]; }

  /// Every boundary face, over all blocks, whose centroid lies within `tol`
  /// of `c`, as (block, face) pairs appended to `out`; `scratch` is reused.
  void FindFaces(const double c[3], double tol, std::vector<std::pair<int, vtkIdType>>& out,
    std::vector<vtkIdType>& scratch) const;

private:
  std::vector<Block> Blocks;
};

} // namespace wallloads
