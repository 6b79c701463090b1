// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/LeastSquaresGradient.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <random>
#include <vector>

using namespace wallloads;

namespace
{
double MaxAbs(const double* a, int n)
{
  double m = 0;
  for (int i = 0; i < n; ++i)
  {
    m = std::max(m, std::abs(a[i]));
  }
  return m;
}

double MaxDiff(const double* a, const double* b, int n)
{
  double m = 0;
  for (int i = 0; i < n; ++i)
  {
    m = std::max(m, std::abs(a[i] - b[i]));
  }
  return m;
}

// Frobenius condition number of the unit-diagonal (Jacobi-scaled) normal
// matrix of the offsets dx (m rows, weights w or 1): the round-off
// amplification of the normal-equation solve.
double ScaledCondition(const std::vector<double>& dx, const double* w, int m)
{
  double A[9] = {};
  for (int k = 0; k < m; ++k)
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j)
        A[3 * i + j] += (w ? w[k] : 1.0) * dx[3 * k + i] * dx[3 * k + j];
  double S[9], C[9];
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      S[3 * i + j] = A[3 * i + j] / std::sqrt(A[4 * i] * A[4 * j]);
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
    {
      const int i1 = (i + 1) % 3, i2 = (i + 2) % 3, j1 = (j + 1) % 3, j2 = (j + 2) % 3;
      C[3 * j + i] = S[3 * i1 + j1] * S[3 * i2 + j2] - S[3 * i1 + j2] * S[3 * i2 + j1];
    }
  const double det = S[0] * C[0] + S[1] * C[3] + S[2] * C[6];
  double nS = 0, nC = 0;
  for (int i = 0; i < 9; ++i)
  {
    nS += S[i] * S[i];
    nC += C[i] * C[i];
  }
  return std::sqrt(nS * nC) / std::abs(det);
}

// A smooth field with all second and third derivatives non-zero, and its gradient.
void Smooth(const double* x, double* u)
{
  u[0] = std::sin(x[0] + 2 * x[1]) + x[2] * x[2] * x[0];
  u[1] = std::exp(0.3 * x[2]) * std::cos(x[1]) + x[0] * x[1] * x[2];
  u[2] = x[0] * x[0] * x[0] - x[1] * x[2] * x[2];
}
void SmoothGradient(const double* x, double* G)
{
  const double c = std::cos(x[0] + 2 * x[1]);
  const double e = std::exp(0.3 * x[2]);
  const double g[9] = { c + x[2] * x[2], 2 * c, 2 * x[2] * x[0],             //
    x[1] * x[2], -e * std::sin(x[1]) + x[0] * x[2], 0.3 * e * std::cos(x[1]) + x[0] * x[1], //
    3 * x[0] * x[0], -x[2] * x[2], -2 * x[1] * x[2] };
  for (int i = 0; i < 9; ++i)
  {
    G[i] = g[i];
  }
}

// A quadratic field u_i = g_i . x + x^T Q_i x and its gradient.
struct Quadratic
{
  double Gl[9];
  double Q[3][9];
  explicit Quadratic(std::mt19937& rng)
  {
    std::uniform_real_distribution<double> U(-1, 1);
    for (double& g : Gl)
      g = U(rng);
    for (auto& q : Q)
      for (double& v : q)
        v = U(rng);
  }
  void Value(const double* x, double* u) const
  {
    for (int i = 0; i < 3; ++i)
    {
      u[i] = Gl[3 * i] * x[0] + Gl[3 * i + 1] * x[1] + Gl[3 * i + 2] * x[2];
      for (int a = 0; a < 3; ++a)
        for (int b = 0; b < 3; ++b)
          u[i] += Q[i][3 * a + b] * x[a] * x[b];
    }
  }
  void Gradient(const double* x, double* G) const
  {
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j)
      {
        G[3 * i + j] = Gl[3 * i + j];
        for (int a = 0; a < 3; ++a)
          G[3 * i + j] += (Q[i][3 * j + a] + Q[i][3 * a + j]) * x[a];
      }
  }
};

// Point-symmetric stencil: the 6 axis neighbours and 4 body diagonals, in pairs.
std::vector<double> SymmetricStencil(const double* x0, double h)
{
  const double dirs[5][3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 }, { 1, 1, 1 }, { 1, -1, 0.5 } };
  std::vector<double> x;
  for (const auto& d : dirs)
  {
    for (double sign : { 1.0, -1.0 })
    {
      for (int c = 0; c < 3; ++c)
        x.push_back(x0[c] + sign * h * d[c]);
    }
  }
  return x;
}
}

// Exact for linear fields: random stencils of 4 to 12 neighbours in a box
// of random size, random weights, random linear fields, with and without a
// wall row. The data are u_k = u_0 + G (x_k - x_0), so their own rounding is
// ~1 ulp of |u|. Random stencils of few points are sometimes nearly
// coplanar, and the normal equations amplify rounding by the condition
// number of the (scaled) normal matrix: over 1e5 stencils (50 seeds) the
// error stayed below 4.7 eps cond, and below 2.7e-14 for the 98.7% with
// cond <= 100. Asserted: 1e-13 when cond <= 100, 16 eps cond always.
TEST(LeastSquaresGradient, ExactForLinearFields)
{
  std::mt19937 rng(20240611);
  std::uniform_real_distribution<double> U(-1, 1);
  std::uniform_real_distribution<double> W(0.1, 2);
  std::uniform_int_distribution<int> N(4, 12);
  const double eps = std::numeric_limits<double>::epsilon();
  int wellConditioned = 0;
  for (int trial = 0; trial < 2000; ++trial)
  {
    const int m = N(rng);
    const double h = std::pow(10.0, 2 * U(rng)); // 1e-2 .. 1e2
    double x0[3], u0[3], G[9];
    for (int c = 0; c < 3; ++c)
    {
      x0[c] = 3 * h * U(rng);
      u0[c] = U(rng);
    }
    for (double& g : G)
      g = U(rng) / h;
    std::vector<double> xk(3 * m), uk(3 * m), wk(m + 1), dx(3 * (m + 1));
    for (int k = 0; k < m; ++k)
    {
      for (int c = 0; c < 3; ++c)
      {
        xk[3 * k + c] = x0[c] + h * U(rng);
        dx[3 * k + c] = xk[3 * k + c] - x0[c];
      }
      for (int i = 0; i < 3; ++i)
      {
        uk[3 * k + i] = u0[i] + G[3 * i] * dx[3 * k] + G[3 * i + 1] * dx[3 * k + 1] +
          G[3 * i + 2] * dx[3 * k + 2];
      }
      wk[k] = W(rng);
    }
    double xf[3], uf[3];
    const double dxf[3] = { 0.1 * h, -0.5 * h, 0.2 * h };
    for (int c = 0; c < 3; ++c)
    {
      xf[c] = x0[c] + dxf[c];
      dx[3 * m + c] = xf[c] - x0[c];
    }
    for (int i = 0; i < 3; ++i)
      uf[i] = u0[i] + G[3 * i] * dxf[0] + G[3 * i + 1] * dxf[1] + G[3 * i + 2] * dxf[2];
    WallConstraint<double> wall;
    wall.Point = xf;
    wall.Value = uf;
    wall.Weight = 4;
    const bool useWall = trial % 2 == 1;
    const bool useWeights = trial % 4 >= 2;
    double out[9];
    ASSERT_EQ(LeastSquaresGradient(x0, u0, xk.data(), uk.data(), useWeights ? wk.data() : nullptr,
                m, out, useWall ? &wall : nullptr),
      GradientStatus::Ok)
      << trial;
    // The condition number of the rows actually used (the wall row has weight 4).
    std::vector<double> wAll(m + 1, 1.0);
    for (int k = 0; k < m; ++k)
      wAll[k] = useWeights ? wk[k] : 1.0;
    wAll[m] = useWall ? 4.0 : 0.0;
    const double cond = ScaledCondition(dx, wAll.data(), m + 1);
    const double err = MaxDiff(out, G, 9) / MaxAbs(G, 9);
    EXPECT_LT(err, 16 * eps * cond) << trial;
    if (cond <= 100)
    {
      EXPECT_LT(err, 1e-13) << trial << " cond " << cond;
      ++wellConditioned;
    }
  }
  EXPECT_GT(wellConditioned, 1900); // the bound above is not vacuous
}

// Far from the origin with exactly representable (dyadic) offsets: the
// differences x_k - x_0 are formed first, so nothing is lost.
TEST(LeastSquaresGradient, FarFromOrigin)
{
  const double x0[3] = { 1e6, -2e6, 3e6 };
  const double u0[3] = { 0, 0, 0 };
  const double G[9] = { 0.5, -0.25, 2, 1, 0.125, -1, 0.75, 3, -0.5 };
  const double offsets[6][3] = { { 0.25, 0, 0 }, { -0.125, 0.5, 0 }, { 0, -0.25, 0.375 },
    { 0.5, 0.5, -0.25 }, { -0.25, 0.125, -0.5 }, { 0.125, -0.375, 0.25 } };
  double xk[18], uk[18];
  for (int k = 0; k < 6; ++k)
  {
    for (int c = 0; c < 3; ++c)
      xk[3 * k + c] = x0[c] + offsets[k][c];
    for (int i = 0; i < 3; ++i)
      uk[3 * k + i] = G[3 * i] * offsets[k][0] + G[3 * i + 1] * offsets[k][1] +
        G[3 * i + 2] * offsets[k][2];
  }
  double out[9];
  ASSERT_EQ(LeastSquaresGradient(x0, u0, xk, uk, static_cast<const double*>(nullptr), 6, out),
    GradientStatus::Ok);
  EXPECT_LT(MaxDiff(out, G, 9), 1e-14);
}

// Point-symmetric stencil (pairs x0 +- r, equal weights): the quadratic terms
// of the data cancel pairwise, so a quadratic field's gradient is exact; for
// a general smooth field the first error is from the cubic terms, O(h^2).
// On a one-sided stencil (random offsets, all positive) the quadratic terms
// remain: O(h).
TEST(LeastSquaresGradient, SecondOrderOnSymmetricStencil)
{
  const double x0[3] = { 0.3, -0.2, 0.5 };
  std::mt19937 rng(7);
  const Quadratic q(rng);
  double u0[3], exact[9], out[9];
  // Quadratic field: exact on the symmetric stencil at every spacing.
  q.Value(x0, u0);
  q.Gradient(x0, exact);
  for (double h : { 0.1, 0.01 })
  {
    const std::vector<double> xk = SymmetricStencil(x0, h);
    const int m = static_cast<int>(xk.size() / 3);
    std::vector<double> uk(xk.size());
    for (int k = 0; k < m; ++k)
      q.Value(&xk[3 * k], &uk[3 * k]);
    ASSERT_EQ(LeastSquaresGradient(x0, u0, xk.data(), uk.data(), static_cast<double*>(nullptr), m,
                out),
      GradientStatus::Ok);
    // Rounding of the data (|u| ~ 1) amplified by 1/h.
    EXPECT_LT(MaxDiff(out, exact, 9), 1e-14 / h) << h;
  }
  // Smooth field: observed order 2 (measured 1.997, 1.999, 2.000; error
  // 1.6e-4 at h = 0.01).
  Smooth(x0, u0);
  SmoothGradient(x0, exact);
  const double hs[4] = { 0.08, 0.04, 0.02, 0.01 };
  double err[4];
  for (int r = 0; r < 4; ++r)
  {
    const std::vector<double> xk = SymmetricStencil(x0, hs[r]);
    const int m = static_cast<int>(xk.size() / 3);
    std::vector<double> uk(xk.size());
    for (int k = 0; k < m; ++k)
      Smooth(&xk[3 * k], &uk[3 * k]);
    ASSERT_EQ(LeastSquaresGradient(x0, u0, xk.data(), uk.data(), static_cast<double*>(nullptr), m,
                out),
      GradientStatus::Ok);
    err[r] = MaxDiff(out, exact, 9);
  }
  for (int r = 0; r + 1 < 4; ++r)
  {
    const double p = std::log(err[r] / err[r + 1]) / std::log(2.0);
    EXPECT_NEAR(p, 2.0, 0.2) << hs[r];
  }
  // One-sided random stencil, quadratic field: first order.
  q.Value(x0, u0);
  q.Gradient(x0, exact);
  std::uniform_real_distribution<double> U(0, 1);
  double shape[18];
  for (double& v : shape)
    v = U(rng); // all offsets positive: one-sided
  double errQ[4];
  for (int r = 0; r < 4; ++r)
  {
    double xk[18], uk[18];
    for (int k = 0; k < 6; ++k)
    {
      for (int c = 0; c < 3; ++c)
        xk[3 * k + c] = x0[c] + hs[r] * shape[3 * k + c];
      q.Value(xk + 3 * k, uk + 3 * k);
    }
    ASSERT_EQ(LeastSquaresGradient(x0, u0, xk, uk, static_cast<double*>(nullptr), 6, out),
      GradientStatus::Ok);
    errQ[r] = MaxDiff(out, exact, 9);
  }
  for (int r = 0; r + 1 < 4; ++r)
  {
    EXPECT_NEAR(std::log(errQ[r] / errQ[r + 1]) / std::log(2.0), 1.0, 0.05) << hs[r];
  }
}

// A wall cell: centre at y = h/2 above the wall y = 0, neighbours at +-h in
// x and z and +h in y, and the wall row (u_W = 0 at the face centroid). For
// u = (a y + b y^2, 0, 0) the y-rows are +h (value u(3h/2)) and -h/2 (the
// wall), giving du/dy = a + 1.7 b h against the exact a + b h: first order,
// error 0.7 b h exactly. Without the wall row the cell's in-plane
// neighbours alone are coplanar: Degenerate.
TEST(LeastSquaresGradient, WallRowOnWallCell)
{
  const double a = 2.0, b = -3.0;
  auto u = [&](double y) { return a * y + b * y * y; };
  const double hs[4] = { 0.1, 0.05, 0.025, 0.0125 };
  double err[4];
  for (int r = 0; r < 4; ++r)
  {
    const double h = hs[r];
    const double x0[3] = { 0, h / 2, 0 };
    const double u0[3] = { u(h / 2), 0, 0 };
    const double xk[15] = { h, h / 2, 0, -h, h / 2, 0, 0, h / 2, h, 0, h / 2, -h, 0, 1.5 * h, 0 };
    double uk[15] = {};
    for (int k = 0; k < 5; ++k)
      uk[3 * k] = u(xk[3 * k + 1]);
    const double xf[3] = { 0, 0, 0 };
    const double uW[3] = { 0, 0, 0 };
    WallConstraint<double> wall;
    wall.Point = xf;
    wall.Value = uW;
    double G[9];
    ASSERT_EQ(
      LeastSquaresGradient(x0, u0, xk, uk, static_cast<double*>(nullptr), 5, G, &wall),
      GradientStatus::Ok);
    err[r] = G[1] - (a + b * h);
    EXPECT_NEAR(err[r], 0.7 * b * h, 1e-12) << h;
    EXPECT_NEAR(G[0], 0, 1e-12);
    EXPECT_NEAR(G[2], 0, 1e-12);
    // In-plane neighbours only: coplanar; the wall row restores the third direction.
    EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, static_cast<double*>(nullptr), 4, G),
      GradientStatus::Degenerate);
    EXPECT_TRUE(std::isnan(G[0]));
    EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, static_cast<double*>(nullptr), 4, G, &wall),
      GradientStatus::Ok);
    // The wall row alone sets du/dy = (u(h/2) - u_W)/(h/2) = a + b h/2.
    EXPECT_NEAR(G[1], a + b * h / 2, 1e-12);
  }
  for (int r = 0; r + 1 < 4; ++r)
  {
    const double p = std::log(err[r] / err[r + 1]) / std::log(2.0);
    EXPECT_GE(p, 0.9);
    EXPECT_LE(p, 1.1);
  }
}

TEST(LeastSquaresGradient, DegenerateStencils)
{
  std::mt19937 rng(3);
  std::uniform_real_distribution<double> U(-1, 1);
  const double x0[3] = { 0.1, 0.2, 0.3 };
  const double u0[3] = { 1, 2, 3 };
  double G[9];
  for (int trial = 0; trial < 100; ++trial)
  {
    // Neighbours in a random plane through x0 (or on a random line).
    double e1[3], e2[3];
    for (int c = 0; c < 3; ++c)
    {
      e1[c] = U(rng);
      e2[c] = U(rng);
    }
    const bool line = trial % 5 == 0;
    double xk[24], uk[24];
    for (int k = 0; k < 8; ++k)
    {
      const double s = U(rng), t = line ? 0.0 : U(rng);
      for (int c = 0; c < 3; ++c)
      {
        xk[3 * k + c] = x0[c] + s * e1[c] + t * e2[c];
        uk[3 * k + c] = U(rng);
      }
    }
    EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, static_cast<double*>(nullptr), 8, G),
      GradientStatus::Degenerate)
      << trial;
  }
  const double xk[9] = { 1, 0, 0, 0, 1, 0, 0, 0, 1 };
  const double uk[9] = { 0, 0, 0, 0, 0, 0, 0, 0, 0 };
  const double* none = nullptr;
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 0, G), GradientStatus::Degenerate);
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 2, G), GradientStatus::Degenerate);
  const double wZero[3] = { 1, 1, 0 };
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, wZero, 3, G), GradientStatus::Degenerate);
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 3, G), GradientStatus::Ok);
}

// Stretched stencils: axis-aligned stretching is taken out by the Jacobi
// scaling (aspect ratio 1e8 is fine and exact); oblique stretching by an
// aspect ratio AR leaves a scaled determinant of about 4/AR^2, accepted at
// AR = 1e5 and Degenerate at 1e7 (threshold 1e-12).
TEST(LeastSquaresGradient, StretchedStencils)
{
  const double x0[3] = { 0, 0, 0 };
  const double u0[3] = { 0, 0, 0 };
  const double Gt[9] = { 1, 2, 3, -1, 0.5, 2, 0.25, -3, 1 };
  auto fill = [&](const double e[3][3], const double len[3], double* xk, double* uk) {
    int k = 0;
    for (int a = 0; a < 3; ++a)
      for (double sign : { 1.0, -1.0 })
      {
        for (int c = 0; c < 3; ++c)
          xk[3 * k + c] = sign * len[a] * e[a][c];
        for (int i = 0; i < 3; ++i)
          uk[3 * k + i] =
            Gt[3 * i] * xk[3 * k] + Gt[3 * i + 1] * xk[3 * k + 1] + Gt[3 * i + 2] * xk[3 * k + 2];
        ++k;
      }
  };
  const double* none = nullptr;
  double xk[18], uk[18], G[9];
  const double axes[3][3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  const double flat[3] = { 1, 1e-8, 1 };
  fill(axes, flat, xk, uk);
  ASSERT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 6, G), GradientStatus::Ok);
  EXPECT_LT(MaxDiff(G, Gt, 9), 1e-13 * MaxAbs(Gt, 9));
  const double r = std::sqrt(0.5);
  const double oblique[3][3] = { { r, r, 0 }, { -r, r, 0 }, { 0, 0, 1 } };
  const double ar5[3] = { 1, 1e-5, 1 };
  fill(oblique, ar5, xk, uk);
  ASSERT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 6, G), GradientStatus::Ok);
  // Condition ~ AR^2 = 1e10 amplifies rounding: measured 3.7e-7 relative.
  EXPECT_LT(MaxDiff(G, Gt, 9), 1e-5 * MaxAbs(Gt, 9));
  const double ar7[3] = { 1, 1e-7, 1 };
  fill(oblique, ar7, xk, uk);
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 6, G), GradientStatus::Degenerate);
}

TEST(LeastSquaresGradient, BadInput)
{
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double x0[3] = { 0, 0, 0 };
  const double u0[3] = { 0, 0, 0 };
  const double xk[12] = { 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1 };
  const double uk[12] = {};
  double G[9];
  const double* none = nullptr;
  double xBad[12];
  std::copy(xk, xk + 12, xBad);
  xBad[4] = nan;
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xBad, uk, none, 4, G), GradientStatus::BadInput);
  EXPECT_TRUE(std::isnan(G[8]));
  const double wNeg[4] = { 1, 1, -1, 1 };
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, wNeg, 4, G), GradientStatus::BadInput);
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, -1, G), GradientStatus::BadInput);
  const double u0Bad[3] = { nan, 0, 0 };
  EXPECT_EQ(LeastSquaresGradient(x0, u0Bad, xk, uk, none, 4, G), GradientStatus::BadInput);
  const double xf[3] = { 0, -0.5, 0 };
  const double uBad[3] = { 0, nan, 0 };
  WallConstraint<double> wall;
  wall.Point = xf;
  wall.Value = uBad;
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 4, G, &wall), GradientStatus::BadInput);
}

TEST(LeastSquaresGradient, FloatInstantiation)
{
  const float x0[3] = { 1, 2, 3 };
  const float u0[3] = { 0, 0, 0 };
  const float xk[12] = { 2, 2, 3, 1, 3, 3, 1, 2, 4, 0, 1, 2 };
  float uk[12];
  for (int k = 0; k < 4; ++k)
  {
    const float dx = xk[3 * k] - 1, dy = xk[3 * k + 1] - 2, dz = xk[3 * k + 2] - 3;
    uk[3 * k] = 2 * dx;
    uk[3 * k + 1] = -dy + dz;
    uk[3 * k + 2] = 0.5f * dz;
  }
  float G[9];
  ASSERT_EQ(LeastSquaresGradient(x0, u0, xk, uk, static_cast<const float*>(nullptr), 4, G),
    GradientStatus::Ok);
  const float expected[9] = { 2, 0, 0, 0, -1, 1, 0, 0, 0.5f };
  for (int i = 0; i < 9; ++i)
  {
    EXPECT_NEAR(G[i], expected[i], 1e-5f) << i;
  }
}
