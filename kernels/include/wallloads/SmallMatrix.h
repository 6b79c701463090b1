// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Small dense linear algebra for the per-face fits: the eigen-decomposition
 * of a symmetric 3x3 matrix by cyclic Jacobi rotations, and a weighted
 * least-squares solve by Householder QR. Fixed sizes, no allocation.
 *
 * Jacobi's method converges quadratically and gives eigenvalues with small
 * absolute error, about eps times the largest (Golub & Van Loan, Matrix
 * Computations, 3rd ed., §8.4; section recalled from memory), which is all
 * the rank decisions here need. Householder QR solves least squares without
 * forming the normal equations, so the error grows with the condition number
 * of the design matrix, not with its square (Golub & Van Loan §5.3; recalled
 * from memory).
 */
#include <algorithm>
#include <cmath>
#include <limits>

namespace wallloads
{

/**
 * Eigenvalues (descending, `lambda`) and unit eigenvectors (columns of V,
 * V[3*r + c] is row r of eigenvector c) of the symmetric 3x3 matrix A
 * (row-major; only its upper triangle is read).
 */
template <typename T>
void SymmetricEigen3(const T A[9], T lambda[3], T V[9])
{
  T a[3][3] = { { A[0], A[1], A[2] }, { A[1], A[4], A[5] }, { A[2], A[5], A[8] } };
  T v[3][3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  for (int sweep = 0; sweep < 50; ++sweep)
  {
    const T off = std::abs(a[0][1]) + std::abs(a[0][2]) + std::abs(a[1][2]);
    const T diag = std::abs(a[0][0]) + std::abs(a[1][1]) + std::abs(a[2][2]);
    if (!(off > T(0)) || off <= std::numeric_limits<T>::min() ||
      off < std::numeric_limits<T>::epsilon() * std::numeric_limits<T>::epsilon() * diag)
    {
      break;
    }
    for (int p = 0; p < 2; ++p)
    {
      for (int q = p + 1; q < 3; ++q)
      {
        if (a[p][q] == T(0))
        {
          continue;
        }
        // Rotation that zeroes a[p][q] (the stable form of the angle).
        const T theta = (a[q][q] - a[p][p]) / (T(2) * a[p][q]);
        const T t = (theta >= T(0) ? T(1) : T(-1)) /
          (std::abs(theta) + std::sqrt(theta * theta + T(1)));
        const T c = T(1) / std::sqrt(t * t + T(1));
        const T s = t * c;
        for (int k = 0; k < 3; ++k)
        {
          const T akp = a[k][p], akq = a[k][q];
          a[k][p] = c * akp - s * akq;
          a[k][q] = s * akp + c * akq;
        }
        for (int k = 0; k < 3; ++k)
        {
          const T apk = a[p][k], aqk = a[q][k];
          a[p][k] = c * apk - s * aqk;
          a[q][k] = s * apk + c * aqk;
        }
        for (int k = 0; k < 3; ++k)
        {
          const T vkp = v[k][p], vkq = v[k][q];
          v[k][p] = c * vkp - s * vkq;
          v[k][q] = s * vkp + c * vkq;
        }
      }
    }
  }
  int order[3] = { 0, 1, 2 };
  std::sort(order, order + 3, [&a](int i, int j) { return a[i][i] > a[j][j]; });
  for (int c = 0; c < 3; ++c)
  {
    lambda[c] = a[order[c]][order[c]];
    for (int r = 0; r < 3; ++r)
    {
      V[3 * r + c] = v[r][order[c]];
    }
  }
}

/**
 * Least squares min |A x - b_j| for `nrhs` right-hand sides by Householder
 * QR. A is rows x cols (row-major, leading dimension `cols`), B is rows x
 * nrhs (leading dimension `nrhs`); both are overwritten. Columns are first
 * scaled to unit norm (which leaves the solution unchanged and makes the
 * rank test scale-free). Writes X (cols x nrhs) and returns true; returns
 * false when rows < cols or a diagonal element of R falls below
 * `rankTolerance` times the largest (the columns are nearly dependent).
 */
template <typename T>
bool HouseholderLeastSquares(
  T* A, T* B, int rows, int cols, int nrhs, T* X, T rankTolerance = T(1e-10))
{
  if (rows < cols || cols <= 0)
  {
    return false;
  }
  T scale[16];
  for (int j = 0; j < cols; ++j)
  {
    T norm = 0;
    for (int i = 0; i < rows; ++i)
    {
      norm += A[i * cols + j] * A[i * cols + j];
    }
    norm = std::sqrt(norm);
    if (!(norm > T(0)) || !std::isfinite(norm))
    {
      return false;
    }
    scale[j] = T(1) / norm;
    for (int i = 0; i < rows; ++i)
    {
      A[i * cols + j] *= scale[j];
    }
  }
  T diag[16];
  for (int k = 0; k < cols; ++k)
  {
    // Householder vector of column k below the diagonal.
    T alpha = 0;
    for (int i = k; i < rows; ++i)
    {
      alpha += A[i * cols + k] * A[i * cols + k];
    }
    alpha = std::sqrt(alpha);
    if (A[k * cols + k] > T(0))
    {
      alpha = -alpha;
    }
    diag[k] = alpha;
    const T v0 = A[k * cols + k] - alpha;
    T vnorm2 = v0 * v0;
    for (int i = k + 1; i < rows; ++i)
    {
      vnorm2 += A[i * cols + k] * A[i * cols + k];
    }
    A[k * cols + k] = v0;
    if (!(vnorm2 > T(0)))
    {
      continue; // column already zero below the diagonal
    }
    // Apply H = I - 2 v v^T / (v^T v) to the remaining columns and to B.
    for (int j = k + 1; j < cols; ++j)
    {
      T dot = 0;
      for (int i = k; i < rows; ++i)
      {
        dot += A[i * cols + k] * A[i * cols + j];
      }
      const T f = T(2) * dot / vnorm2;
      for (int i = k; i < rows; ++i)
      {
        A[i * cols + j] -= f * A[i * cols + k];
      }
    }
    for (int j = 0; j < nrhs; ++j)
    {
      T dot = 0;
      for (int i = k; i < rows; ++i)
      {
        dot += A[i * cols + k] * B[i * nrhs + j];
      }
      const T f = T(2) * dot / vnorm2;
      for (int i = k; i < rows; ++i)
      {
        B[i * nrhs + j] -= f * A[i * cols + k];
      }
    }
  }
  T largest = 0;
  for (int k = 0; k < cols; ++k)
  {
    largest = std::max(largest, std::abs(diag[k]));
  }
  for (int k = 0; k < cols; ++k)
  {
    if (!(std::abs(diag[k]) > rankTolerance * largest))
    {
      return false;
    }
  }
  // Back substitution R x = Q^T b (R's diagonal in diag, above it in A).
  for (int j = 0; j < nrhs; ++j)
  {
    for (int k = cols - 1; k >= 0; --k)
    {
      T sum = B[k * nrhs + j];
      for (int m = k + 1; m < cols; ++m)
      {
        sum -= A[k * cols + m] * X[m * nrhs + j];
      }
      X[k * nrhs + j] = sum / diag[k];
    }
  }
  for (int k = 0; k < cols; ++k)
  {
    for (int j = 0; j < nrhs; ++j)
    {
      X[k * nrhs + j] *= scale[k];
    }
  }
  return true;
}

namespace detail
{
/**
 * Solve N x = r for the symmetric positive definite C x C matrix N (the
 * normal matrix; full storage; only its lower triangle is read) by an
 * L D L^T factorisation. A pivot D_j is compared with N_jj: D_j / N_jj is
 * the pivot of the unit-diagonal (Jacobi-scaled) matrix, so the test is
 * scale-free without scaling anything (Cholesky-type factorisations are
 * invariant under diagonal scaling). False when one of the first `keep`
 * falls below `pivotTolerance`; a later column whose pivot does is dropped
 * (its unknown set to zero: the least-squares solution without it), which
 * solves in the span of the columns the data determine; `dropped`, when
 * given, says which.
 */
template <typename T, int C, int R>
bool CholeskySolveScaled(const T (&N)[C][C], const T (&r)[C][R], T* X, T pivotTolerance,
  int keep = C, bool* dropped = nullptr)
{
  for (int j = 0; dropped && j < C; ++j)
  {
    dropped[j] = false;
  }
  T L[C][C];
  T D[C], invD[C];
  for (int j = 0; j < C; ++j)
  {
    T v[C];
    T d = N[j][j];
    for (int k = 0; k < j; ++k)
    {
      v[k] = L[j][k] * D[k];
      d -= L[j][k] * v[k];
    }
    if (!(N[j][j] > T(0)) || !(d > pivotTolerance * N[j][j]) || !std::isfinite(d))
    {
      if (j < keep)
      {
        return false;
      }
      // A column past `keep` that the others (nearly) determine: dropped, as
      // if it were not in the system (its unknown is zero).
      D[j] = invD[j] = T(0);
      if (dropped)
      {
        dropped[j] = true;
      }
      for (int i = j + 1; i < C; ++i)
      {
        L[i][j] = T(0);
      }
      continue;
    }
    D[j] = d;
    invD[j] = T(1) / d;
    for (int i = j + 1; i < C; ++i)
    {
      T e = N[i][j];
      for (int k = 0; k < j; ++k)
      {
        e -= L[i][k] * v[k];
      }
      L[i][j] = e * invD[j];
    }
  }
  for (int c = 0; c < R; ++c)
  {
    T y[C];
    for (int i = 0; i < C; ++i) // L y = r (unit diagonal)
    {
      T v = r[i][c];
      for (int k = 0; k < i; ++k)
      {
        v -= L[i][k] * y[k];
      }
      y[i] = v;
    }
    for (int i = C - 1; i >= 0; --i) // D L^T x = y
    {
      T v = y[i] * invD[i];
      for (int k = i + 1; k < C; ++k)
      {
        v -= L[k][i] * X[k * R + c];
      }
      X[i * R + c] = v;
    }
  }
  return true;
}

/// NormalEquationsLeastSquares for C columns and R right-hand sides known at
/// compile time (the loops unroll and vectorise).
template <typename T, int C, int R>
bool NormalEquations(const T* A, const T* B, int rows, T* X, T pivotTolerance)
{
  // Full rank-one updates (not the triangle): contiguous rows vectorise.
  alignas(16) T N[C][C] = {};
  alignas(16) T r[C][R] = {};
  for (int k = 0; k < rows; ++k)
  {
    alignas(16) T a[C];
    alignas(16) T b[R];
    for (int j = 0; j < C; ++j)
    {
      a[j] = A[k * C + j];
    }
    for (int j = 0; j < R; ++j)
    {
      b[j] = B[k * R + j];
    }
    for (int i = 0; i < C; ++i)
    {
      const T ai = a[i];
      for (int j = 0; j < C; ++j)
      {
        N[i][j] += ai * a[j];
      }
      for (int j = 0; j < R; ++j)
      {
        r[i][j] += ai * b[j];
      }
    }
  }
  return CholeskySolveScaled<T, C, R>(N, r, X, pivotTolerance);
}

} // namespace detail

/**
 * The same least-squares problem by the normal equations: A^T A x = A^T b
 * by an L D L^T factorisation whose pivots are tested as those of the
 * unit-diagonal (Jacobi-scaled) matrix. About twice as fast as the QR, but the error grows with the
 * square of the condition number: returns false (X untouched) when a pivot
 * falls below `pivotTolerance`, i.e. when the columns are close enough to
 * dependent that the squared condition would cost digits, so that the
 * caller can fall back to the QR. A and B are read only. Sizes: 3, 6 or 10
 * columns (the quadratic fits in 1, 2 or 3 dimensions), 3 right-hand sides;
 * false for others.
 */
template <typename T>
bool NormalEquationsLeastSquares(
  const T* A, const T* B, int rows, int cols, int nrhs, T* X, T pivotTolerance = T(1e-8))
{
  if (rows < cols || nrhs != 3)
  {
    return false;
  }
  switch (cols)
  {
    case 3:
      return detail::NormalEquations<T, 3, 3>(A, B, rows, X, pivotTolerance);
    case 6:
      return detail::NormalEquations<T, 6, 3>(A, B, rows, X, pivotTolerance);
    case 10:
      return detail::NormalEquations<T, 10, 3>(A, B, rows, X, pivotTolerance);
    default:
      return false;
  }
}

} // namespace wallloads
