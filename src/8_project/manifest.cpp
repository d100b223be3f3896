// Reading rungs.toml with toml++ into a Manifest, every problem at its key or value.
#include "8_project/manifest.h"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <map>
#include <optional>

#include <fmt/format.h>
#include <toml++/toml.h>

#include "1_syntax/parser.h"
#include "1_syntax/suggest.h"
#include "1_syntax/text.h"
#include "3_model/resolve.h"

namespace rungs::project {

namespace {

using syntax::Diagnostics;
using syntax::Span;

constexpr std::string_view kTopKeys[] = {"defaults", "netlist"};
constexpr std::string_view kSettingKeys[] = {"rise",   "tolerance", "shape",
                                             "window", "method",    "step"};
constexpr std::string_view kDefaultsKeys[] = {"rise",   "tolerance", "shape",    "window",
                                              "method", "step",      "templates"};
constexpr std::string_view kNetlistKeys[] = {"source",    "output",  "report",    "report_json",
                                             "templates", "library", "with_ideal"};

/// An example value for each setting, for messages.
std::string_view setting_example(std::string_view key) {
  if (key == "rise") return "350ps";
  if (key == "tolerance") return "2%";
  if (key == "shape") return "pi";
  if (key == "method") return "gear";
  if (key == "step") return "5ps";
  return "40ns";
}

/// The byte offset of a toml++ position: 1-based line, and column in code points, which is
/// how toml++ counts (and how InputFile::locate counts back).
std::size_t offset_of(std::string_view text, const toml::source_position& at) {
  std::size_t offset = 0;
  for (toml::source_index line = 1; line < at.line; ++line) {
    const std::size_t newline = text.find('\n', offset);
    if (newline == std::string_view::npos) return text.size();
    offset = newline + 1;
  }
  for (toml::source_index column = 1; column < at.column; ++column) {
    if (offset >= text.size() || text[offset] == '\n') break;
    ++offset;
    while (offset < text.size() && syntax::is_utf8_continuation(text[offset])) ++offset;
  }
  return offset;
}

/// "Error while parsing key-value pair: expected value" -> "not valid TOML: expected value
/// (in a key-value pair)": toml++'s messages in the project's lower-case style, with the two
/// a person meets most (an unclosed string, a key given twice) said in plain words.
/// `at_line_end` tells that the error is at the end of its line.
std::string toml_message(std::string_view description, bool at_line_end) {
  constexpr std::string_view kPrefix = "Error while parsing ";
  std::string what(description);
  std::string context;
  if (what.rfind(kPrefix, 0) == 0) {
    const std::size_t colon = what.find(": ", kPrefix.size());
    if (colon != std::string::npos) {
      context = what.substr(kPrefix.size(), colon - kPrefix.size());
      what = what.substr(colon + 2);
    }
  }
  if (context == "string" && at_line_end)
    return "not valid TOML: the string is not closed on its line; add the closing quote";
  constexpr std::string_view kRedefine = "cannot redefine existing ";
  if (what.rfind(kRedefine, 0) == 0) {
    const std::size_t quote = what.find('\'');
    if (quote != std::string::npos)
      return fmt::format("not valid TOML: {} is given twice; keep one", what.substr(quote));
  }
  if (!what.empty()) what[0] = syntax::fold_case(what[0]);
  return context.empty() ? fmt::format("not valid TOML: {}", what)
                         : fmt::format("not valid TOML: {} (in a {})", what, context);
}

/// For a TOML error on a line like `rise = 350ps`: the span of the unquoted value and a
/// message that says to quote it, since units make the value a string.
std::optional<std::pair<Span, std::string>> unquoted_unit_hint(const syntax::InputFile& file,
                                                               std::size_t error_at) {
  const std::string_view line = file.line_of(error_at);
  const std::size_t line_begin = static_cast<std::size_t>(line.data() - file.text.data());
  const std::size_t equals = line.find('=');
  if (equals == std::string_view::npos) return std::nullopt;
  auto is_space = [](char c) { return c == ' ' || c == '\t'; };
  std::size_t key_begin = 0, key_end = equals, begin = equals + 1;
  while (key_begin < key_end && is_space(line[key_begin])) ++key_begin;
  while (key_end > key_begin && is_space(line[key_end - 1])) --key_end;
  while (begin < line.size() && is_space(line[begin])) ++begin;
  std::size_t end = begin;
  while (end < line.size() && !is_space(line[end]) && line[end] != '#') ++end;
  const std::string_view key = line.substr(key_begin, key_end - key_begin);
  const std::string_view value = line.substr(begin, end - begin);
  const bool numeric_start =
      !value.empty() && (std::isdigit(static_cast<unsigned char>(value[0])) || value[0] == '.' ||
                         value[0] == '-' || value[0] == '+');
  const bool has_unit = std::any_of(value.begin(), value.end(), [](char c) {
    return std::isalpha(static_cast<unsigned char>(c)) || c == '%';
  });
  if (key.empty() || !numeric_start || !has_unit) return std::nullopt;
  return std::pair{
      Span{line_begin + begin, line_begin + end},
      fmt::format("a value with a unit is a string in TOML: write {} = \"{}\"", key, value)};
}

std::string normal_path(std::string_view path) {
  return std::filesystem::path(path).lexically_normal().generic_string();
}

class ManifestReader {
 public:
  explicit ManifestReader(Diagnostics& d) : d_(d), text_(d.file().text) {}

  Manifest read() {
    toml::table root;
    try {
      root = toml::parse(text_, std::string_view(d_.file().name));
    } catch (const toml::parse_error& e) {
      const std::size_t at = offset_of(text_, e.source().begin);
      if (auto hint = unquoted_unit_hint(d_.file(), at))
        d_.error(hint->first, hint->second);
      else
        d_.error({at, std::max(at + 1, offset_of(text_, e.source().end))},
                 toml_message(e.description(),
                              at >= text_.size() || text_[at] == '\n' || text_[at] == '\r'));
      return {};
    }
    Manifest manifest;
    const toml::node* netlists = nullptr;
    Span netlists_span{};
    for (auto&& [key, node] : root) {
      if (key.str() == "defaults") {
        if (const toml::table* table = node.as_table()) {
          manifest.defaults = defaults(*table);
        } else {
          d_.error(span(key.source()),
                   "defaults is a table: write [defaults] on a line of its "
                   "own, and its settings below it");
        }
      } else if (key.str() == "netlist") {
        netlists = &node;
        netlists_span = span(key.source());
      } else {
        unknown(key, kTopKeys, "at the top of the manifest");
      }
    }
    if (netlists) read_netlists(*netlists, netlists_span, manifest);
    if (!netlists && !d_.has_errors())
      d_.error({0, 0},
               "the manifest lists no netlist; add a [[netlist]] table with source "
               "and output");
    check_writers(manifest);
    return manifest;
  }

 private:
  Span span(const toml::source_region& region) const {
    const std::size_t begin = offset_of(text_, region.begin);
    return {begin, std::max(begin, offset_of(text_, region.end))};
  }

  void unknown(const toml::key& key, std::span<const std::string_view> known,
               std::string_view where) {
    d_.error(span(key.source()), fmt::format("unknown key '{}' {}{}", key.str(), where,
                                             syntax::did_you_mean(key.str(), known)));
  }

  Defaults defaults(const toml::table& table) {
    Defaults out;
    for (auto&& [key, node] : table) {
      if (std::find(std::begin(kDefaultsKeys), std::end(kDefaultsKeys), key.str()) ==
          std::end(kDefaultsKeys))
        unknown(key, kDefaultsKeys, "in [defaults]");
    }
    for (std::string_view key : kSettingKeys) {
      if (const toml::node* node = table.get(key))
        if (auto setting = read_setting(key, *node)) out.settings.push_back(std::move(*setting));
    }
    if (const toml::node* node = table.get("templates")) {
      out.templates = path_value("templates", *node, "sim/templates");
      out.templates_span = span(node->source());
    }
    return out;
  }

  /// A setting's value as the description language writes it, checked as `set` checks it.
  std::optional<DefaultSetting> read_setting(std::string_view key, const toml::node& node) {
    const Span where = span(node.source());
    std::string value;
    if (const auto* text = node.as_string()) {
      value = text->get();
    } else if (key == "tolerance" && (node.is_floating_point() || node.is_integer())) {
      value = fmt::format("{}", node.value<double>().value_or(0.0));
    } else {
      d_.error(where, fmt::format("{} takes a value with its unit, as a string: {} = \"{}\"", key,
                                  key, setting_example(key)));
      return std::nullopt;
    }
    if (value.empty() || std::any_of(value.begin(), value.end(), [](char c) {
          return std::isspace(static_cast<unsigned char>(c)) || c == '#';
        })) {
      d_.error(where, fmt::format("{} takes one value with no spaces, such as {} = \"{}\"", key,
                                  key, setting_example(key)));
      return std::nullopt;
    }
    // The same words `set` would read, checked by the same code, so the messages agree.
    const syntax::InputFile probe{"", fmt::format("set {} {}\n", key, value)};
    Diagnostics probe_diagnostics(probe);
    const auto description = syntax::parse_description(probe_diagnostics);
    (void)model::resolve(description, probe_diagnostics);
    for (const syntax::Diagnostic& diagnostic : probe_diagnostics.all())
      d_.error(where, diagnostic.message);
    if (probe_diagnostics.has_errors()) return std::nullopt;
    return DefaultSetting{std::string(key), std::move(value), where};
  }

  /// A path-valued key; empty (and reported) when it is not a non-empty string.
  std::string path_value(std::string_view key, const toml::node& node, std::string_view example) {
    const auto* text = node.as_string();
    if (!text) {
      d_.error(span(node.source()),
               fmt::format("{} takes a path as a string, such as {} = \"{}\"", key, key, example));
      return "";
    }
    if (text->get().empty()) {
      d_.error(span(node.source()),
               fmt::format("{} is empty; give a path, such as {} = \"{}\"", key, key, example));
    }
    return text->get();
  }

  bool bool_value(std::string_view key, const toml::node& node) {
    if (const auto* flag = node.as_boolean()) return flag->get();
    d_.error(span(node.source()), fmt::format("{} is true or false, without quotes", key));
    return false;
  }

  void read_netlists(const toml::node& node, Span key_span, Manifest& manifest) {
    const toml::array* array = node.as_array();
    const bool all_tables =
        array && std::all_of(array->begin(), array->end(),
                             [](const toml::node& element) { return element.is_table(); });
    if (!all_tables) {
      d_.error(key_span,
               "netlist is a list of tables: write [[netlist]], in double brackets, "
               "above each netlist's keys");
      return;
    }
    for (const toml::node& element : *array)
      manifest.netlists.push_back(netlist(*element.as_table()));
  }

  NetlistEntry netlist(const toml::table& table) {
    NetlistEntry entry;
    entry.span = span(table.source());
    for (auto&& [key, node] : table) {
      const std::string_view name = key.str();
      if (name == "source") {
        entry.source = path_value(name, node, "lines/clock.rungs");
        entry.source_span = span(node.source());
      } else if (name == "output") {
        entry.output = path_value(name, node, "sim/clock.cir");
        entry.output_span = span(node.source());
      } else if (name == "report") {
        entry.report = path_value(name, node, "sim/clock.txt");
        entry.report_span = span(node.source());
      } else if (name == "report_json") {
        entry.report_json = path_value(name, node, "sim/clock.json");
        entry.report_json_span = span(node.source());
      } else if (name == "templates") {
        entry.templates = path_value(name, node, "sim/templates");
        entry.templates_span = span(node.source());
      } else if (name == "library") {
        entry.library = bool_value(name, node);
      } else if (name == "with_ideal") {
        entry.with_ideal = bool_value(name, node);
      } else {
        unknown(key, kNetlistKeys, "in [[netlist]]");
      }
    }
    if (!table.contains("source"))
      d_.error(entry.span, "this netlist has no source; add source = \"lines/NAME.rungs\"");
    if (!table.contains("output"))
      d_.error(entry.span, "this netlist has no output; add output = \"sim/NAME.cir\"");
    return entry;
  }

  /// Every file is written by one netlist, and no netlist writes over a description.
  void check_writers(const Manifest& manifest) {
    std::map<std::string, Span> sources;
    for (const NetlistEntry& entry : manifest.netlists)
      if (!entry.source.empty()) sources.emplace(normal_path(entry.source), entry.source_span);
    std::map<std::string, Span> written;
    // Paths in the manifest are relative to its folder, where it is its own file name.
    const std::string manifest_name =
        std::filesystem::path(d_.file().name).filename().generic_string();
    for (const NetlistEntry& entry : manifest.netlists) {
      for (const auto& [path, at] : {std::pair{&entry.output, entry.output_span},
                                     std::pair{&entry.report, entry.report_span},
                                     std::pair{&entry.report_json, entry.report_json_span}}) {
        if (path->empty()) continue;
        const std::string normal = normal_path(*path);
        if (normal == manifest_name) {
          d_.error(at, fmt::format("'{}' is this manifest; an output cannot replace it", *path));
        } else if (sources.count(normal)) {
          d_.error(at, fmt::format("'{}' is a netlist's source; an output cannot replace a "
                                   "description",
                                   *path));
        } else if (auto [it, fresh] = written.emplace(normal, at); !fresh) {
          const syntax::Location first = d_.file().locate(it->second.begin);
          d_.error(at, fmt::format("'{}' is already written at {}:{}; give each file one "
                                   "writer",
                                   *path, first.line, first.column));
        }
      }
    }
  }

 private:
  Diagnostics& d_;
  std::string_view text_;
};

}  // namespace

Manifest parse_manifest(Diagnostics& diagnostics) {
  return ManifestReader(diagnostics).read();
}

std::string templates_of(const Manifest& manifest, const NetlistEntry& entry) {
  return entry.templates.empty() ? manifest.defaults.templates : entry.templates;
}

void apply_defaults(syntax::ast::Description& description,
                    const std::vector<DefaultSetting>& settings) {
  namespace ast = syntax::ast;
  for (const DefaultSetting& setting : settings) {
    const bool set_here = std::any_of(description.statements.begin(), description.statements.end(),
                                      [&](const ast::Statement& statement) {
                                        const auto* set =
                                            std::get_if<ast::SetStatement>(&statement);
                                        return set && set->key.text == setting.key;
                                      });
    if (set_here) continue;
    ast::SetStatement set;
    set.key.text = setting.key;
    set.value.text = setting.value;
    description.statements.insert(description.statements.begin(), std::move(set));
  }
}

}  // namespace rungs::project
