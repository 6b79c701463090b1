// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/FaceGeometry.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <vector>

using namespace wallloads;

namespace
{
FaceFrame<double> Frame(const std::vector<double>& pts, const std::vector<std::int64_t>& ids)
{
  FaceFrame<double> f;
  EXPECT_EQ(ComputeFaceFrame<double>(pts.data(), ids.data(), static_cast<int>(ids.size()), f),
    FaceStatus::Ok);
  return f;
}
}

TEST(FaceGeometry, UnitSquare)
{
  const std::vector<double> p = { 0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0 };
  const auto f = Frame(p, { 0, 1, 2, 3 });
  EXPECT_DOUBLE_EQ(f.Area, 1.0);
  EXPECT_DOUBLE_EQ(f.Normal[2], 1.0);
  EXPECT_DOUBLE_EQ(f.Centroid[0], 0.5);
  EXPECT_DOUBLE_EQ(f.Centroid[1], 0.5);
}

// A non-convex L-shaped hexagon: area 3, centroid by decomposition into a
// 2x1 and a 1x1 rectangle: ((1*2*0.5... ) exact values below.
TEST(FaceGeometry, NonConvexPolygonCentroid)
{
  // L shape: (0,0) (2,0) (2,1) (1,1) (1,2) (0,2)
  const std::vector<double> p = { 0, 0, 0, 2, 0, 0, 2, 1, 0, 1, 1, 0, 1, 2, 0, 0, 2, 0 };
  const auto f = Frame(p, { 0, 1, 2, 3, 4, 5 });
  EXPECT_NEAR(f.Area, 3.0, 1e-15);
  // rectangles [0,2]x[0,1] (area 2, centroid (1,0.5)) and [0,1]x[1,2] (area 1, centroid (0.5,1.5))
  EXPECT_NEAR(f.Centroid[0], (2 * 1.0 + 1 * 0.5) / 3, 1e-15);
  EXPECT_NEAR(f.Centroid[1], (2 * 0.5 + 1 * 1.5) / 3, 1e-15);
}

// A planar quad far from the origin keeps its digits (coordinates are taken
// relative to the first vertex).
TEST(FaceGeometry, FarFromOrigin)
{
  const double o = 1e7;
  const std::vector<double> p = { o, o, o, o + 1e-3, o, o, o + 1e-3, o + 2e-3, o, o, o + 2e-3, o };
  const auto f = Frame(p, { 0, 1, 2, 3 });
  // The exact area of the rectangle the doubles represent (1e-3 is not
  // representable next to 1e7): differences of doubles are exact here.
  const double exact = (p[3] - p[0]) * (p[7] - p[4]);
  EXPECT_NEAR(f.Area, exact, exact * 1e-12);
}

TEST(FaceGeometry, Degenerate)
{
  const std::vector<double> p = { 0, 0, 0, 1, 0, 0, 2, 0, 0 };
  std::vector<std::int64_t> ids = { 0, 1, 2 };
  FaceFrame<double> f;
  EXPECT_EQ(ComputeFaceFrame<double>(p.data(), ids.data(), 3, f), FaceStatus::ZeroArea);
  EXPECT_EQ(ComputeFaceFrame<double>(p.data(), ids.data(), 2, f), FaceStatus::TooFewPoints);
  std::vector<double> q = p;
  q[4] = std::nan("");
  EXPECT_EQ(ComputeFaceFrame<double>(q.data(), ids.data(), 3, f), FaceStatus::NonFinite);
}

// Closure: the area vectors of any closed surface sum to zero (divergence
// theorem applied to a constant field). A randomly jittered octahedron-like
// closed polyhedron with warped quads: Newell vectors still close exactly
// because each face's Newell vector depends only on its boundary loop.
TEST(FaceGeometry, ClosedSurfaceAreaVectorsSumToZero)
{
  // Cube with jittered corners: its quads are warped.
  std::vector<double> p = { 0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1 };
  const double jitter[24] = { .1, -.05, .02, .03, .07, -.04, -.02, .05, .09, .01, -.08, .03, .06,
    .02, -.07, -.03, .04, .05, .08, -.06, .01, -.09, .02, .04 };
  for (int i = 0; i < 24; ++i)
  {
    p[i] += jitter[i];
  }
  const std::vector<std::vector<std::int64_t>> faces = { { 0, 3, 2, 1 }, { 4, 5, 6, 7 },
    { 0, 1, 5, 4 }, { 1, 2, 6, 5 }, { 2, 3, 7, 6 }, { 3, 0, 4, 7 } };
  double sum[3] = { 0, 0, 0 };
  double total = 0;
  for (const auto& face : faces)
  {
    const auto f = Frame(p, face);
    for (int k = 0; k < 3; ++k)
    {
      sum[k] += f.AreaVector[k];
    }
    total += f.Area;
  }
  for (int k = 0; k < 3; ++k)
  {
    EXPECT_LE(std::abs(sum[k]), 1e-12 * total);
  }
}

TEST(FaceGeometry, FloatPointsAndInt32Ids)
{
  const std::vector<float> p = { 0, 0, 0, 2, 0, 0, 0, 3, 0 };
  const std::vector<std::int32_t> ids = { 0, 1, 2 };
  FaceFrame<double> f;
  ASSERT_EQ(ComputeFaceFrame<double>(p.data(), ids.data(), 3, f), FaceStatus::Ok);
  EXPECT_DOUBLE_EQ(f.Area, 3.0);
  EXPECT_DOUBLE_EQ(f.Centroid[0], 2.0 / 3);
  EXPECT_DOUBLE_EQ(f.Centroid[1], 1.0);
}

// A square of side 1e77 far from the origin: the area vector's squared
// length (1e308) is at the edge of double, its area s^2 = 1e154 is not.
TEST(FaceGeometry, CoordinatesNear1e77)
{
  const double s = 1e77, x0 = 3e77, y0 = -2e77, z0 = 1e77;
  const std::vector<double> p = { x0, y0, z0, x0 + s, y0, z0, x0 + s, y0 + s, z0, x0, y0 + s, z0 };
  const auto f = Frame(p, { 0, 1, 2, 3 });
  EXPECT_NEAR(f.Area, s * s, 1e-14 * s * s);
  EXPECT_DOUBLE_EQ(f.Normal[2], 1.0);
  EXPECT_NEAR(f.Centroid[0], x0 + 0.5 * s, 1e-15 * x0);
  EXPECT_NEAR(f.Centroid[1], y0 + 0.5 * s, 1e-15 * x0);
}
