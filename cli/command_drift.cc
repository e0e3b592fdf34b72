// chute drift: is the intake changing? Per day, figures of the decision log
// beside the model's and the period's (classify/drift.h).
#include <CLI/CLI.hpp>

#include "classify/drift.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/drift_report.h"
#include "cli/logged_decisions.h"

namespace chute {

namespace {

constexpr char kCommand[] = "drift";

struct DriftCommandOptions {
  std::string db;
  std::string since = "30d";
  DriftOptions drift;
  OutputFormat format = OutputFormat::kTable;
};

int RunDrift(const DriftCommandOptions& o) {
  std::unique_ptr<Store> store;
  std::string since;
  std::vector<LoggedDecision> decisions;
  if (int rc = LoadDecisionLog(kCommand, o.db, o.since, &store, &since, &decisions);
      rc != kExitDone) {
    return rc;
  }
  ModelCounts counts;
  if (Status s = store->LoadQueueCounts(&counts); !s.ok()) {
    Report(kCommand, s.message());
    return kExitFailed;
  }
  std::vector<std::pair<std::string, int64_t>> ledger;
  for (const QueueCounts& q : counts.queues) ledger.emplace_back(q.name, q.documents);
  const DriftReport r = ComputeDrift(decisions, ledger, o.drift);
  switch (o.format) {
    case OutputFormat::kTable:
      Print(DriftTable(r, since, o.drift));
      break;
    case OutputFormat::kJsonl:
      Print(DriftJsonl(r));
      break;
    case OutputFormat::kCsv:
      Print(DriftCsv(r));
      break;
  }
  return kExitDone;
}

}  // namespace

CommandRun SetupDrift(CLI::App* cmd) {
  auto o = std::make_shared<DriftCommandOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("--since", o->since,
                  "the period: decisions since this age (30m, 24h, 30d) or RFC 3339 time "
                  "(default 30d)")
      ->type_name("AGE");
  cmd->add_option("--change", o->drift.change,
                  "flag a day's figure that differs from its baseline by more than this "
                  "(a difference of shares or of confidences; default 0.1)")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("D");
  cmd->add_option("--min-decisions", o->drift.min_decisions,
                  "flag only days with at least this many decisions (default 20)")
      ->check(CLI::Range(int64_t{1}, int64_t{1} << 40))
      ->type_name("N");
  AddFormatOption(cmd, &o->format);
  cmd->footer(R"(Per day (UTC date of the decision time), from the decision log that
'route --into' and 'watch' write: the queue mix beside the mix of the
documents the model learned; the share held for review, the mean confidence
and the share of terms unknown to the model beside the same figures over the
whole period. A plain sentence names each figure that moved by more than
--change on a day with at least --min-decisions decisions.

Examples:
  chute drift
  chute drift --since 7d --change 0.05
  chute drift --since 2026-11-01T00:00:00Z --format csv > drift.csv)");
  return [o] { return RunDrift(*o); };
}

}  // namespace chute
