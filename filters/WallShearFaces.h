// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * The per-face loop of Shear Projection: for every face of one wall dataset,
 * match it to its adjacent volume cell (WallAdjacency), read the velocity and
 * properties there and reconstruct the wall shear stress with the chosen
 * method (kernels), writing the output arrays. Runs under vtkSMPTools with
 * thread-local scratch and counters; reads plain arrays only (no VTK cell API,
 * no allocation per face once the scratch has grown), so the result of a face
 * does not depend on the backend or the thread count. Private to the module.
 */
#include "WallAdjacency.h"
#include "WallLoadsPipeline.h"

#include <cstdint>
#include <string>
#include <vector>

class vtkDataSet;

namespace wallloads
{

/// The filter's properties for one execution.
struct ShearSettings
{
  ArraySelection Velocity, WallVelocity, Gradient, Viscosity, TurbulentViscosity, Density;
  int Method = 0; ///< vtkShearProjection::Methods
  double ViscosityValue = 1.8e-5;
  bool Kinematic = false;
  double DensityValue = 1;
  double Kappa = 0.41, B = 5.0;
};

/// A volume block with its arrays and its adjacency.
struct VolumeBlock
{
  vtkDataSet* Data = nullptr;
  std::string Name;
  const WallAdjacency::Block* Adjacency = nullptr;
  double Rounding = 0; ///< absolute rounding of its coordinates
  ArrayView Velocity, Gradient, Viscosity, TurbulentViscosity, Density;
};

/// Faces by outcome (doubles, for one reduction over ranks).
struct ShearCounts
{
  enum
  {
    Faces,
    Unmatched,
    NotFaces,
    Degenerate,
    Interfaces,
    OffWall,
    Failed,
    BadDensity,
    Planar,
    FitTooFewSamples,
    FitIllConditioned,
    FitNoSecondDistance,
    NotComputed,
    Size
  };
  double N[Size] = {};
  void Add(const ShearCounts& o)
  {
    for (int i = 0; i < Size; ++i)
    {
      this->N[i] += o.N[i];
    }
  }
};

/**
 * What the face loop keeps from one execution to the next for one wall
 * dataset, while the wall geometry and the volume adjacency are unchanged (a
 * time-step loop): each face's match and geometry and, for the wall fit, its
 * weights (WallFit.h: the fit is linear in the velocities, so re-executing
 * costs one weighted sum per face).
 */
struct WallFaceCache
{
  MeshKey Key;                       ///< the wall dataset's geometry
  std::vector<std::uint64_t> Builds; ///< the adjacency blocks it was matched against
  int BoundaryOf = -2;
  bool HasWeights = false;
  std::vector<int> Block;        ///< matched volume block, or an Outcome below 0
  std::vector<vtkIdType> Face;   ///< matched boundary face
  std::vector<double> Geometry;  ///< 7 per face: x_f, n (into the fluid), d
  std::vector<vtkIdType> WeightOffsets; ///< CSR into Weights / 3
  std::vector<double> Weights;   ///< 3 per sample: adjacent cell, its stencil, then the corners
  /// Fit dimension, or -1 too few samples, -2 ill-conditioned, -3 bad input,
  /// -4 no second distance from the wall.
  std::vector<signed char> Fit;

  enum Outcome
  {
    Unmatched = -1,
    NotFace = -2,
    Degenerate = -3,
    Interface = -4,
    OffWall = -5
  };
};

/**
 * Bring the cache of `wall` up to date: match its faces to the volume
 * (`boundaryOf` >= 0 when `wall` is the boundary of that volume block, face f
 * its boundary face f; -1 to match by centroid) and, for the wall fit, compute
 * the weights. Does nothing while the wall geometry and the adjacency are
 * unchanged.
 */
void PrepareWallFaces(const ShearSettings& settings, const std::vector<VolumeBlock>& volume,
  const WallAdjacency& adjacency, vtkDataSet* wall, int boundaryOf, WallFaceCache& cache);

/**
 * Compute faces [begin, end) of `wall` (polydata or unstructured grid of
 * faces) into its output arrays (created by the caller: Wall Shear Stress,
 * Wall Normal, Wall Distance, Friction Velocity, y+, Near-Wall Regime), from
 * its prepared cache. `wallVelocity` is the validated wall velocity view (or
 * invalid).
 */
void ComputeWallFaces(const ShearSettings& settings, const std::vector<VolumeBlock>& volume,
  vtkDataSet* wall, const ArrayView& wallVelocity, const WallFaceCache& cache, vtkIdType begin,
  vtkIdType end, ShearCounts& counts);

/// Faces [begin, end) of `wall` not computed (an aborted execution): NaN.
void MarkWallFacesNotComputed(vtkDataSet* wall, vtkIdType begin, vtkIdType end);

} // namespace wallloads
