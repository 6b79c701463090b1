// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/// Small fixed-size 3-vector helpers on plain arrays; the hot loops use these
/// instead of a matrix library so that nothing is allocated or virtual.
#include <cmath>
#include <limits>

/// Inlined into the face loops whatever the compiler's size heuristics say
/// (a call per face costs more than the work in it).
#if !defined(WALLLOADS_FACE_INLINE)
#if defined(__GNUC__) || defined(__clang__)
#define WALLLOADS_FACE_INLINE inline __attribute__((always_inline))
#else
#define WALLLOADS_FACE_INLINE inline
#endif
#endif

namespace wallloads
{

template <typename T>
WALLLOADS_FACE_INLINE void Copy3(const T from[3], T to[3])
{
  to[0] = from[0];
  to[1] = from[1];
  to[2] = from[2];
}

template <typename T>
WALLLOADS_FACE_INLINE T Dot(const T a[3], const T b[3])
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

template <typename T>
WALLLOADS_FACE_INLINE void Cross(const T a[3], const T b[3], T out[3])
{
  const T x = a[1] * b[2] - a[2] * b[1];
  const T y = a[2] * b[0] - a[0] * b[2];
  const T z = a[0] * b[1] - a[1] * b[0];
  out[0] = x;
  out[1] = y;
  out[2] = z;
}

namespace detail
{
/// Norm's rare path (kept out of the face loops): the vector scaled by its
/// largest component first.
template <typename T>
T ScaledNorm(const T a[3])
{
  const T m = std::fmax(std::fabs(a[0]), std::fmax(std::fabs(a[1]), std::fabs(a[2])));
  if (std::isnan(a[0]) || std::isnan(a[1]) || std::isnan(a[2]))
  {
    return std::numeric_limits<T>::quiet_NaN();
  }
  if (!(m > T(0)) || std::isinf(m))
  {
    return m; // zero, or infinite
  }
  const T s[3] = { a[0] / m, a[1] / m, a[2] / m };
  return m * std::sqrt(Dot(s, s));
}
} // namespace detail

/**
 * Euclidean length without overflow or underflow: the plain sqrt(a . a)
 * when the sum of squares is a normal finite number (the usual case, same
 * result bit for bit), else the vector scaled by its largest component first,
 * so that (1e200, 1e200, 0), (1e-200, 0, 0) and the area vectors of faces
 * with coordinates near 1e154 keep their length. NaN if a component is NaN,
 * infinity if one is infinite.
 */
template <typename T>
WALLLOADS_FACE_INLINE T Norm(const T a[3])
{
  const T d = Dot(a, a);
  if (d < std::numeric_limits<T>::max() &&
    d >= std::numeric_limits<T>::min() / std::numeric_limits<T>::epsilon())
  {
    return std::sqrt(d);
  }
  return detail::ScaledNorm(a);
}

template <typename T>
inline bool AllFinite(const T* a, int n)
{
  for (int i = 0; i < n; ++i)
  {
    if (!std::isfinite(a[i]))
    {
      return false;
    }
  }
  return true;
}

} // namespace wallloads
