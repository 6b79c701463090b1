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
 * The multisets are compared through a polynomial fingerprint over the prime
 * field p = 2^61 - 1: with g(a) a hash of the point id reduced modulo p,
 *
 *   D = sum over half-edges (a, b) of  g(a) g(b)^2 - g(b) g(a)^2   (mod p).
 *
 * D is the value of the polynomial sum_{a<b} C_ab g_a g_b (g_b - g_a), C_ab =
 * count(a->b) - count(b->a), which is the zero polynomial exactly when every
 * C_ab is 0. By the Schwartz-Zippel lemma an unbalanced surface gives D = 0
 * for at most 3 in p (about 1e-18) of random point values; the hash stands in
 * for random values. D = 0 is therefore taken as the certificate; D != 0 is
 * proof that the surface is open or inconsistent, and the caller then runs
 * the exact check to count faces and edges. Faces that repeat a corner id
 * could use one edge both ways by themselves, which the exact check counts
 * differently: they mark the pass Irregular (no certificate).
 *
 * Cost: per face, one hash and one product per corner and two products per
 * edge; no memory. Passes over parts of the faces merge by addition, so the
 * pass is threaded in any split with the same result.
 */
#include <cstdint>

namespace wallloads
{

struct EdgeBalance
{
  static constexpr std::uint64_t Prime = (std::uint64_t(1) << 61) - 1;

  std::uint64_t Forward = 0;  ///< sum of g(a) g(b)^2 over half-edges, mod p
  std::uint64_t Backward = 0; ///< sum of g(b) g(a)^2 over half-edges, mod p
  std::int64_t Faces = 0;
  bool Irregular = false; ///< a face repeats a corner id

  static std::uint64_t Reduce(unsigned __int128 x)
  {
    // x mod p for p = 2^61 - 1: fold the high bits onto the low ones.
    std::uint64_t r = static_cast<std::uint64_t>(x & Prime) +
      static_cast<std::uint64_t>((x >> 61) & Prime) + static_cast<std::uint64_t>(x >> 122);
    r = (r & Prime) + (r >> 61);
    return r >= Prime ? r - Prime : r;
  }
  static std::uint64_t Hash(std::uint64_t id)
  {
    // splitmix64 finaliser: a bijection of 64 bits with full avalanche.
    std::uint64_t z = id + 0x9E3779B97F4A7C15ull;
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    z ^= z >> 31;
    return z & Prime; // < p (the value p itself maps to 0 only for z == p)
  }

  /// Add one face of `n` corner ids; `reversed` walks it backwards.
  template <typename I>
  void AddFace(const I* ids, int n, bool reversed)
  {
    if (n > 64)
    {
      this->Irregular = true; // never met on wall faces; the exact check handles it
      return;
    }
    std::uint64_t g[64];
    std::uint64_t g2[64];
    for (int k = 0; k < n; ++k)
    {
      for (int j = 0; j < k; ++j)
      {
        this->Irregular |= ids[j] == ids[k];
      }
      g[k] = Hash(static_cast<std::uint64_t>(ids[k]));
      g2[k] = Reduce(static_cast<unsigned __int128>(g[k]) * g[k]);
    }
    // Each product is below 2^122: sum a few before reducing.
    unsigned __int128 fwd = 0, bwd = 0;
    for (int k = 0; k < n; ++k)
    {
      const int a = k;
      const int b = k + 1 == n ? 0 : k + 1;
      fwd += static_cast<unsigned __int128>(g[a]) * g2[b];
      bwd += static_cast<unsigned __int128>(g[b]) * g2[a];
      if ((k & 7) == 7)
      {
        fwd = Reduce(fwd);
        bwd = Reduce(bwd);
      }
    }
    const std::uint64_t f = Reduce(fwd);
    const std::uint64_t r = Reduce(bwd);
    this->Forward = Add(this->Forward, reversed ? r : f);
    this->Backward = Add(this->Backward, reversed ? f : r);
    ++this->Faces;
  }

  void Merge(const EdgeBalance& other)
  {
    this->Forward = Add(this->Forward, other.Forward);
    this->Backward = Add(this->Backward, other.Backward);
    this->Faces += other.Faces;
    this->Irregular |= other.Irregular;
  }

  /// True: closed and consistently oriented (see above). False: unknown,
  /// run the exact check.
  bool ClosedAndConsistent() const { return !this->Irregular && this->Forward == this->Backward; }

private:
  static std::uint64_t Add(std::uint64_t a, std::uint64_t b)
  {
    const std::uint64_t s = a + b; // both below 2^61: no overflow
    return s >= Prime ? s - Prime : s;
  }
};

} // namespace wallloads
