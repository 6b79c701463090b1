// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Wall shear stress reconstructed from the velocity near a wall face.
 *
 * Conventions: n is the unit wall normal into the fluid, d = (x_P - x_f) . n
 * the wall distance of a sample point P from the face centroid f, u_W the
 * wall velocity, t(v) = v - (v . n) n the tangential part, mu_eff = mu + mu_t.
 *
 * (a) Near-wall difference (one sample, first order):
 *       tau_w = mu_eff t(u_P - u_W) / d.
 *     By Taylor expansion its error is mu_eff (d/2) u_t'' + mu_eff (d^2/6) u_t'''
 *     + O(d^3), derivatives along n at the wall: first order where the
 *     profile is curved at the wall (a pressure gradient along it). In a
 *     boundary layer the momentum equation at a no-slip wall gives
 *     mu u_t'' = dp/dx_t and, differentiated once more, u_t''' = 0 (the wall
 *     compatibility conditions, e.g. Schlichting, Boundary-Layer Theory;
 *     recalled from memory), so at zero pressure gradient (a flat plate) the
 *     error is third order.
 *
 * (b) One-dimensional wall fit, for samples on one line along the normal
 *     (Shear Projection's Wall fit method is the multi-dimensional fit of
 *     WallFit.h, which needs no stacked cells): weighted least squares
 *     of each tangential component of u_i - u_W over the samples (d_i) by the
 *     profile u_t(d) = a d + b d^2, which has no slip built in; tau_w = mu_eff a.
 *     Exact for parabolic profiles (plane Poiseuille flow); otherwise its
 *     error is second order (from u_t''') and third order at zero pressure
 *     gradient (from u_t''''). Dividing by d,
 *     the problem is the straight-line fit v = a + b d of v_i = u_i/d_i with
 *     weights w_i d_i^2 (the same objective), which is solved from centred
 *     sums so that close distances do not cancel digits.
 *
 * (c) From a velocity gradient G (row-major, G[3i+j] = du_i/dx_j):
 *       tau_w = t(mu_eff (G + G^T) n)
 *     (the -(2/3) mu tr(G) n part of the traction is normal and drops out).
 *
 * mu_eff is the viscosity at the wall for (b) and (c); where an eddy viscosity
 * is resolved it vanishes at the wall.
 */
#include "wallloads/Traction.h"
#include "wallloads/Vector3.h"

#include <cmath>
#include <cstdint>
#include <limits>

namespace wallloads
{

enum class ShearStatus : std::uint8_t
{
  Ok = 0,
  SingleSample, ///< wall fit given one sample: the near-wall difference (a) was used
  Degenerate,   ///< wall fit without two distinct distances of positive weight
  BadInput      ///< d <= 0, negative weight or viscosity, no samples, or a value not finite
};

namespace detail
{
template <typename T>
inline void FillNaN(T* v, int n)
{
  for (int i = 0; i < n; ++i)
  {
    v[i] = std::numeric_limits<T>::quiet_NaN();
  }
}
} // namespace detail

/// (a) tau_w = mu_eff t(u_P - u_W) / d. tau is NaN unless Ok.
template <typename T>
inline ShearStatus NearWallDifferenceShear(
  const T uP[3], const T uW[3], const T n[3], T d, T muEff, T tau[3])
{
  const T du[3] = { uP[0] - uW[0], uP[1] - uW[1], uP[2] - uW[2] };
  if (!(d > T(0)) || !(muEff >= T(0)) || !std::isfinite(d) || !std::isfinite(muEff) ||
    !AllFinite(du, 3) || !AllFinite(n, 3))
  {
    detail::FillNaN(tau, 3);
    return ShearStatus::BadInput;
  }
  T ut[3];
  SplitNormalTangential(du, n, ut);
  const T scale = muEff / d;
  tau[0] = scale * ut[0];
  tau[1] = scale * ut[1];
  tau[2] = scale * ut[2];
  return ShearStatus::Ok;
}

/// Relative spread of the sample distances, sqrt(var_w(d))/mean_w(d), below
/// which a wall fit is Degenerate: the curvature b would be set by round-off.
template <typename T>
inline T WallFitDistinctTolerance()
{
  return std::sqrt(std::numeric_limits<T>::epsilon());
}

/**
 * (b) Wall fit over `numSamples` samples: distance `d[i]`, velocity
 * `u[3*i + c]`, weight `w[i]` (nullptr: all 1). Writes tau_w = mu_eff a and,
 * if `curvature` is not null, the coefficient b of d^2 (tangential, per
 * component). One sample: the near-wall difference, status SingleSample.
 * tau (and curvature) are NaN for Degenerate and BadInput.
 */
template <typename T>
ShearStatus WallFitShear(const T* d, const T* u, const T* w, int numSamples, const T uW[3],
  const T n[3], T muEff, T tau[3], T* curvature = nullptr)
{
  auto fail = [&](ShearStatus status) {
    detail::FillNaN(tau, 3);
    if (curvature)
    {
      detail::FillNaN(curvature, 3);
    }
    return status;
  };
  if (numSamples < 1 || !AllFinite(uW, 3) || !AllFinite(n, 3))
  {
    return fail(ShearStatus::BadInput);
  }
  if (numSamples == 1)
  {
    const ShearStatus s = NearWallDifferenceShear(u, uW, n, d[0], muEff, tau);
    if (curvature)
    {
      detail::FillNaN(curvature, 3); // not determined by one sample
    }
    return s == ShearStatus::Ok ? ShearStatus::SingleSample : s;
  }
  if (!(muEff >= T(0)) || !std::isfinite(muEff))
  {
    return fail(ShearStatus::BadInput);
  }

  // Pass 1: validate, and find the largest distance; distances are scaled by
  // it so that d^2 weights neither overflow nor underflow.
  T dMax = T(0);
  for (int i = 0; i < numSamples; ++i)
  {
    const T wi = w ? w[i] : T(1);
    if (!(d[i] > T(0)) || !std::isfinite(d[i]) || !(wi >= T(0)) || !std::isfinite(wi) ||
      !AllFinite(u + 3 * i, 3))
    {
      return fail(ShearStatus::BadInput);
    }
    dMax = d[i] > dMax ? d[i] : dMax;
  }

  // Tangential velocity relative to the wall, divided by the scaled distance
  // s = d/dMax: v = u_t/s = a' + b' s, fitted with weights W = w s^2.
  auto sample = [&](int i, T& s, T& W, T v[3]) {
    s = d[i] / dMax;
    const T wi = w ? w[i] : T(1);
    W = wi * s * s;
    const T du[3] = { u[3 * i] - uW[0], u[3 * i + 1] - uW[1], u[3 * i + 2] - uW[2] };
    T ut[3];
    SplitNormalTangential(du, n, ut);
    v[0] = ut[0] / s;
    v[1] = ut[1] / s;
    v[2] = ut[2] / s;
  };

  // Pass 2: weighted means.
  T sumW = T(0), meanS = T(0);
  T meanV[3] = { 0, 0, 0 };
  for (int i = 0; i < numSamples; ++i)
  {
    T s, W, v[3];
    sample(i, s, W, v);
    sumW += W;
    meanS += W * s;
    meanV[0] += W * v[0];
    meanV[1] += W * v[1];
    meanV[2] += W * v[2];
  }
  if (!(sumW > T(0)))
  {
    return fail(ShearStatus::Degenerate);
  }
  meanS /= sumW;
  meanV[0] /= sumW;
  meanV[1] /= sumW;
  meanV[2] /= sumW;

  // Pass 3: centred second moments.
  T sss = T(0);
  T ssv[3] = { 0, 0, 0 };
  for (int i = 0; i < numSamples; ++i)
  {
    T s, W, v[3];
    sample(i, s, W, v);
    const T ds = s - meanS;
    sss += W * ds * ds;
    ssv[0] += W * ds * (v[0] - meanV[0]);
    ssv[1] += W * ds * (v[1] - meanV[1]);
    ssv[2] += W * ds * (v[2] - meanV[2]);
  }
  const T spread = WallFitDistinctTolerance<T>() * meanS;
  if (!(sss > spread * spread * sumW))
  {
    return fail(ShearStatus::Degenerate);
  }
  for (int c = 0; c < 3; ++c)
  {
    const T b = ssv[c] / sss;  // b' (scaled)
    const T a = meanV[c] - b * meanS; // a' (scaled)
    tau[c] = muEff * a / dMax;
    if (curvature)
    {
      curvature[c] = b / (dMax * dMax);
    }
  }
  return AllFinite(tau, 3) ? ShearStatus::Ok : fail(ShearStatus::BadInput);
}

/// (c) tau_w = t(mu_eff (G + G^T) n) from a row-major gradient G[3i+j] = du_i/dx_j.
template <typename T>
inline ShearStatus GradientWallShear(const T G[9], T muEff, const T n[3], T tau[3])
{
  if (!AllFinite(G, 9) || !AllFinite(n, 3) || !(muEff >= T(0)) || !std::isfinite(muEff))
  {
    detail::FillNaN(tau, 3);
    return ShearStatus::BadInput;
  }
  T traction[3];
  ViscousTractionFromGradient(G, muEff, n, traction);
  SplitNormalTangential(traction, n, tau);
  return ShearStatus::Ok;
}

} // namespace wallloads
