// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Per-region sums of wall loads: wetted area, pressure and viscous force,
 * and their moments about a moment centre r0, M = sum (c - r0) x f with c the
 * face's area centroid. Compensated sums, mergeable across threads and ranks.
 */
#include "wallloads/CompensatedSum.h"
#include "wallloads/Lanes.h"
#include "wallloads/LoadAxes.h"
#include "wallloads/Vector3.h"

#include <cstddef>
#include <limits>

namespace wallloads
{

/// Slots of the running sums, in the order they are reduced across ranks.
enum LoadSlot : std::size_t
{
  AreaSlot = 0,
  PressureForceSlot = 1,  // 3 slots
  ViscousForceSlot = 4,   // 3 slots
  PressureMomentSlot = 7, // 3 slots
  ViscousMomentSlot = 10, // 3 slots
  FaceCountSlot = 13,
  SkippedCountSlot = 14,
  ForceMagnitudeSlot = 15, // sum of |f|: the scale below which F is round-off
  NumLoadSlots = 16
};

template <typename T>
struct LoadSums
{
  CompensatedSums<T, NumLoadSlots> Sums;

  WALLLOADS_FACE_INLINE void AddFace(
    const T& area, const T centroid[3], const T r0[3], const T fp[3], const T fv[3])
  {
    const T arm[3] = { centroid[0] - r0[0], centroid[1] - r0[1], centroid[2] - r0[2] };
    T mp[3];
    T mv[3];
    Cross(arm, fp, mp);
    Cross(arm, fv, mv);
    this->Sums.Add(AreaSlot, area);
    for (std::size_t i = 0; i < 3; ++i)
    {
      this->Sums.Add(PressureForceSlot + i, fp[i]);
      this->Sums.Add(ViscousForceSlot + i, fv[i]);
      this->Sums.Add(PressureMomentSlot + i, mp[i]);
      this->Sums.Add(ViscousMomentSlot + i, mv[i]);
    }
    this->Sums.AddUncompensated(FaceCountSlot, T(1));
    const T f[3] = { fp[0] + fv[0], fp[1] + fv[1], fp[2] + fv[2] };
    this->Sums.AddUncompensated(ForceMagnitudeSlot, Norm(f));
  }

  WALLLOADS_FACE_INLINE void AddSkipped() { this->Sums.AddUncompensated(SkippedCountSlot, T(1)); }
  void Merge(const LoadSums& other) { this->Sums.Merge(other.Sums); }
};

/**
 * Sums whose moments were taken about the origin, moved to the moment centre
 * r0: each face's moment about r0 is (c - r0) x f = c x f - r0 x f, so the
 * moment sums lose r0 x (their force sum). The subtraction is added to the
 * compensated sums, so its rounding is that of one more term; with r0 at
 * the origin nothing changes.
 */
template <typename T>
LoadSums<T> MomentsAbout(const LoadSums<T>& aboutOrigin, const T r0[3])
{
  LoadSums<T> s = aboutOrigin;
  const std::size_t force[2] = { PressureForceSlot, ViscousForceSlot };
  const std::size_t moment[2] = { PressureMomentSlot, ViscousMomentSlot };
  for (int part = 0; part < 2; ++part)
  {
    const T f[3] = { s.Sums.Value(force[part]), s.Sums.Value(force[part] + 1),
      s.Sums.Value(force[part] + 2) };
    T shift[3];
    Cross(r0, f, shift);
    for (std::size_t i = 0; i < 3; ++i)
    {
      if (shift[i] != T(0))
      {
        s.Sums.Add(moment[part] + i, -shift[i]);
      }
    }
  }
  return s;
}

/// Reference values that turn loads into coefficients.
template <typename T>
struct ReferenceValues
{
  T Density = 1;
  T Speed = 0; ///< 0: no coefficients
  T Area = 1;
  T Length = 1; ///< pitching moment
  T Span = 1;   ///< rolling and yawing moments
  T DynamicPressure() const { return T(0.5) * this->Density * this->Speed * this->Speed; }
};

/// The finished loads of one region, as reported.
template <typename T>
struct RegionLoads
{
  T Area = 0;
  T FaceCount = 0;
  T SkippedCount = 0;
  T PressureForce[3] = { 0, 0, 0 };
  T ViscousForce[3] = { 0, 0, 0 };
  T Force[3] = { 0, 0, 0 };
  T PressureMoment[3] = { 0, 0, 0 };
  T ViscousMoment[3] = { 0, 0, 0 };
  T Moment[3] = { 0, 0, 0 };
  T Drag = 0, SideForce = 0, Lift = 0;
  T RollingMoment = 0, PitchingMoment = 0, YawingMoment = 0;
  T DragCoefficient = 0, SideForceCoefficient = 0, LiftCoefficient = 0;
  T RollingMomentCoefficient = 0, PitchingMomentCoefficient = 0, YawingMomentCoefficient = 0;
  T LineOfActionPoint[3] = { 0, 0, 0 };
  T ResidualCouple = 0;
};

/// Relative size of a resultant, against the sum of face-force magnitudes,
/// below which it is treated as zero for the line of action.
template <typename T>
constexpr T PureCoupleTolerance()
{
  return T(1e-12);
}

/// Turn raw sums (values of the slots above) into reported loads.
template <typename T>
inline void FinishRegion(const T slots[NumLoadSlots], const T r0[3], const LoadAxes<T>& axes,
  const ReferenceValues<T>& ref, RegionLoads<T>& out)
{
  out.Area = slots[AreaSlot];
  out.FaceCount = slots[FaceCountSlot];
  out.SkippedCount = slots[SkippedCountSlot];
  for (int i = 0; i < 3; ++i)
  {
    out.PressureForce[i] = slots[PressureForceSlot + i];
    out.ViscousForce[i] = slots[ViscousForceSlot + i];
    out.Force[i] = out.PressureForce[i] + out.ViscousForce[i];
    out.PressureMoment[i] = slots[PressureMomentSlot + i];
    out.ViscousMoment[i] = slots[ViscousMomentSlot + i];
    out.Moment[i] = out.PressureMoment[i] + out.ViscousMoment[i];
  }
  out.Drag = Dot(out.Force, axes.Drag);
  out.SideForce = Dot(out.Force, axes.Side);
  out.Lift = Dot(out.Force, axes.Lift);
  out.RollingMoment = Dot(out.Moment, axes.Drag);
  out.PitchingMoment = Dot(out.Moment, axes.Side);
  out.YawingMoment = Dot(out.Moment, axes.Lift);
  const T qA = ref.DynamicPressure() * ref.Area;
  if (qA > T(0))
  {
    out.DragCoefficient = out.Drag / qA;
    out.SideForceCoefficient = out.SideForce / qA;
    out.LiftCoefficient = out.Lift / qA;
    // A moment coefficient needs a positive reference length (span): NaN,
    // not the infinity of a division by zero, when it is not set.
    const T nan = std::numeric_limits<T>::quiet_NaN();
    const T qAS = qA * ref.Span, qAL = qA * ref.Length;
    out.RollingMomentCoefficient = qAS > T(0) ? out.RollingMoment / qAS : nan;
    out.PitchingMomentCoefficient = qAL > T(0) ? out.PitchingMoment / qAL : nan;
    out.YawingMomentCoefficient = qAS > T(0) ? out.YawingMoment / qAS : nan;
  }
  // A resultant that is round-off of the face forces (a pure couple on a
  // closed surface) has no line of action: report NaN rather than a point
  // 1e16 m away. 1e-12 of the summed magnitudes is far above the rounding
  // error of the sum and far below any resolved force.
  const T zero[3] = { 0, 0, 0 };
  const bool resolved = Norm(out.Force) > PureCoupleTolerance<T>() * slots[ForceMagnitudeSlot];
  LineOfAction(resolved ? out.Force : zero, out.Moment, r0, out.LineOfActionPoint,
    out.ResidualCouple);
}

#if WALLLOADS_LANES
/// Sums kept with one face per lane (LoadSums<Lanes<W>>), merged into `to`
/// lane by lane, as the sums of W threads would be.
template <int W>
inline void MergeLanes(const LoadSums<Lanes<W>>& lanes, LoadSums<double>& to)
{
  for (int j = 0; j < W; ++j)
  {
    LoadSums<double> lane;
    for (std::size_t k = 0; k < NumLoadSlots; ++k)
    {
      lane.Sums.Terms[k].Sum = lanes.Sums.Terms[k].Sum[j];
      lane.Sums.Terms[k].Carry = lanes.Sums.Terms[k].Carry[j];
    }
    to.Merge(lane);
  }
}
#endif

} // namespace wallloads
