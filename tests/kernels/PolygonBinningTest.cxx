// SPDX-License-Identifier: BSD-3-Clause
// Exact split of faces among axis bins (PolygonBinning.h). Every expected
// value is derived beside its check from the face's shape: the area of a
// planar face between two planes perpendicular to the axis is the integral
// of its width across the axis, times the slope factor of its plane.
#include "wallloads/PolygonBinning.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <random>
#include <vector>

using namespace wallloads;

namespace
{
struct Part
{
  int Bin;
  double AreaVector[3];
  double Area;
  double Centroid[3];
};

struct Binned
{
  std::vector<Part> Parts;
  double Inside = 0;
  FaceFrame<double> Frame;
};

Binned Bin(const std::vector<double>& pts, const std::vector<std::int64_t>& ids,
  const AxisBins<double>& bins)
{
  Binned out;
  EXPECT_EQ(ComputeFaceFrame<double>(pts.data(), ids.data(), static_cast<int>(ids.size()), out.Frame),
    FaceStatus::Ok);
  out.Inside = BinFace<double>(pts.data(), ids.data(), static_cast<int>(ids.size()), out.Frame, bins,
    [&](int b, const double a[3], double area, const double c[3]) {
      out.Parts.push_back(Part{ b, { a[0], a[1], a[2] }, area, { c[0], c[1], c[2] } });
    });
  return out;
}

AxisBins<double> Bins(const double origin[3], const double dir[3], double start, double end, int n)
{
  AxisBins<double> bins;
  EXPECT_TRUE(MakeAxisBins(origin, dir, start, end, n, bins));
  return bins;
}

const double Zero[3] = { 0, 0, 0 };
const double Z[3] = { 0, 0, 1 };
const double X[3] = { 1, 0, 0 };
}

// Triangle A(0,0,0), B(0,2,0), C(1,1,1), axis z, 4 bins over [0, 1].
// It lies in the plane x = z; its cut at height z runs from y = z (edge AC)
// to y = 2 - z (edge BC): width 2(1 - z). A step dz along the face is
// sqrt(1 + (dx/dz)^2) dz = sqrt(2) dz, so the area between z0 and z1 is
// sqrt(2) [(1 - z0)^2 - (1 - z1)^2]: fractions 7/16, 5/16, 3/16, 1/16 of
// the total sqrt(2). The part's centroid: y = 1 (symmetry), x = z =
// int z (1 - z) dz / int (1 - z) dz over [z0, z1]. Area vector direction:
// (B - A) x (C - A) = (2, 0, -2), i.e. (1, 0, -1)/sqrt(2).
TEST(PolygonBinning, SlantedTriangleExactFractions)
{
  const std::vector<double> p = { 0, 0, 0, 0, 2, 0, 1, 1, 1 };
  const auto bins = Bins(Zero, Z, 0.0, 1.0, 4);
  const Binned r = Bin(p, { 0, 1, 2 }, bins);
  ASSERT_EQ(r.Parts.size(), 4u);
  const double s2 = std::sqrt(2.0);
  for (int b = 0; b < 4; ++b)
  {
    const double z0 = 0.25 * b, z1 = 0.25 * (b + 1);
    const double area = s2 * ((1 - z0) * (1 - z0) - (1 - z1) * (1 - z1));
    const auto F = [](double z) { return z * z / 2 - z * z * z / 3; };
    const auto G = [](double z) { return z - z * z / 2; };
    const double zbar = (F(z1) - F(z0)) / (G(z1) - G(z0));
    const Part& part = r.Parts[static_cast<std::size_t>(b)];
    EXPECT_EQ(part.Bin, b);
    EXPECT_NEAR(part.Area, area, 1e-15);
    EXPECT_NEAR(part.Area / s2, (7.0 - 2 * b) / 16, 1e-15); // the fractions above
    EXPECT_NEAR(part.AreaVector[0], area / s2, 1e-15);
    EXPECT_NEAR(part.AreaVector[1], 0.0, 1e-15);
    EXPECT_NEAR(part.AreaVector[2], -area / s2, 1e-15);
    EXPECT_NEAR(part.Centroid[0], zbar, 1e-15);
    EXPECT_NEAR(part.Centroid[1], 1.0, 1e-15);
    EXPECT_NEAR(part.Centroid[2], zbar, 1e-15);
  }
  EXPECT_NEAR(r.Inside, s2, 1e-15);
}

// A planar trapezoid crossing five bins of a slanted axis, in a rotated
// frame. With e (the axis), f, g orthonormal, the corner (u, v) is placed at
// O + u (e + t g) + v f: the axis coordinate of a point is s = s_O + u, the
// plane is slanted against the axis by the slope t (a step du along the face
// is sqrt(1 + t^2) du), and the corners (0,0), (3,0), (3,4), (0,1) make the
// width across the axis w(u) = 1 + u. Area in [u0, u1]:
// sqrt(1 + t^2) [u + u^2/2] from u0 to u1 (total 7.5 sqrt(1 + t^2)).
// Centroid: u_bar = int u w / int w, v_bar = int w^2/2 / int w.
TEST(PolygonBinning, SlantedQuadRotatedFrame)
{
  const double e[3] = { 1.0 / 3, 2.0 / 3, 2.0 / 3 };
  const double f[3] = { 2.0 / 3, 1.0 / 3, -2.0 / 3 };
  double g[3];
  Cross(e, f, g);
  const double t = 0.75;
  const double O[3] = { 0.3, -0.7, 1.1 };
  const double origin[3] = { -1.0, 0.5, 2.0 };
  const double sO = (O[0] - origin[0]) * e[0] + (O[1] - origin[1]) * e[1] + (O[2] - origin[2]) * e[2];
  const double uv[4][2] = { { 0, 0 }, { 3, 0 }, { 3, 4 }, { 0, 1 } };
  std::vector<double> p;
  for (const auto& c : uv)
  {
    for (int i = 0; i < 3; ++i)
    {
      p.push_back(O[i] + c[0] * (e[i] + t * g[i]) + c[1] * f[i]);
    }
  }
  // The axis direction is given unnormalised: MakeAxisBins normalises it.
  const double dir[3] = { 3 * e[0], 3 * e[1], 3 * e[2] };
  const auto bins = Bins(origin, dir, sO, sO + 3.0, 5);
  const Binned r = Bin(p, { 0, 1, 2, 3 }, bins);
  ASSERT_EQ(r.Parts.size(), 5u);
  const double slope = std::sqrt(1 + t * t);
  const auto W = [](double u) { return u + u * u / 2; };           // int w
  const auto UW = [](double u) { return u * u / 2 + u * u * u / 3; }; // int u w
  const auto WW = [](double u) { return (1 + u) * (1 + u) * (1 + u) / 6; }; // int w^2/2
  double sum = 0;
  for (int b = 0; b < 5; ++b)
  {
    const double u0 = 0.6 * b, u1 = 0.6 * (b + 1);
    const double iw = W(u1) - W(u0);
    const double area = slope * iw;
    const double ubar = (UW(u1) - UW(u0)) / iw;
    const double vbar = (WW(u1) - WW(u0)) / iw;
    const Part& part = r.Parts[static_cast<std::size_t>(b)];
    EXPECT_EQ(part.Bin, b);
    EXPECT_NEAR(part.Area, area, 1e-14);
    for (int i = 0; i < 3; ++i)
    {
      EXPECT_NEAR(part.Centroid[i], O[i] + ubar * (e[i] + t * g[i]) + vbar * f[i], 1e-14);
      EXPECT_NEAR(part.AreaVector[i], area * r.Frame.Normal[i], 1e-14);
    }
    sum += part.Area;
  }
  EXPECT_NEAR(sum, 7.5 * slope, 1e-14);
  EXPECT_NEAR(r.Inside, r.Frame.Area, 1e-14);
}

// A non-convex L-shaped hexagon in the plane z = 0, axis x over [0, 3] in
// three bins: the column x in [0,1] is 3 high, the others 1 high.
TEST(PolygonBinning, NonConvexPolygon)
{
  const std::vector<double> p = { 0, 0, 0, 3, 0, 0, 3, 1, 0, 1, 1, 0, 1, 3, 0, 0, 3, 0 };
  const Binned r = Bin(p, { 0, 1, 2, 3, 4, 5 }, Bins(Zero, X, 0.0, 3.0, 3));
  ASSERT_EQ(r.Parts.size(), 3u);
  const double areas[3] = { 3, 1, 1 };
  const double cy[3] = { 1.5, 0.5, 0.5 };
  for (int b = 0; b < 3; ++b)
  {
    EXPECT_NEAR(r.Parts[b].Area, areas[b], 1e-15);
    EXPECT_NEAR(r.Parts[b].AreaVector[2], areas[b], 1e-15);
    EXPECT_NEAR(r.Parts[b].Centroid[0], b + 0.5, 1e-15);
    EXPECT_NEAR(r.Parts[b].Centroid[1], cy[b], 1e-15);
  }
}

// Bins entirely inside a face: a 10 x 2 rectangle along x holds ten bins of
// width 1 (area 2 each); a range over the middle half bins half of it.
TEST(PolygonBinning, BinsInsideAFace)
{
  const std::vector<double> p = { 0, 0, 0, 10, 0, 0, 10, 2, 0, 0, 2, 0 };
  const Binned all = Bin(p, { 0, 1, 2, 3 }, Bins(Zero, X, 0.0, 10.0, 10));
  ASSERT_EQ(all.Parts.size(), 10u);
  for (int b = 0; b < 10; ++b)
  {
    EXPECT_NEAR(all.Parts[b].Area, 2.0, 1e-14);
    EXPECT_NEAR(all.Parts[b].Centroid[0], b + 0.5, 1e-14);
    EXPECT_NEAR(all.Parts[b].Centroid[1], 1.0, 1e-14);
  }
  EXPECT_NEAR(all.Inside, 20.0, 1e-13);
  const Binned mid = Bin(p, { 0, 1, 2, 3 }, Bins(Zero, X, 2.5, 7.5, 5));
  ASSERT_EQ(mid.Parts.size(), 5u);
  for (int b = 0; b < 5; ++b)
  {
    EXPECT_NEAR(mid.Parts[b].Area, 2.0, 1e-14);
    EXPECT_NEAR(mid.Parts[b].Centroid[0], 3.0 + b, 1e-14);
  }
  EXPECT_NEAR(mid.Inside, 10.0, 1e-13);
  const std::int64_t ids[4] = { 0, 1, 2, 3 };
  EXPECT_TRUE(CrossesRangeEnds(p.data(), ids, 4, Bins(Zero, X, 2.5, 7.5, 5)));
  EXPECT_FALSE(CrossesRangeEnds(p.data(), ids, 4, Bins(Zero, X, 0.0, 10.0, 5)));
  // Entirely outside the range: nothing.
  const Binned out = Bin(p, { 0, 1, 2, 3 }, Bins(Zero, X, 11.0, 12.0, 3));
  EXPECT_TRUE(out.Parts.empty());
  EXPECT_EQ(out.Inside, 0.0);
}

// A face in a bin plane (perpendicular to the axis) belongs to the bin above
// the plane, the last bin at End; a face touching the range from outside
// belongs to none.
TEST(PolygonBinning, FacesOnBinPlanes)
{
  const auto bins = Bins(Zero, Z, 0.0, 1.0, 4);
  auto square = [](double z) {
    return std::vector<double>{ 0, 0, z, 1, 0, z, 1, 1, z, 0, 1, z };
  };
  const double planes[5] = { 0.0, 0.25, 0.5, 0.75, 1.0 };
  const int expected[5] = { 0, 1, 2, 3, 3 };
  for (int k = 0; k < 5; ++k)
  {
    const Binned r = Bin(square(planes[k]), { 0, 1, 2, 3 }, bins);
    ASSERT_EQ(r.Parts.size(), 1u) << "plane " << planes[k];
    EXPECT_EQ(r.Parts[0].Bin, expected[k]);
    EXPECT_EQ(r.Parts[0].Area, 1.0);
    EXPECT_EQ(r.Inside, 1.0);
  }
  EXPECT_TRUE(Bin(square(1.0 + 1e-12), { 0, 1, 2, 3 }, bins).Parts.empty());
  EXPECT_TRUE(Bin(square(-1e-12), { 0, 1, 2, 3 }, bins).Parts.empty());
  // A vertical face with an edge on a bin plane: nothing in the bin above.
  const std::vector<double> wall = { 0, 0, 0.25, 1, 0, 0.25, 1, 0, 0.5, 0, 0, 0.5 };
  const Binned w = Bin(wall, { 0, 1, 2, 3 }, bins);
  ASSERT_EQ(w.Parts.size(), 1u);
  EXPECT_EQ(w.Parts[0].Bin, 1);
  EXPECT_NEAR(w.Parts[0].Area, 0.25, 1e-16);
  // A face touching the start of the range from below: nothing.
  const std::vector<double> below = { 0, 0, -0.5, 1, 0, -0.5, 1, 0, 0, 0, 0, 0 };
  EXPECT_TRUE(Bin(below, { 0, 1, 2, 3 }, bins).Parts.empty());
}

// Degenerate input: fewer than three corners bins nothing; a repeated corner
// (a quad that is a triangle) gives the triangle's answer; the zero-area fan
// triangle of it adds nothing.
TEST(PolygonBinning, DegenerateFaces)
{
  const auto bins = Bins(Zero, Z, 0.0, 1.0, 4);
  const std::vector<double> p = { 0, 0, 0, 0, 2, 0, 1, 1, 1 };
  FaceFrame<double> frame;
  ASSERT_EQ(ComputeFaceFrame<double>(p.data(), std::vector<std::int64_t>{ 0, 1, 2 }.data(), 3, frame),
    FaceStatus::Ok);
  int calls = 0;
  const std::int64_t two[2] = { 0, 1 };
  EXPECT_EQ(BinFace<double>(p.data(), two, 2, frame, bins, [&](int, const double*, double,
                                                               const double*) { ++calls; }),
    0.0);
  EXPECT_EQ(calls, 0);
  const Binned tri = Bin(p, { 0, 1, 2 }, bins);
  const Binned quad = Bin(p, { 0, 1, 2, 2 }, bins);
  const Binned quad2 = Bin(p, { 0, 0, 1, 2 }, bins);
  ASSERT_EQ(quad.Parts.size(), tri.Parts.size());
  ASSERT_EQ(quad2.Parts.size(), tri.Parts.size());
  for (std::size_t k = 0; k < tri.Parts.size(); ++k)
  {
    EXPECT_NEAR(quad.Parts[k].Area, tri.Parts[k].Area, 1e-15);
    EXPECT_NEAR(quad2.Parts[k].Area, tri.Parts[k].Area, 1e-15);
    EXPECT_NEAR(quad.Parts[k].Centroid[2], tri.Parts[k].Centroid[2], 1e-15);
  }
}

// Bins that cannot be made are refused.
TEST(PolygonBinning, InvalidBins)
{
  AxisBins<double> bins;
  const double nan = std::nan("");
  const double zeroDir[3] = { 0, 0, 0 };
  const double nanDir[3] = { nan, 0, 1 };
  EXPECT_FALSE(MakeAxisBins(Zero, zeroDir, 0.0, 1.0, 4, bins));
  EXPECT_FALSE(MakeAxisBins(Zero, nanDir, 0.0, 1.0, 4, bins));
  EXPECT_FALSE(MakeAxisBins(Zero, Z, 0.0, 1.0, 0, bins));
  EXPECT_FALSE(MakeAxisBins(Zero, Z, 1.0, 1.0, 4, bins));
  EXPECT_FALSE(MakeAxisBins(Zero, Z, 1.0, 0.0, 4, bins));
  EXPECT_FALSE(MakeAxisBins(Zero, Z, nan, 1.0, 4, bins));
  EXPECT_FALSE(MakeAxisBins(Zero, Z, 0.0, double(INFINITY), 4, bins));
}

// BinOf agrees with Edge: Edge(b) <= s < Edge(b + 1) for every s in range.
TEST(PolygonBinning, BinOfAgreesWithEdges)
{
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> u(-3, 3);
  for (int trial = 0; trial < 200; ++trial)
  {
    double a = u(rng), b = u(rng);
    if (a == b)
    {
      continue;
    }
    const int n = 1 + static_cast<int>(rng() % 97);
    const auto bins = Bins(Zero, Z, std::fmin(a, b), std::fmax(a, b), n);
    for (int k = 0; k <= n; ++k)
    {
      const double s = bins.Edge(k);
      const int bin = bins.BinOf(s);
      EXPECT_EQ(bin, k < n ? k : n - 1);
      const double below = std::nextafter(s, -INFINITY);
      if (k > 0 && below >= bins.Start)
      {
        EXPECT_EQ(bins.BinOf(below), k - 1);
      }
    }
  }
}

// Conservation on random warped, non-convex polygons and random axes: the
// parts' areas add up to the face's area and their first moments to the
// face's (FaceGeometry.h's centroid times area), to round-off. This is what
// makes the bins of Load Distribution add up to Load Integration's totals.
TEST(PolygonBinning, ConservesAreaAndMomentOnRandomFaces)
{
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> u(-1, 1);
  for (int trial = 0; trial < 500; ++trial)
  {
    const int n = 3 + static_cast<int>(rng() % 6);
    std::vector<double> p;
    std::vector<std::int64_t> ids;
    for (int k = 0; k < n; ++k)
    {
      // A star-shaped polygon around a centre, warped out of its plane.
      const double angle = 2 * M_PI * (k + 0.4 * u(rng)) / n;
      const double radius = 0.5 + 0.45 * u(rng);
      p.push_back(3 + radius * std::cos(angle));
      p.push_back(-2 + radius * std::sin(angle));
      p.push_back(1 + 0.2 * u(rng));
      ids.push_back(n - 1 - k);
    }
    const double dir[3] = { u(rng), u(rng), u(rng) };
    const double origin[3] = { u(rng), u(rng), u(rng) };
    AxisBins<double> probe;
    ASSERT_TRUE(MakeAxisBins(origin, dir, -1.0, 1.0, 1, probe));
    double smin = INFINITY, smax = -INFINITY;
    for (int k = 0; k < n; ++k)
    {
      const double s = probe.Coordinate(&p[3 * k]);
      smin = std::fmin(smin, s);
      smax = std::fmax(smax, s);
    }
    const auto bins = Bins(origin, dir, smin, smax, 1 + static_cast<int>(rng() % 20));
    FaceFrame<double> frame;
    if (ComputeFaceFrame<double>(p.data(), ids.data(), n, frame) != FaceStatus::Ok)
    {
      continue;
    }
    double area = 0, moment[3] = { 0, 0, 0 }, vec[3] = { 0, 0, 0 };
    int previous = -1;
    const double inside = BinFace<double>(p.data(), ids.data(), n, frame, bins,
      [&](int b, const double a[3], double w, const double c[3]) {
        EXPECT_GT(b, previous);
        previous = b;
        area += w;
        for (int i = 0; i < 3; ++i)
        {
          moment[i] += w * c[i];
          vec[i] += a[i];
        }
      });
    EXPECT_NEAR(inside, frame.Area, 1e-14);
    EXPECT_NEAR(area, frame.Area, 1e-14);
    for (int i = 0; i < 3; ++i)
    {
      EXPECT_NEAR(moment[i], frame.Area * frame.Centroid[i], 1e-13);
      EXPECT_NEAR(vec[i], frame.AreaVector[i], 1e-14);
    }
  }
}

// Float coordinates (the common storage) give the same split.
TEST(PolygonBinning, FloatPoints)
{
  const std::vector<float> p = { 0, 0, 0, 0, 2, 0, 1, 1, 1 };
  const std::int64_t ids[3] = { 0, 1, 2 };
  FaceFrame<double> frame;
  ASSERT_EQ(ComputeFaceFrame<double>(p.data(), ids, 3, frame), FaceStatus::Ok);
  const auto bins = Bins(Zero, Z, 0.0, 1.0, 4);
  std::vector<double> areas;
  BinFace<double>(p.data(), ids, 3, frame, bins,
    [&](int, const double*, double w, const double*) { areas.push_back(w); });
  ASSERT_EQ(areas.size(), 4u);
  for (int b = 0; b < 4; ++b)
  {
    EXPECT_NEAR(areas[b], std::sqrt(2.0) * (7.0 - 2 * b) / 16, 1e-15);
  }
}
