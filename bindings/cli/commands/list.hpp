#pragma once
// The commands of the program, in the order the main help lists them. To add a command: write
// commands/NAME.cpp defining `const acidload_cli::Command NAME_command{…}` and add X(NAME) here.
#define ACIDLOAD_CLI_COMMANDS(X) \
  X(check)                       \
  X(run)                         \
  X(report)                      \
  X(solve)                       \
  X(costs)                       \
  X(convert)                     \
  X(fit)                         \
  X(forecast)                    \
  X(uncertainty)                 \
  X(demo)
