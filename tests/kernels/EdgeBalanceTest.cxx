// SPDX-License-Identifier: BSD-3-Clause
// The edge-balance certificate (closed and consistently oriented) and the
// content hash, against cases whose answer follows from the definitions:
// a closed surface oriented consistently walks every edge once each way.
#include "wallloads/ContentHash.h"
#include "wallloads/EdgeBalance.h"
#include "wallloads/FaceGeometry.h" // UseAvx512Loops
#include "wallloads/Lanes.h"        // WALLLOADS_TARGET_AVX512
#include "wallloads/OrientationCheck.h"

#include <gtest/gtest.h>

#include <array>
#include <cstdint>
#include <utility>
#include <vector>

using namespace wallloads;

// Inlined into their callers, so that the AVX-512 one compiles them for AVX-512.
#define LANES_BALANCE_INLINE inline __attribute__((always_inline))

namespace
{
using Face = std::vector<std::int64_t>;
// Cube: 8 corners, 6 quads ordered outward.
std::vector<Face> Cube()
{
  return { { 0, 3, 2, 1 }, { 4, 5, 6, 7 }, { 0, 1, 5, 4 }, { 2, 3, 7, 6 }, { 1, 2, 6, 5 },
    { 0, 4, 7, 3 } };
}

EdgeBalance Balance(const std::vector<Face>& faces, std::size_t from = 0,
  std::size_t to = std::size_t(-1), const std::vector<bool>& reversed = {})
{
  EdgeBalance b;
  for (std::size_t f = from; f < faces.size() && f < to; ++f)
  {
    b.AddFace(faces[f].data(), static_cast<int>(faces[f].size()), !reversed.empty() && reversed[f]);
  }
  return b;
}

OrientationReport Exact(const std::vector<Face>& faces, std::int64_t numPoints)
{
  auto corners = [&](std::int64_t f, const std::int64_t*& ids, std::int64_t*, bool&) {
    ids = faces[static_cast<std::size_t>(f)].data();
    return static_cast<int>(faces[static_cast<std::size_t>(f)].size());
  };
  return CheckOrientation<std::int64_t>(static_cast<std::int64_t>(faces.size()), numPoints, corners);
}
}

TEST(EdgeBalance, ClosedConsistentCubeIsCertified)
{
  const auto cube = Cube();
  EXPECT_TRUE(Balance(cube).ClosedAndConsistent());
  const OrientationReport r = Exact(cube, 8);
  EXPECT_EQ(r.InconsistentFaces, 0);
  EXPECT_EQ(r.BoundaryEdges, 0);
  // Any split into parts merges to the same certificate (threads).
  EdgeBalance a = Balance(cube, 0, 2), b = Balance(cube, 2, 5), c = Balance(cube, 5);
  a.Merge(b);
  a.Merge(c);
  EXPECT_TRUE(a.ClosedAndConsistent());
  // Triangulated: two triangles per quad, still closed and consistent.
  std::vector<Face> tris;
  for (const Face& q : cube)
  {
    tris.push_back({ q[0], q[1], q[2] });
    tris.push_back({ q[0], q[2], q[3] });
  }
  EXPECT_TRUE(Balance(tris).ClosedAndConsistent());
}

TEST(EdgeBalance, OpenOrInconsistentIsNotCertified)
{
  auto cube = Cube();
  std::vector<Face> open(cube.begin(), cube.end() - 1);
  EXPECT_FALSE(Balance(open).ClosedAndConsistent());
  EXPECT_EQ(Exact(open, 8).BoundaryEdges, 4);
  auto flipped = cube;
  flipped[2] = { 4, 5, 1, 0 };
  EXPECT_FALSE(Balance(flipped).ClosedAndConsistent());
  EXPECT_EQ(Exact(flipped, 8).InconsistentFaces, 1);
  // Reversed by the caller (a normal array says so): the flip is undone.
  std::vector<bool> rev(6, false);
  rev[2] = true;
  EXPECT_TRUE(Balance(flipped, 0, std::size_t(-1), rev).ClosedAndConsistent());
  // All faces reversed: consistent again.
  EXPECT_TRUE(Balance(cube, 0, std::size_t(-1), std::vector<bool>(6, true)).ClosedAndConsistent());
  // A face given once more each way: its edges have four users (non-manifold,
  // not joined by the exact check) but stay balanced, and the exact check
  // also finds 0 inconsistent faces and 0 boundary edges: the counts agree.
  auto twice = cube;
  twice.push_back(cube[0]);
  twice.push_back({ 1, 2, 3, 0 });
  EXPECT_TRUE(Balance(twice).ClosedAndConsistent());
  EXPECT_EQ(Exact(twice, 8).InconsistentFaces, 0);
  EXPECT_EQ(Exact(twice, 8).BoundaryEdges, 0);
  EXPECT_EQ(Exact(twice, 8).NonManifoldEdges, 4);
  // Given once more the same way: unbalanced.
  twice.pop_back();
  EXPECT_FALSE(Balance(twice).ClosedAndConsistent());
}

TEST(EdgeBalance, RepeatedCornersAreLeftToTheExactCheck)
{
  auto cube = Cube();
  cube.push_back({ 0, 1, 0 }); // walks 0-1 both ways by itself
  EXPECT_TRUE(Balance(cube).Irregular);
  EXPECT_FALSE(Balance(cube).ClosedAndConsistent());
}

// The accumulated value is the fingerprint as defined, D = sum over
// half-edges (a, b) of g(a) g(b)^2 - g(b) g(a)^2 modulo 2^64, summed here
// term by term (two sums, subtracted at the end) for random faces of 3 to 6
// corners, some walked backwards.
TEST(EdgeBalance, ImbalanceIsTheDefinedFingerprint)
{
  std::uint64_t state = 12345;
  auto next = [&state]() {
    state = state * 6364136223846793005ull + 1442695040888963407ull;
    return state >> 33;
  };
  EdgeBalance b;
  std::uint64_t forward = 0, backward = 0;
  for (int f = 0; f < 5000; ++f)
  {
    const int n = 3 + static_cast<int>(next() % 4);
    Face face(static_cast<std::size_t>(n));
    for (auto& id : face)
    {
      id = static_cast<std::int64_t>(next() % 1000000);
    }
    const bool reversed = next() % 5 == 0;
    b.AddFace(face.data(), n, reversed);
    for (int k = 0; k < n; ++k)
    {
      std::uint64_t a = EdgeBalance::Hash(static_cast<std::uint64_t>(face[k]));
      std::uint64_t c = EdgeBalance::Hash(static_cast<std::uint64_t>(face[(k + 1) % n]));
      if (reversed)
      {
        std::swap(a, c); // the half-edge (b, a)
      }
      forward += a * c * c;
      backward += c * a * a;
    }
    ASSERT_EQ(b.Imbalance, forward - backward) << f;
  }
  EXPECT_EQ(b.Faces, 5000);
}

#if defined(__GNUC__) || defined(__clang__)
/// AddFaces<W, N> (a run of the face loop, a face per lane) against W calls
/// of AddFace: the same fingerprint, face count and repeated-corner flag, for
/// random runs with and without repeated corners, 32- and 64-bit ids.
template <int W, int N, typename I>
LANES_BALANCE_INLINE void CompareRuns(std::uint64_t seed)
{
  std::uint64_t state = seed;
  auto next = [&state]() {
    state = state * 6364136223846793005ull + 1442695040888963407ull;
    return state >> 33;
  };
  for (int run = 0; run < 500; ++run)
  {
    I stored[W][N];
    const I* ids[W];
    for (int j = 0; j < W; ++j)
    {
      for (int k = 0; k < N; ++k)
      {
        // small ranges make repeated corners common; large ids need 64 bits
        const std::uint64_t range = run % 3 == 0 ? 6 : (sizeof(I) == 8 ? (1ull << 40) : (1ull << 30));
        stored[j][k] = static_cast<I>(next() * 7919 % range);
      }
      ids[j] = stored[j];
    }
    EdgeBalance lanes, one;
    lanes.Imbalance = one.Imbalance = next(); // a part already summed
    lanes.AddFaces<W, N>(ids);
    for (int j = 0; j < W; ++j)
    {
      one.AddFace(ids[j], N, false);
    }
    ASSERT_EQ(lanes.Imbalance, one.Imbalance) << "run " << run;
    ASSERT_EQ(lanes.Faces, one.Faces);
    ASSERT_EQ(lanes.Irregular, one.Irregular) << "run " << run;
  }
}

template <int W>
LANES_BALANCE_INLINE void CompareAllRuns()
{
  CompareRuns<W, 3, std::int32_t>(1);
  CompareRuns<W, 4, std::int32_t>(2);
  CompareRuns<W, 3, std::int64_t>(3);
  CompareRuns<W, 4, std::int64_t>(4);
}

#if WALLLOADS_AVX512_CLONE
// Compiled for AVX-512 as the face loop that calls it is (vpmullq).
WALLLOADS_TARGET_AVX512 void CompareEightLaneRuns()
{
  CompareAllRuns<8>();
}
#endif

TEST(EdgeBalance, RunsInLanesEqualFaceByFace)
{
  CompareAllRuns<4>(); // baseline code for the vector extension
  CompareAllRuns<8>();
#if WALLLOADS_AVX512_CLONE
  if (UseAvx512Loops())
  {
    CompareEightLaneRuns();
  }
#endif
}
#endif

TEST(ContentHash, SameBytesSameHashAndOneBitChangesIt)
{
  std::vector<double> a(1000);
  for (std::size_t i = 0; i < a.size(); ++i)
  {
    a[i] = 0.001 * static_cast<double>(i);
  }
  std::vector<double> b = a;
  const std::size_t bytes = a.size() * sizeof(double);
  EXPECT_EQ(HashBytes(a.data(), bytes), HashBytes(b.data(), bytes));
  reinterpret_cast<unsigned char*>(b.data())[4000] ^= 1;
  EXPECT_NE(HashBytes(a.data(), bytes), HashBytes(b.data(), bytes));
  // Length, seed and order of combination matter.
  EXPECT_NE(HashBytes(a.data(), bytes), HashBytes(a.data(), bytes - 8));
  EXPECT_NE(HashBytes(a.data(), bytes, 1), HashBytes(a.data(), bytes, 2));
  EXPECT_NE(HashCombine(HashCombine(0, 1), 2), HashCombine(HashCombine(0, 2), 1));
  // Every tail length (not a multiple of 32 or 8) is hashed whole.
  for (std::size_t n = 1; n < 40; ++n)
  {
    std::vector<unsigned char> x(n, 7), y(n, 7);
    y[n - 1] = 8;
    EXPECT_NE(HashBytes(x.data(), n), HashBytes(y.data(), n)) << n;
  }
}
