// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Statistics of a load history (Load History's kernels): basic statistics,
 * start-up truncation, integrated autocorrelation time and the standard error
 * of the mean, and the dominant frequency and amplitude of a series sampled
 * at uneven times. Plain C++17, no VTK; values in, plain structs out.
 *
 * Methods (each function names its source):
 * - start-up truncation: MSER-5 (White 1997, Simulation 69:323-334; White,
 *   Cobb & Spratt 2000; Franklin & White 2008, Proc. Winter Simulation
 *   Conference), on the samples in order;
 * - integrated autocorrelation time with Sokal's automatic window (Sokal
 *   1997, "Monte Carlo methods in statistical mechanics", in Functional
 *   Integration, Plenum, section 3), and the standard error of the mean from
 *   it;
 * - dominant frequency: the Lomb-Scargle periodogram (Lomb 1976, Astrophys.
 *   Space Sci. 39:447-462; Scargle 1982, ApJ 263:835-853, eq. 10), on an
 *   oversampled grid, refined around the peak by golden-section search on
 *   the sum of squares explained by the least-squares sinusoid with a
 *   floating mean (Lomb 1976: the periodogram is the sum of squares a
 *   sinusoid explains; Zechmeister & Kuerster 2009 add the mean), whose
 *   semi-amplitude is reported.
 *
 * Undefined statistics are NaN with a status saying why: fewer than
 * MinimumSamples samples, or a constant signal (standard deviation below
 * 1e-12 of the largest magnitude).
 */
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <vector>

namespace wallloads
{

/// Why a statistic is or is not defined.
enum class SeriesStatus
{
  Ok = 0,
  TooFewSamples, ///< fewer than MinimumSamples
  Constant,      ///< no variation to analyse
  NoWindow,      ///< Sokal's window condition never met (series too short for its correlation)
  NonPositive,   ///< the autocorrelation time came out <= 0
};

/// Fewest samples for the autocorrelation and spectral statistics.
constexpr std::size_t MinimumSeriesSamples = 8;

template <typename T>
struct BasicStatistics
{
  std::size_t Samples = 0;
  T Mean = std::numeric_limits<T>::quiet_NaN();
  T StandardDeviation = std::numeric_limits<T>::quiet_NaN(); ///< sample (n - 1) form
  T Minimum = std::numeric_limits<T>::quiet_NaN();
  T Maximum = std::numeric_limits<T>::quiet_NaN();
  bool Constant = false; ///< standard deviation <= 1e-12 max |x| (or fewer than 2 samples)
};

/**
 * Mean, sample standard deviation (divisor n - 1; NaN below 2 samples),
 * minimum and maximum of x[0..n). Two passes (the deviations are summed
 * about the mean, so a large mean does not cancel the variance). NaN
 * samples are not expected (the caller leaves them out).
 */
template <typename T>
BasicStatistics<T> ComputeBasicStatistics(const T* x, std::size_t n)
{
  BasicStatistics<T> s;
  s.Samples = n;
  if (n == 0)
  {
    s.Constant = true;
    return s;
  }
  T sum = 0, mn = x[0], mx = x[0], big = 0;
  for (std::size_t i = 0; i < n; ++i)
  {
    sum += x[i];
    mn = std::min(mn, x[i]);
    mx = std::max(mx, x[i]);
    big = std::max(big, std::abs(x[i]));
  }
  s.Mean = sum / static_cast<T>(n);
  s.Minimum = mn;
  s.Maximum = mx;
  if (n < 2)
  {
    s.Constant = true;
    return s;
  }
  T ss = 0;
  for (std::size_t i = 0; i < n; ++i)
  {
    ss += (x[i] - s.Mean) * (x[i] - s.Mean);
  }
  s.StandardDeviation = std::sqrt(ss / static_cast<T>(n - 1));
  s.Constant = !(s.StandardDeviation > T(1e-12) * big);
  return s;
}

/**
 * MSER-5 truncation point (White 1997; Franklin & White 2008): the series is
 * cut into k = floor(n / 5) batch means Z_1..Z_k of 5 consecutive samples
 * (a remainder of fewer than 5 samples at the end is not batched); for each
 * candidate d the statistic MSER(d) = sum_{j>d} (Z_j - mean_{j>d} Z)^2 /
 * (k - d)^2 is the squared standard error of the truncated mean, and the
 * d < k / 2 minimising it is chosen (White's rule: a minimum in the second
 * half means the run is too short; the search is limited to the first half).
 * Returns the number of samples to drop, 5 d (0 when k < 4).
 */
template <typename T>
std::size_t Mser5Truncation(const T* x, std::size_t n)
{
  constexpr std::size_t batch = 5;
  const std::size_t k = n / batch;
  if (k < 4)
  {
    return 0;
  }
  std::vector<T> z(k);
  T shift = 0;
  for (std::size_t j = 0; j < k; ++j)
  {
    T b = 0;
    for (std::size_t i = 0; i < batch; ++i)
    {
      b += x[j * batch + i];
    }
    z[j] = b / static_cast<T>(batch);
    shift += z[j];
  }
  shift /= static_cast<T>(k); // sums about the overall mean: less cancellation
  // Suffix sums of (Z - shift) and (Z - shift)^2 give every MSER(d) in O(k).
  T s1 = 0, s2 = 0;
  std::vector<T> mser(k);
  for (std::size_t j = k; j-- > 0;)
  {
    const T v = z[j] - shift;
    s1 += v;
    s2 += v * v;
    const T m = static_cast<T>(k - j);
    const T ss = std::max(T(0), s2 - s1 * s1 / m);
    mser[j] = ss / (m * m);
  }
  std::size_t best = 0;
  for (std::size_t d = 1; d < k / 2; ++d)
  {
    if (mser[d] < mser[best])
    {
      best = d;
    }
  }
  return best * batch;
}

template <typename T>
struct AutocorrelationTime
{
  SeriesStatus Status = SeriesStatus::TooFewSamples;
  T Tau = std::numeric_limits<T>::quiet_NaN(); ///< in samples: 1 + 2 sum_{k=1}^{M} rho(k)
  std::size_t Window = 0;                      ///< M
};

/**
 * Integrated autocorrelation time in samples, tau = 1 + 2 sum_{k=1}^{M}
 * rho(k), with the normalisation in which Var(mean) = tau sigma^2 / n (an
 * independent series has tau = 1), and Sokal's automatic window (Sokal 1997,
 * section 3): M is the smallest lag with M >= c tau(M), c = 5 by default
 * (Sokal recommends c of about 4 to 6 for series whose autocorrelation
 * decays roughly exponentially). rho(k) = C(k) / C(0) with the biased
 * autocovariance C(k) = (1/n) sum_{i<n-k} (x_i - m)(x_{i+k} - m). The window
 * is searched up to n / 2; NoWindow (NaN) when it is not met there.
 * Samples are taken as equally spaced (the caller converts to seconds with
 * the mean sampling interval).
 */
template <typename T>
AutocorrelationTime<T> IntegratedAutocorrelation(const T* x, std::size_t n, T c = T(5))
{
  AutocorrelationTime<T> r;
  if (n < MinimumSeriesSamples)
  {
    return r;
  }
  const BasicStatistics<T> s = ComputeBasicStatistics(x, n);
  if (s.Constant)
  {
    r.Status = SeriesStatus::Constant;
    return r;
  }
  std::vector<T> d(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    d[i] = x[i] - s.Mean;
  }
  T c0 = 0;
  for (std::size_t i = 0; i < n; ++i)
  {
    c0 += d[i] * d[i];
  }
  T tau = 1;
  for (std::size_t m = 1; m <= n / 2; ++m)
  {
    T cm = 0;
    for (std::size_t i = 0; i + m < n; ++i)
    {
      cm += d[i] * d[i + m];
    }
    tau += 2 * cm / c0;
    if (static_cast<T>(m) >= c * tau)
    {
      r.Window = m;
      r.Tau = tau;
      r.Status = tau > 0 ? SeriesStatus::Ok : SeriesStatus::NonPositive;
      if (!(tau > 0))
      {
        r.Tau = std::numeric_limits<T>::quiet_NaN();
      }
      return r;
    }
  }
  r.Status = SeriesStatus::NoWindow;
  return r;
}

/// Standard error of the mean of n correlated samples: sigma sqrt(tau / n)
/// (tau in samples, as from IntegratedAutocorrelation; Sokal 1997 eq. 3.7).
template <typename T>
T StandardErrorOfMean(T standardDeviation, T tauSamples, std::size_t n)
{
  if (n == 0 || !(tauSamples > 0))
  {
    return std::numeric_limits<T>::quiet_NaN();
  }
  return standardDeviation * std::sqrt(tauSamples / static_cast<T>(n));
}

template <typename T>
struct DominantSinusoid
{
  SeriesStatus Status = SeriesStatus::TooFewSamples;
  T Frequency = std::numeric_limits<T>::quiet_NaN(); ///< cycles per unit of t (Hz for t in s)
  T Amplitude = std::numeric_limits<T>::quiet_NaN(); ///< semi-amplitude, unit of y
  T Power = std::numeric_limits<T>::quiet_NaN();     ///< normalised periodogram at the peak
};

namespace detail
{
constexpr double TwoPi = 6.283185307179586476925286766559;

/// Lomb-Scargle power from the sums over the samples (Scargle 1982 eq. 10):
/// yc = sum y cos wt, ys = sum y sin wt, c2 = sum cos 2wt, s2 = sum sin 2wt.
template <typename T>
T LombScargleFromSums(T yc, T ys, T c2, T s2, std::size_t n, T variance)
{
  // tan(2 w tau) = s2 / c2; cos/sin of 2 w tau and of w tau.
  const T r = std::hypot(c2, s2);
  T cos2 = 1, sin2 = 0;
  if (r > 0)
  {
    cos2 = c2 / r;
    sin2 = s2 / r;
  }
  const T cosT = std::sqrt(std::max(T(0), (1 + cos2) / 2));
  const T sinT = std::copysign(std::sqrt(std::max(T(0), (1 - cos2) / 2)), sin2);
  const T ycT = yc * cosT + ys * sinT; // sum y cos w(t - tau)
  const T ysT = ys * cosT - yc * sinT; // sum y sin w(t - tau)
  const T half = static_cast<T>(n) / 2;
  const T cc = half + r / 2; // sum cos^2 w(t - tau) = n/2 + (1/2) sum cos 2w(t - tau)
  const T ss = half - r / 2;
  T p = 0;
  if (cc > 0)
  {
    p += ycT * ycT / cc;
  }
  if (ss > T(1e-12) * half)
  {
    p += ysT * ysT / ss;
  }
  return p / (2 * variance);
}

template <typename T>
T LombScargleAt(const T* t, const T* y, std::size_t n, T variance, T f)
{
  T yc = 0, ys = 0, c2 = 0, s2 = 0;
  const T w = static_cast<T>(TwoPi) * f;
  for (std::size_t i = 0; i < n; ++i)
  {
    const T a = w * t[i];
    const T ca = std::cos(a), sa = std::sin(a);
    yc += y[i] * ca;
    ys += y[i] * sa;
    c2 += ca * ca - sa * sa;
    s2 += 2 * sa * ca;
  }
  return LombScargleFromSums(yc, ys, c2, s2, n, variance);
}

/// Least-squares fit y = c + a cos wt + b sin wt (normal equations, 3 x 3,
/// Gaussian elimination with partial pivoting); returns false when
/// singular. `explained` is the sum of squares the fit explains for y of
/// zero mean: coefficients dotted with X^T y.
template <typename T>
bool FitSinusoid(
  const T* t, const T* y, std::size_t n, T w, T& a, T& b, T& explained, T* offset = nullptr)
{
  T m[3][4] = {};
  for (std::size_t i = 0; i < n; ++i)
  {
    const T basis[3] = { T(1), std::cos(w * t[i]), std::sin(w * t[i]) };
    for (int p = 0; p < 3; ++p)
    {
      for (int q = 0; q < 3; ++q)
      {
        m[p][q] += basis[p] * basis[q];
      }
      m[p][3] += basis[p] * y[i];
    }
  }
  const T rhs[3] = { m[0][3], m[1][3], m[2][3] };
  for (int col = 0; col < 3; ++col)
  {
    int piv = col;
    for (int row = col + 1; row < 3; ++row)
    {
      if (std::abs(m[row][col]) > std::abs(m[piv][col]))
      {
        piv = row;
      }
    }
    for (int k = 0; k < 4; ++k)
    {
      std::swap(m[col][k], m[piv][k]);
    }
    if (!(std::abs(m[col][col]) > T(1e-12) * static_cast<T>(n)))
    {
      return false;
    }
    for (int row = 0; row < 3; ++row)
    {
      if (row != col)
      {
        const T factor = m[row][col] / m[col][col];
        for (int k = col; k < 4; ++k)
        {
          m[row][k] -= factor * m[col][k];
        }
      }
    }
  }
  const T c = m[0][3] / m[0][0];
  a = m[1][3] / m[1][1];
  b = m[2][3] / m[2][2];
  explained = c * rhs[0] + a * rhs[1] + b * rhs[2];
  if (offset)
  {
    *offset = c;
  }
  return true;
}

/// Derivative of the explained sum of squares E(w) of the floating-mean
/// sinusoid with respect to w. By the envelope theorem (the coefficients
/// are optimal) dE/dw = -dRSS/dw = 2 sum r_i dyhat_i/dw, r the residuals,
/// dyhat/dw = t (b cos wt - a sin wt). Its sign change locates the peak to
/// round-off (E itself is flat there: comparing E locates it only to the
/// square root of the round-off).
template <typename T>
T FloatingMeanSlope(const T* t, const T* y, std::size_t n, T w)
{
  T a, b, e, c;
  if (!FitSinusoid(t, y, n, w, a, b, e, &c))
  {
    return std::numeric_limits<T>::quiet_NaN();
  }
  T d = 0;
  for (std::size_t i = 0; i < n; ++i)
  {
    const T cw = std::cos(w * t[i]), sw = std::sin(w * t[i]);
    const T r = y[i] - (c + a * cw + b * sw);
    d += r * t[i] * (b * cw - a * sw);
  }
  return 2 * d;
}

template <typename T>
T FloatingMeanPower(const T* t, const T* y, std::size_t n, T f)
{
  T a, b, e;
  return FitSinusoid(t, y, n, static_cast<T>(TwoPi) * f, a, b, e) ? e : T(-1);
}
} // namespace detail

/**
 * Lomb-Scargle periodogram (Lomb 1976; Scargle 1982 eq. 10) of y at times t
 * (any spacing, increasing), at frequency f: the normalised power
 * P(f) = [ (sum y' cos w(t - tau))^2 / sum cos^2 w(t - tau)
 *        + (sum y' sin w(t - tau))^2 / sum sin^2 w(t - tau) ] / (2 var),
 * y' = y - mean, w = 2 pi f, tan(2 w tau) = sum sin 2wt / sum cos 2wt.
 */
template <typename T>
T LombScarglePower(const T* t, const T* y, std::size_t n, T f)
{
  const BasicStatistics<T> s = ComputeBasicStatistics(y, n);
  if (n < 2 || s.Constant)
  {
    return std::numeric_limits<T>::quiet_NaN();
  }
  std::vector<T> tt(t, t + n), yy(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    tt[i] -= t[0];
    yy[i] = y[i] - s.Mean;
  }
  const T var = s.StandardDeviation * s.StandardDeviation;
  return detail::LombScargleAt(tt.data(), yy.data(), n, var, f);
}

/**
 * The dominant sinusoid of y(t) (t increasing, any spacing; n >= 8, not
 * constant): the Lomb-Scargle periodogram is evaluated on the grid
 * f = 1/T, 1/T + df, ... up to the mean Nyquist frequency (n - 1) / (2 T),
 * T = t[n-1] - t[0], df = 1 / (oversampling T) (Press & Rybicki 1989 use the
 * same oversampled grid; the sums are advanced in frequency by rotation,
 * re-seeded every 64 steps); the highest grid point is then refined by
 * golden-section search on [f - df, f + df] of the sum of squares explained
 * by the least-squares fit y = c + a cos wt + b sin wt (the floating-mean
 * form; so the frequency is not limited to the grid), and the semi-amplitude
 * is that fit's sqrt(a^2 + b^2) at the refined frequency.
 */
template <typename T>
DominantSinusoid<T> DominantFrequency(const T* t, const T* y, std::size_t n, int oversampling = 8)
{
  DominantSinusoid<T> r;
  if (n < MinimumSeriesSamples)
  {
    return r;
  }
  const BasicStatistics<T> s = ComputeBasicStatistics(y, n);
  const T span = t[n - 1] - t[0];
  if (s.Constant || !(span > 0))
  {
    r.Status = SeriesStatus::Constant;
    return r;
  }
  // Times from the mid-point and values about the mean: smaller phases and sums.
  const T t0 = (t[0] + t[n - 1]) / 2;
  std::vector<T> tt(n), yy(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    tt[i] = t[i] - t0;
    yy[i] = y[i] - s.Mean;
  }
  const T var = s.StandardDeviation * s.StandardDeviation;
  const T fMin = 1 / span;
  const T fMax = static_cast<T>(n - 1) / (2 * span);
  const T df = 1 / (static_cast<T>(std::max(1, oversampling)) * span);
  const std::size_t steps =
    fMax > fMin ? static_cast<std::size_t>(std::floor((fMax - fMin) / df)) + 1 : 1;
  const T twoPi = static_cast<T>(detail::TwoPi);
  // cos/sin of w t_i at the current grid frequency, advanced by the rotation
  // of angle 2 pi df t_i per step.
  std::vector<T> c(n), sn(n), cd(n), sd(n);
  for (std::size_t i = 0; i < n; ++i)
  {
    cd[i] = std::cos(twoPi * df * tt[i]);
    sd[i] = std::sin(twoPi * df * tt[i]);
  }
  T bestPower = -1, bestF = fMin;
  for (std::size_t k = 0; k < steps; ++k)
  {
    const T f = fMin + static_cast<T>(k) * df;
    if (k % 64 == 0)
    {
      for (std::size_t i = 0; i < n; ++i)
      {
        c[i] = std::cos(twoPi * f * tt[i]);
        sn[i] = std::sin(twoPi * f * tt[i]);
      }
    }
    T yc = 0, ys = 0, c2 = 0, s2 = 0;
    for (std::size_t i = 0; i < n; ++i)
    {
      yc += yy[i] * c[i];
      ys += yy[i] * sn[i];
      c2 += c[i] * c[i] - sn[i] * sn[i];
      s2 += 2 * c[i] * sn[i];
      const T cn = c[i] * cd[i] - sn[i] * sd[i];
      sn[i] = sn[i] * cd[i] + c[i] * sd[i];
      c[i] = cn;
    }
    const T p = detail::LombScargleFromSums(yc, ys, c2, s2, n, var);
    if (p > bestPower)
    {
      bestPower = p;
      bestF = f;
    }
  }
  // Refinement: golden-section search on [bestF - df, bestF + df] for the
  // maximum of the sum of squares explained by the least-squares sinusoid
  // with a floating mean (the generalised periodogram, Zechmeister & Kuerster
  // 2009, A&A 496:577; from memory). The classic periodogram subtracts the
  // sample mean first, which shifts its peak when the record holds a
  // non-integer number of cycles (measured: 2e-4 relative for 6 cycles);
  // the floating-mean fit is exact for a sinusoid plus a constant.
  const T* pt = tt.data();
  const T* py = yy.data();
  const T g = static_cast<T>(0.6180339887498949);
  T lo = std::max(bestF - df, df / 4), hi = bestF + df;
  T x1 = hi - g * (hi - lo), x2 = lo + g * (hi - lo);
  T p1 = detail::FloatingMeanPower(pt, py, n, x1);
  T p2 = detail::FloatingMeanPower(pt, py, n, x2);
  for (int it = 0; it < 100 && hi - lo > T(1e-4) * df; ++it)
  {
    if (p1 > p2)
    {
      hi = x2;
      x2 = x1;
      p2 = p1;
      x1 = hi - g * (hi - lo);
      p1 = detail::FloatingMeanPower(pt, py, n, x1);
    }
    else
    {
      lo = x1;
      x1 = x2;
      p1 = p2;
      x2 = lo + g * (hi - lo);
      p2 = detail::FloatingMeanPower(pt, py, n, x2);
    }
  }
  // Polish: bisection on the sign of dE/dw (FloatingMeanSlope), which
  // locates the peak to round-off, so that data equal to round-off (MPI
  // ranks, thread counts) give frequencies equal to round-off.
  T f = p1 > p2 ? x1 : x2;
  {
    T a0 = lo, b0 = hi;
    T da = detail::FloatingMeanSlope(pt, py, n, twoPi * a0);
    const T db = detail::FloatingMeanSlope(pt, py, n, twoPi * b0);
    if (da > 0 && db < 0)
    {
      for (int it = 0; it < 200 && b0 - a0 > 4 * std::numeric_limits<T>::epsilon() * b0; ++it)
      {
        const T mid = (a0 + b0) / 2;
        const T dm = detail::FloatingMeanSlope(pt, py, n, twoPi * mid);
        if (dm > 0)
        {
          a0 = mid;
        }
        else if (dm < 0)
        {
          b0 = mid;
        }
        else
        {
          a0 = b0 = mid;
        }
      }
      f = (a0 + b0) / 2;
    }
  }
  r.Frequency = f;
  r.Power = detail::LombScargleAt(pt, py, n, var, f);
  T a = 0, b = 0, explained = 0;
  if (!detail::FitSinusoid(pt, py, n, twoPi * f, a, b, explained))
  {
    r.Status = SeriesStatus::Constant;
    r.Frequency = std::numeric_limits<T>::quiet_NaN();
    return r;
  }
  r.Amplitude = std::hypot(a, b);
  r.Status = SeriesStatus::Ok;
  return r;
}

} // namespace wallloads
