// Nodal analysis at a complex frequency: two-ports, loads and drives stamped into one matrix.
//
// Each line is a two-port in admittance form between its end nodes (ground rows dropped); a
// drive behind a resistance is a Norton source; a zero-resistance drive or a short fixes its
// node, whose known voltage moves to the right-hand side. Charged lines add the initial-
// condition sources of the telegrapher equations; switched loads add their compensation
// sources. One factorization per frequency serves every source (one column each).
#include "4_sim/frequency_network.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

#include <fmt/format.h>
#include <Eigen/Dense>
#include <Eigen/SparseCore>
#include <Eigen/SparseLU>

#include "3_model/circuit.h"
#include "3_model/circuit_checks.h"
#include "3_model/connected_parts.h"
#include "4_sim/dense_solve.h"

namespace rungs::sim {

namespace {

using model::Circuit;
using model::load_admittance;
using model::LoadAdmittance;
using model::LoadNetwork;

constexpr int kGround = -1;
// Components with more unknowns than this are factored as sparse matrices.
constexpr int kDenseLimit = 48;
// A conductance from every node to ground in the DC solution, so that floating nodes settle.
constexpr double kDcLeak = 1e-12;

struct LineEntry {
  int near = kGround;
  int far = kGround;
  LineTotals totals;
  std::optional<LadderSpec> ladder;
  std::optional<double> charged;
};

struct DriveEntry {
  int node = kGround;
  double resistance = 0.0;
  KinkedWave change;
  double initial_step = 0.0;  // V applied at t = 0 in a rest start (the low level)
  double low = 0.0;           // V before t = 0 in a settled start
};

struct LoadEntry {
  int node = kGround;
  const LoadNetwork* network = nullptr;
  bool is_short = false;
  std::optional<std::size_t> switch_index;
};

Admittance two_port(const LineEntry& line, Complex s) {
  return line.ladder ? ladder_admittance(line.totals, *line.ladder, s)
                     : line_admittance(line.totals, s);
}

/// The unknowns of one switch position: which nodes are free, forced or empty, and the
/// matrix and factorization that stay allocated from one frequency to the next.
struct Stage {
  std::vector<int> free_of;    // node -> unknown index, or -1
  std::vector<int> forced_of;  // node -> forced index, or -1
  std::vector<int> forced_nodes;
  int unknowns = 0;
  bool sparse = false;
  Eigen::MatrixXcd dense;
  Eigen::SparseMatrix<Complex> matrix;
  Eigen::SparseLU<Eigen::SparseMatrix<Complex>> sparse_lu;
  bool analyzed = false;
};

/// Adds admittances and currents to one switch position's equations. Ground and the rows of
/// forced or empty nodes take nothing; a forced node's column moves to the right-hand side with
/// its known voltage.
struct Stamper {
  Stage& st;
  Eigen::MatrixXcd& rhs;
  const Eigen::MatrixXcd& forced;

  void admittance(int p, int q, Complex y) const {
    if (p == kGround || q == kGround) return;
    const int fp = st.free_of[p];
    if (fp < 0) return;
    const int fq = st.free_of[q];
    if (fq >= 0) {
      if (st.sparse)
        st.matrix.coeffRef(fp, fq) += y;
      else
        st.dense(fp, fq) += y;
    } else if (st.forced_of[q] >= 0) {
      rhs.row(fp) -= y * forced.row(st.forced_of[q]);
    }
  }
  void current(int p, Eigen::Index column, Complex i) const {
    if (p == kGround || st.free_of[p] < 0) return;
    rhs(st.free_of[p], column) += i;
  }
  void two_port(int near, int far, const Admittance& y) const {
    admittance(near, near, y.y11);
    admittance(far, far, y.y22);
    admittance(near, far, y.y12);
    admittance(far, near, y.y12);
  }
};

/// The DC equations of a settled start, in real numbers: nodes that lossless lines join are
/// merged into one unknown (ground, kGround, is a node too), and a set held at a known voltage
/// by a zero-resistance drive or a short moves to the right-hand side. Each unknown also has
/// kDcLeak to ground, so that a floating set settles at 0 V.
class DcSystem {
 public:
  DcSystem(std::size_t nodes, Eigen::Index excitations)
      : sets_(nodes + 1), ground_(nodes), sources_(excitations) {}

  /// Merges the sets of two nodes (before number_unknowns).
  void join(int p, int q) { sets_.unite(set_of(p), set_of(q)); }
  /// Holds a node's set at `value` per source column (before number_unknowns). Throws when a
  /// set is held at two different values: a zero-resistance drive shorted to another.
  void hold(int node, const Eigen::RowVectorXd& value) {
    auto [it, fresh] = held_.emplace(set_of(node), value);
    if (!fresh && (it->second - value).cwiseAbs().maxCoeff() > 0.0)
      throw std::invalid_argument(
          "a drive without source resistance is joined to another fixed voltage by a lossless "
          "path: the DC state would short it");
  }
  /// Numbers the sets that are not held, in the order of their first node, and sizes the
  /// equations.
  void number_unknowns() {
    for (std::size_t i = 0; i < ground_; ++i) {
      const std::size_t set = sets_.find(i);
      if (!held_.count(set)) unknown_of_.emplace(set, static_cast<int>(unknown_of_.size()));
    }
    const int u = static_cast<int>(unknown_of_.size());
    a_ = Eigen::MatrixXd::Zero(u, u);
    b_ = Eigen::MatrixXd::Zero(u, sources_);
    for (int i = 0; i < u; ++i) a_(i, i) = kDcLeak;
  }
  /// Adds conductance y (S) to row p, column q; a held column moves to the right-hand side.
  void add(int p, int q, double y) {
    auto fp = unknown_of_.find(set_of(p));
    if (fp == unknown_of_.end()) return;
    const std::size_t sq = set_of(q);
    auto fq = unknown_of_.find(sq);
    if (fq != unknown_of_.end())
      a_(fp->second, fq->second) += y;
    else
      b_.row(fp->second) -= y * held_.at(sq);
  }
  /// Adds a current (A) into node p in one source's column.
  void inject(int p, Eigen::Index column, double current) {
    auto fp = unknown_of_.find(set_of(p));
    if (fp != unknown_of_.end()) b_(fp->second, column) += current;
  }
  /// The voltages of the unknowns per source column, by Eigen's LU with partial pivoting.
  Eigen::MatrixXd solve() const {
    if (a_.rows() == 0) return {};
    return a_.partialPivLu().solve(b_);
  }
  /// A node's DC voltage per source column, from `solution` or its held value.
  Eigen::RowVectorXd voltage(int node, const Eigen::MatrixXd& solution) {
    const std::size_t set = set_of(node);
    auto it = unknown_of_.find(set);
    return it != unknown_of_.end() ? Eigen::RowVectorXd(solution.row(it->second)) : held_.at(set);
  }

 private:
  std::size_t set_of(int node) {
    return sets_.find(node == kGround ? ground_ : static_cast<std::size_t>(node));
  }

  model::DisjointSets sets_;
  std::size_t ground_;
  Eigen::Index sources_;
  std::map<std::size_t, Eigen::RowVectorXd> held_;
  std::map<std::size_t, int> unknown_of_;
  Eigen::MatrixXd a_;
  Eigen::MatrixXd b_;
};

}  // namespace

struct FrequencyNetwork::Impl {
  Impl(const Circuit& circuit, const std::vector<std::optional<LadderSpec>>& ladders,
       InitialState initial);

  int node_of(const std::string& name);
  void add_line(const model::Line& line, std::optional<LadderSpec> ladder, std::size_t index);
  void add_drive(const Circuit& circuit, std::size_t index);
  void add_load(const model::Load& load, std::size_t index);
  void order_switches(const Circuit& circuit);
  void solve_steady();
  void stamp_dc(DcSystem& dc) const;
  Stage& stage(std::size_t closed);
  Complex drive_transform(const DriveEntry& d, Complex s) const;
  void known_voltages(Complex s, std::size_t closed, const Eigen::MatrixXcd& compensation,
                      const Stage& st);
  void stamp_network(Complex s, std::size_t closed, const Eigen::MatrixXcd& compensation,
                     const Stamper& stamp);
  void solve(Complex s, std::size_t closed, const Eigen::MatrixXcd& compensation,
             Eigen::MatrixXcd& v);

  std::map<std::string, int> index;
  std::vector<std::string> names;
  std::vector<LineEntry> lines;
  std::vector<DriveEntry> drives;
  std::vector<LoadEntry> loads;
  std::vector<Excitation> excitations;
  std::vector<Switch> switches;
  InitialState start = InitialState::settled;
  Eigen::MatrixXd steady;
  std::map<std::size_t, Stage> stages;
  // Buffers reused across frequencies.
  std::vector<Admittance> line_y;
  Eigen::MatrixXcd rhs;
  Eigen::MatrixXcd forced;
  Eigen::MatrixXcd unknowns;
};

FrequencyNetwork::Impl::Impl(const Circuit& circuit,
                             const std::vector<std::optional<LadderSpec>>& ladders,
                             InitialState initial) {
  if (!ladders.empty() && ladders.size() != circuit.lines.size())
    throw std::invalid_argument("give a ladder choice for every line, or none");
  const bool charged = std::any_of(circuit.lines.begin(), circuit.lines.end(),
                                   [](const model::Line& l) { return l.charged.has_value(); });
  start = initial == InitialState::automatic
              ? (charged ? InitialState::rest : InitialState::settled)
              : initial;
  if (start == InitialState::settled && charged)
    throw std::invalid_argument(
        "a charged line starts from rest: its charge is not a DC state of the circuit");
  model::check_simulable(circuit);
  for (std::size_t k = 0; k < circuit.lines.size(); ++k)
    add_line(circuit.lines[k], ladders.empty() ? std::nullopt : ladders[k], k);
  for (std::size_t d = 0; d < circuit.drives.size(); ++d) add_drive(circuit, d);
  for (const model::Load& load : circuit.loads)
    if (!model::is_ground(load.node)) node_of(load.node);
  for (std::size_t k = 0; k < circuit.lines.size(); ++k)
    if (circuit.lines[k].charged)
      excitations.push_back({Excitation::Kind::charge, k, *circuit.lines[k].charged});
  for (std::size_t l = 0; l < circuit.loads.size(); ++l) add_load(circuit.loads[l], l);
  order_switches(circuit);
  solve_steady();
}

int FrequencyNetwork::Impl::node_of(const std::string& name) {
  if (model::is_ground(name)) return kGround;
  auto [it, fresh] = index.emplace(name, static_cast<int>(names.size()));
  if (fresh) names.push_back(name);
  return it->second;
}

void FrequencyNetwork::Impl::add_line(const model::Line& line, std::optional<LadderSpec> ladder,
                                      std::size_t) {
  if (ladder && ladder->sections < 1)
    throw std::invalid_argument(
        fmt::format("line '{}': a ladder needs at least one section", line.name));
  LineEntry e;
  e.near = node_of(line.near);
  e.far = node_of(line.far);
  e.totals = line_totals(line);
  if (!(e.totals.r >= 0.0) || !(e.totals.g >= 0.0) || !std::isfinite(e.totals.r) ||
      !std::isfinite(e.totals.g))
    throw std::invalid_argument(
        fmt::format("line '{}' needs r and g zero or positive, and finite", line.name));
  e.ladder = ladder;
  e.charged = line.charged;
  lines.push_back(e);
}

void FrequencyNetwork::Impl::add_drive(const Circuit& circuit, std::size_t index_in_circuit) {
  const model::Drive& drive = circuit.drives[index_in_circuit];
  // check_simulable has checked the drive: off ground, a rise time, one ideal drive a node.
  DriveEntry e;
  e.node = node_of(drive.node);
  e.resistance = drive.source_resistance;
  e.change = drive_change(drive, circuit.settings);
  const double low = drive.kind == model::WaveKind::dc ? 0.0 : drive.low;
  if (start == InitialState::rest)
    e.initial_step = low;
  else
    e.low = low;
  drives.push_back(std::move(e));
  excitations.push_back({Excitation::Kind::drive, index_in_circuit, drive.high - low});
}

void FrequencyNetwork::Impl::add_load(const model::Load& load, std::size_t) {
  LoadEntry e;
  e.node = node_of(load.node);
  e.network = &load.network;
  const LoadAdmittance::Kind form = model::load_form(load.network);
  if (e.node == kGround || form == LoadAdmittance::Kind::open) {
    e.node = kGround;  // nothing to stamp
    loads.push_back(e);
    return;
  }
  e.is_short = form == LoadAdmittance::Kind::short_circuit;
  loads.push_back(e);
}

void FrequencyNetwork::Impl::order_switches(const Circuit& circuit) {
  for (std::size_t l = 0; l < loads.size(); ++l) {
    const std::optional<double>& at = circuit.loads[l].at;
    // A load switched at or before t = 0 is simply connected, as in the characteristics run.
    if (loads[l].node == kGround || !at || !(*at > 0.0)) continue;
    switches.push_back({l, static_cast<std::size_t>(loads[l].node), *at, loads[l].is_short});
  }
  std::stable_sort(switches.begin(), switches.end(),
                   [](const Switch& a, const Switch& b) { return a.at < b.at; });
  for (std::size_t i = 0; i < switches.size(); ++i) loads[switches[i].load].switch_index = i;
}

Complex FrequencyNetwork::Impl::drive_transform(const DriveEntry& d, Complex s) const {
  const Complex change = laplace_transform(d.change, s);
  return d.initial_step != 0.0 ? change + d.initial_step / s : change;
}

Stage& FrequencyNetwork::Impl::stage(std::size_t closed) {
  auto found = stages.find(closed);
  if (found != stages.end()) return found->second;
  Stage& st = stages[closed];
  const std::size_t n = names.size();
  std::vector<bool> is_forced(n, false);
  std::vector<bool> touched(n, false);
  for (const LineEntry& l : lines) {
    if (l.near != kGround) touched[l.near] = true;
    if (l.far != kGround) touched[l.far] = true;
  }
  for (const DriveEntry& d : drives) {
    if (d.resistance == 0.0)
      is_forced[d.node] = true;
    else
      touched[d.node] = true;
  }
  for (const LoadEntry& l : loads) {
    if (l.node == kGround) continue;
    if (l.switch_index && *l.switch_index >= closed) continue;
    if (l.is_short)
      is_forced[l.node] = true;
    else
      touched[l.node] = true;
  }
  st.free_of.assign(n, -1);
  st.forced_of.assign(n, -1);
  for (std::size_t i = 0; i < n; ++i) {
    if (is_forced[i]) {
      st.forced_of[i] = static_cast<int>(st.forced_nodes.size());
      st.forced_nodes.push_back(static_cast<int>(i));
    } else if (touched[i]) {
      st.free_of[i] = st.unknowns++;
    }
    // A node nothing touches (an open end of nothing, or the node of a switch still open) is
    // left out of the equations at 0 V, as in the characteristics run.
  }
  st.sparse = st.unknowns > kDenseLimit;
  if (st.sparse) {
    std::vector<Eigen::Triplet<Complex>> pattern;
    const auto entry = [&](int p, int q) {
      if (p == kGround || q == kGround) return;
      const int fp = st.free_of[p];
      const int fq = st.free_of[q];
      if (fp >= 0 && fq >= 0) pattern.emplace_back(fp, fq, Complex(0.0, 0.0));
    };
    for (int i = 0; i < st.unknowns; ++i) pattern.emplace_back(i, i, Complex(0.0, 0.0));
    for (const LineEntry& l : lines) {
      entry(l.near, l.far);
      entry(l.far, l.near);
    }
    st.matrix.resize(st.unknowns, st.unknowns);
    st.matrix.setFromTriplets(pattern.begin(), pattern.end());
    st.matrix.makeCompressed();
  } else {
    st.dense.resize(st.unknowns, st.unknowns);
  }
  return st;
}

void FrequencyNetwork::Impl::known_voltages(Complex s, std::size_t closed,
                                            const Eigen::MatrixXcd& compensation, const Stage& st) {
  // A zero-resistance drive carries its own transform in its column; a short holds 0 V, or its
  // compensation source while it is a switch that closed.
  forced.setZero(static_cast<Eigen::Index>(st.forced_nodes.size()),
                 static_cast<Eigen::Index>(excitations.size()));
  for (std::size_t d = 0; d < drives.size(); ++d)
    if (drives[d].resistance == 0.0)
      forced(st.forced_of[drives[d].node], static_cast<Eigen::Index>(d)) =
          drive_transform(drives[d], s);
  for (const LoadEntry& l : loads)
    if (l.node != kGround && l.is_short && l.switch_index && *l.switch_index < closed)
      forced.row(st.forced_of[l.node]) =
          compensation.row(static_cast<Eigen::Index>(*l.switch_index));
}

void FrequencyNetwork::Impl::stamp_network(Complex s, std::size_t closed,
                                           const Eigen::MatrixXcd& compensation,
                                           const Stamper& stamp) {
  const Eigen::Index m = static_cast<Eigen::Index>(excitations.size());
  line_y.resize(lines.size());
  for (std::size_t k = 0; k < lines.size(); ++k) {
    line_y[k] = two_port(lines[k], s);
    stamp.two_port(lines[k].near, lines[k].far, line_y[k]);
  }
  // A line charged to V0 (zero current) obeys the telegrapher equations with initial-condition
  // sources; V = C' V0 / (G' + s C') along it with no current solves them, so its ports see the
  // uncharged two-port around that voltage, I = Y (V - Vp [1; 1]): a Norton source Y Vp [1; 1].
  // A ladder whose capacitors all start at V0 has the same particular solution.
  for (Eigen::Index c = 0; c < m; ++c) {
    const Excitation& src = excitations[static_cast<std::size_t>(c)];
    if (src.kind != Excitation::Kind::charge) continue;
    const LineEntry& l = lines[src.index];
    const Admittance& y = line_y[src.index];
    const Complex vp = *l.charged * reciprocal(s + l.totals.g / l.totals.c);
    stamp.current(l.near, c, (y.y11 + y.y12) * vp);
    stamp.current(l.far, c, (y.y12 + y.y22) * vp);
  }
  for (std::size_t d = 0; d < drives.size(); ++d) {
    const DriveEntry& e = drives[d];
    if (e.resistance == 0.0) continue;
    const double g = 1.0 / e.resistance;
    stamp.admittance(e.node, e.node, g);
    stamp.current(e.node, static_cast<Eigen::Index>(d), g * drive_transform(e, s));
  }
  for (const LoadEntry& l : loads) {
    if (l.node == kGround || l.is_short) continue;
    if (l.switch_index && *l.switch_index >= closed) continue;
    const Complex y = load_admittance(*l.network, s).y;
    stamp.admittance(l.node, l.node, y);
    // In series with a closed switch's compensation source e: the branch current is
    // Y (v - e), a Norton source Y e.
    if (l.switch_index)
      for (Eigen::Index c = 0; c < m; ++c)
        stamp.current(l.node, c, y * compensation(static_cast<Eigen::Index>(*l.switch_index), c));
  }
}

void FrequencyNetwork::Impl::solve(Complex s, std::size_t closed,
                                   const Eigen::MatrixXcd& compensation, Eigen::MatrixXcd& v) {
  if (closed > switches.size()) throw std::invalid_argument("more switches closed than exist");
  if (closed > 0 && (compensation.rows() < static_cast<Eigen::Index>(closed) ||
                     compensation.cols() != static_cast<Eigen::Index>(excitations.size())))
    throw std::invalid_argument(
        "the compensation needs a row per closed switch, a column per source");
  Stage& st = stage(closed);
  const Eigen::Index m = static_cast<Eigen::Index>(excitations.size());
  known_voltages(s, closed, compensation, st);
  rhs.setZero(st.unknowns, m);
  if (st.sparse)
    std::fill(st.matrix.valuePtr(), st.matrix.valuePtr() + st.matrix.nonZeros(), Complex(0.0, 0.0));
  else
    st.dense.setZero();
  stamp_network(s, closed, compensation, Stamper{st, rhs, forced});
  if (st.unknowns > 0) {
    if (st.sparse) {
      if (!st.analyzed) {
        st.sparse_lu.analyzePattern(st.matrix);
        st.analyzed = true;
      }
      st.sparse_lu.factorize(st.matrix);
      if (st.sparse_lu.info() != Eigen::Success)
        throw std::runtime_error("the nodal matrix could not be factored");
      unknowns = st.sparse_lu.solve(rhs);
    } else {
      // Every unknown has a two-port, a source resistance or a load to ground, and Re s > 0
      // makes each of those passive and lossy, so the matrix is regular.
      solve_dense_in_place(st.dense, rhs);
      unknowns.swap(rhs);
    }
  }
  v.setZero(static_cast<Eigen::Index>(names.size()), m);
  for (std::size_t i = 0; i < names.size(); ++i) {
    const auto row = static_cast<Eigen::Index>(i);
    if (st.free_of[i] >= 0)
      v.row(row) = unknowns.row(st.free_of[i]);
    else if (st.forced_of[i] >= 0)
      v.row(row) = forced.row(st.forced_of[i]);
  }
}

void FrequencyNetwork::Impl::solve_steady() {
  const std::size_t n = names.size();
  const Eigen::Index m = static_cast<Eigen::Index>(excitations.size());
  steady.setZero(static_cast<Eigen::Index>(n), m);
  if (start != InitialState::settled) return;
  if (std::none_of(drives.begin(), drives.end(), [](const DriveEntry& d) { return d.low != 0.0; }))
    return;
  DcSystem dc(n, m);
  // Lossless-in-series lines are shorts at DC: merge the nodes they join.
  for (const LineEntry& l : lines)
    if (l.totals.r == 0.0) dc.join(l.near, l.far);
  dc.hold(kGround, Eigen::RowVectorXd::Zero(m));
  for (std::size_t d = 0; d < drives.size(); ++d) {
    if (drives[d].resistance != 0.0) continue;
    Eigen::RowVectorXd value = Eigen::RowVectorXd::Zero(m);
    value(static_cast<Eigen::Index>(d)) = drives[d].low;
    dc.hold(drives[d].node, value);
  }
  for (const LoadEntry& l : loads) {
    if (l.node == kGround || l.switch_index) continue;
    if (load_admittance(*l.network, 0.0).kind == LoadAdmittance::Kind::short_circuit)
      dc.hold(l.node, Eigen::RowVectorXd::Zero(m));
  }
  dc.number_unknowns();
  stamp_dc(dc);
  const Eigen::MatrixXd solution = dc.solve();
  for (std::size_t i = 0; i < n; ++i)
    steady.row(static_cast<Eigen::Index>(i)) = dc.voltage(static_cast<int>(i), solution);
}

void FrequencyNetwork::Impl::stamp_dc(DcSystem& dc) const {
  for (const LineEntry& l : lines) {
    if (l.totals.r == 0.0) {
      dc.add(l.near, l.near, l.totals.g);  // the line's whole leakage, at its one DC voltage
      continue;
    }
    Admittance y;
    if (l.totals.g == 0.0) {
      y = {1.0 / l.totals.r, -1.0 / l.totals.r, 1.0 / l.totals.r};
    } else {
      y = two_port(l, 0.0);  // finite at s = 0 when R and G are both positive
    }
    dc.add(l.near, l.near, y.y11.real());
    dc.add(l.far, l.far, y.y22.real());
    dc.add(l.near, l.far, y.y12.real());
    dc.add(l.far, l.near, y.y12.real());
  }
  for (std::size_t d = 0; d < drives.size(); ++d) {
    const DriveEntry& e = drives[d];
    if (e.resistance == 0.0) continue;
    dc.add(e.node, e.node, 1.0 / e.resistance);
    dc.inject(e.node, static_cast<Eigen::Index>(d), e.low / e.resistance);
  }
  for (const LoadEntry& l : loads) {
    if (l.node == kGround || l.switch_index) continue;
    const LoadAdmittance y = load_admittance(*l.network, 0.0);
    if (y.kind == LoadAdmittance::Kind::finite) dc.add(l.node, l.node, y.y.real());
  }
}

FrequencyNetwork::FrequencyNetwork(const Circuit& circuit,
                                   const std::vector<std::optional<LadderSpec>>& ladders,
                                   InitialState initial)
    : impl_(std::make_unique<Impl>(circuit, ladders, initial)) {}
FrequencyNetwork::~FrequencyNetwork() = default;
FrequencyNetwork::FrequencyNetwork(FrequencyNetwork&&) noexcept = default;
FrequencyNetwork& FrequencyNetwork::operator=(FrequencyNetwork&&) noexcept = default;

const std::vector<std::string>& FrequencyNetwork::nodes() const {
  return impl_->names;
}
const std::vector<Excitation>& FrequencyNetwork::excitations() const {
  return impl_->excitations;
}
const std::vector<Switch>& FrequencyNetwork::switches() const {
  return impl_->switches;
}
InitialState FrequencyNetwork::initial() const {
  return impl_->start;
}
const Eigen::MatrixXd& FrequencyNetwork::steady() const {
  return impl_->steady;
}

void FrequencyNetwork::solve(Complex s, std::size_t closed, const Eigen::MatrixXcd& compensation,
                             Eigen::MatrixXcd& v) {
  impl_->solve(s, closed, compensation, v);
}

Complex FrequencyNetwork::switch_admittance(std::size_t i, Complex s) const {
  return load_admittance(*impl_->loads.at(impl_->switches.at(i).load).network, s).y;
}

}  // namespace rungs::sim
