// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/OrientationCheck.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <set>
#include <cstdint>
#include <vector>

using namespace wallloads;

namespace
{
using Faces = std::vector<std::vector<std::int64_t>>;
const Faces Cube = { { 0, 3, 2, 1 }, { 4, 5, 6, 7 }, { 0, 1, 5, 4 }, { 1, 2, 6, 5 },
  { 2, 3, 7, 6 }, { 3, 0, 4, 7 } };

std::set<std::int64_t> Reversed;

OrientationReport Check(const Faces& faces)
{
  auto corners = [&](std::int64_t f, const std::int64_t*& ids, std::int64_t*, bool& reversed) -> int {
    reversed = Reversed.count(f) > 0;
    ids = faces[f].data();
    return static_cast<int>(faces[f].size());
  };
  std::int64_t numPoints = 0;
  for (const auto& face : faces)
  {
    for (auto id : face)
    {
      numPoints = std::max(numPoints, id + 1);
    }
  }
  return CheckOrientation<std::int64_t>(static_cast<std::int64_t>(faces.size()), numPoints, corners);
}
}

TEST(OrientationCheck, ConsistentClosedCube)
{
  const auto r = Check(Cube);
  EXPECT_EQ(r.InconsistentFaces, 0);
  EXPECT_EQ(r.BoundaryEdges, 0);
  EXPECT_EQ(r.NonManifoldEdges, 0);
  EXPECT_EQ(r.Conflicts, 0);
  EXPECT_EQ(r.Patches, 1);
}

TEST(OrientationCheck, OneAndTwoFlippedFaces)
{
  Faces f = Cube;
  std::reverse(f[3].begin(), f[3].end());
  EXPECT_EQ(Check(f).InconsistentFaces, 1);
  std::reverse(f[0].begin(), f[0].end());
  EXPECT_EQ(Check(f).InconsistentFaces, 2);
}

TEST(OrientationCheck, OpenBoxHasBoundary)
{
  Faces f(Cube.begin(), Cube.end() - 1);
  const auto r = Check(f);
  EXPECT_EQ(r.BoundaryEdges, 4);
  EXPECT_EQ(r.InconsistentFaces, 0);
}

TEST(OrientationCheck, SeparatePatchesAreJudgedAlone)
{
  // Two disjoint cubes, the second wholly reversed: each is consistent.
  Faces f = Cube;
  for (auto face : Cube)
  {
    for (auto& id : face)
    {
      id += 8;
    }
    std::reverse(face.begin(), face.end());
    f.push_back(face);
  }
  const auto r = Check(f);
  EXPECT_EQ(r.Patches, 2);
  EXPECT_EQ(r.InconsistentFaces, 0);
}

// A face stored backwards but declared reversed (its orientation decided by a
// normal array) is consistent.
TEST(OrientationCheck, DeclaredReversalCounts)
{
  Faces f = Cube;
  std::reverse(f[2].begin(), f[2].end());
  Reversed = { 2 };
  EXPECT_EQ(Check(f).InconsistentFaces, 0);
  Reversed.clear();
  EXPECT_EQ(Check(f).InconsistentFaces, 1);
}
