// Streaming JSON text: structure, escaping and round-trip number formatting.
#include "7_report/json_writer.h"

#include <cmath>

#include <fmt/format.h>

namespace rungs::report {

std::string json_quote(std::string_view text) {
  std::string out = "\"";
  for (char c : text) {
    switch (c) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\n': out += "\\n"; break;
      case '\t': out += "\\t"; break;
      case '\r': out += "\\r"; break;
      default:
        if (static_cast<unsigned char>(c) < 0x20) {
          out += fmt::format("\\u{:04x}", static_cast<int>(c));
        } else {
          out += c;
        }
    }
  }
  return out + "\"";
}

void JsonWriter::newline() {
  out_ += '\n';
  out_.append(2 * first_in_level_.size(), ' ');
}

void JsonWriter::before_value() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (first_in_level_.empty()) return;
  if (!first_in_level_.back()) out_ += ',';
  first_in_level_.back() = false;
  newline();
}

JsonWriter& JsonWriter::begin_object() {
  before_value();
  out_ += '{';
  first_in_level_.push_back(true);
  return *this;
}

void JsonWriter::close(char bracket) {
  const bool empty = first_in_level_.back();
  first_in_level_.pop_back();
  if (!empty) newline();
  out_ += bracket;
}

JsonWriter& JsonWriter::end_object() {
  close('}');
  return *this;
}

JsonWriter& JsonWriter::begin_array() {
  before_value();
  out_ += '[';
  first_in_level_.push_back(true);
  return *this;
}

JsonWriter& JsonWriter::end_array() {
  close(']');
  return *this;
}

JsonWriter& JsonWriter::key(std::string_view name) {
  before_value();
  out_ += json_quote(name);
  out_ += ": ";
  after_key_ = true;
  return *this;
}

JsonWriter& JsonWriter::value(double number) {
  if (!std::isfinite(number)) return null();
  before_value();
  // fmt's default for double is the shortest text that reads back to the same value, and it
  // never consults the locale.
  out_ += fmt::format("{}", number);
  return *this;
}

JsonWriter& JsonWriter::value(std::optional<double> number) {
  return number ? value(*number) : null();
}

JsonWriter& JsonWriter::value(long long number) {
  before_value();
  out_ += fmt::format("{}", number);
  return *this;
}

JsonWriter& JsonWriter::value(bool flag) {
  before_value();
  out_ += flag ? "true" : "false";
  return *this;
}

JsonWriter& JsonWriter::value(std::string_view text) {
  before_value();
  out_ += json_quote(text);
  return *this;
}

JsonWriter& JsonWriter::null() {
  before_value();
  out_ += "null";
  return *this;
}

std::string JsonWriter::str() const { return first_in_level_.empty() ? out_ + "\n" : out_; }

}  // namespace rungs::report
