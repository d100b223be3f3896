// Lossless lines by the method of characteristics, their terminations by nodal analysis.
//
// References (citations recalled from memory, not re-read):
// - L. Bergeron, "Du coup de bélier en hydraulique au coup de foudre en électricité", Dunod,
//   1949: along a lossless line v + Z0 i is carried unchanged from one end to the other in
//   one delay (the characteristic equations).
// - H. W. Dommel, "Digital computer solution of electromagnetic transients in single- and
//   multiphase networks", IEEE Trans. PAS-88, no. 4, 1969: the line as a conductance 1/Z0
//   with a history current source at each end, and trapezoidal companion models of L and C,
//   all solved as one nodal network per time step.
#include "4_sim/characteristics.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <map>
#include <optional>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

#include <Eigen/Dense>

#include <fmt/format.h>

#include "1_syntax/invariant.h"
#include "3_model/circuit.h"
#include "3_model/circuit_checks.h"
#include "3_model/load_network.h"

namespace rungs::sim {

namespace {

using model::Circuit;
using model::Drive;
using model::ElementKind;
using model::Line;
using model::Load;
using model::LoadNetwork;
using model::NetworkKind;
using model::WaveKind;

constexpr int kGround = -1;
constexpr double kMaxSamples = 5e7;
// Times that should land on the grid carry rounding; this much of a step is forgiven.
constexpr double kGridSlack = 1e-9;

/// LU factors of a small dense matrix (row-major values) with partial pivoting, for the
/// nodal equations; Eigen does the work.
class DenseLu {
 public:
  void factor(const std::vector<double>& a, std::size_t n) {
    const auto rows = static_cast<Eigen::Index>(n);
    lu_.compute(Eigen::Map<const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic,
                                               Eigen::RowMajor>>(a.data(), rows, rows));
    // Every row holds a conductance to ground or a forced voltage, so a zero pivot is a bug.
    RUNGS_ASSERT(!(lu_.matrixLU().diagonal().array() == 0.0).any());
  }
  void solve(std::vector<double>& b) const {
    Eigen::Map<Eigen::VectorXd> x(b.data(), static_cast<Eigen::Index>(b.size()));
    x = lu_.solve(Eigen::VectorXd(x));
  }

 private:
  Eigen::PartialPivLU<Eigen::MatrixXd> lu_;
};

/// What a load network is once zero and infinite parts are folded away.
using Form = model::LoadAdmittance::Kind;

/// One R, L or C between nodes a and b (b may be ground). Its current a -> b at the coming
/// sample is conductance * v + history: a resistor, or a trapezoidal companion (Dommel 1969).
struct Element {
  ElementKind kind = ElementKind::resistor;
  double value = 0.0;
  int a = kGround;
  int b = kGround;
  double conductance = 0.0;
  double history = 0.0;
  double v = 0.0;  // branch voltage and current at the last sample: the companion's state
  double i = 0.0;
};

/// Appends the elements of `n` (whose form is finite) between a and b; series parts
/// get inner nodes numbered from `next_node`.
void expand(const LoadNetwork& n, int a, int b, int& next_node, std::vector<Element>& out) {
  if (n.kind == NetworkKind::single) {
    out.push_back(Element{.kind = n.element, .value = n.value, .a = a, .b = b});
    return;
  }
  std::vector<const LoadNetwork*> parts;
  for (const LoadNetwork& part : n.parts)
    if (model::load_form(part) == Form::finite) parts.push_back(&part);
  if (n.kind == NetworkKind::parallel) {
    for (const LoadNetwork* part : parts) expand(*part, a, b, next_node, out);
    return;
  }
  int from = a;
  for (std::size_t k = 0; k < parts.size(); ++k) {
    const int to = k + 1 == parts.size() ? b : next_node++;
    expand(*parts[k], from, to, next_node, out);
    from = to;
  }
}

/// A load behind its ideal switch: closed from sample `closes_at` on.
struct SwitchedLoad {
  int node = kGround;
  std::size_t closes_at = 0;
  bool is_short = false;
  std::vector<Element> elements;
};

/// The last samples of one line end's v + Z0 i, enough to look one delay back: a ring of
/// floor(delay/dt) + 2 samples, with `initial` standing for every sample before t = 0.
class History {
 public:
  History(double delay_steps, double initial)
      : ring_(static_cast<std::size_t>(std::floor(delay_steps)) + 2, 0.0), initial_(initial) {}

  void put(std::size_t k, double value) { ring_[k % ring_.size()] = value; }

  /// The value at fractional sample `position`, at most the last sample put and at least
  /// floor(delay/dt) + 1 samples before the next. A delay that is not a whole number of
  /// steps falls between samples; linear interpolation there is Dommel's (1969) choice too.
  /// It is exact on the straight parts of a ramp and rounds a corner that falls between
  /// samples by at most a quarter of the change over one step.
  double at(double position) const {
    const double base = std::floor(position);
    const double frac = position - base;
    const double v0 = sample(base);
    return frac == 0.0 ? v0 : v0 + frac * (sample(base + 1.0) - v0);
  }

 private:
  double sample(double j) const {
    return j < 0.0 ? initial_ : ring_[static_cast<std::size_t>(j) % ring_.size()];
  }

  std::vector<double> ring_;
  double initial_;
};

/// A lossless line between two nodes (either may be ground). For each end, `out` keeps
/// v + Z0 i, i flowing into the line: twice the wave that end launches, which reaches the
/// other end one delay later unchanged (Bergeron). `in_*` is twice the wave arriving at the
/// present sample. Charged to V0 with no current, v + Z0 i = V0 at both ends before t = 0:
/// a wave of V0/2 travelling each way.
struct LineModel {
  int near = kGround;
  int far = kGround;
  double z0 = 0.0;
  double delay_steps = 0.0;
  History out_near;
  History out_far;
  double in_near = 0.0;
  double in_far = 0.0;
};

class Simulation {
 public:
  Simulation(const Circuit& circuit, double window, double dt);
  Waveforms run();

 private:
  int node_of(const std::string& name);
  void add_line(const Line& line);
  void add_drive(std::size_t index);
  void add_load(const Load& load, int& next_node);
  bool is_forced(int node, std::size_t k) const;
  void assemble(std::size_t k);
  void step(std::size_t k, std::vector<double>& x);

  const Circuit& circuit_;
  double dt_;
  std::size_t samples_;
  std::map<std::string, int> index_;
  std::vector<std::string> names_;  // the external nodes, in output order
  std::size_t node_count_ = 0;      // external and inner nodes
  std::vector<LineModel> lines_;
  // (node, drive index) of drives behind a resistance, and of those without one.
  std::vector<std::pair<int, std::size_t>> norton_;
  std::vector<std::pair<int, std::size_t>> ideal_;
  std::vector<SwitchedLoad> loads_;
  std::vector<bool> forced_;  // per node, for the present switch positions
  DenseLu lu_;
};

Simulation::Simulation(const Circuit& circuit, double window, double dt)
    : circuit_(circuit), dt_(dt) {
  if (!(dt > 0.0) || !std::isfinite(dt))
    throw std::invalid_argument("the time step must be positive and finite");
  if (!(window >= 0.0) || !std::isfinite(window))
    throw std::invalid_argument("the window must be zero or positive, and finite");
  const double steps = window / dt;
  if (steps + 1.0 > kMaxSamples)
    throw std::invalid_argument(
        fmt::format("the window holds {:.3g} steps; the limit is {:.0f}", steps, kMaxSamples));
  samples_ = static_cast<std::size_t>(std::floor(steps * (1.0 + kGridSlack) + kGridSlack)) + 1;

  model::check_simulable(circuit);
  for (const Line& line : circuit.lines) add_line(line);
  for (std::size_t d = 0; d < circuit.drives.size(); ++d) add_drive(d);
  for (const Load& load : circuit.loads)
    if (!model::is_ground(load.node)) node_of(load.node);
  int next_node = static_cast<int>(names_.size());
  for (const Load& load : circuit.loads) add_load(load, next_node);
  node_count_ = static_cast<std::size_t>(next_node);
}

int Simulation::node_of(const std::string& name) {
  if (model::is_ground(name)) return kGround;
  auto [it, fresh] = index_.emplace(name, static_cast<int>(names_.size()));
  if (fresh) names_.push_back(name);
  return it->second;
}

void Simulation::add_line(const Line& line) {
  if (line.per_length.r != 0.0 || line.per_length.g != 0.0)
    throw std::invalid_argument(fmt::format(
        "line '{}' has r or g: the method of characteristics here takes lossless lines only",
        line.name));
  double steps = line.delay / dt_;
  // The wave must arrive from samples already solved; a shorter delay would couple the ends
  // within one step, which this explicit scheme does not do.
  if (steps < 1.0 - kGridSlack)
    throw std::invalid_argument(fmt::format(
        "line '{}' is shorter ({:g} s) than the time step ({:g} s); take a smaller step", line.name,
        line.delay, dt_));
  if (std::abs(steps - std::round(steps)) < kGridSlack * steps) steps = std::round(steps);
  steps = std::max(steps, 1.0);
  const double initial = line.charged.value_or(0.0);
  lines_.push_back(LineModel{.near = node_of(line.near),
                             .far = node_of(line.far),
                             .z0 = line.z0,
                             .delay_steps = steps,
                             .out_near = History(steps, initial),
                             .out_far = History(steps, initial)});
}

void Simulation::add_drive(std::size_t index) {
  // check_simulable has checked the drive: off ground, a rise time, one ideal drive a node.
  const Drive& drive = circuit_.drives[index];
  const int node = node_of(drive.node);
  if (drive.source_resistance > 0.0)
    norton_.emplace_back(node, index);
  else
    ideal_.emplace_back(node, index);
}

void Simulation::add_load(const Load& load, int& next_node) {
  const int node = node_of(load.node);
  const Form form = model::load_form(load.network);
  if (node == kGround || form == Form::open) return;
  SwitchedLoad s;
  s.node = node;
  if (load.at && *load.at > 0.0)
    s.closes_at = static_cast<std::size_t>(std::max(0.0, std::ceil(*load.at / dt_ - kGridSlack)));
  s.is_short = form == Form::short_circuit;
  if (!s.is_short) expand(load.network, node, kGround, next_node, s.elements);
  loads_.push_back(std::move(s));
}

bool Simulation::is_forced(int node, std::size_t k) const {
  for (const auto& [n, d] : ideal_)
    if (n == node) return true;
  for (const SwitchedLoad& load : loads_)
    if (load.is_short && load.node == node && load.closes_at <= k) return true;
  return false;
}

/// Builds and factors the nodal matrix for the switch positions at sample k. It stays the
/// same until the next switch closes, so it is factored once per such event.
void Simulation::assemble(std::size_t k) {
  const std::size_t n = node_count_;
  std::vector<double> a(n * n, 0.0);
  forced_.assign(n, false);
  const auto stamp = [&](int p, int q, double g) {
    if (p != kGround) a[p * n + p] += g;
    if (q != kGround) a[q * n + q] += g;
    if (p != kGround && q != kGround) {
      a[p * n + q] -= g;
      a[q * n + p] -= g;
    }
  };
  for (const LineModel& line : lines_) {
    stamp(line.near, kGround, 1.0 / line.z0);
    stamp(line.far, kGround, 1.0 / line.z0);
  }
  for (const auto& [node, d] : norton_)
    stamp(node, kGround, 1.0 / circuit_.drives[d].source_resistance);
  for (SwitchedLoad& load : loads_) {
    if (load.closes_at > k) continue;
    for (Element& e : load.elements) {
      // Trapezoidal companions (Dommel 1969): C as 2C/dt, L as dt/(2L), each beside a
      // current source carrying its history.
      e.conductance = e.kind == ElementKind::resistor    ? 1.0 / e.value
                      : e.kind == ElementKind::capacitor ? 2.0 * e.value / dt_
                                                         : dt_ / (2.0 * e.value);
      stamp(e.a, e.b, e.conductance);
    }
  }
  for (std::size_t r = 0; r < n; ++r) {
    // A forced node's row says only v = source; an unstamped row (the inner nodes of an open
    // switch) says v = 0.
    const bool empty =
        std::all_of(a.begin() + r * n, a.begin() + (r + 1) * n, [](double g) { return g == 0.0; });
    forced_[r] = is_forced(static_cast<int>(r), k);
    if (forced_[r] || empty) {
      std::fill(a.begin() + r * n, a.begin() + (r + 1) * n, 0.0);
      a[r * n + r] = 1.0;
    }
  }
  lu_.factor(a, n);
}

void Simulation::step(std::size_t k, std::vector<double>& x) {
  const double t = static_cast<double>(k) * dt_;
  std::fill(x.begin(), x.end(), 0.0);
  // Each line end is 1/Z0 to ground beside a current source of (arriving v + Z0 i)/Z0: the
  // characteristic equation v - Z0 i = (v + Z0 i) of the other end, one delay earlier.
  for (LineModel& line : lines_) {
    const double p = static_cast<double>(k) - line.delay_steps;
    line.in_near = line.out_far.at(p);
    line.in_far = line.out_near.at(p);
    if (line.near != kGround) x[line.near] += line.in_near / line.z0;
    if (line.far != kGround) x[line.far] += line.in_far / line.z0;
  }
  for (const auto& [node, d] : norton_) {
    const Drive& drive = circuit_.drives[d];
    x[node] += drive_voltage(drive, circuit_.settings, t) / drive.source_resistance;
  }
  for (SwitchedLoad& load : loads_) {
    if (load.closes_at > k) continue;
    for (Element& e : load.elements) {
      if (e.kind == ElementKind::resistor) continue;
      // Trapezoidal rule: C: i_k = G (v_k - v_{k-1}) - i_{k-1}; L: i_k = i_{k-1} + G (v_k +
      // v_{k-1}); the terms of the last sample are the history source.
      e.history = e.kind == ElementKind::capacitor ? -(e.conductance * e.v + e.i)
                                                   : e.i + e.conductance * e.v;
      if (e.a != kGround) x[e.a] -= e.history;
      if (e.b != kGround) x[e.b] += e.history;
    }
  }
  // Shorts force 0 V; a zero-resistance drive forces its own voltage.
  for (std::size_t r = 0; r < node_count_; ++r)
    if (forced_[r]) x[r] = 0.0;
  for (const auto& [node, d] : ideal_)
    x[node] = drive_voltage(circuit_.drives[d], circuit_.settings, t);
  lu_.solve(x);

  const auto voltage = [&](int node) { return node == kGround ? 0.0 : x[node]; };
  for (LineModel& line : lines_) {
    // v + Z0 i = 2 v - (v - Z0 i): what each end sends back is fixed by its voltage.
    line.out_near.put(k, 2.0 * voltage(line.near) - line.in_near);
    line.out_far.put(k, 2.0 * voltage(line.far) - line.in_far);
  }
  for (SwitchedLoad& load : loads_) {
    if (load.closes_at > k) continue;
    for (Element& e : load.elements) {
      e.v = voltage(e.a) - voltage(e.b);
      e.i = e.conductance * e.v + e.history;
    }
  }
}

Waveforms Simulation::run() {
  Waveforms out;
  out.t.resize(samples_);
  for (const std::string& name : names_) out.nodes.push_back(NodeWaveform{name, {}});
  for (NodeWaveform& w : out.nodes) w.v.resize(samples_);
  std::vector<std::size_t> events;
  for (const SwitchedLoad& load : loads_)
    if (load.closes_at > 0) events.push_back(load.closes_at);
  std::sort(events.begin(), events.end());
  std::vector<double> x(node_count_);
  auto next_event = events.begin();
  for (std::size_t k = 0; k < samples_; ++k) {
    if (k == 0 || (next_event != events.end() && *next_event == k)) {
      assemble(k);
      while (next_event != events.end() && *next_event <= k) ++next_event;
    }
    step(k, x);
    out.t[k] = static_cast<double>(k) * dt_;
    for (std::size_t n = 0; n < names_.size(); ++n) out.nodes[n].v[k] = x[n];
  }
  return out;
}

}  // namespace

double drive_voltage(const Drive& drive, const model::Settings& settings, double t) {
  const double ramp = model::simulated_ramp(drive, settings);
  const auto edge = [ramp](double s) {
    if (s < 0.0) return 0.0;
    return s >= ramp ? 1.0 : s / ramp;
  };
  const double low = drive.kind == WaveKind::dc ? 0.0 : drive.low;
  const double swing = drive.high - low;
  double s = t - drive.at;
  if (drive.kind != WaveKind::pulse) return low + swing * edge(s);
  if (s < 0.0) return low;
  if (drive.period) s = std::fmod(s, *drive.period);
  return low + swing * (edge(s) - edge(s - ramp - *drive.width));
}

Waveforms simulate_characteristics(const Circuit& circuit, double window, double dt) {
  Simulation simulation(circuit, window, dt);
  return simulation.run();
}

}  // namespace rungs::sim
