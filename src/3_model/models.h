// The registry of line models: their parameters and how each turns them into Z0 and speed.
// Adding a model means adding one entry here (see DEVELOPERS.md).
#pragma once
#include <functional>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "1_syntax/units.h"

namespace rungs::model {

/// One parameter a model takes.
struct ParamSpec {
  std::string_view key;
  syntax::Dimension dimension;
  bool required;
  std::string_view meaning;  // for `rungs` help and messages: "inner-conductor diameter"
};

/// Values of a model's parameters by key, SI; only the ones written are present.
using ParamValues = std::map<std::string, double, std::less<>>;

/// Something wrong or doubtful about a model's parameters, pinned to one of them.
struct ModelProblem {
  bool is_error = true;
  std::string key;  // the parameter to point at
  std::string message;
};

/// What a model gives: the lossless impedance and, where the model knows it, the speed.
struct ModelResult {
  double z0 = 0.0;
  std::optional<double> velocity;  // m/s; empty for an ideal line given only z0 (and delay)
  std::vector<ModelProblem> problems;
};

struct ModelSpec {
  std::string_view name;
  std::string_view summary;
  std::vector<ParamSpec> params;
  /// Called only when every required parameter is present. A result with an error problem
  /// has no meaningful figures.
  std::function<ModelResult(const ParamValues&)> evaluate;
};

/// Every model, in the order the documentation lists them.
const std::vector<ModelSpec>& line_models();

/// The model of that name, or null.
const ModelSpec* find_model(std::string_view name);

/// Options every line takes, whatever its model (length, delay, sections, shape, ...).
const std::vector<ParamSpec>& line_options();

}  // namespace rungs::model
