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
#include "wallloads/Lanes.h"
#include "wallloads/Vector3.h"

#include <cstdint>

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

/// Whether it runs the AVX-512 clones (F, VL and DQ; AVX-512 state enabled by the OS).
inline bool UseAvx512Loops()
{
#if WALLLOADS_AVX512_CLONE
  static const bool avx512 = UseAvx2Loops() && __builtin_cpu_supports("avx512f") != 0 &&
    __builtin_cpu_supports("avx512vl") != 0 && __builtin_cpu_supports("avx512dq") != 0;
  return avx512;
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
/**
 * What pass 1 computed for a face of N corners (N = 3 or 4, known at compile
 * time), kept for pass 2: the corners relative to corner 0 and the fan
 * triangles' cross products. Pass 2 then reads no point again and takes no
 * cross product again (the same values: the same operations on the same
 * operands). N = 0 (corner count known at run time) keeps nothing.
 */
template <int N, typename T>
struct Fan
{
  T Corner[N - 1][3]; ///< corner k + 1 relative to corner 0
  T Cross[N - 2][3];  ///< Cross(Corner[k], Corner[k + 1])
};
template <typename T>
struct Fan<0, T>
{
};

/**
 * Pass 1 sums of the fan about corner 0: `a`, twice the area vector (the sum
 * of the fan triangles' cross products, Newell's vector), and `size2`, the
 * largest squared distance of a corner from corner 0. `corner(k, r)` gives
 * corner k (1 <= k < n) relative to corner 0. Templated on the value type:
 * double for one face, Lanes<W> for W faces at once (Lanes.h). With N > 0
 * the corners and cross products are kept in `fan`.
 */
template <int N, typename T, typename Corner>
WALLLOADS_FACE_INLINE void FanAreaSums(
  Corner&& corner, int numIds, T a[3], T& size2, Fan<N, T>& fan)
{
  const int n = N > 0 ? N : numIds;
  a[0] = a[1] = a[2] = T(0);
  T prev[3];
  corner(1, prev);
  size2 = Dot(prev, prev);
  if constexpr (N > 0)
  {
    Copy3(prev, fan.Corner[0]);
  }
  for (int k = 2; k < n; ++k)
  {
    T cur[3];
    corner(k, cur);
    T c[3];
    Cross(prev, cur, c);
    a[0] += c[0];
    a[1] += c[1];
    a[2] += c[2];
    const T d2 = Dot(cur, cur);
    size2 = Larger(d2, size2);
    if constexpr (N > 0)
    {
      Copy3(cur, fan.Corner[k - 1]);
      Copy3(c, fan.Cross[k - 2]);
    }
    Copy3(cur, prev);
  }
}

/// The unit normal and the area from pass 1's `a` and its length.
template <typename T>
WALLLOADS_FACE_INLINE void NormalAndArea(const T a[3], const T& twiceArea, T normal[3], T& area)
{
  const T inv = T(1) / twiceArea;
  normal[0] = a[0] * inv;
  normal[1] = a[1] * inv;
  normal[2] = a[2] * inv;
  area = T(0.5) * twiceArea;
}

/**
 * Pass 2: the area centroid relative to corner 0, the fan triangles weighted
 * by their area along the unit normal `nhat` (exact when the face is planar;
 * a warped face gets the centroid of its projection's fan).
 */
template <int N, typename T, typename Corner>
WALLLOADS_FACE_INLINE void FanCentroid(
  Corner&& corner, int numIds, const Fan<N, T>& fan, const T nhat[3], T centroid[3])
{
  const int n = N > 0 ? N : numIds;
  T cw[3] = { T(0), T(0), T(0) };
  T w = T(0);
  T prev[3];
  if constexpr (N > 0)
  {
    Copy3(fan.Corner[0], prev);
  }
  else
  {
    corner(1, prev);
  }
  for (int k = 2; k < n; ++k)
  {
    T cur[3];
    T c[3];
    if constexpr (N > 0)
    {
      Copy3(fan.Corner[k - 1], cur);
      Copy3(fan.Cross[k - 2], c);
    }
    else
    {
      corner(k, cur);
      Cross(prev, cur, c);
    }
    const T wt = Dot(c, nhat);
    w += wt;
    cw[0] += wt * (prev[0] + cur[0]);
    cw[1] += wt * (prev[1] + cur[1]);
    cw[2] += wt * (prev[2] + cur[2]);
    Copy3(cur, prev);
  }
  const T invW = T(1) / (T(3) * w);
  centroid[0] = cw[0] * invW;
  centroid[1] = cw[1] * invW;
  centroid[2] = cw[2] * invW;
}

/// Pass 1 of ComputeFaceFrame for `N` corners (N = 0: `numIds` at run time).
template <int N, typename T, typename P, typename I>
WALLLOADS_FACE_INLINE FaceStatus FaceNormalPass(const P* points, const I* ids, int numIds,
  T normal[3], T& area, T relativeAreaTolerance, T a[3], Fan<N, T>& fan)
{
  const P* p0 = points + 3 * ids[0];
  const T o[3] = { T(p0[0]), T(p0[1]), T(p0[2]) };
  T size2;
  FanAreaSums<N>(
    [&](int k, T r[3]) { Relative(points + 3 * ids[k], o, r); }, numIds, a, size2, fan);
  if (!AllFinite(a, 3) || !AllFinite(o, 3))
  {
    return FaceStatus::NonFinite;
  }
  const T twiceArea = Norm(a);
  if (!(twiceArea > T(2) * relativeAreaTolerance * size2))
  {
    return FaceStatus::ZeroArea;
  }
  NormalAndArea(a, twiceArea, normal, area);
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
  T a[3];
  switch (numIds)
  {
    case 3:
    {
      detail::Fan<3, T> fan;
      return detail::FaceNormalPass<3>(points, ids, 3, normal, area, relativeAreaTolerance, a, fan);
    }
    case 4:
    {
      detail::Fan<4, T> fan;
      return detail::FaceNormalPass<4>(points, ids, 4, normal, area, relativeAreaTolerance, a, fan);
    }
    default:
    {
      detail::Fan<0, T> none;
      return numIds < 3 ? FaceStatus::TooFewPoints
                        : detail::FaceNormalPass<0>(
                            points, ids, numIds, normal, area, relativeAreaTolerance, a, none);
    }
  }
}

namespace detail
{
/// ComputeFaceFrame for `N` corners (N = 0: `numIds` at run time).
template <int N, typename T, typename P, typename I>
WALLLOADS_FACE_INLINE FaceStatus FaceFramePass(
  const P* points, const I* ids, int numIds, FaceFrame<T>& frame, T relativeAreaTolerance)
{
  T a[3];
  Fan<N, T> fan;
  const FaceStatus status = FaceNormalPass<N>(
    points, ids, numIds, frame.Normal, frame.Area, relativeAreaTolerance, a, fan);
  if (status != FaceStatus::Ok)
  {
    return status;
  }
  const P* p0 = points + 3 * ids[0];
  const T o[3] = { T(p0[0]), T(p0[1]), T(p0[2]) };
  T c[3];
  FanCentroid<N>(
    [&](int k, T r[3]) { Relative(points + 3 * ids[k], o, r); }, numIds, fan, frame.Normal, c);
  for (int k = 0; k < 3; ++k)
  {
    frame.AreaVector[k] = T(0.5) * a[k];
    frame.Centroid[k] = o[k] + c[k];
  }
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

#if WALLLOADS_LANES
/**
 * W faces (Lanes.h: 4 or 8) of `N` corners each, read from a coordinate
 * array of type `P` and each face's corner ids: corner(k, r) gives corner k
 * of every face relative to that face's corner 0 (Relative, lane by lane),
 * as the passes above take it.
 */
template <int W, int N, typename P, typename I>
struct LaneFaces
{
  const P* Points;
  const I* const* Ids;  ///< W id lists of N corners
  Lanes<W> Origin[3]; ///< corner 0 of each face
  detail::Fan<N, Lanes<W>> Kept; ///< pass 1's corners and cross products (FaceNormalLanes)

  WALLLOADS_FACE_INLINE LaneFaces(const P* points, const I* const ids[W])
    : Points(points)
    , Ids(ids)
  {
    this->Fetch(0, this->Origin);
  }
  WALLLOADS_FACE_INLINE void Fetch(int k, Lanes<W> r[3]) const
  {
    const P* q[W];
    for (int j = 0; j < W; ++j)
    {
      q[j] = this->Points + 3 * this->Ids[j][k];
    }
    for (int d = 0; d < 3; ++d)
    {
      r[d] = Lanes<W>::Gather([&](int j) { return double(q[j][d]); });
    }
  }
  WALLLOADS_FACE_INLINE void operator()(int k, Lanes<W> r[3]) const
  {
    this->Fetch(k, r);
    r[0] -= this->Origin[0];
    r[1] -= this->Origin[1];
    r[2] -= this->Origin[2];
  }
};
template <int N, typename P, typename I>
using FourFaces = LaneFaces<4, N, P, I>;

/**
 * ComputeFaceNormal for W faces of N corners: true when all are Ok, each
 * lane then holding the values the scalar function gives its face (and
 * `faces` what FaceCentroidLanes needs from this pass); false when any is
 * not (the caller then takes the faces one by one).
 */
template <int W, int N, typename P, typename I>
WALLLOADS_FACE_INLINE bool FaceNormalLanes(LaneFaces<W, N, P, I>& faces, Lanes<W> normal[3],
  Lanes<W>& area, Lanes<W> a[3], double relativeAreaTolerance = 1e-14)
{
  Lanes<W> size2;
  detail::FanAreaSums<N>(faces, N, a, size2, faces.Kept);
  const Lanes<W>* o = faces.Origin;
  if (!AllLanes(FiniteLanes(a[0]) & FiniteLanes(a[1]) & FiniteLanes(a[2]) & FiniteLanes(o[0]) &
        FiniteLanes(o[1]) & FiniteLanes(o[2])))
  {
    return false;
  }
  const Lanes<W> twiceArea = Norm(a);
  if (!AllLanes(twiceArea > Lanes<W>(2.0) * relativeAreaTolerance * size2))
  {
    return false;
  }
  detail::NormalAndArea(a, twiceArea, normal, area);
  return true;
}

/// The area centroid of ComputeFaceFrame for W faces whose normals
/// FaceNormalLanes gave, from what it kept (the same values, lane by lane).
template <int W, int N, typename P, typename I>
WALLLOADS_FACE_INLINE void FaceCentroidLanes(
  const LaneFaces<W, N, P, I>& faces, const Lanes<W> normal[3], Lanes<W> centroid[3])
{
  Lanes<W> c[3];
  detail::FanCentroid<N>(faces, N, faces.Kept, normal, c);
  for (int k = 0; k < 3; ++k)
  {
    centroid[k] = faces.Origin[k] + c[k];
  }
}
#endif // WALLLOADS_LANES

} // namespace wallloads
