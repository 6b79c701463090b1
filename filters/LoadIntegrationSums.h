// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Load Integration's face loop (private to vtkLoadIntegration.cxx), for
 * inputs whose sums Wall Traction did not hand over: per-face centroid
 * (unrolled for triangles and quadrilaterals), moment arm and the sixteen
 * compensated sums of LoadTotals.h, threaded with vtkSMPTools. Wall
 * Traction's double cell arrays are read directly, a leaf's single region
 * summed in separate arrays (in the AVX2 clone, runs of four like faces on
 * Lanes4, Lanes.h); other inputs (float arrays, a region array) go through
 * the typed views.
 */
#include "WallLoadsPipeline.h"
#include "wallloads/CompensatedSum.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/LoadTotals.h"

#include "vtkDataSet.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"

#include <cmath>
#include <vector>

namespace wallloads
{
namespace integration
{
using Sums = LoadSums<double>;

struct LeafInputs
{
  ArrayView ForceP, ForceV, Area, Region;
  vtkDataArray *ForcePArray = nullptr, *ForceVArray = nullptr, *AreaArray = nullptr;
  bool Handed = false;  ///< HandedSums came from Wall Traction (WallLoadsMeshCache.h)
  LoadSums<double> HandedSums;
  PointView Points;
  const unsigned char* Ghosts = nullptr;
  int FixedRegion = 0;  ///< region of the leaf when no region array is used
  long long RegionBase = 0; ///< smallest region-array value (global)
};

/// Two doubles added lane by lane (SSE2 on x86-64): the same IEEE
/// operations as two scalar ones, so the same values.
#if defined(__GNUC__) || defined(__clang__)
typedef double Lane2 __attribute__((vector_size(16)));
inline Lane2 MakeLane(double a, double b)
{
  return Lane2{ a, b };
}
#else
struct Lane2
{
  double V[2];
  double operator[](int i) const { return this->V[i]; }
  double& operator[](int i) { return this->V[i]; }
};
inline Lane2 operator+(Lane2 a, Lane2 b)
{
  return Lane2{ { a.V[0] + b.V[0], a.V[1] + b.V[1] } };
}
inline Lane2 operator-(Lane2 a, Lane2 b)
{
  return Lane2{ { a.V[0] - b.V[0], a.V[1] - b.V[1] } };
}
inline Lane2& operator+=(Lane2& a, Lane2 b)
{
  a = a + b;
  return a;
}
inline Lane2 MakeLane(double a, double b)
{
  return Lane2{ { a, b } };
}
#endif

/// The running sums of one region in pairs of slots (slot 2k and 2k+1 in
/// lane k), so that the sixteen compensated additions of a face run as eight
/// two-wide ones. The same operations as CompensatedSum::Add, slot by slot:
/// the same values.
struct SlotSums
{
  static constexpr std::size_t Lanes = NumLoadSlots / 2;
  Lane2 S[Lanes];
  Lane2 C[Lanes];

  void Load(const Sums& from)
  {
    for (std::size_t k = 0; k < Lanes; ++k)
    {
      this->S[k] = MakeLane(from.Sums.Terms[2 * k].Sum, from.Sums.Terms[2 * k + 1].Sum);
      this->C[k] = MakeLane(from.Sums.Terms[2 * k].Carry, from.Sums.Terms[2 * k + 1].Carry);
    }
  }
  void Store(Sums& to) const
  {
    for (std::size_t k = 0; k < Lanes; ++k)
    {
      for (int j = 0; j < 2; ++j)
      {
        to.Sums.Terms[2 * k + j].Sum = this->S[k][j];
        to.Sums.Terms[2 * k + j].Carry = this->C[k][j];
      }
    }
  }
  /// v holds the slot values in pairs; its SkippedCountSlot value must be 0
  /// (adding +0 to a count leaves it as it is).
  void AddAll(const Lane2 v[Lanes])
  {
    for (std::size_t k = 0; k < Lanes; ++k)
    {
      const Lane2 t = this->S[k] + v[k];
      const Lane2 w = t - this->S[k];
      this->C[k] += (this->S[k] - (t - w)) + (v[k] - w);
      this->S[k] = t;
    }
  }
  /// One skipped face: the count alone.
  void AddSkipped()
  {
    constexpr std::size_t k = SkippedCountSlot / 2;
    constexpr int j = SkippedCountSlot % 2;
    CompensatedSum<double> skipped{ this->S[k][j], this->C[k][j] };
    skipped.Add(1.0);
    this->S[k][j] = skipped.Sum;
    this->C[k][j] = skipped.Carry;
  }
};
static_assert(NumLoadSlots == 16 && AreaSlot == 0 && PressureForceSlot == 1 &&
    ViscousForceSlot == 4 && PressureMomentSlot == 7 && ViscousMomentSlot == 10 &&
    FaceCountSlot == 13 && SkippedCountSlot == 14 && ForceMagnitudeSlot == 15,
  "FaceSlots pairs the slots in this order");

/// The slot values LoadSums::AddFace adds for one face (the same
/// operations), in pairs of slots.
inline void FaceSlots(double area, const double centroid[3], const double r0[3],
  const double fp[3], const double fv[3], Lane2 v[SlotSums::Lanes])
{
  const double arm[3] = { centroid[0] - r0[0], centroid[1] - r0[1], centroid[2] - r0[2] };
  double mp[3];
  double mv[3];
  Cross(arm, fp, mp);
  Cross(arm, fv, mv);
  const double f[3] = { fp[0] + fv[0], fp[1] + fv[1], fp[2] + fv[2] };
  v[0] = MakeLane(area, fp[0]);
  v[1] = MakeLane(fp[1], fp[2]);
  v[2] = MakeLane(fv[0], fv[1]);
  v[3] = MakeLane(fv[2], mp[0]);
  v[4] = MakeLane(mp[1], mp[2]);
  v[5] = MakeLane(mv[0], mv[1]);
  v[6] = MakeLane(mv[2], 1.0);
  v[7] = MakeLane(0.0, Norm(f));
}

template <typename I, typename P>
struct SumLoop
{
  const LeafInputs& In;
  const FaceTopology<I>& Topo;
  const double* R0;
  std::size_t NumRegions;
  vtkSMPThreadLocal<std::vector<Sums>> Local;

  SumLoop(const LeafInputs& in, const FaceTopology<I>& topo, const double* r0, std::size_t n)
    : In(in)
    , Topo(topo)
    , R0(r0)
    , NumRegions(n)
  {
  }

  void Initialize() { this->Local.Local().assign(this->NumRegions, Sums()); }

  void operator()(vtkIdType begin, vtkIdType end)
  {
    // Double cell arrays (Wall Traction's) are read directly, one region
    // per leaf summed in separate arrays; anything else by the views.
    const bool direct = !In.Region.Valid() && !In.ForceP.IsFloat && !In.ForceV.IsFloat &&
      !In.Area.IsFloat && !In.ForceP.OnPoints && !In.ForceV.OnPoints && !In.Area.OnPoints;
    if (direct)
    {
      this->Direct(begin, end);
      return;
    }
    std::vector<Sums>& sums = this->Local.Local();
    const P* points = static_cast<const P*>(In.Points.Data);
    for (vtkIdType c = begin; c < end; ++c)
    {
      if (!IsCountedCell(In.Ghosts, c))
      {
        continue;
      }
      std::size_t region = static_cast<std::size_t>(In.FixedRegion);
      if (In.Region.Valid())
      {
        region = static_cast<std::size_t>(std::llround(In.Region.Get(c, 0)) - In.RegionBase);
      }
      I buffer[4];
      const I* ids = nullptr;
      const int n = Topo.Corners(c, ids, buffer);
      if (n == 0)
      {
        continue; // not a face (vertex, line, 3D cell): Wall Traction counted it
      }
      Sums& s = sums[region];
      const double fp[3] = { In.ForceP.Get(c, 0), In.ForceP.Get(c, 1), In.ForceP.Get(c, 2) };
      const double fv[3] = { In.ForceV.Get(c, 0), In.ForceV.Get(c, 1), In.ForceV.Get(c, 2) };
      const double area = In.Area.Get(c, 0);
      if (!AllFinite(fp, 3) || !AllFinite(fv, 3) || !std::isfinite(area))
      {
        s.AddSkipped();
        continue;
      }
      FaceFrame<double> frame;
      if (ComputeFaceFrameFast<double>(points, ids, n, frame) != FaceStatus::Ok)
      {
        s.AddSkipped();
        continue;
      }
      s.AddFace(area, frame.Centroid, this->R0, fp, fv);
    }
  }

  void Direct(vtkIdType begin, vtkIdType end)
  {
#if WALLLOADS_AVX2_CLONE
    if (UseAvx2Loops())
    {
      this->DirectAvx2(begin, end);
      return;
    }
#endif
    this->DirectFaces<false>(begin, end);
  }

#if WALLLOADS_AVX2_CLONE
  /// The same loop compiled for AVX2, taking four faces at a time where it
  /// can (Lanes.h).
  WALLLOADS_TARGET_AVX2 void DirectAvx2(vtkIdType begin, vtkIdType end)
  {
    this->DirectFaces<WALLLOADS_LANES != 0>(begin, end);
  }
#endif

  template <bool UseLanes>
  WALLLOADS_FACE_INLINE void DirectFaces(vtkIdType begin, vtkIdType end)
  {
    Sums& sums = this->Local.Local()[static_cast<std::size_t>(In.FixedRegion)];
    SlotSums acc;
    acc.Load(sums);
    const P* points = static_cast<const P*>(In.Points.Data);
    const double* forceP = static_cast<const double*>(In.ForceP.Data);
    const double* forceV = static_cast<const double*>(In.ForceV.Data);
    const double* areas = static_cast<const double*>(In.Area.Data);
    const unsigned char* ghosts = In.Ghosts;
    const FaceTopology<I> topo = this->Topo;
    // One face by the scalar kernels, summed in face order.
    auto oneFace = [&](vtkIdType c) {
      if (!IsCountedCell(ghosts, c))
      {
        return;
      }
      I buffer[4];
      const I* ids = nullptr;
      const int n = topo.Corners(c, ids, buffer);
      if (n == 0)
      {
        return;
      }
      const double* fp = forceP + 3 * c;
      const double* fv = forceV + 3 * c;
      const double area = areas[c];
      FaceFrame<double> frame;
      if (!AllFinite(fp, 3) || !AllFinite(fv, 3) || !std::isfinite(area) ||
        ComputeFaceFrameFast<double>(points, ids, n, frame) != FaceStatus::Ok)
      {
        acc.AddSkipped();
        return;
      }
      Lane2 v[SlotSums::Lanes];
      FaceSlots(area, frame.Centroid, this->R0, fp, fv, v);
      acc.AddAll(v);
    };
#if WALLLOADS_LANES
    if constexpr (UseLanes)
    {
      // Faces c + j are summed in lane j (a split of the faces like the
      // threads' one, merged the same way).
      LoadSums<Lanes4> lanes;
      vtkIdType c = begin;
      for (; c + 4 <= end; c += 4)
      {
        I buffer[4][4];
        const I* ids[4];
        const int n = topo.template RunOf<4>(c, ids, buffer);
        const bool counted = IsCountedCell(ghosts, c) && IsCountedCell(ghosts, c + 1) &&
          IsCountedCell(ghosts, c + 2) && IsCountedCell(ghosts, c + 3);
        const bool done = n != 0 && counted &&
          (n == 3 ? this->Quartet<3>(c, ids, points, lanes) : this->Quartet<4>(c, ids, points, lanes));
        if (!done)
        {
          for (int j = 0; j < 4; ++j)
          {
            oneFace(c + j);
          }
        }
      }
      for (; c < end; ++c)
      {
        oneFace(c);
      }
      acc.Store(sums);
      MergeLanes(lanes, sums);
      return;
    }
#endif
    for (vtkIdType c = begin; c < end; ++c)
    {
      oneFace(c);
    }
    acc.Store(sums);
  }

#if WALLLOADS_LANES
  /**
   * Faces c..c+3, all of N corners and counted, by the same kernels on
   * Lanes4 (each face's slot values are the scalar ones); false, with
   * nothing added, when any of the four would be skipped.
   */
  template <int N>
  WALLLOADS_FACE_INLINE bool Quartet(
    vtkIdType c, const I* const ids[4], const P* points, LoadSums<Lanes4>& lanes) const
  {
    const double* fpData = static_cast<const double*>(In.ForceP.Data) + 3 * c;
    const double* fvData = static_cast<const double*>(In.ForceV.Data) + 3 * c;
    const double* areaData = static_cast<const double*>(In.Area.Data) + c;
    Lanes4 fp[3];
    Lanes4 fv[3];
    for (int k = 0; k < 3; ++k)
    {
      fp[k] = Lanes4::Of(fpData[k], fpData[3 + k], fpData[6 + k], fpData[9 + k]);
      fv[k] = Lanes4::Of(fvData[k], fvData[3 + k], fvData[6 + k], fvData[9 + k]);
    }
    const Lanes4 area = Lanes4::Of(areaData[0], areaData[1], areaData[2], areaData[3]);
    if (!AllLanes(FiniteLanes(fp[0]) & FiniteLanes(fp[1]) & FiniteLanes(fp[2]) &
          FiniteLanes(fv[0]) & FiniteLanes(fv[1]) & FiniteLanes(fv[2]) & FiniteLanes(area)))
    {
      return false;
    }
    FourFaces<N, P, I> faces(points, ids);
    Lanes4 normal[3];
    Lanes4 faceArea;
    Lanes4 a[3];
    if (!FaceNormalLanes(faces, normal, faceArea, a))
    {
      return false;
    }
    Lanes4 centroid[3];
    FaceCentroidLanes(faces, normal, centroid);
    const Lanes4 r0[3] = { Lanes4(this->R0[0]), Lanes4(this->R0[1]), Lanes4(this->R0[2]) };
    lanes.AddFace(area, centroid, r0, fp, fv);
    return true;
  }
#endif

  void Reduce() {}
};

template <typename I, typename P>
void SumLeaf(const LeafInputs& in, vtkDataSet* ds, const double r0[3], std::vector<Sums>& total)
{
  FaceTopology<I> topo;
  MakeFaceTopology<I>(ds, topo);
  SumLoop<I, P> loop(in, topo, r0, total.size());
  vtkSMPTools::For(0, ds->GetNumberOfCells(), loop);
  for (const std::vector<Sums>& local : loop.Local)
  {
    for (std::size_t r = 0; r < total.size(); ++r)
    {
      total[r].Merge(local[r]);
    }
  }
}

} // namespace integration
} // namespace wallloads
