// A small streaming JSON writer with a fixed, locale-free number format.
#pragma once
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace rungs::report {

/// Builds JSON text in order of the calls. Numbers are written in the shortest form that
/// reads back to the same double; NaN and infinities, which JSON lacks, become null.
/// Pretty-printed with two-space indents, so diffs of reports stay readable.
class JsonWriter {
 public:
  JsonWriter& begin_object();
  JsonWriter& end_object();
  JsonWriter& begin_array();
  JsonWriter& end_array();
  /// The key of the next member of the current object.
  JsonWriter& key(std::string_view name);
  JsonWriter& value(double number);
  JsonWriter& value(std::optional<double> number);
  JsonWriter& value(long long number);
  JsonWriter& value(int number) { return value(static_cast<long long>(number)); }
  JsonWriter& value(bool flag);
  JsonWriter& value(std::string_view text);
  JsonWriter& value(const char* text) { return value(std::string_view(text)); }
  JsonWriter& null();

  /// The text so far, with a final newline once every object and array is closed.
  std::string str() const;

 private:
  void before_value();
  void newline();
  void close(char bracket);
  std::string out_;
  std::vector<bool> first_in_level_;
  bool after_key_ = false;
};

/// `text` as a JSON string literal, quotes included.
std::string json_quote(std::string_view text);

}  // namespace rungs::report
