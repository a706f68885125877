// Transient verification against closed-form solutions (shared/verification.md C12,
// C13, C16, C17, C25) and the conservation and restart properties of the integrator.
#include <gtest/gtest.h>

#include <cmath>

#include "solver/time_table.hpp"
#include "solver/transient_solver.hpp"
#include "verification_support.hpp"

namespace hearth::testing {
namespace {

HeatCapacity capacity(double density, double specific_heat) { return {density, specific_heat}; }

TransientSettings settings_for(double duration, double step, std::vector<double> outputs, double tolerance = 0.05,
                               TimeMethod method = TimeMethod::bdf2) {
  TransientSettings s;
  s.duration = duration;
  s.initial_step = step;
  s.output_times = std::move(outputs);
  s.tolerance = tolerance;
  s.method = method;
  return s;
}

// Runs the integrator and keeps the field at each output time.
struct Integrated {
  TransientSolution solution;
  std::map<double, std::vector<double>> at;  // output time -> temperature
};

Integrated integrate(const Mesh& mesh, const TransientProblem& problem, double initial, const TransientSettings& settings,
                     LinearSolverKind kind = LinearSolverKind::automatic) {
  Integrated run;
  TransientCallbacks callbacks;
  callbacks.on_output = [&](const StepState& s) { run.at[s.time] = *s.temperature; };
  LinearSolverSettings linear;
  linear.tolerance = 1e-12;
  linear.kind = kind;
  run.solution = solve_transient(mesh, problem, std::vector<double>(mesh.n_nodes(), initial), settings, linear, callbacks);
  EXPECT_TRUE(run.solution.completed) << run.solution.failure;
  return run;
}

// C12(a): semi-infinite solid, surface temperature stepped from 20 to 520 degC at t = 0.
// (T - Ts)/(Ti - Ts) = erf(x / (2 sqrt(alpha t))). Carslaw & Jaeger, Conduction of Heat in
// Solids, 2nd ed. (1959), ch. 2; Incropera & DeWitt sect. 5.7 (from memory). Targets at
// 60 s from shared/verification.md C12; tolerance 0.2 % of the 500 K rise.
TEST(SemiInfiniteSolid, StepInSurfaceTemperatureFollowsTheErrorFunction) {
  const Mesh mesh = mesh_script("c12a.geo", prism(0.15, 0.01), 0.0025, 2);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"wall", 40.0}});
  problem.base.regions[0].capacity = capacity(4000.0, 1000.0);  // rho c = 4.0e6 J/(m3 K)
  condition(mesh, problem.base, "x0").temperature = 520.0 + celsius;
  const Integrated run = integrate(mesh, problem, 20.0 + celsius, settings_for(60.0, 0.01, {60.0}, 0.25));
  const auto& T = run.at.at(60.0);
  const double rise = 500.0;
  EXPECT_NEAR(temperature_at(mesh, T, {0.01, 0.005, 0.005}) - celsius, 406.4150, 0.002 * rise);
  EXPECT_NEAR(temperature_at(mesh, T, {0.02, 0.005, 0.005}) - celsius, 301.8514, 0.002 * rise);
  EXPECT_NEAR(temperature_at(mesh, T, {0.04, 0.005, 0.005}) - celsius, 144.1065, 0.002 * rise);
  // The energy that entered equals the energy stored (the face is the only way in).
  const auto& e = run.solution.energy;
  EXPECT_NEAR(e.boundary[boundary_index(mesh, "x0")], e.stored_change, 1e-6 * e.stored_change);
  // Heat taken in over 60 s: integral of k (Ts - Ti) / sqrt(pi alpha t) = 2 k dT sqrt(t / (pi alpha)) per m2
  // (same sources); the face is 0.01 x 0.01 m. Within 1 %.
  const double expected = 2.0 * 40.0 * rise * std::sqrt(60.0 / (M_PI * 1.0e-5)) * 1e-4;
  EXPECT_NEAR(e.boundary[boundary_index(mesh, "x0")], expected, 0.01 * expected);
}

// C12(b): surface temperature rising linearly, T(0, t) = 20 + 5 t degC, given as a time
// table. T - Ti = 4 b t i2erfc(eta). Carslaw & Jaeger ch. 2 (from memory); targets
// at 60 s from shared/verification.md C12; tolerance 0.2 % of the 300 K surface rise.
TEST(SemiInfiniteSolid, RampInSurfaceTemperatureFromATimeTable) {
  const Mesh mesh = mesh_script("c12b.geo", prism(0.15, 0.01), 0.0025, 2);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"wall", 40.0}});
  problem.base.regions[0].capacity = capacity(4000.0, 1000.0);
  const int face = boundary_index(mesh, "x0");
  problem.base.boundaries[face].temperature = 20.0 + celsius;
  const TimeTable ramp({0.0, 60.0}, {20.0 + celsius, 320.0 + celsius});
  problem.at_time = [&](double t, ThermalProblem& p) { p.boundaries[face].temperature = ramp.value(t); };
  problem.break_times = ramp.break_times();
  const Integrated run = integrate(mesh, problem, 20.0 + celsius, settings_for(60.0, 0.5, {60.0}));
  const auto& T = run.at.at(60.0);
  EXPECT_NEAR(temperature_at(mesh, T, {0.0, 0.005, 0.005}) - celsius, 320.0, 1e-6);
  EXPECT_NEAR(temperature_at(mesh, T, {0.01, 0.005, 0.005}) - celsius, 204.8909, 0.002 * 300.0);
  EXPECT_NEAR(temperature_at(mesh, T, {0.02, 0.005, 0.005}) - celsius, 128.4994, 0.002 * 300.0);
}

// C13: semi-infinite solid with surface convection, h = 500 W/(m2 K) to 520 degC from
// t = 0. (T - Ti)/(Tinf - Ti) = erfc(eta) - exp(h x/k + h^2 alpha t/k^2) erfc(eta + h sqrt(alpha t)/k).
// Carslaw & Jaeger ch. 2; Incropera & DeWitt sect. 5.7 (from memory); targets from
// shared/verification.md C13; tolerance 0.2 % of the 500 K rise. The bar is 0.5 m
// (4 sqrt(alpha t) = 0.31 m at 600 s), insulated at the far end.
TEST(SemiInfiniteSolid, SurfaceConvectionClosedForm) {
  const Mesh mesh = mesh_script("c13.geo", prism(0.5, 0.01), 0.005, 2);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"wall", 40.0}});
  problem.base.regions[0].capacity = capacity(4000.0, 1000.0);
  condition(mesh, problem.base, "x0").convection = Convection{500.0, 520.0 + celsius};
  const Integrated run = integrate(mesh, problem, 20.0 + celsius, settings_for(600.0, 0.1, {60.0, 600.0}));
  const double rise = 500.0;
  EXPECT_NEAR(temperature_at(mesh, run.at.at(60.0), {0.0, 0.005, 0.005}) - celsius, 154.8171, 0.002 * rise);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(60.0), {0.01, 0.005, 0.005}) - celsius, 113.6501, 0.002 * rise);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(600.0), {0.0, 0.005, 0.005}) - celsius, 301.7913, 0.002 * rise);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(600.0), {0.02, 0.005, 0.005}) - celsius, 249.7011, 0.002 * rise);
}

// C16: plane wall 2L = 0.1 m cooled on both faces, Bi = hL/k = 1 (half model: the
// mid-plane x = 0 is insulated, the face x = L convects). Exact series solution
// (200 terms, not the one-term form) from shared/verification.md C16, after Incropera &
// DeWitt sect. 5.5 (from memory). Tolerance 0.2 K with P2 (as proposed there).
void check_plane_wall_cooling(LinearSolverKind kind) {
  const Mesh mesh = mesh_script("c16.geo", prism(0.05, 0.01), 0.004, 2);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"wall", 20.0}});
  problem.base.regions[0].capacity = capacity(4000.0, 1000.0);  // alpha = 5e-6 m2/s
  condition(mesh, problem.base, "x1").convection = Convection{400.0, 20.0 + celsius};
  const Integrated run = integrate(mesh, problem, 500.0 + celsius, settings_for(500.0, 0.5, {250.0, 500.0}, 0.02), kind);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(250.0), {0.0, 0.005, 0.005}) - celsius, 390.8127, 0.2);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(250.0), {0.05, 0.005, 0.005}) - celsius, 262.1705, 0.2);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(500.0), {0.0, 0.005, 0.005}) - celsius, 276.2525, 0.2);
  EXPECT_NEAR(temperature_at(mesh, run.at.at(500.0), {0.05, 0.005, 0.005}) - celsius, 187.1249, 0.2);
  // Q/Q0 = 0.52960 at Fo = 1 (same table): heat given up relative to rho c V (Ti - Tinf).
  const double q0 = 4.0e6 * (0.05 * 0.01 * 0.01) * (500.0 - 20.0);
  EXPECT_NEAR(-run.solution.energy.stored_change / q0, 0.52960, 0.002);
  EXPECT_NEAR(run.solution.energy.boundary[boundary_index(mesh, "x1")], run.solution.energy.stored_change,
              1e-6 * q0);
}

TEST(PlaneWallCooling, ExactSeriesAtFourierNumbersHalfAndOne) { check_plane_wall_cooling(LinearSolverKind::automatic); }

// The same with multigrid, whose later steps are solved only to the linear tolerance
// times |R(T_n)| (transient_solver.cpp): the same series values and balance hold.
TEST(PlaneWallCooling, MultigridStepsMatchTheSeriesToo) { check_plane_wall_cooling(LinearSolverKind::iterative); }

// C17: aluminium cube, a = 20 mm, h = 10 W/(m2 K) on all faces: Bi = 1.7e-4, so the
// lumped solution T = Tinf + (Ti - Tinf) exp(-t/tau), tau = rho V c/(h A) = 810 s, holds;
// the exact product solution gives centre 153.5428 / 57.9160 / 23.2915 degC and corner
// 153.4427 / 57.8876 / 23.2890 degC at 600 / 1620 / 3600 s. Incropera & DeWitt sect. 5.2
// and 5.8 (from memory); numbers from shared/verification.md C17; tolerance 0.02 K.
// The C17 cube (20 mm aluminium, k = 200, rho = 2700, c = 900) meshed at `size`, its skin
// convecting with h = 10 W/(m2 K) to 20 degC.
struct AluminiumCube {
  Mesh mesh;
  TransientProblem problem;
};
AluminiumCube aluminium_cube(const std::string& name, double size, int order) {
  const std::string cube =
      "SetFactory(\"OpenCASCADE\");\nBox(1) = {0, 0, 0, 0.02, 0.02, 0.02};\nPhysical Volume(\"cube\") = {1};\n"
      "Physical Surface(\"skin\") = {1, 2, 3, 4, 5, 6};\n";
  AluminiumCube c{mesh_script(name, cube, size, order), {}};
  c.problem.base = problem_for(c.mesh, {{"cube", 200.0}});
  c.problem.base.regions[0].capacity = capacity(2700.0, 900.0);
  condition(c.mesh, c.problem.base, "skin").convection = Convection{10.0, 20.0 + celsius};
  return c;
}

TEST(LumpedCapacitance, AluminiumCubeCoolsAsTheProductSolution) {
  const AluminiumCube cube = aluminium_cube("c17.geo", 0.005, 2);
  const Mesh& mesh = cube.mesh;
  const TransientProblem& problem = cube.problem;
  const Integrated run = integrate(mesh, problem, 300.0 + celsius, settings_for(3600.0, 1.0, {600.0, 1620.0, 3600.0}, 0.0005));
  // (The step tolerance bounds each step's local error; over the ~100 steps of this run
  // their sum reaches about ten times it, so the check takes 5e-4 K for 0.02 K.)
  const std::map<double, std::pair<double, double>> centre_corner{
      {600.0, {153.5428, 153.4427}}, {1620.0, {57.9160, 57.8876}}, {3600.0, {23.2915, 23.2890}}};
  for (const auto& [t, expected] : centre_corner) {
    EXPECT_NEAR(temperature_at(mesh, run.at.at(t), {0.01, 0.01, 0.01}) - celsius, expected.first, 0.02) << t;
    EXPECT_NEAR(temperature_at(mesh, run.at.at(t), {0.0, 0.0, 0.0}) - celsius, expected.second, 0.02) << t;
  }
}

// A film coefficient that changes during the run: the same aluminium cube (C17) with
// h = 10 W/(m2 K) up to 600 s and 40 W/(m2 K) after, in fixed steps. Linear steps at an
// unchanged step size assemble their residual only and keep the last matrix
// (transient_solver.cpp); the step where h changes must assemble its matrix anew.
// Checked two ways: against the same run with the matrix assembled and the solver set up
// at every step (agreement to round-off, common practice, no source), and the mean
// temperature against the lumped solution, tau = rho V c/(h A) = 810 s, then 202.5 s:
// T = Tinf + (Ti - Tinf) exp(-600/810) exp(-(t - 600)/202.5) (Incropera & DeWitt
// sect. 5.2, from memory). At 600 and 1200 s the lumped decay (fast by Bi/3, Bi = hL/k =
// 5e-4 and 2e-3, slab eigenvalue lambda tan lambda = Bi) and BDF2's error from the kink
// at 600 s (no restart there) each move the mean by under 0.02 K; tolerance 0.05 K.
TEST(LumpedCapacitance, FilmCoefficientStepIsFollowed) {
  AluminiumCube cube = aluminium_cube("c17h.geo", 0.01, 1);
  const Mesh& mesh = cube.mesh;
  TransientProblem& problem = cube.problem;
  const int skin = boundary_index(mesh, "skin");
  problem.at_time = [&](double t, ThermalProblem& p) {
    p.boundaries[skin].convection->coefficient = PiecewiseLinear(t <= 600.0 ? 10.0 : 40.0);
  };
  // No restart at 600 s (as a jump in a table would bring): the step size and order
  // stay, so that only h tells the matrices apart.
  problem.break_times = {600.0};
  const double rho_c_v = 2700.0 * 900.0 * 0.02 * 0.02 * 0.02;
  struct Run {
    TransientSolution solution;
    std::map<double, double> mean;               // degC
    std::map<double, std::vector<double>> field;  // K
  };
  auto integrate_with = [&](bool reuse) {
    TransientSettings settings = settings_for(1200.0, 1.0, {600.0, 700.0, 1200.0});
    settings.adaptive = false;
    settings.reuse_linear_solver = reuse;
    Run run;
    TransientCallbacks callbacks;
    callbacks.on_output = [&](const StepState& s) {
      run.mean[s.time] = 300.0 + s.energy->stored_change / rho_c_v;
      run.field[s.time] = *s.temperature;
    };
    LinearSolverSettings linear;
    linear.tolerance = 1e-12;
    run.solution = solve_transient(mesh, problem, std::vector<double>(mesh.n_nodes(), 300.0 + celsius), settings,
                                   linear, callbacks);
    EXPECT_TRUE(run.solution.completed) << run.solution.failure;
    return run;
  };
  const Run kept = integrate_with(true), fresh = integrate_with(false);
  EXPECT_GT(kept.solution.matrix_reuses, 1000);  // the residual-only steps were taken
  for (const auto& [t, T] : fresh.field)
    for (std::size_t i = 0; i < T.size(); ++i) ASSERT_NEAR(kept.field.at(t)[i], T[i], 1e-7) << t;
  auto lumped = [](double t) {
    const double decay = t <= 600.0 ? std::exp(-t / 810.0) : std::exp(-600.0 / 810.0) * std::exp(-(t - 600.0) / 202.5);
    return 20.0 + 280.0 * decay;
  };
  for (const double t : {600.0, 1200.0}) EXPECT_NEAR(kept.mean.at(t), lumped(t), 0.05) << t;
}

// C25 (transient): temporal order on T* = exp(-3 pi^2 alpha t) sin(pi x) sin(pi y) sin(pi z)
// in the unit cube, zero surface temperature. On one mesh the semi-discrete solution is
// fixed, so halving the step isolates the time error: log2 of successive differences
// gives the order, 1 for backward Euler and 2 for BDF2 (V. Thomee, Galerkin Finite
// Element Methods for Parabolic Problems, 2nd ed., 2006 (from memory); orders as in
// shared/verification.md C25).
class TemporalOrder : public ::testing::TestWithParam<TimeMethod> {};

TEST_P(TemporalOrder, ObservedOrderOfTheMethod) {
  const std::string cube =
      "SetFactory(\"OpenCASCADE\");\nBox(1) = {0, 0, 0, 1, 1, 1};\nPhysical Volume(\"cube\") = {1};\n"
      "Physical Surface(\"skin\") = {1, 2, 3, 4, 5, 6};\n";
  const Mesh mesh = mesh_script("c25t.geo", cube, 0.25, 2);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"cube", 1.0}});
  problem.base.regions[0].capacity = capacity(1.0, 1.0);
  condition(mesh, problem.base, "skin").temperature = 0.0;
  std::vector<double> initial(mesh.n_nodes());
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i) {
    const auto x = mesh.node(i);
    initial[i] = std::sin(M_PI * x[0]) * std::sin(M_PI * x[1]) * std::sin(M_PI * x[2]);
  }
  const double duration = 0.05;
  std::vector<double> centre;
  for (int steps : {10, 20, 40, 80}) {
    TransientSettings s = settings_for(duration, duration / steps, {duration}, 0.1, GetParam());
    s.adaptive = false;
    LinearSolverSettings linear;
    linear.tolerance = 1e-13;
    const TransientSolution solution = solve_transient(mesh, problem, initial, s, linear);
    ASSERT_TRUE(solution.completed);
    EXPECT_EQ(solution.steps, steps);
    centre.push_back(temperature_at(mesh, solution.temperature, {0.5, 0.5, 0.5}));
  }
  const double order = std::log2(std::abs(centre[2] - centre[1]) / std::abs(centre[3] - centre[2]));
  EXPECT_NEAR(order, GetParam() == TimeMethod::bdf2 ? 2.0 : 1.0, 0.15);
  // And the field decays as the closed form: exp(-3 pi^2 t) at the centre, within 3 % (the
  // space error of P2 at h = 0.25 is about 2 %).
  EXPECT_NEAR(centre[3], std::exp(-3.0 * M_PI * M_PI * duration), 0.03 * std::exp(-3.0 * M_PI * M_PI * duration));
}

INSTANTIATE_TEST_SUITE_P(BothMethods, TemporalOrder, ::testing::Values(TimeMethod::backward_euler, TimeMethod::bdf2),
                         [](const auto& info) { return info.param == TimeMethod::bdf2 ? "bdf2" : "backward_euler"; });

// Energy conservation (first law): heat in through the surfaces plus the sources equals
// the change in stored energy, here with k(T), rho c(T), radiation, convection, a fixed
// temperature and a source that follows a time table. The scheme's own weights make it
// exact up to the Newton and linear tolerances (common practice, no source).
TEST(EnergyConservation, StoredChangeEqualsNetHeatWithNonlinearTerms) {
  const Mesh mesh = mesh_script("energy.geo", prism(0.1, 0.04), 0.01, 1);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"wall", 1.0}});
  problem.base.regions[0].conductivity = Conductivity::isotropic(PiecewiseLinear({300.0, 900.0}, {0.8, 2.0}));
  problem.base.regions[0].capacity =
      HeatCapacity{PiecewiseLinear(2000.0), PiecewiseLinear({300.0, 900.0}, {800.0, 1200.0})};
  condition(mesh, problem.base, "x0").temperature = 800.0;
  BoundaryCondition& cold = condition(mesh, problem.base, "x1");
  cold.convection = Convection{15.0, 300.0};
  cold.radiation = Radiation{0.8, 300.0};
  const TimeTable source({0.0, 600.0, 600.0, 1200.0}, {0.0, 2.0e4, 0.0, 0.0});
  problem.at_time = [&](double t, ThermalProblem& p) { p.regions[0].heat_source = source.value(t); };
  problem.break_times = source.break_times();
  problem.step_times = source.step_times();
  const Integrated run = integrate(mesh, problem, 300.0, settings_for(1200.0, 5.0, {300.0, 1200.0}, 0.2));
  const auto& e = run.solution.energy;
  double in = e.sources;
  for (double b : e.boundary) in += b;
  EXPECT_GT(e.sources, 0.0);
  EXPECT_NEAR(in, e.stored_change, 1e-7 * std::abs(e.stored_change));
}

// A steady field with the same conditions is a fixed point of the time stepping: no
// drift from the steady state (the restart check; common practice, no source).
TEST(RestartFromSteady, SteadyFieldDoesNotDrift) {
  const Mesh mesh = mesh_script("restart.geo", prism(0.1, 0.04), 0.01, 2);
  TransientProblem problem;
  problem.base = problem_for(mesh, {{"wall", 1.5}}, {{"wall", 1.0e4}});
  problem.base.regions[0].capacity = capacity(2000.0, 900.0);
  condition(mesh, problem.base, "x0").temperature = 600.0;
  condition(mesh, problem.base, "x1").convection = Convection{20.0, 300.0};
  const Solved steady = solve(mesh, problem.base);
  TransientCallbacks none;
  LinearSolverSettings linear;
  linear.tolerance = 1e-12;
  const TransientSolution run =
      solve_transient(mesh, problem, steady.solution.temperature, settings_for(3600.0, 60.0, {3600.0}), linear, none);
  ASSERT_TRUE(run.completed);
  double drift = 0.0;
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    drift = std::max(drift, std::abs(run.temperature[i] - steady.solution.temperature[i]));
  EXPECT_LT(drift, 1e-6);
  EXPECT_LT(run.steps, 20);  // the step grows when nothing changes
}

TEST(Bdf2Coefficients, ConstantStepAndConsistency) {
  // Constant step: (3 T_{n+1} - 4 T_n + T_{n-1}) / (2 h) (textbook BDF2).
  const auto c = bdf2_coefficients(2.0, 2.0);
  EXPECT_DOUBLE_EQ(c[0], 0.75);
  EXPECT_DOUBLE_EQ(c[1], -1.0);
  EXPECT_DOUBLE_EQ(c[2], 0.25);
  // Any step ratio: exact for linear functions of time (c0 + c1 + c2 = 0 and first moment 1).
  const auto v = bdf2_coefficients(3.0, 1.0);
  EXPECT_NEAR(v[0] + v[1] + v[2], 0.0, 1e-15);
  EXPECT_NEAR(v[0] * 4.0 + v[1] * 1.0 + v[2] * 0.0, 1.0, 1e-14);  // d/dt of t at t = 4 (levels 0, 1, 4)
}

TEST(TimeTableValues, StepsAndRamps) {
  const TimeTable table({0.0, 10.0, 10.0, 20.0}, {1.0, 3.0, 5.0, 5.0});
  EXPECT_DOUBLE_EQ(table.value(-1.0), 1.0);
  EXPECT_DOUBLE_EQ(table.value(5.0), 2.0);
  EXPECT_DOUBLE_EQ(table.value(10.0), 3.0);  // the value before the step
  EXPECT_DOUBLE_EQ(table.value(10.5), 5.0);
  EXPECT_DOUBLE_EQ(table.value(99.0), 5.0);
  EXPECT_EQ(table.break_times(), (std::vector<double>{0.0, 10.0, 20.0}));
  EXPECT_EQ(table.step_times(), (std::vector<double>{10.0}));
}

TEST(HeatCapacityEnthalpy, ExactIntegralOfTheProductOfTables) {
  // rho = 1000 constant, c = 500 + (T - 300) linear: H(400) - H(300) = 1000 (500*100 + 100^2/2).
  const HeatCapacity k{PiecewiseLinear(1000.0), PiecewiseLinear({300.0, 400.0}, {500.0, 600.0})};
  EXPECT_NEAR(k.enthalpy(400.0) - k.enthalpy(300.0), 1000.0 * (500.0 * 100.0 + 0.5 * 100.0 * 100.0), 1e-6);
  // Beyond the table the value is held: 600 per K more.
  EXPECT_NEAR(k.enthalpy(450.0) - k.enthalpy(400.0), 1000.0 * 600.0 * 50.0, 1e-6);
}

}  // namespace
}  // namespace hearth::testing
