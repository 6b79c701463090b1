// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Load axes and the line of action of a force system.
 *
 * Axes: e_D along the drag direction, e_L the lift direction made orthogonal
 * to e_D (Gram-Schmidt), e_S = e_L x e_D, so (e_D, e_S, e_L) is right-handed.
 *
 * Flow angles: with x the free-stream direction and z the lift direction at
 * zero incidence, the angle of attack alpha turns the stream from x toward z
 * and the sideslip beta turns it toward +y:
 *   e_D = (cos a cos b, sin b, sin a cos b),  e_L = (-sin a, 0, cos a).
 * (The usual wind-axis construction, e.g. Etkin, Dynamics of Atmospheric
 * Flight, 1972, §4.3, written in our own sign convention: beta > 0 moves the
 * stream toward +y.)
 *
 * Central axis of a force system (F, M about r0): every point r on it has
 * M(r) parallel to F; the point nearest r0 is r0 + F x M / |F|^2, and the
 * couple left along F is (F . M) / |F| (e.g. Goldstein, Classical
 * Mechanics, the reduction of a force system to a wrench).
 */
#include "wallloads/Vector3.h"

#include <cmath>
#include <limits>

namespace wallloads
{

template <typename T>
struct LoadAxes
{
  T Drag[3];
  T Side[3];
  T Lift[3];
};

/// Build orthonormal load axes. Returns false when a direction is zero or the
/// two directions are parallel (no lift axis can be made).
template <typename T>
inline bool MakeLoadAxes(const T drag[3], const T lift[3], LoadAxes<T>& axes)
{
  const T nd = Norm(drag);
  if (!(nd > T(0)) || !std::isfinite(nd))
  {
    return false;
  }
  for (int i = 0; i < 3; ++i)
  {
    axes.Drag[i] = drag[i] / nd;
  }
  const T along = Dot(lift, axes.Drag);
  T l[3];
  for (int i = 0; i < 3; ++i)
  {
    l[i] = lift[i] - along * axes.Drag[i];
  }
  const T nl = Norm(l);
  const T nlift = Norm(lift);
  if (!(nl > T(1e-10) * nlift) || !(nlift > T(0)))
  {
    return false;
  }
  for (int i = 0; i < 3; ++i)
  {
    axes.Lift[i] = l[i] / nl;
  }
  Cross(axes.Lift, axes.Drag, axes.Side);
  return true;
}

/// Drag and lift directions for angle of attack and sideslip (radians).
template <typename T>
inline void DirectionsFromFlowAngles(T alpha, T beta, T drag[3], T lift[3])
{
  drag[0] = std::cos(alpha) * std::cos(beta);
  drag[1] = std::sin(beta);
  drag[2] = std::sin(alpha) * std::cos(beta);
  lift[0] = -std::sin(alpha);
  lift[1] = T(0);
  lift[2] = std::cos(alpha);
}

/// Point of the central axis nearest r0, and the residual couple along F.
/// Both are NaN when the force vanishes (a pure couple has no line of action).
template <typename T>
inline void LineOfAction(const T force[3], const T moment[3], const T r0[3], T point[3], T& couple)
{
  // With the unit vector of F (no |F|^2, which overflows for |F| > 1e154):
  // F x M / |F|^2 = (F/|F|) x M / |F| and (F . M) / |F| = (F/|F|) . M.
  const T f = Norm(force);
  if (!(f > T(0)))
  {
    const T nan = std::numeric_limits<T>::quiet_NaN();
    point[0] = point[1] = point[2] = nan;
    couple = nan;
    return;
  }
  const T fhat[3] = { force[0] / f, force[1] / f, force[2] / f };
  T fxm[3];
  Cross(fhat, moment, fxm);
  for (int i = 0; i < 3; ++i)
  {
    point[i] = r0[i] + fxm[i] / f;
  }
  couple = Dot(fhat, moment);
}

} // namespace wallloads
