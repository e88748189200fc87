#include "app/run_directory.hpp"

#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <fstream>
#include <set>
#include <sstream>
#include <system_error>
#include <vector>

#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/utc_time.hpp"
#include "io/rank_agreement.hpp"

namespace wallrans {

namespace fs = std::filesystem;

namespace {

enum class FileKind { checkpoint, description, fields, fields_at, kept };

struct OutputFile {
  FileKind kind;
  long iteration = -1;  ///< checkpoints, their descriptions and intermediate fields
  bool is_temporary = false;
};

bool is_digits(const std::string& text) {
  return !text.empty() && text.size() < 10 && text.find_first_not_of("0123456789") == std::string::npos;
}

// "<head><digits><tail>" -> the number, or -1.
long number_between(const std::string& name, const std::string& head, const std::string& tail) {
  if (name.size() <= head.size() + tail.size() || !name.starts_with(head) || !name.ends_with(tail)) return -1;
  const std::string middle = name.substr(head.size(), name.size() - head.size() - tail.size());
  return is_digits(middle) ? std::stol(middle) : -1;
}

// The files of ours (io/vtk_writer, io/checkpoint, app): see is_run_output.
std::optional<OutputFile> classify(std::string name) {
  OutputFile file{FileKind::fields};
  if (name.ends_with(".tmp")) {
    file.is_temporary = true;
    name.resize(name.size() - 4);
  }
  if ((file.iteration = number_between(name, "checkpoint_", ".h5")) >= 0) {
    file.kind = FileKind::checkpoint;
    return file;
  }
  if ((file.iteration = number_between(name, "checkpoint_", ".xmf")) >= 0) {
    file.kind = FileKind::description;
    return file;
  }
  if (name == "residuals.csv" || name == "case.resolved.yaml" || name == identity_file_name ||
      name == "progress.log") {
    file.kind = FileKind::kept;
    return file;
  }
  const bool is_profile = name.starts_with("profile_") && name.ends_with(".csv");
  if (name == "fields.pvts" || number_between(name, "fields_", ".vts") >= 0 || name == "wall.csv" ||
      name == "summary.json" || is_profile || name == "fields.pvd" ||
      name == "diverged_fields.pvts" || number_between(name, "diverged_fields_", ".vts") >= 0) {
    file.kind = FileKind::fields;
    file.iteration = -1;
    return file;
  }
  // Intermediate fields: fields_<N>.pvts and their pieces fields_<N>_<rank>.vts.
  file.iteration = number_between(name, "fields_", ".pvts");
  if (file.iteration < 0 && name.starts_with("fields_") && name.ends_with(".vts")) {
    const std::string middle = name.substr(7, name.size() - 11);
    const auto underscore = middle.find('_');
    if (underscore != std::string::npos && is_digits(middle.substr(0, underscore)) &&
        is_digits(middle.substr(underscore + 1)))
      file.iteration = std::stol(middle.substr(0, underscore));
  }
  if (file.iteration >= 0) {
    file.kind = FileKind::fields_at;
    return file;
  }
  return std::nullopt;
}

struct Identity {
  std::string case_id, title;
};

std::optional<Identity> read_identity(const fs::path& directory) {
  std::ifstream in(directory / identity_file_name);
  if (!in) return std::nullopt;
  Identity identity;
  std::string line;
  while (std::getline(in, line)) {
    if (line.starts_with("case_id ")) identity.case_id = line.substr(8);
    if (line.starts_with("title ")) identity.title = line.substr(6);
  }
  if (identity.case_id.empty()) return std::nullopt;
  return identity;
}

// Local. What `directory` (an existing directory) holds for the case `case_id`; `other_title`
// gets the other case's title.
DirectoryContent judge(const fs::path& directory, const std::string& case_id, std::string& other_title) {
  if (const auto identity = read_identity(directory)) {
    other_title = identity->title;
    return identity->case_id == case_id ? DirectoryContent::same_case : DirectoryContent::other_case;
  }
  std::error_code error;
  for (fs::directory_iterator entry(directory, error), end; !error && entry != end; entry.increment(error))
    if (classify(entry->path().filename().string())) return DirectoryContent::unknown_results;
  return DirectoryContent::empty;
}

[[noreturn]] void refuse_results(const RunDirectoryRequest& request, DirectoryContent content,
                                 const std::string& other_title) {
  const std::string got =
      content == DirectoryContent::other_case
          ? "results of another case ('" + other_title + "')"
          : "results of an unknown case (files of ours but no " + std::string(identity_file_name) + ")";
  throw InputError(request.path.string() +
                   ": expected an empty run directory or one holding this case's results, got " + got +
                   "; pass --replace-results to delete them first, or choose another --output-dir");
}

bool lies_in(const fs::path& file, const fs::path& directory) {
  std::error_code error;
  const fs::path a = fs::weakly_canonical(fs::absolute(file), error).parent_path();
  const fs::path b = fs::weakly_canonical(fs::absolute(directory), error);
  return !error && a == b;
}

// Local (rank 0). The checks of inspect_run_directory; returns the content's number.
DirectoryContent inspect_here(const RunDirectoryRequest& request) {
  const fs::path& path = request.path;
  const std::string where = request.origin + ": ";
  std::error_code error;
  const fs::file_status status = fs::status(path, error);
  if (fs::exists(status)) {
    if (!fs::is_directory(status)) {
      throw InputError(where + "expected a directory for the run, got '" + path.string() + "', which is " +
                       (fs::is_regular_file(status) ? "a file" : "not a directory"));
    }
    if (access(path.c_str(), W_OK | X_OK) != 0) {
      throw InputError(where + "expected a directory this run can write to, got '" + path.string() +
                       "': " + std::generic_category().message(errno));
    }
    RunLock::check_free(path);
    std::string other_title;
    const DirectoryContent content = judge(path, request.case_id, other_title);
    if (content == DirectoryContent::other_case || content == DirectoryContent::unknown_results) {
      if (!request.replace_results) refuse_results(request, content, other_title);
      if (request.restart && lies_in(*request.restart, path)) {
        throw InputError("command line: --restart '" + *request.restart +
                         "': expected a checkpoint outside '" + path.string() +
                         "', whose results --replace-results deletes; copy it elsewhere first");
      }
    }
    return content;
  }
  // The nearest existing ancestor must be a directory we may create entries in.
  fs::path ancestor = fs::absolute(path, error).parent_path();
  while (!ancestor.empty() && !fs::exists(ancestor, error) && ancestor != ancestor.root_path())
    ancestor = ancestor.parent_path();
  if (!fs::is_directory(ancestor, error)) {
    throw InputError(where + "expected a directory that can be created, got '" + path.string() + "' ('" +
                     ancestor.string() + "' is not a directory)");
  }
  if (access(ancestor.c_str(), W_OK | X_OK) != 0) {
    throw InputError(where + "expected a directory that can be created, got '" + path.string() + "' ('" +
                     ancestor.string() + "': " + std::generic_category().message(errno) + ")");
  }
  return DirectoryContent::empty;
}

// Local (rank 0). Removes the results that must not survive into a run starting at
// `restart_iteration` (< 0: all of ours). Returns how many files were removed.
int remove_results(const fs::path& directory, int restart_iteration,
                   const std::function<bool(const std::string&)>& is_case_checkpoint) {
  std::vector<fs::path> victims;
  std::set<long> removed_checkpoints;
  std::vector<std::pair<fs::path, long>> descriptions;
  std::error_code error;
  for (fs::directory_iterator entry(directory, error), end; !error && entry != end; entry.increment(error)) {
    const auto file = classify(entry->path().filename().string());
    if (!file) continue;
    bool remove = restart_iteration < 0 || file->is_temporary;
    switch (file->kind) {
      case FileKind::checkpoint:
        remove =
            remove || (file->iteration > restart_iteration && is_case_checkpoint(entry->path().string()));
        if (remove) removed_checkpoints.insert(file->iteration);
        break;
      case FileKind::description:
        if (!remove) descriptions.emplace_back(entry->path(), file->iteration);
        break;
      case FileKind::fields:
        remove = true;
        break;
      case FileKind::fields_at:
        remove = remove || file->iteration > restart_iteration;
        break;
      case FileKind::kept:
        break;
    }
    if (remove) victims.push_back(entry->path());
  }
  if (error) throw Error(directory.string() + ": cannot list the run directory: " + error.message());
  // A description goes with its checkpoint (or when that is missing).
  for (const auto& [path, iteration] : descriptions) {
    fs::path h5 = path;
    h5.replace_extension(".h5");
    if (removed_checkpoints.contains(iteration) || !fs::exists(h5, error)) victims.push_back(path);
  }
  for (const fs::path& victim : victims) {
    fs::remove(victim, error);
    if (error) throw Error(victim.string() + ": cannot delete an earlier result: " + error.message());
  }
  return static_cast<int>(victims.size());
}

}  // namespace

bool is_run_output(const std::string& name) { return classify(name).has_value(); }

DirectoryContent inspect_run_directory(MPI_Comm comm, const RunDirectoryRequest& request) {
  const std::string content =
      run_on_root(comm, [&] { return std::to_string(static_cast<int>(inspect_here(request))); });
  return static_cast<DirectoryContent>(std::stoi(content));
}

RunDirectory::RunDirectory(MPI_Comm comm, const RunDirectoryRequest& request, int restart_iteration,
                           const std::function<bool(const std::string&)>& is_case_checkpoint)
    : path_(request.path) {
  check_mpi(MPI_Comm_rank(comm, &rank_));
  std::string notes;
  bool created = false;
  std::optional<Failure> failure;
  if (rank_ == 0) {
    failure = attempt([&] {
      std::error_code error;
      created = fs::create_directories(path_, error);
      if (error) {
        throw InputError(request.origin + ": expected a directory that can be created, got '" +
                         path_.string() + "' (" + error.message() + ")");
      }
      lock_ = std::make_unique<RunLock>(path_);
      if (const auto& stale = lock_->stale_holder())
        notes += "wallrans: note: took over the lock of an ended run (" + stale->describe() + ")\n";
      std::string other_title;
      const DirectoryContent content = judge(path_, request.case_id, other_title);
      const bool foreign =
          content == DirectoryContent::other_case || content == DirectoryContent::unknown_results;
      if (foreign && !request.replace_results) refuse_results(request, content, other_title);
      const int removed = remove_results(path_, foreign ? -1 : restart_iteration, is_case_checkpoint);
      if (removed > 0 && foreign) {
        notes += "wallrans: note: deleted " + std::to_string(removed) + " result file(s) of " +
                 (other_title.empty() ? std::string("an unknown case") : "case '" + other_title + "'") +
                 " from " + path_.string() + " (--replace-results)\n";
      } else if (removed > 0 && restart_iteration < 0) {
        notes += "wallrans: note: " + path_.string() +
                 " held results of this case; starting afresh deleted " + std::to_string(removed) +
                 " file(s) (--resume continues from its newest checkpoint instead)\n";
      }
      write_file_atomically(path_ / identity_file_name,
                            "# wallrans run directory: the case whose results are here\ncase_id " +
                                request.case_id + "\ntitle " + request.title + "\ncase_file " +
                                request.case_file + "\nclaimed " + utc_now() + "\n",
                            "run directory");
    });
    if (failure) {
      lock_.reset();
      std::error_code ignored;
      if (created) fs::remove(path_, ignored);  // only if still empty
    }
  }
  agree(comm, failure);
  if (rank_ == 0 && !notes.empty()) {
    std::fputs(notes.c_str(), stdout);
    std::fflush(stdout);
  }
}

RunDirectory::~RunDirectory() = default;

void RunDirectory::remove_temporaries() const noexcept {
  if (rank_ != 0) return;
  std::error_code error;
  std::vector<fs::path> victims;
  for (fs::directory_iterator entry(path_, error), end; !error && entry != end; entry.increment(error)) {
    const auto file = classify(entry->path().filename().string());
    if (file && file->is_temporary) victims.push_back(entry->path());
  }
  for (const fs::path& victim : victims) fs::remove(victim, error);
}

}  // namespace wallrans
