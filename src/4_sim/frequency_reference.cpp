// Frequency-domain nodal solutions inverted to node waveforms, switches compensated, error
// estimated.
#include "4_sim/frequency_reference.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include <Eigen/Core>

#include "3_model/edges.h"
#include "4_sim/frequency_network.h"

namespace rungs::sim {

namespace {

/// The transforms of the sampled stage solution at one node, per source: K values per column.
using NodeSpectra = Eigen::MatrixXcd;  // rows frequencies, columns sources

/// The compensation source of a switch closing at `at` (Switch), per source column, and the
/// switch's open voltage at `at` per column. e(t) is the voltage across the switch: before
/// `at` the open-switch voltage u(t) = v(t) + v_steady (v the node's change while the switch is
/// open), so no current flows; from `at` it falls linearly from u(at) to 0 over the closing
/// time (0: at once), the switch a voltage that collapses as a closing switch's does, and the
/// same ramp the deck's switch follows (6_emit/netlist.h); then it stays 0. As the network's steady
/// state is taken out apart, the source is e(t) - v_steady:
///   E = T[(v - v0) 1(t < at)] + v0/s - (v0 + v_steady) L{1(t >= at)} + u(at) L{q},
/// q(t) = 1(t >= at) (1 - (t - at)/closing)^+ the ramp down. `initial` is v(0+) per column: the
/// jump at t = 0 is taken out before inverting (it would ring) and put back in closed form.
Eigen::MatrixXcd compensation_source(LaplaceInverter& inverter, const NodeSpectra& open_voltage,
                                     const Eigen::RowVectorXd& steady,
                                     const Eigen::RowVectorXd& initial, double at,
                                     double closing, Eigen::RowVectorXd& voltage_at) {
  const LaplaceGrid& grid = inverter.grid();
  const Eigen::Index k_count = static_cast<Eigen::Index>(grid.frequencies);
  Eigen::MatrixXcd e(k_count, open_voltage.cols());
  voltage_at.resize(open_voltage.cols());
  std::vector<double> g;
  std::vector<double> undamped;
  std::vector<Complex> part;
  std::vector<Complex> column(grid.frequencies);
  KinkedWave after;
  after.kinks = {{at, 1.0, 0.0}};
  KinkedWave falling;
  if (closing > 0.0)
    falling.kinks = {{at, 1.0, -1.0 / closing}, {at + closing, 0.0, 1.0 / closing}};
  const double h = grid.time_step();
  for (Eigen::Index c = 0; c < open_voltage.cols(); ++c) {
    for (Eigen::Index k = 0; k < k_count; ++k)
      column[static_cast<std::size_t>(k)] =
          open_voltage(k, c) - initial(c) * reciprocal(grid.s(static_cast<std::size_t>(k)));
    inverter.damped(column, grid.frequencies, g);
    inverter.transform_until(g, at, part);
    // u(at): the samples' linear interpolant at `at`, undamped.
    undamped.resize(g.size());
    inverter.undamp(g, undamped);
    const std::size_t j = std::min(static_cast<std::size_t>(at / h), undamped.size() - 2);
    const double f = at / h - static_cast<double>(j);
    const double v_at = (1.0 - f) * undamped[j] + f * undamped[j + 1];
    voltage_at(c) = v_at + initial(c) + steady(c);
    for (Eigen::Index k = 0; k < k_count; ++k) {
      const Complex s = grid.s(static_cast<std::size_t>(k));
      Complex value = part[static_cast<std::size_t>(k)];
      if (initial(c) != 0.0) value += initial(c) * reciprocal(s);
      if (steady(c) + initial(c) != 0.0)
        value -= (steady(c) + initial(c)) * laplace_transform(after, s);
      if (closing > 0.0 && voltage_at(c) != 0.0)
        value += voltage_at(c) * laplace_transform(falling, s);
      e(k, c) = value;
    }
  }
  return e;
}

double closing_of(const ReferenceOptions& options, std::size_t load) {
  return load < options.closing.size() ? std::max(0.0, options.closing[load]) : 0.0;
}

/// The shortest 0-100 % ramp of any drive (rise/0.8) or switch closing, s; infinite when there
/// is none.
double fastest_ramp(const model::Circuit& circuit, const ReferenceOptions& options) {
  double fastest = std::numeric_limits<double>::infinity();
  for (const double closing : options.closing)
    if (closing > 0.0) fastest = std::min(fastest, closing);
  for (const model::Drive& d : circuit.drives) {
    const std::optional<model::Edge> edge = model::drive_edge(d, circuit.settings);
    if (edge && edge->rise > 0.0) fastest = std::min(fastest, edge->ramp);
  }
  return fastest;
}

double aliasing_for(double target) {
  return std::clamp(target / 100.0, 1e-12, 1e-5);
}

}  // namespace

Waveforms Response::total() const {
  Waveforms w;
  w.t = t;
  for (std::size_t i = 0; i < nodes.size(); ++i) {
    NodeWaveform node{nodes[i], std::vector<double>(t.size(), 0.0)};
    for (const auto& source : v)
      for (std::size_t j = 0; j < t.size(); ++j) node.v[j] += source[i][j];
    w.nodes.push_back(std::move(node));
  }
  return w;
}

std::optional<std::size_t> Response::node_index(const std::string& node) const {
  for (std::size_t i = 0; i < nodes.size(); ++i)
    if (nodes[i] == node) return i;
  return std::nullopt;
}

namespace {

bool same_grid(const LaplaceGrid& a, const LaplaceGrid& b) {
  return a.period == b.period && a.sigma == b.sigma && a.frequencies == b.frequencies &&
         a.oversample == b.oversample;
}

LaplaceGrid lower_half(const LaplaceGrid& grid) {
  LaplaceGrid half = grid;
  half.frequencies = std::max<std::size_t>(1, grid.frequencies / 2);
  return half;
}

}  // namespace

ResponseWorkspace::ResponseWorkspace() = default;
ResponseWorkspace::~ResponseWorkspace() = default;

LaplaceInverter& ResponseWorkspace::fine(const LaplaceGrid& grid) {
  if (!fine_ || !same_grid(fine_->grid(), grid)) fine_ = std::make_unique<LaplaceInverter>(grid);
  return *fine_;
}

LaplaceInverter& ResponseWorkspace::coarse(const LaplaceGrid& grid) {
  const LaplaceGrid half = lower_half(grid);
  if (!coarse_ || !same_grid(coarse_->grid(), half))
    coarse_ = std::make_unique<LaplaceInverter>(half);
  return *coarse_;
}

namespace {

/// v(0+) = lim s V(s) as s -> infinity (the initial-value theorem, any table of transforms) of
/// every node (rows) per source (columns): a charged line's ends, or a low level applied at
/// t = 0, jump there. At this s every delay's e^{-s tau} is zero, C a short and L an open to
/// within O(1/(s tau)) of any time constant tau longer than a millionth of a sample; no switch
/// has closed yet.
Eigen::MatrixXd initial_values(FrequencyNetwork& network, const LaplaceGrid& grid,
                               const Eigen::MatrixXcd& no_compensation) {
  const double s_big = 1e6 / grid.time_step();
  Eigen::MatrixXcd v;
  network.solve(Complex(s_big, 0.0), 0, no_compensation, v);
  return (s_big * v).real();
}

/// Solves the network at every frequency of the grid, one switch position after another: the
/// open voltage at each of the first `active` switches becomes its compensation source for the
/// positions after it closes. Fills `spectra` (per source and node, the K frequencies
/// contiguous) with the last position's solution, and returns each active switch's open voltage
/// when it closes, all sources together.
std::vector<double> sweep_switch_positions(FrequencyNetwork& network, LaplaceInverter& inverter,
                                           const ReferenceOptions& options,
                                           const Eigen::MatrixXd& initial, std::size_t active,
                                           std::vector<Complex>& spectra) {
  const LaplaceGrid& grid = inverter.grid();
  const std::size_t kk = grid.frequencies;
  const std::size_t n = network.nodes().size();
  const std::size_t m = network.excitations().size();
  const auto& switches = network.switches();
  Eigen::MatrixXcd compensation =
      Eigen::MatrixXcd::Zero(static_cast<Eigen::Index>(active), static_cast<Eigen::Index>(m));
  std::vector<Eigen::MatrixXcd> sources_of_switch;  // per active switch: K x m
  std::vector<double> switch_voltages;               // per active switch: u(at), all sources
  Eigen::RowVectorXd voltage_at;
  Eigen::MatrixXcd v;
  spectra.assign(kk * n * m, Complex(0.0, 0.0));
  for (std::size_t stage = 0; stage <= active; ++stage) {
    const bool last = stage == active;
    NodeSpectra at_switch;
    if (!last) at_switch.resize(static_cast<Eigen::Index>(kk), static_cast<Eigen::Index>(m));
    for (std::size_t k = 0; k < kk; ++k) {
      for (std::size_t i = 0; i < stage; ++i)
        compensation.row(static_cast<Eigen::Index>(i)) =
            sources_of_switch[i].row(static_cast<Eigen::Index>(k));
      network.solve(grid.s(k), stage, compensation, v);
      if (last) {
        for (std::size_t c = 0; c < m; ++c)
          for (std::size_t i = 0; i < n; ++i)
            spectra[(c * n + i) * kk + k] =
                v(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(c));
      } else {
        at_switch.row(static_cast<Eigen::Index>(k)) =
            v.row(static_cast<Eigen::Index>(switches[stage].node));
      }
    }
    if (last) break;
    const auto node = static_cast<Eigen::Index>(switches[stage].node);
    sources_of_switch.push_back(compensation_source(
        inverter, at_switch, network.steady().row(node), initial.row(node), switches[stage].at,
        closing_of(options, switches[stage].load), voltage_at));
    switch_voltages.push_back(voltage_at.sum());
  }
  return switch_voltages;
}

/// Brings every spectrum of `spectra` to the time domain into r.v, and its lower half into
/// r.coarse, the jump v(0+) and the steady part put back in closed form; fills r.error_estimate
/// against options.target. r.t, r.sources and the network's figures must be set.
void invert_spectra(const FrequencyNetwork& network, ResponseWorkspace& work,
                    const ReferenceOptions& options, const Eigen::MatrixXd& initial,
                    std::vector<Complex>& spectra, Response& r) {
  LaplaceInverter& inverter = work.fine(r.grid);
  const LaplaceGrid& grid = r.grid;
  const std::size_t kk = grid.frequencies;
  const std::size_t n = r.nodes.size();
  const std::size_t m = r.excitations.size();
  const std::size_t samples = r.t.size();
  r.v.assign(m, std::vector<std::vector<double>>(n, std::vector<double>(samples)));
  // The coarse inversion uses the lower half of the frequencies on a grid of half the size:
  // its samples fall on every other fine one.
  LaplaceInverter& coarse_inverter = work.coarse(grid);
  const LaplaceGrid& half = coarse_inverter.grid();
  const std::size_t coarse_samples = (samples + 1) / 2;
  r.coarse.assign(m, std::vector<std::vector<double>>(n, std::vector<double>(coarse_samples)));
  std::vector<double> g;
  double truncation = 0.0;
  double largest = 0.0;
  for (std::size_t c = 0; c < m; ++c) {
    const double swing = std::abs(r.excitations[c].swing);
    for (std::size_t i = 0; i < n; ++i) {
      const std::span<Complex> spectrum(spectra.data() + (c * n + i) * kk, kk);
      const double v0 = initial(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(c));
      if (v0 != 0.0)
        for (std::size_t k = 0; k < kk; ++k) spectrum[k] -= v0 * reciprocal(grid.s(k));
      const double steady =
          v0 + network.steady()(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(c));
      inverter.damped(spectrum, kk, g);
      inverter.undamp(g, r.v[c][i]);
      coarse_inverter.damped(spectrum, half.frequencies, g);
      coarse_inverter.undamp(g, r.coarse[c][i]);
      if (swing > 0.0) {
        for (std::size_t j = 0; j < coarse_samples; ++j)
          truncation = std::max(truncation, std::abs(r.v[c][i][2 * j] - r.coarse[c][i][j]) / swing);
        for (std::size_t j = 0; j < samples; ++j)
          largest = std::max(largest, std::abs(r.v[c][i][j]) / swing);
      }
      for (double& x : r.v[c][i]) x += steady;
      for (double& x : r.coarse[c][i]) x += steady;
    }
  }
  const double eps = grid.aliasing();
  r.error_estimate.truncation = truncation;
  r.error_estimate.aliasing = 2.0 * largest * eps / (1.0 - eps);
  r.error_estimate.within_target = r.error_estimate.estimate() <= options.target;
}

}  // namespace

Response frequency_response(const model::Circuit& circuit,
                            const std::vector<std::optional<LadderSpec>>& ladders,
                            const LaplaceGrid& grid, const ReferenceOptions& options,
                            ResponseWorkspace* workspace) {
  if (!(options.window > 0.0) || options.window > 0.5 * grid.period * (1.0 + 1e-12))
    throw std::invalid_argument("the window must be positive and at most half the period");
  FrequencyNetwork network(circuit, ladders, options.initial);
  ResponseWorkspace local;
  ResponseWorkspace& work = workspace ? *workspace : local;
  const auto& switches = network.switches();
  // Switches that close after the window change nothing inside it.
  std::size_t active = 0;
  while (active < switches.size() && switches[active].at < options.window) ++active;
  // Taken out of every spectrum as v(0+)/s and put back as a constant, the jump at t = 0 does
  // not ring in the inversion.
  const Eigen::MatrixXd initial =
      initial_values(network, grid,
                     Eigen::MatrixXcd::Zero(static_cast<Eigen::Index>(active),
                                            static_cast<Eigen::Index>(network.excitations().size())));
  std::vector<Complex>& spectra = work.spectra();
  Response r;
  r.switch_voltages =
      sweep_switch_positions(network, work.fine(grid), options, initial, active, spectra);
  r.grid = grid;
  r.nodes = network.nodes();
  r.excitations = network.excitations();
  r.switches = network.switches();
  r.initial = network.initial();
  const double h = grid.time_step();
  const std::size_t samples =
      std::min(grid.fft_size(),
               static_cast<std::size_t>(std::floor(options.window / h * (1.0 + 1e-12))) + 1);
  r.t.resize(samples);
  for (std::size_t j = 0; j < samples; ++j) r.t[j] = h * static_cast<double>(j);
  invert_spectra(network, work, options, initial, spectra, r);
  return r;
}

std::size_t fft_friendly(std::size_t k) {
  for (std::size_t c = std::max<std::size_t>(k + (k & 1), 2);; c += 2) {
    std::size_t r = c;
    for (const std::size_t p : {2, 3, 5})
      while (r % p == 0) r /= p;
    if (r == 1) return c;
  }
}

LaplaceGrid initial_reference_grid(const model::Circuit& circuit,
                                   const ReferenceOptions& options) {
  const double ramp = fastest_ramp(circuit, options);
  const double period = 2.0 * options.window;
  // A corner where the slope changes by J, cut off at the band B = K/P, is rounded by about
  // J/(2 pi^2 B) (the Abel mean of the Dirichlet kernel's first moment). A ramp of the full
  // swing over `ramp` has J = 1/ramp, twice that where a wave doubles at an open end: so
  // B = 0.1/(target ramp) meets the target at such a corner, and costs no second sweep.
  const double wanted =
      std::isfinite(ramp) && options.target > 0.0 ? 0.1 * period / (options.target * ramp) : 0.0;
  const std::size_t cap = std::max(options.max_frequencies, options.min_frequencies);
  std::size_t k = std::max<std::size_t>(options.min_frequencies, 2);
  if (wanted > static_cast<double>(k)) k = static_cast<std::size_t>(std::min(wanted, 1e12));
  k = fft_friendly(std::min(k, cap));
  return make_laplace_grid(options.window, k, aliasing_for(options.target), options.oversample);
}

Response exact_reference(const model::Circuit& circuit, const ReferenceOptions& options,
                         ResponseWorkspace* workspace) {
  LaplaceGrid grid = initial_reference_grid(circuit, options);
  const std::size_t cap = std::max(options.max_frequencies, options.min_frequencies);
  for (;;) {
    Response r = frequency_response(circuit, {}, grid, options, workspace);
    if (r.error_estimate.within_target || grid.frequencies >= cap) return r;
    // Truncation error falls as 1/K at corners: ask for what the estimate needs, with a margin.
    const double need = 1.2 * r.error_estimate.truncation /
                        std::max(options.target - r.error_estimate.aliasing, 0.5 * options.target);
    const double factor = std::clamp(need, 1.5, 8.0);
    grid.frequencies = fft_friendly(std::min(
        cap, static_cast<std::size_t>(std::ceil(factor * static_cast<double>(grid.frequencies)))));
  }
}

}  // namespace rungs::sim
