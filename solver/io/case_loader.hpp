// Case file (YAML) -> validated CaseSpec, and CaseSpec -> resolved YAML for the run directory.
// The layout and every key are documented in configs/README.md.
#pragma once

#include <string>

#include "core/case_spec.hpp"

namespace wallrans {

/// Reads and validates the case file at `path`. Local (no MPI): every rank that calls it reads
/// the same file and fails the same way. Sets CaseSpec::source_file to `path` and each segment's
/// `line`, and fills every default, including the pressure of outflow/opening segments
/// (flow.reference_pressure). Throws InputError with a one-line
/// "<path>:<line>: key '<dotted.key>': expected ..., got ..." message for an unreadable file,
/// malformed YAML, unknown or repeated keys, wrong types, out-of-range or inconsistent values.
CaseSpec load_case_file(const std::string& path);

/// As load_case_file, from text; `source_name` stands for the file name in messages and in
/// CaseSpec::source_file.
CaseSpec parse_case_text(const std::string& text, const std::string& source_name);

/// The full case with every default written out, as YAML that parse_case_text reads back to an
/// equal CaseSpec (apart from source_file and segment lines). Numbers are written in their
/// shortest exact form, so nothing is lost.
std::string resolved_case_yaml(const CaseSpec& spec);

}  // namespace wallrans
