// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Wall traction of a Newtonian fluid (with an eddy-viscosity model).
 *
 * sigma = -(p - p_ref) I + tau,
 * tau   = mu_eff (G + G^T) - (2/3) mu_eff tr(G) I,       G_ij = du_i/dx_j,
 * t     = sigma n, with n the unit normal out of the wall into the fluid
 * (e.g. Batchelor, An Introduction to Fluid Dynamics, 1967, §3.3).
 *
 * The viscous traction tau n is split into its tangential part, the wall shear
 * stress, and its normal part, which vanishes at a no-slip wall in
 * incompressible flow and is kept as a diagnostic.
 */
#include "wallloads/Lanes.h"
#include "wallloads/Vector3.h"

namespace wallloads
{

/// Viscous traction tau n from a row-major velocity gradient G (G[3*i+j] = du_i/dx_j).
template <typename T>
WALLLOADS_FACE_INLINE void ViscousTractionFromGradient(
  const T G[9], const T& muEff, const T n[3], T out[3])
{
  const T trace = G[0] + G[4] + G[8];
  const T bulk = T(2) / T(3) * trace;
  for (int i = 0; i < 3; ++i)
  {
    // (G + G^T) n, row i: sum_j (G_ij + G_ji) n_j
    const T gn = G[3 * i + 0] * n[0] + G[3 * i + 1] * n[1] + G[3 * i + 2] * n[2];
    const T gtn = G[0 + i] * n[0] + G[3 + i] * n[1] + G[6 + i] * n[2];
    out[i] = muEff * (gn + gtn - bulk * n[i]);
  }
}

/// Split a vector into its part along n (returned) and its tangential part.
template <typename T>
WALLLOADS_FACE_INLINE T SplitNormalTangential(const T v[3], const T n[3], T tangential[3])
{
  const T vn = Dot(v, n);
  tangential[0] = v[0] - vn * n[0];
  tangential[1] = v[1] - vn * n[1];
  tangential[2] = v[2] - vn * n[2];
  return vn;
}

/// Everything the per-face traction needs, already reduced to SI units.
template <typename T>
struct FaceTractionInput
{
  const T* Normal = nullptr;          ///< unit normal into the fluid
  T GaugePressure = 0;                ///< p - p_ref, Pa
  const T* ShearVector = nullptr;     ///< wall shear stress (Pa), or nullptr
  const T* VelocityGradient = nullptr; ///< 9 components, or nullptr
  T EffectiveViscosity = 0;           ///< mu + mu_t, Pa s (gradient path only)
  bool IncludeNormalViscousStress = false;
  /// false: ShearMagnitude is left 0 (spares a square root per face when
  /// the caller does not use it; every other output is the same).
  bool WantShearMagnitude = true;
};

template <typename T>
struct FaceTraction
{
  T Pressure[3];        ///< -(p - p_ref) n
  T Viscous[3];         ///< wall shear stress, plus the normal part if included
  T Total[3];           ///< Pressure + Viscous
  T NormalViscous = 0;  ///< (tau n) . n, Pa
  T ShearMagnitude = 0; ///< |wall shear stress|, Pa
};

/**
 * The values of ComputeFaceTraction without its check, for any value type:
 * double for one face, Lanes<W> (Lanes.h) for W faces at once, with the
 * same operations lane by lane.
 */
template <typename T>
WALLLOADS_FACE_INLINE void FaceTractionValues(const FaceTractionInput<T>& in, FaceTraction<T>& out)
{
  const T* n = in.Normal;
  const T dp = in.GaugePressure;
  out.Pressure[0] = -dp * n[0];
  out.Pressure[1] = -dp * n[1];
  out.Pressure[2] = -dp * n[2];

  T viscous[3] = { T(0), T(0), T(0) };
  if (in.VelocityGradient)
  {
    ViscousTractionFromGradient(in.VelocityGradient, in.EffectiveViscosity, n, viscous);
  }
  else if (in.ShearVector)
  {
    viscous[0] = in.ShearVector[0];
    viscous[1] = in.ShearVector[1];
    viscous[2] = in.ShearVector[2];
  }
  T shear[3];
  out.NormalViscous = SplitNormalTangential(viscous, n, shear);
  out.ShearMagnitude = in.WantShearMagnitude ? Norm(shear) : T(0);
  const T keep = in.IncludeNormalViscousStress ? out.NormalViscous : T(0);
  for (int i = 0; i < 3; ++i)
  {
    out.Viscous[i] = shear[i] + keep * n[i];
    out.Total[i] = out.Pressure[i] + out.Viscous[i];
  }
}

/// Traction on one wall face. Returns false if any input is not finite.
template <typename T>
WALLLOADS_FACE_INLINE bool ComputeFaceTraction(const FaceTractionInput<T>& in, FaceTraction<T>& out)
{
  FaceTractionValues(in, out);
  return std::isfinite(in.GaugePressure) && AllFinite(out.Viscous, 3) &&
    std::isfinite(out.NormalViscous);
}

} // namespace wallloads
