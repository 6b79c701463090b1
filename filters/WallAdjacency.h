// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Face-to-cell adjacency of Shear Projection: the boundary faces of each
 * volume block, indexed for matching wall faces to their adjacent cell, kept
 * in a cache while the block's mesh does not change. Private to the module.
 *
 * For each volume block the boundary faces are extracted once (with the id
 * of their adjacent cell) and their centroids put in a point locator. A wall
 * face is matched to the boundary face at its centroid, within a tolerance
 * the caller gives; two matches (the sides of a zero-thickness baffle) are
 * told apart by the wall's stored orientation, taken to point out of the
 * fluid. A boundary face that another volume block also has is an interface
 * between blocks, not a wall.
 */
#include "vtkSmartPointer.h"
#include "vtkType.h"

#include <vector>

class vtkDataSet;
class vtkIdList;
class vtkPolyData;
class vtkStaticPointLocator;

namespace wallloads
{

class WallAdjacency
{
public:
  /// The boundary of one volume block, indexed for matching.
  struct Block
  {
    // Identity of the mesh the entry was built from.
    const void* Points = nullptr;
    vtkMTimeType PointsTime = 0;
    const void* Cells = nullptr;
    vtkMTimeType CellsTime = 0;
    vtkIdType NumPoints = -1, NumCells = -1;
    double Bounds[6] = { 0, 0, 0, 0, 0, 0 };

    vtkSmartPointer<vtkPolyData> Faces;          ///< boundary faces, with vtkOriginalCellIds
    vtkSmartPointer<vtkStaticPointLocator> Near; ///< on the face centroids
    std::vector<vtkIdType> Cell;                 ///< adjacent cell of each boundary face
    vtkSmartPointer<vtkDataSet> Mesh;            ///< private copy for neighbour queries

    bool Matches(vtkDataSet* ds) const;
    void Build(vtkDataSet* ds);
  };

  /// Entries for these volume blocks, in order: cached ones are reused,
  /// the others built. Returns how many were built.
  int Update(const std::vector<vtkDataSet*>& volumes);

  std::size_t Size() const { return this->Blocks.size(); }
  const Block& operator[](std::size_t i) const { return this->Blocks[i]; }

  /// A wall face's adjacent cell: block and cell id, or -1 for none.
  struct Match
  {
    int Block = -1;
    vtkIdType Cell = -1;
  };

  /**
   * The adjacent cell of a wall face with centroid `c` and unit normal
   * `normal` (stored orientation), over every block: the boundary face whose
   * centroid is nearest within `tol`; with candidates on both sides of the
   * face, the one on the fluid side (opposite to `normal`).
   */
  Match FindAdjacentCell(const double c[3], const double normal[3], double tol,
    vtkIdList* found, vtkIdList* corners) const;

  /// Whether boundary face centroid `c` of block `block` is also on the
  /// boundary of another block (an interface between blocks, not a wall).
  bool IsInterface(std::size_t block, const double c[3], double tol) const;

private:
  std::vector<Block> Blocks;
};

/// Mean of the points of a cell (the cell centre Shear Projection uses).
void CellCentre(vtkDataSet* ds, vtkIdList* cellPoints, double x[3]);

} // namespace wallloads
