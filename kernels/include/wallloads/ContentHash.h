// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * A 64-bit hash of a block of bytes at memory speed, to tell whether a mesh
 * handed over in new objects has the same content as the one cached.
 *
 * Four independent lanes, each a multiply-rotate-multiply round per 8 bytes
 * (the round of the xxHash family, Collet 2012), so that the multiplications
 * of the lanes overlap: about 8 bytes per cycle, faster than memory is read.
 * Not cryptographic: two different meshes collide with a probability of
 * about 2^-64, which a cache of derived diagnostics can accept.
 * Blocks are hashed separately and combined in order (HashCombine), so a
 * threaded caller that cuts the bytes into fixed blocks gets the same value
 * with any number of threads.
 */
#include <cstddef>
#include <cstdint>
#include <cstring>

namespace wallloads
{
namespace detail
{
constexpr std::uint64_t HashP1 = 0x9E3779B185EBCA87ull;
constexpr std::uint64_t HashP2 = 0xC2B2AE3D27D4EB4Full;
constexpr std::uint64_t HashP3 = 0x165667B19E3779F9ull;
inline std::uint64_t Rotl(std::uint64_t x, int r)
{
  return (x << r) | (x >> (64 - r));
}
inline std::uint64_t Round(std::uint64_t acc, std::uint64_t w)
{
  return Rotl(acc + w * HashP2, 31) * HashP1;
}
inline std::uint64_t Mix(std::uint64_t h)
{
  h ^= h >> 33;
  h *= HashP2;
  h ^= h >> 29;
  h *= HashP3;
  h ^= h >> 32;
  return h;
}
} // namespace detail

/// Hash of `size` bytes at `data`, with a seed.
inline std::uint64_t HashBytes(const void* data, std::size_t size, std::uint64_t seed = 0)
{
  using namespace detail;
  const unsigned char* p = static_cast<const unsigned char*>(data);
  std::uint64_t lane[4] = { seed + HashP1 + HashP2, seed + HashP2, seed, seed - HashP1 };
  std::size_t i = 0;
  for (; i + 32 <= size; i += 32)
  {
    std::uint64_t w[4];
    std::memcpy(w, p + i, 32);
    lane[0] = Round(lane[0], w[0]);
    lane[1] = Round(lane[1], w[1]);
    lane[2] = Round(lane[2], w[2]);
    lane[3] = Round(lane[3], w[3]);
  }
  std::uint64_t h = Rotl(lane[0], 1) + Rotl(lane[1], 7) + Rotl(lane[2], 12) + Rotl(lane[3], 18);
  for (; i + 8 <= size; i += 8)
  {
    std::uint64_t w;
    std::memcpy(&w, p + i, 8);
    h = Round(h, w);
  }
  for (; i < size; ++i)
  {
    h = Round(h, p[i]);
  }
  return Mix(h ^ static_cast<std::uint64_t>(size));
}

/// Order-dependent combination of hashes.
inline std::uint64_t HashCombine(std::uint64_t h, std::uint64_t v)
{
  return detail::Mix(detail::Round(h, v) + detail::HashP3);
}

} // namespace wallloads
