// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Exact split of a polygonal face among bins along an axis.
 *
 * The bins are slabs between planes perpendicular to a unit axis e through
 * an origin o: a point x has the axis coordinate s = (x - o) . e, and bin b
 * covers Edge(b) <= s <= Edge(b + 1), Edge(0) = Start, Edge(Count) = End,
 * the edges evenly spaced.
 *
 * A face is taken as the fan of triangles (v0, vk, vk+1) that FaceGeometry.h
 * uses for its Newell area vector and centroid. Each triangle is planar and
 * convex, so clipping it to a slab (Sutherland & Hodgman, "Reentrant polygon
 * clipping", CACM 17(1), 1974: one pass per plane) gives the exact part of it
 * in that bin; the part's area vector and area centroid follow from its own
 * fan. For each bin the face touches, the kernel reports
 *
 * - the area vector of the face's part in the bin (sum over the triangles);
 * - its area, the area vector projected on the face's unit normal n (for a
 *   planar face this is the clipped area itself, for a warped one the
 *   projected area FaceGeometry.h weights its centroid with);
 * - its area centroid, the triangles' clipped parts weighted by that area.
 *
 * Because the parts of every triangle tile it, the areas add up to the
 * face's area and their area-weighted centroids to the face's first moment
 * (the FaceGeometry.h centroid times its area), to round-off, whatever the
 * face's shape (convex or not, planar or warped) and however many bins it
 * crosses. Sharing a face's force in proportion to these areas therefore
 * conserves the force and, with each part's force acting at its centroid,
 * the moment about any point.
 *
 * Conventions: a face (or triangle) lying in a bin plane belongs to the bin
 * above that plane (the last bin at End); parts of a face outside
 * [Start, End] belong to no bin (the returned area inside the range says
 * how much was binned). Nothing is allocated; no state is kept.
 */
#include "wallloads/FaceGeometry.h"
#include "wallloads/Vector3.h"

#include <cmath>

namespace wallloads
{

/// Evenly spaced bins along a unit axis.
template <typename T>
struct AxisBins
{
  T Origin[3] = { 0, 0, 0 };
  T Axis[3] = { 0, 0, 1 }; ///< unit
  T Start = 0;
  T End = 1;
  int Count = 1;

  /// Axis coordinate s = (x - o) . e of a point.
  template <typename P>
  T Coordinate(const P* x) const
  {
    return (T(x[0]) - this->Origin[0]) * this->Axis[0] +
      (T(x[1]) - this->Origin[1]) * this->Axis[1] + (T(x[2]) - this->Origin[2]) * this->Axis[2];
  }

  /// Edge b (0..Count) of the bins; the first and last are Start and End exactly.
  T Edge(int b) const
  {
    if (b <= 0)
    {
      return this->Start;
    }
    if (b >= this->Count)
    {
      return this->End;
    }
    return this->Start + (this->End - this->Start) * (T(b) / T(this->Count));
  }

  /// The bin holding s (s within [Start, End]): Edge(b) <= s < Edge(b + 1),
  /// the last bin for s = End; clamped to the first or last bin outside.
  int BinOf(T s) const
  {
    const T u = (s - this->Start) / (this->End - this->Start) * T(this->Count);
    int b = u > T(0) ? (u < T(this->Count) ? static_cast<int>(u) : this->Count - 1) : 0;
    // Agree with Edge() where division and multiplication round differently.
    while (b > 0 && s < this->Edge(b))
    {
      --b;
    }
    while (b + 1 < this->Count && s >= this->Edge(b + 1))
    {
      ++b;
    }
    return b;
  }
};

/**
 * Set up `count` bins over [start, end] along `direction` (normalised here)
 * through `origin`. False (bins untouched) when the direction is zero or not
 * finite, count < 1, or the range is not finite with end > start.
 */
template <typename T>
inline bool MakeAxisBins(
  const T origin[3], const T direction[3], T start, T end, int count, AxisBins<T>& bins)
{
  const T n = Norm(direction);
  if (!(n > T(0)) || !std::isfinite(n) || !AllFinite(origin, 3) || count < 1 ||
    !std::isfinite(start) || !std::isfinite(end) || !(end > start))
  {
    return false;
  }
  for (int i = 0; i < 3; ++i)
  {
    bins.Origin[i] = origin[i];
    bins.Axis[i] = direction[i] / n;
  }
  bins.Start = start;
  bins.End = end;
  bins.Count = count;
  return true;
}

/// Whether any corner of the face lies outside [Start, End] (the face then
/// has a part in no bin, unless that part has no area).
template <typename T, typename P, typename I>
inline bool CrossesRangeEnds(const P* points, const I* ids, int numIds, const AxisBins<T>& bins)
{
  for (int k = 0; k < numIds; ++k)
  {
    const T s = bins.Coordinate(points + 3 * ids[k]);
    if (s < bins.Start || s > bins.End)
    {
      return true;
    }
  }
  return false;
}

namespace detail
{
/// One pass of Sutherland-Hodgman: keep the part of the convex polygon
/// (x, s) with sign * (s - level) >= 0. Returns the new vertex count
/// (at most n + 1).
template <typename T>
inline int ClipByPlane(
  const T (*x)[3], const T* s, int n, T level, T sign, T (*outX)[3], T* outS)
{
  int m = 0;
  for (int k = 0; k < n; ++k)
  {
    const int j = (k + 1) % n;
    const bool inK = sign * (s[k] - level) >= T(0);
    const bool inJ = sign * (s[j] - level) >= T(0);
    if (inK)
    {
      outX[m][0] = x[k][0];
      outX[m][1] = x[k][1];
      outX[m][2] = x[k][2];
      outS[m] = s[k];
      ++m;
    }
    if (inK != inJ)
    {
      const T t = (level - s[k]) / (s[j] - s[k]);
      for (int c = 0; c < 3; ++c)
      {
        outX[m][c] = x[k][c] + t * (x[j][c] - x[k][c]);
      }
      outS[m] = level;
      ++m;
    }
  }
  return m;
}

/// Add the area vector, the area along `normal` and the first moment (area
/// along `normal` times centroid) of a convex polygon to the accumulators.
template <typename T>
inline void AddConvexPart(
  const T (*x)[3], int n, const T normal[3], T area[3], T& projected, T moment[3])
{
  for (int k = 1; k + 1 < n; ++k)
  {
    const T a[3] = { x[k][0] - x[0][0], x[k][1] - x[0][1], x[k][2] - x[0][2] };
    const T b[3] = { x[k + 1][0] - x[0][0], x[k + 1][1] - x[0][1], x[k + 1][2] - x[0][2] };
    T c[3];
    Cross(a, b, c);
    const T w = T(0.5) * Dot(c, normal);
    for (int i = 0; i < 3; ++i)
    {
      area[i] += T(0.5) * c[i];
      moment[i] += w * (x[0][i] + x[k][i] + x[k + 1][i]) / T(3);
    }
    projected += w;
  }
}
} // namespace detail

/**
 * Split the face with corner ids `ids[0..numIds)` (coordinates
 * `points[3 * id + c]`), whose frame `frame` was computed by
 * ComputeFaceFrame, among `bins`. Calls
 * `emit(int bin, const T areaVector[3], T area, const T centroid[3])` once
 * for every bin holding a part of non-zero area, in increasing bin order.
 * Returns the face's area inside [Start, End] (the sum of the emitted areas;
 * the face's area, to round-off, when the face is inside the range).
 */
template <typename T, typename P, typename I, typename Emit>
T BinFace(const P* points, const I* ids, int numIds, const FaceFrame<T>& frame,
  const AxisBins<T>& bins, Emit&& emit)
{
  if (numIds < 3)
  {
    return T(0);
  }
  T smin = bins.Coordinate(points + 3 * ids[0]);
  T smax = smin;
  for (int k = 1; k < numIds; ++k)
  {
    const T s = bins.Coordinate(points + 3 * ids[k]);
    smin = s < smin ? s : smin;
    smax = s > smax ? s : smax;
  }
  if (!(smax >= bins.Start) || !(smin <= bins.End) || (smax == bins.Start && smin < smax))
  {
    return T(0); // outside the range, or touching its start from below
  }
  const int first = bins.BinOf(smin > bins.Start ? smin : bins.Start);
  const int last = bins.BinOf(smax < bins.End ? smax : bins.End);
  if (first == last && smin >= bins.Edge(first) && smax <= bins.Edge(first + 1))
  {
    // Inside one bin (the common case): the face itself.
    emit(first, frame.AreaVector, frame.Area, frame.Centroid);
    return frame.Area;
  }
  // Coordinates relative to the first corner, as FaceGeometry.h does.
  const P* p0 = points + 3 * ids[0];
  const T o[3] = { T(p0[0]), T(p0[1]), T(p0[2]) };
  const T so = bins.Coordinate(p0);
  T inside = 0;
  for (int b = first; b <= last; ++b)
  {
    const T lo = bins.Edge(b);
    const T hi = bins.Edge(b + 1);
    T area[3] = { 0, 0, 0 };
    T moment[3] = { 0, 0, 0 };
    T projected = 0;
    for (int k = 1; k + 1 < numIds; ++k)
    {
      T tri[3][3];
      T st[3];
      tri[0][0] = tri[0][1] = tri[0][2] = T(0);
      st[0] = so;
      Relative(points + 3 * ids[k], o, tri[1]);
      Relative(points + 3 * ids[k + 1], o, tri[2]);
      st[1] = bins.Coordinate(points + 3 * ids[k]);
      st[2] = bins.Coordinate(points + 3 * ids[k + 1]);
      const T tmin = std::fmin(st[0], std::fmin(st[1], st[2]));
      const T tmax = std::fmax(st[0], std::fmax(st[1], st[2]));
      if (tmin == tmax)
      {
        // A triangle in a plane of constant s: all of it in the bin holding s.
        if (tmin >= bins.Start && tmin <= bins.End && bins.BinOf(tmin) == b)
        {
          detail::AddConvexPart<T>(tri, 3, frame.Normal, area, projected, moment);
        }
        continue;
      }
      if (tmax <= lo || tmin >= hi)
      {
        continue; // no part of non-zero area in this bin
      }
      if (tmin >= lo && tmax <= hi)
      {
        detail::AddConvexPart<T>(tri, 3, frame.Normal, area, projected, moment);
        continue;
      }
      T midX[4][3], midS[4], outX[5][3], outS[5];
      const int m = detail::ClipByPlane<T>(tri, st, 3, lo, T(1), midX, midS);
      const int n = m >= 3 ? detail::ClipByPlane<T>(midX, midS, m, hi, T(-1), outX, outS) : 0;
      if (n >= 3)
      {
        detail::AddConvexPart<T>(outX, n, frame.Normal, area, projected, moment);
      }
    }
    if (projected != T(0))
    {
      const T centroid[3] = { o[0] + moment[0] / projected, o[1] + moment[1] / projected,
        o[2] + moment[2] / projected };
      emit(b, area, projected, centroid);
      inside += projected;
    }
  }
  return inside;
}

} // namespace wallloads
