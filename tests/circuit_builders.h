// Test helper: small circuits built directly as physics values, without description text.
#pragma once
#include <string>
#include <utility>
#include <vector>

#include <catch2/catch.hpp>

#include "3_model/circuit.h"
#include "5_plan/plan.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/input_file.h"

namespace rungs::testing {

/// An ideal line of impedance z0 (ohm) and one-way delay (s) between two nodes.
inline model::Line ideal_line(const std::string& name, const std::string& near,
                                const std::string& far, double z0, double delay) {
  model::Line l;
  l.name = name;
  l.near = near;
  l.far = far;
  l.model = "ideal";
  l.z0 = z0;
  l.delay = delay;
  return l;
}

/// A step from `low` to `high` volts behind `source` ohms, its 10-90 % edge `rise` (s)
/// starting at `at` (s).
inline model::Drive step_drive(const std::string& node, double low, double high, double source,
                                 double rise, double at = 0.0) {
  model::Drive d;
  d.node = node;
  d.kind = model::WaveKind::step;
  d.low = low;
  d.high = high;
  d.rise = rise;
  d.at = at;
  d.source_resistance = source;
  return d;
}

/// One R, C or L of `value` (ohm, F, H).
inline model::LoadNetwork element(model::ElementKind kind, double value) {
  model::LoadNetwork n;
  n.kind = model::NetworkKind::single;
  n.element = kind;
  n.value = value;
  return n;
}

/// Parts joined in series or in parallel.
inline model::LoadNetwork combine(model::NetworkKind kind,
                                    std::vector<model::LoadNetwork> parts) {
  model::LoadNetwork n;
  n.kind = kind;
  n.parts = std::move(parts);
  return n;
}

/// A load from `node` to ground, connected from t = 0.
inline model::Load load(const std::string& node, model::LoadNetwork network) {
  model::Load l;
  l.node = node;
  l.network = std::move(network);
  return l;
}

/// The analytic plan of `c`, as rungs plan --analytic makes it; a test fails if it errs (as
/// it does when c's edges were not derived: model::derive_edges).
inline plan::Plan analytic_plan(const model::Circuit& c) {
  const syntax::InputFile file{"test.rungs", ""};
  syntax::Diagnostics diagnostics(file);
  plan::Plan p = plan::plan_circuit(c, diagnostics);
  REQUIRE_FALSE(diagnostics.has_errors());
  return p;
}

}  // namespace rungs::testing
