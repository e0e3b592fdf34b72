// chute forget: unlearns documents exactly and erases what the store kept of
// them, in one transaction.
#include <CLI/CLI.hpp>
#include <map>
#include <set>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/table_writer.h"
#include "cli/read/document_name.h"

namespace chute {

namespace {

struct ForgetOptions {
  std::string db;
  std::vector<std::string> names;
  std::string by;
  OutputFormat format = OutputFormat::kTable;
};

// What became of one name on the command line.
struct Line {
  std::string document;  // as given
  std::string digest;
  std::string queue;
  std::string outcome;  // forgotten, duplicate, refused
  std::string reason;
};

std::string Candidates(const Resolution& r) {
  std::string list;
  for (size_t i = 0; i < r.candidates.size() && i < 5; ++i) {
    list += (i ? ", " : "") + ShortDigest(r.candidates[i]);
  }
  return list + (r.candidates.size() > 5 ? ", ..." : "");
}

void PrintLines(const std::vector<Line>& lines, OutputFormat format) {
  if (format == OutputFormat::kJsonl) {
    JsonWriter w;
    for (const Line& l : lines) {
      w.BeginObject().Key("document").String(l.document).Key("digest");
      w.StringOrNull(l.digest);
      w.Key("queue");
      w.StringOrNull(l.queue);
      w.Key("outcome").String(l.outcome).Key("reason");
      w.StringOrNull(l.reason);
      Print(w.EndObject().Take() + "\n");
    }
  } else {
    Print(CsvRecordLine({"document", "digest", "queue", "outcome", "reason"}));
    for (const Line& l : lines) {
      Print(
          CsvRecordLine({l.document, l.digest, l.queue, l.outcome, l.reason}));
    }
  }
}

void PrintSummary(const std::vector<Line>& lines, const ForgetResult& result,
                  const std::string& by, Store* store) {
  std::map<std::string, int64_t> per_queue;
  int64_t refused = 0;
  for (const Line& l : lines) {
    if (l.outcome == "forgotten") ++per_queue[l.queue];
    refused += l.outcome == "refused";
  }
  std::vector<QueueInfo> queues;
  store->ListQueues(&queues, Store::TermTally::kWithout);
  TableWriter table({{"queue"},
                     {"forgotten", TableWriter::Align::kRight},
                     {"documents left", TableWriter::Align::kRight}});
  for (const QueueInfo& q : queues) {
    auto it = per_queue.find(q.name);
    if (it != per_queue.end()) {
      table.AddRow(
          {q.name, std::to_string(it->second), std::to_string(q.documents)});
    }
  }
  if (!per_queue.empty()) Print(table.Render());
  Print("forgot " + std::to_string(result.forgotten.size()) + " documents (" +
        std::to_string(result.removed_terms) + " terms left the vocabulary); " +
        std::to_string(refused) + " not forgotten; by " + by + "\n");
  if (result.decisions > 0 || !result.log_only.empty()) {
    Print("erased " + std::to_string(result.decisions) + " decision log rows (" +
          std::to_string(result.log_only.size()) + " of documents routed but never learned)\n");
  }
}

int RunForget(const ForgetOptions& o) {
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("forget", o.db, &store)) return kExitFailed;

  std::vector<Line> lines;
  std::vector<std::string> digests;
  std::set<std::string> named;
  for (const std::string& arg : o.names) {
    NamedDocument nd;
    NameDocument(arg, "", ReadOptions{}, &nd);
    Resolution r;
    if (Status s = store->ResolveDocument(nd.name, &r); !s.ok()) {
      Report("forget", s.message() + "; nothing was forgotten");
      return kExitFailed;
    }
    Line line{arg, "", "", "refused", ""};
    if (r.kind == Resolution::Kind::kFound) {
      line.digest = r.entry.digest;
      line.queue = r.entry.queue;
      if (named.insert(r.entry.digest).second) {
        line.outcome = "forgotten";
        digests.push_back(r.entry.digest);
      } else {
        line.outcome = "duplicate";
        line.reason = "named more than once; forgotten once";
      }
    } else if (r.kind == Resolution::Kind::kAmbiguous) {
      line.reason = "matches several learned documents (" + Candidates(r) +
                    "); give more of the digest";
    } else {
      // Never learned, but perhaps routed into folders: the decision log
      // (and the unreadable files) keep its path and digest.
      std::vector<std::string> logged;
      if (Status s = store->FindLogged(nd.name, &logged); !s.ok()) {
        Report("forget", s.message() + "; nothing was forgotten");
        return kExitFailed;
      }
      if (logged.size() == 1) {
        line.digest = logged.front();
        if (named.insert(logged.front()).second) {
          line.outcome = "forgotten";
          line.reason = "never learned; erased from the decision log";
          digests.push_back(logged.front());
        } else {
          line.outcome = "duplicate";
          line.reason = "named more than once; forgotten once";
        }
      } else if (logged.size() > 1) {
        std::string some;
        for (const std::string& d : logged) some += (some.empty() ? "" : ", ") + d.substr(0, 12);
        line.reason = "matches several documents in the decision log (" + some +
                      "); give more of the digest";
      } else {
        line.reason = UnknownReason(arg, nd);
      }
    }
    if (line.outcome == "refused") Report("forget", arg + ": " + line.reason);
    lines.push_back(std::move(line));
  }

  ForgetResult result;
  if (!digests.empty()) {
    if (Status s =
            store->Forget(digests, ChangeInfo{NowRfc3339(), o.by}, &result);
        !s.ok()) {
      Report("forget", s.message() + "; nothing was forgotten");
      return kExitFailed;
    }
    if (!result.checkpointed) {
      Report(
          "forget",
          "other processes kept reading the store, so its write-ahead log (" +
              o.db +
              "-wal) could not be emptied; it still holds old pages until the "
              "next "
              "checkpoint (run 'chute forget' again, or close the readers)");
    }
  }
  if (o.format == OutputFormat::kTable) {
    PrintSummary(lines, result, o.by, store.get());
  } else {
    PrintLines(lines, o.format);
  }
  int64_t refused = 0;
  for (const Line& l : lines) refused += l.outcome == "refused";
  return BatchExit(static_cast<int64_t>(result.forgotten.size() + result.log_only.size()),
                   refused);
}

}  // namespace

CommandRun SetupForget(CLI::App* cmd) {
  auto o = std::make_shared<ForgetOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option(
         "documents", o->names,
         "paths of learned files, or digest prefixes (at least 8 hex digits)")
      ->required();
  AddByOption(cmd, &o->by);
  AddFormatOption(cmd, &o->format);
  cmd->footer(
      R"(A path names the digest of the file as it is now, or else the path the
store recorded when it learned it. A name that matches several documents is
reported, not guessed. Everything is forgotten in one transaction; the store's
deleted content is overwritten with zeros and its write-ahead log emptied.

Examples:
  chute forget inbox/letter-0412.txt
  chute forget 3f9a61c0b2 --by records-office
  chute forget 3f9a61c0b2 7d00e1a4 --format jsonl)");
  return [o] { return RunForget(*o); };
}

}  // namespace chute
