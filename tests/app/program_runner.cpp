// Launches the wallrans program through the shell with std::system and reads back what it wrote.
#include "program_runner.hpp"

#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <random>
#include <sstream>
#include <stdexcept>
#include <thread>

extern char** environ;

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

BackgroundProgram::BackgroundProgram(const std::vector<std::string>& argv, const fs::path& directory,
                                     const fs::path& capture_directory, const std::string& label,
                                     const std::vector<std::string>& environment)
    : out_(capture_directory / (label + ".stdout")), err_(capture_directory / (label + ".stderr")) {
  fs::create_directories(capture_directory);
  std::vector<std::string> args = argv, env;
  for (char** entry = environ; *entry != nullptr; ++entry) env.emplace_back(*entry);
  env.insert(env.end(), environment.begin(), environment.end());
  std::vector<char*> arg_pointers, env_pointers;
  for (auto& a : args) arg_pointers.push_back(a.data());
  arg_pointers.push_back(nullptr);
  for (auto& e : env) env_pointers.push_back(e.data());
  env_pointers.push_back(nullptr);
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, 0, "/dev/null", O_RDONLY, 0);
  posix_spawn_file_actions_addopen(&actions, 1, out_.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  posix_spawn_file_actions_addopen(&actions, 2, err_.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  posix_spawn_file_actions_addchdir_np(&actions, directory.c_str());
  pid_t pid = -1;
  const int error =
      posix_spawn(&pid, args[0].c_str(), &actions, nullptr, arg_pointers.data(), env_pointers.data());
  posix_spawn_file_actions_destroy(&actions);
  if (error != 0) throw std::runtime_error("cannot start " + args[0]);
  pid_ = pid;
}

BackgroundProgram::~BackgroundProgram() {
  if (pid_ <= 0) return;
  kill(pid_, SIGKILL);
  int status = 0;
  waitpid(pid_, &status, 0);
}

bool BackgroundProgram::signal(int signal) const { return pid_ > 0 && kill(pid_, signal) == 0; }

ProgramResult BackgroundProgram::wait() {
  ProgramResult result;
  int status = 0;
  if (pid_ > 0 && waitpid(pid_, &status, 0) == pid_) {
    if (WIFEXITED(status)) result.exit_status = WEXITSTATUS(status);
    if (WIFSIGNALED(status)) terminating_signal_ = WTERMSIG(status);
    pid_ = -1;
  }
  result.out = read_text(out_);
  result.err = read_text(err_);
  return result;
}

std::vector<std::string> mpi_command(int ranks, const std::vector<std::string>& arguments) {
  std::vector<std::string> argv{WALLRANS_MPIEXEC, WALLRANS_MPIEXEC_NUMPROC_FLAG, std::to_string(ranks),
                                WALLRANS_PROGRAM};
  argv.insert(argv.end(), arguments.begin(), arguments.end());
  return argv;
}

std::vector<std::string> program_command(const std::vector<std::string>& arguments) {
  std::vector<std::string> argv{WALLRANS_PROGRAM};
  argv.insert(argv.end(), arguments.begin(), arguments.end());
  return argv;
}

std::vector<int> program_children(int parent) {
  std::vector<int> children;
  for (const auto& entry : fs::directory_iterator("/proc")) {
    const std::string name = entry.path().filename().string();
    if (name.find_first_not_of("0123456789") != std::string::npos) continue;
    // /proc/<pid>/stat: "pid (comm) state ppid ..."; comm may contain spaces, so parse after ')'.
    const std::string stat = read_text(entry.path() / "stat");
    const auto open = stat.find('('), close = stat.rfind(')');
    if (open == std::string::npos || close == std::string::npos) continue;
    std::istringstream rest(stat.substr(close + 1));
    std::string state;
    int ppid = 0;
    rest >> state >> ppid;
    if (ppid == parent && stat.substr(open + 1, close - open - 1) == "wallrans" && state != "Z")
      children.push_back(std::stoi(name));
  }
  std::sort(children.begin(), children.end());
  return children;
}

bool wait_until(const std::function<bool()>& condition, double seconds) {
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::duration<double>(seconds);
  while (std::chrono::steady_clock::now() < deadline) {
    if (condition()) return true;
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }
  return condition();
}

int history_rows(const fs::path& directory) {
  const auto lines = lines_of(read_text(directory / "residuals.csv"));
  return lines.empty() ? 0 : static_cast<int>(lines.size()) - 1;
}

std::string json_field(const fs::path& path, const std::string& key) {
  const auto json = nlohmann::json::parse(read_text(path), nullptr, false);
  if (!json.is_object() || !json.contains(key) || !json[key].is_string()) return "";
  return json[key].get<std::string>();
}

std::string this_host() {
  char name[256] = {};
  gethostname(name, sizeof name - 1);
  return name;
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

std::vector<std::string> program_lines(const std::string& text) {
  std::vector<std::string> lines;
  for (const auto& line : lines_of(text))
    if (line.rfind("wallrans", 0) == 0) lines.push_back(line);
  return lines;
}

}  // namespace wallrans::test_support
