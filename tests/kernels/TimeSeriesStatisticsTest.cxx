// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/TimeSeriesStatistics.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <vector>

using namespace wallloads;

namespace
{
constexpr double Pi = 3.14159265358979323846;

/// AR(1) series x_i = phi x_{i-1} + e_i, e_i ~ N(0, s^2), started from its
/// stationary distribution (so there is no transient).
std::vector<double> Ar1(std::size_t n, double phi, double s, std::mt19937_64& rng)
{
  std::normal_distribution<double> e(0.0, s);
  std::vector<double> x(n);
  x[0] = e(rng) / std::sqrt(1 - phi * phi);
  for (std::size_t i = 1; i < n; ++i)
  {
    x[i] = phi * x[i - 1] + e(rng);
  }
  return x;
}

/// Uneven sampling times: steps drawn uniformly in [0.5, 1.5] dt.
std::vector<double> UnevenTimes(std::size_t n, double dt, std::mt19937_64& rng)
{
  std::uniform_real_distribution<double> u(0.5, 1.5);
  std::vector<double> t(n);
  t[0] = 0.25;
  for (std::size_t i = 1; i < n; ++i)
  {
    t[i] = t[i - 1] + dt * u(rng);
  }
  return t;
}
} // namespace

TEST(TimeSeriesStatistics, BasicStatistics)
{
  const double x[] = { 1, 2, 3, 4, 10 };
  const BasicStatistics<double> s = ComputeBasicStatistics(x, 5);
  EXPECT_EQ(s.Samples, 5u);
  EXPECT_DOUBLE_EQ(s.Mean, 4.0);
  // sum of squared deviations 9 + 4 + 1 + 0 + 36 = 50, / (n - 1) = 12.5
  EXPECT_DOUBLE_EQ(s.StandardDeviation, std::sqrt(12.5));
  EXPECT_EQ(s.Minimum, 1.0);
  EXPECT_EQ(s.Maximum, 10.0);
  EXPECT_FALSE(s.Constant);
}

// Undefined statistics are NaN with the reason: fewer than 8 samples, or a
// constant signal.
TEST(TimeSeriesStatistics, UndefinedIsNaN)
{
  const double t[] = { 0, 1, 2, 3, 4, 5, 6 };
  const double y[] = { 1, 3, 2, 5, 1, 2, 4 };
  EXPECT_EQ(IntegratedAutocorrelation(y, 7).Status, SeriesStatus::TooFewSamples);
  EXPECT_TRUE(std::isnan(IntegratedAutocorrelation(y, 7).Tau));
  EXPECT_TRUE(std::isnan(DominantFrequency(t, y, 7).Frequency));
  EXPECT_TRUE(std::isnan(DominantFrequency(t, y, 7).Amplitude));
  std::vector<double> tc(20), yc(20, 3.25);
  for (int i = 0; i < 20; ++i)
  {
    tc[i] = i;
  }
  EXPECT_TRUE(ComputeBasicStatistics(yc.data(), 20).Constant);
  EXPECT_EQ(ComputeBasicStatistics(yc.data(), 20).StandardDeviation, 0.0);
  EXPECT_EQ(IntegratedAutocorrelation(yc.data(), 20).Status, SeriesStatus::Constant);
  EXPECT_EQ(DominantFrequency(tc.data(), yc.data(), 20).Status, SeriesStatus::Constant);
  EXPECT_TRUE(std::isnan(DominantFrequency(tc.data(), yc.data(), 20).Amplitude));
  EXPECT_TRUE(std::isnan(StandardErrorOfMean(1.0, std::nan(""), 20)));
  EXPECT_EQ(Mser5Truncation(yc.data(), 19), 0u); // fewer than 4 batches: no truncation
}

// AR(1), x_i = phi x_{i-1} + e_i (derivation, e.g. Sokal 1997 section 3 or
// any time-series text): Var x = s^2 / (1 - phi^2) and rho(k) = phi^k, so
//   tau_int = 1 + 2 sum_{k>=1} phi^k = 1 + 2 phi / (1 - phi) = (1 + phi) / (1 - phi),
// and the variance of the mean of n samples is, for n >> tau,
//   Var(mean) = tau_int Var x / n = s^2 / ((1 - phi)^2 n),
//   SEM = s / ((1 - phi) sqrt(n)).
// phi = 0.8: tau_int = 9. Sokal's window cuts at M ~ 5 tau = 45, leaving out
// 2 sum_{k>45} 0.8^k = 10 * 0.8^46 = 3.5e-4 (bias negligible); the
// statistical error of the estimate is sqrt(2 (2M + 1) / n) = 4.3% of tau for
// n = 1e5 (Sokal 1997 eq. 3.19), so tau within 15% (3.5 sigma) and SEM
// (which goes as sqrt(tau)) within 8%.
TEST(TimeSeriesStatistics, Ar1AutocorrelationTimeAndStandardError)
{
  std::mt19937_64 rng(12345);
  const double phi = 0.8, s = 0.5;
  const std::size_t n = 100000;
  const std::vector<double> x = Ar1(n, phi, s, rng);
  const AutocorrelationTime<double> a = IntegratedAutocorrelation(x.data(), n);
  ASSERT_EQ(a.Status, SeriesStatus::Ok);
  const double tauExact = (1 + phi) / (1 - phi);
  EXPECT_NEAR(a.Tau, tauExact, 0.15 * tauExact);
  EXPECT_GE(static_cast<double>(a.Window), 5 * a.Tau); // Sokal's condition holds at M
  const BasicStatistics<double> b = ComputeBasicStatistics(x.data(), n);
  const double sem = StandardErrorOfMean(b.StandardDeviation, a.Tau, n);
  const double semExact = s / ((1 - phi) * std::sqrt(static_cast<double>(n)));
  EXPECT_NEAR(sem, semExact, 0.08 * semExact);
}

// The standard error is what it claims to be: over 400 independent AR(1)
// series of 4000 samples (phi = 0.9, tau = 19), the spread of their means
// matches the analytic SEM s / ((1 - phi) sqrt(n)) and the average estimated
// SEM. The spread of 400 means is known to sqrt(1 / (2 * 399)) = 3.5%; the
// per-series estimate of tau has about sqrt(2 (2 * 95 + 1) / 4000) = 31%
// scatter (about 15% on the SEM) but its average over 400 series is known to
// ~1%, and is biased low by the window (about 1 - 1/(2 n/tau) plus the
// left-out tail): within 10% of the analytic value.
TEST(TimeSeriesStatistics, Ar1StandardErrorMatchesSpreadOfMeans)
{
  std::mt19937_64 rng(777);
  const double phi = 0.9, s = 1.0;
  const std::size_t n = 4000, series = 400;
  double sumMean = 0, sumMean2 = 0, sumSem = 0;
  for (std::size_t r = 0; r < series; ++r)
  {
    const std::vector<double> x = Ar1(n, phi, s, rng);
    const BasicStatistics<double> b = ComputeBasicStatistics(x.data(), n);
    const AutocorrelationTime<double> a = IntegratedAutocorrelation(x.data(), n);
    ASSERT_EQ(a.Status, SeriesStatus::Ok);
    sumMean += b.Mean;
    sumMean2 += b.Mean * b.Mean;
    sumSem += StandardErrorOfMean(b.StandardDeviation, a.Tau, n);
  }
  const double m = sumMean / series;
  const double spread = std::sqrt((sumMean2 - series * m * m) / (series - 1));
  const double semExact = s / ((1 - phi) * std::sqrt(static_cast<double>(n)));
  EXPECT_NEAR(spread, semExact, 0.12 * semExact); // 3.5 sigma of the spread
  EXPECT_NEAR(sumSem / series, semExact, 0.10 * semExact);
}

// A sine sampled at uneven times (steps uniform in [0.5, 1.5] dt) with
// white noise of sd sigma: the least-squares frequency has standard error
// sigma_w = sqrt(12 / n) sigma / (A T) (Cramer-Rao bound for one sinusoid,
// Rife & Boorstyn 1974, IEEE Trans. Inf. Theory 20:591), here
// sqrt(12/400) * 0.05 / (2 * 40) rad/s = 1.1e-4 rad/s, 1.7e-5 Hz; the
// semi-amplitude sigma sqrt(2 / n) = 0.0035. Tolerances: 2e-4 Hz (12 sigma,
// and 1/15 of the 8x oversampled grid spacing 1/(8 T) = 3.1e-3 Hz, so the
// refinement is what meets it) and 0.02 (6 sigma).
TEST(TimeSeriesStatistics, LombScargleUnevenSine)
{
  std::mt19937_64 rng(2024);
  const std::size_t n = 400;
  const std::vector<double> t = UnevenTimes(n, 0.1, rng);
  const double f = 0.37, amplitude = 2.0, mean = 5.0, sigma = 0.05;
  std::normal_distribution<double> noise(0.0, sigma);
  std::vector<double> y(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    y[i] = mean + amplitude * std::sin(2 * Pi * f * t[i] + 0.3) + noise(rng);
  }
  const DominantSinusoid<double> d = DominantFrequency(t.data(), y.data(), n);
  ASSERT_EQ(d.Status, SeriesStatus::Ok);
  EXPECT_NEAR(d.Frequency, f, 2e-4);
  EXPECT_NEAR(d.Amplitude, amplitude, 0.02);
  // Scargle 1982 eq. 10 normalised by the variance: a pure sinusoid of
  // semi-amplitude A over many cycles has P = n A^2 / (4 var) = n / 2 with
  // var = A^2 / 2 (+ the noise, 0.06% here).
  EXPECT_NEAR(d.Power, n / 2.0, 0.01 * n / 2.0);
}

// Without noise, a frequency half-way between grid points is found to
// round-off by the refinement (the grid alone would be off by df / 2).
TEST(TimeSeriesStatistics, LombScargleRefinesOffTheGrid)
{
  std::mt19937_64 rng(99);
  const std::size_t n = 256;
  const std::vector<double> t = UnevenTimes(n, 0.05, rng);
  const double span = t[n - 1] - t[0];
  const double df = 1 / (8 * span);
  const double f = 1 / span + 40.5 * df; // mid-grid
  std::vector<double> y(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    y[i] = -1.5 + 0.75 * std::cos(2 * Pi * f * t[i] - 1.0);
  }
  const DominantSinusoid<double> d = DominantFrequency(t.data(), y.data(), n);
  EXPECT_NEAR(d.Frequency, f, 1e-6 * f);
  EXPECT_NEAR(d.Amplitude, 0.75, 1e-6);
}

// MSER-5 on a start-up transient (White 1997): y = 1 + 3 exp(-i / 40) + noise
// (sd 0.1), n = 2000. The transient falls below the noise after
// 40 ln(30) = 136 samples. Without truncation the mean is biased by
// 3 * 40 / 2000 = 0.06; the standard error of the truncated mean is about
// 0.1 / sqrt(1800) = 0.0024. The truncation must land past the bulk of the
// transient (3 time constants: 120 samples, where it is 0.15) and in the first
// half (White's rule), and the truncated mean must be closer to the truth
// than the untruncated one by at least a factor 5.
TEST(TimeSeriesStatistics, Mser5RemovesTransient)
{
  std::mt19937_64 rng(4242);
  std::normal_distribution<double> noise(0.0, 0.1);
  const std::size_t n = 2000;
  std::vector<double> y(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    y[i] = 1.0 + 3.0 * std::exp(-static_cast<double>(i) / 40.0) + noise(rng);
  }
  const std::size_t d = Mser5Truncation(y.data(), n);
  EXPECT_GE(d, 120u);
  EXPECT_LT(d, n / 2);
  EXPECT_EQ(d % 5, 0u);
  const double all = ComputeBasicStatistics(y.data(), n).Mean;
  const double kept = ComputeBasicStatistics(y.data() + d, n - d).Mean;
  EXPECT_LT(std::abs(kept - 1.0) * 5, std::abs(all - 1.0));
}
