// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/WallQuantities.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace wallloads;

// Spalding's formula gives y+ from u+ explicitly (Spalding 1961, J. Appl.
// Mech. 28:455): build the near-wall speed of a chosen friction velocity
// with it, and the wall-law shear must return rho u_tau^2 along the
// tangential relative velocity, with no normal part.
TEST(WallQuantities, WallLawShearRecoversFrictionVelocity)
{
  const double kappa = 0.41, B = 5.0, nu = 1.5e-5, rho = 1.2;
  const double n[3] = { 0.0, 0.6, 0.8 };
  const double t[3] = { 1.0, 0.0, 0.0 };
  const double uW[3] = { 0.3, -0.1, 0.2 };
  for (double uplus : { 2.0, 9.0, 18.0 })
  {
    const double utau = 0.05;
    const double yplus = SpaldingYPlus(uplus, kappa, B);
    const double d = yplus * nu / utau;
    const double U = uplus * utau;
    // Relative velocity U t plus a normal part the law must ignore.
    const double uP[3] = { uW[0] + U * t[0] + 0.7 * n[0], uW[1] + U * t[1] + 0.7 * n[1],
      uW[2] + U * t[2] + 0.7 * n[2] };
    double tau[3];
    ASSERT_EQ(WallLawShear(uP, uW, n, d, nu, rho, kappa, B, tau), WallLawStatus::Ok);
    for (int k = 0; k < 3; ++k)
    {
      EXPECT_NEAR(tau[k], rho * utau * utau * t[k], 1e-12 * rho * utau * utau) << uplus;
    }
  }
  // A wall distance of zero is bad input: NaN, not a number that looks right.
  const double uP[3] = { 1, 0, 0 };
  double tau[3];
  EXPECT_EQ(WallLawShear(uP, uW, n, 0.0, nu, rho, kappa, B, tau), WallLawStatus::BadInput);
  EXPECT_TRUE(std::isnan(tau[0]));
}

// The divergence theorem in the plane: the Green-Gauss gradient over a
// polygon is exact for a field linear in the face plane, convex or not.
TEST(WallQuantities, FaceGradientExactForLinearFields)
{
  // A non-convex pentagon in the plane z = 0.3 (an arrow head), unit normal +z.
  const double xy[5][2] = { { 0, 0 }, { 2, 0 }, { 2, 1 }, { 1, 0.4 }, { 0, 1 } };
  double xyz[15];
  double u[15];
  const double G[9] = { 0.3, -1.2, 7.0, 2.0, 0.5, -3.0, -0.7, 0.1, 4.0 };
  const double c0[3] = { 0.2, -0.4, 1.1 };
  for (int k = 0; k < 5; ++k)
  {
    xyz[3 * k] = xy[k][0];
    xyz[3 * k + 1] = xy[k][1];
    xyz[3 * k + 2] = 0.3;
    for (int i = 0; i < 3; ++i)
    {
      u[3 * k + i] = c0[i] + G[3 * i] * xyz[3 * k] + G[3 * i + 1] * xyz[3 * k + 1] +
        G[3 * i + 2] * xyz[3 * k + 2];
    }
  }
  // Shoelace area of the pentagon.
  double area = 0;
  for (int k = 0; k < 5; ++k)
  {
    const int m = (k + 1) % 5;
    area += 0.5 * (xy[k][0] * xy[m][1] - xy[m][0] * xy[k][1]);
  }
  const double n[3] = { 0, 0, 1 };
  double W[9];
  FaceVelocityGradient(xyz, u, 5, n, area, W);
  for (int i = 0; i < 3; ++i)
  {
    EXPECT_NEAR(W[3 * i], G[3 * i], 1e-13);
    EXPECT_NEAR(W[3 * i + 1], G[3 * i + 1], 1e-13);
    EXPECT_NEAR(W[3 * i + 2], 0.0, 1e-13); // nothing along the normal
  }
  // No area: no gradient.
  FaceVelocityGradient(xyz, u, 5, n, 0.0, W);
  EXPECT_EQ(W[0], 0.0);
}

// A rigid rotation u = Omega x r has W = [Omega]_x (antisymmetric), so
// t(W^T n) = -Omega x n: on a spinning cylinder (Omega along the axis, n
// radial) the along-wall term is -mu Omega e_theta, half of the wall shear
// -2 mu Omega e_theta of the flow u_theta = Omega R^2/r (Landau & Lifshitz,
// Fluid Mechanics, §18; section recalled from memory).
TEST(WallQuantities, AlongWallTermOfARigidRotation)
{
  const double Om = 2.5, mu = 1.3e-3;
  const double W[9] = { 0, -Om, 0, Om, 0, 0, 0, 0, 0 }; // [Omega e_z]_x
  const double n[3] = { std::cos(0.4), std::sin(0.4), 0 };
  const double etheta[3] = { -std::sin(0.4), std::cos(0.4), 0 };
  double tau[3] = { 1.0, 2.0, 3.0 };
  AddAlongWallShear(W, n, mu, tau);
  for (int k = 0; k < 3; ++k)
  {
    EXPECT_NEAR(tau[k], (k + 1.0) - mu * Om * etheta[k], 1e-15);
  }
}

// The definitions u_tau = sqrt(|tau|/rho), y+ = d u_tau/nu.
TEST(WallQuantities, FrictionVelocityAndYPlusDefinitions)
{
  const double tau[3] = { 3.0, 0.0, 4.0 }; // |tau| = 5
  double utau, yplus;
  FrictionVelocityAndYPlus(tau, 1.25, 2e-3, 1e-5, utau, yplus);
  EXPECT_NEAR(utau, 2.0, 1e-15);
  EXPECT_NEAR(yplus, 400.0, 1e-11);
}
