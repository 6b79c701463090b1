// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/WallLaw.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>

using namespace wallloads;

namespace
{
const double Kappa = DefaultKarmanConstant<double>();
const double B = DefaultLogLawIntercept<double>();

// The test's own inverse of Spalding's formula: plain bisection on
// y+(u+) - target, independent of the kernel's Newton. y+(u+) is increasing
// and y+(u+) >= u+, so the root is in [0, target].
double UPlusByBisection(double yPlus, double kappa = Kappa, double b = B)
{
  double lo = 0, hi = yPlus;
  for (int k = 0; k < 200 && hi - lo > 0; ++k)
  {
    const double mid = 0.5 * (lo + hi);
    if (mid == lo || mid == hi)
    {
      break;
    }
    (SpaldingYPlus(mid, kappa, b) < yPlus ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}
}

// The series branch (|kappa u+| < 2) and the direct branch agree with an
// extended-precision evaluation of the same kernel: the tail e^z - 1 - z -
// z^2/2 - z^3/6 ~ z^4/24 would lose every digit to cancellation if written
// directly at small z.
TEST(WallLaw, SpaldingFormulaIsAccurateAcrossBranches)
{
  // The same constants in both precisions (0.41L is not the double 0.41).
  const long double kl = Kappa, bl = B;
  const double eps = std::numeric_limits<double>::epsilon();
  double worst = 0;
  for (double up = 1e-3; up < 80; up *= 1.01)
  {
    // Relative to the condition number of the formula, u+ |y+'| / |y+|
    // (~ kappa u+ in the log layer): rounding kappa u+ alone costs that.
    const double y = SpaldingYPlus(up);
    const long double yl = SpaldingYPlus<long double>(up, kl, bl);
    const double dy = SpaldingYPlusDerivative(up);
    const long double dyl = SpaldingYPlusDerivative<long double>(up, kl, bl);
    const double condY = std::max(1.0, static_cast<double>(up * dyl / yl));
    worst = std::max(worst, static_cast<double>(std::abs((y - yl) / yl)) / (eps * condY));
    const double condD = std::max(1.0, Kappa * up);
    worst = std::max(worst, static_cast<double>(std::abs((dy - dyl) / dyl)) / (eps * condD));
  }
  // Measured 0.55 ulp times the condition number.
  EXPECT_LT(worst, 2.0);
  EXPECT_EQ(SpaldingYPlus(0.0), 0.0);
  // Continuity at the branch switch, kappa u+ = 2.
  const double u = 2 / Kappa;
  const double below = SpaldingYPlus(std::nextafter(u, 0.0));
  const double above = SpaldingYPlus(std::nextafter(u, 10.0));
  EXPECT_NEAR(below, above, 1e-14 * above);
}

// Velocities synthesised from Spalding's formula at a known u_tau, for y+
// log-spaced from 0.5 to 1e4 (200 points) and two (nu, y) pairs, give back
// u_tau. The iteration count is bounded over the whole range.
TEST(WallLaw, RecoversFrictionVelocity)
{
  struct Case
  {
    double Nu, Y;
  };
  const Case cases[2] = { { 1.5e-5, 1e-3 }, { 1e-6, 0.05 } }; // air at 1 mm, water at 5 cm
  double worst = 0;
  int maxIterations = 0;
  for (const Case& c : cases)
  {
    for (int k = 0; k < 200; ++k)
    {
      const double target = 0.5 * std::pow(1e4 / 0.5, k / 199.0);
      const double uPlus = UPlusByBisection(target);
      const double yPlus = SpaldingYPlus(uPlus); // consistent pair, up to rounding
      const double uTau = yPlus * c.Nu / c.Y;
      const double U = uPlus * uTau;
      FrictionVelocityResult<double> r;
      ASSERT_EQ(SolveSpaldingFrictionVelocity(U, c.Y, c.Nu, r), WallLawStatus::Ok) << target;
      const double err = std::abs(r.FrictionVelocity - uTau) / uTau;
      EXPECT_LT(err, 1e-10) << "y+ = " << target;
      worst = std::max(worst, err);
      maxIterations = std::max(maxIterations, r.Iterations);
      EXPECT_NEAR(r.YPlus, yPlus, 1e-12 * yPlus);
      EXPECT_NEAR(r.UPlus, uPlus, 1e-12 * uPlus);
    }
  }
  // Measured: worst 3.3e-16 (rounding of the synthesised U and u_tau), so the
  // ~1e-14 convergence claim holds with margin.
  EXPECT_LT(worst, 1e-14);
  // Measured: at most 7 residual evaluations (2 of them for the two initial
  // guesses), over this test and a 2001-point sweep of 0.1..1e5.
  EXPECT_LE(maxIterations, 8);
}

// The designed range 0.1 <= y+ <= 1e5, with the common-practice constants
// and Spalding's own, converges in a bounded number of evaluations.
TEST(WallLaw, ConvergesOverDesignRange)
{
  const double constants[2][2] = { { Kappa, B },
    { SpaldingKarmanConstant<double>(), SpaldingLogLawIntercept<double>() } };
  int maxIterations = 0;
  for (const auto& kb : constants)
  {
    for (int k = 0; k <= 300; ++k)
    {
      const double target = 0.1 * std::pow(1e6, k / 300.0);
      const double uPlus = UPlusByBisection(target, kb[0], kb[1]);
      const double nu = 1e-5, y = 1e-2;
      const double yPlus = SpaldingYPlus(uPlus, kb[0], kb[1]);
      const double uTau = yPlus * nu / y;
      FrictionVelocityResult<double> r;
      ASSERT_EQ(SolveSpaldingFrictionVelocity(uPlus * uTau, y, nu, r, kb[0], kb[1]),
        WallLawStatus::Ok)
        << target;
      EXPECT_NEAR(r.FrictionVelocity, uTau, 1e-13 * uTau) << target;
      maxIterations = std::max(maxIterations, r.Iterations);
    }
  }
  EXPECT_LE(maxIterations, 8);
  // Far outside the range the bracket still holds (exp overflows at the
  // sublayer guess: the log-law guess and bisection take over).
  FrictionVelocityResult<double> r;
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1e3, 1.0, 1e-9, r), WallLawStatus::Ok);
  EXPECT_NEAR(SpaldingYPlus(r.UPlus), r.YPlus, 1e-13 * r.YPlus);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1e-12, 1e-6, 1e-3, r), WallLawStatus::Ok);
  EXPECT_NEAR(r.UPlus, r.YPlus, 1e-12 * r.YPlus); // deep in the sublayer
  // An iteration limit too small to converge is reported, with the iterate.
  EXPECT_EQ(SolveSpaldingFrictionVelocity(10.0, 1e-2, 1e-5, r, Kappa, B, 3),
    WallLawStatus::NoConvergence);
  EXPECT_TRUE(r.FrictionVelocity > 0);
}

TEST(WallLaw, BadInputAndZeroSpeed)
{
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  FrictionVelocityResult<double> r;
  EXPECT_EQ(SolveSpaldingFrictionVelocity(-1.0, 1e-3, 1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 0.0, 1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, -1e-3, 1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 1e-3, 0.0, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 1e-3, -1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(nan, 1e-3, 1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, nan, 1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 1e-3, nan, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(inf, 1e-3, 1e-5, r), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 1e-3, 1e-5, r, nan, B), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 1e-3, 1e-5, r, Kappa, nan), WallLawStatus::BadInput);
  EXPECT_EQ(SolveSpaldingFrictionVelocity(1.0, 1e-3, 1e-5, r, 0.0, B), WallLawStatus::BadInput);
  ASSERT_EQ(SolveSpaldingFrictionVelocity(0.0, 1e-3, 1e-5, r), WallLawStatus::Ok);
  EXPECT_EQ(r.FrictionVelocity, 0.0);
  EXPECT_EQ(r.YPlus, 0.0);
  EXPECT_EQ(r.UPlus, 0.0);
}

// Limits of Spalding's formula.
// Small y+: y+ - u+ = exp(-kappa B) (kappa u+)^4/24 (1 + O(kappa u+)), so
// u+ = y+ to 1.6e-4 relative at y+ = 1 and the deviation is fourth order.
// Large y+: y+ = exp(kappa (u+ - B)) (1 - P3(kappa u+) e^-kappa u+) + u+,
// so u+ approaches ln(y+)/kappa + B with a deviation that decays like
// (ln y+)^3 / y+ (P3 the cubic Taylor polynomial of exp).
TEST(WallLaw, SublayerAndLogLawLimits)
{
  // (From 1e-2: below it y+ - u+ < 1e-12 y+ is too close to rounding to test.)
  for (double yp : { 1e-2, 0.1, 0.5, 1.0 })
  {
    const double up = UPlusByBisection(yp);
    const double z = Kappa * up;
    const double leading = std::exp(-Kappa * B) * z * z * z * z / 24;
    // deviation equals the leading term to O(kappa u+) = O(z / 5)
    EXPECT_NEAR((yp - up) / leading, 1.0, 0.25 * z + 1e-6) << yp;
    EXPECT_LT(std::abs(up - yp), 2e-4 * yp) << yp;
  }
  // The leading estimate of the deviation, derived by putting
  // u+ = L + delta (L = ln(y+)/kappa + B) into the formula:
  //   delta = -(L - exp(-kappa B) P3(kappa L)) / (kappa y+) (1 + O(delta)).
  // Measured ratio deviation/estimate - 1: 4e-3 at 1e3, 8e-5 at 1e4, 2e-5 at 1e6.
  for (double yp : { 1e3, 3e3, 1e4, 1e5, 1e6 })
  {
    const double up = UPlusByBisection(yp);
    const double logLaw = std::log(yp) / Kappa + B;
    const double z = Kappa * logLaw;
    const double p3 = 1 + z + z * z / 2 + z * z * z / 6;
    const double estimate = -(logLaw - std::exp(-Kappa * B) * p3) / (Kappa * yp);
    EXPECT_NEAR((up - logLaw) / estimate, 1.0, 0.01) << yp;
  }
  // The estimate's numerator changes sign near y+ = 1e3, so the deviation
  // decreases monotonically only beyond its peak (4.26e-3 at y+ = 3.2e3,
  // measured on a log grid over 1e3..1e5): the log law holds to 5e-3 in u+
  // for y+ >= 1e3.
  double previous = 1e300;
  for (int k = 0; k <= 40; ++k)
  {
    const double yp = 1e3 * std::pow(1e3, k / 40.0);
    const double deviation = std::abs(UPlusByBisection(yp) - (std::log(yp) / Kappa + B));
    EXPECT_LT(deviation, 5e-3) << yp;
    if (yp > 4e3)
    {
      EXPECT_LT(deviation, previous) << yp;
    }
    previous = deviation;
  }
}

TEST(WallLaw, NearWallRegime)
{
  EXPECT_EQ(NearWallRegime(0.0), ViscousSublayer);
  EXPECT_EQ(NearWallRegime(4.999), ViscousSublayer);
  EXPECT_EQ(NearWallRegime(5.0), BufferLayer);
  EXPECT_EQ(NearWallRegime(30.0), BufferLayer);
  EXPECT_EQ(NearWallRegime(30.001), LogLayer);
  EXPECT_EQ(NearWallRegime(1e5), LogLayer);
  EXPECT_EQ(NearWallRegime(-1.0), UnknownRegime);
  EXPECT_EQ(NearWallRegime(std::nan("")), UnknownRegime);
  EXPECT_EQ(static_cast<int>(NearWallRegime(12.0f)), 1);
}

// Single precision: same algorithm, tolerance of a few float ulps.
TEST(WallLaw, FloatInstantiation)
{
  for (float yp : { 0.5f, 20.0f, 3000.0f })
  {
    const float up = static_cast<float>(UPlusByBisection(yp));
    const float ypf = SpaldingYPlus(up);
    const float nu = 1.5e-5f, y = 1e-3f;
    const float uTau = ypf * nu / y;
    FrictionVelocityResult<float> r;
    ASSERT_EQ(SolveSpaldingFrictionVelocity(up * uTau, y, nu, r), WallLawStatus::Ok);
    EXPECT_NEAR(r.FrictionVelocity, uTau, 1e-5f * uTau) << yp;
  }
}
