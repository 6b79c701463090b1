// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Four doubles operated on lane by lane, so that the face kernels, written
 * once as templates on their value type, run on four faces at a time.
 *
 * Every operator is the IEEE operation of the scalar code applied to each
 * lane (+, -, *, / and sqrt are correctly rounded, and no multiply-add is
 * ever formed: the face loops are compiled for AVX2 without FMA), so each
 * face gets bit for bit the values the scalar instantiation gives it.
 * Branches of the scalar code become lane masks; a caller that meets a lane
 * outside the common case (a degenerate face, a non-finite value) hands the
 * four faces back to the scalar code.
 *
 * With GCC or Clang the lanes are a vector extension (one AVX register in
 * the AVX2 face loops); elsewhere WALLLOADS_LANES is 0 and only the scalar
 * code is used.
 */
#include "wallloads/Vector3.h"

#include <cmath>
#include <cstdint>
#include <limits>

/// Face loops are compiled for the baseline target (SSE2) and for AVX2
/// (Wall Traction's also for AVX-512VL, whose 32 vector registers spare the
/// four-face path most of its spills), chosen at run time. The filters are
/// compiled with -ffp-contract=off, so no target forms a multiply-add:
/// products and sums stay separately rounded and every clone gives the same
/// IEEE results.
#if (defined(__GNUC__) || defined(__clang__)) && defined(__x86_64__)
#define WALLLOADS_AVX2_CLONE 1
// Not in sanitizer builds: the same source as the AVX2 clone (what the
// sanitizers check), and it would double their longest compile.
#if defined(__SANITIZE_ADDRESS__)
#define WALLLOADS_AVX512_CLONE 0
#else
#define WALLLOADS_AVX512_CLONE 1
#endif
#define WALLLOADS_TARGET_AVX2 __attribute__((target("avx2")))
#define WALLLOADS_TARGET_AVX512 __attribute__((target("avx2,avx512f,avx512vl")))
#else
#define WALLLOADS_AVX2_CLONE 0
#define WALLLOADS_AVX512_CLONE 0
#define WALLLOADS_TARGET_AVX2
#define WALLLOADS_TARGET_AVX512
#endif

#if defined(__GNUC__) || defined(__clang__)
#define WALLLOADS_LANES 1
#else
#define WALLLOADS_LANES 0
#endif

namespace wallloads
{

/// The larger of two values as the scalar kernels take it: `a > b ? a : b`
/// (b when either is NaN).
WALLLOADS_FACE_INLINE double Larger(double a, double b)
{
  return a > b ? a : b;
}

#if WALLLOADS_LANES

/// Lane masks (all bits set where a comparison holds).
struct LaneMask
{
  typedef std::int64_t Vec __attribute__((vector_size(32)));
  Vec M;
};
WALLLOADS_FACE_INLINE LaneMask operator&(const LaneMask& a, const LaneMask& b)
{
  return LaneMask{ a.M & b.M };
}

struct Lanes4
{
  typedef double Vec __attribute__((vector_size(32)));
  Vec V;

  Lanes4() = default;
  WALLLOADS_FACE_INLINE Lanes4(double x)
    : V{ x, x, x, x }
  {
  }
  WALLLOADS_FACE_INLINE static Lanes4 Of(double a, double b, double c, double d)
  {
    Lanes4 r;
    r.V = Vec{ a, b, c, d };
    return r;
  }
  WALLLOADS_FACE_INLINE double operator[](int j) const { return this->V[j]; }
  WALLLOADS_FACE_INLINE void Set(int j, double x) { this->V[j] = x; }

  WALLLOADS_FACE_INLINE Lanes4& operator+=(const Lanes4& b)
  {
    this->V += b.V;
    return *this;
  }
  WALLLOADS_FACE_INLINE Lanes4& operator-=(const Lanes4& b)
  {
    this->V -= b.V;
    return *this;
  }
};

#define WALLLOADS_LANES_BINARY(op)                                                                 \
  WALLLOADS_FACE_INLINE Lanes4 operator op(const Lanes4& a, const Lanes4& b)                       \
  {                                                                                                \
    Lanes4 r;                                                                                      \
    r.V = a.V op b.V;                                                                              \
    return r;                                                                                      \
  }                                                                                                \
  WALLLOADS_FACE_INLINE Lanes4 operator op(double a, const Lanes4& b)                              \
  {                                                                                                \
    return Lanes4(a) op b;                                                                         \
  }                                                                                                \
  WALLLOADS_FACE_INLINE Lanes4 operator op(const Lanes4& a, double b)                              \
  {                                                                                                \
    return a op Lanes4(b);                                                                         \
  }
WALLLOADS_LANES_BINARY(+)
WALLLOADS_LANES_BINARY(-)
WALLLOADS_LANES_BINARY(*)
WALLLOADS_LANES_BINARY(/)
#undef WALLLOADS_LANES_BINARY

WALLLOADS_FACE_INLINE Lanes4 operator-(const Lanes4& a)
{
  Lanes4 r;
  r.V = -a.V;
  return r;
}

WALLLOADS_FACE_INLINE LaneMask operator>(const Lanes4& a, const Lanes4& b)
{
  return LaneMask{ a.V > b.V };
}
WALLLOADS_FACE_INLINE LaneMask operator<(const Lanes4& a, const Lanes4& b)
{
  return LaneMask{ a.V < b.V };
}
WALLLOADS_FACE_INLINE LaneMask operator>=(const Lanes4& a, const Lanes4& b)
{
  return LaneMask{ a.V >= b.V };
}

/// Whether every lane of the mask holds.
WALLLOADS_FACE_INLINE bool AllLanes(const LaneMask& m)
{
  return ((m.M[0] & m.M[1]) & (m.M[2] & m.M[3])) != 0;
}

/// Lane by lane `a > b ? a : b`, as Larger(double, double).
WALLLOADS_FACE_INLINE Lanes4 Larger(const Lanes4& a, const Lanes4& b)
{
  Lanes4 r;
  r.V = a.V > b.V ? a.V : b.V;
  return r;
}

/// Lane by lane IEEE square root (correctly rounded, as std::sqrt).
WALLLOADS_FACE_INLINE Lanes4 Sqrt(const Lanes4& a)
{
  return Lanes4::Of(std::sqrt(a[0]), std::sqrt(a[1]), std::sqrt(a[2]), std::sqrt(a[3]));
}

/// Lanes whose value is finite (x - x is 0 exactly then, NaN otherwise).
WALLLOADS_FACE_INLINE LaneMask FiniteLanes(const Lanes4& a)
{
  const Lanes4 zero(0.0);
  return LaneMask{ (a - a).V == zero.V };
}

/// Norm (Vector3.h) lane by lane: the plain square root where every lane's
/// sum of squares is a normal number, else the scalar Norm of each lane, so
/// the values are the scalar ones in every case.
WALLLOADS_FACE_INLINE Lanes4 Norm(const Lanes4 a[3])
{
  const Lanes4 d = Dot(a, a);
  const Lanes4 largest(std::numeric_limits<double>::max());
  const Lanes4 smallest(std::numeric_limits<double>::min() / std::numeric_limits<double>::epsilon());
  if (AllLanes((d < largest) & (d >= smallest)))
  {
    return Sqrt(d);
  }
  Lanes4 r;
  for (int j = 0; j < 4; ++j)
  {
    const double s[3] = { a[0][j], a[1][j], a[2][j] };
    r.Set(j, Norm(s));
  }
  return r;
}

#endif // WALLLOADS_LANES

} // namespace wallloads
