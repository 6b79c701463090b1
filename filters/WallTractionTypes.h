// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * What Wall Traction's face loop (WallTractionFaces.h) reads and writes in
 * one execution: the settings read from the properties, a leaf's input
 * views and output pointers, the per-thread and per-rank tallies, the cache
 * it keeps between executions, and whether its outputs are written past the
 * caches (StreamOutputs).
 */
#include "WallLoadsMeshCache.h"
#include "WallLoadsPipeline.h"
#include "wallloads/CompensatedSum.h"
#include "wallloads/EdgeBalance.h"
#include "wallloads/Lanes.h"
#include "wallloads/LoadTotals.h"

#include <cstdint>

namespace wallloads
{
namespace traction
{

/// Everything one execution needs, read from the properties once.
struct Settings
{
  ArraySelection Pressure, DensityArray, ShearStressArray, VelocityGradient, ViscosityArray,
    TurbulentViscosity;
  bool PressurePerUnitDensity = false;
  bool ShearPerUnitDensity = false;
  bool Kinematic = false;
  int ShearSource = 0;
  int Orientation = 0;
  bool IncludeNormal = false;
  bool CheckOrientation = true;
  bool AllArrays = true;
  double ReferencePressure = 0;
  double Density = 1;
  double Viscosity = 0;
  double LoadDirection[3] = { 1, 0, 0 };
  double DynamicPressure = 0; ///< 0: no coefficients
};

/// Local (this rank) results of one execution.
struct Tally
{
  CompensatedSum<double> WettedArea;
  double NonSurface = 0, Degenerate = 0, NonFinite = 0, Inconsistent = 0, OpenEdges = 0;
  double Faces = 0;
};

/// Output arrays of one leaf, as raw pointers for the face loop.
struct Outputs
{
  /// Orientation check: 0 invalid geometry, 1 valid, 2 valid and flipped
  /// against the stored order by the Wall Normal array.
  std::uint8_t* FaceOk = nullptr;
  double* Area = nullptr;   // always made
  double* ForceP = nullptr; // always made
  double* ForceV = nullptr; // always made
  double *Normal = nullptr, *TractionP = nullptr, *TractionV = nullptr, *Traction = nullptr,
         *Force = nullptr, *NormalV = nullptr, *Directional = nullptr; // with all arrays
  double* Cp = nullptr;
  double* Cf = nullptr;
  bool Full = true; ///< false: only Face Area, Pressure Force and Viscous Force
  /// The eight-face loop stores past the caches (StreamOutputs).
  bool Stream = false;
};

/**
 * Whether the eight-face loop writes its outputs with streaming stores
 * (Lanes.h, StreamVector), decided where the output arrays are made
 * (MakeOutputs in vtkWallTraction.cxx): when every output array is 64-byte
 * aligned (the OutputArrayPool allocates them so) and together they take at
 * least StreamBytes. The threshold is the last-level cache of the machines
 * measured (32 MiB): what the loop writes beyond it has left the cache
 * before any consumer reads it, so keeping it there only costs the read of
 * every line before it is written; below it, a consumer may still find the
 * outputs in cache, and plain stores keep them there.
 */
constexpr double StreamBytes = 32.0 * 1024 * 1024;
inline bool StreamOutputs(double bytes, bool aligned)
{
  return aligned && bytes >= StreamBytes;
}

/// Whether a W-lane loop streams these outputs (only the eight-lane one does).
template <int W>
constexpr bool Streaming(const Outputs& out)
{
  return W == 8 && out.Stream;
}

/// Inputs of one leaf.
struct Inputs
{
  ArrayView Pressure, Density, Shear, Gradient, Viscosity, TurbulentViscosity, WallNormal;
  PointView Points;
  const unsigned char* Ghosts = nullptr;
};

#if WALLLOADS_LANES
/**
 * The cell arrays the four- and eight-face runs read, each by its first byte
 * and its bytes per face, so that the loop can ask for a run's lines before
 * it reads them (PrefetchBytes, Lanes.h). Point data and the connectivity
 * are left to the hardware: they are read through the connectivity, in the
 * order of the points, or are narrow.
 */
struct FaceStreams
{
  static constexpr int Max = 5; ///< pressure, density, shear or gradient, two viscosities
  const char* First[Max] = {};
  std::uintptr_t BytesPerFace[Max] = {};
  int Count = 0;

  /// The arrays a run reads, with the shear stress array or the gradient.
  FaceStreams(const Inputs& in, bool shearStress)
  {
    this->Add(in.Pressure);
    this->Add(in.Density);
    this->Add(shearStress ? in.Shear : in.Gradient);
    if (!shearStress)
    {
      this->Add(in.Viscosity);
      this->Add(in.TurbulentViscosity);
    }
  }
  void Add(const ArrayView& v)
  {
    if (v.Valid() && !v.OnPoints && this->Count < Max)
    {
      this->First[this->Count] = static_cast<const char*>(v.Data);
      this->BytesPerFace[this->Count] =
        static_cast<std::uintptr_t>(v.NumComponents) * (v.IsFloat ? sizeof(float) : sizeof(double));
      ++this->Count;
    }
  }
  /// Asks for faces [c, c + n) of every array (all within the arrays).
  WALLLOADS_FACE_INLINE void Prefetch(vtkIdType c, int n) const
  {
    for (int k = 0; k < this->Count; ++k)
    {
      PrefetchBytes(this->First[k] + this->BytesPerFace[k] * static_cast<std::uintptr_t>(c),
        this->BytesPerFace[k] * static_cast<std::uintptr_t>(n));
    }
  }
};

/// How far ahead of the run it computes the loop asks for its inputs: four
/// eight-face runs, about half a microsecond of work on one thread, a few
/// times a memory access's latency (measured: 16, 32 and 64 gained alike).
constexpr vtkIdType PrefetchAhead = 32;
#endif

struct ThreadTally
{
  CompensatedSum<double> Area;
  vtkIdType NonSurface = 0, Degenerate = 0, NonFinite = 0, Faces = 0;
  EdgeBalance Balance; ///< orientation certificate, when the check runs
  /// Load Integration's sums of these faces (moments about the origin),
  /// handed over with the output (WallLoadsMeshCache.h).
  LoadSums<double> Loads;
};

/// What the filter keeps between executions (WallLoadsMeshCache.h).
struct LeafCache
{
  MeshResultCache* Results = nullptr;
  OutputArrayPool* Pool = nullptr;
  ValidatedCells* Cells = nullptr; ///< offsets found well formed before
  std::size_t Slot = 0; ///< leaf ordinal
};

} // namespace traction
} // namespace wallloads
