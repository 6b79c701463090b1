// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/Traction.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace wallloads;

// Plane Couette flow u = (gamma y, 0, 0) over the wall y = 0 with n = +y:
// tau_xy = mu gamma, so the wall shear stress is (mu gamma, 0, 0) and the
// normal viscous stress is zero (e.g. White, Fluid Mechanics, §6.x, Couette).
TEST(Traction, CouetteShear)
{
  const double G[9] = { 0, 2.5, 0, 0, 0, 0, 0, 0, 0 };
  const double n[3] = { 0, 1, 0 };
  double t[3];
  ViscousTractionFromGradient(G, 0.4, n, t);
  EXPECT_DOUBLE_EQ(t[0], 1.0);
  EXPECT_DOUBLE_EQ(t[1], 0.0);
  EXPECT_DOUBLE_EQ(t[2], 0.0);
}

// Pure dilatation G = c I: 2 mu c I - (2/3) mu (3c) I = 0, no viscous stress.
TEST(Traction, BulkTermCancelsPureDilatation)
{
  const double G[9] = { 3, 0, 0, 0, 3, 0, 0, 0, 3 };
  const double n[3] = { 0.6, 0, 0.8 };
  double t[3];
  ViscousTractionFromGradient(G, 1.7, n, t);
  for (double v : t)
  {
    EXPECT_NEAR(v, 0.0, 1e-15);
  }
}

// Uniaxial extension G = diag(e, 0, 0) on a wall normal to x:
// tau_xx = 2 mu e - (2/3) mu e = (4/3) mu e (normal, not shear).
TEST(Traction, NormalStressOfExtension)
{
  const double G[9] = { 1.5, 0, 0, 0, 0, 0, 0, 0, 0 };
  const double n[3] = { 1, 0, 0 };
  FaceTractionInput<double> in;
  in.Normal = n;
  in.VelocityGradient = G;
  in.EffectiveViscosity = 2.0;
  FaceTraction<double> out;
  ASSERT_TRUE(ComputeFaceTraction(in, out));
  EXPECT_DOUBLE_EQ(out.NormalViscous, 4.0 / 3 * 2.0 * 1.5);
  EXPECT_DOUBLE_EQ(out.Viscous[0], 0.0); // left out by default
  in.IncludeNormalViscousStress = true;
  ASSERT_TRUE(ComputeFaceTraction(in, out));
  EXPECT_DOUBLE_EQ(out.Viscous[0], 4.0);
}

TEST(Traction, PressureActsAgainstNormal)
{
  const double n[3] = { 0, 0, 1 };
  FaceTractionInput<double> in;
  in.Normal = n;
  in.GaugePressure = 2.0;
  FaceTraction<double> out;
  ASSERT_TRUE(ComputeFaceTraction(in, out));
  EXPECT_DOUBLE_EQ(out.Pressure[2], -2.0);
  EXPECT_DOUBLE_EQ(out.Total[2], -2.0);
}

// A shear-stress array with a normal component: the tangential part is the
// wall shear stress; the normal part goes to the diagnostic.
TEST(Traction, ShearArraySplit)
{
  const double n[3] = { 0, 0, 1 };
  const double w[3] = { 3, 4, 0.5 };
  FaceTractionInput<double> in;
  in.Normal = n;
  in.ShearVector = w;
  FaceTraction<double> out;
  ASSERT_TRUE(ComputeFaceTraction(in, out));
  EXPECT_DOUBLE_EQ(out.ShearMagnitude, 5.0);
  EXPECT_DOUBLE_EQ(out.NormalViscous, 0.5);
  EXPECT_DOUBLE_EQ(out.Viscous[2], 0.0);
}

TEST(Traction, NonFiniteIsReported)
{
  const double n[3] = { 0, 0, 1 };
  FaceTractionInput<double> in;
  in.Normal = n;
  in.GaugePressure = std::nan("");
  FaceTraction<double> out;
  EXPECT_FALSE(ComputeFaceTraction(in, out));
}
