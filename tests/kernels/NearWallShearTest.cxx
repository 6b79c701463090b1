// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/NearWallShear.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

using namespace wallloads;

namespace
{
// An oblique wall frame: unit normal n into the fluid, unit tangents t1, t2.
struct Frame
{
  double N[3], T1[3], T2[3];
  Frame()
  {
    const double a[3] = { 0.3, -0.5, 0.8 };
    const double na = Norm(a);
    for (int i = 0; i < 3; ++i)
    {
      N[i] = a[i] / na;
    }
    const double b[3] = { 1, 0.2, -0.1 };
    const double bn = Dot(b, N);
    double t[3] = { b[0] - bn * N[0], b[1] - bn * N[1], b[2] - bn * N[2] };
    const double nt = Norm(t);
    for (int i = 0; i < 3; ++i)
    {
      T1[i] = t[i] / nt;
    }
    Cross(N, T1, T2);
  }
};

double Order(double e1, double e2, double h1, double h2)
{
  return std::log(e1 / e2) / std::log(h1 / h2);
}

// Least squares of g(t) = t^p by a t + b t^2 (by a t alone if m = 1) over
// t_k, k < m, by the raw 2x2 normal equations: the test's own oracle for the
// wall fit's response to a t^p term of the profile. Returns a.
double PowerFitSlope(const double* t, int m, int p)
{
  double s2 = 0, s3 = 0, s4 = 0, r1 = 0, r2 = 0;
  for (int k = 0; k < m; ++k)
  {
    const double x = t[k], g = std::pow(x, p);
    s2 += x * x;
    s3 += x * x * x;
    s4 += x * x * x * x;
    r1 += x * g;
    r2 += x * x * g;
  }
  if (m == 1)
  {
    return r1 / s2;
  }
  return (r1 * s4 - r2 * s3) / (s2 * s4 - s3 * s3);
}
}

// Plane Couette flow u = u_W + U (d/h) t over a moving wall, in an oblique
// frame, with a spurious normal velocity that the tangential split removes:
// tau_w = mu U/h along t, and every method is exact (e.g. White, Viscous
// Fluid Flow, §3-2, Couette flow).
TEST(NearWallShear, CouetteEveryMethodExact)
{
  const Frame f;
  const double mu = 1.8e-5, U = 3.0, h = 0.02;
  const double uW[3] = { 0.7 * f.T2[0], 0.7 * f.T2[1], 0.7 * f.T2[2] };
  const double tauExact = mu * U / h;
  auto velocity = [&](double d, double* u) {
    for (int i = 0; i < 3; ++i)
    {
      u[i] = uW[i] + U * d / h * f.T1[i] + 0.4 * f.N[i];
    }
  };
  auto check = [&](const double tau[3], const char* what) {
    for (int i = 0; i < 3; ++i)
    {
      EXPECT_NEAR(tau[i], tauExact * f.T1[i], 1e-14 * tauExact) << what << " " << i;
    }
  };
  double tau[3];
  for (double d : { 1e-4, 3e-3, 0.015 })
  {
    double u[3];
    velocity(d, u);
    ASSERT_EQ(NearWallDifferenceShear(u, uW, f.N, d, mu, tau), ShearStatus::Ok);
    check(tau, "difference");
  }
  for (int m : { 2, 3, 5 })
  {
    double d[5], u[15];
    const double w[5] = { 1, 0.5, 2, 0.1, 3 };
    for (int k = 0; k < m; ++k)
    {
      d[k] = (k + 0.5) * h / 8;
      velocity(d[k], u + 3 * k);
    }
    ASSERT_EQ(WallFitShear(d, u, static_cast<const double*>(nullptr), m, uW, f.N, mu, tau),
      ShearStatus::Ok);
    check(tau, "fit");
    ASSERT_EQ(WallFitShear(d, u, w, m, uW, f.N, mu, tau), ShearStatus::Ok);
    check(tau, "weighted fit");
  }
  // G = (U/h) t1 n^T plus a dilatation c I, which is normal and drops out.
  double G[9];
  for (int i = 0; i < 3; ++i)
  {
    for (int j = 0; j < 3; ++j)
    {
      G[3 * i + j] = U / h * f.T1[i] * f.N[j] + (i == j ? 5.0 : 0.0);
    }
  }
  ASSERT_EQ(GradientWallShear(G, mu, f.N, tau), ShearStatus::Ok);
  check(tau, "gradient");
}

// Plane Poiseuille flow between walls y = 0 and y = h,
// u = 4 U_m y (h - y) / h^2, tau_w = 4 mu U_m / h at y = 0 (e.g. White,
// Viscous Fluid Flow, §3-2, Poiseuille flow between plates). The wall fit
// is exact (the profile is its model); the near-wall difference has the
// relative error -d/h exactly: first order.
TEST(NearWallShear, PoiseuilleFitExactDifferenceFirstOrder)
{
  const Frame f;
  const double mu = 1e-3, Um = 0.2, h = 0.01;
  const double uW[3] = { 0, 0, 0 };
  const double tauExact = 4 * mu * Um / h;
  auto profile = [&](double y) { return 4 * Um * y * (h - y) / (h * h); };
  double tau[3], curvature[3];
  for (int m : { 2, 3, 4 })
  {
    for (double dy : { h / 10, h / 40 })
    {
      double d[4], u[12];
      for (int k = 0; k < m; ++k)
      {
        d[k] = (k + 0.5) * dy;
        for (int i = 0; i < 3; ++i)
        {
          u[3 * k + i] = profile(d[k]) * f.T1[i];
        }
      }
      ASSERT_EQ(WallFitShear(d, u, static_cast<const double*>(nullptr), m, uW, f.N, mu, tau,
                  curvature),
        ShearStatus::Ok);
      for (int i = 0; i < 3; ++i)
      {
        EXPECT_NEAR(tau[i], tauExact * f.T1[i], 1e-14 * tauExact) << m << " " << dy;
        // b = u''/2 = -4 U_m / h^2 (= (dp/dx) / (2 mu)).
        EXPECT_NEAR(curvature[i], -4 * Um / (h * h) * f.T1[i], 1e-12 * 4 * Um / (h * h));
      }
    }
  }
  // Near-wall difference at four distances.
  const double ds[4] = { h / 10, h / 20, h / 40, h / 80 };
  double err[4];
  for (int k = 0; k < 4; ++k)
  {
    double u[3];
    for (int i = 0; i < 3; ++i)
    {
      u[i] = profile(ds[k]) * f.T1[i];
    }
    ASSERT_EQ(NearWallDifferenceShear(u, uW, f.N, ds[k], mu, tau), ShearStatus::Ok);
    err[k] = Norm(tau) / tauExact - 1;
    EXPECT_NEAR(err[k], -ds[k] / h, 1e-13);
  }
  // Measured order 1.00000000000001 (the error is exactly linear in d).
  for (int k = 0; k + 1 < 4; ++k)
  {
    const double p = Order(std::abs(err[k]), std::abs(err[k + 1]), ds[k], ds[k + 1]);
    EXPECT_GE(p, 0.9);
    EXPECT_LE(p, 1.1);
  }
  // The gradient path with the exact wall gradient is exact.
  double G[9];
  for (int i = 0; i < 3; ++i)
  {
    for (int j = 0; j < 3; ++j)
    {
      G[3 * i + j] = 4 * Um / h * f.T1[i] * f.N[j];
    }
  }
  ASSERT_EQ(GradientWallShear(G, mu, f.N, tau), ShearStatus::Ok);
  EXPECT_NEAR(Norm(tau), tauExact, 1e-14 * tauExact);
}

// Laminar flat-plate boundary layer (Blasius 1908; White, Viscous Fluid
// Flow, §4-3): f''' + f f''/2 = 0, f(0) = f'(0) = 0, f'(inf) = 1,
// u/U = f'(eta), eta = y sqrt(U/(nu x)), cf = 2 f''(0)/sqrt(Re_x) = 0.664/sqrt(Re_x).
//
// Near the wall f' = s eta - s^2 eta^4/48 + 11 s^3 eta^7/20160 + O(eta^10),
// s = f''(0) (the power series of the equation, coefficients derived from it
// term by term): no eta^2 or eta^3 term (zero pressure gradient), so both the
// near-wall difference and the wall fit converge at third order. With the
// samples at eta_k = t_k dEta, t_k = k + 1/2, the relative error of tau_w is
//   -(s/48) A4 dEta^3 + (11 s^2/20160) A7 dEta^6 + O(dEta^9),
// A_p the slope a of the least-squares fit of t^p by a t + b t^2 on the t_k
// (a t alone for the difference): A4 = 1/8 for the difference, -3/2 for
// the 2-sample fit and -11.27 for the 3-sample fit, which is therefore the
// least accurate here: its samples reach further into the curved profile.
TEST(NearWallShear, BlasiusBoundaryLayer)
{
  // RK4 on (f, f', f''), step 1/640 so that every sample eta lands on a step.
  const int perUnit = 640;
  const double step = 1.0 / perUnit;
  const int steps = 12 * perUnit; // eta_max = 12: f'' ~ 1e-12 there
  auto integrate = [&](double s, std::vector<double>* fp) {
    double y[3] = { 0, 0, s };
    if (fp)
    {
      fp->assign(1, 0.0);
    }
    auto rhs = [](const double* v, double* out) {
      out[0] = v[1];
      out[1] = v[2];
      out[2] = -0.5 * v[0] * v[2];
    };
    for (int n = 0; n < steps; ++n)
    {
      double k1[3], k2[3], k3[3], k4[3], t[3];
      rhs(y, k1);
      for (int i = 0; i < 3; ++i)
        t[i] = y[i] + 0.5 * step * k1[i];
      rhs(t, k2);
      for (int i = 0; i < 3; ++i)
        t[i] = y[i] + 0.5 * step * k2[i];
      rhs(t, k3);
      for (int i = 0; i < 3; ++i)
        t[i] = y[i] + step * k3[i];
      rhs(t, k4);
      for (int i = 0; i < 3; ++i)
        y[i] += step / 6 * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
      if (fp)
      {
        fp->push_back(y[1]);
      }
    }
    return y[1];
  };
  // Shooting on s = f''(0) by the secant method on f'(eta_max) - 1.
  double s0 = 0.3, s1 = 0.35;
  double r0 = integrate(s0, nullptr) - 1, r1 = integrate(s1, nullptr) - 1;
  for (int it = 0; it < 50 && std::abs(s1 - s0) > 1e-15; ++it)
  {
    const double s2 = s1 - r1 * (s1 - s0) / (r1 - r0);
    s0 = s1;
    r0 = r1;
    s1 = s2;
    r1 = integrate(s1, nullptr) - 1;
  }
  const double s = s1;
  // f''(0) = 0.332057 (Blasius 1908; White §4-3; value recalled from memory).
  // Measured 0.332057336215269.
  EXPECT_NEAR(s, 0.332057, 1e-5);
  std::vector<double> fp;
  integrate(s, &fp);

  // Air over a plate: U = 10 m/s, x = 0.5 m, Re_x = 3.3e5.
  const double U = 10, nu = 1.5e-5, rho = 1.2, mu = rho * nu, x = 0.5;
  const double reX = U * x / nu;
  const double etaPerY = std::sqrt(U / (nu * x));
  const double cfExact = 2 * s / std::sqrt(reX); // this profile's own wall stress
  const double n[3] = { 0, 1, 0 };
  const double uW[3] = { 0, 0, 0 };

  struct Method
  {
    const char* Name;
    int Samples; // 0: near-wall difference
  };
  const Method methods[3] = { { "difference", 0 }, { "fit2", 2 }, { "fit3", 3 } };
  const double dEta[4] = { 0.4, 0.2, 0.1, 0.05 };
  for (const Method& m : methods)
  {
    const int count = m.Samples ? m.Samples : 1;
    double t[3] = { 0.5, 1.5, 2.5 };
    const double a4 = PowerFitSlope(t, count, 4);
    const double a7 = PowerFitSlope(t, count, 7);
    double err[4];
    for (int r = 0; r < 4; ++r)
    {
      const double dy = dEta[r] / etaPerY;
      double d[3], u[9];
      for (int k = 0; k < count; ++k)
      {
        d[k] = (k + 0.5) * dy;
        const long idx = std::lround((k + 0.5) * dEta[r] * perUnit);
        u[3 * k] = U * fp[static_cast<std::size_t>(idx)];
        u[3 * k + 1] = u[3 * k + 2] = 0;
      }
      double tau[3];
      if (m.Samples)
      {
        ASSERT_EQ(WallFitShear(d, u, static_cast<const double*>(nullptr), count, uW, n, mu, tau),
          ShearStatus::Ok);
      }
      else
      {
        ASSERT_EQ(NearWallDifferenceShear(u, uW, n, d[0], mu, tau), ShearStatus::Ok);
      }
      const double cf = 2 * tau[0] / (rho * U * U);
      err[r] = cf / cfExact - 1;
      const double leading = -s / 48 * a4 * std::pow(dEta[r], 3);
      const double next = 11 * s * s / 20160 * a7 * std::pow(dEta[r], 6);
      // Measured: the two terms predict the error to 1e-4 (worst: the
      // coarsest 3-sample stencil, reaching eta = 1; the next term is
      // O(eta^6) of the leading one), the leading term alone to 1.2% there
      // and to 0.2% or better elsewhere.
      EXPECT_NEAR(err[r] / (leading + next), 1.0, 5e-4) << m.Name << " dEta " << dEta[r];
      EXPECT_NEAR(err[r] / leading, 1.0, 0.02) << m.Name << " dEta " << dEta[r];
    }
    // Measured orders: difference 2.9999, 3.0000, 3.0000; 2-sample fit
    // 2.997, 3.000, 3.000; 3-sample fit 2.985, 2.998, 3.000.
    for (int r = 0; r + 1 < 4; ++r)
    {
      const double p = Order(std::abs(err[r]), std::abs(err[r + 1]), dEta[r], dEta[r + 1]);
      EXPECT_GE(p, 2.95) << m.Name;
      EXPECT_LE(p, 3.05) << m.Name;
    }
    // Against the textbook 0.664/sqrt(Re_x): 0.664 is 2 f''(0) = 0.664115
    // rounded, 1.7e-4 relative, which dominates the method error at the
    // finest spacing (|leading term| = 1.1e-7, 1.3e-6 and 9.7e-6 for the
    // three methods at dEta = 0.05): 1.7e-4 + 1e-5 < 2e-4. Measured
    // cf/(0.664/sqrt(Re_x)) - 1 = 1.726e-4, 1.740e-4, 1.824e-4.
    const double cfTextbook = 0.664 / std::sqrt(reX);
    const double cfFinest = cfExact * (1 + err[3]);
    EXPECT_NEAR(cfFinest / cfTextbook, 1.0, 2e-4) << m.Name;
  }
}

TEST(NearWallShear, StatusesAndFallback)
{
  const double n[3] = { 0, 0, 1 };
  const double uW[3] = { 0, 0, 0 };
  const double nan = std::numeric_limits<double>::quiet_NaN();
  double tau[3], ref[3], curvature[3];
  const double d1[1] = { 0.01 };
  const double u1[3] = { 2, 1, 7 };
  // One sample: the near-wall difference, flagged.
  ASSERT_EQ(NearWallDifferenceShear(u1, uW, n, d1[0], 1e-3, ref), ShearStatus::Ok);
  EXPECT_EQ(WallFitShear(d1, u1, static_cast<const double*>(nullptr), 1, uW, n, 1e-3, tau,
              curvature),
    ShearStatus::SingleSample);
  for (int i = 0; i < 3; ++i)
  {
    EXPECT_EQ(tau[i], ref[i]);
    EXPECT_TRUE(std::isnan(curvature[i]));
  }
  EXPECT_DOUBLE_EQ(ref[0], 0.2);
  EXPECT_EQ(ref[2], 0.0); // normal velocity removed
  // No samples, d <= 0, NaN, negative weight or viscosity: BadInput and NaN.
  const double d2[2] = { 0.01, 0.02 };
  const double u2[6] = { 1, 0, 0, 2, 0, 0 };
  const double dBad[2] = { 0.01, 0.0 };
  const double uNaN[6] = { 1, 0, 0, nan, 0, 0 };
  const double wNeg[2] = { 1, -1 };
  const double* none = nullptr;
  EXPECT_EQ(WallFitShear(d2, u2, none, 0, uW, n, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_EQ(WallFitShear(dBad, u2, none, 2, uW, n, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_TRUE(std::isnan(tau[0]));
  EXPECT_EQ(WallFitShear(d2, uNaN, none, 2, uW, n, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_EQ(WallFitShear(d2, u2, wNeg, 2, uW, n, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_EQ(WallFitShear(d2, u2, none, 2, uW, n, -1.0, tau), ShearStatus::BadInput);
  EXPECT_EQ(NearWallDifferenceShear(u1, uW, n, 0.0, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_EQ(NearWallDifferenceShear(u1, uW, n, -0.1, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_EQ(NearWallDifferenceShear(u1, uW, n, nan, 1e-3, tau), ShearStatus::BadInput);
  EXPECT_TRUE(std::isnan(tau[1]));
  const double Gnan[9] = { 0, nan, 0, 0, 0, 0, 0, 0, 0 };
  EXPECT_EQ(GradientWallShear(Gnan, 1e-3, n, tau), ShearStatus::BadInput);
  // Two samples at the same distance, or only one of positive weight: Degenerate.
  const double dSame[2] = { 0.01, 0.01 };
  const double wOne[2] = { 1, 0 };
  EXPECT_EQ(WallFitShear(dSame, u2, none, 2, uW, n, 1e-3, tau), ShearStatus::Degenerate);
  EXPECT_TRUE(std::isnan(tau[0]));
  EXPECT_EQ(WallFitShear(d2, u2, wOne, 2, uW, n, 1e-3, tau), ShearStatus::Degenerate);
  const double dClose[2] = { 0.01, 0.01 * (1 + 1e-10) };
  EXPECT_EQ(WallFitShear(dClose, u2, none, 2, uW, n, 1e-3, tau), ShearStatus::Degenerate);
}

// A weight of 2 is the same sample taken twice (weighted least squares).
TEST(NearWallShear, WeightIsMultiplicity)
{
  const double n[3] = { 0, 1, 0 };
  const double uW[3] = { 0, 0, 0 };
  const double d[3] = { 0.001, 0.003, 0.006 };
  const double u[9] = { 0.10, 0, 0.02, 0.28, 0, 0.05, 0.51, 0, 0.07 }; // not a parabola
  const double w[3] = { 1, 2, 1 };
  const double dd[4] = { 0.001, 0.003, 0.003, 0.006 };
  const double uu[12] = { 0.10, 0, 0.02, 0.28, 0, 0.05, 0.28, 0, 0.05, 0.51, 0, 0.07 };
  double a[3], b[3];
  ASSERT_EQ(WallFitShear(d, u, w, 3, uW, n, 1.0, a), ShearStatus::Ok);
  ASSERT_EQ(WallFitShear(dd, uu, static_cast<const double*>(nullptr), 4, uW, n, 1.0, b),
    ShearStatus::Ok);
  for (int i = 0; i < 3; ++i)
  {
    EXPECT_NEAR(a[i], b[i], 1e-12 * std::abs(b[0]));
  }
}

// Single precision instantiation on Couette flow.
TEST(NearWallShear, FloatInstantiation)
{
  const float n[3] = { 0, 1, 0 };
  const float uW[3] = { 0, 0, 0 };
  const float d[2] = { 0.5f, 1.5f };
  const float u[6] = { 1, 0, 0, 3, 0, 0 };
  float tau[3];
  ASSERT_EQ(WallFitShear(d, u, static_cast<const float*>(nullptr), 2, uW, n, 2.0f, tau),
    ShearStatus::Ok);
  EXPECT_NEAR(tau[0], 4.0f, 1e-5f);
  const float G[9] = { 0, 2, 0, 0, 0, 0, 0, 0, 0 };
  ASSERT_EQ(GradientWallShear(G, 2.0f, n, tau), ShearStatus::Ok);
  EXPECT_NEAR(tau[0], 4.0f, 1e-6f);
}
