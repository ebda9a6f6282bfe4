#pragma once
// The data files of an optimization run (coordinates, CST descriptions, history, CAD) and the
// record of what was written where (summary.json's "files").
#include <filesystem>
#include <iosfwd>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "geometry/cst.h"
#include "optimize/case_file.h"
#include "optimize/driver.h"

namespace fulmar::optimize {

// Writes files into one directory atomically and remembers each under a key.
class OutputFiles {
 public:
  explicit OutputFiles(std::filesystem::path dir) : dir_(std::move(dir)) {}
  // Writes `content` to dir/file and records its path under `key`.
  void put(const std::string& key, const std::string& file, const std::string& content);
  // Records a file written by someone else (dir/file) under `key`.
  void record(const std::string& key, const std::string& file);
  const std::filesystem::path& dir() const { return dir_; }
  const nlohmann::json& paths() const { return files_; }

 private:
  std::filesystem::path dir_;
  nlohmann::json files_ = nlohmann::json::object();
};

// history.csv: one row per evaluation: number, status, objective (100 cd), worst constraint,
// feasible (within `tol`), the design vector and each scaled constraint (columns `names`).
std::string history_csv(const SearchResult& r, const std::vector<std::string>& names, double tol);

// The optimum's coordinates (.dat and .csv, the case's output points), both CST descriptions and
// the CAD files of the case's formats; `progress` (may be null) gets a line per CAD file.
void write_section_files(const Case& c, const std::string& baseline_name,
                         const CstShape& baseline_shape, const std::string& optimum_name,
                         const CstShape& optimum_shape, OutputFiles& files, std::ostream* progress);

}  // namespace fulmar::optimize
