// rotorq-accuracy: sweeps every rotorq function against its double twin and prints the error of each
// in LSB of its format (max |error|, RMS, mean), the worst input and the documented bound.
//
//   rotorq-accuracy                      summary table on the terminal
//   rotorq-accuracy --markdown           the same as a Markdown table
//   rotorq-accuracy --write-readme F     replace the table between the accuracy markers in F
//   rotorq-accuracy --check-readme F     fail if the table in F differs from a fresh run
//   rotorq-accuracy --quick              a reduced sweep (for tests); not for the README
//
// The exit status is 1 when any function exceeds its bound, 2 on a usage error, 3 when
// --check-readme finds the README out of date.
#include <fmt/core.h>

#include <chrono>
#include <cstring>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "rotorq/accuracy/sweeps.hpp"
#include "rotorq/detail/sine_table.hpp"

namespace {

using rotorq::accuracy::error_stats;

constexpr const char* begin_marker = "<!-- accuracy-table:begin (rotorq-accuracy --write-readme) -->";
constexpr const char* end_marker = "<!-- accuracy-table:end -->";

std::string markdown_table(const std::vector<error_stats>& rows, const rotorq::accuracy::sweep_options& o) {
  std::string out;
  out += fmt::format(
      "Seed {}; error = result - exact value of the same inputs (clamped to the range), in LSB.\n\n", o.seed);
  out += "| function | format | inputs | max abs error | RMS | mean | bound |\n";
  out += "|---|---|---|---:|---:|---:|---:|\n";
  for (const error_stats& r : rows) {
    out += fmt::format("| `{}` | {} | {} | {:.4f} | {:.4f} | {:+.5f} | {:.2f} |\n", r.function, r.format,
                       r.inputs, r.max_abs, r.rms(), r.mean(), r.bound);
  }
  out += fmt::format("\nsin_cos table: {} bytes of read-only data, shared by q15 and q31.\n",
                     sizeof(rotorq::detail::sine_table));
  return out;
}

void print_terminal(const std::vector<error_stats>& rows) {
  fmt::print("{:<38} {:<4} {:>10} {:>8} {:>9} {:>6}  {:<5} {}\n", "function", "fmt", "max|err|", "RMS",
             "mean", "bound", "ok", "worst input");
  for (const error_stats& r : rows) {
    fmt::print("{:<38} {:<4} {:>10.4f} {:>8.4f} {:>+9.5f} {:>6.2f}  {:<5} {}\n", r.function, r.format,
               r.max_abs, r.rms(), r.mean(), r.bound, r.within_bound() ? "yes" : "NO", r.worst_input);
  }
  fmt::print("(errors in LSB of the output format; {} samples in all)\n", [&] {
    uint64_t n = 0;
    for (const error_stats& r : rows) n += r.samples;
    return n;
  }());
}

bool read_file(const std::string& path, std::string& text) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return false;
  std::ostringstream buffer;
  buffer << in.rdbuf();
  text = buffer.str();
  return true;
}

// The README with its accuracy section replaced by `table`; empty when the markers are missing.
std::string with_table(const std::string& readme, const std::string& table) {
  const size_t begin = readme.find(begin_marker);
  const size_t end = readme.find(end_marker);
  if (begin == std::string::npos || end == std::string::npos || end < begin) return {};
  const size_t after_begin = begin + std::strlen(begin_marker);
  return readme.substr(0, after_begin) + "\n" + table + readme.substr(end);
}

}  // namespace

int main(int argc, char** argv) {
  rotorq::accuracy::sweep_options options;
  bool markdown = false;
  std::string write_readme, check_readme;
  for (int i = 1; i < argc; ++i) {
    const std::string arg = argv[i];
    if (arg == "--markdown") {
      markdown = true;
    } else if (arg == "--quick") {
      options.random_inputs = 20'000;
      options.sin_cos_q31_angles = 200'000;
    } else if ((arg == "--write-readme" || arg == "--check-readme") && i + 1 < argc) {
      (arg == "--write-readme" ? write_readme : check_readme) = argv[++i];
    } else {
      fmt::print(stderr,
                 "usage: rotorq-accuracy [--markdown] [--quick] [--write-readme README.md] "
                 "[--check-readme README.md]\n");
      return 2;
    }
  }

  const auto start = std::chrono::steady_clock::now();
  const std::vector<error_stats> rows = rotorq::accuracy::sweep_all(options);
  const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  const std::string table = markdown_table(rows, options);

  if (markdown) {
    fmt::print("{}", table);
  } else {
    print_terminal(rows);
    fmt::print("sweep took {:.1f} s\n", seconds);
  }

  int status = 0;
  for (const error_stats& r : rows) {
    if (!r.within_bound()) {
      fmt::print(stderr, "rotorq-accuracy: {} {} exceeds its bound: {:.4f} > {:.2f} LSB at {}\n", r.function,
                 r.format, r.max_abs, r.bound, r.worst_input);
      status = 1;
    }
  }

  for (const std::string& path : {write_readme, check_readme}) {
    if (path.empty()) continue;
    std::string readme;
    if (!read_file(path, readme)) {
      fmt::print(stderr, "rotorq-accuracy: cannot read {}\n", path);
      return 2;
    }
    const std::string updated = with_table(readme, table);
    if (updated.empty()) {
      fmt::print(stderr, "rotorq-accuracy: {} has no accuracy-table markers\n", path);
      return 2;
    }
    if (path == write_readme) {
      std::ofstream(path, std::ios::binary) << updated;
      fmt::print("wrote the accuracy table into {}\n", path);
    } else if (updated != readme) {
      fmt::print(stderr,
                 "rotorq-accuracy: the accuracy table in {} is out of date; regenerate it with "
                 "rotorq-accuracy --write-readme {}\n",
                 path, path);
      return 3;
    } else {
      fmt::print("the accuracy table in {} matches this run\n", path);
    }
  }
  return status;
}
