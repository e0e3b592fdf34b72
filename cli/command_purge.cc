// chute purge: erases the kept text and source paths of documents learned
// before a cutoff; their counts stay learned.
#include <CLI/CLI.hpp>
#include <ctime>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/table_writer.h"
#include "cli/older_than.h"

namespace chute {

namespace {

struct PurgeOptions {
  std::string db;
  std::string older_than;
  std::string by;
  bool dry_run = false;
  OutputFormat format = OutputFormat::kTable;
};

void PrintResult(const PurgeResult& r, const PurgeOptions& o,
                 const std::string& before) {
  if (o.format == OutputFormat::kJsonl) {
    JsonWriter w;
    w.BeginObject().Key("before").String(before).Key("dry_run").Bool(o.dry_run);
    w.Key("purged").Int(r.entries).Key("texts").Int(r.texts).Key("sources").Int(
        r.sources);
    w.Key("decisions").Int(r.decisions).Key("unreadable").Int(r.unreadable);
    w.Key("by").String(o.by).Key("queues").BeginArray();
    for (const PurgeResult::Queue& q : r.queues) {
      w.BeginObject().Key("queue").String(q.name).Key("purged").Int(q.entries);
      w.Key("texts").Int(q.texts).Key("sources").Int(q.sources).EndObject();
    }
    Print(w.EndArray().EndObject().Take() + "\n");
  } else if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine(
        {"before", "dry_run", "purged", "texts", "sources", "decisions", "unreadable", "by"}));
    Print(CsvRecordLine({before, o.dry_run ? "true" : "false", std::to_string(r.entries),
                         std::to_string(r.texts), std::to_string(r.sources),
                         std::to_string(r.decisions), std::to_string(r.unreadable), o.by}));
  } else {
    if (!r.queues.empty()) {
      TableWriter table(
          {{"queue"},
           {o.dry_run ? "would purge" : "purged", TableWriter::Align::kRight},
           {"texts", TableWriter::Align::kRight},
           {"source paths", TableWriter::Align::kRight}});
      for (const PurgeResult::Queue& q : r.queues) {
        table.AddRow({q.name, std::to_string(q.entries),
                      std::to_string(q.texts), std::to_string(q.sources)});
      }
      Print(table.Render());
    }
    Print(
        std::string(o.dry_run ? "would purge " : "purged ") +
        std::to_string(r.entries) + " documents learned before " + before +
        " (" + std::to_string(r.texts) + " texts and " +
        std::to_string(r.sources) + " source paths " +
        (o.dry_run ? "would be " : "") + "erased); their counts stay learned" +
        (o.dry_run ? "; dry run, nothing was changed" : "; by " + o.by) + "\n");
    if (r.decisions > 0 || r.unreadable > 0) {
      Print(std::string(o.dry_run ? "would delete " : "deleted ") + std::to_string(r.decisions) +
            " decision log rows and " + std::to_string(r.unreadable) +
            " unreadable-file rows from before " + before + "\n");
    }
  }
}

int RunPurge(const PurgeOptions& o) {
  std::string before, why;
  if (!ParseOlderThan(o.older_than, std::time(nullptr), &before, &why)) {
    Report("purge", "--older-than: " + why);
    return kExitUsage;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("purge", o.db, &store)) return kExitFailed;
  PurgeResult result;
  if (Status s = store->Purge(before, o.dry_run, &result); !s.ok()) {
    Report("purge", s.message() + "; nothing was purged");
    return kExitFailed;
  }
  if (!result.checkpointed) {
    Report("purge",
           "other processes kept reading the store, so its write-ahead log (" +
               o.db +
               "-wal) could not be emptied; it still holds old pages until the "
               "next "
               "checkpoint (run 'chute purge' again, or close the readers)");
  }
  PrintResult(result, o, before);
  return kExitDone;
}

}  // namespace

CommandRun SetupPurge(CLI::App* cmd) {
  auto o = std::make_shared<PurgeOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option(
         "--older-than", o->older_than,
         "purge documents learned before this: an age (400d, 12h, 30m: days, "
         "hours or "
         "minutes before now) or an RFC 3339 time (2025-01-31T00:00:00Z)")
      ->required()
      ->type_name("AGE|TIME");
  AddByOption(cmd, &o->by);
  cmd->add_flag("--dry-run", o->dry_run,
                "count what would be purged; change nothing");
  AddFormatOption(cmd, &o->format);
  cmd->footer(
      R"(For every document learned before the cutoff, the store's copy of its text and
the path it was learned from are erased; its digest, queue and counts stay, so
the model and its routing do not change (no new version). The erased content is
overwritten with zeros and the store's write-ahead log emptied, as for forget.
To take a document out of the model as well, use 'chute forget'.

Examples:
  chute purge --older-than 400d
  chute purge --older-than 400d --dry-run
  chute purge --older-than 2025-01-31T00:00:00Z --by records-office --format jsonl)");
  return [o] { return RunPurge(*o); };
}

}  // namespace chute
