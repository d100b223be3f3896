// The nodal equations of a whole circuit at a complex frequency, each line an exact or ladder
// two-port, solved for every source at once.
#pragma once
#include <complex>
#include <cstddef>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "3_model/circuit.h"
#include "3_model/load_network.h"
#include "4_sim/excitation.h"
#include "4_sim/frequency_drives.h"
#include "4_sim/frequency_parts.h"
#include "4_sim/two_port.h"

namespace rungs::sim {

/// The nodal network of a circuit: nodes are every line end (in the order the lines name them),
/// then any node that only drives and loads touch, as simulate_characteristics lists them.
/// `ladders` (empty, or parallel to circuit.lines) replaces a line by its N-section ladder
/// (ladder_admittance); other lines are exact (line_admittance). Lines may carry R' and G'.
///
/// Throws std::invalid_argument for a line without a positive, finite z0 and delay, a ladder with
/// fewer than one section, a drive on ground or without a rise time, a negative or non-finite
/// source resistance or load element, two zero-resistance drives on one node (or one and a
/// short), settled start with a charged line, or a zero-resistance drive joined to another
/// forced node by a lossless path (their DC levels would fight).
class FrequencyNetwork {
 public:
  FrequencyNetwork(const model::Circuit& circuit,
                   const std::vector<std::optional<LadderSpec>>& ladders, InitialState initial);
  ~FrequencyNetwork();
  FrequencyNetwork(FrequencyNetwork&&) noexcept;
  FrequencyNetwork& operator=(FrequencyNetwork&&) noexcept;

  const std::vector<std::string>& nodes() const;
  const std::vector<Excitation>& excitations() const;
  /// Switched loads in the order they close (by time, then by their order in the text).
  const std::vector<Switch>& switches() const;
  /// The start actually used (automatic resolved).
  InitialState initial() const;

  /// The constant part of every node's voltage (rows) per source (columns), V: in a settled start
  /// the DC state from each drive's low level (a nodal solution at s = 0 with lossless lines as
  /// shorts, capacitors open, inductors shorted, and 1e-12 S from each node to ground so that a
  /// floating node settles at 0 V); zero otherwise.
  const Eigen::MatrixXd& steady() const;

  /// The Laplace transforms V(s) of every node's voltage change (rows) per source (columns), with
  /// the first `closed` switches in place. `compensation` (rows switches, columns sources, at
  /// least `closed` rows) holds their series sources E(s). Needs Re s > 0.
  void solve(Complex s, std::size_t closed, const Eigen::MatrixXcd& compensation,
             Eigen::MatrixXcd& v);

  /// The admittance of switch i's load at s (its impedance's inverse; not for a short).
  Complex switch_admittance(std::size_t i, Complex s) const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace rungs::sim
