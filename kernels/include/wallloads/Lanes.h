// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Four or eight doubles operated on lane by lane, so that the face kernels,
 * written once as templates on their value type, run on four faces at a time
 * (AVX2) or eight (AVX-512).
 *
 * Every operator is the IEEE operation of the scalar code applied to each
 * lane (+, -, *, / and sqrt are correctly rounded, and no multiply-add is
 * ever formed: everything that uses the kernels compiles with
 * -ffp-contract=off), so each face gets bit for bit the values the scalar
 * instantiation gives it.
 * Branches of the scalar code become lane masks; a caller that meets a lane
 * outside the common case (a degenerate face, a non-finite value) hands the
 * run of faces back to the scalar code.
 *
 * With GCC or Clang the lanes are a vector extension (one AVX register in
 * the AVX2 face loops, one AVX-512 register in the AVX-512 ones); elsewhere
 * WALLLOADS_LANES is 0 and only the scalar code is used.
 */
#include "wallloads/Vector3.h"

#include <cmath>
#include <cstdint>
#include <limits>

/// Face loops are compiled for the baseline target (SSE2) and for AVX2
/// (four lanes; Wall Traction's also for AVX-512 F/VL/DQ, eight lanes),
/// chosen at run time. Everything that uses the kernels is compiled with
/// -ffp-contract=off, so no target forms a multiply-add: products and sums
/// stay separately rounded and every clone gives each face the same IEEE
/// results. The sanitizer builds compile the AVX-512 clone too: its
/// eight-lane gathers and stores are code of their own.
#if (defined(__GNUC__) || defined(__clang__)) && defined(__x86_64__)
#define WALLLOADS_AVX2_CLONE 1
#define WALLLOADS_AVX512_CLONE 1
#define WALLLOADS_TARGET_AVX2 __attribute__((target("avx2")))
#define WALLLOADS_TARGET_AVX512 __attribute__((target("avx2,avx512f,avx512vl,avx512dq")))
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

/// The vector types of W lanes (GCC takes no vector size that depends on a
/// template parameter, hence one specialisation per width).
template <int W>
struct LaneVectors;
template <>
struct LaneVectors<4>
{
  typedef double Values __attribute__((vector_size(32)));
  typedef std::int64_t Masks __attribute__((vector_size(32)));
};
template <>
struct LaneVectors<8>
{
  typedef double Values __attribute__((vector_size(64)));
  typedef std::int64_t Masks __attribute__((vector_size(64)));
  /// Eight doubles in memory as a streaming store writes them (they alias
  /// the output array's doubles).
  typedef double Memory __attribute__((vector_size(64), may_alias));
};

/// Lane masks (all bits set where a comparison holds), W lanes.
template <int W>
struct LaneMask
{
  typedef typename LaneVectors<W>::Masks Vec;
  Vec M;
};
template <int W>
WALLLOADS_FACE_INLINE LaneMask<W> operator&(const LaneMask<W>& a, const LaneMask<W>& b)
{
  return LaneMask<W>{ a.M & b.M };
}

/// The mask of a comparison's result. For eight lanes an empty asm holds
/// each 512-bit comparison whole: GCC 12 otherwise compiles the AND of two
/// comparisons made in inlined functions lane by lane in scalar code
/// (measured: the eight-lane loop ran at half the speed of the four-lane one).
template <int W>
WALLLOADS_FACE_INLINE LaneMask<W> MaskOf(const typename LaneMask<W>::Vec& comparison)
{
  typename LaneMask<W>::Vec m = comparison;
#if WALLLOADS_AVX512_CLONE
  if constexpr (W == 8)
  {
    __asm__("" : "+v"(m));
  }
#endif
  return LaneMask<W>{ m };
}

/// W doubles, one face per lane: 4 (one AVX register) in the AVX2 loops,
/// 8 (one AVX-512 register) in the AVX-512 loops.
template <int W>
struct Lanes
{
  static_assert(W == 4 || W == 8, "four or eight lanes");
  typedef typename LaneVectors<W>::Values Vec;
  Vec V;

  Lanes() = default;
  /// x in every lane, bit for bit (a sign of zero included).
  WALLLOADS_FACE_INLINE Lanes(double x)
  {
    if constexpr (W == 4)
    {
      this->V = Vec{ x, x, x, x };
    }
    else
    {
      // Two halves of four: GCC 12 builds eight equal lanes by a chain of
      // masked insertions, and four by one broadcast.
      typedef typename LaneVectors<4>::Values Half;
      const Half half = Half{ x, x, x, x };
      this->V = __builtin_shufflevector(half, half, 0, 1, 2, 3, 0, 1, 2, 3);
    }
  }
  /// Lane j holds value(j).
  template <typename Fn>
  WALLLOADS_FACE_INLINE static Lanes Gather(Fn&& value)
  {
    // Eight lanes as two halves of four: GCC 12 builds a 512-bit vector
    // from eight scalars by a chain of dependent masked loads, and two
    // 256-bit halves by pairs of loads and one insertion each.
    Lanes r;
    if constexpr (W == 4)
    {
      r.V = Vec{ value(0), value(1), value(2), value(3) };
    }
    else
    {
      typedef typename LaneVectors<4>::Values Half;
      const Half low = Half{ value(0), value(1), value(2), value(3) };
      const Half high = Half{ value(4), value(5), value(6), value(7) };
      r.V = __builtin_shufflevector(low, high, 0, 1, 2, 3, 4, 5, 6, 7);
    }
    return r;
  }
  WALLLOADS_FACE_INLINE static Lanes Of(double a, double b, double c, double d)
  {
    static_assert(W == 4, "Of takes four lanes");
    Lanes r;
    r.V = Vec{ a, b, c, d };
    return r;
  }
  WALLLOADS_FACE_INLINE double operator[](int j) const { return this->V[j]; }
  WALLLOADS_FACE_INLINE void Set(int j, double x) { this->V[j] = x; }

  WALLLOADS_FACE_INLINE Lanes& operator+=(const Lanes& b)
  {
    this->V += b.V;
    return *this;
  }
  WALLLOADS_FACE_INLINE Lanes& operator-=(const Lanes& b)
  {
    this->V -= b.V;
    return *this;
  }
};
typedef Lanes<4> Lanes4;

#define WALLLOADS_LANES_BINARY(op)                                                                 \
  template <int W>                                                                                 \
  WALLLOADS_FACE_INLINE Lanes<W> operator op(const Lanes<W>& a, const Lanes<W>& b)                 \
  {                                                                                                \
    Lanes<W> r;                                                                                    \
    r.V = a.V op b.V;                                                                              \
    return r;                                                                                      \
  }                                                                                                \
  template <int W>                                                                                 \
  WALLLOADS_FACE_INLINE Lanes<W> operator op(double a, const Lanes<W>& b)                          \
  {                                                                                                \
    return Lanes<W>(a) op b;                                                                       \
  }                                                                                                \
  template <int W>                                                                                 \
  WALLLOADS_FACE_INLINE Lanes<W> operator op(const Lanes<W>& a, double b)                          \
  {                                                                                                \
    return a op Lanes<W>(b);                                                                       \
  }
WALLLOADS_LANES_BINARY(+)
WALLLOADS_LANES_BINARY(-)
WALLLOADS_LANES_BINARY(*)
WALLLOADS_LANES_BINARY(/)
#undef WALLLOADS_LANES_BINARY

template <int W>
WALLLOADS_FACE_INLINE Lanes<W> operator-(const Lanes<W>& a)
{
  Lanes<W> r;
  r.V = -a.V;
  return r;
}

template <int W>
WALLLOADS_FACE_INLINE LaneMask<W> operator>(const Lanes<W>& a, const Lanes<W>& b)
{
  return MaskOf<W>(a.V > b.V);
}
template <int W>
WALLLOADS_FACE_INLINE LaneMask<W> operator<(const Lanes<W>& a, const Lanes<W>& b)
{
  return MaskOf<W>(a.V < b.V);
}
template <int W>
WALLLOADS_FACE_INLINE LaneMask<W> operator>=(const Lanes<W>& a, const Lanes<W>& b)
{
  return MaskOf<W>(a.V >= b.V);
}


/// Whether every lane of the mask holds.
WALLLOADS_FACE_INLINE bool AllLanes(const LaneMask<4>& m)
{
  return ((m.M[0] & m.M[1]) & (m.M[2] & m.M[3])) != 0;
}
/// Eight lanes: the halves ANDed in vector registers first (GCC 12 moves
/// each of eight lanes to a general register otherwise).
WALLLOADS_FACE_INLINE bool AllLanes(const LaneMask<8>& m)
{
  typedef typename LaneVectors<4>::Masks Half;
  const Half both = __builtin_shufflevector(m.M, m.M, 0, 1, 2, 3) &
    __builtin_shufflevector(m.M, m.M, 4, 5, 6, 7);
  return ((both[0] & both[1]) & (both[2] & both[3])) != 0;
}

/**
 * Eight doubles into d (64-byte aligned) by a non-temporal store, which
 * writes the cache line to memory without reading it first and without
 * keeping it in the caches: for outputs much larger than the last-level
 * cache, which nothing reads again before they have left it, this saves the
 * read of every line written (a third of the traffic of Wall Traction's face
 * loop with all arrays). Only in AVX-512 code (the operand is one AVX-512
 * register); StreamFence() must follow the last one before another thread
 * reads what it wrote.
 */
WALLLOADS_FACE_INLINE void StreamVector(double* d, const LaneVectors<8>::Values& v)
{
#if WALLLOADS_AVX512_CLONE
  asm("vmovntpd %1, %0" : "=m"(*reinterpret_cast<LaneVectors<8>::Memory*>(d)) : "v"(v));
#else
  __builtin_memcpy(d, &v, sizeof v);
#endif
}

/// The 64-byte cache lines that hold bytes [p, p + bytes): the address of
/// the first and their number (none for no bytes).
struct CacheLines
{
  std::uintptr_t First = 0;
  std::uintptr_t Count = 0;
};
inline CacheLines CacheLinesOf(const void* p, std::uintptr_t bytes)
{
  CacheLines lines;
  if (bytes == 0)
  {
    return lines;
  }
  const std::uintptr_t begin = reinterpret_cast<std::uintptr_t>(p);
  lines.First = begin & ~std::uintptr_t(63);
  lines.Count = (begin + bytes - 1 - lines.First) / 64 + 1;
  return lines;
}

/**
 * Asks for the cache lines of bytes [p, p + bytes) before they are read (a
 * hint: it cannot fault and changes no value). The face loops read their
 * cell arrays front to back, but the runs read a wide array (the velocity
 * gradient: 72 bytes a face, nine lines a run of eight faces) one component
 * at a time across the run; on the machine measured, asking for the lines
 * four runs ahead took 2-12 % off the loop on one thread and 7-19 % on two
 * (medians; DEVELOPERS.md, "Prefetching").
 */
WALLLOADS_FACE_INLINE void PrefetchBytes(const void* p, std::uintptr_t bytes)
{
  const CacheLines lines = CacheLinesOf(p, bytes);
  for (std::uintptr_t k = 0; k < lines.Count; ++k)
  {
    __builtin_prefetch(reinterpret_cast<const void*>(lines.First + 64 * k));
  }
}

/// Orders the streaming stores before everything that follows (their data
/// are then visible to another thread that synchronises with this one).
WALLLOADS_FACE_INLINE void StreamFence()
{
#if WALLLOADS_AVX512_CLONE
  asm volatile("sfence" ::: "memory");
#endif
}

/// Lane j of `v` into d[j] (W unaligned doubles); with Stream (eight lanes
/// only), by StreamVector into 64-byte aligned d.
template <int W, bool Stream = false>
WALLLOADS_FACE_INLINE void StoreLanes(double* d, const Lanes<W>& v)
{
  static_assert(!Stream || W == 8, "streaming stores take eight lanes");
  if constexpr (Stream)
  {
    StreamVector(d, v.V);
  }
  else
  {
    __builtin_memcpy(d, &v.V, sizeof v.V);
  }
}

/// Lane j of v[0], v[1], v[2] into d[3j], d[3j+1], d[3j+2] (3W unaligned
/// doubles: the x, y, z of W faces, as 3-component arrays store them). Eight
/// lanes are interleaved in registers by two-source shuffles (one AVX-512
/// permutation each) and stored as three vectors, instead of 24 scalar
/// stores and the extractions that feed them; with Stream, by StreamVector
/// into 64-byte aligned d.
template <int W, bool Stream = false>
WALLLOADS_FACE_INLINE void StoreInterleaved(double* d, const Lanes<W> v[3])
{
  static_assert(!Stream || W == 8, "streaming stores take eight lanes");
  if constexpr (W == 8)
  {
    // Output vector r, element i holds component (8r+i) % 3 of face
    // (8r+i) / 3: first x and y are placed (index 8+ takes y), then z.
    typedef typename LaneVectors<8>::Values Vec;
    const Vec& x = v[0].V;
    const Vec& y = v[1].V;
    const Vec& z = v[2].V;
    const Vec xy0 = __builtin_shufflevector(x, y, 0, 8, 0, 1, 9, 0, 2, 10);
    const Vec xy1 = __builtin_shufflevector(x, y, 0, 3, 11, 0, 4, 12, 0, 5);
    const Vec xy2 = __builtin_shufflevector(x, y, 13, 0, 6, 14, 0, 7, 15, 0);
    const Vec out[3] = { __builtin_shufflevector(xy0, z, 0, 1, 8, 3, 4, 9, 6, 7),
      __builtin_shufflevector(xy1, z, 10, 1, 2, 11, 4, 5, 12, 7),
      __builtin_shufflevector(xy2, z, 0, 13, 2, 3, 14, 5, 6, 15) };
    if constexpr (Stream)
    {
      StreamVector(d, out[0]);
      StreamVector(d + 8, out[1]);
      StreamVector(d + 16, out[2]);
    }
    else
    {
      __builtin_memcpy(d, out, sizeof out);
    }
  }
  else
  {
    for (int j = 0; j < W; ++j)
    {
      d[3 * j] = v[0][j];
      d[3 * j + 1] = v[1][j];
      d[3 * j + 2] = v[2][j];
    }
  }
}

/// Lane by lane `a > b ? a : b`, as Larger(double, double).
template <int W>
WALLLOADS_FACE_INLINE Lanes<W> Larger(const Lanes<W>& a, const Lanes<W>& b)
{
  Lanes<W> r;
  r.V = a.V > b.V ? a.V : b.V;
  return r;
}

/// Lane by lane IEEE square root (correctly rounded, as std::sqrt).
template <int W>
WALLLOADS_FACE_INLINE Lanes<W> Sqrt(const Lanes<W>& a)
{
  return Lanes<W>::Gather([&a](int j) { return std::sqrt(a[j]); });
}

/// Lanes whose value is finite (x - x is 0 exactly then, NaN otherwise).
template <int W>
WALLLOADS_FACE_INLINE LaneMask<W> FiniteLanes(const Lanes<W>& a)
{
  const Lanes<W> zero(0.0);
  return MaskOf<W>((a - a).V == zero.V);
}

/// Norm (Vector3.h) lane by lane: the plain square root where every lane's
/// sum of squares is a normal number, else the scalar Norm of each lane, so
/// the values are the scalar ones in every case.
template <int W>
WALLLOADS_FACE_INLINE Lanes<W> Norm(const Lanes<W> a[3])
{
  const Lanes<W> d = Dot(a, a);
  const Lanes<W> largest(std::numeric_limits<double>::max());
  const Lanes<W> smallest(
    std::numeric_limits<double>::min() / std::numeric_limits<double>::epsilon());
  if (AllLanes((d < largest) & (d >= smallest)))
  {
    return Sqrt(d);
  }
  Lanes<W> r;
  for (int j = 0; j < W; ++j)
  {
    const double s[3] = { a[0][j], a[1][j], a[2][j] };
    r.Set(j, Norm(s));
  }
  return r;
}

#endif // WALLLOADS_LANES

} // namespace wallloads
