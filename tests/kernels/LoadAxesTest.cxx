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
