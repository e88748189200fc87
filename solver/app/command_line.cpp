#include "app/command_line.hpp"

#include <CLI/CLI.hpp>
#include <cctype>
#include <cerrno>
#include <cstdlib>
#include <vector>

#include "app/progress.hpp"
#include "core/error.hpp"

namespace wallrans {

namespace {

constexpr const char* commands = "run, check, write-grid, extract or version";

constexpr const char* petsc_text =
    "PETSc options for the linear solvers go last, after our own arguments, with one prefix per\n"
    "equation: -momentum_ (u and v), -pressure_ (pressure correction), -turbulence_ (the model's\n"
    "equation), e.g. -pressure_ksp_rtol 1e-3 -turbulence_ksp_type gmres. A case file's\n"
    "iterations.petsc_options override them.\n";

constexpr const char* outputs_text =
    "Outputs in the run directory (output.directory or --output-dir):\n"
    "  summary.json            how the run ended (status, exit code) and the answers: forces, Cf,\n"
    "                          y+, separation/reattachment per wall; U_b, u_tau, Re_tau if periodic\n"
    "  progress.log            every line the run prints (also with --quiet)\n"
    "  residuals.csv           residuals and linear iterations of every equation per iteration\n"
    "  fields.pvts (+ .vts)    final cell and point data (VTK); fields_<N>.pvts every\n"
    "                          output.fields_every iterations, listed in fields.pvd\n"
    "  wall.csv                per wall face: segment, side, x, y, s, tangent, Cf, Cp, tau_w, y+\n"
    "  profile_x<X>.csv        profiles at output.profiles_at_x, from the nearest wall\n"
    "  checkpoint_<N>.h5/.xmf  restart file (HDF5) and its XDMF description for a viewer\n"
    "  case.resolved.yaml      the case with every default written out\n";

constexpr const char* exit_text =
    "Exit codes: 0 converged/valid, 2 bad input (command line, case file, checkpoint, run\n"
    "directory), 3 iteration cap reached, 4 diverged, 5 stopped by SIGTERM/SIGINT/SIGUSR1 or the\n"
    "wall-clock budget (checkpoint written), 1 other failure.\n";

// Validators return "" or what was wrong; CLI11 reports it as "<option>: <text>".
CLI::Validator integer_at_least(long minimum) {
  return CLI::Validator(
      [minimum](std::string& text) -> std::string {
        char* end = nullptr;
        errno = 0;
        const long value = std::strtol(text.c_str(), &end, 10);
        if (text.empty() || *end != '\0' || errno != 0 || value < minimum || value > 1000000000)
          return "expected an integer >= " + std::to_string(minimum) + " (at most 1e9), got '" + text + "'";
        return "";
      },
      "");
}

CLI::Validator positive_seconds() {
  return CLI::Validator(
      [](std::string& text) -> std::string {
        char* end = nullptr;
        errno = 0;
        const double value = std::strtod(text.c_str(), &end);
        if (text.empty() || *end != '\0' || errno != 0 || !(value > 0.0) || value > 1e12)
          return "expected a positive number of seconds (decimals allowed), got '" + text + "'";
        return "";
      },
      "");
}

// The options run and check share.
void add_run_options(CLI::App& command, RunOptions& run, std::vector<std::string>& case_files) {
  command.add_option("CASE", case_files, "the case file (YAML; configs/README.md lists every key)")
      ->type_name("CASE.yaml");
  command.add_option("--output-dir", run.output_directory, "run directory; overrides output.directory")
      ->type_name("DIR");
  command
      .add_option("--max-iterations", run.max_iterations,
                  "iterations of this run (also after a restart); overrides iterations.max; 0 writes "
                  "the starting state (e.g. a restart checkpoint) again")
      ->type_name("N")
      ->check(integer_at_least(0));
  command.add_flag(
      "--quiet", run.quiet,
      "print only the final line (everything else still goes to " + std::string(progress_log_name) + ")");
  command
      .add_option("--restart", run.restart,
                  "continue from this checkpoint; overrides checkpoint.restart_from")
      ->type_name("FILE.h5");
  command.add_flag("--resume", run.resume,
                   "continue from this case's newest checkpoint in the run directory, if there is one");
  command.add_flag("--replace-results", run.replace_results,
                   "delete another case's results from the run directory before running");
  command
      .add_option("--walltime", run.walltime,
                  "write a checkpoint and stop before this many seconds of wall-clock time; overrides "
                  "checkpoint.walltime")
      ->type_name("SECONDS")
      ->check(positive_seconds());
  command.allow_extras();
}

// A word that starts the PETSc options: one '-' and a letter (negative numbers are values).
bool is_petsc_option(const std::string& word) {
  return word.size() > 1 && word[0] == '-' && std::isalpha(static_cast<unsigned char>(word[1])) &&
         word != "-h";
}

// Our own message for what CLI11 found wrong (its own text names the option first).
std::string message_of(const CLI::ParseError& e) {
  std::string text = e.what();
  for (char& c : text)
    if (c == '\n') c = ' ';
  const std::string option = text.substr(0, text.find(':'));
  if (dynamic_cast<const CLI::ArgumentMismatch*>(&e) != nullptr)
    return option + ": expected a value after it";
  if (dynamic_cast<const CLI::ValidationError*>(&e) != nullptr) return text;
  return text + " (expected the form that 'wallrans --help' shows)";
}

}  // namespace

CommandLine parse_command_line(int argc, const char* const* argv) {
  std::vector<const char*> ours{argc > 0 ? argv[0] : "wallrans"};
  int n_words = 0;  // the command and its files
  for (int k = 1; k < argc; ++k) {
    const std::string word = argv[k];
    if (is_petsc_option(word)) {
      if (n_words < 2)
        throw InputError("command line: PETSc option '" + word +
                         "': expected it after the command and case file");
      break;
    }
    if (word[0] != '-') ++n_words;
    ours.push_back(argv[k]);
  }
  bool wants_help = false;
  for (size_t k = 1; k < ours.size(); ++k)
    wants_help = wants_help || std::string(ours[k]) == "--help" || std::string(ours[k]) == "-h";
  if (!wants_help) {
    // The command comes first; CLI11 would call an unknown one an unexpected argument.
    if (ours.size() < 2) throw InputError(std::string("command line: expected a command (") + commands + ")");
    const std::string first = ours[1];
    if (first != "run" && first != "check" && first != "write-grid" && first != "extract" &&
        first != "version") {
      throw InputError(first[0] == '-'
                           ? "command line: option '" + first + "' before the command: expected a command (" +
                                 commands + ") first"
                           : "command line: unknown command '" + first + "'; expected " + commands);
    }
  }

  CommandLine result;
  std::vector<std::string> case_files, grid_arguments;
  std::string stations;
  CLI::App app("wallrans: a 2D incompressible RANS solver on structured curvilinear grids.", "wallrans");
  app.footer(std::string("Run 'wallrans <command> --help' for the options of a command.\n") + exit_text);
  app.require_subcommand(0, 1);
  CLI::App* run = app.add_subcommand("run", "solve a case and write its outputs and answers");
  add_run_options(*run, result.run, case_files);
  run->footer(
      std::string("Example: mpirun -np 2 wallrans run configs/channel_sa_re180.yaml --output-dir out/ch "
                  "-pressure_ksp_rtol 1e-3\n\n") +
      petsc_text + "\n" + outputs_text + "\n" + exit_text);
  CLI::App* check =
      app.add_subcommand("check", "make every check run makes before it iterates; writes nothing");
  add_run_options(*check, result.run, case_files);
  check->footer(std::string("Example: wallrans check configs/plate_sa.yaml\n\n") + petsc_text + "\n" +
                exit_text);
  CLI::App* write_grid =
      app.add_subcommand("write-grid", "write the case's grid with its boundary patches (docs/grid-file.md)");
  write_grid->add_option("FILES", grid_arguments, "the case file (YAML) and the grid file to write (HDF5)")
      ->type_name("CASE.yaml GRID.h5");
  write_grid->allow_extras();
  write_grid->footer(
      "Example: wallrans write-grid configs/plate_sa.yaml plate_grid.h5\n"
      "Writes plate_grid.h5 and, for a viewer, plate_grid.pvts with one plate_grid_<rank>.vts\n"
      "per rank (cell data: solid, cell_volume, cell_index).\n\n" +
      std::string(exit_text));
  CLI::App* extract = app.add_subcommand(
      "extract",
      "write wall data and profiles of a checkpoint into a folder of your choice, without iterating");
  extract->add_option("CASE", case_files, "the case file the checkpoint belongs to (YAML)")
      ->type_name("CASE.yaml");
  extract
      ->add_option("--checkpoint", result.extract.checkpoint,
                   "the checkpoint to read (written on any rank count)")
      ->type_name("FILE.h5")
      ->required();
  extract
      ->add_option("--into", result.extract.into,
                   "the folder to write wall.csv and profile_x<X>.csv into (created if missing); never the "
                   "run directory or the checkpoint's folder")
      ->type_name("DIR")
      ->required();
  extract
      ->add_option("--stations", stations,
                   "profile stations x [m], comma-separated; default: the case's output.profiles_at_x")
      ->type_name("X1,X2,...");
  extract->allow_extras();
  extract->footer(
      "Examples:\n"
      "  wallrans extract configs/plate_sa.yaml --checkpoint out/plate_sa/checkpoint_412.h5 \\\n"
      "      --into plate_stations --stations 0.5,1.0,1.5\n"
      "  mpirun -np 2 wallrans extract case.yaml --checkpoint run/checkpoint_80.h5 --into extracted\n\n"
      "It reads the checkpoint as a restart does, computes the wall data as at the end of a run (the\n"
      "same numbers the run wrote from that checkpoint) and prints the answers table. The run\n"
      "directory is left untouched (no lock taken), so it may extract from a run in progress.\n"
      "Outputs in DIR: wall.csv and profile_x<X>.csv, with the columns of a run's (wallrans run "
      "--help).\n\n" +
      std::string(exit_text));
  CLI::App* version = app.add_subcommand("version", "print the version");
  version->allow_extras();

  try {
    app.parse(static_cast<int>(ours.size()), ours.data());
  } catch (const CLI::CallForHelp&) {
    result.command = "help";
    result.help = app.help();
    return result;
  } catch (const CLI::CallForAllHelp&) {
    result.command = "help";
    result.help = app.help();
    return result;
  } catch (const CLI::ParseError& e) {
    throw InputError("command line: " + message_of(e));
  }
  CLI::App* chosen = app.get_subcommands().empty() ? nullptr : app.get_subcommands().front();
  if (chosen == nullptr) throw InputError(std::string("command line: expected a command (") + commands + ")");
  result.command = chosen->get_name();
  for (const std::string& extra : chosen->remaining()) {
    throw InputError(extra.rfind("-", 0) == 0
                         ? "command line: unknown option '" + extra + "' for " + result.command +
                               "; expected one of those 'wallrans " + result.command + " --help' lists"
                         : "command line: " + result.command + ": unexpected argument '" + extra +
                               "'; expected what 'wallrans " + result.command + " --help' lists");
  }
  if (result.command == "write-grid") {
    if (grid_arguments.size() != 2) {
      throw InputError("command line: write-grid: expected a case file and a grid file, got " +
                       std::to_string(grid_arguments.size()) + " argument(s)");
    }
    result.run.case_file = grid_arguments[0];
    result.grid_file = grid_arguments[1];
  } else if (result.command == "extract") {
    if (case_files.size() != 1) {
      throw InputError("command line: extract: expected exactly one case file, got " +
                       std::to_string(case_files.size()));
    }
    result.extract.case_file = case_files[0];
    if (!stations.empty()) result.extract.stations = parse_station_list(stations);
  } else if (result.command == "run" || result.command == "check") {
    if (case_files.size() != 1) {
      throw InputError("command line: " + result.command + ": expected exactly one case file, got " +
                       std::to_string(case_files.size()));
    }
    result.run.case_file = case_files[0];
    if (result.run.resume && result.run.restart)
      throw InputError("command line: --resume: expected either --resume or --restart FILE, got both");
  }
  return result;
}

}  // namespace wallrans
