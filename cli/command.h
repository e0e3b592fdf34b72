// How a command plugs into main(): each command file defines one Setup
// function that adds its options to its CLI11 subcommand and returns the
// function that runs it once the command line is parsed.
#ifndef CHUTE_CLI_COMMAND_H_
#define CHUTE_CLI_COMMAND_H_

#include <functional>

namespace CLI {
class App;
}

namespace chute {

using CommandRun = std::function<int()>;  // returns an ExitCode
using CommandSetup = CommandRun (*)(CLI::App* command);

struct Command {
  const char* name;
  const char* summary;
  CommandSetup setup;
};

CommandRun SetupInit(CLI::App* command);
CommandRun SetupLearn(CLI::App* command);
CommandRun SetupRoute(CLI::App* command);
CommandRun SetupQueues(CLI::App* command);
CommandRun SetupTermsOf(CLI::App* command);
CommandRun SetupWhy(CLI::App* command);
CommandRun SetupTerms(CLI::App* command);
CommandRun SetupEvaluate(CLI::App* command);
CommandRun SetupCheck(CLI::App* command);
CommandRun SetupBackup(CLI::App* command);
CommandRun SetupRestore(CLI::App* command);
CommandRun SetupForget(CLI::App* command);
CommandRun SetupCorrect(CLI::App* command);
CommandRun SetupRebuild(CLI::App* command);
CommandRun SetupPromote(CLI::App* command);
CommandRun SetupPurge(CLI::App* command);
CommandRun SetupVersions(CLI::App* command);
CommandRun SetupRollback(CLI::App* command);
CommandRun SetupLog(CLI::App* command);
CommandRun SetupDrift(CLI::App* command);
CommandRun SetupWatch(CLI::App* command);

}  // namespace chute

#endif  // CHUTE_CLI_COMMAND_H_
