#pragma once
// A small parallel loop for independent pieces of work (one polar per Reynolds number, one
// study chain, ...): std::thread workers take the next index until all are done.
#include <algorithm>
#include <atomic>
#include <cstddef>
#include <exception>
#include <thread>
#include <vector>

namespace fulmar {

// Cores of this machine (at least 1).
inline unsigned core_count() {
  return std::max(1u, std::thread::hardware_concurrency());
}

// Calls body(i) for i = 0 .. count-1 on at most `max_threads` threads (0: one per core; the
// calling thread is one of them). Indices are handed out in increasing order, each exactly once.
// When bodies throw, every other index still runs and the exception of the lowest index is
// re-thrown after all have finished, so the outcome does not depend on the thread count.
template <class Body>
void parallel_for(std::size_t count, unsigned max_threads, Body&& body) {
  if (count == 0) return;
  const std::size_t threads =
      std::min<std::size_t>(count, max_threads == 0 ? core_count() : max_threads);
  std::atomic<std::size_t> next{0};
  std::vector<std::exception_ptr> errors(count);
  auto work = [&]() {
    for (std::size_t i = next++; i < count; i = next++) {
      try {
        body(i);
      } catch (...) {
        errors[i] = std::current_exception();
      }
    }
  };
  std::vector<std::thread> pool;
  pool.reserve(threads - 1);
  for (std::size_t t = 1; t < threads; ++t) pool.emplace_back(work);
  work();
  for (std::thread& t : pool) t.join();
  for (const std::exception_ptr& e : errors)
    if (e) std::rethrow_exception(e);
}

}  // namespace fulmar
