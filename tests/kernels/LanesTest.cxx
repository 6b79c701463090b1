// SPDX-License-Identifier: BSD-3-Clause
// The lane kernels (Lanes.h: four faces at a time in the AVX2 loops, eight
// in the AVX-512 ones) against the scalar ones they are built from: every
// lane must hold exactly the scalar result of its face. Exact equality is
// the specification here, not a tolerance: both are the same IEEE
// operations in the same order, compared within one binary. The eight-lane
// checks run in functions compiled for AVX-512, as the face loop is, and
// are skipped on processors without it.
#include "wallloads/CompensatedSum.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/Lanes.h"
#include "wallloads/Traction.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <cstring>
#include <iterator>
#include <limits>
#include <random>
#include <vector>

#if WALLLOADS_LANES

using namespace wallloads;

namespace
{
bool Same(double a, double b)
{
  return std::memcmp(&a, &b, sizeof a) == 0;
}

/// Random faces of N corners: a random plane patch, warped a little,
/// shifted far from the origin for some.
template <typename P>
void RandomFaces(int n, int count, std::mt19937_64& rng, std::vector<P>& points,
  std::vector<std::int64_t>& ids)
{
  std::uniform_real_distribution<double> u(-1, 1);
  for (int f = 0; f < count; ++f)
  {
    const double shift = (f % 3 == 0) ? 1e6 * u(rng) : u(rng);
    for (int k = 0; k < n; ++k)
    {
      const double t = 2 * 3.141592653589793 * (k + 0.2 * u(rng)) / n;
      const double r = 0.5 + 0.4 * u(rng);
      ids.push_back(static_cast<std::int64_t>(points.size() / 3));
      points.push_back(static_cast<P>(shift + r * std::cos(t)));
      points.push_back(static_cast<P>(shift + r * std::sin(t) + 0.3 * u(rng)));
      points.push_back(static_cast<P>(0.05 * u(rng) + 0.5 * r * std::cos(t)));
    }
  }
}

/// Inlined into its caller, so that the eight-lane instantiation is
/// compiled for AVX-512 as the face loop is.
#define LANES_TEST_INLINE inline __attribute__((always_inline))

template <int W, int N, typename P>
LANES_TEST_INLINE void CompareGeometry(std::uint64_t seed)
{
  std::mt19937_64 rng(seed);
  std::vector<P> points;
  std::vector<std::int64_t> ids;
  RandomFaces<P>(N, 400, rng, points, ids);
  for (int f = 0; f + W <= 400; f += W)
  {
    const std::int64_t* faceIds[W];
    for (int j = 0; j < W; ++j)
    {
      faceIds[j] = &ids[N * (f + j)];
    }
    LaneFaces<W, N, P, std::int64_t> faces(points.data(), faceIds);
    Lanes<W> normal[3];
    Lanes<W> area;
    Lanes<W> a[3];
    ASSERT_TRUE(FaceNormalLanes(faces, normal, area, a));
    Lanes<W> centroid[3];
    FaceCentroidLanes(faces, normal, centroid);
    for (int j = 0; j < W; ++j)
    {
      FaceFrame<double> frame;
      ASSERT_EQ(ComputeFaceFrameFast<double>(points.data(), faceIds[j], N, frame), FaceStatus::Ok);
      EXPECT_TRUE(Same(area[j], frame.Area)) << "face " << f + j;
      for (int k = 0; k < 3; ++k)
      {
        EXPECT_TRUE(Same(normal[k][j], frame.Normal[k])) << "face " << f + j;
        EXPECT_TRUE(Same(centroid[k][j], frame.Centroid[k])) << "face " << f + j;
        EXPECT_TRUE(Same(0.5 * a[k][j], frame.AreaVector[k])) << "face " << f + j;
      }
    }
  }
}

/// One face outside the common case (degenerate, or a NaN corner) sends the
/// whole run back to the scalar path.
template <int W>
LANES_TEST_INLINE void RefuseUncommonFaces()
{
  std::mt19937_64 rng(5);
  std::vector<double> points;
  std::vector<std::int64_t> ids;
  RandomFaces<double>(4, W, rng, points, ids);
  const std::int64_t* faceIds[W];
  for (int j = 0; j < W; ++j)
  {
    faceIds[j] = &ids[4 * j];
  }
  Lanes<W> normal[3];
  Lanes<W> area;
  Lanes<W> a[3];
  {
    LaneFaces<W, 4, double, std::int64_t> faces(points.data(), faceIds);
    EXPECT_TRUE(FaceNormalLanes(faces, normal, area, a));
  }
  const int collapsedFace = W - 2;
  std::vector<double> collapsed = points;
  for (int k = 1; k < 4; ++k) // that face collapses onto its first corner
  {
    for (int d = 0; d < 3; ++d)
    {
      collapsed[3 * ids[4 * collapsedFace + k] + d] = collapsed[3 * ids[4 * collapsedFace] + d];
    }
  }
  {
    LaneFaces<W, 4, double, std::int64_t> faces(collapsed.data(), faceIds);
    EXPECT_FALSE(FaceNormalLanes(faces, normal, area, a));
  }
  std::vector<double> nan = points;
  nan[3 * ids[4 * (W - 1)]] = std::numeric_limits<double>::quiet_NaN(); // last face, corner 0
  {
    LaneFaces<W, 4, double, std::int64_t> faces(nan.data(), faceIds);
    EXPECT_FALSE(FaceNormalLanes(faces, normal, area, a));
  }
}

/// Norm in every range: plain, near overflow, near underflow, zero (lane j
/// takes case j % 4).
template <int W>
LANES_TEST_INLINE void CompareNorms()
{
  const double cases[4][3] = { { 3, 4, 12 }, { 1e200, 1e200, 0 }, { 1e-200, 0, 0 },
    { 0, 0, 0 } };
  Lanes<W> v[3];
  for (int k = 0; k < 3; ++k)
  {
    v[k] = Lanes<W>::Gather([&](int j) { return cases[j % 4][k]; });
  }
  const Lanes<W> n = Norm(v);
  for (int j = 0; j < W; ++j)
  {
    EXPECT_TRUE(Same(n[j], Norm(cases[j % 4]))) << j;
  }
  EXPECT_EQ(n[0], 13.0);
}
} // namespace

TEST(Lanes, TrianglesAndQuadsEqualTheScalarFrame)
{
  CompareGeometry<4, 3, double>(1);
  CompareGeometry<4, 4, double>(2);
  CompareGeometry<4, 3, float>(3);
  CompareGeometry<4, 4, float>(4);
}

TEST(Lanes, ADegenerateOrNonFiniteFaceIsRefused)
{
  RefuseUncommonFaces<4>();
}

TEST(Lanes, NormEqualsTheScalarNormInEveryRange)
{
  CompareNorms<4>();
}

namespace
{
template <int W>
LANES_TEST_INLINE void CompareTractions()
{
  std::mt19937_64 rng(6);
  std::normal_distribution<double> g;
  for (int repeat = 0; repeat < 200; ++repeat)
  {
    double grad[W][9];
    double nrm[W][3];
    double p[W];
    Lanes<W> G[9];
    Lanes<W> n[3];
    for (int j = 0; j < W; ++j)
    {
      for (double& x : grad[j])
      {
        x = g(rng);
      }
      const double raw[3] = { g(rng), g(rng), g(rng) };
      const double len = Norm(raw);
      for (int k = 0; k < 3; ++k)
      {
        nrm[j][k] = raw[k] / len;
      }
      p[j] = 1e5 + g(rng);
    }
    for (int k = 0; k < 9; ++k)
    {
      G[k] = Lanes<W>::Gather([&](int j) { return grad[j][k]; });
    }
    for (int k = 0; k < 3; ++k)
    {
      n[k] = Lanes<W>::Gather([&](int j) { return nrm[j][k]; });
    }
    FaceTractionInput<Lanes<W>> in;
    in.Normal = n;
    in.GaugePressure = Lanes<W>::Gather([&](int j) { return p[j]; }) - 101325.0;
    in.VelocityGradient = G;
    in.EffectiveViscosity = Lanes<W>(1.8e-5);
    in.IncludeNormalViscousStress = repeat % 2 == 0;
    FaceTraction<Lanes<W>> out;
    FaceTractionValues(in, out);
    for (int j = 0; j < W; ++j)
    {
      FaceTractionInput<double> one;
      one.Normal = nrm[j];
      one.GaugePressure = p[j] - 101325.0;
      one.VelocityGradient = grad[j];
      one.EffectiveViscosity = 1.8e-5;
      one.IncludeNormalViscousStress = in.IncludeNormalViscousStress;
      FaceTraction<double> ref;
      ASSERT_TRUE(ComputeFaceTraction(one, ref));
      for (int k = 0; k < 3; ++k)
      {
        EXPECT_TRUE(Same(out.Pressure[k][j], ref.Pressure[k]));
        EXPECT_TRUE(Same(out.Viscous[k][j], ref.Viscous[k]));
        EXPECT_TRUE(Same(out.Total[k][j], ref.Total[k]));
      }
      EXPECT_TRUE(Same(out.NormalViscous[j], ref.NormalViscous));
      EXPECT_TRUE(Same(out.ShearMagnitude[j], ref.ShearMagnitude));
    }
  }
}

/// Compensated sums with one face per lane are W scalar compensated sums.
template <int W>
LANES_TEST_INLINE void CompareLaneSums()
{
  std::mt19937_64 rng(7);
  std::normal_distribution<double> g;
  CompensatedSum<Lanes<W>> lanes;
  CompensatedSum<double> scalar[W];
  for (int i = 0; i < 10000; ++i)
  {
    double x[W];
    for (double& v : x)
    {
      v = 1e5 * g(rng);
    }
    lanes.Add(Lanes<W>::Gather([&](int j) { return x[j]; }));
    for (int j = 0; j < W; ++j)
    {
      scalar[j].Add(x[j]);
    }
  }
  for (int j = 0; j < W; ++j)
  {
    EXPECT_TRUE(Same(lanes.Sum[j], scalar[j].Sum));
    EXPECT_TRUE(Same(lanes.Carry[j], scalar[j].Carry));
  }
}

/// The stores of the face loops: lane j of a scalar into d[j], lane j of
/// a vector into d[3j..3j+2], nothing outside, each value moved unchanged.
template <int W>
LANES_TEST_INLINE void CompareStores()
{
  const double guard = -7.5;
  Lanes<W> v[3];
  for (int k = 0; k < 3; ++k)
  {
    v[k] = Lanes<W>::Gather([k](int j) { return 100.0 * k + j + 0.25; });
  }
  std::vector<double> vectors(3 * W + 2, guard);
  StoreInterleaved(vectors.data() + 1, v);
  std::vector<double> scalars(W + 2, guard);
  StoreLanes(scalars.data() + 1, v[2]);
  EXPECT_EQ(vectors.front(), guard);
  EXPECT_EQ(vectors.back(), guard);
  EXPECT_EQ(scalars.front(), guard);
  EXPECT_EQ(scalars.back(), guard);
  for (int j = 0; j < W; ++j)
  {
    for (int k = 0; k < 3; ++k)
    {
      EXPECT_TRUE(Same(vectors[1 + 3 * j + k], v[k][j])) << "lane " << j << " component " << k;
    }
    EXPECT_TRUE(Same(scalars[1 + j], v[2][j])) << "lane " << j;
  }
}

#if WALLLOADS_AVX512_CLONE
/// The streaming stores (non-temporal, 64-byte aligned): the same values in
/// the same places as the plain stores, nothing outside.
LANES_TEST_INLINE void CompareStreamedStores()
{
  const double guard = -7.5;
  Lanes<8> v[3];
  for (int k = 0; k < 3; ++k)
  {
    v[k] = Lanes<8>::Gather([k](int j) { return 100.0 * k + j + 0.25; });
  }
  // One line of guards on each side of 24 doubles, and of 8.
  alignas(64) double vectors[8 + 24 + 8];
  alignas(64) double scalars[8 + 8 + 8];
  std::fill(std::begin(vectors), std::end(vectors), guard);
  std::fill(std::begin(scalars), std::end(scalars), guard);
  StoreInterleaved<8, true>(vectors + 8, v);
  StoreLanes<8, true>(scalars + 8, v[2]);
  StreamFence();
  for (int i = 0; i < 8; ++i)
  {
    EXPECT_EQ(vectors[i], guard);
    EXPECT_EQ(vectors[8 + 24 + i], guard);
    EXPECT_EQ(scalars[i], guard);
    EXPECT_EQ(scalars[16 + i], guard);
  }
  for (int j = 0; j < 8; ++j)
  {
    for (int k = 0; k < 3; ++k)
    {
      EXPECT_TRUE(Same(vectors[8 + 3 * j + k], v[k][j])) << "lane " << j << " component " << k;
    }
    EXPECT_TRUE(Same(scalars[8 + j], v[2][j])) << "lane " << j;
  }
}

// The eight-lane checks, compiled for AVX-512 as the face loop's clone is.
WALLLOADS_TARGET_AVX512 void CheckEightLanes()
{
  CompareGeometry<8, 3, double>(11);
  CompareGeometry<8, 4, double>(12);
  CompareGeometry<8, 3, float>(13);
  CompareGeometry<8, 4, float>(14);
  RefuseUncommonFaces<8>();
  CompareNorms<8>();
  CompareTractions<8>();
  CompareLaneSums<8>();
  CompareStores<8>();
  CompareStreamedStores();
}
#endif
} // namespace

TEST(Lanes, TractionEqualsTheScalarTraction)
{
  CompareTractions<4>();
}

TEST(Lanes, CompensatedSumPerLane)
{
  CompareLaneSums<4>();
}

TEST(Lanes, StoresPutEveryLaneInPlace)
{
  CompareStores<4>();
}

TEST(Lanes, PrefetchAsksForEveryLineOfTheBytes)
{
  // Every byte of [p, p + n) lies on one of the lines CacheLinesOf gives,
  // and each of those lines holds one of the bytes (no line before or after
  // the range), for every start within a line and lengths around a line.
  alignas(64) static char block[64 * 12];
  for (int start = 0; start < 64; ++start)
  {
    for (std::uintptr_t n : { 0, 1, 8, 63, 64, 65, 72, 127, 128, 576, 577 })
    {
      const char* p = block + start;
      const CacheLines lines = CacheLinesOf(p, n);
      if (n == 0)
      {
        EXPECT_EQ(lines.Count, 0u);
        continue;
      }
      const std::uintptr_t first = reinterpret_cast<std::uintptr_t>(p);
      const std::uintptr_t last = first + n - 1;
      EXPECT_EQ(lines.First % 64, 0u);
      EXPECT_LE(lines.First, first) << "start " << start << ", " << n << " bytes";
      EXPECT_GT(lines.First + 64, first) << "start " << start << ", " << n << " bytes";
      EXPECT_LE(lines.First + 64 * (lines.Count - 1), last) << "start " << start << ", " << n;
      EXPECT_GT(lines.First + 64 * lines.Count, last) << "start " << start << ", " << n << " bytes";
      PrefetchBytes(p, n); // a hint: nothing to observe but that it is harmless
    }
  }
  // The gradient of a run of eight faces (72 bytes each) from a line start:
  // nine lines; from the middle of a line: ten.
  EXPECT_EQ(CacheLinesOf(block, 576).Count, 9u);
  EXPECT_EQ(CacheLinesOf(block + 32, 576).Count, 10u);
}

TEST(Lanes, EightLanesEqualTheScalarKernels)
{
#if WALLLOADS_AVX512_CLONE
  if (!UseAvx512Loops())
  {
    GTEST_SKIP() << "this processor has no AVX-512: the face loops take four lanes";
  }
  CheckEightLanes();
#else
  GTEST_SKIP() << "built without the AVX-512 clone (sanitizer build or not x86-64 GCC/Clang)";
#endif
}

#endif
