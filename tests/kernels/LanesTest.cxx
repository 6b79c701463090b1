// SPDX-License-Identifier: BSD-3-Clause
// The four-face kernels (Lanes.h) against the scalar ones they are built
// from: every lane must hold exactly the scalar result of its face. Exact
// equality is the specification here, not a tolerance: both are the same
// IEEE operations in the same order, compared within one binary.
#include "wallloads/CompensatedSum.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/Lanes.h"
#include "wallloads/Traction.h"

#include <gtest/gtest.h>

#include <cstdint>
#include <cstring>
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

template <int N, typename P>
void CompareGeometry(std::uint64_t seed)
{
  std::mt19937_64 rng(seed);
  std::vector<P> points;
  std::vector<std::int64_t> ids;
  RandomFaces<P>(N, 400, rng, points, ids);
  for (int f = 0; f + 4 <= 400; f += 4)
  {
    const std::int64_t* faceIds[4] = { &ids[N * f], &ids[N * (f + 1)], &ids[N * (f + 2)],
      &ids[N * (f + 3)] };
    FourFaces<N, P, std::int64_t> faces(points.data(), faceIds);
    Lanes4 normal[3];
    Lanes4 area;
    Lanes4 a[3];
    ASSERT_TRUE(FaceNormalLanes(faces, normal, area, a));
    Lanes4 centroid[3];
    FaceCentroidLanes(faces, normal, centroid);
    for (int j = 0; j < 4; ++j)
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
} // namespace

TEST(Lanes, TrianglesAndQuadsEqualTheScalarFrame)
{
  CompareGeometry<3, double>(1);
  CompareGeometry<4, double>(2);
  CompareGeometry<3, float>(3);
  CompareGeometry<4, float>(4);
}

// One face outside the common case sends all four back to the scalar path.
TEST(Lanes, ADegenerateOrNonFiniteFaceIsRefused)
{
  std::mt19937_64 rng(5);
  std::vector<double> points;
  std::vector<std::int64_t> ids;
  RandomFaces<double>(4, 4, rng, points, ids);
  const std::int64_t* faceIds[4] = { &ids[0], &ids[4], &ids[8], &ids[12] };
  Lanes4 normal[3];
  Lanes4 area;
  Lanes4 a[3];
  {
    FourFaces<4, double, std::int64_t> faces(points.data(), faceIds);
    EXPECT_TRUE(FaceNormalLanes(faces, normal, area, a));
  }
  std::vector<double> collapsed = points;
  for (int k = 1; k < 4; ++k) // face 2 collapses onto its first corner
  {
    for (int d = 0; d < 3; ++d)
    {
      collapsed[3 * ids[8 + k] + d] = collapsed[3 * ids[8] + d];
    }
  }
  {
    FourFaces<4, double, std::int64_t> faces(collapsed.data(), faceIds);
    EXPECT_FALSE(FaceNormalLanes(faces, normal, area, a));
  }
  std::vector<double> nan = points;
  nan[3 * ids[12]] = std::numeric_limits<double>::quiet_NaN(); // face 3, corner 0
  {
    FourFaces<4, double, std::int64_t> faces(nan.data(), faceIds);
    EXPECT_FALSE(FaceNormalLanes(faces, normal, area, a));
  }
}

TEST(Lanes, NormEqualsTheScalarNormInEveryRange)
{
  const double cases[4][3] = { { 3, 4, 12 }, { 1e200, 1e200, 0 }, { 1e-200, 0, 0 },
    { 0, 0, 0 } };
  Lanes4 v[3];
  for (int k = 0; k < 3; ++k)
  {
    v[k] = Lanes4::Of(cases[0][k], cases[1][k], cases[2][k], cases[3][k]);
  }
  const Lanes4 n = Norm(v);
  for (int j = 0; j < 4; ++j)
  {
    EXPECT_TRUE(Same(n[j], Norm(cases[j]))) << j;
  }
  EXPECT_EQ(n[0], 13.0);
}

TEST(Lanes, TractionEqualsTheScalarTraction)
{
  std::mt19937_64 rng(6);
  std::normal_distribution<double> g;
  for (int repeat = 0; repeat < 200; ++repeat)
  {
    double grad[4][9];
    double nrm[4][3];
    double p[4];
    Lanes4 G[9];
    Lanes4 n[3];
    for (int j = 0; j < 4; ++j)
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
      G[k] = Lanes4::Of(grad[0][k], grad[1][k], grad[2][k], grad[3][k]);
    }
    for (int k = 0; k < 3; ++k)
    {
      n[k] = Lanes4::Of(nrm[0][k], nrm[1][k], nrm[2][k], nrm[3][k]);
    }
    FaceTractionInput<Lanes4> in;
    in.Normal = n;
    in.GaugePressure = Lanes4::Of(p[0], p[1], p[2], p[3]) - 101325.0;
    in.VelocityGradient = G;
    in.EffectiveViscosity = Lanes4(1.8e-5);
    in.IncludeNormalViscousStress = repeat % 2 == 0;
    FaceTraction<Lanes4> out;
    FaceTractionValues(in, out);
    for (int j = 0; j < 4; ++j)
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

// Compensated sums with one face per lane are four scalar compensated sums.
TEST(Lanes, CompensatedSumPerLane)
{
  std::mt19937_64 rng(7);
  std::normal_distribution<double> g;
  CompensatedSum<Lanes4> lanes;
  CompensatedSum<double> scalar[4];
  for (int i = 0; i < 10000; ++i)
  {
    double x[4];
    for (double& v : x)
    {
      v = 1e5 * g(rng);
    }
    lanes.Add(Lanes4::Of(x[0], x[1], x[2], x[3]));
    for (int j = 0; j < 4; ++j)
    {
      scalar[j].Add(x[j]);
    }
  }
  for (int j = 0; j < 4; ++j)
  {
    EXPECT_TRUE(Same(lanes.Sum[j], scalar[j].Sum));
    EXPECT_TRUE(Same(lanes.Carry[j], scalar[j].Carry));
  }
}

#endif
