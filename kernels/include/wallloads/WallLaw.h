// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Law of the wall: Spalding's single formula and its inversion for the
 * friction velocity.
 *
 * Spalding 1961 ("A single formula for the law of the wall", J. Appl. Mech.
 * 28:455-458) writes y+ as an explicit function of u+ that is the viscous
 * sublayer u+ = y+ near the wall and the log law u+ = ln(y+)/kappa + B far
 * from it, with a smooth buffer layer between:
 *
 *   y+ = u+ + exp(-kappa B) [exp(kappa u+) - 1 - kappa u+ - (kappa u+)^2/2 - (kappa u+)^3/6],
 *
 * u+ = U/u_tau, y+ = y u_tau/nu, U the tangential speed relative to the wall
 * at wall distance y, nu the kinematic viscosity and u_tau = sqrt(tau_w/rho).
 *
 * Constants. The paper fits kappa = 0.4 and exp(-kappa B) = 0.1108, i.e.
 * B = 5.5 (read from a scanned copy of the paper; the printed formula also
 * carries a (kappa u+)^4/4! term, which the paper says may be omitted with an
 * equally good fit; it is omitted here, as is usual). The defaults below are
 * the values of common practice, kappa = 0.41 and B = 5.0 (e.g. White,
 * Viscous Fluid Flow, 2nd ed., ch. 6, after Coles & Hirst 1968; values and
 * chapter recalled from memory). Pass the constants the flow solver used
 * when they are known.
 *
 * Inversion. With Re_y = U y/nu known, u+ is the root of
 *   h(u+) = u+ y+(u+) - Re_y,
 * which is the residual r(u_tau) = y u_tau/nu - y+(U/u_tau) multiplied by u+
 * (same root for u+ > 0). h is increasing and convex for u+ > 0, and the root
 * lies in (0, sqrt(Re_y)] because y+(u+) >= u+, so Newton's method inside
 * that bracket, bisecting whenever a step would leave it, cannot fail; from a
 * start on the right of the root Newton on a convex increasing function
 * converges monotonically (Fourier's condition, a standard result, e.g.
 * Dahlquist & Björck, Numerical Methods, 1974, ch. 6; chapter recalled from
 * memory).
 */
#include <cmath>
#include <cstdint>
#include <limits>

namespace wallloads
{

enum class WallLawStatus : std::uint8_t
{
  Ok = 0,
  NoConvergence, ///< iteration limit reached; the result holds the last iterate
  BadInput       ///< U < 0, y <= 0, nu <= 0, kappa <= 0, or an input not finite
};

/// Karman constant of common practice (see the header comment).
template <typename T>
constexpr T DefaultKarmanConstant()
{
  return T(0.41);
}

/// Log-law intercept B of common practice (see the header comment).
template <typename T>
constexpr T DefaultLogLawIntercept()
{
  return T(5.0);
}

/// The Karman constant of Spalding's 1961 fit.
template <typename T>
constexpr T SpaldingKarmanConstant()
{
  return T(0.4);
}

/// The intercept of Spalding's 1961 fit (exp(-0.4 B) = 0.1108 gives B = 5.50).
template <typename T>
constexpr T SpaldingLogLawIntercept()
{
  return T(5.5);
}

/// Relative step at which the friction-velocity iteration stops: 1e-14, or a
/// few ulps for types coarser than double (the noise floor of the residual).
template <typename T>
constexpr T WallLawTolerance()
{
  return T(16) * std::numeric_limits<T>::epsilon() > T(1e-14)
    ? T(16) * std::numeric_limits<T>::epsilon()
    : T(1e-14);
}

namespace detail
{
/// Tails of the exponential series, r3 = e^z - 1 - z - z^2/2 and
/// r4 = r3 - z^3/6. For |z| < 2 they are summed as series: the direct
/// formula loses all digits as z -> 0 (r4 ~ z^4/24 against terms of size 1).
template <typename T>
inline void ExpTails(T z, T& r3, T& r4)
{
  if (std::abs(z) < T(2))
  {
    T term = z * z * z * z / T(24);
    T sum = term;
    // 2^k/k! < 1e-17 of the first term by k = 30; the loop usually stops far sooner.
    for (int k = 5; k < 40; ++k)
    {
      term *= z / T(k);
      const T next = sum + term;
      if (next == sum)
      {
        break;
      }
      sum = next;
    }
    r4 = sum;
    r3 = sum + z * z * z / T(6);
    return;
  }
  r3 = std::expm1(z) - z - T(0.5) * z * z;
  r4 = r3 - z * z * z / T(6);
}
} // namespace detail

/// Spalding's y+ for a given u+.
template <typename T>
inline T SpaldingYPlus(
  T uPlus, T kappa = DefaultKarmanConstant<T>(), T B = DefaultLogLawIntercept<T>())
{
  T r3, r4;
  detail::ExpTails(kappa * uPlus, r3, r4);
  return uPlus + std::exp(-kappa * B) * r4;
}

/// d y+ / d u+ of Spalding's formula: 1 + kappa exp(-kappa B) r3(kappa u+).
template <typename T>
inline T SpaldingYPlusDerivative(
  T uPlus, T kappa = DefaultKarmanConstant<T>(), T B = DefaultLogLawIntercept<T>())
{
  T r3, r4;
  detail::ExpTails(kappa * uPlus, r3, r4);
  return T(1) + kappa * std::exp(-kappa * B) * r3;
}

template <typename T>
struct FrictionVelocityResult
{
  T FrictionVelocity = 0; ///< u_tau, same unit as the speed
  T YPlus = 0;            ///< y u_tau / nu
  T UPlus = 0;            ///< U / u_tau (0 when U = 0, the limit U -> 0)
  int Iterations = 0;     ///< residual evaluations used
};

/**
 * Friction velocity u_tau from the tangential speed `speed` (relative to the
 * wall) at wall distance `y`, for kinematic viscosity `nu`, by Spalding's law.
 * Designed for 0.1 <= y+ <= 1e5 (tested there) and convergent far beyond.
 * speed == 0 gives u_tau = 0 and Ok.
 */
template <typename T>
WallLawStatus SolveSpaldingFrictionVelocity(T speed, T y, T nu, FrictionVelocityResult<T>& out,
  T kappa = DefaultKarmanConstant<T>(), T B = DefaultLogLawIntercept<T>(), int maxIterations = 100)
{
  out = FrictionVelocityResult<T>();
  // Written so that NaN fails every test.
  if (!(speed >= T(0)) || !(y > T(0)) || !(nu > T(0)) || !(kappa > T(0)) ||
    !std::isfinite(speed) || !std::isfinite(y) || !std::isfinite(nu) || !std::isfinite(kappa) ||
    !std::isfinite(B))
  {
    return WallLawStatus::BadInput;
  }
  if (speed == T(0))
  {
    return WallLawStatus::Ok;
  }
  const T re = speed * y / nu;
  if (!std::isfinite(re) || !(re > T(0)))
  {
    return WallLawStatus::BadInput;
  }
  const T tol = WallLawTolerance<T>();
  const T damping = std::exp(-kappa * B);

  // h(s) = s y+(s) - Re_y and h'(s) = y+(s) + s y+'(s), s = u+.
  auto residual = [&](T s, T& h, T& dh) {
    T r3, r4;
    detail::ExpTails(kappa * s, r3, r4);
    const T yp = s + damping * r4;
    const T dyp = T(1) + kappa * damping * r3;
    h = s * yp - re;
    dh = yp + s * dyp;
  };

  // Bracket: h(0) = -Re_y < 0 and h(sqrt(Re_y)) >= 0 since y+ >= u+.
  T lo = T(0);
  T hi = std::sqrt(re);

  // Initial guess: the better of the sublayer branch u+ = y+ (u+ = sqrt(Re_y))
  // and the log-law branch u+ = ln(Re_y/u+)/kappa + B, the latter by a few
  // fixed-point sweeps (a contraction with factor 1/(kappa u+) < 0.25 once
  // u+ > 10, i.e. wherever the log law is the better guess).
  T s = hi;
  T h, dh;
  residual(s, h, dh);
  int evaluations = 1;
  {
    T sl = hi;
    for (int k = 0; k < 6; ++k)
    {
      const T next = std::log(re / sl) / kappa + B;
      if (!(next > T(0)) || !(next < hi))
      {
        sl = T(-1);
        break;
      }
      sl = next;
    }
    if (sl > T(0))
    {
      T hl, dhl;
      residual(sl, hl, dhl);
      ++evaluations;
      if (std::isfinite(hl) && std::isfinite(dhl) && std::abs(hl) < std::abs(h))
      {
        s = sl;
        h = hl;
        dh = dhl;
      }
    }
  }

  for (;;)
  {
    T next;
    if (!std::isfinite(h) || !std::isfinite(dh))
    {
      // exp overflowed: far on the right of the root.
      hi = s;
      next = T(0.5) * (lo + hi);
    }
    else
    {
      if (h > T(0))
      {
        hi = s;
      }
      else if (h < T(0))
      {
        lo = s;
      }
      else
      {
        break; // exact root
      }
      const T step = h / dh;
      if (std::abs(step) <= tol * s)
      {
        // Converged: take the last (quadratically small) correction. Tested
        // before the bracket because the correction may be below an ulp.
        s -= step;
        break;
      }
      next = s - step;
      if (!(next > lo && next < hi))
      {
        next = T(0.5) * (lo + hi);
      }
    }
    if (!(hi - lo > tol * next))
    {
      s = next; // the bracket itself has closed
      break;
    }
    if (evaluations >= maxIterations)
    {
      out.UPlus = s;
      out.FrictionVelocity = speed / s;
      out.YPlus = y * out.FrictionVelocity / nu;
      out.Iterations = evaluations;
      return WallLawStatus::NoConvergence;
    }
    s = next;
    residual(s, h, dh);
    ++evaluations;
  }
  out.UPlus = s;
  out.FrictionVelocity = speed / s;
  out.YPlus = y * out.FrictionVelocity / nu;
  out.Iterations = evaluations;
  return WallLawStatus::Ok;
}

/// Near-wall layer of a given y+, by the bounds of common practice: viscous
/// sublayer below 5, buffer layer 5 to 30, log layer above 30 (e.g. Pope,
/// Turbulent Flows, 2000, §7.1; section recalled from memory).
enum WallRegime : int
{
  UnknownRegime = -1, ///< y+ negative or NaN
  ViscousSublayer = 0,
  BufferLayer = 1,
  LogLayer = 2
};

template <typename T>
inline WallRegime NearWallRegime(T yPlus)
{
  if (!(yPlus >= T(0)))
  {
    return UnknownRegime;
  }
  if (yPlus < T(5))
  {
    return ViscousSublayer;
  }
  return yPlus <= T(30) ? BufferLayer : LogLayer;
}

} // namespace wallloads
