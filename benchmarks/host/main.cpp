// rotorq-bench-host: Google Benchmark's usual command line (every --benchmark_* flag), plus
//
//   --ratios   run each benchmark briefly (3 repetitions of at least 0.02 s; later --benchmark_min_time
//              and --benchmark_repetitions flags override) and print one table: ns per call of the
//              library next to float and double code, and the ratios fixed/float and fixed/double.
//
// Host timings move with the machine's load and clock, so the table gives the fastest CPU time of the
// repetitions (the least disturbed) and is meant to be read as ratios; it says nothing about cycles
// on a target core.
#include <benchmark/benchmark.h>
#include <fmt/core.h>

#include <algorithm>
#include <chrono>
#include <cstring>
#include <map>
#include <string>
#include <vector>

#include "bench_support.hpp"

namespace {

// The fastest CPU time per call of each benchmark over its repetitions, by function and variant in
// the order they ran.
class fastest_runs : public benchmark::BenchmarkReporter {
 public:
  struct function_times {
    std::string name;
    std::vector<std::string> variants;  // in the order they ran
    std::map<std::string, double> ns;
  };

  bool ReportContext(const Context& context) override {
    cpus_ = context.cpu_info.num_cpus;
    mhz_ = context.cpu_info.cycles_per_second / 1e6;
    scaling_ = context.cpu_info.scaling == benchmark::CPUInfo::ENABLED;
    return true;
  }

  void ReportRuns(const std::vector<Run>& runs) override {
    bool measured = false;
    for (const Run& run : runs) {
      if (run.run_type != Run::RT_Iteration) continue;  // not the mean, median, ... of repetitions
      measured = true;
      const std::string& name = run.run_name.function_name;  // "<function>/<variant>"
      const size_t slash = name.rfind('/');
      const std::string function = name.substr(0, slash);
      const std::string variant = slash == std::string::npos ? "" : name.substr(slash + 1);
      const double ns = run.GetAdjustedCPUTime() * 1e9 / benchmark::GetTimeUnitMultiplier(run.time_unit);
      function_times& f = find(function);
      const auto [at, inserted] = f.ns.emplace(variant, ns);
      if (inserted) {
        f.variants.push_back(variant);
      } else {
        at->second = std::min(at->second, ns);
      }
    }
    if (measured) fmt::print(stderr, ".");  // one per benchmark
  }

  void Finalize() override { fmt::print(stderr, "\n"); }

  const std::vector<function_times>& functions() const { return functions_; }
  int cpus() const { return cpus_; }
  double mhz() const { return mhz_; }
  bool scaling() const { return scaling_; }

 private:
  function_times& find(const std::string& function) {
    for (function_times& f : functions_) {
      if (f.name == function) return f;
    }
    functions_.push_back({function, {}, {}});
    return functions_.back();
  }

  std::vector<function_times> functions_;
  int cpus_ = 0;
  double mhz_ = 0;
  bool scaling_ = false;
};

std::string cell(const std::map<std::string, double>& ns, const std::string& variant, int width) {
  const auto at = ns.find(variant);
  return at == ns.end() ? fmt::format("{:>{}}", "-", width) : fmt::format("{:>{}.2f}", at->second, width);
}
std::string ratio(double fixed, const std::map<std::string, double>& ns, const std::string& variant,
                  int width) {
  const auto at = ns.find(variant);
  if (at == ns.end() || at->second <= 0) return fmt::format("{:>{}}", "-", width);
  return fmt::format("{:>{}.2f}", fixed / at->second, width);
}

#ifndef ROTORQ_BENCH_BUILD_TYPE
#define ROTORQ_BENCH_BUILD_TYPE "unknown"
#endif

std::string compiler() {
#if defined(__clang__)
  std::string name = "clang++ " __clang_version__;
#elif defined(__GNUC__)
  std::string name = "g++ " __VERSION__;
#else
  std::string name = "an unknown compiler";
#endif
  name.erase(name.find_last_not_of(' ') + 1);  // clang's version ends with a space
  return name;
}

void print_table(const fastest_runs& runs, double seconds) {
#if defined(__OPTIMIZE__)
  const char* optimized = "";
#else
  const char* optimized = " WITHOUT optimization (the figures mean nothing)";
#endif
  fmt::print("\nrotorq host timing: ns per call, the fastest CPU time of the repetitions; one run, noisy:\n");
  fmt::print("read the ratios, not the figures. {} build by {}{}; {} CPUs at {:.0f} MHz{}.\n\n",
             ROTORQ_BENCH_BUILD_TYPE, compiler(), optimized, runs.cpus(), runs.mhz(),
             runs.scaling() ? ", CPU frequency scaling on" : "");
  fmt::print("{:<31} {:<8} {:>8} {:>8} {:>8} {:>12} {:>13}\n", "function", "variant", "fixed", "float",
             "double", "fixed/float", "fixed/double");
  fmt::print("{:-<31} {:-<8} {:->8} {:->8} {:->8} {:->12} {:->13}\n", "", "", "", "", "", "", "");
  for (const auto& f : runs.functions()) {
    for (const std::string& variant : f.variants) {
      if (variant == "float" || variant == "double") continue;
      const double fixed = f.ns.at(variant);
      fmt::print("{:<31} {:<8} {:>8.2f} {} {} {} {}\n", f.name, variant, fixed, cell(f.ns, "float", 8),
                 cell(f.ns, "double", 8), ratio(fixed, f.ns, "float", 12), ratio(fixed, f.ns, "double", 13));
    }
  }
  fmt::print(
      "\nEach figure includes the benchmark loop and the load of one precomputed input (loop_overhead).\n"
      "fixed: rotorq in q15/q31 (int: no q format; timer16/32: the timer width); float, double: plain\n"
      "<cmath> code (benchmarks/host/plain_math.hpp); '-' where no float code applies. {:.1f} s in all.\n",
      seconds);
}

}  // namespace

int main(int argc, char** argv) {
  rotorq::bench::register_arithmetic();
  rotorq::bench::register_transforms();
  rotorq::bench::register_modulation();
  rotorq::bench::register_rotor_angle();

  static char min_time[] = "--benchmark_min_time=0.02";
  static char repetitions[] = "--benchmark_repetitions=3";
  std::vector<char*> args(argv, argv + argc);
  const auto ratios_flag =
      std::find_if(args.begin(), args.end(), [](const char* a) { return std::strcmp(a, "--ratios") == 0; });
  const bool ratios = ratios_flag != args.end();
  if (ratios) {
    args.erase(ratios_flag);
    args.insert(args.begin() + 1, {min_time, repetitions});  // before the caller's flags, which win
  }
  if (std::find_if(args.begin(), args.end(), [](const char* a) { return std::strcmp(a, "--help") == 0; }) !=
      args.end()) {
    fmt::print(
        "{} [--ratios] [Google Benchmark flags]\n  --ratios  a table of fixed vs float vs double (brief "
        "runs)\n",
        argv[0]);
  }
  int count = static_cast<int>(args.size());
  args.push_back(nullptr);
  benchmark::Initialize(&count, args.data());
  if (benchmark::ReportUnrecognizedArguments(count, args.data())) return 1;

  if (!ratios) {
    benchmark::RunSpecifiedBenchmarks();
  } else {
    fastest_runs runs;
    const auto start = std::chrono::steady_clock::now();
    benchmark::RunSpecifiedBenchmarks(&runs);
    const std::chrono::duration<double> elapsed = std::chrono::steady_clock::now() - start;
    print_table(runs, elapsed.count());
  }
  benchmark::Shutdown();
  return 0;
}
