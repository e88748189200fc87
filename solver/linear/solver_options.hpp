// A private PETSc options database for the linear solvers of one solver object, so the options
// of one case never leak into another solver of the same process, and PETSc calls that read
// options with their errors turned into one-line messages.
#pragma once

#include <petscsys.h>

#include <functional>
#include <string>
#include <utility>
#include <vector>

namespace wallrans {

/// Where the options of a case come from, for messages: the case-file text and its file.
struct CaseOptionsText {
  std::string text;       ///< iterations.petsc_options, e.g. "-pressure_ksp_rtol 1e-3"
  std::string case_file;  ///< the case file ("" when the case was built in code)
};

/// One option as given: its name with the leading '-', its value ("" for a flag) and where it
/// was given ("command line" or "<case>: key 'iterations.petsc_options'").
struct GivenOption {
  std::string name, value, source;
};

/// Local. The options of `text` in PETSc's own parsing (quotes, flags without values). Throws
/// InputError "<source>: expected PETSc options (-name [value] ...), got '<text>'" if PETSc
/// cannot parse it.
std::vector<GivenOption> parse_petsc_options(const std::string& text, const std::string& source);

/// Local. The options on the command line (PETSc's process-wide database, which holds nothing
/// else in wallrans).
std::vector<GivenOption> command_line_options();

/// Local. "<case_file>: key 'iterations.petsc_options'" ("case: ..." without a file).
std::string case_options_source(const std::string& case_file);

class SolverOptions {
 public:
  /// Local. The database holds `defaults` (name with '-', value), then every command-line option
  /// (which override the defaults), then the case file's options (which override both). A given
  /// "...relax_type_all" removes the defaults "...relax_type_down", "_up" and "_coarse" it covers.
  SolverOptions(const CaseOptionsText& case_options,
                const std::vector<std::pair<std::string, std::string>>& defaults);
  SolverOptions(const SolverOptions&) = delete;
  SolverOptions& operator=(const SolverOptions&) = delete;
  ~SolverOptions();

  /// Runs `call` (one or more PETSc calls that may read options: KSPSetFromOptions, KSPSolve, whose
  /// preconditioner set-up reads the options of its sub-solvers) with this database as PETSc's
  /// default and PETSc's error printing switched off. On a PETSc error it throws InputError if an
  /// option value caused it ("<source>: PETSc option '-name value': expected a value PETSc
  /// accepts, got 'value' (<PETSc's message>)"), Error naming `what` otherwise. Local in itself;
  /// the PETSc calls inside keep their collectivity, and equal options fail on every rank alike.
  void use(const std::string& what, const std::function<PetscErrorCode()>& call) const;

  /// Local. The given options (command line and case file, not the defaults) that nothing has
  /// read from this database so far, by name with the leading '-'.
  std::vector<std::string> unused() const;

 private:
  PetscOptions options_ = nullptr;
  std::vector<GivenOption> given_;
};

/// Local. Names (with '-') of the given options no solver used: those in the unused() list of
/// every database in `databases` and not read from the command-line database either (where
/// PETSc itself reads options such as -log_view). Null entries are skipped.
std::vector<std::string> options_used_by_none(const std::vector<const SolverOptions*>& databases);

}  // namespace wallrans
