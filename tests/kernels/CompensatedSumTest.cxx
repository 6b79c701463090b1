// SPDX-License-Identifier: BSD-3-Clause
#include "wallloads/CompensatedSum.h"

#include <gtest/gtest.h>

#include <vector>

using wallloads::CompensatedSum;

// Neumaier 1974: the compensated sum of 1, 1e100, 1, -1e100 is 2; a plain
// sum gives 0.
TEST(CompensatedSum, RecoversCancelledTerms)
{
  CompensatedSum<double> s;
  for (double v : { 1.0, 1e100, 1.0, -1e100 })
  {
    s.Add(v);
  }
  EXPECT_EQ(s.Value(), 2.0);
}

// Splitting the same terms among "threads" and merging gives the same total
// to the last bit for this well-conditioned case and to ~1 ulp in general.
TEST(CompensatedSum, MergeIsIndependentOfSplit)
{
  std::vector<double> terms;
  for (int i = 1; i <= 100000; ++i)
  {
    terms.push_back(1.0 / i * ((i % 3) ? 1.0 : -1.0));
  }
  CompensatedSum<double> whole;
  for (double t : terms)
  {
    whole.Add(t);
  }
  for (int parts : { 2, 3, 7, 64 })
  {
    std::vector<CompensatedSum<double>> local(parts);
    for (std::size_t i = 0; i < terms.size(); ++i)
    {
      local[i % parts].Add(terms[i]);
    }
    CompensatedSum<double> merged;
    for (auto& l : local)
    {
      merged.Merge(l);
    }
    EXPECT_NEAR(merged.Value(), whole.Value(), 2e-16 * std::abs(whole.Value())) << parts;
  }
}

// A count added without compensation is exact (integers below 2^53 add
// exactly in binary64, IEEE 754-2019 §3.3), so its carry stays 0 and the
// value equals the compensated count, to the last bit, past 2^24 and 2^32.
TEST(CompensatedSum, UncompensatedCountIsExact)
{
  CompensatedSum<double> plain;
  CompensatedSum<double> compensated;
  const double start = 4294967296.0 - 1000.0; // 2^32 - 1000
  plain.AddUncompensated(start);
  compensated.Add(start);
  for (int i = 0; i < 3000; ++i)
  {
    plain.AddUncompensated(1.0);
    compensated.Add(1.0);
  }
  EXPECT_EQ(plain.Carry, 0.0);
  EXPECT_EQ(plain.Value(), 4294967296.0 + 2000.0);
  EXPECT_EQ(plain.Value(), compensated.Value());
}
