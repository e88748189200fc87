// Test helper: the message of the InputError a piece of code throws.
#pragma once

#include <gtest/gtest.h>

#include <string>

#include "core/error.hpp"

namespace wallrans::test_support {

/// The message of the InputError that `run` throws ("" and a test failure if it throws none).
template <class Run>
std::string input_error_of(Run run) {
  try {
    run();
  } catch (const InputError& error) {
    return error.what();
  }
  ADD_FAILURE() << "expected an InputError";
  return "";
}

}  // namespace wallrans::test_support
