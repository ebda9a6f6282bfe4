#include "common/parallel_for.h"

#include <gtest/gtest.h>

#include <atomic>
#include <stdexcept>
#include <string>
#include <vector>

namespace fulmar {
namespace {

TEST(ParallelFor, EveryIndexRunsExactlyOnce) {
  for (unsigned threads : {0u, 1u, 3u, 64u}) {
    std::vector<std::atomic<int>> hits(100);
    parallel_for(hits.size(), threads, [&](std::size_t i) { ++hits[i]; });
    for (std::size_t i = 0; i < hits.size(); ++i) EXPECT_EQ(hits[i].load(), 1) << i;
  }
  parallel_for(0, 4, [](std::size_t) { FAIL() << "no work for an empty range"; });
}

TEST(ParallelFor, TheLowestFailingIndexIsReportedAfterAllRan) {
  for (unsigned threads : {1u, 4u}) {
    std::atomic<int> ran{0};
    try {
      parallel_for(20, threads, [&](std::size_t i) {
        ++ran;
        if (i == 7 || i == 13) throw std::runtime_error("index " + std::to_string(i));
      });
      FAIL() << "nothing thrown";
    } catch (const std::runtime_error& e) {
      EXPECT_STREQ(e.what(), "index 7");
    }
    EXPECT_EQ(ran.load(), 20);
  }
}

}  // namespace
}  // namespace fulmar
