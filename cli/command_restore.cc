// chute restore FILE: puts a copy made by `chute backup` back as the store,
// with SQLite's online backup API (store/backup.h).
#include <CLI/CLI.hpp>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "store/backup.h"

namespace chute {

namespace {

struct RestoreOptions {
  std::string db;
  std::string file;
  bool force = false;
};

int RunRestore(const RestoreOptions& o) {
  RestoreResult r;
  if (Status s = RestoreStore(o.file, o.db, o.force, &r); !s.ok()) {
    Report("restore", s.message());
    return kExitFailed;
  }
  std::string line = "restored " + o.file +
                     (r.created ? " as the new store " : " into ") + o.db +
                     ": " + std::to_string(r.documents) + " documents, " +
                     std::to_string(r.queues) + " queues";
  if (!r.created)
    line += " (it held " + std::to_string(r.documents_before) + " documents)";
  Print(line + "\n");
  return kExitDone;
}

}  // namespace

CommandRun SetupRestore(CLI::App* cmd) {
  auto o = std::make_shared<RestoreOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("FILE", o->file, "a copy made by 'chute backup'")->required();
  cmd->add_flag("--force", o->force,
                "replace a store that holds learned documents (they are lost)");
  cmd->footer(
      R"(FILE must be a chute store of a schema this chute understands (an older
one is upgraded after the restore); it is only read. The store at --db is
created when it does not exist; when it exists it is overwritten in one
transaction (routers running meanwhile see the old model, then the
restored one), and if it holds learned documents, only with --force.

Examples:
  chute restore --db harbour.db backups/harbour-2026-12-02.db
  chute restore --db harbour.db backups/harbour-2026-12-02.db --force)");
  return [o] { return RunRestore(*o); };
}

}  // namespace chute
