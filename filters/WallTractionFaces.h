// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Wall Traction's face loop (private to vtkWallTraction.cxx; instantiated in
 * WallTractionFaces32/64.cxx): per face the Newell normal, area and centroid
 * (unrolled for triangles and quadrilaterals), the traction from the
 * pressure and the viscous source, the per-face arrays, the tallies, Load
 * Integration's sums (handed over, WallLoadsMeshCache.h), and, when the
 * orientation check must run, the edge-balance certificate (EdgeBalance.h)
 * that spares the exact check on closed consistently oriented surfaces. The
 * check's result is kept per leaf while the mesh is unchanged. In the AVX2
 * clone, runs of four like faces take the same kernels on Lanes<4>
 * (Lanes.h), and in the AVX-512 clone runs of eight on Lanes<8>, with the
 * same per-face values (written past the caches when the outputs are large:
 * StreamOutputs). What the loop reads and writes: WallTractionTypes.h.
 */
#include "WallTractionTypes.h"
#include "vtkWallTraction.h"
#include "wallloads/CompensatedSum.h"
#include "wallloads/EdgeBalance.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/LoadTotals.h"
#include "wallloads/OrientationCheck.h"
#include "wallloads/Traction.h"

#include "vtkDataSet.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"

#include <cmath>
#include <cstdint>
#include <limits>
#include <utility>
#include <vector>

namespace wallloads
{
namespace traction
{

/// `Direct`: every input array is a double cell array, read without the
/// views' per-value type and association branches (the same values).
/// `Shear` (a ShearSources value) and `Arrays` (0 forces only, 1 all
/// arrays) fix those settings at compile time, so that the face loop carries
/// no branch and no code for the paths it does not take; -1: read from the
/// settings per face (the general loop, kept small in number).
template <typename I, typename P, bool Direct, int Shear = -1, int Arrays = -1>
struct FaceLoop
{
  const Settings& S;
  const Inputs& In;
  const Outputs& Out;
  const FaceTopology<I>& Topo;
  bool Balance = false; ///< accumulate the orientation certificate
  vtkSMPThreadLocal<ThreadTally> Local;

  FaceLoop(const Settings& s, const Inputs& in, const Outputs& out, const FaceTopology<I>& topo)
    : S(s)
    , In(in)
    , Out(out)
    , Topo(topo)
  {
  }

  void Initialize() {}

  int ShearSource() const { return Shear >= 0 ? Shear : S.ShearSource; }
  bool Full() const { return Arrays >= 0 ? Arrays == 1 : Out.Full; }

  double Val(const ArrayView& v, vtkIdType c, const I* ids, int n, int k) const
  {
    if (Direct)
    {
      return static_cast<const double*>(v.Data)[c * v.NumComponents + k];
    }
    return v.Face(c, ids, n, k);
  }

  void MarkSkipped(vtkIdType c) const
  {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    Out.Area[c] = nan;
    for (double* a : { Out.ForceP, Out.ForceV })
    {
      a[3 * c] = a[3 * c + 1] = a[3 * c + 2] = nan;
    }
    if (!this->Full())
    {
      return;
    }
    for (double* a : { Out.Normal, Out.TractionP, Out.TractionV, Out.Traction, Out.Force })
    {
      a[3 * c] = a[3 * c + 1] = a[3 * c + 2] = nan;
    }
    Out.NormalV[c] = Out.Directional[c] = nan;
    if (Out.Cp)
    {
      Out.Cp[c] = nan;
    }
    if (Out.Cf)
    {
      Out.Cf[c] = nan;
    }
  }

  void operator()(vtkIdType begin, vtkIdType end)
  {
#if WALLLOADS_AVX512_CLONE
    if (UseAvx512Loops())
    {
      this->FacesAvx512(begin, end);
      return;
    }
#endif
#if WALLLOADS_AVX2_CLONE
    if (UseAvx2Loops())
    {
      this->FacesAvx2(begin, end);
      return;
    }
#endif
    this->Faces<false, 4>(begin, end);
  }

#if WALLLOADS_AVX2_CLONE
  /// The same loop compiled for AVX2 (Lanes.h), taking four faces at a time
  /// where it can: the same values.
  WALLLOADS_TARGET_AVX2 void FacesAvx2(vtkIdType begin, vtkIdType end)
  {
    this->Faces<WALLLOADS_LANES != 0, 4>(begin, end);
  }
#endif
#if WALLLOADS_AVX512_CLONE
  /// And for AVX-512, eight faces at a time in registers twice as wide
  /// (and twice as many): the same values.
  WALLLOADS_TARGET_AVX512 void FacesAvx512(vtkIdType begin, vtkIdType end)
  {
    this->Faces<WALLLOADS_LANES != 0, 8>(begin, end);
  }
#endif

  /// Whether this loop has a lane path (runs of four or eight faces): double cell arrays, the
  /// viscous source and the array set fixed at compile time.
  static constexpr bool HasLanes = WALLLOADS_LANES != 0 && Direct && Shear >= 0 && Arrays >= 0;

  template <bool UseLanes, int W>
  WALLLOADS_FACE_INLINE void Faces(vtkIdType begin, vtkIdType end)
  {
    ThreadTally& tally = this->Local.Local();
    // Local copies: the loop stores bytes (the orientation check's face
    // flags), which may alias any member, so members would be reloaded
    // after every store; locals whose address is never taken are not.
    const Outputs out = this->Out;
    const Inputs in = this->In;
    const FaceTopology<I> topo = this->Topo;
    const bool balance = this->Balance;
    const int orientation = S.Orientation;
    const bool pressurePerUnitDensity = S.PressurePerUnitDensity;
    const bool shearPerUnitDensity = S.ShearPerUnitDensity;
    const bool kinematic = S.Kinematic;
    const bool includeNormal = S.IncludeNormal;
    const double referencePressure = S.ReferencePressure;
    const double density = S.Density;
    const double viscosity = S.Viscosity;
    const double dynamicPressure = S.DynamicPressure;
    const double loadDirection[3] = { S.LoadDirection[0], S.LoadDirection[1], S.LoadDirection[2] };
    const P* points = static_cast<const P*>(in.Points.Data);
    // One face by the scalar kernels: the reference for every value.
    auto oneFace = [&](vtkIdType c) {
      const bool counted = IsCountedCell(in.Ghosts, c);
      I buffer[4];
      const I* ids = nullptr;
      const int n = topo.Corners(c, ids, buffer);
      if (n == 0)
      {
        if (out.FaceOk)
        {
          out.FaceOk[c] = 0;
        }
        this->MarkSkipped(c);
        tally.NonSurface += counted;
        return;
      }
      // Normal and area, and the centroid for Load Integration's moments.
      FaceFrame<double> frame;
      const FaceStatus status = ComputeFaceFrameFast<double>(points, ids, n, frame);
      if (out.FaceOk)
      {
        out.FaceOk[c] = status == FaceStatus::Ok;
      }
      if (status != FaceStatus::Ok)
      {
        this->MarkSkipped(c);
        (status == FaceStatus::NonFinite ? tally.NonFinite : tally.Degenerate) += counted;
        if (counted)
        {
          tally.Loads.AddSkipped();
        }
        return;
      }
      double sign = orientation == vtkWallTraction::STORED_INTO_FLUID ? 1.0 : -1.0;
      if (orientation == vtkWallTraction::WALL_NORMAL_ARRAY)
      {
        const double d = frame.Normal[0] * in.WallNormal.Get(c, 0) +
          frame.Normal[1] * in.WallNormal.Get(c, 1) + frame.Normal[2] * in.WallNormal.Get(c, 2);
        sign = d > 0 ? 1.0 : (d < 0 ? -1.0 : std::numeric_limits<double>::quiet_NaN());
      }
      if (orientation == vtkWallTraction::WALL_NORMAL_ARRAY && sign < 0 && out.FaceOk)
      {
        out.FaceOk[c] = 2;
      }
      if (balance && counted)
      {
        // The faces the orientation check takes: valid geometry, counted.
        tally.Balance.AddFace(ids, n, orientation == vtkWallTraction::WALL_NORMAL_ARRAY && sign < 0);
      }
      const double normal[3] = { sign * frame.Normal[0], sign * frame.Normal[1],
        sign * frame.Normal[2] };

      double rho = density;
      if (in.Density.Valid())
      {
        rho = this->Val(in.Density, c, ids, n, 0);
      }
      FaceTractionInput<double> tin;
      tin.Normal = normal;
      tin.IncludeNormalViscousStress = includeNormal;
      tin.WantShearMagnitude = out.Cf != nullptr;
      if (in.Pressure.Valid())
      {
        const double p = this->Val(in.Pressure, c, ids, n, 0);
        tin.GaugePressure = (pressurePerUnitDensity ? rho * p : p) - referencePressure;
      }
      else
      {
        tin.GaugePressure = 0;
      }
      double shear[3];
      double gradient[9];
      if (this->ShearSource() == vtkWallTraction::WALL_SHEAR_STRESS)
      {
        const double f = shearPerUnitDensity ? rho : 1.0;
        for (int k = 0; k < 3; ++k)
        {
          shear[k] = f * this->Val(in.Shear, c, ids, n, k);
        }
        tin.ShearVector = shear;
      }
      else if (this->ShearSource() == vtkWallTraction::VELOCITY_GRADIENT)
      {
        if (Direct)
        {
          // Read in place (validated: 9 components); no copy per face.
          tin.VelocityGradient = static_cast<const double*>(in.Gradient.Data) + 9 * c;
        }
        else
        {
          for (int k = 0; k < 9; ++k)
          {
            gradient[k] = this->Val(in.Gradient, c, ids, n, k);
          }
          tin.VelocityGradient = gradient;
        }
        double mu = in.Viscosity.Valid() ? this->Val(in.Viscosity, c, ids, n, 0) : viscosity;
        if (in.TurbulentViscosity.Valid())
        {
          mu += this->Val(in.TurbulentViscosity, c, ids, n, 0);
        }
        tin.EffectiveViscosity = kinematic ? rho * mu : mu;
      }
      FaceTraction<double> t;
      if (!ComputeFaceTraction(tin, t) || !std::isfinite(sign) || !std::isfinite(rho))
      {
        this->MarkSkipped(c);
        tally.NonFinite += counted;
        if (counted)
        {
          tally.Loads.AddSkipped();
        }
        return;
      }
      const double A = frame.Area;
      out.Area[c] = A;
      double fp[3];
      double fv[3];
      for (int k = 0; k < 3; ++k)
      {
        fp[k] = t.Pressure[k] * A;
        fv[k] = t.Viscous[k] * A;
        out.ForceP[3 * c + k] = fp[k];
        out.ForceV[3 * c + k] = fv[k];
      }
      if (counted)
      {
        // Load Integration's rule: a force that overflowed is left out.
        if (AllFinite(fp, 3) && AllFinite(fv, 3))
        {
          const double origin[3] = { 0, 0, 0 };
          tally.Loads.AddFace(A, frame.Centroid, origin, fp, fv);
        }
        else
        {
          tally.Loads.AddSkipped();
        }
      }
      if (this->Full())
      {
        for (int k = 0; k < 3; ++k)
        {
          const vtkIdType j = 3 * c + k;
          out.Normal[j] = normal[k];
          out.TractionP[j] = t.Pressure[k];
          out.TractionV[j] = t.Viscous[k];
          out.Traction[j] = t.Total[k];
          out.Force[j] = t.Total[k] * A;
        }
        out.NormalV[c] = t.NormalViscous;
        out.Directional[c] = Dot(t.Total, loadDirection);
      }
      if (out.Cp)
      {
        out.Cp[c] = tin.GaugePressure / dynamicPressure;
      }
      if (out.Cf)
      {
        out.Cf[c] = t.ShearMagnitude / dynamicPressure;
      }
      if (counted)
      {
        tally.Area.Add(A);
        ++tally.Faces;
      }
    };
#if WALLLOADS_LANES
    if constexpr (UseLanes && HasLanes)
    {
      if (orientation != vtkWallTraction::WALL_NORMAL_ARRAY)
      {
        const Lanes<W> lanesLoadDirection[3] = { Lanes<W>(loadDirection[0]),
          Lanes<W>(loadDirection[1]), Lanes<W>(loadDirection[2]) };
        LoadSums<Lanes<W>> lanes; // Load Integration's sums, one face per lane
        vtkIdType c = begin;
        if (Streaming<W>(out))
        {
          // Streaming stores need runs that start on a multiple of eight
          // faces (64-byte aligned stores): the faces before it one by one.
          for (; c < end && c % W != 0; ++c)
          {
            oneFace(c);
          }
        }
        const FaceStreams ahead(this->In, this->ShearSource() == vtkWallTraction::WALL_SHEAR_STRESS);
        for (; c + W <= end; c += W)
        {
          if (c + PrefetchAhead + W <= end)
          {
            ahead.Prefetch(c + PrefetchAhead, W);
          }
          I buffer[W][4];
          const I* ids[W];
          const int n = topo.template RunOf<W>(c, ids, buffer);
          const bool done = n != 0 &&
            (n == 3 ? this->LaneRun<W, 3>(c, ids, tally, lanes, points, lanesLoadDirection)
                    : this->LaneRun<W, 4>(c, ids, tally, lanes, points, lanesLoadDirection));
          if (!done)
          {
            for (int j = 0; j < W; ++j)
            {
              oneFace(c + j);
            }
          }
        }
        for (; c < end; ++c)
        {
          oneFace(c);
        }
        if (Streaming<W>(out))
        {
          StreamFence(); // before the thread reports its part done
        }
        MergeLaneTallies(lanes, tally);
        return;
      }
    }
#endif
    for (vtkIdType c = begin; c < end; ++c)
    {
      oneFace(c);
    }
  }
#if WALLLOADS_LANES
  /// Merges the lanes' sums into the thread's, and takes the wetted area and
  /// face count of those faces from their area and count slots: every face
  /// summed in lanes is counted and finite, so the lane path carries no
  /// per-face scalar sum (a chain of dependent additions) of its own.
  template <int W>
  static void MergeLaneTallies(const LoadSums<Lanes<W>>& lanes, ThreadTally& tally)
  {
    MergeLanes(lanes, tally.Loads);
    const CompensatedSum<Lanes<W>>& area = lanes.Sums.Terms[AreaSlot];
    const CompensatedSum<Lanes<W>>& count = lanes.Sums.Terms[FaceCountSlot];
    for (int j = 0; j < W; ++j)
    {
      CompensatedSum<double> laneArea;
      laneArea.Sum = area.Sum[j];
      laneArea.Carry = area.Carry[j];
      tally.Area.Merge(laneArea);
      tally.Faces += static_cast<vtkIdType>(count.Sum[j] + count.Carry[j]);
    }
  }

  /**
   * Faces c..c+W-1, all of N corners, by the same kernels on Lanes<W>: each
   * face gets the values and tallies the scalar path gives it. False, with
   * nothing written, when any of them leaves the common case (invalid geometry,
   * a non-finite value): the caller then takes them one by one.
   */
  template <int W, int N>
  WALLLOADS_FACE_INLINE bool LaneRun(vtkIdType c, const I* const ids[W], ThreadTally& tally,
    LoadSums<Lanes<W>>& lanes, const P* points, const Lanes<W> loadDirection[3]) const
  {
    const Outputs& out = this->Out;
    const Inputs& in = this->In;
    LaneFaces<W, N, P, I> faces(points, ids);
    Lanes<W> unit[3];
    Lanes<W> A;
    Lanes<W> a[3];
    if (!FaceNormalLanes(faces, unit, A, a))
    {
      return false;
    }
    const double sign = S.Orientation == vtkWallTraction::STORED_INTO_FLUID ? 1.0 : -1.0;
    const Lanes<W> normal[3] = { sign * unit[0], sign * unit[1], sign * unit[2] };
    Lanes<W> rho(S.Density);
    if (in.Density.Valid())
    {
      rho = GatherFaces<W, 1>(in.Density, c, 0);
    }
    FaceTractionInput<Lanes<W>> tin;
    tin.Normal = normal;
    tin.IncludeNormalViscousStress = S.IncludeNormal;
    tin.WantShearMagnitude = out.Cf != nullptr;
    if (in.Pressure.Valid())
    {
      const Lanes<W> p = GatherFaces<W, 1>(in.Pressure, c, 0);
      tin.GaugePressure = (S.PressurePerUnitDensity ? rho * p : p) - S.ReferencePressure;
    }
    else
    {
      tin.GaugePressure = Lanes<W>(0.0);
    }
    Lanes<W> shear[3];
    Lanes<W> gradient[9];
    if (Shear == vtkWallTraction::WALL_SHEAR_STRESS)
    {
      const Lanes<W> f = S.ShearPerUnitDensity ? rho : Lanes<W>(1.0);
      for (int k = 0; k < 3; ++k)
      {
        shear[k] = f * GatherFaces<W, 3>(in.Shear, c, k);
      }
      tin.ShearVector = shear;
    }
    else
    {
      for (int k = 0; k < 9; ++k)
      {
        gradient[k] = GatherFaces<W, 9>(in.Gradient, c, k);
      }
      tin.VelocityGradient = gradient;
      Lanes<W> mu = in.Viscosity.Valid() ? GatherFaces<W, 1>(in.Viscosity, c, 0) : Lanes<W>(S.Viscosity);
      if (in.TurbulentViscosity.Valid())
      {
        mu += GatherFaces<W, 1>(in.TurbulentViscosity, c, 0);
      }
      tin.EffectiveViscosity = S.Kinematic ? rho * mu : mu;
    }
    FaceTraction<Lanes<W>> t;
    FaceTractionValues(tin, t);
    const Lanes<W> fp[3] = { t.Pressure[0] * A, t.Pressure[1] * A, t.Pressure[2] * A };
    const Lanes<W> fv[3] = { t.Viscous[0] * A, t.Viscous[1] * A, t.Viscous[2] * A };
    if (!AllLanes(FiniteLanes(tin.GaugePressure) & FiniteLanes(t.Viscous[0]) &
          FiniteLanes(t.Viscous[1]) & FiniteLanes(t.Viscous[2]) & FiniteLanes(t.NormalViscous) &
          FiniteLanes(rho) & FiniteLanes(fp[0]) & FiniteLanes(fp[1]) & FiniteLanes(fp[2]) &
          FiniteLanes(fv[0]) & FiniteLanes(fv[1]) & FiniteLanes(fv[2])))
    {
      return false;
    }
    if (in.Ghosts)
    {
      for (int j = 0; j < W; ++j)
      {
        if (!IsCountedCell(in.Ghosts, c + j))
        {
          return false; // ghost faces are left out of the sums: one by one
        }
      }
    }
    Lanes<W> centroid[3];
    FaceCentroidLanes(faces, unit, centroid);
    const Lanes<W> origin[3] = { Lanes<W>(0.0), Lanes<W>(0.0), Lanes<W>(0.0) };
    lanes.AddFace(A, centroid, origin, fp, fv);
    // Every lane is valid: the stores and tallies of the scalar path.
    if (out.FaceOk)
    {
      for (int j = 0; j < W; ++j)
      {
        out.FaceOk[c + j] = 1; // counted (checked above)
      }
    }
    if (this->Balance)
    {
      tally.Balance.AddFaces<W, N>(ids); // the run's W faces in lanes
    }
    if constexpr (W == 8)
    {
      if (out.Stream) // c is a multiple of eight (Faces)
      {
        this->StoreRun<W, true>(c, A, fp, fv, normal, t, tin, loadDirection);
        return true;
      }
    }
    this->StoreRun<W, false>(c, A, fp, fv, normal, t, tin, loadDirection);
    return true;
  }

  /// The per-face arrays of faces c..c+W-1 (Stream: by streaming stores).
  template <int W, bool Stream>
  WALLLOADS_FACE_INLINE void StoreRun(vtkIdType c, const Lanes<W>& A, const Lanes<W> fp[3],
    const Lanes<W> fv[3], const Lanes<W> normal[3], const FaceTraction<Lanes<W>>& t,
    const FaceTractionInput<Lanes<W>>& tin, const Lanes<W> loadDirection[3]) const
  {
    const Outputs& out = this->Out;
    StoreLanes<W, Stream>(out.Area + c, A);
    StoreVectors<W, Stream>(out.ForceP, c, fp);
    StoreVectors<W, Stream>(out.ForceV, c, fv);
    if (Arrays == 1)
    {
      StoreVectors<W, Stream>(out.Normal, c, normal);
      StoreVectors<W, Stream>(out.TractionP, c, t.Pressure);
      StoreVectors<W, Stream>(out.TractionV, c, t.Viscous);
      StoreVectors<W, Stream>(out.Traction, c, t.Total);
      StoreVectors<W, Stream>(out.Force, c, t.Total, &A);
      StoreLanes<W, Stream>(out.NormalV + c, t.NormalViscous);
      StoreLanes<W, Stream>(out.Directional + c, Dot(t.Total, loadDirection));
    }
    if (out.Cp)
    {
      StoreLanes<W, Stream>(out.Cp + c, tin.GaugePressure / S.DynamicPressure);
    }
    if (out.Cf)
    {
      StoreLanes<W, Stream>(out.Cf + c, t.ShearMagnitude / S.DynamicPressure);
    }
  }

  /// Component k of faces c..c+W-1 from a double cell array of `Components`
  /// components (the widths the filter validated, so that the stride is a
  /// constant the compiler folds into the addresses).
  template <int W, int Components>
  static WALLLOADS_FACE_INLINE Lanes<W> GatherFaces(const ArrayView& v, vtkIdType c, int k)
  {
    const double* d = static_cast<const double*>(v.Data) + c * Components + k;
    return Lanes<W>::Gather([d](int j) { return d[j * Components]; });
  }

  /// v (times `scale` when given) of faces c..c+W-1 into a 3-component array.
  template <int W, bool Stream>
  static WALLLOADS_FACE_INLINE void StoreVectors(
    double* to, vtkIdType c, const Lanes<W> v[3], const Lanes<W>* scale = nullptr)
  {
    Lanes<W> w[3] = { v[0], v[1], v[2] };
    if (scale)
    {
      w[0] = v[0] * *scale;
      w[1] = v[1] * *scale;
      w[2] = v[2] * *scale;
    }
    StoreInterleaved<W, Stream>(to + 3 * c, w);
  }
#endif

  void Reduce() {}
};


template <typename I, typename P>
void RunFaces(const Settings& s, const Inputs& in, Outputs out, vtkDataSet* ds, Tally& tally,
  const LeafCache& cache, vtkDataArray* wallNormal, LoadSums<double>& leafLoads)
{
  // The orientation check depends on the mesh only (and on the Wall Normal
  // array when it decides the orientation): reused while that is unchanged.
  double orientation[MeshResultCache::NumValues] = { 0, 0 };
  const bool check = s.CheckOrientation &&
    !(cache.Results && cache.Results->Find(cache.Slot, ds, wallNormal, orientation));
  // One byte per face, only when the check runs: faces whose geometry is
  // valid take part in it even when their values are NaN (no false open edges).
  std::vector<std::uint8_t> faceOk;
  if (check)
  {
    faceOk.assign(static_cast<std::size_t>(ds->GetNumberOfCells()), 0);
    out.FaceOk = faceOk.data();
  }
  FaceTopology<I> topo;
  MakeFaceTopology<I>(ds, topo);
  bool direct = true;
  for (const ArrayView* v : { &in.Pressure, &in.Density, &in.Shear, &in.Gradient, &in.Viscosity,
         &in.TurbulentViscosity })
  {
    direct = direct && (!v->Valid() || (!v->IsFloat && !v->OnPoints));
  }
  // The direct loops read each array with the width the filter validated.
  const std::pair<const ArrayView*, int> widths[] = { { &in.Pressure, 1 }, { &in.Density, 1 },
    { &in.Shear, 3 }, { &in.Gradient, 9 }, { &in.Viscosity, 1 }, { &in.TurbulentViscosity, 1 } };
  for (const auto& w : widths)
  {
    direct = direct && (!w.first->Valid() || w.first->NumComponents == w.second);
  }
  EdgeBalance balance;
  // Runs one loop and merges its thread tallies in a fixed order of their
  // values: compensated sums make the total independent of how the faces
  // were split among threads.
  auto run = [&](auto& loop) {
    loop.Balance = check;
    vtkSMPTools::For(0, ds->GetNumberOfCells(), loop);
    for (const ThreadTally& t : loop.Local)
    {
      tally.WettedArea.Merge(t.Area);
      tally.NonSurface += t.NonSurface;
      tally.Degenerate += t.Degenerate;
      tally.NonFinite += t.NonFinite;
      tally.Faces += t.Faces;
      balance.Merge(t.Balance);
      leafLoads.Merge(t.Loads);
    }
  };
  // Double cell arrays (Wall Traction's usual input) get loops compiled for
  // the viscous source and the array set; anything else the general loop.
  const int shear = s.ShearSource;
  if (direct && shear == vtkWallTraction::VELOCITY_GRADIENT && out.Full)
  {
    FaceLoop<I, P, true, vtkWallTraction::VELOCITY_GRADIENT, 1> loop(s, in, out, topo);
    run(loop);
  }
  else if (direct && shear == vtkWallTraction::VELOCITY_GRADIENT)
  {
    FaceLoop<I, P, true, vtkWallTraction::VELOCITY_GRADIENT, 0> loop(s, in, out, topo);
    run(loop);
  }
  else if (direct && shear == vtkWallTraction::WALL_SHEAR_STRESS && out.Full)
  {
    FaceLoop<I, P, true, vtkWallTraction::WALL_SHEAR_STRESS, 1> loop(s, in, out, topo);
    run(loop);
  }
  else if (direct && shear == vtkWallTraction::WALL_SHEAR_STRESS)
  {
    FaceLoop<I, P, true, vtkWallTraction::WALL_SHEAR_STRESS, 0> loop(s, in, out, topo);
    run(loop);
  }
  else if (direct)
  {
    FaceLoop<I, P, true> loop(s, in, out, topo);
    run(loop);
  }
  else
  {
    FaceLoop<I, P, false> loop(s, in, out, topo);
    run(loop);
  }
  const bool certified = check && balance.ClosedAndConsistent();
  if (certified)
  {
    // Certified closed and consistently oriented in the face loop itself
    // (EdgeBalance.h): the exact check would find 0 and 0.
    orientation[0] = orientation[1] = 0;
  }
  else if (check)
  {
    const std::uint8_t* ok = faceOk.data();
    const unsigned char* ghosts = in.Ghosts;
    auto corners = [&](std::int64_t f, const I*& ids, I buffer[4], bool& reversed) -> int {
      if (!ok[f] || !IsCountedCell(ghosts, f))
      {
        return 0;
      }
      reversed = ok[f] == 2;
      return topo.Corners(f, ids, buffer);
    };
    const OrientationReport report =
      CheckOrientation<I>(ds->GetNumberOfCells(), ds->GetNumberOfPoints(), corners);
    orientation[0] = static_cast<double>(report.InconsistentFaces);
    orientation[1] = static_cast<double>(report.BoundaryEdges);
  }
  if (check && cache.Results)
  {
    // Hashed for new objects with the same content only when the exact
    // check ran: certifying again costs less than hashing (WallLoadsMeshCache.h).
    cache.Results->Store(cache.Slot, ds, wallNormal, orientation, !certified);
  }
  tally.Inconsistent += orientation[0];
  tally.OpenEdges += orientation[1];
}


/// Instantiated in WallTractionFaces32.cxx and WallTractionFaces64.cxx (one
/// per connectivity width, compiled in parallel: these loops are the
/// largest code in the library).
#define WALLLOADS_RUN_FACES(prefix, I, P)                                                          \
  prefix template void RunFaces<I, P>(const Settings&, const Inputs&, Outputs, vtkDataSet*,       \
    Tally&, const LeafCache&, vtkDataArray*, LoadSums<double>&);
WALLLOADS_RUN_FACES(extern, vtkTypeInt32, float)
WALLLOADS_RUN_FACES(extern, vtkTypeInt32, double)
WALLLOADS_RUN_FACES(extern, vtkTypeInt64, float)
WALLLOADS_RUN_FACES(extern, vtkTypeInt64, double)

} // namespace traction
} // namespace wallloads
