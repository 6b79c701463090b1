// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Least-squares gradient of a vector field at a cell centre.
 *
 * With dx_k = x_k - x_0 and du_k = u_k - u_0 for the neighbours k, the
 * gradient G (row-major, G[3i+j] = du_i/dx_j) minimises
 *   sum_k w_k |du_k - G dx_k|^2,
 * i.e. each row g_i solves the 3x3 normal equations
 *   A g_i = b_i,   A = sum_k w_k dx_k dx_k^T,   b_i = sum_k w_k (du_k)_i dx_k
 * (the weighted least-squares reconstruction of cell-centred finite-volume
 * schemes, e.g. Blazek, Computational Fluid Dynamics: Principles and
 * Applications, 2001, ch. 5; chapter recalled from memory).
 * A wall face can add one more row: the wall velocity u_W at the face
 * centroid x_f, with its own weight.
 *
 * Accuracy: exact for linear fields. On a point-symmetric stencil (neighbours
 * in pairs x_0 +- r with equal weights) the quadratic terms cancel, so the
 * gradient is also exact for quadratics and its error is O(h^2); on a
 * one-sided stencil (a wall cell with its wall row) it is O(h).
 *
 * One Cholesky factorisation of A serves the three components. A is first
 * scaled to unit diagonal (Jacobi scaling), which leaves the solution
 * unchanged and takes out the anisotropy of axis-aligned stretched cells.
 * Conditioning: the determinant of the scaled matrix, det(A)/(A_11 A_22 A_33)
 * (its trace is 3, so this is also det/(tr/3)^3), lies in [0, 1] by
 * Hadamard's inequality: 1 when the directions are orthogonal, 0 when the
 * neighbours span fewer than three directions. Below the threshold the status
 * is Degenerate. For a stencil stretched by an aspect ratio AR along a
 * direction oblique to the axes the scaled determinant is about 4/AR^2, so
 * the default 1e-12 (double) accepts aspect ratios up to about 1e6.
 *
 * Rank-deficient neighbourhoods (LeastSquaresGradientInSpan). A mesh one cell
 * thick, as 2-D cases are stored, has every neighbour of a cell in the slab's
 * mid-plane: the neighbours span two directions, and the derivative across
 * the slab is not determined by the data. LeastSquaresGradientInSpan then
 * solves in the subspace the neighbours span: with the eigen-decomposition
 * A = sum_k lambda_k v_k v_k^T, the rows are
 *   g_i = sum over kept k of (v_k . b_i / lambda_k) v_k,
 * the least-squares solution of minimum norm, whose derivative along every
 * dropped direction is zero (for a slab: no variation across it, which is
 * what a 2-D case means). A direction is kept when its eigenvalue is above
 * the coordinate-rounding floor (64 eps times the largest coordinate,
 * squared, times the sum of weights) and above 1e-14 of the largest (the
 * accuracy of the decomposition). The rank (1, 2 or 3) is returned so that
 * the caller can say how often it happened.
 */
#include "wallloads/SmallMatrix.h"
#include "wallloads/Vector3.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>

namespace wallloads
{

enum class GradientStatus : std::uint8_t
{
  Ok = 0,
  Degenerate, ///< fewer than three independent directions (scaled determinant below threshold)
  BadInput    ///< negative number of neighbours or weight, or a value not finite
};

/// Optional extra row of the fit: the wall velocity at the face centroid.
template <typename T>
struct WallConstraint
{
  const T* Point = nullptr; ///< face centroid x_f (3)
  const T* Value = nullptr; ///< wall velocity u_W (3)
  T Weight = T(1);
};

/// Default threshold on the scaled determinant: 1e-12, or 64 ulps for types
/// coarser than double (coplanar stencils give a few ulps from round-off).
template <typename T>
constexpr T GradientConditionThreshold()
{
  return T(64) * std::numeric_limits<T>::epsilon() > T(1e-12)
    ? T(64) * std::numeric_limits<T>::epsilon()
    : T(1e-12);
}

/**
 * Gradient at x0 (value u0) from `numNeighbours` neighbours at `xk[3k..3k+2]`
 * with values `uk[3k..3k+2]` and weights `wk[k]` (nullptr: all 1), plus the
 * optional wall row. Writes G[3i+j] = du_i/dx_j; NaN unless Ok.
 */
template <typename T>
GradientStatus LeastSquaresGradient(const T x0[3], const T u0[3], const T* xk, const T* uk,
  const T* wk, int numNeighbours, T G[9], const WallConstraint<T>* wall = nullptr,
  T threshold = GradientConditionThreshold<T>())
{
  const T nan = std::numeric_limits<T>::quiet_NaN();
  auto fail = [&](GradientStatus status) {
    for (int i = 0; i < 9; ++i)
    {
      G[i] = nan;
    }
    return status;
  };
  if (numNeighbours < 0 || !AllFinite(x0, 3) || !AllFinite(u0, 3))
  {
    return fail(GradientStatus::BadInput);
  }
  // A (symmetric: a00 a01 a02 a11 a12 a22) and B[i][j] = sum w du_i dx_j.
  T a00 = 0, a01 = 0, a02 = 0, a11 = 0, a12 = 0, a22 = 0;
  T B[3][3] = { { 0, 0, 0 }, { 0, 0, 0 }, { 0, 0, 0 } };
  int rows = 0;
  T weights = 0;
  T reach = std::max(std::abs(x0[0]), std::max(std::abs(x0[1]), std::abs(x0[2])));
  auto addRow = [&](const T* x, const T* u, T w) {
    if (!(w >= T(0)) || !std::isfinite(w) || !AllFinite(x, 3) || !AllFinite(u, 3))
    {
      return false;
    }
    // Differences first: stencils far from the origin keep their digits.
    const T dx[3] = { x[0] - x0[0], x[1] - x0[1], x[2] - x0[2] };
    const T du[3] = { u[0] - u0[0], u[1] - u0[1], u[2] - u0[2] };
    const T wx[3] = { w * dx[0], w * dx[1], w * dx[2] };
    a00 += wx[0] * dx[0];
    a01 += wx[0] * dx[1];
    a02 += wx[0] * dx[2];
    a11 += wx[1] * dx[1];
    a12 += wx[1] * dx[2];
    a22 += wx[2] * dx[2];
    for (int i = 0; i < 3; ++i)
    {
      B[i][0] += du[i] * wx[0];
      B[i][1] += du[i] * wx[1];
      B[i][2] += du[i] * wx[2];
    }
    rows += w > T(0) ? 1 : 0;
    weights += w;
    reach = std::max(reach, std::max(std::abs(x[0]), std::max(std::abs(x[1]), std::abs(x[2]))));
    return true;
  };
  for (int k = 0; k < numNeighbours; ++k)
  {
    if (!addRow(xk + 3 * k, uk + 3 * k, wk ? wk[k] : T(1)))
    {
      return fail(GradientStatus::BadInput);
    }
  }
  if (wall && wall->Point && wall->Value)
  {
    if (!addRow(wall->Point, wall->Value, wall->Weight))
    {
      return fail(GradientStatus::BadInput);
    }
  }
  if (rows < 3 || !(a00 > T(0)) || !(a11 > T(0)) || !(a22 > T(0)))
  {
    return fail(GradientStatus::Degenerate);
  }
  if (!std::isfinite(a00) || !std::isfinite(a11) || !std::isfinite(a22))
  {
    return fail(GradientStatus::BadInput);
  }
  // A direction whose spread is at the rounding level of the coordinates
  // (a mesh one cell thick, whose only offset across is round-off) carries
  // no information; Jacobi scaling would make it look well conditioned.
  {
    const T floor = T(64) * std::numeric_limits<T>::epsilon() * reach;
    const T least = floor * floor * weights;
    if (!(a00 > least) || !(a11 > least) || !(a22 > least))
    {
      return fail(GradientStatus::Degenerate);
    }
  }
  // Jacobi scaling: S = D^-1/2 A D^-1/2 has unit diagonal.
  const T s[3] = { T(1) / std::sqrt(a00), T(1) / std::sqrt(a11), T(1) / std::sqrt(a22) };
  const T s01 = a01 * s[0] * s[1];
  const T s02 = a02 * s[0] * s[2];
  const T s12 = a12 * s[1] * s[2];
  // Cholesky S = L L^T; det(S) = (l00 l11 l22)^2 with l00 = 1.
  const T l10 = s01;
  const T l20 = s02;
  const T p1 = T(1) - l10 * l10;
  if (!(p1 > T(0)))
  {
    return fail(GradientStatus::Degenerate);
  }
  const T l11 = std::sqrt(p1);
  const T l21 = (s12 - l20 * l10) / l11;
  const T p2 = T(1) - l20 * l20 - l21 * l21;
  if (!(p1 * p2 > threshold))
  {
    return fail(GradientStatus::Degenerate);
  }
  const T l22 = std::sqrt(p2);
  for (int i = 0; i < 3; ++i)
  {
    // Solve S y = D^-1/2 b_i, then g_i = D^-1/2 y.
    const T r0 = B[i][0] * s[0];
    const T r1 = B[i][1] * s[1];
    const T r2 = B[i][2] * s[2];
    const T z0 = r0;
    const T z1 = (r1 - l10 * z0) / l11;
    const T z2 = (r2 - l20 * z0 - l21 * z1) / l22;
    const T y2 = z2 / l22;
    const T y1 = (z1 - l21 * y2) / l11;
    const T y0 = z0 - l10 * y1 - l20 * y2;
    G[3 * i + 0] = y0 * s[0];
    G[3 * i + 1] = y1 * s[1];
    G[3 * i + 2] = y2 * s[2];
  }
  return AllFinite(G, 9) ? GradientStatus::Ok : fail(GradientStatus::BadInput);
}

/**
 * As LeastSquaresGradient, but a neighbourhood spanning fewer than three
 * directions gives the gradient in the spanned subspace (see the header
 * comment) instead of Degenerate. `rank` is 3 for a full solve, 1 or 2 for a
 * reduced one, 0 otherwise. Degenerate only without any direction above the
 * floors (no neighbour, or all at x0).
 */
template <typename T>
GradientStatus LeastSquaresGradientInSpan(const T x0[3], const T u0[3], const T* xk, const T* uk,
  const T* wk, int numNeighbours, T G[9], int& rank, const WallConstraint<T>* wall = nullptr)
{
  rank = 0;
  const GradientStatus full = LeastSquaresGradient(x0, u0, xk, uk, wk, numNeighbours, G, wall);
  if (full != GradientStatus::Degenerate)
  {
    rank = full == GradientStatus::Ok ? 3 : 0;
    return full;
  }
  // The same sums as the full solve (inputs already validated there).
  T A[9] = { 0, 0, 0, 0, 0, 0, 0, 0, 0 };
  T B[3][3] = { { 0, 0, 0 }, { 0, 0, 0 }, { 0, 0, 0 } };
  T weights = 0;
  T reach = std::max(std::abs(x0[0]), std::max(std::abs(x0[1]), std::abs(x0[2])));
  auto addRow = [&](const T* x, const T* u, T w) {
    const T dx[3] = { x[0] - x0[0], x[1] - x0[1], x[2] - x0[2] };
    const T du[3] = { u[0] - u0[0], u[1] - u0[1], u[2] - u0[2] };
    for (int r = 0; r < 3; ++r)
    {
      for (int c = r; c < 3; ++c)
      {
        A[3 * r + c] += w * dx[r] * dx[c];
      }
      for (int i = 0; i < 3; ++i)
      {
        B[i][r] += w * du[i] * dx[r];
      }
    }
    weights += w;
    reach = std::max(reach, std::max(std::abs(x[0]), std::max(std::abs(x[1]), std::abs(x[2]))));
  };
  for (int k = 0; k < numNeighbours; ++k)
  {
    addRow(xk + 3 * k, uk + 3 * k, wk ? wk[k] : T(1));
  }
  if (wall && wall->Point && wall->Value)
  {
    addRow(wall->Point, wall->Value, wall->Weight);
  }
  T lambda[3], V[9];
  SymmetricEigen3(A, lambda, V);
  const T floor = T(64) * std::numeric_limits<T>::epsilon() * reach;
  const T least = std::max(floor * floor * weights, T(1e-14) * lambda[0]);
  for (int i = 0; i < 9; ++i)
  {
    G[i] = T(0);
  }
  for (int k = 0; k < 3; ++k)
  {
    if (!(lambda[k] > least))
    {
      continue;
    }
    ++rank;
    const T v[3] = { V[k], V[3 + k], V[6 + k] };
    for (int i = 0; i < 3; ++i)
    {
      const T c = (v[0] * B[i][0] + v[1] * B[i][1] + v[2] * B[i][2]) / lambda[k];
      for (int j = 0; j < 3; ++j)
      {
        G[3 * i + j] += c * v[j];
      }
    }
  }
  if (rank == 0 || !AllFinite(G, 9))
  {
    rank = 0;
    for (int i = 0; i < 9; ++i)
    {
      G[i] = std::numeric_limits<T>::quiet_NaN();
    }
    return GradientStatus::Degenerate;
  }
  return GradientStatus::Ok;
}

} // namespace wallloads
