// Templates for the fixed parts of a deck: named texts with {{placeholder}}s.
#pragma once
#include <map>
#include <string>
#include <string_view>

namespace rungs::emit {

/// Template texts by name ("header", "line_begin", "line_end", "analysis").
using TemplateSet = std::map<std::string, std::string, std::less<>>;

/// The templates of templates/*.tmpl, compiled into the binary at build time.
const TemplateSet& builtin_templates();

/// Values for placeholders, by name.
using TemplateValues = std::map<std::string, std::string, std::less<>>;

/// A filled template, or why it could not be filled.
struct FilledTemplate {
  std::string text;
  std::string error;  // empty when filled
};

/// `text` with every {{name}} replaced by its value. A placeholder with no value, or an
/// unclosed one, is an error naming it, so an override that misspells one is caught.
FilledTemplate fill_template(std::string_view name, std::string_view text,
                             const TemplateValues& values);

}  // namespace rungs::emit
