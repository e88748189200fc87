// The case-file reference (configs/README.md) against the loader's key table (io/case_keys): the
// key, type, default and range columns of every table row are generated from the table, and the
// README must equal what the generator makes of it. With WALLRANS_WRITE_CASE_REFERENCE=1 the test
// rewrites configs/README.md from the table instead (new keys get a row to describe).
#include <gtest/gtest.h>
#include <yaml-cpp/yaml.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "io/case_keys.hpp"
#include "io/case_loader.hpp"

namespace wallrans {
namespace {

const std::string readme_path = std::string(WALLRANS_SOURCE_DIR) + "/configs/README.md";

std::string read_all(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

std::vector<std::string> split_lines(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

// The top-level key a heading "## `name` ..." documents ("" for other headings).
std::string heading_key(const std::string& line) {
  static const std::regex heading("^## `([a-z_]+)`.*");
  std::smatch match;
  return std::regex_match(line, match, heading) ? match[1].str() : "";
}

// The key a table row "| `name` | ..." documents ("" for other lines).
std::string row_key(const std::string& line) {
  static const std::regex row("^\\| `([a-z_]+)` \\|.*");
  std::smatch match;
  return std::regex_match(line, match, row) ? match[1].str() : "";
}

// The keys documented under the heading of top-level key `top`: its section's keys, or the key
// itself for a top-level scalar (title).
std::vector<const CaseKey*> documented_under(const std::string& top) {
  std::vector<const CaseKey*> keys;
  for (const CaseKey& k : case_keys())
    if (k.section == top) keys.push_back(&k);
  if (keys.empty())
    for (const CaseKey& k : case_keys())
      if (k.section.empty() && k.key == top) keys.push_back(&k);
  return keys;
}

// The generator: `readme` with the first four cells of every key row made from the table, rows of
// keys the table lacks removed, and a row for each missing key after the last row of its heading.
std::string regenerate(const std::string& readme) {
  const std::vector<std::string> lines = split_lines(readme);
  std::vector<std::string> out;
  std::string top;
  std::vector<const CaseKey*> expected;
  std::set<std::string> seen;
  size_t last_row = 0;  // position in `out` after the last key row of the current heading
  auto flush_missing = [&] {
    std::vector<std::string> missing;
    for (const CaseKey* k : expected)
      if (!seen.count(std::string(k->key)))
        missing.push_back(reference_row_start(*k) + " (to be described) |");
    if (!missing.empty() && last_row > 0)
      out.insert(out.begin() + long(last_row), missing.begin(), missing.end());
  };
  for (const std::string& line : lines) {
    if (line.rfind("## ", 0) == 0) {
      flush_missing();
      top = heading_key(line);
      expected = top.empty() ? std::vector<const CaseKey*>{} : documented_under(top);
      seen.clear();
      last_row = 0;
      out.push_back(line);
      continue;
    }
    const std::string key = row_key(line);
    if (top.empty() || key.empty()) {
      out.push_back(line);
      continue;
    }
    const CaseKey* found = nullptr;
    for (const CaseKey* k : expected)
      if (k->key == key) found = k;
    if (found == nullptr) continue;  // a key the loader does not accept
    // The meaning is the last cell; the first four are generated.
    const size_t bar = line.rfind(" | ", line.size() - 3);
    const std::string meaning = line.substr(bar + 3);
    out.push_back(reference_row_start(*found) + " " + meaning);
    seen.insert(key);
    last_row = out.size();
  }
  flush_missing();
  std::string text;
  for (const std::string& line : out) text += line + "\n";
  return text;
}

TEST(CaseReference, EveryHeadingIsATopLevelKeyInLoaderOrder) {
  std::vector<std::string> headings;
  for (const std::string& line : split_lines(read_all(readme_path)))
    if (!heading_key(line).empty()) headings.push_back(heading_key(line));
  EXPECT_EQ(headings, keys_of("")) << readme_path;
}

TEST(CaseReference, TablesEqualTheGeneratedOnes) {
  const std::string readme = read_all(readme_path);
  ASSERT_FALSE(readme.empty()) << readme_path;
  const std::string generated = regenerate(readme);
  if (std::getenv("WALLRANS_WRITE_CASE_REFERENCE") != nullptr) {
    std::ofstream(readme_path, std::ios::binary) << generated;
    GTEST_SKIP() << "rewrote " << readme_path;
  }
  // Per heading: the keys in the table's order and each row's generated cells.
  std::string top;
  std::map<std::string, std::vector<std::string>> rows;
  for (const std::string& line : split_lines(readme)) {
    if (line.rfind("## ", 0) == 0) top = heading_key(line);
    if (!top.empty() && !row_key(line).empty()) rows[top].push_back(line);
  }
  size_t checked = 0;
  for (const std::string& section : keys_of("")) {
    std::vector<std::string> expected_keys, readme_keys;
    for (const CaseKey* k : documented_under(section)) expected_keys.emplace_back(k->key);
    for (const std::string& line : rows[section]) readme_keys.push_back(row_key(line));
    EXPECT_EQ(readme_keys, expected_keys) << "keys under '## `" << section << "`' of " << readme_path;
    for (const std::string& line : rows[section]) {
      for (const CaseKey* k : documented_under(section)) {
        if (k->key != row_key(line)) continue;
        EXPECT_EQ(line.substr(0, reference_row_start(*k).size()), reference_row_start(*k))
            << "section " << section << ": the row of " << k->key << " differs from io/case_keys.cpp";
        EXPECT_GT(line.size(), reference_row_start(*k).size() + 3) << k->key << ": no meaning";
        ++checked;
      }
    }
  }
  EXPECT_EQ(checked, case_keys().size() - (keys_of("").size() - 1));  // all but the section keys
  // The whole file, reported at its first differing line.
  const std::vector<std::string> want = split_lines(generated), have = split_lines(readme);
  size_t line = 0;
  while (line < want.size() && line < have.size() && want[line] == have[line]) ++line;
  EXPECT_TRUE(line == want.size() && line == have.size())
      << readme_path << ":" << line + 1 << ": expected\n  " << (line < want.size() ? want[line] : "(the end)")
      << "\ngot\n  " << (line < have.size() ? have[line] : "(the end)")
      << "\n(run this test with WALLRANS_WRITE_CASE_REFERENCE=1 to regenerate the tables)";
}

// A documented default that is a plain number or a single name must be the loader's: the
// resolved case (every default written out) of a case that gives only the required keys.
TEST(CaseReference, PlainDefaultsAreTheLoadersDefaults) {
  const CaseSpec spec = parse_case_text(
      "flow: {kinematic_viscosity: 0.01}\n"
      "grid: {generator: cavity, cells: [4, 4]}\n"
      "boundaries: [{side: top, kind: wall}, {side: bottom, kind: wall}, {side: left, kind: wall},\n"
      "             {side: right, kind: wall}]\n",
      "defaults.yaml");
  const YAML::Node resolved = YAML::Load(resolved_case_yaml(spec));
  static const std::regex number("^[-+]?[0-9.]+(e[-+]?[0-9]+)?$"), name("^`([a-z_\"]*)`$");
  int compared = 0;
  for (const CaseKey& k : case_keys()) {
    const std::string fallback(k.fallback);
    const YAML::Node section = k.section.empty() ? resolved : resolved[std::string(k.section)];
    if (!section) continue;  // a section the resolved case leaves out (periodic, solid_regions)
    const YAML::Node value = section[std::string(k.key)];
    std::smatch match;
    if (std::regex_match(fallback, number)) {
      if (!value) continue;  // written only for some generators (e.g. run_up for plate)
      EXPECT_DOUBLE_EQ(value.as<double>(), std::stod(fallback)) << k.section << "." << k.key;
      ++compared;
    } else if (std::regex_match(fallback, match, name) && !match[1].str().empty()) {
      if (!value) continue;
      const std::string text = match[1].str() == "\"\"" ? "" : match[1].str();
      EXPECT_EQ(value.as<std::string>(), text) << k.section << "." << k.key;
      ++compared;
    }
  }
  std::printf("compared %d documented defaults with the resolved case\n", compared);
  // The cavity case writes the flow, turbulence, iterations, checkpoint and output sections in
  // full and the grid's length and height: at least 25 such defaults.
  EXPECT_GE(compared, 25);
}

}  // namespace
}  // namespace wallrans
