// The command line of the `wallrans` program (CLI11): the commands run, check, write-grid,
// extract and version, their options, and the help text of each.
#pragma once

#include <string>

#include "app/extract.hpp"
#include "app/run_case.hpp"

namespace wallrans {

struct CommandLine {
  std::string command;  ///< "run", "check", "write-grid", "extract", "version", or "help"
  RunOptions run;
  ExtractOptions extract;
  std::string grid_file;  ///< write-grid: the file to write
  std::string help;       ///< "help": the text to print
};

/// Local. Parses our part of the command line: argv[1] up to the first PETSc option (a word
/// starting with one '-' and a letter, other than -h), which PETSc has read in PetscInitialize.
/// `--help` (or -h) anywhere gives command "help" with the text of the command named (or of
/// the program). Throws InputError "command line: ... expected ..." (one line) for anything else
/// that is not a valid command line.
CommandLine parse_command_line(int argc, const char* const* argv);

}  // namespace wallrans
