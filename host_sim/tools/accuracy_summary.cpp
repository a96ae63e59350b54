// rotorq-accuracy: the accuracy report. Sweeps every rotorq function against its double twin and
// states each one's error in LSB of its format and in the physical units of a drive (mA, mV,
// electrical degrees, nanoseconds of duty), with the worst input and the documented bound.
//
//   rotorq-accuracy                        full sweep (sin_cos q31 over all 2^32 angles), terminal
//                                          table, report folder ./rotorq-report
//   rotorq-accuracy --quick                a reduced sweep (for tests)
//   rotorq-accuracy --config drive.cfg     the drive's scaling from a file of "name = value" lines
//   rotorq-accuracy --write-readme F       replace the table between the accuracy markers in F
//   rotorq-accuracy --check-readme F       fail if the table in F differs from this run
//   rotorq-accuracy --help                 every option
//
// Exit status: 1 when any function exceeds its bound, 2 on a usage or file error, 3 when
// --check-readme finds the README out of date.
#include <fmt/core.h>
#include <fmt/os.h>
#include <unistd.h>

#include <CLI/CLI.hpp>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "rotorq/accuracy/sweeps.hpp"
#include "rotorq/detail/newton.hpp"
#include "rotorq/detail/sine_table.hpp"
#include "rotorq/tools/readme_table.hpp"

namespace {

using rotorq::accuracy::error_stats;
using rotorq::accuracy::quantity;

constexpr const char* begin_marker = "<!-- accuracy-table:begin (rotorq-accuracy --write-readme) -->";
constexpr const char* end_marker = "<!-- accuracy-table:end -->";

// The drive the errors are stated for. The defaults are a made-up 48 V, 20 A drive with a
// four-pole-pair motor, switching at 20 kHz from a 100 MHz timer (centre-aligned period 2500).
struct drive_units {
  double current_full_scale = 20.0;  // A at q full scale (1.0)
  double bus_voltage = 48.0;         // V; voltages are per unit of the bus
  int pole_pairs = 4;
  double pwm_frequency = 20000.0;  // Hz
  double timer_period = 2500.0;    // compare counts at duty 1
};

struct physical_figure {
  double value = 0;
  const char* unit = "";
  double also = 0;  // a second view: mechanical degrees, or timer counts
  const char* also_unit = "";
};

physical_figure physical(const error_stats& r, const drive_units& u) {
  const double fraction = std::ldexp(r.max_abs, -r.fraction_bits);  // of full scale
  switch (r.kind) {
    case quantity::current:
      return {fraction * u.current_full_scale * 1e3, "mA"};
    case quantity::voltage:
      return {fraction * u.bus_voltage * 1e3, "mV"};
    case quantity::angle: {
      // an error e in sine or cosine of a unit vector is an angle error of at most e rad
      const double degrees = fraction * 180.0 / M_PI;
      return {degrees, "deg el", degrees / u.pole_pairs, "deg mech"};
    }
    case quantity::duty:
      return {fraction / u.pwm_frequency * 1e9, "ns", fraction * u.timer_period, "counts"};
    case quantity::rotor_angle: {
      const double degrees = fraction * 360.0;  // fraction of a turn
      return {degrees, "deg el", degrees / u.pole_pairs, "deg mech"};
    }
    case quantity::value:
      break;
  }
  return {};
}

std::string physical_text(const error_stats& r, const drive_units& u) {
  const physical_figure p = physical(r, u);
  if (p.unit[0] == '\0') return "-";
  std::string text = fmt::format("{:.4g} {}", p.value, p.unit);
  if (p.also_unit[0] != '\0') text += fmt::format(" ({:.3g} {})", p.also, p.also_unit);
  return text;
}

// A table cell: a literal | would end the cell.
std::string cell(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c == '|') out += '\\';
    out += c;
  }
  return out;
}

std::string markdown_table(const std::vector<error_stats>& rows, const rotorq::accuracy::sweep_options& o,
                           const drive_units& u) {
  std::string out;
  out += fmt::format(
      "Seed {}; error = result - exact value of the same inputs (clamped to the range), in LSB and for a "
      "{:g} A / {:g} V drive with {} pole pairs at {:g} kHz (timer period {:g}).\n\n",
      o.seed, u.current_full_scale, u.bus_voltage, u.pole_pairs, u.pwm_frequency / 1e3, u.timer_period);
  out += "| function | format | inputs | max abs error | in the drive | RMS | mean | bound |\n";
  out += "|---|---|---|---:|---:|---:|---:|---:|\n";
  for (const error_stats& r : rows) {
    out += fmt::format("| `{}` | {} | {} | {:.4f} | {} | {:.4f} | {:+.5f} | {:.2f} |\n", r.function, r.format,
                       cell(r.inputs), r.max_abs, physical_text(r, u), r.rms(), r.mean(), r.bound);
  }
  out += fmt::format(
      "\nsin_cos table: {} bytes of read-only data, shared by q15 and q31; 1/sqrt start table: {} bytes.\n",
      sizeof(rotorq::detail::sine_table), sizeof(rotorq::detail::reciprocal_sqrt_start));
  return out;
}

void print_terminal(const std::vector<error_stats>& rows, const drive_units& u) {
  fmt::print("{:<36} {:<4} {:>9} {:>26} {:>7} {:>9} {:>6}  {:<3} {}\n", "function", "fmt", "max|err|",
             "in the drive", "RMS", "mean", "bound", "ok", "worst input");
  uint64_t samples = 0;
  for (const error_stats& r : rows) {
    fmt::print("{:<36} {:<4} {:>9.4f} {:>26} {:>7.4f} {:>+9.5f} {:>6.2f}  {:<3} {}\n", r.function, r.format,
               r.max_abs, physical_text(r, u), r.rms(), r.mean(), r.bound, r.within_bound() ? "yes" : "NO",
               r.worst_input);
    samples += r.samples;
  }
  fmt::print("(errors in LSB of the output format; {} samples in all)\n", samples);
}

const char* kind_name(quantity k) {
  switch (k) {
    case quantity::current:
      return "current";
    case quantity::voltage:
      return "voltage";
    case quantity::angle:
      return "angle";
    case quantity::duty:
      return "duty";
    case quantity::rotor_angle:
      return "rotor angle";
    case quantity::value:
      break;
  }
  return "value";
}

nlohmann::json to_json(const std::vector<error_stats>& rows, const rotorq::accuracy::sweep_options& o,
                       const drive_units& u) {
  nlohmann::json j;
  j["seed"] = o.seed;
  j["random_inputs"] = o.random_inputs;
  j["exhaustive_sin_cos_q31"] = o.exhaustive_sin_cos_q31;
  j["drive"] = {{"current_full_scale_A", u.current_full_scale},
                {"bus_voltage_V", u.bus_voltage},
                {"pole_pairs", u.pole_pairs},
                {"pwm_frequency_Hz", u.pwm_frequency},
                {"timer_period_counts", u.timer_period}};
  for (const error_stats& r : rows) {
    const physical_figure p = physical(r, u);
    nlohmann::json row = {
        {"function", r.function},       {"format", r.format},           {"inputs", r.inputs},
        {"samples", r.samples},         {"max_abs_lsb", r.max_abs},     {"rms_lsb", r.rms()},
        {"mean_lsb", r.mean()},         {"bound_lsb", r.bound},         {"within_bound", r.within_bound()},
        {"worst_input", r.worst_input}, {"quantity", kind_name(r.kind)}};
    if (p.unit[0] != '\0') row["max_abs_physical"] = {{"value", p.value}, {"unit", p.unit}};
    if (p.also_unit[0] != '\0') row["max_abs_physical_also"] = {{"value", p.also}, {"unit", p.also_unit}};
    nlohmann::json counts = nlohmann::json::array();
    for (uint64_t c : r.errors.counts) counts.push_back(c);
    row["histogram"] = {{"first_edge_lsb", rotorq::accuracy::histogram::edge(0)},
                        {"bin_width_lsb", 1.0 / rotorq::accuracy::histogram::bins_per_lsb},
                        {"counts", counts},
                        {"below", r.errors.below},
                        {"above", r.errors.above}};
    j["rows"].push_back(row);
  }
  return j;
}

void write_csv(const std::filesystem::path& path, const std::vector<error_stats>& rows,
               const drive_units& u) {
  auto out = fmt::output_file(path.string());
  out.print(
      "function,format,inputs,samples,max_abs_lsb,rms_lsb,mean_lsb,bound_lsb,within_bound,"
      "max_abs_physical,unit,worst_input\n");
  for (const error_stats& r : rows) {
    const physical_figure p = physical(r, u);
    out.print("{},{},\"{}\",{},{:.6f},{:.6f},{:.6f},{:.4f},{},{:.6g},{},\"{}\"\n", r.function, r.format,
              r.inputs, r.samples, r.max_abs, r.rms(), r.mean(), r.bound, r.within_bound() ? 1 : 0, p.value,
              p.unit, r.worst_input);
  }
}

// Data files and gnuplot scripts for the plots; returns the plots that gnuplot rendered.
std::vector<std::string> write_plots(const std::filesystem::path& dir, const rotorq::accuracy::plot_data& d,
                                     const std::vector<error_stats>& rows) {
  namespace fs = std::filesystem;
  fs::create_directories(dir / "data");
  fs::create_directories(dir / "plots");
  {
    auto out = fmt::output_file((dir / "data" / "sin_cos_q15.dat").string());
    out.print("# angle_deg sin_error_lsb cos_error_lsb\n");
    for (size_t i = 0; i < d.q15_angle.size(); ++i) {
      out.print("{:.6f} {:.5f} {:.5f}\n", d.q15_angle[i] * 360.0, d.q15_sin[i], d.q15_cos[i]);
    }
  }
  if (!d.q31_angle.empty()) {
    auto out = fmt::output_file((dir / "data" / "sin_cos_q31.dat").string());
    out.print("# angle_deg lowest_error_lsb highest_error_lsb (per 65536 consecutive angles)\n");
    for (size_t i = 0; i < d.q31_angle.size(); ++i) {
      out.print("{:.6f} {:.5f} {:.5f}\n", d.q31_angle[i] * 360.0, d.q31_low[i], d.q31_high[i]);
    }
  }
  {
    auto out = fmt::output_file((dir / "data" / "park_map.dat").string());
    out.print("# alpha beta max_abs_error_lsb (park(v, sin_cos(theta)) q15, worst of 64 angles)\n");
    for (int row = 0; row < d.map_size; ++row) {
      for (int column = 0; column < d.map_size; ++column) {
        out.print("{:.4f} {:.4f} {:.5f}\n", -1.0 + 2.0 * column / (d.map_size - 1),
                  -1.0 + 2.0 * row / (d.map_size - 1),
                  d.park_map[static_cast<size_t>(row) * static_cast<size_t>(d.map_size) +
                             static_cast<size_t>(column)]);
      }
      out.print("\n");
    }
  }
  {
    auto out = fmt::output_file((dir / "data" / "histograms.dat").string());
    out.print("# error_lsb then the fraction of samples per bin for each row below\n");
    std::vector<const error_stats*> picked;
    for (const error_stats& r : rows) {
      if (r.function == "sin_cos" || r.function == "park(sin_cos(angle))" ||
          r.function == "svpwm (linear range)") {
        picked.push_back(&r);
      }
    }
    out.print("#");
    for (const error_stats* r : picked) out.print(" \"{} {}\"", r->function, r->format);
    out.print("\n");
    for (int i = 0; i < rotorq::accuracy::histogram::bin_count; ++i) {
      out.print("{:.4f}",
                rotorq::accuracy::histogram::edge(i) + 0.5 / rotorq::accuracy::histogram::bins_per_lsb);
      for (const error_stats* r : picked) {
        out.print(" {:.6g}", static_cast<double>(r->errors.counts[static_cast<size_t>(i)]) /
                                 static_cast<double>(r->samples));
      }
      out.print("\n");
    }
    auto gp = fmt::output_file((dir / "plots" / "histograms.gp").string());
    gp.print(
        "set terminal pngcairo size 900,500 noenhanced\nset output 'plots/histograms.png'\n"
        "set title 'Error histograms (fraction of samples per 1/16 LSB)'\nset xlabel 'error (LSB)'\n"
        "set xrange [-2:2]\nset key top left\nplot ");
    for (size_t k = 0; k < picked.size(); ++k) {
      gp.print("{}'data/histograms.dat' using 1:{} with steps title '{} {}'", k ? ", " : "", k + 2,
               picked[k]->function, picked[k]->format);
    }
    gp.print("\n");
  }
  {
    auto gp = fmt::output_file((dir / "plots" / "sin_cos_q15.gp").string());
    gp.print(
        "set terminal pngcairo size 900,450 noenhanced\nset output 'plots/sin_cos_q15.png'\n"
        "set title 'sin_cos q15: error at every one of the 65536 angles'\n"
        "set xlabel 'angle (electrical degrees)'\nset ylabel 'error (LSB)'\nset xrange [0:360]\n"
        "set yrange [-0.6:0.75]\nset xtics 45\nset key top right horizontal\n"
        "plot 'data/sin_cos_q15.dat' using 1:2 with points pt 7 ps 0.15 title 'sin', "
        "'' using 1:3 with points pt 7 ps 0.15 title 'cos', "
        "0.51 with lines dt 2 title 'bound +-0.51', -0.51 with lines dt 2 notitle\n");
  }
  if (!d.q31_angle.empty()) {
    auto gp = fmt::output_file((dir / "plots" / "sin_cos_q31.gp").string());
    gp.print(
        "set terminal pngcairo size 900,450 noenhanced\nset output 'plots/sin_cos_q31.png'\n"
        "set title 'sin_cos q31: lowest and highest error over all 2^32 angles, per 65536 angles'\n"
        "set xlabel 'angle (electrical degrees)'\nset ylabel 'error (LSB)'\nset xrange [0:360]\n"
        "set yrange [-2.5:2.5]\nset xtics 45\nset key bottom right horizontal\n"
        "plot 'data/sin_cos_q31.dat' using 1:2:3 with filledcurves title 'error range', "
        "2 with lines dt 2 title 'bound +-2', -2 with lines dt 2 notitle\n");
  }
  {
    auto gp = fmt::output_file((dir / "plots" / "park_map.gp").string());
    gp.print(
        "set terminal pngcairo size 700,600 noenhanced\nset output 'plots/park_map.png'\n"
        "set title 'park(v, sin_cos(theta)) q15: largest error over 64 rotor angles (LSB)'\n"
        "set xlabel 'alpha'\nset ylabel 'beta'\nset view map\nset size ratio -1\n"
        "splot 'data/park_map.dat' using 1:2:3 with pm3d notitle\n");
  }
  std::vector<std::string> rendered;
  for (const char* name : {"sin_cos_q15", "sin_cos_q31", "histograms", "park_map"}) {
    const fs::path script = dir / "plots" / (std::string(name) + ".gp");
    if (!fs::exists(script)) continue;
    const std::string command = "cd '" + dir.string() + "' && gnuplot 'plots/" + name + ".gp' 2>/dev/null";
    // NOLINTNEXTLINE(cert-env33-c): runs gnuplot on a script this tool wrote, in a folder it made
    if (std::system(command.c_str()) == 0) rendered.push_back(std::string("plots/") + name + ".png");
  }
  return rendered;
}

void write_summary(const std::filesystem::path& path, const std::string& table,
                   const std::vector<std::string>& plots, const std::vector<error_stats>& rows,
                   double seconds) {
  auto out = fmt::output_file(path.string());
  bool all_within = true;
  for (const error_stats& r : rows) all_within = all_within && r.within_bound();
  out.print("# rotorq accuracy report\n\n{}\n\n", all_within
                                                      ? "Every function is within its documented bound."
                                                      : "**Some functions exceed their bounds.**");
  out.print(
      "{}\nSweep time: {:.1f} s. Figures: results.csv and results.json (with error histograms); "
      "plot data in data/.\n\n",
      table, seconds);
  for (const std::string& p : plots) out.print("![{}]({})\n\n", p, p);
  if (plots.empty()) out.print("(No plots: gnuplot was not found or failed.)\n");
}

void draw_progress(double fraction) {
  const int width = 40;
  const int filled = static_cast<int>(fraction * width);
  fmt::print(stderr, "\rsin_cos q31, all 2^32 angles [{:<{}}] {:3.0f}%",
             std::string(static_cast<size_t>(filled), '#'), width, fraction * 100);
  if (fraction >= 1.0) fmt::print(stderr, "\n");
}

}  // namespace

static int run(int argc, char** argv) {
  rotorq::accuracy::sweep_options options;
  options.exhaustive_sin_cos_q31 = true;
  drive_units units;
  bool quick = false, markdown = false, no_report = false;
  std::string report_dir = "rotorq-report", write_readme, check_readme;

  CLI::App app{"rotorq accuracy report: every function against its double-precision twin"};
  app.set_config("--config", "", "Read options from a file of 'name = value' lines (# starts a comment)");
  app.add_flag("--quick", quick, "Reduced sweep: 20000 random inputs, 200000 random q31 angles");
  app.add_option("--seed", options.seed, "Seed of every random input")->capture_default_str();
  app.add_option("--threads", options.threads, "Threads for the exhaustive sweep (0: every core)")
      ->capture_default_str();
  app.add_option("--report", report_dir, "Folder for the report (summary.md, CSV, JSON, plots)")
      ->capture_default_str();
  app.add_flag("--no-report", no_report, "Print only; write no report folder");
  app.add_flag("--markdown", markdown, "Print the Markdown table instead of the terminal table");
  app.add_option("--write-readme", write_readme, "Replace the accuracy table in this README");
  app.add_option("--check-readme", check_readme, "Fail (status 3) if this README's table differs");
  app.add_option("--current-full-scale", units.current_full_scale, "Current at q full scale, A")
      ->capture_default_str()
      ->check(CLI::PositiveNumber);
  app.add_option("--bus-voltage", units.bus_voltage, "DC-bus voltage, V (voltages are per unit of it)")
      ->capture_default_str()
      ->check(CLI::PositiveNumber);
  app.add_option("--pole-pairs", units.pole_pairs, "Motor pole pairs")
      ->capture_default_str()
      ->check(CLI::PositiveNumber);
  app.add_option("--pwm-frequency", units.pwm_frequency, "PWM frequency, Hz")
      ->capture_default_str()
      ->check(CLI::PositiveNumber);
  app.add_option("--timer-period", units.timer_period, "Timer compare counts at duty 1")
      ->capture_default_str()
      ->check(CLI::PositiveNumber);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : 2;
  }
  if (quick) {
    options.random_inputs = 20'000;
    options.sin_cos_q31_angles = 200'000;
    options.exhaustive_sin_cos_q31 = false;
  }
  if (options.exhaustive_sin_cos_q31 && isatty(STDERR_FILENO)) options.progress = draw_progress;

  const auto start = std::chrono::steady_clock::now();
  rotorq::accuracy::plot_data plots;
  const std::vector<error_stats> rows = rotorq::accuracy::sweep_report(options, no_report ? nullptr : &plots);
  const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  const std::string table = markdown_table(rows, options, units);

  if (markdown) {
    fmt::print("{}", table);
  } else {
    print_terminal(rows, units);
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

  if (!no_report) {
    try {
      const std::filesystem::path dir = std::filesystem::absolute(report_dir);
      std::filesystem::create_directories(dir);
      std::ofstream(dir / "results.json") << to_json(rows, options, units).dump(2) << "\n";
      write_csv(dir / "results.csv", rows, units);
      const std::vector<std::string> rendered = write_plots(dir, plots, rows);
      write_summary(dir / "summary.md", table, rendered, rows, seconds);
      fmt::print("report written to {} ({} plots)\n", (dir / "summary.md").string(), rendered.size());
    } catch (const std::exception& e) {
      fmt::print(stderr, "rotorq-accuracy: cannot write the report to {}: {}\n", report_dir, e.what());
      return 2;
    }
  }

  const int readme =
      rotorq::tools::readme_step("rotorq-accuracy", "accuracy", write_readme, check_readme, begin_marker,
                                 end_marker, table, "rotorq-accuracy --no-report --write-readme");
  if (readme != 0) return readme;
  return status;
}

int main(int argc, char** argv) {
  try {
    return run(argc, argv);
  } catch (const std::exception& e) {
    fmt::print(stderr, "rotorq-accuracy: {}\n", e.what());
    return 2;
  }
}
