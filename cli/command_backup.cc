// chute backup FILE: a consistent copy of the store, taken with SQLite's
// online backup API while other processes use the store (store/backup.h).
#include <CLI/CLI.hpp>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "store/backup.h"

namespace chute {

namespace {

struct BackupOptions {
  std::string db;
  std::string file;
  bool force = false;
};

int RunBackup(const BackupOptions& o) {
  BackupResult r;
  if (Status s = BackupStore(o.db, o.file, o.force, &r); !s.ok()) {
    Report("backup", s.message());
    return kExitFailed;
  }
  Print("backed up " + o.db + " to " + o.file + ": " +
        std::to_string(r.documents) + " documents, " +
        std::to_string(r.queues) + " queues, " + std::to_string(r.bytes) +
        " bytes\n");
  return kExitDone;
}

}  // namespace

CommandRun SetupBackup(CLI::App* cmd) {
  auto o = std::make_shared<BackupOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("FILE", o->file, "where to write the copy")->required();
  cmd->add_flag("--force", o->force, "replace FILE when it exists");
  cmd->footer(
      R"(The copy is one consistent snapshot of the store; routing and learning
may go on meanwhile. It is written beside FILE (mode 0600), checked, and
renamed into place. The copy holds everything the store holds, personal
data included: keep it as safe as the store.

Examples:
  chute backup --db harbour.db backups/harbour-2026-12-02.db
  chute backup --db harbour.db backups/harbour-latest.db --force)");
  return [o] { return RunBackup(*o); };
}

}  // namespace chute
