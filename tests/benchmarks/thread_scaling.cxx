// SPDX-License-Identifier: BSD-3-Clause
// How much this machine gives a second thread (and more), for the loops
// benchmark_loads.py measures: a loop that only computes (multiplies, adds,
// divisions and square roots in registers, as the face kernels do) and a
// loop that only streams (reads 144 B and rewrites 56 or 192 B per face in
// memory already mapped, the traffic of Wall Traction's face loop with forces
// only or all arrays), with plain stores and with streaming (non-temporal)
// stores as the face loop's eight-face runs use above 32 MiB of outputs.
// Each is timed best of 20 on one thread and on every core, the work split
// in equal parts; the speed-up of each is the bound of a loop of that kind.
// Plain C++ and std::thread (SSE2 streaming stores on x86-64), no VTK.
//
//   wallloads_thread_scaling [faces]      (default 2000000)
#if defined(__x86_64__)
#include <emmintrin.h>
#endif

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <thread>
#include <vector>

namespace
{
volatile double Sink = 0;

/// Best of `repeat` wall-clock times of work(part, parts) on `threads` threads.
template <typename Work>
double BestOf(int threads, int repeat, const Work& work)
{
  double best = 1e30;
  for (int r = 0; r < repeat; ++r)
  {
    const auto t0 = std::chrono::steady_clock::now();
    std::vector<std::thread> others;
    for (int t = 1; t < threads; ++t)
    {
      others.emplace_back(work, t, threads);
    }
    work(0, threads);
    for (std::thread& t : others)
    {
      t.join();
    }
    best = std::min(best, std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
  }
  return best;
}

/// Eight independent chains of a*m + b, then sqrt(a / m): no memory traffic.
void Compute(long steps, int part, int parts)
{
  double a[8];
  for (int i = 0; i < 8; ++i)
  {
    a[i] = 1.0 + 1e-3 * (i + part);
  }
  const long mine = steps / parts;
  for (long k = 0; k < mine; ++k)
  {
    for (int i = 0; i < 8; ++i)
    {
      a[i] = std::sqrt((a[i] * 0.9999999 + 1e-7) / 0.9999998);
    }
  }
  double s = 0;
  for (double v : a)
  {
    s += v;
  }
  Sink = Sink + s;
}

/// Faces [part/parts, (part+1)/parts) of `faces`, in blocks of 64: read 18
/// words of `in` per face (combined by XOR: no chain of dependent
/// floating-point additions, which would bound the loop by its latency),
/// then write the block's `width` doubles per face of `out` (with
/// `streaming`, by non-temporal stores of aligned pairs).
void Stream(
  const std::uint64_t* in, double* out, long faces, int width, bool streaming, int part, int parts)
{
  const long f0 = faces * part / parts / 64 * 64;
  const long f1 = part + 1 == parts ? faces : faces * (part + 1) / parts / 64 * 64;
  double s = 0;
  for (long b = f0; b < f1; b += 64)
  {
    const long e = std::min(f1, b + 64);
    std::uint64_t bits = 0;
    for (const std::uint64_t* x = in + 18 * b; x < in + 18 * e; ++x)
    {
      bits ^= *x;
    }
    const double t = static_cast<double>(bits & 0xffff);
    double* y = out + static_cast<long>(width) * b;
    const long n = static_cast<long>(width) * (e - b);
    long k = 0;
#if defined(__x86_64__)
    if (streaming)
    {
      for (; k < n && reinterpret_cast<std::uintptr_t>(y + k) % 16 != 0; ++k)
      {
        y[k] = t + k;
      }
      for (; k + 2 <= n; k += 2)
      {
        _mm_stream_pd(y + k, _mm_set_pd(t + k + 1, t + k));
      }
    }
#endif
    for (; k < n; ++k)
    {
      y[k] = t + k;
    }
    s += t;
  }
#if defined(__x86_64__)
  if (streaming)
  {
    _mm_sfence();
  }
#endif
  Sink = Sink + s;
}
} // namespace

int main(int argc, char** argv)
{
  const long faces = argc > 1 ? std::atol(argv[1]) : 2000000;
  const int cores = std::max(1u, std::thread::hardware_concurrency());
  const int repeat = 20;
  const long steps = 2000000;
  const double c1 = BestOf(1, repeat, [&](int p, int n) { Compute(steps, p, n); });
  const double cn = BestOf(cores, repeat, [&](int p, int n) { Compute(steps, p, n); });
  std::printf("compute only: %.2f ms on one thread, %.2f ms on %d threads, speed-up %.2fx\n", c1 * 1e3,
    cn * 1e3, cores, c1 / cn);
  std::vector<std::uint64_t> in(static_cast<std::size_t>(18 * faces), 1);
  for (int width : { 7, 24 })
  {
    std::vector<double> out(static_cast<std::size_t>(width * faces), 0.0); // mapped before timing
    for (bool streaming : { false, true })
    {
      auto work = [&](int p, int n) { Stream(in.data(), out.data(), faces, width, streaming, p, n); };
      const double s1 = BestOf(1, repeat, work);
      const double sn = BestOf(cores, repeat, work);
      std::printf("memory only, read 144 + write %d B/face, %s stores: %.2f ms on one thread, %.2f ms"
                  " on %d threads, speed-up %.2fx\n",
        8 * width, streaming ? "streaming" : "plain", s1 * 1e3, sn * 1e3, cores, s1 / sn);
    }
  }
  return 0;
}
