// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * A one-pass certificate that a surface is closed and consistently oriented.
 *
 * A surface (faces joined through shared point ids) is closed and
 * consistently oriented exactly when, for every ordered pair of points
 * (a, b), the faces traverse the edge a->b as often as b->a: the multiset of
 * half-edges equals the multiset of reversed half-edges (each interior edge is
 * walked once each way, and no edge is left with one user). When it holds,
 * the exact check (OrientationCheck.h) reports 0 inconsistent faces and 0
 * boundary edges; this certificate proves it without gathering the faces
 * around each point.
 *
 * The multisets are compared through a polynomial fingerprint: with g(a) a
 * 64-bit hash of the point id and arithmetic modulo 2^64,
 *
 *   D = sum over half-edges (a, b) of  g(a) g(b)^2 - g(b) g(a)^2
 *     = sum over half-edges (a, b) of  g(a) g(b) (g(b) - g(a)).
 *
 * D is the value of sum_{a<b} C_ab g_a g_b (g_b - g_a), C_ab = count(a->b) -
 * count(b->a), which is the zero polynomial exactly when every C_ab is 0.
 * For hash values that behave as random, an unbalanced surface gives D = 0
 * with a probability of about 2^-60 (a Schwartz-Zippel bound, weakened by
 * the few factors of two that small counts C_ab can carry). D = 0 is taken
 * as the certificate; D != 0 proves that the surface is open or
 * inconsistent, and the caller then runs the exact check to count faces and
 * edges. Faces that repeat a corner id could use one edge both ways by
 * themselves, which the exact check counts differently: they mark the pass
 * Irregular (no certificate). Edges used twice each way (non-manifold) keep
 * D = 0, and the exact check, which joins faces only across edges of two
 * users, then also finds 0 and 0: the reported counts agree.
 *
 * Cost: per face, two multiplications per corner (its hash) and two per
 * edge, with no memory. Integer arithmetic modulo 2^64 is exact and
 * commutative: passes over parts of the faces merge by addition, so the pass
 * is threaded in any split with the same result.
 */
#include "wallloads/Vector3.h" // WALLLOADS_FACE_INLINE

#include <cstdint>

namespace wallloads
{

#if defined(__GNUC__) || defined(__clang__)
/// W 64-bit integer lanes (a vector extension: one AVX2 or AVX-512 register
/// in the face loops compiled for them) and the lane masks of comparisons.
template <int W>
struct IdLanes;
template <>
struct IdLanes<4>
{
  typedef std::uint64_t Ids __attribute__((vector_size(32)));
  typedef std::int64_t Same __attribute__((vector_size(32)));
};
template <>
struct IdLanes<8>
{
  typedef std::uint64_t Ids __attribute__((vector_size(64)));
  typedef std::int64_t Same __attribute__((vector_size(64)));
};
#endif

struct EdgeBalance
{
  std::uint64_t Imbalance = 0; ///< D above, modulo 2^64
  std::int64_t Faces = 0;
  bool Irregular = false; ///< a face repeats a corner id

  /// g(id) in place: one 64-bit value, or W of them in the lanes of an
  /// IdLanes<W> (by reference: no vector crosses a call boundary).
  template <typename U>
  static WALLLOADS_FACE_INLINE void HashInPlace(U& z)
  {
    // splitmix64 finaliser: a bijection of 64 bits with full avalanche.
    z += 0x9E3779B97F4A7C15ull;
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    z ^= z >> 31;
  }
  static std::uint64_t Hash(std::uint64_t id)
  {
    HashInPlace(id);
    return id;
  }

  /// Add one face of `n` corner ids; `reversed` walks it backwards.
  template <typename I>
  void AddFace(const I* ids, int n, bool reversed)
  {
    switch (n)
    {
      case 3:
        this->AddFaceOf<3>(ids, 3, reversed);
        return;
      case 4:
        this->AddFaceOf<4>(ids, 4, reversed);
        return;
      default:
        if (n > 64)
        {
          this->Irregular = true; // never met on wall faces; the exact check handles it
          return;
        }
        this->AddFaceOf<0>(ids, n, reversed);
    }
  }

  /// AddFace for `N` corners (0: `n` at run time), unrolled for N > 0.
  template <int N, typename I>
  void AddFaceOf(const I* ids, int numIds, bool reversed)
  {
    const int n = N > 0 ? N : numIds;
    std::uint64_t g[N > 0 ? N : 64];
    for (int k = 0; k < n; ++k)
    {
      for (int j = 0; j < k; ++j)
      {
        this->Irregular |= ids[j] == ids[k];
      }
      g[k] = Hash(static_cast<std::uint64_t>(ids[k]));
    }
    std::uint64_t d = 0;
    for (int k = 0; k < n; ++k)
    {
      const std::uint64_t b = g[k + 1 == n ? 0 : k + 1];
      d += g[k] * b * (b - g[k]);
    }
    this->Imbalance += reversed ? 0 - d : d;
    ++this->Faces;
  }

#if defined(__GNUC__) || defined(__clang__)
  /**
   * AddFace(ids[j], N, false) for the W faces of a face loop's run, one face
   * per lane of a W x 64-bit vector (in the AVX-512 loop, eight faces a
   * multiplication). The same terms are added: integer addition modulo 2^64
   * is exact and commutative, so the result does not depend on the order.
   */
  template <int W, int N, typename I>
  WALLLOADS_FACE_INLINE void AddFaces(const I* const ids[W])
  {
    typedef typename IdLanes<W>::Ids Ids;
    typedef typename IdLanes<W>::Same Same;
    Ids corner[N];
    for (int k = 0; k < N; ++k)
    {
      for (int j = 0; j < W; ++j)
      {
        corner[k][j] = static_cast<std::uint64_t>(static_cast<std::int64_t>(ids[j][k]));
      }
    }
    Same repeated = {};
    for (int k = 1; k < N; ++k)
    {
      for (int j = 0; j < k; ++j)
      {
        repeated |= corner[j] == corner[k];
      }
    }
    Ids* g = corner; // hashed in place
    for (int k = 0; k < N; ++k)
    {
      HashInPlace(g[k]);
    }
    Ids d = {};
    for (int k = 0; k < N; ++k)
    {
      const Ids b = g[k + 1 == N ? 0 : k + 1];
      d += g[k] * b * (b - g[k]);
    }
    std::uint64_t sum = 0;
    bool irregular = false;
    for (int j = 0; j < W; ++j)
    {
      sum += d[j];
      irregular |= repeated[j] != 0;
    }
    this->Imbalance += sum;
    this->Faces += W;
    this->Irregular |= irregular;
  }
#endif

  void Merge(const EdgeBalance& other)
  {
    this->Imbalance += other.Imbalance;
    this->Faces += other.Faces;
    this->Irregular |= other.Irregular;
  }

  /// True: closed and consistently oriented (see above). False: unknown,
  /// run the exact check.
  bool ClosedAndConsistent() const { return !this->Irregular && this->Imbalance == 0; }
};

} // namespace wallloads
