// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Geometry of one polygonal face: area vector by Newell's method, area and
 * area centroid.
 *
 * Newell's method (Sutherland, Sproull & Schumacker 1974; see also
 * Tampieri, "Newell's method for computing the plane equation of a polygon",
 * Graphics Gems III, 1992) gives the exact area vector of any planar polygon,
 * convex or not, and the projected-area vector of a warped one. The area
 * vectors of the faces of any closed surface therefore sum to zero exactly
 * (up to round-off), which is what makes pressure datums cancel.
 *
 * Coordinates are taken relative to the first vertex so that faces far from
 * the origin keep their significant digits.
 */
#include "wallloads/Vector3.h"

#include <cstdint>

/// Inlined into the face loops whatever the compiler's size heuristics say
/// (a call per face costs more than the work in it).
#if defined(__GNUC__) || defined(__clang__)
#define WALLLOADS_FACE_INLINE inline __attribute__((always_inline))
#else
#define WALLLOADS_FACE_INLINE inline
#endif

/// Face loops are compiled twice on x86-64 with GCC or Clang: for the
/// baseline target (SSE2) and for AVX2, chosen at run time. AVX2 only (no
/// FMA: products and sums stay separately rounded), so both give the same
/// IEEE results; AVX's three-operand instructions drop the register copies
/// that make up a fifth of the baseline loops.
#if (defined(__GNUC__) || defined(__clang__)) && defined(__x86_64__)
#define WALLLOADS_AVX2_CLONE 1
#define WALLLOADS_TARGET_AVX2 __attribute__((target("avx2")))
#else
#define WALLLOADS_AVX2_CLONE 0
#define WALLLOADS_TARGET_AVX2
#endif

namespace wallloads
{

/// Whether this processor runs the AVX2 clones of the face loops.
inline bool UseAvx2Loops()
{
#if WALLLOADS_AVX2_CLONE
  static const bool avx2 = __builtin_cpu_supports("avx2") != 0;
  return avx2;
#else
  return false;
#endif
}

enum class FaceStatus : std::uint8_t
{
  Ok = 0,
  TooFewPoints, ///< fewer than three vertices
  ZeroArea,     ///< degenerate: area not above the tolerance
  NonFinite     ///< a vertex coordinate is NaN or infinite
};

template <typename T>
struct FaceFrame
{
  T AreaVector[3]; ///< A * n for the stored vertex order (right-hand rule)
  T Area;
  T Normal[3];   ///< unit normal for the stored vertex order
  T Centroid[3]; ///< area centroid
};

template <typename T, typename P>
inline void Relative(const P* p, const T o[3], T out[3])
{
  out[0] = T(p[0]) - o[0];
  out[1] = T(p[1]) - o[1];
  out[2] = T(p[2]) - o[2];
}

namespace detail
{
/// Pass 1 of ComputeFaceFrame for `N` corners (N = 0: `numIds` at run time).
template <int N, typename T, typename P, typename I>
WALLLOADS_FACE_INLINE FaceStatus FaceNormalPass(
  const P* points, const I* ids, int numIds, T normal[3], T& area, T relativeAreaTolerance)
{
  const int n = N > 0 ? N : numIds;
  const P* p0 = points + 3 * ids[0];
  const T o[3] = { T(p0[0]), T(p0[1]), T(p0[2]) };
  T a[3] = { 0, 0, 0 };
  T prev[3];
  Relative(points + 3 * ids[1], o, prev);
  T size2 = Dot(prev, prev);
  for (int k = 2; k < n; ++k)
  {
    T cur[3];
    Relative(points + 3 * ids[k], o, cur);
    T c[3];
    Cross(prev, cur, c);
    a[0] += c[0];
    a[1] += c[1];
    a[2] += c[2];
    const T d2 = Dot(cur, cur);
    size2 = d2 > size2 ? d2 : size2;
    prev[0] = cur[0];
    prev[1] = cur[1];
    prev[2] = cur[2];
  }
  if (!AllFinite(a, 3) || !AllFinite(o, 3))
  {
    return FaceStatus::NonFinite;
  }
  const T twiceArea = Norm(a);
  if (!(twiceArea > T(2) * relativeAreaTolerance * size2))
  {
    return FaceStatus::ZeroArea;
  }
  const T inv = T(1) / twiceArea;
  normal[0] = a[0] * inv;
  normal[1] = a[1] * inv;
  normal[2] = a[2] * inv;
  area = T(0.5) * twiceArea;
  return FaceStatus::Ok;
}
} // namespace detail

/**
 * The unit normal and area of ComputeFaceFrame (the same operations, so the
 * same values and status) without the centroid, for loops that need only
 * those; triangles and quadrilaterals take unrolled paths.
 */
template <typename T, typename P, typename I>
WALLLOADS_FACE_INLINE FaceStatus ComputeFaceNormal(const P* points, const I* ids, int numIds, T normal[3],
  T& area, T relativeAreaTolerance = T(1e-14))
{
  switch (numIds)
  {
    case 3:
      return detail::FaceNormalPass<3>(points, ids, 3, normal, area, relativeAreaTolerance);
    case 4:
      return detail::FaceNormalPass<4>(points, ids, 4, normal, area, relativeAreaTolerance);
    default:
      return numIds < 3
        ? FaceStatus::TooFewPoints
        : detail::FaceNormalPass<0>(points, ids, numIds, normal, area, relativeAreaTolerance);
  }
}

namespace detail
{
/// ComputeFaceFrame for `N` corners (N = 0: `numIds` at run time): the same operations.
template <int N, typename T, typename P, typename I>
WALLLOADS_FACE_INLINE FaceStatus FaceFramePass(
  const P* points, const I* ids, int numIds, FaceFrame<T>& frame, T relativeAreaTolerance)
{
  const int n = N > 0 ? N : numIds;
  T nhat[3];
  T area;
  const FaceStatus status =
    FaceNormalPass<N>(points, ids, n, nhat, area, relativeAreaTolerance);
  if (status != FaceStatus::Ok)
  {
    return status;
  }
  const P* p0 = points + 3 * ids[0];
  const T o[3] = { T(p0[0]), T(p0[1]), T(p0[2]) };
  T cw[3] = { 0, 0, 0 };
  T w = 0;
  T prev[3];
  Relative(points + 3 * ids[1], o, prev);
  T a[3] = { 0, 0, 0 };
  for (int k = 2; k < n; ++k)
  {
    T cur[3];
    Relative(points + 3 * ids[k], o, cur);
    T c[3];
    Cross(prev, cur, c);
    a[0] += c[0];
    a[1] += c[1];
    a[2] += c[2];
    const T wt = Dot(c, nhat);
    w += wt;
    cw[0] += wt * (prev[0] + cur[0]);
    cw[1] += wt * (prev[1] + cur[1]);
    cw[2] += wt * (prev[2] + cur[2]);
    prev[0] = cur[0];
    prev[1] = cur[1];
    prev[2] = cur[2];
  }
  frame.AreaVector[0] = T(0.5) * a[0];
  frame.AreaVector[1] = T(0.5) * a[1];
  frame.AreaVector[2] = T(0.5) * a[2];
  frame.Area = area;
  frame.Normal[0] = nhat[0];
  frame.Normal[1] = nhat[1];
  frame.Normal[2] = nhat[2];
  const T invW = T(1) / (T(3) * w);
  frame.Centroid[0] = o[0] + cw[0] * invW;
  frame.Centroid[1] = o[1] + cw[1] * invW;
  frame.Centroid[2] = o[2] + cw[2] * invW;
  return FaceStatus::Ok;
}
} // namespace detail

/// ComputeFaceFrame (the same values and status) with unrolled paths for
/// triangles and quadrilaterals, for face loops.
template <typename T, typename P, typename I>
WALLLOADS_FACE_INLINE FaceStatus ComputeFaceFrameFast(const P* points, const I* ids, int numIds,
  FaceFrame<T>& frame, T relativeAreaTolerance = T(1e-14))
{
  switch (numIds)
  {
    case 3:
      return detail::FaceFramePass<3>(points, ids, 3, frame, relativeAreaTolerance);
    case 4:
      return detail::FaceFramePass<4>(points, ids, 4, frame, relativeAreaTolerance);
    default:
      return numIds < 3 ? FaceStatus::TooFewPoints
                        : detail::FaceFramePass<0>(points, ids, numIds, frame, relativeAreaTolerance);
  }
}

/**
 * Compute the frame of the polygon whose vertex `k` has coordinates
 * `points[3*ids[k] + c]`. `P` is the coordinate type (float or double), `I`
 * the index type. A face whose area is not above `relativeAreaTolerance`
 * times its squared size (largest vertex distance from vertex 0) is ZeroArea.
 */
template <typename T, typename P, typename I>
FaceStatus ComputeFaceFrame(const P* points, const I* ids, int numIds, FaceFrame<T>& frame,
  T relativeAreaTolerance = T(1e-14))
{
  // Pass 1 (Newell area vector of the fan triangles, tolerance, normal) and
  // pass 2 (centroid of the fan weighted by the triangles' area along the
  // normal, exact when planar): one implementation, shared with the face loops.
  return numIds < 3 ? FaceStatus::TooFewPoints
                    : detail::FaceFramePass<0>(points, ids, numIds, frame, relativeAreaTolerance);
}

} // namespace wallloads
