// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Consistency of face orientation across shared edges.
 *
 * Two faces that share an edge are consistently oriented when they traverse it
 * in opposite directions. Faces are joined by a union-find that carries the
 * relative orientation (parity) of each face to its root; in every connected
 * patch the faces in the minority orientation are the ones reported as
 * inconsistent (flipping exactly those makes the patch consistent). The same
 * pass counts boundary edges (used by one face: the surface is open) and
 * non-manifold edges (used by more than two).
 *
 * Faces connect through shared point ids only: a surface whose patches carry
 * duplicated points is checked patch by patch.
 */
#include <algorithm>
#include <cstdint>
#include <vector>

namespace wallloads
{

struct OrientationReport
{
  std::int64_t InconsistentFaces = 0; ///< faces opposite to the majority of their patch
  std::int64_t BoundaryEdges = 0;     ///< edges used by exactly one face
  std::int64_t NonManifoldEdges = 0;  ///< edges used by three or more faces
  std::int64_t Conflicts = 0;         ///< edge pairs that contradict (non-orientable)
  std::int64_t Patches = 0;           ///< connected patches of checked faces
};

namespace detail
{
struct ParityUnionFind
{
  std::vector<std::int64_t> Parent;
  std::vector<std::uint8_t> Parity; // orientation relative to the parent

  explicit ParityUnionFind(std::int64_t n)
    : Parent(static_cast<std::size_t>(n))
    , Parity(static_cast<std::size_t>(n), 0)
  {
    for (std::int64_t i = 0; i < n; ++i)
    {
      this->Parent[i] = i;
    }
  }

  // Returns the root; `parity` becomes the face's orientation relative to it.
  std::int64_t Find(std::int64_t f, std::uint8_t& parity)
  {
    parity = 0;
    std::int64_t r = f;
    while (this->Parent[r] != r)
    {
      parity ^= this->Parity[r];
      r = this->Parent[r];
    }
    // Path compression, keeping each node's parity relative to the root.
    std::uint8_t p = parity;
    while (this->Parent[f] != r && this->Parent[f] != f)
    {
      const std::int64_t next = this->Parent[f];
      const std::uint8_t own = this->Parity[f];
      this->Parent[f] = r;
      this->Parity[f] = p;
      p ^= own;
      f = next;
    }
    return r;
  }

  // Record that a and b differ in orientation by `relation`; false on conflict.
  bool Join(std::int64_t a, std::int64_t b, std::uint8_t relation)
  {
    std::uint8_t pa, pb;
    const std::int64_t ra = this->Find(a, pa);
    const std::int64_t rb = this->Find(b, pb);
    if (ra == rb)
    {
      return (pa ^ pb) == relation;
    }
    this->Parent[rb] = ra;
    this->Parity[rb] = static_cast<std::uint8_t>(pa ^ pb ^ relation);
    return true;
  }
};
} // namespace detail

/**
 * Check faces 0..numFaces-1 whose corner ids are below numPoints.
 * `corners(f, ids, buffer, reversed)` returns the number of corner ids of
 * face f and points `ids` at them (0: face not checked); `buffer` has room
 * for 4 ids for callers that must reorder corners; setting `reversed` makes
 * the face count as traversed backwards (a face whose orientation is decided
 * elsewhere, e.g. by a normal array).
 *
 * Cost O(faces x corners x faces-per-point): the faces around each point are
 * gathered once (counting sort), and each edge's other users are found by
 * scanning the faces around its less shared endpoint. Memory: one id per corner and
 * one per point, plus the union-find.
 */
template <typename I, typename Corners>
OrientationReport CheckOrientation(std::int64_t numFaces, std::int64_t numPoints, Corners corners)
{
  OrientationReport report;
  // Faces around each point, as compressed rows.
  std::vector<std::int64_t> start(static_cast<std::size_t>(numPoints) + 1, 0);
  std::vector<std::uint8_t> used(static_cast<std::size_t>(numFaces), 0);
  std::vector<std::uint8_t> flipped(static_cast<std::size_t>(numFaces), 0);
  for (std::int64_t f = 0; f < numFaces; ++f)
  {
    I buffer[4];
    const I* ids = nullptr;
    bool reversed = false;
    const int n = corners(f, ids, buffer, reversed);
    if (n < 3)
    {
      continue;
    }
    used[f] = 1;
    flipped[f] = reversed ? 1 : 0;
    for (int k = 0; k < n; ++k)
    {
      ++start[static_cast<std::size_t>(ids[k]) + 1];
    }
  }
  for (std::int64_t p = 0; p < numPoints; ++p)
  {
    start[p + 1] += start[p];
  }
  std::vector<std::int64_t> around(static_cast<std::size_t>(start[numPoints]));
  {
    std::vector<std::int64_t> fill(start.begin(), start.end() - 1);
    for (std::int64_t f = 0; f < numFaces; ++f)
    {
      if (!used[f])
      {
        continue;
      }
      I buffer[4];
      const I* ids = nullptr;
      bool reversed = false;
      const int n = corners(f, ids, buffer, reversed);
      for (int k = 0; k < n; ++k)
      {
        around[fill[ids[k]]++] = f;
      }
    }
  }

  // Direction in which face g traverses the edge {a, b}: +1 a->b, -1 b->a, 0 absent.
  auto direction = [&](std::int64_t g, I a, I b) -> int {
    I buffer[4];
    const I* ids = nullptr;
    bool reversed = false;
    const int n = corners(g, ids, buffer, reversed);
    for (int k = 0; k < n; ++k)
    {
      const I u = ids[k];
      const I v = ids[(k + 1) % n];
      if (u == a && v == b)
      {
        return reversed ? -1 : 1;
      }
      if (u == b && v == a)
      {
        return reversed ? 1 : -1;
      }
    }
    return 0;
  };

  detail::ParityUnionFind sets(numFaces);
  for (std::int64_t f = 0; f < numFaces; ++f)
  {
    if (!used[f])
    {
      continue;
    }
    I buffer[4];
    const I* ids = nullptr;
    bool reversed = false;
    const int n = corners(f, ids, buffer, reversed);
    // Copy: `direction` below reuses the caller's buffer.
    I own[4];
    const I* mine = ids;
    if (ids == buffer)
    {
      for (int k = 0; k < n; ++k)
      {
        own[k] = buffer[k];
      }
      mine = own;
    }
    for (int k = 0; k < n; ++k)
    {
      const I a = mine[k];
      const I b = mine[(k + 1) % n];
      if (a == b)
      {
        continue;
      }
      const int fdir = reversed ? -1 : 1;
      int users = 1;
      bool smallest = true;
      std::int64_t other = -1;
      int odir = 0;
      // Scan the faces around the endpoint with fewer of them (a pole of a
      // latitude-longitude sphere has thousands; its neighbours have four).
      const I pivot = (start[a + 1] - start[a]) <= (start[b + 1] - start[b]) ? a : b;
      for (std::int64_t j = start[pivot]; j < start[pivot + 1]; ++j)
      {
        const std::int64_t g = around[j];
        if (g == f || (j > start[pivot] && around[j - 1] == g))
        {
          continue;
        }
        const int d = direction(g, a, b);
        if (d == 0)
        {
          continue;
        }
        ++users;
        smallest = smallest && f < g;
        other = g;
        odir = d;
      }
      if (!smallest)
      {
        continue; // the edge is handled from its smallest user
      }
      if (users == 1)
      {
        ++report.BoundaryEdges;
      }
      else if (users == 2)
      {
        // Traversed the same way: opposite orientation.
        const std::uint8_t relation = odir == fdir ? 1 : 0;
        if (!sets.Join(f, other, relation))
        {
          ++report.Conflicts;
        }
      }
      else
      {
        ++report.NonManifoldEdges;
      }
    }
  }
  // Count each patch's faces by orientation relative to its root.
  std::vector<std::int64_t> count0(static_cast<std::size_t>(numFaces), 0);
  std::vector<std::int64_t> count1(static_cast<std::size_t>(numFaces), 0);
  for (std::int64_t f = 0; f < numFaces; ++f)
  {
    if (!used[f])
    {
      continue;
    }
    std::uint8_t parity;
    const std::int64_t root = sets.Find(f, parity);
    (parity ? count1 : count0)[root]++;
  }
  for (std::int64_t f = 0; f < numFaces; ++f)
  {
    if (count0[f] + count1[f] > 0)
    {
      ++report.Patches;
      report.InconsistentFaces += std::min(count0[f], count1[f]);
    }
  }
  return report;
}

} // namespace wallloads
