// Typed access to yaml-cpp nodes with one-line, line-numbered errors. Numbers and booleans are
// converted here rather than with yaml-cpp's as<T>(), which accepts quoted numbers, "yes"/"on"
// booleans and "1e3"-style integers; a case file should mean exactly what it says.
#include "io/yaml_reader.hpp"

#include <yaml-cpp/eventhandler.h>

#include <charconv>
#include <cmath>
#include <limits>
#include <sstream>
#include <string_view>
#include <system_error>

#include "core/error.hpp"

namespace wallrans::yaml_reader {

namespace {

constexpr std::size_t max_shown = 60;  // longest rendering of a bad value in a message

// Every ASCII control character as a space (vertical tab and form feed also break a terminal
// line); UTF-8 text is kept.
std::string one_line(std::string text) {
  for (char& c : text) {
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7f) c = ' ';
  }
  return text;
}

std::string shorten(std::string text) {
  if (text.size() > max_shown) text = text.substr(0, max_shown - 3) + "...";
  return text;
}

// Counts the documents of a YAML stream (events of the parser, no nodes built), stopping after
// the first empty one after the first, and keeps where the second document's content starts.
class DocumentCounter : public YAML::EventHandler {
 public:
  int n_documents = 0;
  bool saw_empty_document = false;
  YAML::Mark second_start = YAML::Mark::null_mark();

  void OnDocumentStart(const YAML::Mark&) override {
    ++n_documents;
    has_content_ = false;
  }
  void OnDocumentEnd() override {
    if (!has_content_ && n_documents > 1) saw_empty_document = true;
  }
  void OnNull(const YAML::Mark&, YAML::anchor_t) override {}
  void OnAlias(const YAML::Mark& mark, YAML::anchor_t) override { content(mark); }
  void OnScalar(const YAML::Mark& mark, const std::string&, YAML::anchor_t, const std::string&) override {
    content(mark);
  }
  void OnSequenceStart(const YAML::Mark& mark, const std::string&, YAML::anchor_t,
                       YAML::EmitterStyle::value) override {
    content(mark);
  }
  void OnSequenceEnd() override {}
  void OnMapStart(const YAML::Mark& mark, const std::string&, YAML::anchor_t,
                  YAML::EmitterStyle::value) override {
    content(mark);
  }
  void OnMapEnd() override {}

 private:
  void content(const YAML::Mark& mark) {
    if (n_documents == 2 && !has_content_) second_start = mark;
    has_content_ = true;
  }
  bool has_content_ = false;
};

[[noreturn]] void throw_at(const std::string& source, int line, const std::string& key,
                           const std::string& expected, const std::string& got) {
  std::string message = source;
  if (line > 0) message += ":" + std::to_string(line);
  message += ": ";
  if (!key.empty()) message += "key '" + key + "': ";
  message += "expected " + expected + ", got " + got;
  throw InputError(one_line(message));
}

// YAML marks are 0-based and -1 when unknown; messages use 1-based lines, 0 = unknown.
int line_of(const YAML::Mark& mark) { return mark.is_null() || mark.line < 0 ? 0 : mark.line + 1; }

// Only an untagged, unquoted scalar may be a number or boolean (yaml-cpp tags plain scalars "?").
bool is_plain_scalar(const YAML::Node& node) { return node.IsScalar() && node.Tag() == "?"; }

std::string_view without_plus(const YAML::Node& node) {
  std::string_view text = node.Scalar();
  if (text.size() > 1 && text[0] == '+' && text[1] != '-') text.remove_prefix(1);
  return text;
}

std::optional<double> to_number(const YAML::Node& node) {
  if (!is_plain_scalar(node)) return std::nullopt;
  const std::string_view text = without_plus(node);
  double x = 0.0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), x);
  if (error != std::errc() || end != text.data() + text.size() || !std::isfinite(x)) return std::nullopt;
  return x;
}

std::optional<int> to_integer(const YAML::Node& node) {
  if (!is_plain_scalar(node)) return std::nullopt;
  const std::string_view text = without_plus(node);
  long long n = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), n);
  if (error != std::errc() || end != text.data() + text.size()) return std::nullopt;
  if (n < std::numeric_limits<int>::min() || n > std::numeric_limits<int>::max()) return std::nullopt;
  return static_cast<int>(n);
}

std::string join(const std::vector<std::string>& names) {
  std::string text;
  for (const std::string& name : names) text += (text.empty() ? "" : ", ") + name;
  return text;
}

}  // namespace

std::string describe(const YAML::Node& node) {
  switch (node.Type()) {
    case YAML::NodeType::Undefined:
      return "nothing";
    case YAML::NodeType::Null:
      return "an empty value";
    case YAML::NodeType::Scalar:
      if (node.Tag() == "!") return shorten(one_line("\"" + node.Scalar() + "\""));
      if (node.Tag() != "?") return shorten(one_line(node.Tag() + " " + node.Scalar()));
      return shorten(one_line(node.Scalar()));
    case YAML::NodeType::Sequence:
    case YAML::NodeType::Map:
      break;
  }
  YAML::Emitter out;
  out.SetSeqFormat(YAML::Flow);
  out.SetMapFormat(YAML::Flow);
  out << node;
  return shorten(one_line(out.c_str()));
}

std::string number_text(double x) {
  char buffer[64];
  const auto result = std::to_chars(buffer, buffer + sizeof buffer, x);
  return std::string(buffer, result.ptr);
}

Value::Value(std::string source, YAML::Node node, std::string key, int line)
    : source_(std::move(source)), node_(std::move(node)), key_(std::move(key)), line_(line) {}

void Value::fail(const std::string& expected) const { fail(expected, describe(node_)); }

void Value::fail(const std::string& expected, const std::string& got) const {
  throw_at(source_, line_, key_, expected, got);
}

double Value::number(const std::string& expected, const std::function<bool(double)>& ok) const {
  const auto x = to_number(node_);
  if (!x || (ok && !ok(*x))) fail(expected);
  return *x;
}

int Value::integer(const std::string& expected, const std::function<bool(int)>& ok) const {
  const auto n = to_integer(node_);
  if (!n || (ok && !ok(*n))) fail(expected);
  return *n;
}

bool Value::boolean() const {
  if (is_plain_scalar(node_) && node_.Scalar() == "true") return true;
  if (is_plain_scalar(node_) && node_.Scalar() == "false") return false;
  fail("true or false");
}

std::string Value::text(const std::string& expected) const {
  if (!node_.IsScalar()) fail(expected);
  return node_.Scalar();
}

std::vector<double> Value::numbers(std::size_t count, const std::string& expected) const {
  if (!node_.IsSequence() || node_.size() != count) fail(expected);
  std::vector<double> values;
  for (const auto& item : node_) {
    const auto x = to_number(item);
    if (!x) fail(expected);
    values.push_back(*x);
  }
  return values;
}

std::vector<int> Value::integers(std::size_t count, const std::string& expected,
                                 const std::function<bool(int)>& ok) const {
  if (!node_.IsSequence() || node_.size() != count) fail(expected);
  std::vector<int> values;
  for (const auto& item : node_) {
    const auto n = to_integer(item);
    if (!n || (ok && !ok(*n))) fail(expected);
    values.push_back(*n);
  }
  return values;
}

Vec2 Value::vec2(const std::string& expected) const {
  const auto xy = numbers(2, expected);
  return {xy[0], xy[1]};
}

std::vector<Value> Value::items(const std::string& expected) const {
  if (!node_.IsSequence()) fail(expected);
  std::vector<Value> values;
  for (const auto& item : node_) {
    const int line = line_of(item.Mark());
    values.emplace_back(source_, item, key_ + "[" + std::to_string(values.size()) + "]",
                        line > 0 ? line : line_);
  }
  return values;
}

Section Value::section(const std::vector<std::string>& allowed) const { return Section(*this, allowed); }

Section::Section(const Value& self, const std::vector<std::string>& allowed) : self_(self) {
  const std::string keys = join(allowed);
  if (!self.node().IsMap()) self.fail("a mapping with keys " + keys);
  for (const auto& entry : self.node()) {
    const YAML::Node& key_node = entry.first;
    const int line = line_of(key_node.Mark());
    if (!key_node.IsScalar()) {
      throw_at(self.source(), line, self.key(), "plain key names", "the key " + describe(key_node));
    }
    const std::string name = key_node.Scalar();
    const std::string key = child_key(name.c_str());
    bool known = false;
    for (const std::string& allowed_name : allowed) known = known || name == allowed_name;
    if (!known) {
      const std::string where = self.key().empty() ? "a top-level key" : "a key of '" + self.key() + "'";
      throw_at(self.source(), line, shorten(key), where + " (" + keys + ")", "an unknown key");
    }
    if (const auto previous = find(name.c_str())) {
      throw_at(self.source(), line, key, "each key once",
               "it again (first at line " + std::to_string(previous->line()) + ")");
    }
    entries_.emplace_back(name, Value(self.source(), entry.second, key, line > 0 ? line : self.line()));
  }
}

std::optional<Value> Section::find(const char* name) const {
  for (const auto& [entry_name, value] : entries_) {
    if (entry_name == name) return value;
  }
  return std::nullopt;
}

Value Section::require(const char* name, const std::string& expected) const {
  if (auto value = find(name)) return *value;
  missing(name, expected);
}

void Section::missing(const char* name, const std::string& expected) const {
  throw_at(self_.source(), self_.line(), child_key(name), expected, "nothing (the key is missing)");
}

std::string Section::child_key(const char* name) const {
  return self_.key().empty() ? std::string(name) : self_.key() + "." + name;
}

Value parse_document(const std::string& text, const std::string& source) {
  YAML::Node document;
  DocumentCounter counter;
  try {
    document = YAML::Load(text);
    // Not YAML::LoadAll: in yaml-cpp 0.7 it never returns for some malformed text (e.g. one that
    // starts with ','; jbeder/yaml-cpp#1319, fixed upstream in 2024), adding empty documents.
    std::istringstream stream(text);
    YAML::Parser parser(stream);
    while (!counter.saw_empty_document && parser.HandleNextDocument(counter)) {
    }
  } catch (const YAML::Exception& error) {
    throw_at(source, line_of(error.mark), "", "valid YAML", "a syntax error (" + error.msg + ")");
  }
  if (document.IsNull()) throw_at(source, 0, "", "a mapping of top-level keys", "an empty document");
  if (counter.n_documents > 1) {
    throw_at(source, line_of(counter.second_start), "", "a single YAML document",
             std::to_string(counter.n_documents) + " documents");
  }
  const int line = line_of(document.Mark());
  return Value(source, document, "", line > 0 ? line : 1);
}

}  // namespace wallrans::yaml_reader
