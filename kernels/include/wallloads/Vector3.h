// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/// Small fixed-size 3-vector helpers on plain arrays; the hot loops use these
/// instead of a matrix library so that nothing is allocated or virtual.
#include <cmath>

namespace wallloads
{

template <typename T>
inline T Dot(const T a[3], const T b[3])
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

template <typename T>
inline void Cross(const T a[3], const T b[3], T out[3])
{
  const T x = a[1] * b[2] - a[2] * b[1];
  const T y = a[2] * b[0] - a[0] * b[2];
  const T z = a[0] * b[1] - a[1] * b[0];
  out[0] = x;
  out[1] = y;
  out[2] = z;
}

template <typename T>
inline T Norm(const T a[3])
{
  return std::sqrt(Dot(a, a));
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
