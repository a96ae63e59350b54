// The closed-loop simulation (host_sim/sim) against outside facts: the plant alone (a locked-rotor
// voltage step is an RL circuit, an unloaded motor runs where its back-EMF equals the applied
// voltage, the energy ledger balances), then the controllers on it (the six-step torque geometry,
// FOC torque ripple with the exact and the Hall angle, the PMSM torque equation, the agreement of the
// q15, q31 and double controllers) and the choice of integration step. The machines are made up for
// these tests; the windows are short so the suite stays fast.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <vector>

#include "rotorq/sim/simulation.hpp"

namespace {

using namespace rotorq::sim;

constexpr double two_pi = 6.283185307179586476925286766559;

// A made-up salient machine (interior magnets, L_d < L_q), 10 pole pairs.
machine_parameters salient_machine() {
  machine_parameters m;
  m.resistance = 0.12;
  m.inductance_d = 0.2e-3;
  m.inductance_q = 0.3e-3;
  m.flux_linkage = 0.04;
  m.pole_pairs = 10;
  m.inertia = 0.05;
  return m;
}
// A made-up non-salient machine (surface magnets), 4 pole pairs.
machine_parameters round_machine() {
  machine_parameters m;
  m.resistance = 0.6;
  m.inductance_d = m.inductance_q = 0.8e-3;
  m.flux_linkage = 0.006;
  m.pole_pairs = 4;
  m.inertia = 5e-5;
  return m;
}

// A drive on a dynamometer: the speed is held, the controller holds a torque current.
scenario dynamometer(const machine_parameters& m, double rpm, double current, double bus,
                     double adc_full_scale) {
  scenario s;
  s.name = "test";
  s.machine = m;
  s.machine.locked_speed_rpm = rpm;
  s.inverter.bus_voltage = bus;
  s.adc.full_scale = adc_full_scale;
  s.voltage_full_scale = 2 * bus;
  s.speed_full_scale_rpm = 4 * rpm + 100;
  s.current_bandwidth_hz = 800;
  s.speed_control = false;
  s.torque_current = current;
  s.foc_above_rpm = -1;  // FOC from the first period
  return s;
}

// The period-by-period duties that put the average voltage vector v (alpha, beta; V) on the machine.
inverter_command duties_for(double alpha, double beta, double bus) {
  const double a = alpha, b = -alpha / 2 + std::sqrt(3.0) / 2 * beta,
               c = -alpha / 2 - std::sqrt(3.0) / 2 * beta;
  return {leg_command{leg_mode::switched, 0.5 + a / bus}, leg_command{leg_mode::switched, 0.5 + b / bus},
          leg_command{leg_mode::switched, 0.5 + c / bus}};
}

// A voltage step on a locked rotor is an RL circuit on each axis (circuit theory, any handbook):
// i(t) = V/R (1 - e^(-t R/L)), with L = L_d along the magnet axis and L_q across it; the rotor does
// not move, so there is no back-EMF and no coupling. RK4 at 8 steps per 50 us period, against
// tau = L/R of 1.7 and 2.5 ms, is far more accurate than the bound (1e-9 of V/R).
TEST(SimulationPlant, LockedRotorVoltageStepIsAnRLResponse) {
  machine_parameters m = salient_machine();
  m.locked_speed_rpm = 0;
  inverter_parameters inv;
  inv.bus_voltage = 24;
  for (const bool q_axis : {false, true}) {
    plant p(m, inv, hall_sensors{}, 8);
    // a voltage along alpha lies along d with the d axis at 0 degrees, and along -q with the d axis
    // at 90 degrees (q = -alpha sin theta + beta cos theta)
    const double theta = q_axis ? two_pi / 4 : 0.0;
    p.state().angle = theta / m.pole_pairs;
    const double volts = 1.5;
    const inverter_command command = duties_for(volts, 0.0, inv.bus_voltage);
    const double inductance = q_axis ? m.inductance_q : m.inductance_d;
    const double expected_sign = q_axis ? -1.0 : 1.0;
    std::array<hall_edge_event, 16> edges{};
    int n = 0;
    double worst = 0;
    for (int k = 1; k <= 400; ++k) {  // 20 ms: 8 to 12 time constants
      p.run_period(command, edges, n, [](double, const machine_state&) {});
      const double t = k / inv.pwm_frequency;
      const double want = volts / m.resistance * (1 - std::exp(-t * m.resistance / inductance));
      const double got = expected_sign * (q_axis ? p.state().i_q : p.state().i_d);
      worst = std::max(worst, std::fabs(got - want));
      EXPECT_NEAR(q_axis ? p.state().i_d : p.state().i_q, 0.0, 1e-12);
    }
    EXPECT_LE(worst, 1e-9 * volts / m.resistance) << (q_axis ? "q axis" : "d axis");
    EXPECT_EQ(p.state().speed, 0.0);
  }
}

// Without load or friction an unloaded motor accelerates until its back-EMF takes all of the
// applied voltage: with v_q = V and v_d = 0 held in the rotor frame, steady state has T = 0, so
// i_q = 0 and (from v_d = R i_d - w L_q i_q) i_d = 0, and v_q = w psi: w = V / psi electrical
// (the steady-state PMSM voltage equations, Krause et al., Analysis of Electric Machinery and Drive
// Systems, from memory). The voltage is placed at the middle of each period's rotation; the
// period-average of a vector turning by w T is shorter by (w T)^2 / 24, 4e-5 here: bound 1e-4. Within
// the period the vector swings +-w T / 2 about q, so i_d ripples by about V (w T / 2) T / (4 L_d),
// 1 mA, at the period boundaries where it is read: bound 2 mA.
TEST(SimulationPlant, UnloadedMotorRunsWhereBackEmfEqualsTheVoltage) {
  machine_parameters m = round_machine();
  m.flux_linkage = 0.01;
  m.inertia = 2e-5;
  inverter_parameters inv;
  inv.bus_voltage = 24;
  plant p(m, inv, hall_sensors{}, 8);
  const double volts = 6.0;
  const double period = 1 / inv.pwm_frequency;
  std::array<hall_edge_event, 16> edges{};
  int n = 0;
  for (int k = 0; k < 4000; ++k) {  // 0.2 s, about 40 mechanical time constants
    const double mid = p.electrical_angle() + m.pole_pairs * p.state().speed * period / 2;
    p.run_period(duties_for(-volts * std::sin(mid), volts * std::cos(mid), inv.bus_voltage), edges, n,
                 [](double, const machine_state&) {});
  }
  const double electrical_speed = m.pole_pairs * p.state().speed;
  EXPECT_NEAR(electrical_speed / (volts / m.flux_linkage), 1.0, 1e-4);
  EXPECT_NEAR(p.state().i_q, 0.0, 2e-3);
  EXPECT_NEAR(p.state().i_d, 0.0, 2e-3);
}

// Energy is conserved (the power balance of the machine equations; any text on electromechanical
// energy conversion, e.g. Krause et al., from memory): the electrical input, summed over the phases
// as terminal voltage times current, equals copper loss + friction + load work + the change of the
// stored magnetic and kinetic energy. Checked over a closed-loop start-up with dead time and device
// drops, six-step commutation (floating legs), the hand-over and a load step; the residue is the
// integration error (1e-9), once the magnetic energy of the tiny currents removed when a floating
// leg's current is set to zero is counted (itself below 1e-5 of the input).
TEST(SimulationPlant, EnergyBalances) {
  scenario s;
  s.machine = round_machine();
  s.machine.viscous_friction = 2e-6;
  s.machine.load_quadratic = 2.4e-6;
  s.inverter.dead_time = 500e-9;
  s.inverter.device_drop = 0.3;
  s.adc.full_scale = 10;
  s.current_limit = 6;
  s.speed_ramp = 20000;
  s.speed_1 = 1500;
  s.speed_full_scale_rpm = 4000;
  s.speed_bandwidth_hz = 15;
  s.load_step_time = 0.12;
  s.load_step_torque = 0.03;
  s.duration = 0.2;
  const run_result r = run(s, run_options{});
  ASSERT_GT(r.handover_time, 0.0) << "the run should reach FOC";
  const machine_state& e = r.final_state;
  const double stored = r.final_magnetic_energy + r.final_kinetic_energy - r.initial_kinetic_energy;
  const double out =
      e.copper_loss + e.friction_loss + e.load_work + stored - e.dynamometer_work + e.commutation_residue;
  EXPECT_GT(e.energy_in, 0.5);  // J: the test is not trivially small
  EXPECT_NEAR(out / e.energy_in, 1.0, 1e-9) << "in " << e.energy_in << " J, out " << out << " J";
  EXPECT_LT(std::fabs(e.commutation_residue) / e.energy_in, 1e-5);  // the model's one shortcut is small
}

// Six-step with sinusoidal back-EMF: two phases carry the current, so the current vector points
// along the commutation vector, which the commutation keeps within 90 +- 30 degrees of the rotor's
// d axis; the torque 3/2 p psi |i| sin(angle) lies between cos 30 = 0.866 and 1 of its peak
// 3/2 p psi |i| (geometry; common practice, no source), a ripple of 13.4 % of the peak. Checked on
// a non-salient machine at a low held speed over one electrical turn: outside the commutations
// (the outgoing phase's diode current decaying) the torque per unit of the current's peak torque
// stays in [cos 30, 1] and reaches both ends; where the regulator holds the current's magnitude
// at its reference (all but the commutation dips) the torque ripples by 13.4 % of its peak.
TEST(Simulation, SixStepTorqueLiesBetweenCos30AndOneOfItsPeak) {
  const machine_parameters m = round_machine();
  const double current = 3.0;
  scenario s = dynamometer(m, 30.0, current, 24.0, 10.0);  // 2 Hz electrical: a turn in 0.5 s
  s.duration = 0.62;
  const run_result r = run(s, run_options{arithmetic::q15, angle_input::hall, true, true});
  const double kt = 1.5 * m.pole_pairs * m.flux_linkage;
  const auto first = static_cast<size_t>(0.1 / r.substep), last = static_cast<size_t>(0.6 / r.substep);
  double low = 10, high = -10, regulated_low = 10, regulated_high = -10;
  size_t commutating = 0, regulated = 0;
  for (size_t k = first; k < last; ++k) {
    if (r.substep_commutating[k] != 0) {
      ++commutating;
      continue;
    }
    const double of_peak = r.substep_torque[k] / (kt * r.substep_current[k]);
    low = std::min(low, of_peak);
    high = std::max(high, of_peak);
    if (std::fabs(r.substep_current[k] / current - 1) < 0.01) {
      ++regulated;
      regulated_low = std::min(regulated_low, r.substep_torque[k] / (kt * current));
      regulated_high = std::max(regulated_high, r.substep_torque[k] / (kt * current));
    }
  }
  const double cos30 = std::sqrt(3.0) / 2;
  const double samples = static_cast<double>(last - first);
  // the commutation angles are the Hall edges' (ideal sensors here), acted on within two periods
  // (the poll and the control delay), 0.07 degrees of rotor motion: 6e-4 of the peak at 60 degrees
  EXPECT_GE(low, cos30 - 2e-3);
  EXPECT_LE(low, cos30 + 2e-3);
  EXPECT_GE(high, 1 - 1e-3);
  EXPECT_LE(high, 1 + 1e-9);
  EXPECT_LT(static_cast<double>(commutating) / samples, 0.02) << "commutating";
  EXPECT_GT(static_cast<double>(regulated) / samples, 0.9) << "current at its reference";
  EXPECT_NEAR((regulated_high - regulated_low) / regulated_high, 1 - cos30, 0.01)
      << "ripple of the peak, 13.4 % by geometry";
}

// FOC torque ripple at a held speed with a constant torque current: with the exact angle the ripple
// left is the ADC's quantisation and the fixed-point rounding, below 1 % of the mean; with the
// angle interpolated between Hall edges (sensors displaced by up to 2.5 degrees, turn-averaged
// speed), below 2 %. The targets are the simulation issue's; the window is two electrical turns.
TEST(Simulation, FocTorqueRippleWithTheExactAndTheHallAngle) {
  scenario s = dynamometer(salient_machine(), 200.0, 8.0, 48.0, 50.0);
  s.hall.rising_deg = {32.0, 147.5, 271.0};
  s.duration = 0.2;
  for (const angle_input angle : {angle_input::exact, angle_input::hall}) {
    const run_result r = run(s, run_options{arithmetic::q15, angle, false, true});
    const window_figures w = figures(r, 0.1, 0.2);
    EXPECT_GT(w.mean_torque, 4.5);
    EXPECT_LT(w.ripple_percent, angle == angle_input::exact ? 1.0 : 2.0) << name_of(angle);
    if (angle == angle_input::hall) {
      EXPECT_GT(w.angle_error_rms_deg, 0.5);  // the displaced sensors show
    }
  }
}

// The steady torque of a salient machine is T = 3/2 p (psi i_q + (L_d - L_q) i_d i_q) (the standard
// PMSM torque equation, Krause et al., Analysis of Electric Machinery and Drive Systems, from
// memory). The controller holds i_d = -8 A, i_q = 10 A on a dynamometer; the mean torque is compared
// with the equation at the commanded currents (what the drive promises), and, independently of the
// model's torque line, with the torque the electrical side delivers: (electrical input - copper loss
// - change of magnetic energy) / mechanical angle turned, from the energy ledger; the dynamometer's
// work per radian closes the balance on the shaft.
TEST(Simulation, SteadyTorqueFollowsThePmsmTorqueEquation) {
  const machine_parameters m = salient_machine();
  scenario s = dynamometer(m, 200.0, 10.0, 48.0, 50.0);
  s.d_current = -8.0;
  s.duration = 0.2;
  const run_result r = run(s, run_options{arithmetic::q15, angle_input::exact, false, true});
  const window_figures w = figures(r, 0.1, 0.2);
  const double reluctance = 1.5 * m.pole_pairs * (m.inductance_d - m.inductance_q) * -8.0 * 10.0;
  const double equation = 1.5 * m.pole_pairs * m.flux_linkage * 10.0 + reluctance;
  EXPECT_GT(reluctance / equation, 0.015);  // the reluctance part is visible at this tolerance
  EXPECT_NEAR(w.mean_torque / equation, 1.0, 0.002);

  // the same from the energy ledger over the whole run after the first 0.1 s: rerun to 0.1 s for
  // the ledger at the window's start
  scenario half = s;
  half.duration = 0.1;
  const run_result a = run(half, run_options{arithmetic::q15, angle_input::exact, false, false});
  const double electrical = r.final_state.energy_in - a.final_state.energy_in;
  const double copper = r.final_state.copper_loss - a.final_state.copper_loss;
  const double magnetic = r.final_magnetic_energy - a.final_magnetic_energy;
  const double angle = r.final_state.angle - a.final_state.angle;
  const double from_power = (electrical - copper - magnetic) / angle;
  EXPECT_NEAR(from_power / equation, 1.0, 0.002);
  EXPECT_NEAR(from_power / w.mean_torque, 1.0, 1e-5);  // integration error
  // and the mechanical side: what the dynamometer absorbed per radian (no friction, no load here)
  const double from_shaft = -(r.final_state.dynamometer_work - a.final_state.dynamometer_work) / angle;
  EXPECT_NEAR(from_shaft / from_power, 1.0, 1e-5);
}

// The q15 controller's steady torque within 0.5 % of the double controller's (the target of the
// simulation issue), and q31's within 0.05 %, in a closed speed loop with Hall sensors, dead time,
// ADC offset and gain errors.
TEST(Simulation, Q15AndQ31SteadyTorqueMatchTheDoubleController) {
  scenario s;
  s.machine = round_machine();
  s.machine.load_quadratic = 2.4e-6;
  s.inverter.dead_time = 500e-9;
  s.inverter.device_drop = 0.3;
  s.adc.full_scale = 10;
  s.adc.offset = {0.01, -0.005, 0.0};
  s.adc.gain_error = {0.005, -0.003, 0.0};
  s.hall.rising_deg = {30.0, 151.5, 269.0};
  s.current_limit = 6;
  s.speed_ramp = 20000;
  s.speed_1 = 1500;
  s.speed_full_scale_rpm = 4000;
  s.speed_bandwidth_hz = 15;
  s.duration = 0.3;
  std::vector<run_result> runs;
  double torque[3] = {};
  for (int k = 0; k < 3; ++k) {
    runs.push_back(run(s, run_options{static_cast<arithmetic>(k), angle_input::hall, false, true}));
    torque[k] = figures(runs.back(), 0.2, 0.3).mean_torque;
  }
  const double reference = torque[static_cast<int>(arithmetic::reference)];
  EXPECT_GT(reference, 0.05);
  EXPECT_NEAR(torque[static_cast<int>(arithmetic::q15)] / reference, 1.0, 0.005);
  EXPECT_NEAR(torque[static_cast<int>(arithmetic::q31)] / reference, 1.0, 0.0005);
  // In a speed loop the steady torque is the load's whatever the regulators do, so the trajectories
  // are compared too: through the start-up, the hand-over and the ramp (0 to 0.2 s) the torque of
  // the fixed-point controllers stays within 1 % (RMS, of the steady torque; 0.06 % measured) of the
  // double controller's, which a wrong gain or scaling would not.
  for (const int k : {0, 1}) {
    double sum = 0;
    int n = 0;
    for (size_t i = 0; i < runs[static_cast<size_t>(k)].trace.size(); ++i) {
      if (runs[2].trace[i].time >= 0.2) break;
      const double d = runs[static_cast<size_t>(k)].trace[i].torque - runs[2].trace[i].torque;
      sum += d * d;
      ++n;
    }
    EXPECT_LT(std::sqrt(sum / n) / reference, 0.01) << name_of(static_cast<arithmetic>(k));
  }
}

// The integration step: halving it (8 -> 16 substeps per period) changes a closed-loop run's
// figures by far less than they are quoted to, so the step is not what the figures show.
TEST(Simulation, IntegrationStepIsFineEnough) {
  scenario s = dynamometer(salient_machine(), 200.0, 8.0, 48.0, 50.0);
  s.duration = 0.1;
  const run_result coarse = run(s, run_options{arithmetic::reference, angle_input::exact, false, true});
  s.substeps = 16;
  const run_result fine = run(s, run_options{arithmetic::reference, angle_input::exact, false, true});
  const window_figures a = figures(coarse, 0.05, 0.1), b = figures(fine, 0.05, 0.1);
  EXPECT_NEAR(a.mean_torque / b.mean_torque, 1.0, 1e-6);
  EXPECT_NEAR(a.ripple_percent, b.ripple_percent, 0.01);
  EXPECT_NEAR(a.current_error_rms, b.current_error_rms, 1e-4);
}

// A scenario the model cannot run (here a zero inductance, a timer slower than the PWM) is refused
// with a message instead of producing infinities.
TEST(Simulation, ImpossibleScenariosAreRefused) {
  scenario s;
  EXPECT_EQ(problem_with(s), "");
  s.machine.inductance_q = 0;
  EXPECT_NE(problem_with(s), "");
  EXPECT_THROW(run(s, run_options{}), std::invalid_argument);
  s = scenario{};
  s.capture_timer_hz = 1000;
  EXPECT_NE(problem_with(s), "");
}

}  // namespace
