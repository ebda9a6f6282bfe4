#include "common/atomic_file.h"

#include <unistd.h>

#include <cstdio>
#include <fstream>
#include <sstream>
#include <system_error>

#include "common/error.h"

namespace fulmar {
namespace fs = std::filesystem;

namespace {

fs::path temporary_beside(const fs::path& path) {
  fs::path tmp = path;
  tmp += ".tmp." + std::to_string(::getpid());
  return tmp;
}

}  // namespace

void require_writable(const fs::path& path) {
  const fs::path dir = path.has_parent_path() ? path.parent_path() : fs::path(".");
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) {
    throw InputError("cannot write '" + path.string() + "': directory '" + dir.string() +
                     "' does not exist");
  }
  if (fs::is_directory(path, ec)) {
    throw InputError("cannot write '" + path.string() + "': it is a directory");
  }
  if (::access(dir.c_str(), W_OK) != 0) {
    throw InputError("cannot write '" + path.string() + "': directory '" + dir.string() +
                     "' is not writable");
  }
}

void write_file_atomically(const fs::path& path, const std::function<void(std::ostream&)>& writer) {
  require_writable(path);
  const fs::path tmp = temporary_beside(path);
  {
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    if (!out)
      throw InputError("cannot write '" + path.string() + "': cannot create '" + tmp.string() +
                       "'");
    try {
      writer(out);
    } catch (...) {
      out.close();
      std::remove(tmp.c_str());
      throw;
    }
    out.flush();
    if (!out) {
      out.close();
      std::remove(tmp.c_str());
      throw InputError("cannot write '" + path.string() + "': write failed");
    }
  }
  std::error_code ec;
  fs::rename(tmp, path, ec);
  if (ec) {
    std::remove(tmp.c_str());
    throw InputError("cannot write '" + path.string() + "': " + ec.message());
  }
}

void write_file_atomically(const fs::path& path, const std::string& content) {
  write_file_atomically(path, [&](std::ostream& out) { out << content; });
}

}  // namespace fulmar
