// The resolved circuit: lines with their electrical figures, drives and loads, all in SI.
#pragma once
#include <optional>
#include <string>
#include <vector>

#include "1_syntax/kinds.h"
#include "1_syntax/input_file.h"
#include "2_physics/per_length.h"

namespace rungs::model {

/// Section shape of a ladder: pi (C/2, L, C/2), T (L/2, C, L/2) or L (L then C).
enum class Shape { pi, t, l };

/// The SPICE3 integration method the deck asks the simulator for (`.options method=`):
/// trapezoidal, or Gear's backward-difference formulas.
enum class IntegrationMethod { trap, gear };

/// An edge of a drive, or the one a line is planned for: the 10-90 % time of a linear ramp and
/// the 0-100 % time of the whole ramp (ramp_time in 3_model/edges.h).
struct Edge {
  double rise = 0.0;  // s
  double ramp = 0.0;  // s
};

/// A transmission line between two nodes, with the ground as its reference.
struct Line {
  std::string name;
  syntax::Span span;  // the line's name in the text
  std::string near;
  std::string far;
  syntax::Span near_span;
  syntax::Span far_span;
  std::string model;
  /// L', C', R', G'; L' and C' are meaningful only when `length` is known.
  physics::PerLength per_length;
  std::optional<double> length;  // m; unknown for an ideal line given by its delay alone
  double delay = 0.0;            // s
  double z0 = 0.0;               // ohm, lossless sqrt(L'/C')
  double velocity = 0.0;         // m/s
  double eps_eff = 1.0;          // (c/v)^2

  // Per-line options; empty means "use the design's setting".
  std::optional<int> sections;
  std::optional<Shape> shape;
  std::optional<double> tolerance;  // fraction of the swing
  std::optional<double> rise;       // s, 10-90 %
  std::optional<double> charged;    // V, the line's initial voltage

  /// Derived by derive_edges (3_model/edges.h): the edge that reaches the line, its own rise=,
  /// else the fastest drive in its connected part, else `set rise`; empty when none does.
  std::optional<Edge> edge;
};

using WaveKind = syntax::ast::WaveKind;

/// A voltage source behind a resistance, from a node to ground.
struct Drive {
  std::string node;
  syntax::Span span;  // the drive's node in the text
  WaveKind kind = WaveKind::step;
  double low = 0.0;   // V; for dc, 0 before `at`
  double high = 0.0;  // V; for dc, the level
  std::optional<double> rise;  // s, 10-90 % of a linear ramp; empty: the design's `set rise`
  double at = 0.0;             // s, where the ramp starts
  double source_resistance = 0.0;  // ohm
  std::optional<double> width;     // s, pulse only: time at the high level
  std::optional<double> period;    // s, pulse only; empty: a single pulse

  /// Derived by derive_edges (3_model/edges.h): its own rise, else `set rise`; empty when
  /// neither is given.
  std::optional<Edge> edge;
};

enum class ElementKind { resistor, capacitor, inductor };
using NetworkKind = syntax::ast::NetworkKind;

/// A two-terminal load network: one element, or parts in series or in parallel, or an open
/// or a short.
struct LoadNetwork {
  NetworkKind kind = NetworkKind::single;
  ElementKind element = ElementKind::resistor;  // for kind == single
  double value = 0.0;                           // ohm, F or H, for kind == single
  std::vector<LoadNetwork> parts;               // for series and parallel
};

/// A load from a node to ground, connected from t = 0 or switched in at `at`.
struct Load {
  std::string node;
  syntax::Span span;  // the load's node in the text
  LoadNetwork network;
  std::optional<double> at;  // s
};

/// Design-wide settings (`set`).
struct Settings {
  std::optional<double> rise;     // s
  double tolerance = 0.02;        // fraction of the swing
  Shape shape = Shape::pi;
  std::optional<double> window;   // s
  IntegrationMethod method = IntegrationMethod::trap;  // `set method`
  std::optional<double> step;     // s, the deck's maximum time step (`set step`); else chosen
};

struct Circuit {
  std::string name;
  Settings settings;
  std::vector<Line> lines;
  std::vector<Drive> drives;
  std::vector<Load> loads;
};

/// The name of a shape as the language writes it: "pi", "t", "l".
std::string_view shape_name(Shape shape);

/// The name of an integration method as the language and SPICE write it: "trap", "gear".
std::string_view method_name(IntegrationMethod method);

/// True for the ground node as written: "0" or "gnd" in any case.
bool is_ground(std::string_view node);

}  // namespace rungs::model
