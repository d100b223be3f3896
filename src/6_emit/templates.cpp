// Filling {{placeholder}}s in deck templates.
#include "6_emit/templates.h"

#include <fmt/format.h>

namespace rungs::emit {

FilledTemplate fill_template(std::string_view name, std::string_view text,
                             const TemplateValues& values) {
  std::string out;
  std::size_t at = 0;
  while (true) {
    const std::size_t open = text.find("{{", at);
    out.append(text.substr(at, open - at));
    if (open == std::string_view::npos) return {out, ""};
    const std::size_t close = text.find("}}", open + 2);
    if (close == std::string_view::npos)
      return {"", fmt::format("template {}: '{{{{' with no '}}}}'", name)};
    const std::string_view key = text.substr(open + 2, close - open - 2);
    auto value = values.find(key);
    if (value == values.end()) {
      std::string known;
      for (const auto& [k, v] : values) known += (known.empty() ? "" : ", ") + k;
      return {"", fmt::format("template {}: unknown placeholder {{{{{}}}}}; it knows {}", name,
                              key, known)};
    }
    out += value->second;
    at = close + 2;
  }
}

}  // namespace rungs::emit
