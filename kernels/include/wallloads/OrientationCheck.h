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
struct HalfEdge
{
  std::uint64_t Lo;
  std::uint64_t Hi;
  std::int64_t Face;
  bool Forward;
  bool SameEdge(const HalfEdge& o) const { return this->Lo == o.Lo && this->Hi == o.Hi; }
  bool operator<(const HalfEdge& o) const
  {
    if (this->Lo != o.Lo)
    {
      return this->Lo < o.Lo;
    }
    if (this->Hi != o.Hi)
    {
      return this->Hi < o.Hi;
    }
    return this->Face < o.Face;
  }
};

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
 * Check faces 0..numFaces-1. `corners(f, ids, buffer, reversed)` returns the
 * number of corner ids of face f and points `ids` at them (0: face not
 * checked); `buffer` has room for 4 ids for callers that must reorder
 * corners; setting `reversed` makes the face count as traversed backwards
 * (a face whose orientation is decided elsewhere, e.g. by a normal array).
 * `sorter(begin, end)` sorts the half-edges (pass a parallel sort to thread it).
 */
template <typename I, typename Corners, typename Sorter>
OrientationReport CheckOrientation(std::int64_t numFaces, Corners corners, Sorter sorter)
{
  OrientationReport report;
  std::vector<detail::HalfEdge> edges;
  edges.reserve(static_cast<std::size_t>(numFaces) * 4);
  std::vector<std::uint8_t> used(static_cast<std::size_t>(numFaces), 0);
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
    for (int k = 0; k < n; ++k)
    {
      const std::uint64_t a = static_cast<std::uint64_t>(ids[k]);
      const std::uint64_t b = static_cast<std::uint64_t>(ids[(k + 1) % n]);
      if (a == b)
      {
        continue;
      }
      const bool forward = (a < b) != reversed;
      edges.push_back({ a < b ? a : b, a < b ? b : a, f, forward });
    }
  }
  sorter(edges.begin(), edges.end());

  detail::ParityUnionFind sets(numFaces);
  for (std::size_t i = 0; i < edges.size();)
  {
    std::size_t j = i + 1;
    while (j < edges.size() && edges[j].SameEdge(edges[i]))
    {
      ++j;
    }
    const std::size_t users = j - i;
    if (users == 1)
    {
      ++report.BoundaryEdges;
    }
    else if (users == 2)
    {
      // Same traversal direction means opposite orientation.
      const std::uint8_t relation = edges[i].Forward == edges[i + 1].Forward ? 1 : 0;
      if (edges[i].Face != edges[i + 1].Face &&
        !sets.Join(edges[i].Face, edges[i + 1].Face, relation))
      {
        ++report.Conflicts;
      }
    }
    else
    {
      ++report.NonManifoldEdges;
    }
    i = j;
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
