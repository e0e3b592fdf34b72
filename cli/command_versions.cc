// chute versions: the model's history, one line per committed change; and
// --prune-before, which drops the history before a version.
#include <CLI/CLI.hpp>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/table_writer.h"

namespace chute {

namespace {

struct VersionsOptions {
  std::string db;
  OutputFormat format = OutputFormat::kTable;
  int64_t prune_before = 0;
};

void PrintVersions(const std::vector<VersionInfo>& versions, OutputFormat format) {
  switch (format) {
    case OutputFormat::kJsonl: {
      std::string out;
      for (const VersionInfo& v : versions) {
        JsonWriter w;
        w.BeginObject()
            .Key("version").Int(v.version)
            .Key("time").String(v.time)
            .Key("command").String(v.command)
            .Key("by").String(v.by)
            .Key("added").Int(v.added)
            .Key("moved").Int(v.moved)
            .Key("removed").Int(v.removed)
            .Key("fingerprint").String(v.fingerprint);
        if (!v.details.empty()) w.Key("details").Raw(v.details);
        out += w.EndObject().Take() + "\n";
      }
      Print(out);
      return;
    }
    case OutputFormat::kCsv: {
      std::string out = CsvRecordLine(
          {"version", "time", "command", "by", "added", "moved", "removed", "fingerprint"});
      for (const VersionInfo& v : versions) {
        out += CsvRecordLine({std::to_string(v.version), v.time, v.command, v.by,
                              std::to_string(v.added), std::to_string(v.moved),
                              std::to_string(v.removed), v.fingerprint});
      }
      Print(out);
      return;
    }
    case OutputFormat::kTable: {
      TableWriter t({{"version", TableWriter::Align::kRight},
                     {"time"},
                     {"command"},
                     {"by"},
                     {"added", TableWriter::Align::kRight},
                     {"moved", TableWriter::Align::kRight},
                     {"removed", TableWriter::Align::kRight},
                     {"fingerprint"}});
      for (const VersionInfo& v : versions) {
        t.AddRow({std::to_string(v.version), v.time, v.command, v.by, std::to_string(v.added),
                  std::to_string(v.moved), std::to_string(v.removed),
                  v.fingerprint.substr(0, 12)});
      }
      Print(t.Render());
      if (!versions.empty()) {
        Print("current model: version " + std::to_string(versions.back().version) +
              "; rollback reaches back to version " + std::to_string(versions.front().version) +
              "\n");
      }
      return;
    }
  }
}

int RunVersions(const VersionsOptions& o) {
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("versions", o.db, &store)) return kExitFailed;
  if (o.prune_before > 0) {
    VersionInfo current;
    if (Status s = store->CurrentVersion(&current); !s.ok()) {
      Report("versions", s.message());
      return kExitFailed;
    }
    if (o.prune_before > current.version) {
      Report("versions", "--prune-before " + std::to_string(o.prune_before) +
                             ": the newest version is " + std::to_string(current.version));
      return kExitUsage;
    }
    int64_t dropped = 0;
    if (Status s = store->PruneVersions(o.prune_before, &dropped); !s.ok()) {
      Report("versions", s.message() + "; nothing was pruned");
      return kExitFailed;
    }
    if (o.format == OutputFormat::kTable) {
      Print("dropped " + std::to_string(dropped) + " versions; rollback now reaches back to version " +
            std::to_string(o.prune_before) + "\n");
      return kExitDone;
    }
  }
  std::vector<VersionInfo> versions;
  if (Status s = store->ListVersions(&versions); !s.ok()) {
    Report("versions", s.message());
    return kExitFailed;
  }
  PrintVersions(versions, o.format);
  return kExitDone;
}

}  // namespace

CommandRun SetupVersions(CLI::App* cmd) {
  auto o = std::make_shared<VersionsOptions>();
  AddDbOption(cmd, &o->db);
  AddFormatOption(cmd, &o->format);
  cmd->add_option("--prune-before", o->prune_before,
                  "V: drop the history before version V (rollback then reaches back to V)")
      ->check(CLI::PositiveNumber)
      ->type_name("V");
  cmd->footer(R"(Every committed change of the model (learn, correct, forget, rebuild,
promote, rollback, queue changes) is a version: who made it, when, how many
documents entered, moved and left the model, and the fingerprint of the model
after it (SHA-256 over the settings and the sorted counts).

Examples:
  chute versions
  chute versions --format jsonl
  chute versions --prune-before 120)");
  return [o] { return RunVersions(*o); };
}

}  // namespace chute
