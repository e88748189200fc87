// Strict, typed reading of a parsed YAML document. Every failure becomes a one-line InputError
// "<source>:<line>: key '<dotted.key>': expected <what>, got <what>". Knows nothing about cases;
// io/case_loader describes the case layout with it.
#pragma once

#include <yaml-cpp/yaml.h>

#include <cstddef>
#include <functional>
#include <initializer_list>
#include <optional>
#include <string>
#include <vector>

#include "core/vec2.hpp"

namespace wallrans::yaml_reader {

class Section;

/// One value of the document with the dotted key that leads to it ("grid.cells", "boundaries[2]")
/// and the 1-based line used in messages: the line of its key, or of the list entry itself.
class Value {
 public:
  Value(std::string source, YAML::Node node, std::string key, int line);

  const std::string& source() const { return source_; }
  const std::string& key() const { return key_; }
  int line() const { return line_; }
  const YAML::Node& node() const { return node_; }

  /// Throws InputError at this value's line; `got` defaults to a one-line rendering of the value.
  [[noreturn]] void fail(const std::string& expected) const;
  [[noreturn]] void fail(const std::string& expected, const std::string& got) const;

  /// A finite number written as a plain scalar (quoted "1.0" is a string, not a number). `ok`
  /// is the range test; `expected` describes type and range for the message.
  double number(const std::string& expected, const std::function<bool(double)>& ok = {}) const;
  /// A whole number that fits an int ("2.5" and "2.0" are rejected).
  int integer(const std::string& expected, const std::function<bool(int)>& ok = {}) const;
  /// Exactly `true` or `false`.
  bool boolean() const;
  /// Any scalar (plain or quoted) as its text; an empty value is an error.
  std::string text(const std::string& expected) const;
  /// A list of exactly `count` numbers / integers, each passing `ok`.
  std::vector<double> numbers(std::size_t count, const std::string& expected) const;
  std::vector<int> integers(std::size_t count, const std::string& expected,
                            const std::function<bool(int)>& ok = {}) const;
  Vec2 vec2(const std::string& expected) const;
  /// The entries of a list, each keyed "<key>[i]" (counted from 0) at its own line.
  std::vector<Value> items(const std::string& expected) const;
  /// This value as a mapping whose keys must all be in `allowed` (each at most once).
  Section section(const std::vector<std::string>& allowed) const;

 private:
  std::string source_;
  YAML::Node node_;
  std::string key_;
  int line_;
};

/// A mapping whose keys have been checked: unknown, repeated and non-scalar keys are errors.
class Section {
 public:
  Section(const Value& self, const std::vector<std::string>& allowed);

  const Value& self() const { return self_; }
  bool has(const char* name) const { return find(name).has_value(); }
  std::optional<Value> find(const char* name) const;
  /// The value of a required key; a missing key fails at the line of this section's key.
  Value require(const char* name, const std::string& expected) const;
  /// Reports `name` as missing (for keys that a combination of other keys makes required).
  [[noreturn]] void missing(const char* name, const std::string& expected) const;
  /// The dotted key of a child, present or not.
  std::string child_key(const char* name) const;

 private:
  Value self_;
  std::vector<std::pair<std::string, Value>> entries_;
};

/// Parses `text` as exactly one YAML document whose top level is the returned Value (key "").
/// Throws InputError for a syntax error (with its line), an empty text or several documents.
Value parse_document(const std::string& text, const std::string& source);

/// A one-line rendering of a node for messages: `[0, 96]`, `"0.1"` (quoted), `an empty value`.
std::string describe(const YAML::Node& node);

/// Shortest text that reads back as exactly `x` (e.g. 1e-06, 0.3, -2).
std::string number_text(double x);

}  // namespace wallrans::yaml_reader
