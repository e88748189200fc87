// Private PETSc options databases: filled from defaults, the command line and the case file;
// pushed as PETSc's default while a solver reads them, with PETSc's error printing captured.
#include "linear/solver_options.hpp"

#include <algorithm>
#include <cctype>
#include <set>

#include "core/error.hpp"

namespace wallrans {

namespace {

// The first message of the PETSc error being raised (later calls of the handler for the same
// error only add traceback lines).
PetscErrorCode capture_message(MPI_Comm, int, const char*, const char*, PetscErrorCode code,
                               PetscErrorType type, const char* message, void* context) {
  auto* text = static_cast<std::string*>(context);
  if (type == PETSC_ERROR_INITIAL && text->empty() && message != nullptr) *text = message;
  return code;
}

// PETSc's error printing is replaced by capture_message for the lifetime of the object.
class CapturedErrors {
 public:
  CapturedErrors() { (void)PetscPushErrorHandler(capture_message, &message_); }
  CapturedErrors(const CapturedErrors&) = delete;
  CapturedErrors& operator=(const CapturedErrors&) = delete;
  ~CapturedErrors() { (void)PetscPopErrorHandler(); }
  // PETSc's message on one line: line breaks and runs of blanks become one blank.
  std::string message() const {
    std::string out;
    for (const char c : message_) {
      const char d = (c == '\n' || c == '\t' || c == '\r') ? ' ' : c;
      if (d == ' ' && (out.empty() || out.back() == ' ')) continue;
      out += d;
    }
    while (!out.empty() && out.back() == ' ') out.pop_back();
    return out;
  }

 private:
  std::string message_;
};

bool contains_word(const std::string& text, const std::string& word) {
  if (word.empty()) return false;
  auto is_word_char = [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-' || c == '.' || c == '+';
  };
  for (size_t at = text.find(word); at != std::string::npos; at = text.find(word, at + 1)) {
    const bool starts = at == 0 || !is_word_char(text[at - 1]);
    const size_t end = at + word.size();
    const bool ends = end == text.size() || !is_word_char(text[end]) || text[end] == '.';
    if (starts && ends) return true;
  }
  return false;
}

}  // namespace

std::vector<GivenOption> parse_petsc_options(const std::string& text, const std::string& source) {
  PetscOptions parsed = nullptr;
  check_petsc(PetscOptionsCreate(&parsed));
  PetscErrorCode code = 0;
  std::string message;
  {
    const CapturedErrors errors;
    code = PetscOptionsInsertString(parsed, text.c_str());
    message = errors.message();
  }
  std::vector<GivenOption> out;
  if (code == 0) {
    PetscInt n = 0;
    char** names = nullptr;
    char** values = nullptr;
    code = PetscOptionsLeftGet(parsed, &n, &names, &values);
    if (code == 0) {
      for (PetscInt k = 0; k < n; ++k)
        out.push_back({std::string("-") + names[k], values[k] ? values[k] : "", source});
      (void)PetscOptionsLeftRestore(parsed, &n, &names, &values);
    }
  }
  (void)PetscOptionsDestroy(&parsed);
  if (code != 0) {
    throw InputError(source + ": expected PETSc options (-name [value] ...), got '" + text + "'" +
                     (message.empty() ? "" : " (" + message + ")"));
  }
  return out;
}

std::vector<GivenOption> command_line_options() {
  char* all = nullptr;
  check_petsc(PetscOptionsGetAll(nullptr, &all));
  const std::string text = all ? all : "";
  (void)PetscFree(all);
  // Words starting with "--" are the program's own options (PETSc keeps them as options too).
  std::vector<GivenOption> options = parse_petsc_options(text, "command line");
  std::erase_if(options, [](const GivenOption& option) { return option.name.rfind("--", 0) == 0; });
  return options;
}

std::string case_options_source(const std::string& case_file) {
  return (case_file.empty() ? std::string("case") : case_file) + ": key 'iterations.petsc_options'";
}

SolverOptions::SolverOptions(const CaseOptionsText& case_options,
                             const std::vector<std::pair<std::string, std::string>>& defaults) {
  given_ = command_line_options();
  for (GivenOption& option :
       parse_petsc_options(case_options.text, case_options_source(case_options.case_file)))
    given_.push_back(std::move(option));
  check_petsc(PetscOptionsCreate(&options_));
  for (const auto& [name, value] : defaults)
    check_petsc(PetscOptionsSetValue(options_, name.c_str(), value.c_str()));
  // An option that sets several others at once takes back the defaults it covers: a user's
  // -X_relax_type_all replaces our -X_relax_type_down/_up/_coarse, which hypre would otherwise
  // apply after it.
  const std::string all_suffix = "relax_type_all";
  for (const GivenOption& option : given_) {
    if (option.name.size() < all_suffix.size() ||
        option.name.compare(option.name.size() - all_suffix.size(), all_suffix.size(), all_suffix) != 0)
      continue;
    const std::string stem = option.name.substr(0, option.name.size() - 3);  // "...relax_type_"
    for (const char* leg : {"down", "up", "coarse"})
      check_petsc(PetscOptionsClearValue(options_, (stem + leg).c_str()));
  }
  for (const GivenOption& option : given_) {
    check_petsc(PetscOptionsSetValue(options_, option.name.c_str(),
                                     option.value.empty() ? nullptr : option.value.c_str()));
  }
}

SolverOptions::~SolverOptions() { (void)PetscOptionsDestroy(&options_); }

void SolverOptions::use(const std::string& what, const std::function<PetscErrorCode()>& call) const {
  PetscErrorCode code = 0;
  std::string message;
  {
    const CapturedErrors errors;
    check_petsc(PetscOptionsPush(options_));
    code = call();
    (void)PetscOptionsPop();
    message = errors.message();
  }
  if (code == 0) return;
  // The option behind the error: named in PETSc's message ("Unknown option foo for -name"), or
  // else the one whose value it quotes ("Input string abc has no numeric value"). The case file
  // is searched first, as its options win.
  const GivenOption* culprit = nullptr;
  for (auto it = given_.rbegin(); it != given_.rend() && !culprit; ++it)
    if (contains_word(message, it->name)) culprit = &*it;
  for (auto it = given_.rbegin(); it != given_.rend() && !culprit; ++it)
    if (contains_word(message, it->value)) culprit = &*it;
  if (culprit) {
    throw InputError(culprit->source + ": PETSc option '" + culprit->name +
                     (culprit->value.empty() ? "" : " " + culprit->value) +
                     "': expected a value PETSc accepts, got '" + culprit->value + "' (" + message + ")");
  }
  if (code == PETSC_ERR_ARG_UNKNOWN_TYPE || code == PETSC_ERR_USER_INPUT) {
    throw InputError("PETSc options of the " + what + ": expected values PETSc accepts, got an error (" +
                     message + ")");
  }
  throw Error("PETSc error " + std::to_string(code) + " in the " + what + ": " + message);
}

std::vector<std::string> SolverOptions::unused() const {
  std::set<std::string> given;
  for (const GivenOption& option : given_) given.insert(option.name);
  PetscInt n = 0;
  char** names = nullptr;
  char** values = nullptr;
  check_petsc(PetscOptionsLeftGet(options_, &n, &names, &values));
  std::vector<std::string> out;
  for (PetscInt k = 0; k < n; ++k) {
    const std::string name = std::string("-") + names[k];
    if (given.count(name)) out.push_back(name);
  }
  check_petsc(PetscOptionsLeftRestore(options_, &n, &names, &values));
  return out;
}

std::vector<std::string> options_used_by_none(const std::vector<const SolverOptions*>& databases) {
  std::vector<std::string> out;
  bool first = true;
  for (const SolverOptions* database : databases) {
    if (!database) continue;
    std::vector<std::string> unused = database->unused();
    std::sort(unused.begin(), unused.end());
    if (first) {
      out = unused;
      first = false;
      continue;
    }
    std::vector<std::string> both;
    std::set_intersection(out.begin(), out.end(), unused.begin(), unused.end(), std::back_inserter(both));
    out = both;
  }
  std::erase_if(out, [](const std::string& name) {
    // PETSc reads these only in PetscFinalize (measured with PETSc 3.18).
    if (name == "-options_left" || name == "-options_view") return true;
    PetscBool used = PETSC_FALSE;
    check_petsc(PetscOptionsUsed(nullptr, name.c_str() + 1, &used));
    return used == PETSC_TRUE;
  });
  return out;
}

}  // namespace wallrans
