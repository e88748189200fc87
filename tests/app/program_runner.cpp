// Launches the wallrans program through the shell with std::system and reads back what it wrote.
#include "program_runner.hpp"

#include <sys/wait.h>

#include <cstdlib>
#include <fstream>
#include <random>
#include <sstream>
#include <stdexcept>

namespace wallrans::test_support {

namespace fs = std::filesystem;

namespace {

// Single-quoted for the POSIX shell; an embedded ' becomes '\''.
std::string quoted(const std::string& text) {
  std::string out = "'";
  for (char c : text) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return out + "'";
}

ProgramResult run_command(const std::string& launcher, const std::string& program, const fs::path& directory,
                          const std::vector<std::string>& arguments, const fs::path& capture_directory,
                          const std::string& label) {
  fs::create_directories(capture_directory);
  const fs::path out = capture_directory / (label + ".stdout");
  const fs::path err = capture_directory / (label + ".stderr");
  // Built by appending pieces (GCC 12 warns falsely about `"literal" + std::string&&`).
  std::string command = "cd ";
  command.append(quoted(directory.string())).append(" && ").append(launcher).append(quoted(program));
  for (const auto& argument : arguments) command.append(" ").append(quoted(argument));
  command.append(" >").append(quoted(out.string())).append(" 2>").append(quoted(err.string()));
  command.append(" </dev/null");
  const int status = std::system(command.c_str());
  ProgramResult result;
  if (status != -1 && WIFEXITED(status)) result.exit_status = WEXITSTATUS(status);
  result.out = read_text(out);
  result.err = read_text(err);
  return result;
}

}  // namespace

ScratchDirectory::ScratchDirectory(const std::string& prefix) {
  std::random_device entropy;
  for (int attempt = 0; attempt < 100; ++attempt) {
    const fs::path candidate = fs::temp_directory_path() /
                               (prefix + "_" + std::to_string(entropy()) + "_" + std::to_string(entropy()));
    if (fs::create_directory(candidate)) {
      path_ = candidate;
      return;
    }
  }
  throw std::runtime_error("cannot create a scratch directory under " + fs::temp_directory_path().string());
}

ScratchDirectory::~ScratchDirectory() {
  std::error_code ignored;
  fs::remove_all(path_, ignored);
}

ProgramResult run_program(const fs::path& directory, const std::vector<std::string>& arguments,
                          const fs::path& capture_directory, const std::string& label) {
  return run_command("", WALLRANS_PROGRAM, directory, arguments, capture_directory, label);
}

ProgramResult run_executable(const std::string& program, const fs::path& directory,
                             const std::vector<std::string>& arguments, const fs::path& capture_directory,
                             const std::string& label) {
  return run_command("", program, directory, arguments, capture_directory, label);
}

ProgramResult run_program_mpi(int ranks, const fs::path& directory, const std::vector<std::string>& arguments,
                              const fs::path& capture_directory, const std::string& label,
                              const std::string& environment) {
  // `environment` (e.g. "NAME=value") is exported to the launcher and so to every rank.
  const std::string launcher = (environment.empty() ? std::string() : "env " + environment + " ") +
                               quoted(WALLRANS_MPIEXEC) + " " + WALLRANS_MPIEXEC_NUMPROC_FLAG + " " +
                               std::to_string(ranks) + " ";
  return run_command(launcher, WALLRANS_PROGRAM, directory, arguments, capture_directory, label);
}

std::string read_text(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

void write_text(const fs::path& path, const std::string& text) {
  if (path.has_parent_path()) fs::create_directories(path.parent_path());
  std::ofstream out(path, std::ios::binary);
  out << text;
  if (!out.good()) throw std::runtime_error("cannot write " + path.string());
}

std::map<std::string, std::string> snapshot(const fs::path& directory) {
  std::map<std::string, std::string> files;
  for (const auto& entry : fs::recursive_directory_iterator(directory)) {
    const std::string name = fs::relative(entry.path(), directory).string();
    files[name] = entry.is_regular_file() ? read_text(entry.path()) : std::string("<not a regular file>");
  }
  return files;
}

int line_containing(const std::string& text, const std::string& marker) {
  const auto found = lines_of(text);
  for (size_t k = 0; k < found.size(); ++k) {
    if (found[k].find(marker) != std::string::npos) return static_cast<int>(k) + 1;
  }
  return 0;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> lines;
  std::string line;
  std::istringstream in(text);
  while (std::getline(in, line)) lines.push_back(line);
  return lines;
}

}  // namespace wallrans::test_support
