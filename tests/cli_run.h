#pragma once
// Runs the built fulmar executable as a child process for end-to-end tests.
#include <filesystem>
#include <string>
#include <vector>

namespace fulmar::testing {

struct CliResult {
  int exit_code = -1;  // the process exit status (128 + signal if it was killed)
  std::string out;     // everything written to stdout
  std::string err;     // everything written to stderr
};

// Runs `fulmar args...` (the binary named by the FULMAR_BIN environment variable, which CTest
// sets) with `cwd` as working directory when given.
CliResult run_fulmar(const std::vector<std::string>& args, const std::filesystem::path& cwd = {});

// A fresh empty directory under the system temporary directory, unique to this process and tag.
std::filesystem::path fresh_directory(const std::string& tag);

// The project's source directory (for cases/ and test data).
std::filesystem::path source_dir();

// Reads a whole file; empty string when it does not exist.
std::string read_file(const std::filesystem::path& path);

}  // namespace fulmar::testing
