// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Second-order wall fit on any near-wall cells: a quadratic least-squares
 * reconstruction of the velocity around a wall face, anchored by no slip at
 * the face's corners, whose gradient at the face centroid gives the wall
 * shear stress.
 *
 * Derivation (our own). Near a wall face f (centroid x_f, unit normal n into
 * the fluid) a smooth velocity field is, by Taylor's theorem,
 *   u(x) = c + G r + (1/2) r^T H r + O(|r|^3),   r = x - x_f,          (1)
 * with c = u(x_f), G the gradient and H the Hessian at x_f. The wall shear
 * stress is the tangential part of mu (G + G^T) n (NearWallShear.h (c)).
 * Fit (1), truncated after the quadratic terms, by weighted least squares to
 *   - the near-wall cells: the adjacent cell P and its neighbours (sharing a
 *     face or a corner with P), with their velocities at their centres, and
 *   - the wall: the face's corner points with the wall velocity (no slip).
 * The fit reproduces any quadratic field exactly, whatever the shapes and
 * positions of the cells, as long as the samples determine the ten
 * coefficients (per component) of (1); for a smooth field its gradient at
 * x_f is then in error by O(h^2), h the stencil size: second order. Nothing
 * assumes cells stacked off the wall, so tetrahedra, prisms and the wedges of
 * a triangulated 2-D mesh are handled like hexahedra.
 *
 * Why the corners, not the centroid, carry no slip: a faceted curved wall's
 * vertices lie on the true wall (mesh generators place them there), while the
 * centroid of a flat face lies inside it by O(h^2) (the sagitta). Imposing
 * u = u_W at the centroid would misplace the wall by O(h^2) and, divided by
 * the near-wall distance O(h), cost an O(h) error; at the corners no slip is
 * where the wall is, and second order survives on curved walls. With a point
 * wall velocity the corners carry its own values, so a moving wall's
 * along-wall variation enters G (and so the G^T n part of the shear) from the
 * data; with one value per face it is taken uniform over the face.
 *
 * Local frame and rank. Coordinates are taken in an orthonormal frame
 * (n, t1, t2) and scaled by the stencil size. The wall-normal axis n is
 * always kept (the adjacent cell lies off the wall). The tangential axes are
 * those along which the cell samples spread: the eigenvectors of
 * sum_k t(r_k) t(r_k)^T above the coordinate-rounding floor (64 times the
 * rounding of the coordinates, squared, per sample) and above 1e-14 of the
 * largest. On a mesh one cell thick (a 2-D case) every cell centre lies in
 * the mid-plane, the spread across is zero, and the fit is taken in the
 * plane: six coefficients (1, two linear, three quadratic), the wall corners
 * projected onto the plane, derivatives across it zero. `Dimension` reports
 * 3, 2 or 1.
 *
 * Weights: w_k = 1/(|r_k|^2/s^2 + 1e-4), s the stencil size (inverse squared
 * distance from x_f, bounded): near samples, whose truncation error is
 * smallest, count most; on stretched near-wall cells the samples stacked off
 * the wall dominate those along it. Exactness for quadratics does not depend
 * on the weights.
 *
 * Sample selection: cells behind the face's plane by more than half their
 * along-wall offset (d_k < -0.5 |t(r_k)|, about 27 degrees) are left out:
 * they are round a sharp edge or across a thin plate, not above this face.
 * On a smoothly curved wall the cells beside P lie below the face's plane by
 * only |t(r)|^2/(2R), and stay.
 *
 * The solve uses the normal equations (column-scaled, Cholesky) where their
 * pivots stay above 1e-8, and a Householder QR of the weighted design matrix
 * otherwise (SmallMatrix.h): the normal equations square the condition
 * number, so they are kept for well-spread stencils, the common case. Status TooFewSamples when fewer samples than
 * coefficients, IllConditioned when the samples do not determine them (QR
 * diagonal below 1e-10 of the largest after column scaling), and
 * NoNormalCurvature when the samples do not determine the curvature of the
 * profile along the normal (no second distance from the wall: the fit would
 * be first order); the caller then falls back to the near-wall difference
 * and says why. Other terms the samples do not determine (a curvature along
 * the wall across a one-sided stencil) are left out of the fit.
 */
#include "wallloads/SmallMatrix.h"
#include "wallloads/Vector3.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>

namespace wallloads
{

enum class WallFitStatus : std::uint8_t
{
  Ok = 0,
  TooFewSamples,  ///< fewer samples than coefficients of the quadratic
  IllConditioned, ///< the samples do not determine the quadratic
  NoNormalCurvature, ///< no second distance from the wall: the profile's curvature is undetermined
  BadInput        ///< a value not finite, no cell, or a zero normal
};

/// Most samples (cells plus wall corners) the fit takes; more are ignored.
constexpr int WallFitMaxSamples = 64;

/// What a fit used: its dimension (3, or 2 in a plane, or 1) and samples.
struct WallFitInfo
{
  int Dimension = 0;   ///< 3, or 2 (in a plane: a slab), or 1
  int CellsUsed = 0;   ///< cell samples that entered the fit
  int CellsBehind = 0; ///< cell samples left out (behind the face's plane)
};

template <typename T>
struct WallFitResult : WallFitInfo
{
  T G[9]; ///< velocity gradient at x_f, row-major du_i/dx_j
};

namespace detail
{
/// A fit's basis: monomials of the local coordinates (xi_0 along n, then the
/// tangential ones), as exponents; the constant first, then the linear terms
/// (whose coefficients are the gradient), then the rest.
struct FitBasis
{
  int Columns = 0;
  int Exponents[13][3];
  void Add(int a, int b, int c)
  {
    this->Exponents[this->Columns][0] = a;
    this->Exponents[this->Columns][1] = b;
    this->Exponents[this->Columns][2] = c;
    ++this->Columns;
  }
  /// The quadratic in `dim` coordinates; with `alongWall`, also xi_0 xi_a xi_b
  /// for the tangential a <= b (the wall gradient varying quadratically along
  /// the wall).
  static FitBasis Make(int dim, bool alongWall)
  {
    FitBasis basis;
    basis.Add(0, 0, 0);
    for (int a = 0; a < dim; ++a)
    {
      basis.Add(a == 0, a == 1, a == 2);
    }
    for (int a = 0; a < dim; ++a)
    {
      for (int b = a; b < dim; ++b)
      {
        basis.Add((a == 0) + (b == 0), (a == 1) + (b == 1), (a == 2) + (b == 2));
      }
    }
    for (int a = 1; alongWall && a < dim; ++a)
    {
      for (int b = a; b < dim; ++b)
      {
        basis.Add(1, (a == 1) + (b == 1), (a == 2) + (b == 2));
      }
    }
    return basis;
  }
  template <typename T>
  void Evaluate(const T xi[3], T* m) const
  {
    for (int i = 0; i < this->Columns; ++i)
    {
      T v = T(1);
      for (int c = 0; c < 3; ++c)
      {
        for (int e = 0; e < this->Exponents[i][c]; ++e)
        {
          v *= xi[c];
        }
      }
      m[i] = v;
    }
  }
};

/// Rows 1..dim of N^-1 (the gradient rows), by N Y = [e_1 .. e_dim]: the
/// normal matrix of `basis` over the samples, C columns.
template <typename T, int C>
bool GradientRowsOfInverse(
  const FitBasis& basis, const T (*xi)[3], const T* w, int m, int dim, T* Y, bool* dropped)
{
  T N[C][C] = {};
  for (int k = 0; k < m; ++k)
  {
    T mono[C];
    basis.Evaluate(xi[k], mono);
    for (int i = 0; i < C; ++i)
    {
      const T wi = w[k] * mono[i];
      for (int j = 0; j < C; ++j)
      {
        N[i][j] += wi * mono[j];
      }
    }
  }
  T rhs[C][3] = {};
  for (int a = 0; a < dim; ++a)
  {
    rhs[1 + a][a] = T(1);
  }
  // The constant and the gradient must be determined; a higher term that
  // the samples do not determine (e.g. a curvature across a one-sided
  // stencil) is left out.
  return CholeskySolveScaled<T, C, 3>(N, rhs, Y, T(1e-6), 1 + dim, dropped);
}

template <typename T>
bool GradientRows(
  const FitBasis& basis, const T (*xi)[3], const T* w, int m, int dim, T* Y, bool* dropped)
{
  switch (basis.Columns)
  {
    case 3:
      return GradientRowsOfInverse<T, 3>(basis, xi, w, m, dim, Y, dropped);
    case 6:
      return GradientRowsOfInverse<T, 6>(basis, xi, w, m, dim, Y, dropped);
    case 7:
      return GradientRowsOfInverse<T, 7>(basis, xi, w, m, dim, Y, dropped);
    case 10:
      return GradientRowsOfInverse<T, 10>(basis, xi, w, m, dim, Y, dropped);
    case 13:
      return GradientRowsOfInverse<T, 13>(basis, xi, w, m, dim, Y, dropped);
    default:
      return false;
  }
}
} // namespace detail

/**
 * The weights of the fit: the fit is linear in the sample velocities, so its
 * gradient at x_f is G = sum_k u_k gamma_k^T over the cell samples and the
 * wall samples. Writes gamma (3 per sample) for the `numCells` cells at
 * `xc[3k..]` (the adjacent cell first; zero for cells left out) and the
 * `numWall` wall samples at `xw[3k..]`; geometry only, so that a caller can
 * keep them while the mesh does not change. Arguments as QuadraticWallFit.
 */
template <typename T>
WallFitStatus QuadraticWallFitWeights(const T xf[3], const T n[3], const T* xc, int numCells,
  const T* xw, int numWall, T rounding, T* gammaCells, T* gammaWall, WallFitInfo& info)
{
  info = WallFitInfo();
  numWall = std::max(numWall, 0);
  for (int k = 0; k < 3 * std::max(numCells, 0); ++k)
  {
    gammaCells[k] = T(0);
  }
  for (int k = 0; k < 3 * numWall; ++k)
  {
    gammaWall[k] = T(0);
  }
  if (numCells < 1 || !AllFinite(xf, 3) || !AllFinite(n, 3) || !(std::abs(Norm(n) - T(1)) < T(1e-6)))
  {
    return WallFitStatus::BadInput;
  }
  const int usedCells = std::min(numCells, WallFitMaxSamples);
  const int usedWall = std::min(numWall, WallFitMaxSamples - usedCells);

  // Offsets, sample selection, stencil size.
  T r[WallFitMaxSamples][3];
  T* gamma[WallFitMaxSamples];
  bool isCell[WallFitMaxSamples];
  int m = 0;
  T size = 0;
  for (int k = 0; k < usedCells + usedWall; ++k)
  {
    const bool cell = k < usedCells;
    const T* x = cell ? xc + 3 * k : xw + 3 * (k - usedCells);
    if (!AllFinite(x, 3))
    {
      return WallFitStatus::BadInput;
    }
    const T d[3] = { x[0] - xf[0], x[1] - xf[1], x[2] - xf[2] };
    const T d2 = Dot(d, d);
    if (cell && k > 0)
    {
      // Behind the plane by more than half the along-wall offset:
      // dn < -|t|/2, i.e. dn < 0 and dn^2 > (|d|^2 - dn^2)/4.
      const T dn = Dot(d, n);
      if (dn < T(0) && T(5) * dn * dn > d2)
      {
        ++info.CellsBehind;
        continue;
      }
    }
    r[m][0] = d[0];
    r[m][1] = d[1];
    r[m][2] = d[2];
    gamma[m] = cell ? gammaCells + 3 * k : gammaWall + 3 * (k - usedCells);
    isCell[m] = cell;
    info.CellsUsed += cell ? 1 : 0;
    size = std::max(size, d2);
    ++m;
  }
  size = std::sqrt(size);
  if (!(size > T(0)) || !std::isfinite(size))
  {
    return WallFitStatus::BadInput;
  }

  // Frame: n, then the tangential directions the cells spread along.
  T S[9] = { 0, 0, 0, 0, 0, 0, 0, 0, 0 };
  for (int k = 0; k < m; ++k)
  {
    if (!isCell[k])
    {
      continue;
    }
    const T dn = Dot(r[k], n);
    const T t[3] = { r[k][0] - dn * n[0], r[k][1] - dn * n[1], r[k][2] - dn * n[2] };
    S[0] += t[0] * t[0];
    S[1] += t[0] * t[1];
    S[2] += t[0] * t[2];
    S[4] += t[1] * t[1];
    S[5] += t[1] * t[2];
    S[8] += t[2] * t[2];
  }
  T lambda[3], V[9];
  SymmetricEigen3(S, lambda, V);
  const T floor = T(64) * rounding;
  const T least = std::max(floor * floor * T(info.CellsUsed), T(1e-14) * lambda[0]);
  T E[3][3] = { { n[0], n[1], n[2] } };
  int dim = 1;
  for (int k = 0; k < 2; ++k) // the third eigenvalue is the (zero) normal one
  {
    if (lambda[k] > least && lambda[k] > T(0))
    {
      T e[3] = { V[k], V[3 + k], V[6 + k] };
      // Exactly tangential, unit (the decomposition leaves round-off along n).
      const T en = Dot(e, n);
      for (int c = 0; c < 3; ++c)
      {
        e[c] -= en * n[c];
      }
      const T len = Norm(e);
      for (int c = 0; c < 3; ++c)
      {
        E[dim][c] = e[c] / len;
      }
      ++dim;
    }
  }
  info.Dimension = dim;
  // The richer basis first (the wall gradient varying along the wall), then
  // the plain quadratic where the samples do not determine it.
  const detail::FitBasis rich = detail::FitBasis::Make(dim, true);
  const detail::FitBasis plain = detail::FitBasis::Make(dim, false);
  if (m < plain.Columns)
  {
    return WallFitStatus::TooFewSamples;
  }

  // Local coordinates (scaled by the stencil size) and weights.
  const T inv = T(1) / size;
  T xi[WallFitMaxSamples][3];
  T w[WallFitMaxSamples];
  for (int k = 0; k < m; ++k)
  {
    T xi2 = 0;
    for (int a = 0; a < 3; ++a)
    {
      xi[k][a] = a < dim ? Dot(E[a], r[k]) * inv : T(0);
      xi2 += xi[k][a] * xi[k][a];
    }
    w[k] = T(1) / (xi2 + T(1e-4));
  }
  // gamma_k = sum_a c_ka e_a / size, c_ka the weight of sample k in d u/d xi_a.
  auto store = [&](int k, const T* c) {
    for (int j = 0; j < 3; ++j)
    {
      T g = 0;
      for (int a = 0; a < dim; ++a)
      {
        g += c[a] * E[a][j];
      }
      gamma[k][j] = g * inv;
    }
  };
  // Normal equations: Y = rows 1..dim of N^-1, N = sum_k w_k m_k m_k^T; the
  // weight of sample k for d/dxi_a is then w_k (m_k . Y_a).
  bool solved = false;
  for (const detail::FitBasis* basis : { &rich, &plain })
  {
    if (solved || m < basis->Columns || (basis == &rich && rich.Columns == plain.Columns))
    {
      continue;
    }
    T Y[13 * 3];
    bool dropped[13];
    if (!detail::GradientRows(*basis, xi, w, m, dim, Y, dropped))
    {
      continue;
    }
    // The curvature along the normal (xi_0^2, the fourth column of every
    // basis here: 1, the linear terms, then xi_0^2) is what makes the fit
    // second order; without it the fit is the near-wall difference's
    // order, and the caller is told.
    if (dropped[1 + dim])
    {
      return WallFitStatus::NoNormalCurvature;
    }
    for (int k = 0; k < m; ++k)
    {
      T mono[13];
      basis->Evaluate(xi[k], mono);
      T c[3] = { 0, 0, 0 };
      for (int a = 0; a < dim; ++a)
      {
        for (int i = 0; i < basis->Columns; ++i)
        {
          c[a] += mono[i] * Y[i * 3 + a];
        }
        c[a] *= w[k];
      }
      store(k, c);
    }
    solved = true;
  }
  if (!solved)
  {
    // The normal equations would lose digits: Householder QR of the weighted
    // design matrix of the plain quadratic, right-hand sides diag(sqrt(w)),
    // so that column k of the solution is the weight of sample k.
    const int cols = plain.Columns;
    T A[WallFitMaxSamples * 10];
    T B[WallFitMaxSamples * WallFitMaxSamples] = {};
    T X[10 * WallFitMaxSamples];
    for (int k = 0; k < m; ++k)
    {
      const T sw = std::sqrt(w[k]);
      T mono[10];
      plain.Evaluate(xi[k], mono);
      for (int i = 0; i < cols; ++i)
      {
        A[k * cols + i] = sw * mono[i];
      }
      B[k * m + k] = sw;
    }
    if (!HouseholderLeastSquares(A, B, m, cols, m, X))
    {
      for (int k = 0; k < m; ++k)
      {
        gamma[k][0] = gamma[k][1] = gamma[k][2] = T(0);
      }
      return WallFitStatus::IllConditioned;
    }
    for (int k = 0; k < m; ++k)
    {
      const T c[3] = { X[1 * m + k], dim > 1 ? X[2 * m + k] : T(0), dim > 2 ? X[3 * m + k] : T(0) };
      store(k, c);
    }
  }
  for (int k = 0; k < m; ++k)
  {
    if (!AllFinite(gamma[k], 3))
    {
      return WallFitStatus::BadInput;
    }
  }
  return WallFitStatus::Ok;
}

/// G = sum_k u_k gamma_k^T over cell and wall samples (row-major du_i/dx_j).
template <typename T>
inline void ApplyWallFitWeights(const T* gammaCells, const T* uc, int numCells,
  const T* gammaWall, const T* uw, int numWall, T G[9])
{
  for (int i = 0; i < 9; ++i)
  {
    G[i] = T(0);
  }
  auto add = [G](const T* g, const T* u) {
    for (int i = 0; i < 3; ++i)
    {
      G[3 * i] += u[i] * g[0];
      G[3 * i + 1] += u[i] * g[1];
      G[3 * i + 2] += u[i] * g[2];
    }
  };
  for (int k = 0; k < numCells; ++k)
  {
    add(gammaCells + 3 * k, uc + 3 * k);
  }
  for (int k = 0; k < numWall; ++k)
  {
    add(gammaWall + 3 * k, uw + 3 * k);
  }
}

/**
 * Fit around face centroid `xf` with unit normal `n` (into the fluid):
 * `numCells` cell samples at `xc[3k..]` with velocities `uc[3k..]` (the
 * adjacent cell first), `numWall` wall samples (face corners) at `xw[3k..]`
 * with wall velocities `uw[3k..]`. `rounding` is the absolute rounding of the
 * coordinates (machine epsilon of the point type times the largest
 * coordinate). On Ok, `out.G` holds the gradient at xf; otherwise NaN.
 */
template <typename T>
WallFitStatus QuadraticWallFit(const T xf[3], const T n[3], const T* xc, const T* uc,
  int numCells, const T* xw, const T* uw, int numWall, T rounding, WallFitResult<T>& out)
{
  numCells = std::min(std::max(numCells, 0), WallFitMaxSamples);
  numWall = std::min(std::max(numWall, 0), WallFitMaxSamples);
  T gc[3 * WallFitMaxSamples], gw[3 * WallFitMaxSamples];
  WallFitStatus status = QuadraticWallFitWeights(xf, n, xc, numCells, xw, numWall, rounding, gc, gw,
    static_cast<WallFitInfo&>(out));
  if (status == WallFitStatus::Ok && (!AllFinite(uc, 3 * numCells) || !AllFinite(uw, 3 * numWall)))
  {
    status = WallFitStatus::BadInput;
  }
  if (status != WallFitStatus::Ok)
  {
    for (T& g : out.G)
    {
      g = std::numeric_limits<T>::quiet_NaN();
    }
    return status;
  }
  ApplyWallFitWeights(gc, uc, numCells, gw, uw, numWall, out.G);
  return AllFinite(out.G, 9) ? WallFitStatus::Ok : WallFitStatus::BadInput;
}

} // namespace wallloads
