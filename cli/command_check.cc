// chute check: SQLite's own integrity checks plus chute's invariants
// (store/check.h); prints what is wrong and exits 1, or says the store is
// consistent.
#include <CLI/CLI.hpp>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "store/check.h"

namespace chute {

namespace {

struct CheckOptions {
  std::string db;
  OutputFormat format = OutputFormat::kTable;
};

std::string Summary(const CheckReport& r) {
  return std::to_string(r.documents) + " documents, " +
         std::to_string(r.queues) + " queues, " + std::to_string(r.terms) +
         " terms";
}

int RunCheck(const CheckOptions& o) {
  CheckReport report;
  if (Status s = CheckStore(o.db, &report); !s.ok()) {
    Report("check", s.message());
    return kExitFailed;
  }
  const bool consistent = report.consistent();
  const std::string summary =
      consistent ? "store is consistent: " + Summary(report)
                 : "store is NOT consistent: " + Summary(report);
  if (o.format == OutputFormat::kJsonl) {
    JsonWriter w;
    for (const CheckLine& l : report.lines) {
      w.BeginObject().Key("check").String(l.check).Key("ok").Bool(l.ok);
      Print(w.Key("detail").String(l.detail).EndObject().Take() + "\n");
    }
    w.BeginObject().Key("check").String("summary").Key("ok").Bool(consistent);
    Print(w.Key("detail").String(summary).EndObject().Take() + "\n");
  } else if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"check", "ok", "detail"}));
    for (const CheckLine& l : report.lines) {
      Print(CsvRecordLine({l.check, l.ok ? "true" : "false", l.detail}));
    }
    Print(CsvRecordLine({"summary", consistent ? "true" : "false", summary}));
  } else {
    for (const CheckLine& l : report.lines) {
      if (!l.ok) Print(l.check + ": " + l.detail + "\n");
    }
    Print(summary + "\n");
  }
  return consistent ? kExitDone : kExitFailed;
}

}  // namespace

CommandRun SetupCheck(CLI::App* cmd) {
  auto o = std::make_shared<CheckOptions>();
  AddDbOption(cmd, &o->db);
  AddFormatOption(cmd, &o->format);
  cmd->footer(
      R"(Reads the whole store in one read transaction; it changes nothing, and
routing and learning may go on meanwhile.

Exit status: 0 consistent; 1 something is wrong (each finding printed) or
the store could not be checked; 2 usage error.

Examples:
  chute check --db harbour.db
  chute check --db harbour.db --format jsonl)");
  return [o] { return RunCheck(*o); };
}

}  // namespace chute
