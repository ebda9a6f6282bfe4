#include "cli_run.h"

#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <fstream>
#include <sstream>
#include <stdexcept>

namespace fulmar::testing {
namespace fs = std::filesystem;

namespace {

std::string quoted(const std::string& s) {
  std::string q = "'";
  for (char c : s) {
    if (c == '\'')
      q += "'\\''";
    else
      q += c;
  }
  return q + "'";
}

}  // namespace

std::string read_file(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return {};
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

fs::path fresh_directory(const std::string& tag) {
  static int counter = 0;
  fs::path dir = fs::temp_directory_path() / ("fulmar_" + tag + "_" + std::to_string(::getpid()) +
                                              "_" + std::to_string(counter++));
  fs::remove_all(dir);
  fs::create_directories(dir);
  return dir;
}

fs::path source_dir() {
  return fs::path(FULMAR_SOURCE_DIR);
}

CliResult run_fulmar(const std::vector<std::string>& args, const fs::path& cwd) {
  const char* bin = std::getenv("FULMAR_BIN");
  if (bin == nullptr) throw std::runtime_error("FULMAR_BIN is not set (run the tests with ctest)");
  const fs::path dir = fresh_directory("cli");
  const fs::path out = dir / "stdout";
  const fs::path err = dir / "stderr";
  std::string cmd;
  // Appended piece by piece: g++ 12 warns falsely (-Wrestrict) on "literal" + std::string&&.
  if (!cwd.empty()) {
    cmd.append("cd ").append(quoted(cwd.string())).append(" && ");
  }
  cmd.append(quoted(bin));
  for (const auto& a : args) cmd.append(" ").append(quoted(a));
  cmd.append(" >").append(quoted(out.string()));
  cmd.append(" 2>").append(quoted(err.string())).append(" </dev/null");
  const int status = std::system(cmd.c_str());
  CliResult r;
  if (WIFEXITED(status))
    r.exit_code = WEXITSTATUS(status);
  else if (WIFSIGNALED(status))
    r.exit_code = 128 + WTERMSIG(status);
  r.out = read_file(out);
  r.err = read_file(err);
  fs::remove_all(dir);
  return r;
}

}  // namespace fulmar::testing
