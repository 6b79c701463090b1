// SPDX-License-Identifier: BSD-3-Clause
#include "WallAdjacency.h"
#include "WallLoadsMeshCache.h"

#include "WallLoadsPipeline.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/Vector3.h"

#include "vtkCellArray.h"
#include "vtkCellData.h"
#include "vtkCellType.h"
#include "vtkCellTypes.h"
#include "vtkDataArray.h"
#include "vtkIdList.h"
#include "vtkIdTypeArray.h"
#include "vtkImageData.h"
#include "vtkMatrix3x3.h"
#include "vtkNew.h"
#include "vtkPointSet.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkRectilinearGrid.h"
#include "vtkStructuredGrid.h"
#include "vtkUnsignedCharArray.h"
#include "vtkUnstructuredGrid.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstdint>
#include <limits>
#include <unordered_map>

namespace wallloads
{
namespace
{
// Local faces of the linear 3-D cells, by corner position in the cell's point
// list (any orientation: faces are ordered out of the cell after extraction).
// -1 ends a face of fewer than 4 corners.
struct FaceTable
{
  int NumCorners = 0; ///< corner points of the cell (its first points)
  int NumFaces = 0;
  int Faces[8][6];
  int Sizes[8];
};

FaceTable MakeTable(int corners, std::initializer_list<std::initializer_list<int>> faces)
{
  FaceTable t;
  t.NumCorners = corners;
  for (const auto& f : faces)
  {
    int k = 0;
    for (int c : f)
    {
      t.Faces[t.NumFaces][k++] = c;
    }
    t.Sizes[t.NumFaces++] = k;
  }
  return t;
}

const FaceTable& Tetra()
{
  static const FaceTable t = MakeTable(4, { { 0, 1, 3 }, { 1, 2, 3 }, { 2, 0, 3 }, { 0, 2, 1 } });
  return t;
}
const FaceTable& Hexahedron()
{
  static const FaceTable t = MakeTable(8,
    { { 0, 4, 7, 3 }, { 1, 2, 6, 5 }, { 0, 1, 5, 4 }, { 3, 7, 6, 2 }, { 0, 3, 2, 1 },
      { 4, 5, 6, 7 } });
  return t;
}
const FaceTable& Voxel() // points in raster order
{
  static const FaceTable t = MakeTable(8,
    { { 0, 4, 6, 2 }, { 1, 3, 7, 5 }, { 0, 1, 5, 4 }, { 2, 6, 7, 3 }, { 0, 2, 3, 1 },
      { 4, 5, 7, 6 } });
  return t;
}
const FaceTable& Wedge()
{
  static const FaceTable t = MakeTable(
    6, { { 0, 1, 2 }, { 3, 5, 4 }, { 0, 3, 4, 1 }, { 1, 4, 5, 2 }, { 2, 5, 3, 0 } });
  return t;
}
const FaceTable& Pyramid()
{
  static const FaceTable t = MakeTable(
    5, { { 0, 3, 2, 1 }, { 0, 1, 4 }, { 1, 2, 4 }, { 2, 3, 4 }, { 3, 0, 4 } });
  return t;
}
const FaceTable& PentagonalPrism()
{
  static const FaceTable t = MakeTable(10,
    { { 0, 4, 3, 2, 1 }, { 5, 6, 7, 8, 9 }, { 0, 1, 6, 5 }, { 1, 2, 7, 6 }, { 2, 3, 8, 7 },
      { 3, 4, 9, 8 }, { 4, 0, 5, 9 } });
  return t;
}
const FaceTable& HexagonalPrism()
{
  static const FaceTable t = MakeTable(12,
    { { 0, 5, 4, 3, 2, 1 }, { 6, 7, 8, 9, 10, 11 }, { 0, 1, 7, 6 }, { 1, 2, 8, 7 },
      { 2, 3, 9, 8 }, { 3, 4, 10, 9 }, { 4, 5, 11, 10 }, { 5, 0, 6, 11 } });
  return t;
}

/// The face table of a 3-D cell kind; higher-order kinds list their corners
/// first, in the order of the linear kind. Null for polyhedra (their own
/// face stream) and kinds without faces.
const FaceTable* TableOf(int type)
{
  switch (type)
  {
    case VTK_TETRA:
    case VTK_QUADRATIC_TETRA:
    case VTK_LAGRANGE_TETRAHEDRON:
    case VTK_BEZIER_TETRAHEDRON:
      return &Tetra();
    case VTK_HEXAHEDRON:
    case VTK_QUADRATIC_HEXAHEDRON:
    case VTK_TRIQUADRATIC_HEXAHEDRON:
    case VTK_BIQUADRATIC_QUADRATIC_HEXAHEDRON:
    case VTK_LAGRANGE_HEXAHEDRON:
    case VTK_BEZIER_HEXAHEDRON:
      return &Hexahedron();
    case VTK_VOXEL:
      return &Voxel();
    case VTK_WEDGE:
    case VTK_QUADRATIC_WEDGE:
    case VTK_QUADRATIC_LINEAR_WEDGE:
    case VTK_BIQUADRATIC_QUADRATIC_WEDGE:
    case VTK_LAGRANGE_WEDGE:
    case VTK_BEZIER_WEDGE:
      return &Wedge();
    case VTK_PYRAMID:
    case VTK_QUADRATIC_PYRAMID:
    case VTK_TRIQUADRATIC_PYRAMID:
    case VTK_LAGRANGE_PYRAMID:
    case VTK_BEZIER_PYRAMID:
      return &Pyramid();
    case VTK_PENTAGONAL_PRISM:
      return &PentagonalPrism();
    case VTK_HEXAGONAL_PRISM:
      return &HexagonalPrism();
    default:
      return nullptr;
  }
}

/// Cell topology read once per cell while building (sequential): the
/// cell's points, its corner points and its faces (as corner lists).
class CellReader
{
public:
  explicit CellReader(vtkDataSet* ds)
    : Data(ds)
    , Grid(vtkUnstructuredGrid::SafeDownCast(ds))
  {
  }

  /// Read cell c: its points and corners and, unless `cornersOnly`, its
  /// faces. False if it is not a 3-D cell, or a 3-D cell without faces (then
  /// `unsupported` is set).
  bool Read(vtkIdType c, bool& unsupported, bool cornersOnly = false)
  {
    unsupported = false;
    const int type = this->Grid ? this->Grid->GetCellType(c) : this->Data->GetCellType(c);
    if (vtkCellTypes::GetDimension(static_cast<unsigned char>(type)) != 3)
    {
      return false;
    }
    if (this->Grid)
    {
      // The connectivity itself, without a vtkIdList per cell.
      vtkIdType n = 0;
      const vtkIdType* pts = nullptr;
      this->Grid->GetCellPoints(c, n, pts);
      this->Points.assign(pts, pts + n);
    }
    else
    {
      this->Data->GetCellPoints(c, this->Ids);
      this->Points.assign(this->Ids->GetPointer(0), this->Ids->GetPointer(0) + this->Ids->GetNumberOfIds());
    }
    const vtkIdType n = static_cast<vtkIdType>(this->Points.size());
    this->FaceOffsets.assign(1, 0);
    this->FacePoints.clear();
    if (type == VTK_POLYHEDRON && this->Grid)
    {
      vtkIdType nfaces = 0;
      const vtkIdType* stream = nullptr;
      this->Grid->GetFaceStream(c, nfaces, stream);
      if (!stream || nfaces <= 0)
      {
        unsupported = true;
        return false;
      }
      for (vtkIdType f = 0; f < nfaces; ++f)
      {
        const vtkIdType m = *stream++;
        this->FacePoints.insert(this->FacePoints.end(), stream, stream + m);
        stream += m;
        this->FaceOffsets.push_back(static_cast<vtkIdType>(this->FacePoints.size()));
      }
      this->Corners = this->Points; // every point of a polyhedron is a corner
      return true;
    }
    const FaceTable* table = TableOf(type);
    if (!table || n < table->NumCorners)
    {
      unsupported = true;
      return false;
    }
    this->Corners.assign(this->Points.begin(), this->Points.begin() + table->NumCorners);
    for (int f = 0; f < table->NumFaces && !cornersOnly; ++f)
    {
      for (int k = 0; k < table->Sizes[f]; ++k)
      {
        this->FacePoints.push_back(this->Points[table->Faces[f][k]]);
      }
      this->FaceOffsets.push_back(static_cast<vtkIdType>(this->FacePoints.size()));
    }
    return true;
  }

  std::vector<vtkIdType> Points;      ///< every point of the cell
  std::vector<vtkIdType> Corners;     ///< its corners
  std::vector<vtkIdType> FaceOffsets; ///< faces as corner lists
  std::vector<vtkIdType> FacePoints;

private:
  vtkDataSet* Data;
  vtkUnstructuredGrid* Grid;
  vtkNew<vtkIdList> Ids;
};

double Distance2(const double* a, const double* b)
{
  const double d[3] = { a[0] - b[0], a[1] - b[1], a[2] - b[2] };
  return d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
}

/**
 * The build proper, with cell indices of type L in the point-to-cell index
 * (32 bits when the cell count allows: half the memory of the index).
 */
template <typename L>
void BuildBlock(vtkDataSet* ds, WallAdjacency::Block& b)
{
  const vtkIdType numCells = ds->GetNumberOfCells();
  const vtkIdType numPoints = ds->GetNumberOfPoints();
  const unsigned char* ghosts = CellGhostMask(ds);
  CellReader reader(ds);

  // Point-to-cell index over the corners of every 3-D cell (owned or ghost).
  std::vector<vtkIdType> linkOffsets(static_cast<std::size_t>(numPoints) + 1, 0);
  std::vector<char> volumeCell(static_cast<std::size_t>(numCells), 0);
  for (vtkIdType c = 0; c < numCells; ++c)
  {
    bool unsupported = false;
    if (!reader.Read(c, unsupported, true))
    {
      b.NumUnsupported += unsupported ? 1 : 0;
      continue;
    }
    volumeCell[c] = 1;
    ++b.NumVolumeCells;
    b.NumOwnedVolumeCells += IsCountedCell(ghosts, c) ? 1 : 0;
    for (vtkIdType p : reader.Corners)
    {
      ++linkOffsets[p + 1];
    }
  }
  for (vtkIdType p = 0; p < numPoints; ++p)
  {
    linkOffsets[p + 1] += linkOffsets[p];
  }
  std::vector<L> links(static_cast<std::size_t>(linkOffsets[numPoints]));
  {
    std::vector<vtkIdType> fill(linkOffsets.begin(), linkOffsets.end() - 1);
    bool unsupported;
    for (vtkIdType c = 0; c < numCells; ++c)
    {
      if (volumeCell[c] && reader.Read(c, unsupported, true))
      {
        for (vtkIdType p : reader.Corners)
        {
          links[fill[p]++] = static_cast<L>(c); // ascending cell ids per point
        }
      }
    }
  }
  auto cellsOf = [&](vtkIdType p, const L*& first, const L*& last) {
    first = links.data() + linkOffsets[p];
    last = links.data() + linkOffsets[p + 1];
  };

  // Points as doubles, once (any point type, any dataset kind).
  std::vector<double> xyz(3 * static_cast<std::size_t>(numPoints));
  const PointView view = MakePointView(ds);
  for (vtkIdType p = 0; p < numPoints; ++p)
  {
    if (!view.Data)
    {
      ds->GetPoint(p, &xyz[3 * p]); // implicit points (image, rectilinear)
      continue;
    }
    for (int k = 0; k < 3; ++k)
    {
      xyz[3 * p + k] = view.IsFloat ? static_cast<const float*>(view.Data)[3 * p + k]
                                    : static_cast<const double*>(view.Data)[3 * p + k];
    }
  }
  auto centreOf = [&](const std::vector<vtkIdType>& pts, double x[3]) {
    x[0] = x[1] = x[2] = 0;
    for (vtkIdType p : pts)
    {
      for (int k = 0; k < 3; ++k)
      {
        x[k] += xyz[3 * p + k];
      }
    }
    for (int k = 0; k < 3; ++k)
    {
      x[k] /= static_cast<double>(pts.size());
    }
  };

  std::unordered_map<vtkIdType, int> sampleOf;
  auto sampleIndex = [&](vtkIdType cell) -> int {
    auto it = sampleOf.find(cell);
    if (it != sampleOf.end())
    {
      return it->second;
    }
    bool unsupported;
    reader.Read(cell, unsupported, true);
    const int s = static_cast<int>(b.SampleCell.size());
    b.SampleCell.push_back(cell);
    double x[3];
    centreOf(reader.Points, x);
    b.SampleCentre.insert(b.SampleCentre.end(), x, x + 3);
    b.SamplePoints.insert(b.SamplePoints.end(), reader.Points.begin(), reader.Points.end());
    b.SamplePointOffsets.push_back(static_cast<vtkIdType>(b.SamplePoints.size()));
    sampleOf.emplace(cell, s);
    return s;
  };

  b.FaceOffsets.assign(1, 0);
  b.SamplePointOffsets.assign(1, 0);
  b.StencilOffsets.assign(1, 0);
  std::vector<vtkIdType> faceNeighbours, others, face, localIds;
  std::vector<double> faceXyz;
  for (vtkIdType c = 0; c < numCells; ++c)
  {
    bool unsupported;
    if (!volumeCell[c] || !IsCountedCell(ghosts, c) || !reader.Read(c, unsupported))
    {
      continue;
    }
    faceNeighbours.clear();
    const vtkIdType firstFace = static_cast<vtkIdType>(b.FaceWallCell.size());
    double centre[3];
    centreOf(reader.Points, centre);
    const std::size_t nf = reader.FaceOffsets.size() - 1;
    for (std::size_t f = 0; f < nf; ++f)
    {
      face.assign(reader.FacePoints.begin() + reader.FaceOffsets[f],
        reader.FacePoints.begin() + reader.FaceOffsets[f + 1]);
      if (face.size() < 3)
      {
        continue;
      }
      // The other 3-D cell with every corner of this face, from the corner
      // with the fewest cells.
      std::size_t least = 0;
      for (std::size_t k = 1; k < face.size(); ++k)
      {
        if (linkOffsets[face[k] + 1] - linkOffsets[face[k]] <
          linkOffsets[face[least] + 1] - linkOffsets[face[least]])
        {
          least = k;
        }
      }
      const L* first;
      const L* last;
      cellsOf(face[least], first, last);
      vtkIdType neighbour = -1;
      for (const L* q = first; q != last && neighbour < 0; ++q)
      {
        const vtkIdType cand = static_cast<vtkIdType>(*q);
        if (cand == c)
        {
          continue;
        }
        bool all = true;
        for (std::size_t k = 0; k < face.size() && all; ++k)
        {
          const L* f0;
          const L* f1;
          cellsOf(face[k], f0, f1);
          all = std::binary_search(f0, f1, static_cast<L>(cand));
        }
        neighbour = all ? cand : -1;
      }
      if (neighbour >= 0)
      {
        faceNeighbours.push_back(neighbour);
        continue;
      }
      // A boundary face of an owned cell: corners out of the cell.
      faceXyz.resize(3 * face.size());
      localIds.resize(face.size());
      for (std::size_t k = 0; k < face.size(); ++k)
      {
        std::copy(&xyz[3 * face[k]], &xyz[3 * face[k]] + 3, &faceXyz[3 * k]);
        localIds[k] = static_cast<vtkIdType>(k);
      }
      FaceFrame<double> frame;
      double centroid[3];
      if (ComputeFaceFrame<double>(faceXyz.data(), localIds.data(), static_cast<int>(face.size()),
            frame) == FaceStatus::Ok)
      {
        std::copy(frame.Centroid, frame.Centroid + 3, centroid);
        const double out[3] = { centroid[0] - centre[0], centroid[1] - centre[1],
          centroid[2] - centre[2] };
        if (Dot(out, frame.Normal) < 0)
        {
          std::reverse(face.begin(), face.end());
        }
      }
      else
      {
        // Degenerate face: kept (the wall face carries NaN), centroid as vertex mean.
        centreOf(face, centroid);
      }
      b.FaceCorners.insert(b.FaceCorners.end(), face.begin(), face.end());
      b.FaceOffsets.push_back(static_cast<vtkIdType>(b.FaceCorners.size()));
      b.FaceCentroid.insert(b.FaceCentroid.end(), centroid, centroid + 3);
      b.FaceWallCell.push_back(static_cast<int>(b.WallCellId.size()));
    }
    if (static_cast<vtkIdType>(b.FaceWallCell.size()) == firstFace)
    {
      continue; // not a wall cell
    }
    // A wall cell: its neighbours through corners, face neighbours first.
    std::sort(faceNeighbours.begin(), faceNeighbours.end());
    faceNeighbours.erase(
      std::unique(faceNeighbours.begin(), faceNeighbours.end()), faceNeighbours.end());
    others.clear();
    for (vtkIdType p : reader.Corners)
    {
      const L* first;
      const L* last;
      cellsOf(p, first, last);
      for (const L* q = first; q != last; ++q)
      {
        const vtkIdType cand = static_cast<vtkIdType>(*q);
        if (cand != c && !std::binary_search(faceNeighbours.begin(), faceNeighbours.end(), cand))
        {
          others.push_back(cand);
        }
      }
    }
    std::sort(others.begin(), others.end());
    others.erase(std::unique(others.begin(), others.end()), others.end());
    const int self = sampleIndex(c);
    std::vector<int> stencil;
    for (vtkIdType q : faceNeighbours)
    {
      stencil.push_back(sampleIndex(q));
    }
    std::vector<std::pair<double, int>> byDistance;
    for (vtkIdType q : others)
    {
      const int s = sampleIndex(q);
      byDistance.emplace_back(Distance2(&b.SampleCentre[3 * s], centre), s);
    }
    const std::size_t room = stencil.size() < static_cast<std::size_t>(WallAdjacency::MaxStencil)
      ? WallAdjacency::MaxStencil - stencil.size()
      : 0;
    if (byDistance.size() > room)
    {
      // Keep the nearest, and every neighbour as near as the last one kept
      // (up to rounding), so that the choice never splits cells at the same
      // distance: a mirror-symmetric mesh keeps mirror-symmetric stencils.
      std::sort(byDistance.begin(), byDistance.end());
      std::size_t keep = room;
      const double cut = room > 0 ? byDistance[room - 1].first : 0.0;
      while (keep < byDistance.size() && keep < room + WallAdjacency::TieRoom &&
        byDistance[keep].first <= cut * (1 + 1e-9))
      {
        ++keep;
      }
      if (keep == room + WallAdjacency::TieRoom)
      {
        // Too many ties: drop the whole tied group instead.
        while (keep > 0 && byDistance[keep - 1].first >= cut * (1 - 1e-9))
        {
          --keep;
        }
      }
      byDistance.resize(keep);
    }
    for (const auto& e : byDistance)
    {
      stencil.push_back(e.second);
    }
    b.WallCellId.push_back(c);
    b.WallCellSample.push_back(self);
    b.FaceNeighbours.push_back(static_cast<int>(faceNeighbours.size()));
    b.Stencil.insert(b.Stencil.end(), stencil.begin(), stencil.end());
    b.StencilOffsets.push_back(static_cast<int>(b.Stencil.size()));
  }

  // Centroid index: buckets about one face across.
  double meanSize = 0;
  const vtkIdType nfaces = b.NumberOfFaces();
  for (vtkIdType f = 0; f < nfaces; ++f)
  {
    const vtkIdType p0 = b.FaceCorners[b.FaceOffsets[f]];
    meanSize += std::sqrt(Distance2(&xyz[3 * p0], &b.FaceCentroid[3 * f]));
  }
  meanSize = nfaces > 0 ? 2.0 * meanSize / static_cast<double>(nfaces) : 1.0;
  b.Index.Build(b.FaceCentroid, meanSize);

  // The boundary as polydata on compact points (the output without Walls).
  std::vector<vtkIdType> compact(static_cast<std::size_t>(numPoints), -1);
  b.SurfacePointIds.clear();
  auto polys = vtkSmartPointer<vtkCellArray>::New();
  polys->AllocateExact(nfaces, static_cast<vtkIdType>(b.FaceCorners.size()));
  std::vector<vtkIdType> ids;
  for (vtkIdType f = 0; f < nfaces; ++f)
  {
    ids.clear();
    for (vtkIdType k = b.FaceOffsets[f]; k < b.FaceOffsets[f + 1]; ++k)
    {
      const vtkIdType p = b.FaceCorners[k];
      if (compact[p] < 0)
      {
        compact[p] = static_cast<vtkIdType>(b.SurfacePointIds.size());
        b.SurfacePointIds.push_back(p);
      }
      ids.push_back(compact[p]);
    }
    polys->InsertNextCell(static_cast<vtkIdType>(ids.size()), ids.data());
  }
  auto points = vtkSmartPointer<vtkPoints>::New();
  points->SetDataTypeToDouble();
  points->SetNumberOfPoints(static_cast<vtkIdType>(b.SurfacePointIds.size()));
  for (std::size_t i = 0; i < b.SurfacePointIds.size(); ++i)
  {
    points->SetPoint(static_cast<vtkIdType>(i), &xyz[3 * b.SurfacePointIds[i]]);
  }
  b.Surface = vtkSmartPointer<vtkPolyData>::New();
  b.Surface->SetPoints(points);
  b.Surface->SetPolys(polys);
}
} // namespace

//------------------------------------------------------------------------------
void CentroidIndex::Build(const std::vector<double>& xyz, double cellSize)
{
  const std::size_t n = xyz.size() / 3;
  double lo[3] = { 0, 0, 0 }, hi[3] = { 0, 0, 0 };
  bool any = false;
  for (std::size_t i = 0; i < n; ++i)
  {
    if (!AllFinite(&xyz[3 * i], 3))
    {
      continue;
    }
    for (int k = 0; k < 3; ++k)
    {
      lo[k] = any ? std::min(lo[k], xyz[3 * i + k]) : xyz[3 * i + k];
      hi[k] = any ? std::max(hi[k], xyz[3 * i + k]) : xyz[3 * i + k];
    }
    any = true;
  }
  // Buckets about a face across, at most about 2 per face in all.
  double size = cellSize > 0 && std::isfinite(cellSize) ? cellSize : 1.0;
  const double budget = 2.0 * static_cast<double>(std::max<std::size_t>(n, 1));
  for (;;)
  {
    double total = 1;
    for (int k = 0; k < 3; ++k)
    {
      total *= std::floor((hi[k] - lo[k]) / size) + 1;
    }
    if (total <= budget)
    {
      break;
    }
    size *= 1.5;
  }
  this->Size = size;
  for (int k = 0; k < 3; ++k)
  {
    this->Origin[k] = lo[k];
    this->Dims[k] = static_cast<int>(std::floor((hi[k] - lo[k]) / size)) + 1;
  }
  const std::size_t buckets =
    static_cast<std::size_t>(this->Dims[0]) * this->Dims[1] * this->Dims[2];
  this->Offsets.assign(buckets + 1, 0);
  std::vector<std::size_t> bucketOf(n, buckets);
  for (std::size_t i = 0; i < n; ++i)
  {
    if (!AllFinite(&xyz[3 * i], 3))
    {
      continue;
    }
    std::size_t b = 0;
    for (int k = 2; k >= 0; --k)
    {
      int j = static_cast<int>(std::floor((xyz[3 * i + k] - lo[k]) / size));
      j = std::min(std::max(j, 0), this->Dims[k] - 1);
      b = b * this->Dims[k] + j;
    }
    bucketOf[i] = b;
    ++this->Offsets[b + 1];
  }
  for (std::size_t b = 0; b < buckets; ++b)
  {
    this->Offsets[b + 1] += this->Offsets[b];
  }
  this->Ids.assign(static_cast<std::size_t>(this->Offsets[buckets]), 0);
  std::vector<vtkIdType> fill(this->Offsets.begin(), this->Offsets.end() - 1);
  for (std::size_t i = 0; i < n; ++i)
  {
    if (bucketOf[i] < buckets)
    {
      this->Ids[fill[bucketOf[i]]++] = static_cast<vtkIdType>(i);
    }
  }
}

void CentroidIndex::Within(const std::vector<double>& p, const double x[3], double radius,
  std::vector<vtkIdType>& out) const
{
  if (this->Offsets.size() < 2 || !AllFinite(x, 3))
  {
    return;
  }
  int lo[3], hi[3];
  for (int k = 0; k < 3; ++k)
  {
    const double a = std::floor((x[k] - radius - this->Origin[k]) / this->Size);
    const double b = std::floor((x[k] + radius - this->Origin[k]) / this->Size);
    if (b < 0 || a > this->Dims[k] - 1)
    {
      return;
    }
    lo[k] = static_cast<int>(std::max(a, 0.0));
    hi[k] = static_cast<int>(std::min(b, double(this->Dims[k] - 1)));
  }
  const double r2 = radius * radius;
  for (int k = lo[2]; k <= hi[2]; ++k)
  {
    for (int j = lo[1]; j <= hi[1]; ++j)
    {
      for (int i = lo[0]; i <= hi[0]; ++i)
      {
        const std::size_t b =
          (static_cast<std::size_t>(k) * this->Dims[1] + j) * this->Dims[0] + i;
        for (vtkIdType e = this->Offsets[b]; e < this->Offsets[b + 1]; ++e)
        {
          const vtkIdType id = this->Ids[e];
          if (Distance2(&p[3 * id], x) <= r2)
          {
            out.push_back(id);
          }
        }
      }
    }
  }
}

//------------------------------------------------------------------------------
void WallAdjacency::Block::Build(vtkDataSet* ds)
{
  static std::atomic<std::uint64_t> builds{ 0 };
  this->BuildId = ++builds;
  this->Key = MeshKey::Of(ds);
  this->Key.StoreContentHash();
  if (ds->GetNumberOfCells() < static_cast<vtkIdType>(std::numeric_limits<std::uint32_t>::max()))
  {
    BuildBlock<std::uint32_t>(ds, *this);
  }
  else
  {
    BuildBlock<vtkIdType>(ds, *this);
  }
}

int WallAdjacency::Update(const std::vector<vtkDataSet*>& volumes)
{
  int built = 0;
  std::vector<Block> kept;
  kept.reserve(volumes.size());
  std::vector<bool> used(this->Blocks.size(), false);
  for (vtkDataSet* ds : volumes)
  {
    const MeshKey key = MeshKey::Of(ds);
    bool found = false;
    for (std::size_t i = 0; i < this->Blocks.size() && !found; ++i)
    {
      if (!used[i] && key.SameAs(this->Blocks[i].Key))
      {
        kept.push_back(std::move(this->Blocks[i]));
        // Hold this step's objects (not the last step's: they may be large
        // and are otherwise freed), with the hash of their content.
        key.StoreContentHash();
        kept.back().Key = key;
        used[i] = true;
        found = true;
      }
    }
    if (!found)
    {
      kept.emplace_back();
      kept.back().Build(ds);
      ++built;
    }
  }
  this->Blocks = std::move(kept);
  return built;
}

void WallAdjacency::FindFaces(const double c[3], double tol,
  std::vector<std::pair<int, vtkIdType>>& out, std::vector<vtkIdType>& scratch) const
{
  for (std::size_t v = 0; v < this->Blocks.size(); ++v)
  {
    scratch.clear();
    this->Blocks[v].Index.Within(this->Blocks[v].FaceCentroid, c, tol, scratch);
    for (vtkIdType f : scratch)
    {
      out.emplace_back(static_cast<int>(v), f);
    }
  }
}

} // namespace wallloads
