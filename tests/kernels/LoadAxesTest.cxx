// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/LoadAxes.h"
#include "wallloads/LoadTotals.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace wallloads;

TEST(LoadAxes, DefaultsAreRightHanded)
{
  const double d[3] = { 1, 0, 0 }, l[3] = { 0, 0, 1 };
  LoadAxes<double> a;
  ASSERT_TRUE(MakeLoadAxes(d, l, a));
  // side = lift x drag = z x x = y
  EXPECT_DOUBLE_EQ(a.Side[0], 0);
  EXPECT_DOUBLE_EQ(a.Side[1], 1);
  EXPECT_DOUBLE_EQ(a.Side[2], 0);
}

TEST(LoadAxes, LiftIsMadeOrthogonal)
{
  const double d[3] = { 2, 0, 0 }, l[3] = { 1, 0, 1 };
  LoadAxes<double> a;
  ASSERT_TRUE(MakeLoadAxes(d, l, a));
  EXPECT_NEAR(a.Lift[0], 0, 1e-16);
  EXPECT_NEAR(a.Lift[2], 1, 1e-16);
  const double p[3] = { 1, 0, 0 };
  EXPECT_FALSE(MakeLoadAxes(d, p, a)); // parallel
  const double z[3] = { 0, 0, 0 };
  EXPECT_FALSE(MakeLoadAxes(z, l, a));
}

// alpha = 90 deg turns the stream onto +z and lift onto -x.
TEST(LoadAxes, FlowAngles)
{
  double d[3], l[3];
  DirectionsFromFlowAngles(M_PI / 2, 0.0, d, l);
  EXPECT_NEAR(d[2], 1, 1e-15);
  EXPECT_NEAR(l[0], -1, 1e-15);
  DirectionsFromFlowAngles(0.1, 0.2, d, l);
  EXPECT_NEAR(Dot(d, l), 0, 1e-16);
  EXPECT_NEAR(Norm(d), 1, 1e-15);
  EXPECT_NEAR(d[1], std::sin(0.2), 1e-16);
}

// A force F = (0, 0, 2) acting through the point (3, 0, 0) has moment
// r x F = (0, -6, 0) about the origin; the line of action recovered is the
// point of the vertical line x = 3 nearest the origin, and no couple remains.
TEST(LoadAxes, LineOfActionOfSingleForce)
{
  const double F[3] = { 0, 0, 2 };
  const double M[3] = { 0, -6, 0 };
  const double r0[3] = { 0, 0, 0 };
  double p[3], c;
  LineOfAction(F, M, r0, p, c);
  EXPECT_NEAR(p[0], 3, 1e-15);
  EXPECT_NEAR(p[1], 0, 1e-15);
  EXPECT_NEAR(p[2], 0, 1e-15);
  EXPECT_NEAR(c, 0, 1e-15);
  // Add a couple along F: it shows up as the residual couple.
  const double M2[3] = { 0, -6, 5 };
  LineOfAction(F, M2, r0, p, c);
  EXPECT_NEAR(c, 5, 1e-15);
  const double zero[3] = { 0, 0, 0 };
  LineOfAction(zero, M2, r0, p, c);
  EXPECT_TRUE(std::isnan(p[0]) && std::isnan(c));
}

// Coefficients: C = F/(q A), C_M = M/(q A L) with span for roll and yaw.
TEST(LoadTotals, FinishRegionCoefficients)
{
  LoadSums<double> s;
  const double r0[3] = { 0, 0, 0 };
  const double c[3] = { 0, 1, 0 };
  const double fp[3] = { 4, 0, 2 };
  const double fv[3] = { 1, 0, 0 };
  s.AddFace(0.5, c, r0, fp, fv);
  double slots[NumLoadSlots];
  for (std::size_t k = 0; k < NumLoadSlots; ++k)
  {
    slots[k] = s.Sums.Value(k);
  }
  LoadAxes<double> axes;
  const double d[3] = { 1, 0, 0 }, l[3] = { 0, 0, 1 };
  MakeLoadAxes(d, l, axes);
  ReferenceValues<double> ref;
  ref.Density = 2;
  ref.Speed = 3; // q = 9
  ref.Area = 0.5;
  ref.Length = 2;
  ref.Span = 4;
  RegionLoads<double> out;
  FinishRegion(slots, r0, axes, ref, out);
  EXPECT_DOUBLE_EQ(out.Drag, 5);
  EXPECT_DOUBLE_EQ(out.Lift, 2);
  EXPECT_DOUBLE_EQ(out.DragCoefficient, 5 / 4.5);
  // M = c x F = (0,1,0) x (5,0,2) = (2, 0, -5)
  EXPECT_DOUBLE_EQ(out.RollingMoment, 2);
  EXPECT_DOUBLE_EQ(out.YawingMoment, -5);
  EXPECT_DOUBLE_EQ(out.RollingMomentCoefficient, 2 / (4.5 * 4));
  EXPECT_DOUBLE_EQ(out.YawingMomentCoefficient, -5 / (4.5 * 4));
  EXPECT_DOUBLE_EQ(out.FaceCount, 1);
}

// A moment coefficient without a positive reference length or span is
// undefined: NaN (M / (q A L) with L = 0 would be infinite).
TEST(LoadTotals, MomentCoefficientsWithoutLengthAreNaN)
{
  LoadSums<double> s;
  const double r0[3] = { 0, 0, 0 };
  const double c[3] = { 0, 1, 0 };
  const double fp[3] = { 4, 0, 2 };
  const double fv[3] = { 0, 0, 0 };
  s.AddFace(0.5, c, r0, fp, fv);
  double slots[NumLoadSlots];
  for (std::size_t k = 0; k < NumLoadSlots; ++k)
  {
    slots[k] = s.Sums.Value(k);
  }
  LoadAxes<double> axes;
  const double d[3] = { 1, 0, 0 }, l[3] = { 0, 0, 1 };
  ASSERT_TRUE(MakeLoadAxes(d, l, axes));
  ReferenceValues<double> ref;
  ref.Speed = 3;
  ref.Length = 0;
  ref.Span = 0;
  RegionLoads<double> out;
  FinishRegion(slots, r0, axes, ref, out);
  EXPECT_DOUBLE_EQ(out.DragCoefficient, 4 / 4.5); // C_D = F_D / (q A), q = 4.5, A = 1
  EXPECT_TRUE(std::isnan(out.PitchingMomentCoefficient));
  EXPECT_TRUE(std::isnan(out.RollingMomentCoefficient));
  EXPECT_TRUE(std::isnan(out.YawingMomentCoefficient));
}

// Directions of any finite size are directions: the norm neither overflows
// for (1e200, 1e200, 0) nor underflows for (1e-200, 0, 0).
TEST(LoadAxes, HugeAndTinyDirections)
{
  LoadAxes<double> axes;
  const double d1[3] = { 1e200, 1e200, 0 }, l1[3] = { 0, 0, 1e300 };
  ASSERT_TRUE(MakeLoadAxes(d1, l1, axes));
  EXPECT_NEAR(axes.Drag[0], std::sqrt(0.5), 4e-16); // a few ulp: one sqrt, one division
  EXPECT_NEAR(axes.Drag[1], std::sqrt(0.5), 4e-16); // a few ulp: one sqrt, one division
  EXPECT_DOUBLE_EQ(axes.Lift[2], 1);
  const double d2[3] = { 1e-200, 0, 0 }, l2[3] = { 0, 1e-300, 1e-300 };
  ASSERT_TRUE(MakeLoadAxes(d2, l2, axes));
  EXPECT_DOUBLE_EQ(axes.Drag[0], 1);
  EXPECT_NEAR(axes.Lift[1], std::sqrt(0.5), 4e-16); // a few ulp: one sqrt, one division
  EXPECT_NEAR(axes.Lift[2], std::sqrt(0.5), 4e-16); // a few ulp: one sqrt, one division
  const double zero[3] = { 0, 0, 0 };
  EXPECT_FALSE(MakeLoadAxes(zero, l1, axes));
  EXPECT_DOUBLE_EQ(Norm(zero), 0);
  const double nan[3] = { std::nan(""), 1, 0 }, inf[3] = { -INFINITY, 1, 0 };
  EXPECT_TRUE(std::isnan(Norm(nan)));
  EXPECT_TRUE(std::isinf(Norm(inf)));
}

// The line of action of a force of 1e200 N (|F|^2 overflows): F = (0, 0, f)
// at (1, 0, 0) has M = r x F = (0, -f, 0) about the origin; the nearest point
// of its line is (1, 0, 0) and no couple is left (wrench reduction).
TEST(LoadAxes, LineOfActionOfHugeForce)
{
  const double f = 1e200;
  const double F[3] = { 0, 0, f }, M[3] = { 0, -f, 0 }, r0[3] = { 0, 0, 0 };
  double p[3], c;
  LineOfAction(F, M, r0, p, c);
  EXPECT_NEAR(p[0], 1, 1e-15);
  EXPECT_NEAR(p[1], 0, 1e-15);
  EXPECT_NEAR(p[2], 0, 1e-15);
  EXPECT_NEAR(c, 0, 1e-15 * f);
}

// Moments summed about the origin and moved to r0 (MomentsAbout) against
// moments summed about r0 directly, for faces far from both: the same to
// the round-off of the terms (sum |c x f| times a few epsilon).
TEST(LoadTotals, MomentsMovedToACentreEqualMomentsAboutIt)
{
  const double r0[3] = { 12.5, -3.0, 0.25 };
  LoadSums<double> aboutOrigin;
  LoadSums<double> aboutCentre;
  double scale = 0;
  unsigned state = 12345;
  auto next = [&state]() {
    state = state * 1103515245u + 12345u;
    return static_cast<double>((state >> 8) & 0xffff) / 65536.0 - 0.5;
  };
  for (int i = 0; i < 5000; ++i)
  {
    const double c[3] = { 10 + next(), -2 + next(), next() };
    const double fp[3] = { 1e3 * next(), 1e3 * next(), 1e3 * next() };
    const double fv[3] = { next(), next(), next() };
    const double origin[3] = { 0, 0, 0 };
    aboutOrigin.AddFace(0.01, c, origin, fp, fv);
    aboutCentre.AddFace(0.01, c, r0, fp, fv);
    scale += 11 * (std::fabs(fp[0]) + std::fabs(fp[1]) + std::fabs(fp[2]));
  }
  const LoadSums<double> moved = MomentsAbout(aboutOrigin, r0);
  for (std::size_t k = 0; k < NumLoadSlots; ++k)
  {
    EXPECT_NEAR(moved.Sums.Value(k), aboutCentre.Sums.Value(k), 4e-16 * scale) << "slot " << k;
  }
  // About the origin itself nothing changes.
  const double zero[3] = { 0, 0, 0 };
  const LoadSums<double> same = MomentsAbout(aboutOrigin, zero);
  for (std::size_t k = 0; k < NumLoadSlots; ++k)
  {
    EXPECT_EQ(same.Sums.Value(k), aboutOrigin.Sums.Value(k));
  }
}
