// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * Compensated summation: every addition's rounding error is recovered
 * exactly with Knuth's branch-free TwoSum (Knuth, TAOCP vol. 2, §4.2.2) and
 * accumulated in a carry, as in Neumaier's improved Kahan-Babuska sum
 * (Neumaier 1974, ZAMM 54:39-51).
 *
 * Totals over millions of faces are summed per thread and merged; plain
 * summation would make the result depend on the thread count at the 1e-13
 * level. The running compensation keeps the error independent of the number
 * of terms, so sequential, threaded and MPI totals agree to round-off.
 * TwoSum has no data-dependent branch, which keeps the face loops fast.
 */
#include "wallloads/Vector3.h" // WALLLOADS_FACE_INLINE

#include <cmath>
#include <cstddef>

namespace wallloads
{

template <typename T>
struct CompensatedSum
{
  T Sum = T(0);
  T Carry = T(0);

  WALLLOADS_FACE_INLINE void Add(const T& value)
  {
    const T t = this->Sum + value;
    const T v = t - this->Sum;
    this->Carry += (this->Sum - (t - v)) + (value - v);
    this->Sum = t;
  }

  /// An addition that needs no compensation: a count (integers below 2^53
  /// add exactly, so the carry would stay 0) or a scale compared with a
  /// tolerance (LoadTotals.h). One operation instead of seven.
  WALLLOADS_FACE_INLINE void AddUncompensated(const T& value) { this->Sum += value; }

  void Merge(const CompensatedSum& other)
  {
    this->Add(other.Sum);
    this->Carry += other.Carry;
  }

  T Value() const { return this->Sum + this->Carry; }
};

/// A fixed number of compensated sums stored side by side; mergeable as a block.
template <typename T, std::size_t N>
struct CompensatedSums
{
  CompensatedSum<T> Terms[N];

  WALLLOADS_FACE_INLINE void Add(std::size_t i, const T& value) { this->Terms[i].Add(value); }
  WALLLOADS_FACE_INLINE void AddUncompensated(std::size_t i, const T& value)
  {
    this->Terms[i].AddUncompensated(value);
  }
  void Merge(const CompensatedSums& other)
  {
    for (std::size_t i = 0; i < N; ++i)
    {
      this->Terms[i].Merge(other.Terms[i]);
    }
  }
  T Value(std::size_t i) const { return this->Terms[i].Value(); }
};

} // namespace wallloads
