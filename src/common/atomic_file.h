#pragma once
// Outputs are written atomically: the content goes to a temporary file beside the target, which
// is flushed and then renamed over the target, so an interrupted run never leaves a torn file.
#include <filesystem>
#include <functional>
#include <iosfwd>
#include <string>

namespace fulmar {

// Writes `content` to `path` atomically. Creates no directories. Throws InputError naming the
// path when the directory does not exist or is not writable.
void write_file_atomically(const std::filesystem::path& path, const std::string& content);

// Same, with the content produced by `writer` into a stream (for large outputs).
void write_file_atomically(const std::filesystem::path& path,
                           const std::function<void(std::ostream&)>& writer);

// Throws InputError unless a file could be created at `path` (its directory exists and is
// writable). Call before starting long work so that a bad -o fails at once, with nothing written.
void require_writable(const std::filesystem::path& path);

}  // namespace fulmar
