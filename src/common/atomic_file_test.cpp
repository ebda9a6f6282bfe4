#include "common/atomic_file.h"

#include <gtest/gtest.h>

#include <fstream>
#include <sstream>

#include "common/error.h"

namespace fulmar {
namespace {
namespace fs = std::filesystem;

fs::path scratch_dir() {
  fs::path dir = fs::temp_directory_path() / ("fulmar_atomic_" + std::to_string(::getpid()));
  fs::create_directories(dir);
  return dir;
}

TEST(AtomicFile, WritesContentAndLeavesNoTemporary) {
  const fs::path dir = scratch_dir();
  const fs::path file = dir / "out.txt";
  write_file_atomically(file, "hello\n");
  std::ifstream in(file);
  std::stringstream ss;
  ss << in.rdbuf();
  EXPECT_EQ(ss.str(), "hello\n");
  int entries = 0;
  for (const auto& e : fs::directory_iterator(dir)) {
    (void)e;
    ++entries;
  }
  EXPECT_EQ(entries, 1);
  fs::remove_all(dir);
}

TEST(AtomicFile, FailedWriterKeepsOldFile) {
  const fs::path dir = scratch_dir();
  const fs::path file = dir / "keep.txt";
  write_file_atomically(file, "old");
  EXPECT_THROW(write_file_atomically(file, [](std::ostream&) { throw std::runtime_error("x"); }),
               std::runtime_error);
  std::ifstream in(file);
  std::string s;
  in >> s;
  EXPECT_EQ(s, "old");
  fs::remove_all(dir);
}

TEST(AtomicFile, MissingDirectoryIsInputError) {
  EXPECT_THROW(write_file_atomically("/nonexistent_dir_fulmar/x.txt", "x"), InputError);
}

}  // namespace
}  // namespace fulmar
