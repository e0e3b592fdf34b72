// chute: routes documents into queues with multinomial naive Bayes.
// main() only picks the command from one table, runs it, and maps the
// outcome to an exit status (cli/exit_code.h).
#include <CLI/CLI.hpp>

#include <cstdio>
#include <exception>
#include <string>

#include "cli/command.h"
#include "cli/exit_code.h"

namespace {

constexpr chute::Command kCommands[] = {
    {"init", "create a store; its model settings are fixed for its life", chute::SetupInit},
    {"learn", "learn labelled documents (a folder tree, a CSV manifest, or files)",
     chute::SetupLearn},
    {"route", "choose the queue of each document, with its confidence", chute::SetupRoute},
    {"watch", "route the files of an inbox folder into queue folders as they arrive",
     chute::SetupWatch},
    {"why", "explain a routing decision: the terms that pulled each way", chute::SetupWhy},
    {"terms", "per queue, the terms that most set it apart from the other queues",
     chute::SetupTerms},
    {"evaluate",
     "measure how well each queue is served: cross-validation, a holdout, or the decision log",
     chute::SetupEvaluate},
    {"drift", "is the intake changing? daily figures of the decision log beside the model's",
     chute::SetupDrift},
    {"correct",
     "move learned documents to the queues reviewers name (a CSV file, or the folders)",
     chute::SetupCorrect},
    {"forget", "unlearn documents exactly and erase what the store kept of them",
     chute::SetupForget},
    {"rebuild", "recount the model under new settings from the kept texts; swap it in",
     chute::SetupRebuild},
    {"promote", "make the candidate the current model if it is not worse on held-out documents",
     chute::SetupPromote},
    {"purge", "erase the kept text and source paths of documents learned before a time",
     chute::SetupPurge},
    {"versions", "list the model's versions: every committed change, with its fingerprint",
     chute::SetupVersions},
    {"rollback", "make the model an earlier version's again (itself a new version)",
     chute::SetupRollback},
    {"log", "the decisions route --into and watch delivered: where each document went, and why",
     chute::SetupLog},
    {"queues", "list the queues, their documents, terms and priors; set priors",
     chute::SetupQueues},
    {"terms-of", "print the terms chute counts for a document", chute::SetupTermsOf},
    {"check", "check the store's integrity: SQLite's own checks and chute's invariants",
     chute::SetupCheck},
    {"backup", "copy the store to a file while it is in use", chute::SetupBackup},
    {"restore", "put a copy made by 'chute backup' back as the store", chute::SetupRestore},
};

// Levenshtein distance, for "did you mean" (common practice).
size_t EditDistance(const std::string& a, const std::string& b) {
  std::vector<size_t> row(b.size() + 1);
  for (size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (size_t i = 1; i <= a.size(); ++i) {
    size_t diag = row[0];
    row[0] = i;
    for (size_t j = 1; j <= b.size(); ++j) {
      size_t up = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (a[i - 1] != b[j - 1])});
      diag = up;
    }
  }
  return row[b.size()];
}

void SuggestCommand(int argc, char** argv) {
  for (int i = 1; i < argc; ++i) {
    std::string word = argv[i];
    if (word.empty() || word[0] == '-') continue;
    for (const auto& c : kCommands) {
      if (EditDistance(word, c.name) <= 2) {
        std::fprintf(stderr, "chute: did you mean '%s'?\n", c.name);
        return;
      }
    }
    return;
  }
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"chute routes incoming documents into queues with a multinomial naive Bayes\n"
               "model learned from labelled examples.",
               "chute"};
  app.require_subcommand(1, 1);
  app.set_version_flag("--version", std::string(CHUTE_VERSION));
  app.footer(R"(Run 'chute <command> --help' for a command's options and examples.

Start here:
  chute init --db harbour.db
  chute learn --db harbour.db --tree corpora/port-authority/labelled/
  chute route --db harbour.db corpora/port-authority/inbox/

Exit status: 0 done; 1 failed, nothing changed; 2 usage error;
3 done, but some documents were refused (each reported on stderr);
4 promote refused by its gate (the candidate was worse).)");
  std::vector<std::pair<CLI::App*, chute::CommandRun>> runs;
  for (const auto& c : kCommands) {
    CLI::App* sub = app.add_subcommand(c.name, c.summary);
    runs.emplace_back(sub, c.setup(sub));
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    app.exit(e);
    if (app.get_subcommands().empty()) SuggestCommand(argc, argv);
    return chute::kExitUsage;
  }
  try {
    for (auto& [sub, run] : runs) {
      if (sub->parsed()) return run();
    }
  } catch (const std::exception& e) {
    std::fprintf(stderr, "chute: %s\n", e.what());
    return chute::kExitFailed;
  }
  return chute::kExitUsage;
}
