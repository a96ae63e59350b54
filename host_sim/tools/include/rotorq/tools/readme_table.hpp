// The README tables the host tools generate: a table lives between a begin and an end marker line,
// and a tool either rewrites it (--write-readme) or fails when it differs from its own output
// (--check-readme), so every figure in the README comes from a tool run. Shared by rotorq-accuracy,
// rotorq-sim and rotorq-cycles.
#pragma once

#include <fmt/core.h>

#include <fstream>
#include <optional>
#include <sstream>
#include <string>

namespace rotorq::tools {

inline std::optional<std::string> read_text(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return std::nullopt;
  std::ostringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

// `readme` with the text between the two markers replaced by a newline and `table`; nothing when
// the markers are missing or out of order.
inline std::optional<std::string> with_table(const std::string& readme, const std::string& begin_marker,
                                             const std::string& end_marker, const std::string& table) {
  const size_t begin = readme.find(begin_marker);
  const size_t end = readme.find(end_marker);
  if (begin == std::string::npos || end == std::string::npos || end < begin) return std::nullopt;
  return readme.substr(0, begin + begin_marker.size()) + "\n" + table + readme.substr(end);
}

enum class readme_status { written, current, stale, unreadable, no_markers };

// Writes the table into the README at `path` (write = true) or compares it (write = false).
inline readme_status update_readme_table(const std::string& path, const std::string& begin_marker,
                                         const std::string& end_marker, const std::string& table,
                                         bool write) {
  const std::optional<std::string> readme = read_text(path);
  if (!readme) return readme_status::unreadable;
  const std::optional<std::string> updated = with_table(*readme, begin_marker, end_marker, table);
  if (!updated) return readme_status::no_markers;
  if (write) {
    std::ofstream(path, std::ios::binary) << *updated;
    return readme_status::written;
  }
  return *updated == *readme ? readme_status::current : readme_status::stale;
}

// The --write-readme PATH / --check-readme PATH step of a tool (empty paths are skipped), with its
// messages: returns 0, 2 (unreadable file or missing markers) or 3 (the table is out of date).
inline int readme_step(const std::string& tool, const std::string& what, const std::string& write_path,
                       const std::string& check_path, const std::string& begin_marker,
                       const std::string& end_marker, const std::string& table,
                       const std::string& regenerate_command) {
  for (const bool write : {true, false}) {
    const std::string& path = write ? write_path : check_path;
    if (path.empty()) continue;
    switch (update_readme_table(path, begin_marker, end_marker, table, write)) {
      case readme_status::written:
        fmt::print("wrote the {} table into {}\n", what, path);
        break;
      case readme_status::current:
        fmt::print("the {} table in {} matches this run\n", what, path);
        break;
      case readme_status::unreadable:
        fmt::print(stderr, "{}: cannot read {}\n", tool, path);
        return 2;
      case readme_status::no_markers:
        fmt::print(stderr, "{}: {} has no {}-table markers\n", tool, path, what);
        return 2;
      case readme_status::stale:
        fmt::print(stderr, "{}: the {} table in {} is out of date; regenerate it with {} {}\n", tool, what,
                   path, regenerate_command, path);
        return 3;
    }
  }
  return 0;
}

}  // namespace rotorq::tools
