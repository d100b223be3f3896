// The line models: parameters, physical checks and the closed forms behind each one.
#include "3_model/models.h"

#include <cmath>

#include <fmt/format.h>

#include "2_physics/coax.h"
#include "2_physics/constants.h"
#include "2_physics/microstrip.h"
#include "2_physics/plates.h"
#include "2_physics/stripline.h"
#include "2_physics/twin.h"

namespace rungs::model {

namespace {

using syntax::Dimension;

ModelProblem error(std::string key, std::string message) {
  return {true, std::move(key), std::move(message)};
}
ModelProblem warning(std::string key, std::string message) {
  return {false, std::move(key), std::move(message)};
}

/// Checks shared by the models: sizes positive, er at least 1.
void check_positive(const ParamValues& p, std::initializer_list<std::string_view> keys,
                    std::vector<ModelProblem>& problems) {
  for (std::string_view key : keys) {
    auto it = p.find(key);
    if (it != p.end() && !(it->second > 0.0))
      problems.push_back(error(std::string(key), fmt::format("{}= must be greater than zero", key)));
  }
}
void check_er(const ParamValues& p, std::vector<ModelProblem>& problems) {
  auto it = p.find("er");
  if (it != p.end() && !(it->second >= 1.0))
    problems.push_back(error("er", fmt::format("er={} is below 1; a dielectric's relative "
                                               "permittivity is at least 1 (vacuum)",
                                               it->second)));
}
bool has_error(const std::vector<ModelProblem>& problems) {
  for (const ModelProblem& p : problems)
    if (p.is_error) return true;
  return false;
}

ModelResult from_per_length(const physics::PerLength& pl, std::vector<ModelProblem> problems) {
  return {physics::characteristic_impedance(pl), physics::phase_velocity(pl), std::move(problems)};
}

ModelResult evaluate_ideal(const ParamValues& p) {
  ModelResult r;
  check_positive(p, {"z0", "v"}, r.problems);
  check_er(p, r.problems);
  if (p.count("v") && p.count("er"))
    r.problems.push_back(error("er", "give the speed once: v= or er=, not both"));
  if (auto v = p.find("v"); v != p.end() && v->second > physics::kSpeedOfLight * (1 + 1e-12))
    r.problems.push_back(error("v", fmt::format("v={:.6g}m/s is faster than light; write a "
                                                "fraction of c such as 0.66c",
                                                v->second)));
  if (has_error(r.problems)) return r;
  r.z0 = p.at("z0");
  if (auto v = p.find("v"); v != p.end()) r.velocity = v->second;
  if (auto er = p.find("er"); er != p.end()) r.velocity = physics::kSpeedOfLight / std::sqrt(er->second);
  return r;
}

ModelResult evaluate_perlength(const ParamValues& p) {
  std::vector<ModelProblem> problems;
  check_positive(p, {"l", "c"}, problems);
  if (has_error(problems)) return {0.0, std::nullopt, problems};
  const physics::PerLength pl{p.at("l"), p.at("c")};
  if (physics::phase_velocity(pl) > physics::kSpeedOfLight * (1 + 1e-9))
    problems.push_back(error("c", fmt::format("l and c give {:.4g}c, faster than light; "
                                              "check their units",
                                              physics::phase_velocity(pl) / physics::kSpeedOfLight)));
  return from_per_length(pl, std::move(problems));
}

ModelResult evaluate_coax(const ParamValues& p) {
  std::vector<ModelProblem> problems;
  check_positive(p, {"inner", "outer"}, problems);
  check_er(p, problems);
  if (!has_error(problems) && p.at("inner") >= p.at("outer"))
    problems.push_back(error("inner", "inner must be smaller than outer (both are diameters)"));
  if (has_error(problems)) return {0.0, std::nullopt, problems};
  return from_per_length(physics::coax_per_length(p.at("inner"), p.at("outer"), p.at("er")), problems);
}

ModelResult evaluate_twin(const ParamValues& p) {
  std::vector<ModelProblem> problems;
  check_positive(p, {"wire", "spacing"}, problems);
  check_er(p, problems);
  if (!has_error(problems) && p.at("spacing") <= p.at("wire"))
    problems.push_back(error("spacing", "spacing (centre to centre) must exceed the wire "
                                        "diameter, or the wires overlap"));
  if (has_error(problems)) return {0.0, std::nullopt, problems};
  return from_per_length(physics::twin_per_length(p.at("wire"), p.at("spacing"), p.at("er")), problems);
}

ModelResult evaluate_plates(const ParamValues& p) {
  std::vector<ModelProblem> problems;
  check_positive(p, {"width", "gap"}, problems);
  check_er(p, problems);
  if (has_error(problems)) return {0.0, std::nullopt, problems};
  const double aspect = p.at("width") / p.at("gap");
  if (aspect < physics::kPlatesMinAspect)
    problems.push_back(warning("width", fmt::format("width/gap = {:.3g} is below {:g}; the "
                                                    "parallel-plate formula neglects fringing "
                                                    "and holds for width much larger than gap "
                                                    "(Pozar, Table 2.1; common practice)",
                                                    aspect, physics::kPlatesMinAspect)));
  return from_per_length(physics::plates_per_length(p.at("width"), p.at("gap"), p.at("er")), problems);
}

double thickness_of(const ParamValues& p) {
  auto t = p.find("thickness");
  return t == p.end() ? 0.0 : t->second;
}

void check_thickness(const ParamValues& p, std::vector<ModelProblem>& problems) {
  if (auto t = p.find("thickness"); t != p.end() && t->second < 0.0)
    problems.push_back(error("thickness", "thickness cannot be negative (0 for a thin strip)"));
}

ModelResult evaluate_microstrip(const ParamValues& p) {
  std::vector<ModelProblem> problems;
  check_positive(p, {"width", "height"}, problems);
  check_thickness(p, problems);
  check_er(p, problems);
  if (has_error(problems)) return {0.0, std::nullopt, problems};
  const double u = p.at("width") / p.at("height");
  if (u < physics::kMicrostripMinAspect || u > physics::kMicrostripMaxAspect)
    problems.push_back(warning("width", fmt::format("width/height = {:.3g} is outside {:g} to "
                                                    "{:g}, where Hammerstad and Jensen (1980) "
                                                    "state their accuracy",
                                                    u, physics::kMicrostripMinAspect,
                                                    physics::kMicrostripMaxAspect)));
  if (p.at("er") > physics::kMicrostripMaxEr)
    problems.push_back(warning("er", fmt::format("er above {:g} is outside the range where "
                                                 "Hammerstad and Jensen (1980) state their "
                                                 "accuracy",
                                                 physics::kMicrostripMaxEr)));
  return from_per_length(
      physics::microstrip_per_length(p.at("width"), p.at("height"), thickness_of(p), p.at("er")),
      problems);
}

ModelResult evaluate_stripline(const ParamValues& p) {
  std::vector<ModelProblem> problems;
  check_positive(p, {"width", "spacing"}, problems);
  check_thickness(p, problems);
  check_er(p, problems);
  if (!has_error(problems) && thickness_of(p) >= p.at("spacing"))
    problems.push_back(error("thickness", "thickness must be less than the ground-plane "
                                          "spacing"));
  if (has_error(problems)) return {0.0, std::nullopt, problems};
  const double ratio = thickness_of(p) / p.at("spacing");
  if (ratio > physics::kStriplineMaxThicknessRatio)
    problems.push_back(warning("thickness", fmt::format("thickness/spacing = {:.3g} is above "
                                                        "{:g}: a strip this thick is outside "
                                                        "the thin-strip case that Wheeler's "
                                                        "(1978) thickness correction was made "
                                                        "for (common practice)",
                                                        ratio, physics::kStriplineMaxThicknessRatio)));
  return from_per_length(
      physics::stripline_per_length(p.at("width"), p.at("spacing"), thickness_of(p), p.at("er")),
      problems);
}

}  // namespace

const std::vector<ModelSpec>& line_models() {
  static const std::vector<ModelSpec> models = {
      {"ideal",
       "a line given by its impedance and its delay or speed",
       {{"z0", Dimension::resistance, true, "characteristic impedance"},
        {"v", Dimension::speed, false, "propagation speed, e.g. 0.66c"},
        {"er", Dimension::ratio, false, "effective relative permittivity (sets the speed)"}},
       evaluate_ideal},
      {"perlength",
       "a line given by its inductance and capacitance per length",
       {{"l", Dimension::inductance_per_length, true, "series inductance per length"},
        {"c", Dimension::capacitance_per_length, true, "shunt capacitance per length"}},
       evaluate_perlength},
      {"coax",
       "coaxial cable",
       {{"inner", Dimension::length, true, "inner-conductor diameter"},
        {"outer", Dimension::length, true, "dielectric (shield inside) diameter"},
        {"er", Dimension::ratio, true, "dielectric relative permittivity"}},
       evaluate_coax},
      {"twin",
       "two round wires (twin lead)",
       {{"wire", Dimension::length, true, "wire diameter"},
        {"spacing", Dimension::length, true, "centre-to-centre spacing"},
        {"er", Dimension::ratio, true, "relative permittivity around the wires"}},
       evaluate_twin},
      {"plates",
       "two parallel plates, width much larger than gap",
       {{"width", Dimension::length, true, "plate width"},
        {"gap", Dimension::length, true, "distance between the plates"},
        {"er", Dimension::ratio, true, "relative permittivity between the plates"}},
       evaluate_plates},
      {"microstrip",
       "a strip over a ground plane on a substrate (Hammerstad-Jensen)",
       {{"width", Dimension::length, true, "strip width"},
        {"height", Dimension::length, true, "substrate height"},
        {"thickness", Dimension::length, false, "strip thickness (default 0)"},
        {"er", Dimension::ratio, true, "substrate relative permittivity"}},
       evaluate_microstrip},
      {"stripline",
       "a strip centred between two ground planes (Cohn, Wheeler)",
       {{"width", Dimension::length, true, "strip width"},
        {"spacing", Dimension::length, true, "ground-plane spacing"},
        {"thickness", Dimension::length, false, "strip thickness (default 0)"},
        {"er", Dimension::ratio, true, "dielectric relative permittivity"}},
       evaluate_stripline},
  };
  return models;
}

const ModelSpec* find_model(std::string_view name) {
  for (const ModelSpec& m : line_models())
    if (m.name == name) return &m;
  return nullptr;
}

const std::vector<ParamSpec>& line_options() {
  static const std::vector<ParamSpec> options = {
      {"length", Dimension::length, false, "physical length"},
      {"delay", Dimension::time, false, "one-way delay"},
      {"r", Dimension::resistance_per_length, false, "series resistance per length"},
      {"g", Dimension::conductance_per_length, false, "shunt conductance per length"},
      {"sections", Dimension::count, false, "section count (overrides the planner)"},
      {"shape", Dimension::ratio, false, "section shape: pi, t or l"},
      {"tolerance", Dimension::ratio, false, "waveform error budget for this line"},
      {"rise", Dimension::time, false, "rise time of the edge that reaches this line"},
      {"charged", Dimension::voltage, false, "initial voltage of the line"},
  };
  return options;
}

}  // namespace rungs::model
