// chute log: the decisions `route --into` and `watch` delivered, oldest
// first, with the fields they printed (cli/format/decision_lines.h).
#include <CLI/CLI.hpp>

#include <ctime>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/decision_lines.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"
#include "cli/older_than.h"

namespace chute {

namespace {

struct LogOptions {
  std::string db;
  OutputFormat format = OutputFormat::kTable;
  std::string since;
  std::string queue;
};

int RunLog(const LogOptions& o) {
  DecisionQuery query;
  query.queue = o.queue;
  query.delivered_only = true;
  if (!o.since.empty()) {
    std::string why;
    if (!ParseOlderThan(o.since, std::time(nullptr), &query.since, &why)) {
      Report("log", "--since: " + why);
      return kExitUsage;
    }
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("log", o.db, &store)) return kExitFailed;

  TableWriter table({{"time"},
                     {"queue"},
                     {"confidence", TableWriter::Align::kRight},
                     {"held"},
                     {"source"},
                     {"destination"},
                     {"by"}});
  std::string out;
  int64_t rows = 0;
  if (o.format == OutputFormat::kCsv) out += DecisionCsvHeader();
  Status s = store->ReadDecisions(query, [&](const DecisionRecord& r) {
    ++rows;
    switch (o.format) {
      case OutputFormat::kJsonl:
        out += DecisionJsonLine(r);
        break;
      case OutputFormat::kCsv:
        out += DecisionCsvLine(r);
        break;
      case OutputFormat::kTable:
        table.AddRow({r.time, r.queue, FormatFixed(r.confidence, 3), std::string(HeldName(r.held)),
                      r.source, r.destination, r.by});
        break;
    }
    // Long logs are printed as they are read, not held whole in memory.
    if (out.size() > (1 << 20)) {
      Print(out);
      out.clear();
    }
    return Status::Ok();
  });
  if (!s.ok()) {
    Print(out);
    Report("log", s.message());
    return kExitFailed;
  }
  Print(out);
  if (o.format == OutputFormat::kTable) {
    Print(table.Render());
    Print(std::to_string(rows) + " decisions" + (o.since.empty() ? "" : " since " + query.since) +
          (o.queue.empty() ? "" : " for queue " + o.queue) + "\n");
  }
  return kExitDone;
}

}  // namespace

CommandRun SetupLog(CLI::App* cmd) {
  auto o = std::make_shared<LogOptions>();
  AddDbOption(cmd, &o->db);
  AddFormatOption(cmd, &o->format);
  cmd->add_option("--since", o->since,
                  "only decisions made since: 30m, 24h, 7d (minutes, hours, days before now) or "
                  "an RFC 3339 time such as 2026-11-30T00:00:00Z")
      ->type_name("AGE|TIME");
  cmd->add_option("--queue", o->queue,
                  "only decisions for this queue (held ones by their best guess)")
      ->type_name("Q");
  cmd->footer(R"(Each line is one document 'route --into' or 'watch' delivered: digest,
source, destination, queue, confidence, runner_up, runner_up_posterior,
held (why it went to the review folder: threshold, no_terms,
min_documents, audit; empty when it went to its queue), model_version,
time, by. Oldest first.

Examples:
  chute log --since 24h
  chute log --since 2026-11-30T00:00:00Z --queue billing --format csv
  chute log --format jsonl)");
  return [o] { return RunLog(*o); };
}

}  // namespace chute
