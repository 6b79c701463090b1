// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Wall quantities that follow from the wall shear stress and the near-wall
 * cell, shared by every reconstruction method of Shear Projection.
 *
 * Conventions as in NearWallShear.h: n the unit wall normal into the fluid,
 * t(v) = v - (v . n) n, d the wall distance of the near-wall sample.
 *
 * - Wall-law shear: with the friction velocity u_tau from the law of the wall
 *   (WallLaw.h) for the tangential speed U = |t(u_P - u_W)| at distance d,
 *   tau_w = rho u_tau^2 along t(u_P - u_W) (the wall law gives a magnitude;
 *   the near-wall velocity gives the direction).
 * - Friction velocity u_tau = sqrt(|tau_w|/rho) and y+ = d u_tau / nu (the
 *   definitions, e.g. Pope, Turbulent Flows, 2000, §7.1; section recalled
 *   from memory).
 * - Along-wall term: tau n = mu (G + G^T) n; the methods that take the
 *   wall-normal derivative of the tangential velocity (G n) miss t(mu G^T n),
 *   mu times the derivative along the wall of the normal velocity. At the wall
 *   that is the wall velocity's: zero on stationary and translating walls,
 *   half of the shear on a spinning cylinder. With W the wall velocity's
 *   gradient in the face plane, the term is mu t(W^T n).
 * - Face gradient of a point field: Green-Gauss over the face polygon,
 *   grad_s u = (1/A) sum over edges of the edge-mean value times the in-plane
 *   edge normal e x n; exact for fields linear in the face plane (the
 *   divergence theorem in the plane).
 */
#include "wallloads/Traction.h"
#include "wallloads/Vector3.h"
#include "wallloads/WallLaw.h"

#include <cmath>
#include <cstdint>
#include <limits>

namespace wallloads
{

/// tau = rho u_tau^2 along t(u_P - u_W), u_tau from Spalding's law (WallLaw.h).
/// Returns the wall-law status; tau is NaN unless Ok.
template <typename T>
WallLawStatus WallLawShear(const T uP[3], const T uW[3], const T n[3], T d, T nu, T rho, T kappa,
  T B, T tau[3])
{
  const T nan = std::numeric_limits<T>::quiet_NaN();
  tau[0] = tau[1] = tau[2] = nan;
  const T du[3] = { uP[0] - uW[0], uP[1] - uW[1], uP[2] - uW[2] };
  T ut[3];
  SplitNormalTangential(du, n, ut);
  const T U = Norm(ut);
  FrictionVelocityResult<T> r;
  const WallLawStatus status = SolveSpaldingFrictionVelocity(U, d, nu, r, kappa, B);
  if (status != WallLawStatus::Ok)
  {
    return status;
  }
  // Zero speed: zero shear (no direction).
  const T scale = U > T(0) ? rho * r.FrictionVelocity * r.FrictionVelocity / U : T(0);
  for (int k = 0; k < 3; ++k)
  {
    tau[k] = scale * ut[k];
  }
  return status;
}

/// tau += mu_eff t(W^T n), W the in-plane wall velocity gradient (row-major du_i/dx_j).
template <typename T>
inline void AddAlongWallShear(const T W[9], const T n[3], T muEff, T tau[3])
{
  T gtn[3];
  for (int j = 0; j < 3; ++j)
  {
    gtn[j] = W[j] * n[0] + W[3 + j] * n[1] + W[6 + j] * n[2];
  }
  T along[3];
  SplitNormalTangential(gtn, n, along);
  for (int k = 0; k < 3; ++k)
  {
    tau[k] += muEff * along[k];
  }
}

/**
 * Green-Gauss gradient in the face plane of a 3-component point field:
 * corner k at `xyz[3k..]` with value `u[3k..]`, `numCorners` corners in
 * polygon order, unit normal `n` and area `area` of the face. Writes
 * W[3i+j] = du_i/dx_j (zero along n). W is zero for area <= 0.
 */
template <typename T>
void FaceVelocityGradient(const T* xyz, const T* u, int numCorners, const T n[3], T area, T W[9])
{
  for (int k = 0; k < 9; ++k)
  {
    W[k] = T(0);
  }
  if (!(area > T(0)))
  {
    return;
  }
  for (int j = 0; j < numCorners; ++j)
  {
    const int a = j;
    const int b = (j + 1) % numCorners;
    const T e[3] = { xyz[3 * b] - xyz[3 * a], xyz[3 * b + 1] - xyz[3 * a + 1],
      xyz[3 * b + 2] - xyz[3 * a + 2] };
    T en[3];
    Cross(e, n, en);
    for (int i = 0; i < 3; ++i)
    {
      const T mean = T(0.5) * (u[3 * a + i] + u[3 * b + i]);
      for (int k = 0; k < 3; ++k)
      {
        W[3 * i + k] += mean * en[k] / area;
      }
    }
  }
}

/**
 * The wall-normal part of the shear from a gradient G (row-major
 * du_i/dx_j): tau = mu_eff t(G n), the derivative of the tangential
 * velocity along the normal. The other part, mu_eff t(G^T n), is the
 * along-wall term above: at a no-slip wall it is the wall velocity's, so a
 * reconstruction near the wall need not estimate it from the volume.
 */
template <typename T>
inline void NormalDerivativeShear(const T G[9], const T n[3], T muEff, T tau[3])
{
  T gn[3];
  for (int i = 0; i < 3; ++i)
  {
    gn[i] = muEff * (G[3 * i] * n[0] + G[3 * i + 1] * n[1] + G[3 * i + 2] * n[2]);
  }
  SplitNormalTangential(gn, n, tau);
}

/// u_tau = sqrt(|tau|/rho) and y+ = d u_tau / nu.
template <typename T>
inline void FrictionVelocityAndYPlus(const T tau[3], T rho, T d, T nu, T& utau, T& yplus)
{
  utau = std::sqrt(Norm(tau) / rho);
  yplus = d * utau / nu;
}

} // namespace wallloads
