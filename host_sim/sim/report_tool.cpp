// rotorq-sim: the closed-loop simulation report. Runs each scenario file with the library's q15 and
// q31 controllers and their double twin (Hall angle), the q15 controller with the exact angle and in
// six-step only, and writes the figures (torque ripple, current tracking error, d-axis current,
// phase-current THD, angle-estimation error, the q15/q31/double differences, the hand-over, speed
// step and load step), the traces as CSV, gnuplot plots and a Markdown summary.
//
//   rotorq-sim --config host_sim/sim/scenarios/fan_24v.conf [--config ...] [--out DIR]
//   rotorq-sim --config ... --write-readme README.md     replace the table between the markers
//   rotorq-sim --config ... --check-readme README.md     fail (status 3) if it differs from this run
//   rotorq-sim --config ... --benchmark                   real-time factor of 1 s of simulated time
//
// A scenario file holds "name = value" lines (# starts a comment); --help-scenario lists every name
// with its unit and default. Exit status: 0, 2 on a usage or file error, 3 when --check-readme finds
// the README out of date.
#include <fmt/core.h>
#include <fmt/os.h>

#include <CLI/CLI.hpp>
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "rotorq/sim/simulation.hpp"
#include "rotorq/tools/readme_table.hpp"

namespace {

namespace fs = std::filesystem;
using namespace rotorq::sim;

constexpr const char* begin_marker = "<!-- simulation-table:begin (rotorq-sim --write-readme) -->";
constexpr const char* end_marker = "<!-- simulation-table:end -->";

// ---- scenario files ------------------------------------------------------------------------------

// Every scenario field as a named option, so a file of "name = value" lines sets them (CLI11's config
// reader, as rotorq-accuracy uses); unknown names are an error.
void bind(CLI::App& app, scenario& s) {
  machine_parameters& m = s.machine;
  inverter_parameters& i = s.inverter;
  app.add_option("--name", s.name, "Scenario name (file and plot names)");
  app.add_option("--description", s.description, "One line on what the scenario is");
  app.add_option("--resistance", m.resistance, "Phase resistance, ohm")->capture_default_str();
  app.add_option("--inductance-d", m.inductance_d, "d-axis inductance, H")->capture_default_str();
  app.add_option("--inductance-q", m.inductance_q, "q-axis inductance, H")->capture_default_str();
  app.add_option("--flux-linkage", m.flux_linkage, "Peak phase flux linkage of the magnets, V s")
      ->capture_default_str();
  app.add_option("--pole-pairs", m.pole_pairs, "Pole pairs")->capture_default_str();
  app.add_option("--inertia", m.inertia, "Rotor and load inertia, kg m^2")->capture_default_str();
  app.add_option("--viscous-friction", m.viscous_friction, "N m s/rad")->capture_default_str();
  app.add_option("--load-torque", m.load_torque, "Constant load torque against forward rotation, N m")
      ->capture_default_str();
  app.add_option("--load-quadratic", m.load_quadratic, "Fan load k in k W |W|, N m s^2/rad^2")
      ->capture_default_str();
  app.add_option("--locked-speed", m.locked_speed_rpm, "Dynamometer speed, rpm (< 0: free rotor)")
      ->capture_default_str();
  app.add_option("--bus-voltage", i.bus_voltage, "DC bus, V")->capture_default_str();
  app.add_option("--pwm-frequency", i.pwm_frequency, "PWM and control rate, Hz")->capture_default_str();
  app.add_option("--dead-time", i.dead_time, "Inverter dead time, s")->capture_default_str();
  app.add_option("--device-drop", i.device_drop, "Drop of a conducting switch or diode, V")
      ->capture_default_str();
  app.add_option("--current-ramp", i.current_ramp, "Width of the current sign for dead time and drop, A")
      ->capture_default_str();
  app.add_option("--adc-bits", s.adc.bits, "Current ADC resolution")
      ->capture_default_str()
      ->check(CLI::Range(8, 16));
  app.add_option("--adc-full-scale", s.adc.full_scale, "Current at the ADC's ends (+-), A")
      ->capture_default_str();
  const char* phase_names[3] = {"a", "b", "c"};
  for (size_t k = 0; k < 3; ++k) {
    app.add_option(fmt::format("--adc-offset-{}", phase_names[k]), s.adc.offset[k],
                   "Current sensor offset, A")
        ->capture_default_str();
    app.add_option(fmt::format("--adc-gain-error-{}", phase_names[k]), s.adc.gain_error[k],
                   "Current sensor gain error, relative")
        ->capture_default_str();
    app.add_option(fmt::format("--hall-edge-{}", phase_names[k]), s.hall.rising_deg[k],
                   "Hall sensor rising edge, electrical degrees (nominal 30, 150, 270)")
        ->capture_default_str();
  }
  app.add_option("--voltage-full-scale", s.voltage_full_scale, "Voltage at 1.0 of the controller, V")
      ->capture_default_str();
  app.add_option("--speed-full-scale", s.speed_full_scale_rpm, "Speed at 1.0 of the controller, rpm")
      ->capture_default_str();
  app.add_option("--current-bandwidth", s.current_bandwidth_hz, "FOC current loops, Hz")
      ->capture_default_str();
  app.add_option("--six-step-bandwidth", s.six_step_bandwidth_hz, "Six-step current loop, Hz")
      ->capture_default_str();
  app.add_option("--speed-bandwidth", s.speed_bandwidth_hz, "Speed loop, Hz")->capture_default_str();
  app.add_option("--speed-divider", s.speed_divider, "Speed loop every this many periods")
      ->capture_default_str();
  app.add_option("--current-limit", s.current_limit, "Largest torque current command, A")
      ->capture_default_str();
  app.add_option("--d-current", s.d_current, "Constant d-axis current in FOC, A")->capture_default_str();
  app.add_option("--voltage-margin", s.voltage_margin, "Used fraction of V_bus / sqrt(3)")
      ->capture_default_str();
  app.add_option("--foc-above", s.foc_above_rpm, "Hand-over to FOC above, rpm (< 0: FOC at once)")
      ->capture_default_str();
  app.add_option("--six-step-below", s.six_step_below_rpm, "Back to six-step below, rpm")
      ->capture_default_str();
  app.add_option("--capture-timer", s.capture_timer_hz, "Timer dating Hall edges and control steps, Hz")
      ->capture_default_str();
  app.add_option("--pwm-timer", s.pwm_timer_hz, "PWM counter clock, Hz")->capture_default_str();
  app.add_option("--min-pulse", s.min_pulse, "Minimum pulse of duty_to_compare, s")->capture_default_str();
  app.add_option("--control-delay", s.control_delay, "Periods from sample to applied voltage (0 or 1)")
      ->capture_default_str()
      ->check(CLI::Range(0, 1));
  app.add_option("--substeps", s.substeps, "RK4 steps per PWM period")
      ->capture_default_str()
      ->check(CLI::Range(1, 1000));
  app.add_option("--duration", s.duration, "Simulated time, s")
      ->capture_default_str()
      ->check(CLI::Range(1e-3, 100.0));
  app.add_option("--speed-ramp", s.speed_ramp, "Start-up ramp of the speed reference, rpm/s")
      ->capture_default_str();
  app.add_option("--speed-1", s.speed_1, "First speed reference, rpm")->capture_default_str();
  app.add_option("--speed-step-time", s.speed_step_time, "Time of the speed step, s")->capture_default_str();
  app.add_option("--speed-2", s.speed_2, "Speed reference after the step, rpm")->capture_default_str();
  app.add_option("--load-step-time", s.load_step_time, "Time of the load step, s")->capture_default_str();
  app.add_option("--load-step-torque", s.load_step_torque, "Constant load added at the step, N m")
      ->capture_default_str();
  app.add_option("--speed-control", s.speed_control, "Speed loop on (else a constant torque current)")
      ->capture_default_str();
  app.add_option("--torque-current", s.torque_current, "Torque current without the speed loop, A")
      ->capture_default_str();
  app.add_option("--steady-start", s.steady_start, "Start of the steady window the figures use, s")
      ->capture_default_str();
  app.add_option("--steady-end", s.steady_end, "End of the steady window, s")->capture_default_str();
}

scenario read_scenario(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw std::runtime_error("cannot read " + path);
  scenario s;
  s.name = fs::path(path).stem().string();
  CLI::App app{"scenario"};
  app.allow_config_extras(false);
  bind(app, s);
  try {
    app.parse_from_stream(in);
  } catch (const CLI::Error& e) {
    throw std::runtime_error(path + ": " + e.what());
  }
  if (!(s.steady_end > s.steady_start) || s.steady_end > s.duration + 1e-12) {
    throw std::runtime_error(path + ": the steady window must lie inside the run");
  }
  if (const std::string problem = problem_with(s); !problem.empty())
    throw std::runtime_error(path + ": " + problem);
  return s;
}

// ---- the runs of a scenario ----------------------------------------------------------------------

struct run_case {
  const char* label = "";  // file names
  const char* title = "";  // tables
  run_options options;
};
const run_case cases[] = {
    {"q15_hall", "q15, Hall", {arithmetic::q15, angle_input::hall, false, true}},
    {"q31_hall", "q31, Hall", {arithmetic::q31, angle_input::hall, false, true}},
    {"double_hall", "double, Hall", {arithmetic::reference, angle_input::hall, false, true}},
    {"q15_exact", "q15, exact angle", {arithmetic::q15, angle_input::exact, false, true}},
    {"q15_six_step", "q15, six-step only", {arithmetic::q15, angle_input::hall, true, true}},
};
constexpr size_t case_count = sizeof(cases) / sizeof(cases[0]);
constexpr size_t double_case = 2;

struct scenario_result {
  scenario s;
  std::vector<run_result> runs;
  std::vector<window_figures> steady;
  std::vector<event_figures> events;
  double host_seconds = 0;
};

scenario_result run_scenario(const scenario& s) {
  scenario_result out;
  out.s = s;
  for (const run_case& c : cases) {
    out.runs.push_back(run(s, c.options));
    out.steady.push_back(figures(out.runs.back(), s.steady_start, s.steady_end));
    out.events.push_back(events(s, out.runs.back()));
    out.host_seconds += out.runs.back().host_seconds;
  }
  return out;
}

// Torque difference to the double controller, in % of its mean torque over the window.
double torque_difference(const scenario_result& r, size_t k) {
  const double reference = r.steady[double_case].mean_torque;
  return 100.0 * (r.steady[k].mean_torque - reference) / std::fabs(reference);
}
// The RMS over the window of the q15 (or q31) torque minus the double controller's, sample by sample,
// in % of the mean: how far the three runs' trajectories stay apart.
double torque_rms_difference(const scenario_result& r, size_t k) {
  const run_result& a = r.runs[k];
  const run_result& b = r.runs[double_case];
  double sum = 0;
  int n = 0;
  for (size_t i = 0; i < a.trace.size() && i < b.trace.size(); ++i) {
    if (a.trace[i].time < r.s.steady_start || a.trace[i].time >= r.s.steady_end) continue;
    const double d = a.trace[i].torque - b.trace[i].torque;
    sum += d * d;
    ++n;
  }
  return n == 0 ? 0.0 : 100.0 * std::sqrt(sum / n) / std::fabs(r.steady[double_case].mean_torque);
}

// A value rounded to `digits` decimals with its sign, and no "-0" for a value that rounds to zero.
std::string signed_fixed(double x, int digits) {
  const double scale = std::pow(10.0, digits);
  const double rounded = std::round(x * scale) / scale;
  return fmt::format("{:+.{}f}", rounded == 0 ? 0.0 : rounded, digits);
}

std::string ms_or_dash(double seconds) { return seconds < 0 ? "-" : fmt::format("{:.1f}", seconds * 1e3); }

// ---- tables --------------------------------------------------------------------------------------

std::string figures_table(const std::vector<scenario_result>& results) {
  std::string out;
  out +=
      "| scenario | controller | torque ripple (%) | current error RMS (A) | i_d mean (A) | phase-current "
      "THD (%) "
      "| angle error RMS / max (deg el) | mean torque (N m) | vs double: mean / RMS (%) |\n";
  out += "|---|---|---:|---:|---:|---:|---:|---:|---:|\n";
  for (const scenario_result& r : results) {
    for (size_t k = 0; k < case_count; ++k) {
      const window_figures& w = r.steady[k];
      const bool compared = k < double_case;
      out += fmt::format("| {} | {} | {:.2f} | {:.4f} | {} | {:.2f} | {:.2f} / {:.2f} | {:.4f} | {} |\n",
                         r.s.name, cases[k].title, w.ripple_percent, w.current_error_rms,
                         signed_fixed(w.i_d_mean, 4), w.thd_percent, w.angle_error_rms_deg,
                         w.angle_error_max_deg, w.mean_torque,
                         compared ? fmt::format("{} / {:.4f}", signed_fixed(torque_difference(r, k), 4),
                                                torque_rms_difference(r, k))
                                  : std::string(k == double_case ? "(reference)" : "-"));
    }
  }
  return out;
}

std::string events_table(const std::vector<scenario_result>& results) {
  std::string out;
  out +=
      "| scenario | controller | hand-over to FOC (ms) | speed step: within 2 % after (ms) | load step: "
      "speed dip (rpm) |\n";
  out += "|---|---|---:|---:|---:|\n";
  for (const scenario_result& r : results) {
    for (size_t k = 0; k < case_count; ++k) {
      if (k == 3) continue;  // the exact-angle run starts like the others
      const event_figures& e = r.events[k];
      out += fmt::format("| {} | {} | {} | {} | {:.1f} |\n", r.s.name, cases[k].title,
                         ms_or_dash(e.handover_time), ms_or_dash(e.speed_step_settle), e.load_step_dip_rpm);
    }
  }
  return out;
}

std::string readme_table(const std::vector<scenario_result>& results) {
  std::string out;
  out +=
      "Steady window of each scenario (after the start-up, before the speed step); torque ripple is "
      "peak to peak over the window in % of its mean; the current error is the command minus the true "
      "current in the controller's frame; THD of phase a to the 50th harmonic.\n\n";
  out += figures_table(results);
  out += "\n";
  out += events_table(results);
  return out;
}

// ---- files ---------------------------------------------------------------------------------------

void write_trace(const fs::path& path, const run_result& r, int every, double until = 1e300) {
  auto out = fmt::output_file(path.string());
  out.print(
      "time_s,torque_Nm,i_d_A,i_q_A,i_d_ref_A,i_q_ref_A,i_a_A,i_b_A,i_c_A,speed_rpm,speed_ref_rpm,"
      "speed_estimate_rpm,angle_error_deg,current_command_A,foc\n");
  for (size_t k = 0; k < r.trace.size() && r.trace[k].time <= until; k += static_cast<size_t>(every)) {
    const trace_point& t = r.trace[k];
    out.print(
        "{:.6f},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.5g},{:.6g},{}"
        "\n",
        t.time, t.torque, t.i_d, t.i_q, t.i_d_ref, t.i_q_ref, t.i_a, t.i_b, t.i_c, t.speed_rpm,
        t.speed_ref_rpm, t.speed_estimate_rpm, t.angle_error_deg, t.current_command, t.foc ? 1 : 0);
  }
}

void write_figures_csv(const fs::path& path, const std::vector<scenario_result>& results) {
  auto out = fmt::output_file(path.string());
  out.print(
      "scenario,controller,angle,six_step_only,window_start_s,window_end_s,mean_torque_Nm,min_torque_Nm,"
      "max_torque_Nm,ripple_percent,current_error_rms_A,i_d_mean_A,i_d_rms_A,fundamental_A,thd_percent,"
      "angle_error_rms_deg,angle_error_max_deg,speed_mean_rpm,foc_fraction,torque_vs_double_percent,"
      "torque_rms_vs_double_percent,handover_s,speed_step_settle_s,load_step_dip_rpm,host_s\n");
  for (const scenario_result& r : results) {
    for (size_t k = 0; k < case_count; ++k) {
      const window_figures& w = r.steady[k];
      const event_figures& e = r.events[k];
      const run_options& o = cases[k].options;
      out.print(
          "{},{},{},{},{},{},{:.8g},{:.8g},{:.8g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:."
          "6g},"
          "{:.4g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.4g}\n",
          r.s.name, name_of(o.math), name_of(o.angle), o.six_step_only ? 1 : 0, w.start, w.end, w.mean_torque,
          w.min_torque, w.max_torque, w.ripple_percent, w.current_error_rms, w.i_d_mean, w.i_d_rms,
          w.fundamental, w.thd_percent, w.angle_error_rms_deg, w.angle_error_max_deg, w.speed_mean_rpm,
          w.foc_fraction, torque_difference(r, k), k < double_case ? torque_rms_difference(r, k) : 0.0,
          e.handover_time, e.speed_step_settle, e.load_step_dip_rpm, r.runs[k].host_seconds);
    }
  }
}

// Torque of two runs, sample by sample, over a short span of the steady window (a few electrical
// turns), for the six-step-beside-FOC plot.
void write_span(const fs::path& path, const scenario_result& r, double start, double end) {
  auto out = fmt::output_file(path.string());
  out.print("# time_ms torque_foc torque_six_step i_a_foc i_a_six_step (q15, Hall)\n");
  const run_result& foc = r.runs[0];
  const run_result& six = r.runs[4];
  const size_t first = static_cast<size_t>(start / foc.substep),
               last = static_cast<size_t>(end / foc.substep);
  const auto per_period = static_cast<size_t>(r.s.substeps);
  for (size_t k = first; k < last && k < foc.substep_torque.size() && k < six.substep_torque.size(); ++k) {
    const size_t period = k / per_period;
    out.print("{:.5f} {:.6g} {:.6g} {:.6g} {:.6g}\n", static_cast<double>(k + 1) * foc.substep * 1e3,
              foc.substep_torque[k], six.substep_torque[k], foc.trace[period].i_a, six.trace[period].i_a);
  }
}

// The start-up plot's span: twice the time to the hand-over, at least 50 ms.
double start_span(const scenario_result& r) { return std::max(2 * r.events[0].handover_time, 0.05); }

std::vector<std::string> write_plots(const fs::path& dir, const scenario_result& r) {
  const std::string& n = r.s.name;
  const fs::path data = dir / "data";
  const double handover = r.events[0].handover_time;
  // a few electrical turns in the middle of the steady window
  const double f_e = r.steady[0].speed_mean_rpm / 60.0 * r.s.machine.pole_pairs;
  const double turns = 3.0;
  const double middle = (r.s.steady_start + r.s.steady_end) / 2;
  const double span = f_e > 0 ? std::min(turns / f_e, r.s.steady_end - r.s.steady_start) : 0.02;
  write_span(data / (n + "_span.dat"), r, middle - span / 2, middle + span / 2);
  const std::string overview = fmt::format(
      "set terminal pngcairo size 1100,900 noenhanced\nset output 'plots/{0}_overview.png'\n"
      "set datafile separator ','\nset multiplot layout 3,1 title '{0}: q15 controller, Hall angle (six-step "
      "until the hand-over at {1:.1f} ms)'\nset xlabel 'time (s)'\nset grid\n"
      "set arrow 1 from {2},graph 0 to {2},graph 1 nohead dt 2\n"
      "set ylabel 'torque (N m)'\nplot 'data/{0}_q15_hall.csv' using 1:2 with lines title 'q15', "
      "'data/{0}_double_hall.csv' using 1:2 with lines dt 3 title 'double'\n"
      "set ylabel 'current (A)'\nplot 'data/{0}_q15_hall.csv' using 1:3 with lines title 'i_d', '' using 1:4 "
      "with lines title 'i_q', '' using 1:6 with lines dt 2 title 'i_q command'\n"
      "set ylabel 'speed (rpm)'\nplot 'data/{0}_q15_hall.csv' using 1:10 with lines title 'speed', '' using "
      "1:11 "
      "with lines dt 2 title 'reference', '' using 1:12 with lines title 'Hall estimate'\nunset multiplot\n",
      n, handover * 1e3, handover);
  const std::string phases = fmt::format(
      "set terminal pngcairo size 1100,500 noenhanced\nset output 'plots/{0}_start_currents.png'\n"
      "set datafile separator ','\nset title '{0}: phase currents through start-up and hand-over (q15, "
      "Hall)'\n"
      "set xlabel 'time (s)'\nset ylabel 'current (A)'\nset grid\nset xrange [0:{1}]\n"
      "set arrow 1 from {2},graph 0 to {2},graph 1 nohead dt 2\n"
      "plot 'data/{0}_q15_hall_start.csv' using 1:7 with lines title 'i_a', '' using 1:8 with lines title "
      "'i_b', '' "
      "using 1:9 with lines title 'i_c'\n",
      n, start_span(r), handover);
  const std::string beside = fmt::format(
      "set terminal pngcairo size 1100,700 noenhanced\nset output 'plots/{0}_six_step_vs_foc.png'\n"
      "set multiplot layout 2,1 title '{0}: six-step beside FOC at the same operating point (q15, Hall, "
      "three "
      "electrical turns)'\nset xlabel 'time (ms)'\nset grid\nset ylabel 'torque (N m)'\n"
      "plot 'data/{0}_span.dat' using 1:3 with lines title 'six-step', '' using 1:2 with lines lw 2 title "
      "'FOC'\n"
      "set ylabel 'phase a current (A)'\nplot 'data/{0}_span.dat' using 1:5 with lines title 'six-step', '' "
      "using "
      "1:4 with lines lw 2 title 'FOC'\nunset multiplot\n",
      n);
  const std::string arithmetic_plot = fmt::format(
      "set terminal pngcairo size 1100,450 noenhanced\nset output 'plots/{0}_arithmetic.png'\n"
      "set datafile separator ','\nset title '{0}: torque of the q15 and q31 controllers minus the double "
      "controller (Hall angle)'\nset xlabel 'time (s)'\nset ylabel 'torque difference (N m)'\nset grid\n"
      "plot '< paste -d, data/{0}_q15_hall.csv data/{0}_double_hall.csv' using 1:($2-$17) with lines title "
      "'q15 - double', '< paste -d, data/{0}_q31_hall.csv data/{0}_double_hall.csv' using 1:($2-$17) with "
      "lines title 'q31 - double'\n",
      n);
  std::vector<std::string> rendered;
  const std::pair<std::string, std::string> scripts[] = {{n + "_overview", overview},
                                                         {n + "_start_currents", phases},
                                                         {n + "_six_step_vs_foc", beside},
                                                         {n + "_arithmetic", arithmetic_plot}};
  for (const auto& [name, text] : scripts) {
    const fs::path script = dir / "plots" / (name + ".gp");
    std::ofstream(script) << text;
    const std::string command = "cd '" + dir.string() + "' && gnuplot 'plots/" + name + ".gp' 2>/dev/null";
    // NOLINTNEXTLINE(cert-env33-c): runs gnuplot on a script this tool wrote, in a folder it made
    if (std::system(command.c_str()) == 0) rendered.push_back("plots/" + name + ".png");
  }
  return rendered;
}

std::string scenario_text(const scenario& s) {
  const machine_parameters& m = s.machine;
  return fmt::format(
      "{}\n\nMachine: R = {:g} ohm, L_d = {:g} mH, L_q = {:g} mH, psi = {:g} V s, {} pole pairs, J = {:g} kg "
      "m^2, "
      "B = {:g} N m s, load {:g} N m + {:g} W|W|. Inverter: {:g} V bus, {:g} kHz, dead time {:g} ns, device "
      "drop {:g} V. "
      "Current ADC: {} bits over +-{:g} A, offsets {:g}/{:g}/{:g} A, gain errors {:g}/{:g}/{:g}. Hall edges "
      "at "
      "{:g}/{:g}/{:g} degrees (nominal 30/150/270). Loops: current {:g} Hz, six-step {:g} Hz, speed {:g} Hz; "
      "hand-over at {:g} rpm. Timeline: ramp at {:g} rpm/s to {:g} rpm, step to {:g} rpm at {:g} s, load "
      "+{:g} N m "
      "at {:g} s, end {:g} s; steady window [{:g}, {:g}] s. RK4, {} substeps per period ({:.3g} us).\n",
      s.description, m.resistance, m.inductance_d * 1e3, m.inductance_q * 1e3, m.flux_linkage, m.pole_pairs,
      m.inertia, m.viscous_friction, m.load_torque, m.load_quadratic, s.inverter.bus_voltage,
      s.inverter.pwm_frequency / 1e3, s.inverter.dead_time * 1e9, s.inverter.device_drop, s.adc.bits,
      s.adc.full_scale, s.adc.offset[0], s.adc.offset[1], s.adc.offset[2], s.adc.gain_error[0],
      s.adc.gain_error[1], s.adc.gain_error[2], s.hall.rising_deg[0], s.hall.rising_deg[1],
      s.hall.rising_deg[2], s.current_bandwidth_hz, s.six_step_bandwidth_hz, s.speed_bandwidth_hz,
      s.foc_above_rpm, s.speed_ramp, s.speed_1, s.speed_2, s.speed_step_time, s.load_step_torque,
      s.load_step_time, s.duration, s.steady_start, s.steady_end, s.substeps,
      1e6 / (s.inverter.pwm_frequency * s.substeps));
}

void write_summary(const fs::path& path, const std::vector<scenario_result>& results,
                   const std::vector<std::vector<std::string>>& plots) {
  auto out = fmt::output_file(path.string());
  out.print("# rotorq closed-loop simulation\n\n");
  out.print(
      "Each scenario runs five times: the library's q15 and q31 controllers and their double twin with the "
      "angle from the Hall tracker, the q15 controller with the exact angle, and the q15 controller in "
      "six-step throughout (the same start-up without the hand-over). All start in six-step from standstill "
      "and hand over to FOC, except the six-step run.\n\n");
  out.print("{}\n", readme_table(results));
  double simulated = 0, host = 0;
  for (size_t k = 0; k < results.size(); ++k) {
    const scenario_result& r = results[k];
    simulated += r.s.duration * static_cast<double>(case_count);
    host += r.host_seconds;
    out.print("## {}\n\n{}\n", r.s.name, scenario_text(r.s));
    for (const std::string& p : plots[k]) out.print("![{}]({})\n\n", p, p);
    if (plots[k].empty()) out.print("(No plots: gnuplot was not found or failed.)\n\n");
  }
  out.print(
      "Host time: {:.2f} s for {:.2f} s of simulated time ({:.0f} x real time, every run recorded). Traces: "
      "data/<scenario>_<run>.csv (every 4th period; _start: every period of the start-up), figures: "
      "figures.csv.\n",
      host, simulated, simulated / host);
}

// Real-time factor: 1 s of simulated time (a copy of the scenario cut or extended to 1 s), without
// recording, best of three.
void benchmark(const std::vector<scenario>& scenarios) {
  fmt::print("{:<12} {:<20} {:>16} {:>12}\n", "scenario", "controller", "host s per sim s", "real time x");
  for (scenario s : scenarios) {
    s.duration = 1.0;
    for (const arithmetic a : {arithmetic::q15, arithmetic::q31, arithmetic::reference}) {
      double best = 1e9;
      for (int k = 0; k < 3; ++k)
        best = std::min(best, run(s, run_options{a, angle_input::hall, false, false}).host_seconds);
      fmt::print("{:<12} {:<20} {:>16.4f} {:>12.1f}\n", s.name, std::string(name_of(a)) + ", Hall", best,
                 1.0 / best);
    }
  }
  fmt::print("(1 s at {:g} kHz control rate with RK4 substeps, one core, no trace recorded)\n",
             scenarios.empty() ? 0.0 : scenarios.front().inverter.pwm_frequency / 1e3);
}

int run_tool(int argc, char** argv) {
  std::vector<std::string> configs;
  std::string out_dir = "rotorq-sim-report", write_readme, check_readme;
  bool no_report = false, run_benchmark = false, help_scenario = false;
  CLI::App app{"rotorq closed-loop simulation: the library's controllers on a simulated PMSM drive"};
  app.add_option("--config", configs, "Scenario file of 'name = value' lines (repeat for several)");
  app.add_option("--out", out_dir, "Folder for the report (summary.md, figures.csv, traces, plots)")
      ->capture_default_str();
  app.add_flag("--no-report", no_report, "Print only; write no report folder");
  app.add_option("--write-readme", write_readme, "Replace the simulation table in this README");
  app.add_option("--check-readme", check_readme, "Fail (status 3) if this README's table differs");
  app.add_flag("--benchmark", run_benchmark, "Print the real-time factor instead of the report");
  app.add_flag("--help-scenario", help_scenario, "List every scenario setting with its default");
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : 2;
  }
  if (help_scenario) {
    scenario s;
    CLI::App names{
        "Scenario settings: one 'name = value' per line in a scenario file, each name written "
        "without its dashes (resistance = 0.6); # starts a comment"};
    bind(names, s);
    fmt::print("{}", names.help());
    return 0;
  }
  if (configs.empty()) {
    fmt::print(stderr, "rotorq-sim: give at least one --config (scenario file); --help lists the options\n");
    return 2;
  }
  std::vector<scenario> scenarios;
  try {
    for (const std::string& path : configs) scenarios.push_back(read_scenario(path));
  } catch (const std::exception& e) {
    fmt::print(stderr, "rotorq-sim: {}\n", e.what());
    return 2;
  }
  if (run_benchmark) {
    benchmark(scenarios);
    return 0;
  }

  std::vector<scenario_result> results;
  for (const scenario& s : scenarios) results.push_back(run_scenario(s));
  const std::string table = readme_table(results);
  fmt::print("{}", table);

  if (!no_report) {
    try {
      const fs::path dir = fs::absolute(out_dir);
      fs::create_directories(dir / "data");
      fs::create_directories(dir / "plots");
      std::vector<std::vector<std::string>> plots;
      for (const scenario_result& r : results) {
        for (size_t k = 0; k < case_count; ++k) {
          write_trace(dir / "data" / (r.s.name + "_" + cases[k].label + ".csv"), r.runs[k], 4);
        }
        write_trace(dir / "data" / (r.s.name + "_q15_hall_start.csv"), r.runs[0], 1, start_span(r));
        plots.push_back(write_plots(dir, r));
      }
      write_figures_csv(dir / "figures.csv", results);
      write_summary(dir / "summary.md", results, plots);
      size_t count = 0;
      for (const auto& p : plots) count += p.size();
      fmt::print("report written to {} ({} plots)\n", (dir / "summary.md").string(), count);
    } catch (const std::exception& e) {
      fmt::print(stderr, "rotorq-sim: cannot write the report to {}: {}\n", out_dir, e.what());
      return 2;
    }
  }

  if (const int status =
          rotorq::tools::readme_step("rotorq-sim", "simulation", write_readme, check_readme, begin_marker,
                                     end_marker, table, "bash scripts/simulate --write-readme");
      status != 0) {
    return status;
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  try {
    return run_tool(argc, argv);
  } catch (const std::exception& e) {
    fmt::print(stderr, "rotorq-sim: {}\n", e.what());
    return 2;
  }
}
