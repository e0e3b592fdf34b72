// chute rollback: makes the model an earlier version's again, as a new
// version.
#include <CLI/CLI.hpp>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/parallel.h"
#include "cli/recount.h"

namespace chute {

namespace {

struct RollbackOptions {
  std::string db;
  int64_t version = 0;
  std::string by;
  OutputFormat format = OutputFormat::kTable;
};

int RunRollback(const RollbackOptions& o) {
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("rollback", o.db, &store)) return kExitFailed;
  VersionState target;
  if (Status s = store->LoadVersionState(o.version, &target); !s.ok()) {
    Report("rollback", s.message());
    return kExitFailed;
  }
  RollbackResult r;
  const ChangeInfo change{NowRfc3339(), o.by};
  // A rebuild changed the tokenizing since: the ledger is recounted with the
  // version's settings from the kept text first (cli/recount.h).
  const bool recount = !SameTokenizing(target.settings, store->settings());
  if (Status s = recount ? RollbackAcrossTokenizing(store.get(), o.version, change,
                                                    DefaultThreads(), &r)
                         : store->Rollback(o.version, change, &r);
      !s.ok()) {
    Report("rollback", s.message() + "; nothing was changed");
    return kExitFailed;
  }
  const bool same = r.made.fingerprint == target.info.fingerprint;
  if (o.format == OutputFormat::kTable) {
    Print("rolled back to version " + std::to_string(o.version) + " as version " +
          std::to_string(r.made.version) + ": " + std::to_string(r.added) +
          " documents back in the model, " + std::to_string(r.moved) + " moved back, " +
          std::to_string(r.removed) + " out of it (kept in the ledger); by " + o.by + "\n");
    Print(same ? "fingerprint " + r.made.fingerprint.substr(0, 12) + ", the same as version " +
                     std::to_string(o.version) + "'s\n"
               : "fingerprint " + r.made.fingerprint.substr(0, 12) + ", not version " +
                     std::to_string(o.version) +
                     "'s: documents it counted were forgotten since, and stay forgotten\n");
    return kExitDone;
  }
  if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"version", "rolled_back_to", "added", "moved", "removed", "fingerprint",
                         "same_as_target"}) +
          CsvRecordLine({std::to_string(r.made.version), std::to_string(o.version),
                         std::to_string(r.added), std::to_string(r.moved),
                         std::to_string(r.removed), r.made.fingerprint, same ? "true" : "false"}));
    return kExitDone;
  }
  JsonWriter w;
  w.BeginObject()
      .Key("version").Int(r.made.version)
      .Key("rolled_back_to").Int(o.version)
      .Key("added").Int(r.added)
      .Key("moved").Int(r.moved)
      .Key("removed").Int(r.removed)
      .Key("fingerprint").String(r.made.fingerprint)
      .Key("same_as_target").Bool(same)
      .EndObject();
  Print(w.Take() + "\n");
  return kExitDone;
}

}  // namespace

CommandRun SetupRollback(CLI::App* cmd) {
  auto o = std::make_shared<RollbackOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("version", o->version, "the version whose model comes back (see 'chute versions')")
      ->required()
      ->check(CLI::PositiveNumber);
  AddByOption(cmd, &o->by);
  AddFormatOption(cmd, &o->format);
  cmd->footer(R"(Every document then routes exactly as it did at that version: documents
learned since leave the model (they stay in the ledger and come back with a
later rollback or when learned again), moved documents move back, and queue
names, hand-set priors and the smoothing are the version's. The rollback is
itself a new version, so it can be undone the same way. Documents forgotten
since stay forgotten.

Examples:
  chute versions
  chute rollback 41 --by night-shift)");
  return [o] { return RunRollback(*o); };
}

}  // namespace chute
