// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/LeastSquaresGradient.h"
#include "wallloads/NearWallShear.h"
#include "wallloads/SmallMatrix.h"
#include "wallloads/WallFit.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <vector>

using namespace wallloads;

namespace
{
const double Eps = std::numeric_limits<double>::epsilon();

// A random quadratic field q(x) = c + G x + x^T H_i x per component.
struct Quadratic
{
  double C[3], G[9], H[3][9];
  explicit Quadratic(std::mt19937& rng)
  {
    std::uniform_real_distribution<double> U(-1, 1);
    for (int i = 0; i < 3; ++i)
    {
      C[i] = U(rng);
      for (int j = 0; j < 3; ++j)
      {
        G[3 * i + j] = U(rng);
        for (int k = j; k < 3; ++k)
        {
          H[i][3 * j + k] = H[i][3 * k + j] = U(rng);
        }
      }
    }
  }
  void Value(const double x[3], double u[3]) const
  {
    for (int i = 0; i < 3; ++i)
    {
      u[i] = C[i];
      for (int j = 0; j < 3; ++j)
      {
        u[i] += G[3 * i + j] * x[j];
        for (int k = 0; k < 3; ++k)
        {
          u[i] += 0.5 * x[j] * H[i][3 * j + k] * x[k];
        }
      }
    }
  }
  void Gradient(const double x[3], double out[9]) const
  {
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j)
      {
        out[3 * i + j] = G[3 * i + j];
        for (int k = 0; k < 3; ++k)
          out[3 * i + j] += H[i][3 * j + k] * x[k];
      }
  }
};

double MaxDiff(const double* a, const double* b, int n)
{
  double m = 0;
  for (int i = 0; i < n; ++i)
    m = std::max(m, std::abs(a[i] - b[i]));
  return m;
}
} // namespace

// Jacobi's eigen-decomposition reproduces a matrix built from known
// eigenpairs (V diag(lambda) V^T), including a zero eigenvalue.
TEST(SmallMatrix, SymmetricEigen3)
{
  const double c = std::cos(0.7), s = std::sin(0.7);
  // Orthonormal columns: a rotation about (1,1,1)/sqrt(3) would do; use two plane rotations.
  const double R1[9] = { c, -s, 0, s, c, 0, 0, 0, 1 };
  const double R2[9] = { 1, 0, 0, 0, c, -s, 0, s, c };
  double Q[9] = {};
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      for (int k = 0; k < 3; ++k)
        Q[3 * i + j] += R1[3 * i + k] * R2[3 * k + j];
  const double lam[3] = { 5.0, 0.0, 2.0 };
  double A[9] = {};
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      for (int k = 0; k < 3; ++k)
        A[3 * i + j] += Q[3 * i + k] * lam[k] * Q[3 * j + k];
  double l[3], V[9];
  SymmetricEigen3(A, l, V);
  EXPECT_NEAR(l[0], 5.0, 1e-14);
  EXPECT_NEAR(l[1], 2.0, 1e-14);
  EXPECT_NEAR(l[2], 0.0, 1e-14);
  // The eigenvector of 0 is Q's second column, up to sign.
  const double dot = V[2] * Q[1] + V[5] * Q[4] + V[8] * Q[7];
  EXPECT_NEAR(std::abs(dot), 1.0, 1e-14);
}

// Householder least squares: exact on consistent data, and it reports
// dependent columns instead of returning a number.
TEST(SmallMatrix, HouseholderLeastSquares)
{
  std::mt19937 rng(5);
  std::uniform_real_distribution<double> U(-1, 1);
  const int rows = 12, cols = 4;
  double A[rows * cols], B[rows * 2], X[cols * 2];
  const double x[cols * 2] = { 1, -2, 0.5, 3, -1, 0.25, 2, 7 };
  for (int i = 0; i < rows; ++i)
  {
    for (int j = 0; j < cols; ++j)
      A[i * cols + j] = U(rng) * std::pow(10.0, j); // badly scaled columns
    for (int r = 0; r < 2; ++r)
    {
      B[i * 2 + r] = 0;
      for (int j = 0; j < cols; ++j)
        B[i * 2 + r] += A[i * cols + j] * x[j * 2 + r];
    }
  }
  ASSERT_TRUE(HouseholderLeastSquares(A, B, rows, cols, 2, X));
  EXPECT_LT(MaxDiff(X, x, cols * 2), 1e-12);
  // Column 3 = 2 x column 1: dependent.
  for (int i = 0; i < rows; ++i)
  {
    A[i * cols + 0] = U(rng);
    A[i * cols + 1] = U(rng);
    A[i * cols + 2] = U(rng);
    A[i * cols + 3] = 2 * A[i * cols + 1];
  }
  EXPECT_FALSE(HouseholderLeastSquares(A, B, rows, cols, 2, X));
  EXPECT_FALSE(HouseholderLeastSquares(A, B, 3, cols, 2, X)); // fewer rows than columns
}

// A one-cell-thick slab: neighbours in a plane (here tilted, and far from
// the origin so that the out-of-plane offsets are round-off). The gradient
// in the plane is exact for a field linear in the plane, with zero
// derivative across it and rank 2; a line of neighbours gives rank 1.
TEST(LeastSquaresGradient, InSpanSolvesInTheSlabPlane)
{
  const double e1[3] = { 0.6, 0.8, 0.0 };
  const double e2[3] = { -0.48, 0.36, 0.8 };
  const double across[3] = { 0.64, -0.48, 0.6 }; // e1 x e2
  const double o[3] = { 1e3, -2e3, 5e2 };
  // u = G0 x with G0 e3 = 0 (a field that does not vary across the slab).
  const double a[3] = { 1.5, -0.2, 0.7 }, b[3] = { 0.3, 2.0, -1.1 };
  double G0[9];
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      G0[3 * i + j] = a[i] * e1[j] + b[i] * e2[j];
  auto field = [&](const double x[3], double u[3]) {
    for (int i = 0; i < 3; ++i)
      u[i] = G0[3 * i] * (x[0] - o[0]) + G0[3 * i + 1] * (x[1] - o[1]) + G0[3 * i + 2] * (x[2] - o[2]);
  };
  const double st[6][2] = { { 1, 0 }, { -1, 0.2 }, { 0.3, 1 }, { -0.2, -1 }, { 0.7, 0.7 }, { -0.5, 0.4 } };
  double xk[18], uk[18], x0[3], u0[3];
  for (int c = 0; c < 3; ++c)
    x0[c] = o[c] + 0.01 * e1[c];
  field(x0, u0);
  for (int k = 0; k < 6; ++k)
  {
    for (int c = 0; c < 3; ++c)
      xk[3 * k + c] = o[c] + 0.1 * (st[k][0] * e1[c] + st[k][1] * e2[c]);
    field(&xk[3 * k], &uk[3 * k]);
  }
  double G[9];
  int rank = -1;
  const double* none = nullptr;
  EXPECT_EQ(LeastSquaresGradient(x0, u0, xk, uk, none, 6, G), GradientStatus::Degenerate);
  ASSERT_EQ(LeastSquaresGradientInSpan(x0, u0, xk, uk, none, 6, G, rank), GradientStatus::Ok);
  EXPECT_EQ(rank, 2);
  EXPECT_LT(MaxDiff(G, G0, 9), 1e-9); // coordinates 1e3: differences keep ~13 digits
  for (int i = 0; i < 3; ++i)
  {
    const double g = G[3 * i] * across[0] + G[3 * i + 1] * across[1] + G[3 * i + 2] * across[2];
    EXPECT_LT(std::abs(g), 1e-12) << "derivative across the slab must be zero";
  }
  // Neighbours on a line: rank 1, the derivative along it.
  for (int k = 0; k < 6; ++k)
    for (int c = 0; c < 3; ++c)
      xk[3 * k + c] = o[c] + 0.1 * st[k][0] * e1[c];
  for (int k = 0; k < 6; ++k)
    field(&xk[3 * k], &uk[3 * k]);
  for (int c = 0; c < 3; ++c)
    x0[c] = o[c];
  field(x0, u0);
  ASSERT_EQ(LeastSquaresGradientInSpan(x0, u0, xk, uk, none, 6, G, rank), GradientStatus::Ok);
  EXPECT_EQ(rank, 1);
  for (int i = 0; i < 3; ++i)
  {
    const double along = G[3 * i] * e1[0] + G[3 * i + 1] * e1[1] + G[3 * i + 2] * e1[2];
    EXPECT_NEAR(along, a[i], 1e-9);
  }
  // A full 3-D stencil is the plain least-squares gradient (rank 3).
  const double x3[12] = { 1, 0, 0, 0, 1, 0, 0, 0, 1, -1, -1, -1 };
  double u3[12] = {};
  const double z[3] = { 0, 0, 0 };
  ASSERT_EQ(LeastSquaresGradientInSpan(z, z, x3, u3, none, 4, G, rank), GradientStatus::Ok);
  EXPECT_EQ(rank, 3);
  // No neighbour: Degenerate.
  EXPECT_EQ(LeastSquaresGradientInSpan(z, z, x3, u3, none, 0, G, rank), GradientStatus::Degenerate);
  EXPECT_EQ(rank, 0);
}

namespace
{
// Samples around a wall face: a triangle in the plane z = 0 (wall, corners),
// the adjacent cell above it and neighbours scattered above the wall at
// random (no structure: "whatever the cell shapes"). Returns the face
// centroid.
void RandomStencil(std::mt19937& rng, double h, std::vector<double>& xc, std::vector<double>& xw,
  double xf[3])
{
  std::uniform_real_distribution<double> U(-1, 1), Up(0.05, 1);
  const double tri[9] = { 0, 0, 0, h, 0.1 * h, 0, 0.3 * h, 0.9 * h, 0 };
  xw.assign(tri, tri + 9);
  for (int c = 0; c < 3; ++c)
    xf[c] = (tri[c] + tri[3 + c] + tri[6 + c]) / 3;
  xc.assign({ xf[0] + 0.05 * h, xf[1] - 0.02 * h, 0.3 * h });
  for (int k = 0; k < 20; ++k)
  {
    xc.push_back(xf[0] + 1.5 * h * U(rng));
    xc.push_back(xf[1] + 1.5 * h * U(rng));
    xc.push_back(1.2 * h * Up(rng));
  }
}
} // namespace

// Exact for quadratic fields on random stencils: the fitted gradient at the
// face centroid equals the field's (WallFit.h: the fit reproduces any
// quadratic; the wall corners carry the field's own value there).
TEST(WallFit, ExactForQuadraticsOnRandomStencils)
{
  std::mt19937 rng(11);
  const double n[3] = { 0, 0, 1 };
  for (int trial = 0; trial < 50; ++trial)
  {
    const Quadratic q(rng);
    std::vector<double> xc, xw;
    double xf[3];
    RandomStencil(rng, 0.05, xc, xw, xf);
    std::vector<double> uc(xc.size()), uw(xw.size());
    for (std::size_t k = 0; k < xc.size() / 3; ++k)
      q.Value(&xc[3 * k], &uc[3 * k]);
    for (std::size_t k = 0; k < xw.size() / 3; ++k)
      q.Value(&xw[3 * k], &uw[3 * k]);
    WallFitResult<double> r;
    ASSERT_EQ(QuadraticWallFit(xf, n, xc.data(), uc.data(), int(xc.size() / 3), xw.data(),
                uw.data(), 3, 1e-16, r),
      WallFitStatus::Ok)
      << trial;
    double G[9];
    q.Gradient(xf, G);
    EXPECT_LT(MaxDiff(r.G, G, 9), 1e-10) << trial;
    EXPECT_EQ(r.Dimension, 3);
  }
}

// Plane Poiseuille flow over a flat wall, u = A y (h - y) e_x: quadratic in
// the wall distance, so the fit is exact (tau_w = mu A h; White, Viscous
// Fluid Flow, ch. 3 - recalled from memory), here with the samples of a
// one-cell-thick slab of triangles (wedges): every cell centre in the plane
// z = 0, the wall quad's corners at z = +-t/2. The fit is taken in the
// plane (Dimension 2) and the derivatives across are zero.
TEST(WallFit, SlabOfWedgesPoiseuilleExact)
{
  const double A = 3.0, hh = 0.2, mu = 1.3e-3, t = 0.05;
  auto u = [&](const double x[3], double out[3]) {
    out[0] = A * x[1] * (hh - x[1]);
    out[1] = out[2] = 0;
  };
  // Wall edge from x = 0 to 0.04 on y = 0; triangle centres near it.
  const double xw[12] = { 0, 0, -t / 2, 0.04, 0, -t / 2, 0.04, 0, t / 2, 0, 0, t / 2 };
  const double xf[3] = { 0.02, 0, 0 };
  const double n[3] = { 0, 1, 0 };
  const double centres[7][2] = { { 0.021, 0.011 }, { 0.003, 0.009 }, { 0.041, 0.012 },
    { 0.017, 0.031 }, { -0.015, 0.02 }, { 0.052, 0.027 }, { 0.033, 0.045 } };
  double xc[21], uc[21], uw[12];
  for (int k = 0; k < 7; ++k)
  {
    xc[3 * k] = centres[k][0];
    xc[3 * k + 1] = centres[k][1];
    xc[3 * k + 2] = 0;
    u(&xc[3 * k], &uc[3 * k]);
  }
  for (int k = 0; k < 4; ++k)
    u(&xw[3 * k], &uw[3 * k]);
  WallFitResult<double> r;
  ASSERT_EQ(QuadraticWallFit(xf, n, xc, uc, 7, xw, uw, 4, 1e-16, r), WallFitStatus::Ok);
  EXPECT_EQ(r.Dimension, 2);
  double tau[3];
  GradientWallShear(r.G, mu, n, tau);
  EXPECT_NEAR(tau[0], mu * A * hh, 1e-12 * mu * A * hh);
  EXPECT_NEAR(tau[1], 0, 1e-15);
  EXPECT_NEAR(tau[2], 0, 1e-15);
  for (int i = 0; i < 3; ++i)
    EXPECT_EQ(r.G[3 * i + 2], 0.0) << "no derivative across the slab";
}

// Second order on a curved wall: the flow past a circular cylinder in the
// Stokes regime near its surface, stream function
//   psi = U sin(theta) (r ln(r/R) - r/2 + R^2/(2 r))
// (a biharmonic function with psi = dpsi/dr = 0 at r = R: no slip; the inner
// solution of Oseen flow past a cylinder, Lamb, Hydrodynamics, §343 -
// recalled from memory). Its wall shear stress is tau_r_theta(R) =
// -2 mu U sin(theta)/R (our own differentiation: u_theta = -U sin(theta)
// g'(r), g'' (R) = 2/R). The stencil - a face whose corners lie on the circle
// and cells above it at random - shrinks by halves: the error must fall by
// about 4 per halving (order 2; measured 1.93, 2.00, 2.01, 2.01 from h = 0.2
// to 0.0125; the last two halvings asserted in [1.7, 2.4]).
TEST(WallFit, SecondOrderOnACurvedWall)
{
  const double R = 1.0, U0 = 1.0, mu = 1.0;
  auto velocity = [&](const double x[3], double out[3]) {
    const double r = std::hypot(x[0], x[1]), th = std::atan2(x[1], x[0]);
    const double g = r * std::log(r / R) - r / 2 + R * R / (2 * r);
    const double gp = std::log(r / R) + 0.5 - R * R / (2 * r * r);
    const double ur = U0 * std::cos(th) * g / r, ut = -U0 * std::sin(th) * gp;
    out[0] = ur * std::cos(th) - ut * std::sin(th);
    out[1] = ur * std::sin(th) + ut * std::cos(th);
    out[2] = 0;
  };
  const double theta0 = 0.9;
  std::vector<double> errors;
  std::mt19937 rng(17);
  std::uniform_real_distribution<double> U(-1, 1), Up(0.1, 1);
  std::vector<double> offs;
  for (int k = 0; k < 24; ++k)
  {
    offs.push_back(U(rng));
    offs.push_back(Up(rng));
    offs.push_back(U(rng));
  }
  for (double h : { 0.2, 0.1, 0.05, 0.025, 0.0125 })
  {
    // A quad face: chord of angular width h between two corners on the
    // circle, extruded by h along z.
    const double a = theta0 - h / 2 / R, b = theta0 + h / 2 / R;
    const double xw[12] = { R * std::cos(a), R * std::sin(a), -h / 2, R * std::cos(b),
      R * std::sin(b), -h / 2, R * std::cos(b), R * std::sin(b), h / 2, R * std::cos(a),
      R * std::sin(a), h / 2 };
    const double xf[3] = { (xw[0] + xw[3]) / 2, (xw[1] + xw[4]) / 2, 0 };
    double n[3] = { xf[0], xf[1], 0 };
    const double nn = std::hypot(n[0], n[1]);
    n[0] /= nn;
    n[1] /= nn;
    std::vector<double> xc, uc;
    // P, then cells scattered over a polar patch above the face.
    for (int k = 0; k < 25; ++k)
    {
      const double dth = k == 0 ? 0.0 : 1.5 * h * offs[3 * (k - 1)] / R;
      const double dr = k == 0 ? 0.4 * h : 1.3 * h * offs[3 * (k - 1) + 1];
      const double z = k == 0 ? 0.0 : 1.5 * h * offs[3 * (k - 1) + 2];
      const double r = R + dr, th = theta0 + dth;
      xc.insert(xc.end(), { r * std::cos(th), r * std::sin(th), z });
    }
    uc.resize(xc.size());
    for (std::size_t k = 0; k < xc.size() / 3; ++k)
      velocity(&xc[3 * k], &uc[3 * k]);
    double uw[12] = {};
    WallFitResult<double> r;
    ASSERT_EQ(QuadraticWallFit(xf, n, xc.data(), uc.data(), 25, xw, uw, 4, 1e-16, r),
      WallFitStatus::Ok);
    double tau[3];
    GradientWallShear(r.G, mu, n, tau);
    // Exact: -2 mu U sin(theta0)/R along e_theta at theta0.
    const double exact = -2 * mu * U0 * std::sin(theta0) / R;
    const double et[3] = { -std::sin(theta0), std::cos(theta0), 0 };
    errors.push_back(std::abs(tau[0] * et[0] + tau[1] * et[1] - exact) / std::abs(exact));
  }
  for (std::size_t i = 0; i + 1 < errors.size(); ++i)
  {
    const double order = std::log2(errors[i] / errors[i + 1]);
    std::printf("h / %d: relative error %.3e -> %.3e, order %.2f\n", 1 << i, errors[i],
      errors[i + 1], order);
    if (i + 3 >= errors.size())
    {
      EXPECT_GE(order, 1.7);
      EXPECT_LE(order, 2.4);
    }
  }
}

// Statuses: too few samples, samples that do not determine a quadratic,
// bad input; cells behind the face's plane (round a sharp edge) are left out.
TEST(WallFit, StatusesAndSampleSelection)
{
  const double n[3] = { 0, 0, 1 };
  const double xf[3] = { 0, 0, 0 };
  const double xw[9] = { -0.1, -0.1, 0, 0.1, -0.1, 0, 0, 0.1, 0 };
  const double uw[9] = {};
  WallFitResult<double> r;
  const double xc1[6] = { 0, 0, 0.05, 0.01, 0, 0.1 };
  const double uc1[6] = { 1, 0, 0, 2, 0, 0 };
  EXPECT_EQ(QuadraticWallFit(xf, n, xc1, uc1, 2, xw, uw, 3, 1e-16, r),
    WallFitStatus::TooFewSamples);
  EXPECT_TRUE(std::isnan(r.G[0]));
  // Enough samples, but all cells on one vertical line above the centroid
  // and the corners: the in-plane quadratic terms are not determined.
  std::vector<double> xc, uc;
  for (int k = 0; k < 12; ++k)
  {
    xc.insert(xc.end(), { 0, 0, 0.05 * (k + 1) });
    uc.insert(uc.end(), { 0.1 * k, 0, 0 });
  }
  EXPECT_EQ(QuadraticWallFit(xf, n, xc.data(), uc.data(), 12, xw, uw, 3, 1e-16, r),
    WallFitStatus::Ok); // a vertical line: the fit is one-dimensional (Dimension 1)
  EXPECT_EQ(r.Dimension, 1);
  const double bad[3] = { std::nan(""), 0, 0 };
  EXPECT_EQ(QuadraticWallFit(xf, n, bad, uc.data(), 1, xw, uw, 3, 1e-16, r), WallFitStatus::BadInput);
  const double zero[3] = { 0, 0, 0 };
  EXPECT_EQ(QuadraticWallFit(xf, zero, xc.data(), uc.data(), 12, xw, uw, 3, 1e-16, r),
    WallFitStatus::BadInput);
  // Cells deep behind the face's plane are not samples (but P always is).
  std::mt19937 rng(3);
  const Quadratic q(rng);
  std::vector<double> xs, xwv;
  double c[3];
  RandomStencil(rng, 0.05, xs, xwv, c);
  const int above = int(xs.size() / 3);
  xs.insert(xs.end(), { c[0] + 0.01, c[1], -0.05, c[0] - 0.02, c[1] + 0.01, -0.08 });
  std::vector<double> us(xs.size()), uwv(xwv.size());
  for (std::size_t k = 0; k < xs.size() / 3; ++k)
    q.Value(&xs[3 * k], &us[3 * k]);
  // Values behind the wall are garbage: leaving them out keeps the fit exact.
  for (std::size_t k = 3 * above; k < xs.size(); ++k)
    us[k] = 1e3;
  for (std::size_t k = 0; k < xwv.size() / 3; ++k)
    q.Value(&xwv[3 * k], &uwv[3 * k]);
  ASSERT_EQ(QuadraticWallFit(c, n, xs.data(), us.data(), int(xs.size() / 3), xwv.data(),
              uwv.data(), 3, 1e-16, r),
    WallFitStatus::Ok);
  EXPECT_EQ(r.CellsBehind, 2);
  double G[9];
  q.Gradient(c, G);
  EXPECT_LT(MaxDiff(r.G, G, 9), 1e-10);
  (void)Eps;
}

// One layer of cells (every cell at the same distance from the wall): the
// curvature of the profile along the normal is not determined, and the fit
// says so rather than returning a first-order result as if it were second.
TEST(WallFit, OneLayerHasNoNormalCurvature)
{
  const double n[3] = { 0, 1, 0 };
  const double xf[3] = { 0, 0, 0 };
  const double h = 0.1, d = 0.05;
  std::vector<double> xc, uc;
  for (int i = -1; i <= 1; ++i)
  {
    for (int k = -1; k <= 1; ++k)
    {
      if (i == 0 && k == 0 && !xc.empty())
      {
        continue;
      }
      xc.insert(xc.end(), { i * h, d, k * h });
    }
  }
  // The adjacent cell first.
  std::vector<double> ordered = { 0, d, 0 };
  for (std::size_t k = 0; k < xc.size() / 3; ++k)
  {
    if (!(xc[3 * k] == 0 && xc[3 * k + 2] == 0))
    {
      ordered.insert(ordered.end(), { xc[3 * k], xc[3 * k + 1], xc[3 * k + 2] });
    }
  }
  const int nc = static_cast<int>(ordered.size() / 3);
  uc.assign(ordered.size(), 0.0);
  for (int k = 0; k < nc; ++k)
  {
    uc[3 * k] = 2.0 * ordered[3 * k + 1];
  }
  const double xw[12] = { -h / 2, 0, -h / 2, h / 2, 0, -h / 2, h / 2, 0, h / 2, -h / 2, 0, h / 2 };
  const double uw[12] = {};
  WallFitResult<double> r;
  EXPECT_EQ(QuadraticWallFit(xf, n, ordered.data(), uc.data(), nc, xw, uw, 4, 1e-17, r),
    WallFitStatus::NoNormalCurvature);
  EXPECT_TRUE(std::isnan(r.G[0]));
}
