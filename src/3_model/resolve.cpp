// From syntax tree to circuit: reading values with their units, evaluating line models,
// checking each statement's parameters.
#include "3_model/resolve.h"

#include <cmath>
#include <map>
#include <set>

#include <fmt/format.h>

#include "1_syntax/ast.h"
#include "1_syntax/suggest.h"
#include "1_syntax/text.h"
#include "1_syntax/units.h"
#include "2_physics/constants.h"
#include "3_model/edges.h"
#include "3_model/models.h"

namespace rungs::model {

namespace {

namespace ast = syntax::ast;
using syntax::Diagnostics;
using syntax::Dimension;
using syntax::Span;

std::string where(const Diagnostics& d, Span span) {
  const syntax::Location at = d.file().locate(span.begin);
  return fmt::format("{}:{}", at.line, at.column);
}

std::optional<double> read(const ast::Value& value, Dimension dimension, Diagnostics& d) {
  auto result = syntax::read_quantity(value.text, dimension);
  if (auto* error = std::get_if<syntax::UnitError>(&result)) {
    d.error(value.span, error->message);
    return std::nullopt;
  }
  return std::get<double>(result);
}

constexpr std::string_view kShapes[] = {"pi", "t", "l"};
constexpr std::string_view kMethods[] = {"trap", "gear"};

std::optional<Shape> read_shape(const ast::Value& value, Diagnostics& d) {
  if (value.text == "pi") return Shape::pi;
  if (value.text == "t") return Shape::t;
  if (value.text == "l") return Shape::l;
  d.error(value.span,
          fmt::format("unknown shape '{}'{}", value.text, syntax::did_you_mean(value.text, kShapes)));
  return std::nullopt;
}

/// The parameters of one statement by key, with duplicates and unknown keys reported.
class ParamReader {
 public:
  ParamReader(const std::vector<ast::Param>& params, std::vector<const ParamSpec*> specs,
              std::string_view owner, Diagnostics& d)
      : d_(d) {
    std::vector<std::string_view> keys;
    for (const ParamSpec* s : specs) keys.push_back(s->key);
    for (const ast::Param& p : params) {
      const ParamSpec* spec = nullptr;
      for (const ParamSpec* s : specs)
        if (s->key == p.key.text) spec = s;
      if (!spec) {
        d.error(p.key.span, fmt::format("unknown parameter '{}' for {}{}", p.key.text, owner,
                                        syntax::did_you_mean(p.key.text, keys)));
        if (std::string near = syntax::nearest(p.key.text, keys); !near.empty())
          suggested_.insert(std::move(near));
        failed_ = true;
        continue;
      }
      auto [it, fresh] = given_.emplace(p.key.text, &p);
      if (!fresh) {
        d.error(p.key.span, fmt::format("{} is given twice (first at {}); keep one", p.key.text,
                                        where(d, it->second->key.span)));
        continue;
      }
      if (p.key.text == "shape") {
        shape_ = read_shape(p.value, d);
      } else if (auto v = read(p.value, spec->dimension, d)) {
        values_[p.key.text] = *v;
      } else {
        failed_ = true;
      }
    }
  }

  bool has(std::string_view key) const { return given_.count(key) > 0; }
  /// True when an unknown key was reported with this one as its "did you mean", so that its
  /// absence need not be reported again.
  bool was_suggested(std::string_view key) const { return suggested_.count(key) > 0; }
  std::optional<double> get(std::string_view key) const {
    auto it = values_.find(key);
    return it == values_.end() ? std::nullopt : std::optional<double>(it->second);
  }
  /// The parameter's value token, or null when it was not written.
  const ast::Value* value_of(std::string_view key) const {
    auto it = given_.find(key);
    return it == given_.end() ? nullptr : &it->second->value;
  }
  /// The value of a parameter as written ("1ns"), for messages.
  std::string text_of(std::string_view key) const {
    auto it = given_.find(key);
    return it == given_.end() ? std::string() : it->second->value.text;
  }
  /// The span of a parameter's value, or `fallback` when it was not written.
  Span span_of(std::string_view key, Span fallback) const {
    auto it = given_.find(key);
    return it == given_.end() ? fallback : it->second->value.span;
  }
  const ParamValues& values() const { return values_; }
  std::optional<Shape> shape() const { return shape_; }
  bool failed() const { return failed_; }

  /// Reports an error unless `value` (if given) is positive.
  void require_positive(std::string_view key, Span fallback, std::string_view what) const {
    if (auto v = get(key); v && !(*v > 0.0))
      d_.error(span_of(key, fallback), fmt::format("{}= must be greater than zero", what));
  }
  void require_not_negative(std::string_view key, Span fallback, std::string_view what) const {
    if (auto v = get(key); v && *v < 0.0)
      d_.error(span_of(key, fallback), fmt::format("{}= cannot be negative", what));
  }

 private:
  Diagnostics& d_;
  std::map<std::string, const ast::Param*, std::less<>> given_;
  ParamValues values_;
  std::optional<Shape> shape_;
  std::set<std::string, std::less<>> suggested_;
  bool failed_ = false;
};

void check_tolerance(std::optional<double> tolerance, const ast::Value* written, Diagnostics& d) {
  if (!tolerance || (*tolerance > 0.0 && *tolerance < 1.0)) return;
  const Span span = written->span;
  if (written->text.back() != '%' && *tolerance >= 1.0 && *tolerance < 100.0)
    d.error(span, fmt::format("the tolerance is a fraction of the swing between 0 and 100 %; "
                              "for {:g} percent write {:g}%",
                              *tolerance, *tolerance));
  else
    d.error(span, "the tolerance is a fraction of the swing between 0 and 100 %; write for "
                  "example 2%");
}

struct Resolver {
  Diagnostics& d;
  Circuit circuit;
  /// Every line, drive and load by name and node, also those whose values were wrong, so
  /// that topology checks do not report knock-on errors.
  Circuit connections;
  std::optional<Span> design_span;
  std::map<std::string, Span, std::less<>> settings_seen;

  void design(const ast::DesignStatement& s) {
    if (design_span) {
      d.error(s.name.span, fmt::format("the design is already named at {}; keep one design "
                                       "statement",
                                       where(d, *design_span)));
      return;
    }
    design_span = s.name.span;
    circuit.name = s.name.text;
  }

  void setting(const ast::SetStatement& s) {
    static constexpr std::string_view keys[] = {"rise",   "tolerance", "shape",
                                                "window", "method",    "step"};
    const std::string& key = s.key.text;
    if (std::find(std::begin(keys), std::end(keys), key) == std::end(keys)) {
      d.error(s.key.span,
              fmt::format("unknown setting '{}'{}", key, syntax::did_you_mean(key, keys)));
      return;
    }
    if (auto [it, fresh] = settings_seen.emplace(key, s.key.span); !fresh) {
      d.error(s.key.span, fmt::format("{} is already set at {}; keep one", key,
                                      where(d, it->second)));
      return;
    }
    Settings& st = circuit.settings;
    if (key == "shape") {
      if (auto shape = read_shape(s.value, d)) st.shape = *shape;
    } else if (key == "method") {
      if (s.value.text == "trap" || s.value.text == "gear")
        st.method = s.value.text == "gear" ? IntegrationMethod::gear : IntegrationMethod::trap;
      else
        d.error(s.value.span, fmt::format("unknown integration method '{}'{}", s.value.text,
                                          syntax::did_you_mean(s.value.text, kMethods)));
    } else if (key == "tolerance") {
      if (auto v = read(s.value, Dimension::ratio, d)) {
        check_tolerance(v, &s.value, d);
        st.tolerance = *v;
      }
    } else if (auto v = read(s.value, Dimension::time, d)) {
      if (!(*v > 0.0)) d.error(s.value.span, fmt::format("{} must be greater than zero", key));
      (key == "rise" ? st.rise : key == "step" ? st.step : st.window) = *v;
    }
  }

  void line(const ast::LineStatement& s);
  void drive(const ast::DriveStatement& s);
  void load(const ast::LoadStatement& s);
  std::optional<LoadNetwork> network(const ast::LoadNetwork& n);
};

std::string node_name(const ast::Word& w) { return is_ground(w.text) ? "0" : w.text; }

/// The model a line statement names; an error with a "did you mean" when none has that name.
const ModelSpec* line_model(const ast::Word& name, Diagnostics& d) {
  if (const ModelSpec* model = find_model(name.text)) return model;
  std::vector<std::string_view> names;
  for (const ModelSpec& m : line_models()) names.push_back(m.name);
  d.error(name.span,
          fmt::format("unknown model '{}'{}", name.text, syntax::did_you_mean(name.text, names)));
  return nullptr;
}

/// Reads a line's own options (sections, shape, tolerance, rise, charged) into `line` and
/// checks the signs of the figures written beside them.
void read_line_options(const ParamReader& params, const ast::LineStatement& s, Line& line,
                       Diagnostics& d) {
  if (auto n = params.get("sections")) {
    if (*n < 1) d.error(params.span_of("sections", s.name.span), "sections must be at least 1");
    line.sections = static_cast<int>(*n);
  }
  line.shape = params.shape();
  line.tolerance = params.get("tolerance");
  check_tolerance(line.tolerance, params.value_of("tolerance"), d);
  params.require_positive("rise", s.name.span, "rise");
  line.rise = params.get("rise");
  line.charged = params.get("charged");
  params.require_positive("length", s.name.span, "length");
  params.require_positive("delay", s.name.span, "delay");
  params.require_not_negative("r", s.name.span, "r");
  params.require_not_negative("g", s.name.span, "g");
}

/// Evaluates the line's model on its parameters, reporting its problems (errors and
/// warnings); empty when one of them is an error.
std::optional<ModelResult> evaluate_model(const ModelSpec& model, const ParamReader& params,
                                          const ast::LineStatement& s, Diagnostics& d) {
  ParamValues model_values;
  for (const ParamSpec& p : model.params)
    if (auto v = params.get(p.key)) model_values[std::string(p.key)] = *v;
  ModelResult result = model.evaluate(model_values);
  bool ok = true;
  for (const ModelProblem& problem : result.problems) {
    const Span at = params.span_of(problem.key, s.model.span);
    if (problem.is_error) {
      d.error(at, problem.message);
      ok = false;
    } else {
      d.warning(at, problem.message);
    }
  }
  if (!ok) return std::nullopt;
  return result;
}

/// Length, delay and speed of a line whose model gives a speed: any two fix the third, and
/// all three must agree. False (reported) when they do not, or neither length nor delay is
/// given.
bool set_extent_with_speed(const ModelSpec& model, const ParamReader& params,
                           const ast::LineStatement& s, Line& line, Diagnostics& d) {
  const std::optional<double> length = params.get("length");
  const std::optional<double> delay = params.get("delay");
  if (length && delay) {
    const double implied = *length / *delay;
    if (std::abs(implied - line.velocity) > 1e-3 * line.velocity) {
      d.error(params.span_of("delay", s.name.span),
              fmt::format("length={} and delay={} imply {:.4g}c, but this {} line "
                          "carries {:.4g}c; give only one of length= and delay=",
                          params.text_of("length"), params.text_of("delay"),
                          implied / physics::kSpeedOfLight, model.name,
                          line.velocity / physics::kSpeedOfLight));
      return false;
    }
  }
  if (!length && !delay) {
    d.error(s.model.span, fmt::format("{} needs length= (or delay=)", model.name));
    return false;
  }
  line.length = length ? *length : *delay * line.velocity;
  line.delay = delay ? *delay : *length / line.velocity;
  return true;
}

/// Delay (required) and length (optional) of an ideal line whose model gives no speed; the
/// speed follows from them and cannot exceed light's. False (reported) otherwise.
bool set_extent_ideal(const ParamReader& params, const ast::LineStatement& s, Line& line,
                      Diagnostics& d) {
  const std::optional<double> length = params.get("length");
  const std::optional<double> delay = params.get("delay");
  if (!delay) {
    d.error(s.model.span, "an ideal line needs delay=, or length= with a speed (v= or er=)");
    return false;
  }
  line.delay = *delay;
  line.length = length;
  line.velocity = length ? *length / *delay : 0.0;
  if (length && line.velocity > physics::kSpeedOfLight * (1 + 1e-9)) {
    d.error(params.span_of("delay", s.name.span),
            fmt::format("length={} in delay={} is faster than light", params.text_of("length"),
                        params.text_of("delay")));
    return false;
  }
  return true;
}

/// The per-length figures from Z0 and speed, and R' and G', which need a length. False
/// (reported) when r= or g= is given for a line without one.
bool set_per_length(const ParamReader& params, const ast::LineStatement& s, Line& line,
                    Diagnostics& d) {
  if (line.velocity > 0) {
    line.per_length = physics::per_length_from_z0_velocity(line.z0, line.velocity);
    line.eps_eff = physics::effective_permittivity(line.per_length);
  }
  for (std::string_view key : {"r", "g"}) {
    if (params.has(key) && !line.length) {
      d.error(params.span_of(key, s.name.span),
              fmt::format("{}= is per length, and this line has none; give length= too", key));
      return false;
    }
  }
  line.per_length.r = params.get("r").value_or(0.0);
  line.per_length.g = params.get("g").value_or(0.0);
  return true;
}

void Resolver::line(const ast::LineStatement& s) {
  Line ends;
  ends.name = s.name.text;
  ends.span = s.name.span;
  ends.near = node_name(s.near);
  ends.far = node_name(s.far);
  ends.near_span = s.near.span;
  ends.far_span = s.far.span;
  connections.lines.push_back(ends);

  const ModelSpec* model = line_model(s.model, d);
  if (!model) return;
  std::vector<const ParamSpec*> specs;
  for (const ParamSpec& p : model->params) specs.push_back(&p);
  for (const ParamSpec& p : line_options()) specs.push_back(&p);
  const ParamReader params(s.params, specs, fmt::format("{} lines", model->name), d);

  bool complete = !params.failed();
  for (const ParamSpec& p : model->params) {
    if (p.required && !params.has(p.key)) {
      if (!params.was_suggested(p.key))
        d.error(s.model.span, fmt::format("{} needs {}= ({})", model->name, p.key, p.meaning));
      complete = false;
    }
  }

  Line line = ends;
  line.model = model->name;
  read_line_options(params, s, line, d);
  if (!complete) return;
  const std::optional<ModelResult> result = evaluate_model(*model, params, s, d);
  if (!result) return;
  line.z0 = result->z0;
  const std::optional<double> length = params.get("length");
  const std::optional<double> delay = params.get("delay");
  if ((length && !(*length > 0)) || (delay && !(*delay > 0))) return;  // reported above
  if (result->velocity) line.velocity = *result->velocity;
  const bool extent = result->velocity ? set_extent_with_speed(*model, params, s, line, d)
                                       : set_extent_ideal(params, s, line, d);
  if (!extent || !set_per_length(params, s, line, d)) return;
  circuit.lines.push_back(std::move(line));
}

void Resolver::drive(const ast::DriveStatement& s) {
  static const std::vector<ParamSpec> common = {
      {"source", Dimension::resistance, false, "source resistance"},
      {"rise", Dimension::time, false, "10-90 % rise time"},
      {"at", Dimension::time, false, "start time"}};
  static const std::vector<ParamSpec> pulse_only = {
      {"width", Dimension::time, false, "time at the high level"},
      {"period", Dimension::time, false, "repetition period"}};
  const bool is_pulse = s.waveform.kind == WaveKind::pulse;
  std::vector<const ParamSpec*> specs;
  for (const ParamSpec& p : common) specs.push_back(&p);
  if (is_pulse)
    for (const ParamSpec& p : pulse_only) specs.push_back(&p);
  const char* kind_name = s.waveform.kind == WaveKind::step ? "step" : is_pulse ? "pulse" : "dc";
  const ParamReader params(s.params, specs, fmt::format("{} drives", kind_name), d);

  Drive drive;
  drive.node = node_name(s.node);
  drive.span = s.node.span;
  connections.drives.push_back(drive);
  drive.kind = s.waveform.kind;
  auto low = read(s.waveform.low, Dimension::voltage, d);
  std::optional<double> high;
  if (s.waveform.high) high = read(*s.waveform.high, Dimension::voltage, d);
  if (drive.kind == WaveKind::dc) {
    high = low;
    low = 0.0;
  }
  if (!low || !high) return;
  drive.low = *low;
  drive.high = *high;
  if (drive.kind == WaveKind::dc && drive.high == 0.0)
    d.error(s.waveform.low.span, fmt::format("a dc drive of {} has no swing; give a level other "
                                             "than 0V",
                                             s.waveform.low.text));
  else if (drive.high == drive.low)
    d.error(s.waveform.span, "the drive has no swing; its two levels are equal");

  params.require_positive("rise", s.node.span, "rise");
  params.require_not_negative("at", s.node.span, "at");
  params.require_not_negative("source", s.node.span, "source");
  params.require_positive("width", s.node.span, "width");
  params.require_positive("period", s.node.span, "period");
  drive.rise = params.get("rise");
  drive.at = params.get("at").value_or(0.0);
  drive.source_resistance = params.get("source").value_or(0.0);
  drive.width = params.get("width");
  drive.period = params.get("period");
  if (is_pulse && !drive.width)
    d.error(s.waveform.span, "a pulse needs width= (the time it stays high)");
  const std::optional<Edge> edge = drive_edge(drive, circuit.settings);
  if (!edge)
    d.error(s.node.span, "the drive needs rise= (its 10-90 % time), or write set rise for the "
                         "whole design; an edge with no rise time cannot be modelled");
  const double ramp = edge ? edge->ramp : 0.0;
  if (drive.width && drive.period && *drive.period < *drive.width + 2.0 * ramp)
    d.error(params.span_of("period", s.node.span),
            "the period is shorter than the pulse: width plus its rising and falling ramps");
  circuit.drives.push_back(drive);
}

std::optional<LoadNetwork> Resolver::network(const ast::LoadNetwork& n) {
  LoadNetwork out;
  out.kind = n.kind;
  if (n.kind == NetworkKind::open || n.kind == NetworkKind::short_circuit) return out;
  bool ok = true;
  for (const ast::LoadTerm& term : n.terms) {
    if (const auto* value = boost::get<ast::Value>(&term)) {
      static constexpr Dimension kinds[] = {Dimension::resistance, Dimension::capacitance,
                                            Dimension::inductance};
      auto read_result = syntax::read_quantity_of(value->text, kinds);
      if (auto* error = std::get_if<syntax::UnitError>(&read_result)) {
        d.error(value->span, error->message);
        ok = false;
        continue;
      }
      const auto q = std::get<syntax::Quantity>(read_result);
      if (!(q.value > 0.0)) {
        d.error(value->span, "a load element must be greater than zero; write short for 0ohm");
        ok = false;
        continue;
      }
      LoadNetwork element;
      element.element = q.dimension == Dimension::resistance    ? ElementKind::resistor
                        : q.dimension == Dimension::capacitance ? ElementKind::capacitor
                                                                : ElementKind::inductor;
      element.value = q.value;
      out.parts.push_back(element);
    } else {
      const auto& inner = boost::get<boost::spirit::x3::forward_ast<ast::LoadNetwork>>(term).get();
      if (auto part = network(inner)) {
        out.parts.push_back(std::move(*part));
      } else {
        ok = false;
      }
    }
  }
  if (!ok) return std::nullopt;
  if (out.kind == NetworkKind::single) return std::move(out.parts.front());
  return out;
}

void Resolver::load(const ast::LoadStatement& s) {
  static const std::vector<ParamSpec> specs = {
      {"at", Dimension::time, false, "time the load is switched in"}};
  std::vector<const ParamSpec*> spec_ptrs = {&specs[0]};
  const ParamReader params(s.params, spec_ptrs, "loads", d);
  Load ends;
  ends.node = node_name(s.node);
  ends.span = s.node.span;
  ends.network.kind = s.network.kind;
  connections.loads.push_back(ends);
  auto net = network(s.network);
  if (!net) return;
  params.require_not_negative("at", s.node.span, "at");
  Load load;
  load.node = node_name(s.node);
  load.span = s.node.span;
  load.network = std::move(*net);
  load.at = params.get("at");
  if (load.at && load.network.kind == NetworkKind::open)
    d.error(params.span_of("at", s.node.span), "an open load has nothing to switch in; remove at=");
  circuit.loads.push_back(std::move(load));
}

std::string file_stem(const std::string& path) {
  std::string stem = path.substr(path.find_last_of("/\\") + 1);
  if (auto dot = stem.rfind('.'); dot != std::string::npos && dot > 0) stem.resize(dot);
  if (stem.empty() || stem == "<stdin>") return "design";
  // The name goes into the deck's comments: a line break in it must not start a line there.
  for (char& c : stem)
    if (syntax::is_control(c)) c = '_';
  return stem;
}

}  // namespace

Circuit resolve(const syntax::ast::Description& description, Diagnostics& diagnostics) {
  const bool had_syntax_errors = diagnostics.has_errors();
  Resolver r{diagnostics, {}, {}, {}, {}};
  r.circuit.name = file_stem(diagnostics.file().name);
  // Settings first: a drive may rely on `set rise` written below it.
  for (const ast::Statement& s : description.statements) {
    if (auto* set = std::get_if<ast::SetStatement>(&s)) r.setting(*set);
    if (auto* design = std::get_if<ast::DesignStatement>(&s)) r.design(*design);
  }
  for (const ast::Statement& s : description.statements) {
    if (auto* line = std::get_if<ast::LineStatement>(&s)) r.line(*line);
    if (auto* drive = std::get_if<ast::DriveStatement>(&s)) r.drive(*drive);
    if (auto* load = std::get_if<ast::LoadStatement>(&s)) r.load(*load);
  }
  // After a syntax error some statements are missing, and what would connect to them looks
  // unconnected: check connectivity only on a file that parsed whole.
  check_topology(r.connections, diagnostics, /*check_reach=*/!had_syntax_errors);
  derive_edges(r.circuit);
  return std::move(r.circuit);
}

}  // namespace rungs::model
