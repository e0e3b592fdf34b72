// chute correct: moves learned documents to the queues a reviewer says they
// belong in (and learns the new ones), from a CSV file, in one transaction.
#include <CLI/CLI.hpp>
#include <algorithm>
#include <map>
#include <set>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/correct_from_folders.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/table_writer.h"
#include "cli/parallel.h"
#include "cli/read/csv_records.h"
#include "cli/read/document_name.h"
#include "store/queue_name.h"
#include "store/text_codec.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

struct CorrectOptions {
  std::string db;
  std::string csv;
  std::string by;
  bool create_queues = false;
  bool candidate = false;
  OutputFormat format = OutputFormat::kTable;
  int64_t max_bytes = kDefaultMaxBytes;
  size_t threads = 1;  // reading and naming the files
  // --from-folders DEST (correct_from_folders.h) instead of a file.
  std::string from_folders;
  std::string confirm_after;
  bool dry_run = false;
};

// What became of one line of the file.
struct Line {
  int64_t line = 0;
  std::string document;  // as written in the file
  std::string digest;
  std::string from;
  std::string to;
  std::string outcome;  // corrected, unchanged, learned, refused
  std::string reason;
};

void PrintLines(const std::vector<Line>& lines, OutputFormat format) {
  if (format == OutputFormat::kJsonl) {
    JsonWriter w;
    for (const Line& l : lines) {
      w.BeginObject().Key("document").String(l.document);
      for (const auto& [key, value] :
           {std::pair<const char*, const std::string*>{"digest", &l.digest},
            {"from", &l.from},
            {"to", &l.to}}) {
        w.Key(key);
        w.StringOrNull(*value);
      }
      w.Key("outcome").String(l.outcome).Key("reason");
      w.StringOrNull(l.reason);
      Print(w.EndObject().Take() + "\n");
    }
  } else {
    Print(CsvRecordLine(
        {"document", "digest", "from", "to", "outcome", "reason"}));
    for (const Line& l : lines) {
      Print(CsvRecordLine(
          {l.document, l.digest, l.from, l.to, l.outcome, l.reason}));
    }
  }
}

void PrintSummary(const std::vector<Line>& lines, const std::string& by,
                  Store* store) {
  struct Tally {
    int64_t into = 0, out_of = 0, learned = 0;
  };
  std::map<std::string, Tally> per_queue;
  std::map<std::string, int64_t> outcomes;
  for (const Line& l : lines) {
    ++outcomes[l.outcome];
    if (l.outcome == "corrected") {
      ++per_queue[l.to].into;
      ++per_queue[l.from].out_of;
    } else if (l.outcome == "learned") {
      ++per_queue[l.to].learned;
    }
  }
  std::vector<QueueInfo> queues;
  store->ListQueues(&queues, Store::TermTally::kWithout);
  TableWriter table({{"queue"},
                     {"corrected into", TableWriter::Align::kRight},
                     {"corrected out of", TableWriter::Align::kRight},
                     {"learned", TableWriter::Align::kRight},
                     {"documents in all", TableWriter::Align::kRight}});
  for (const QueueInfo& q : queues) {
    auto it = per_queue.find(q.name);
    if (it == per_queue.end()) continue;
    table.AddRow({q.name, std::to_string(it->second.into),
                  std::to_string(it->second.out_of),
                  std::to_string(it->second.learned),
                  std::to_string(q.documents)});
  }
  if (!per_queue.empty()) Print(table.Render());
  Print("corrected " + std::to_string(outcomes["corrected"]) +
        " documents; learned " + std::to_string(outcomes["learned"]) +
        " new; " + std::to_string(outcomes["unchanged"]) +
        " already in their queue; " + std::to_string(outcomes["refused"]) +
        " lines refused; by " + by + "\n");
}

int RunCorrect(const CorrectOptions& o) {
  std::vector<CsvRecord> records;
  if (Status s = ReadCsvRecords(o.csv, &records); !s.ok()) {
    Report("correct", s.message() + "; nothing was changed");
    return kExitFailed;
  }
  if (records.empty()) {
    Report(
        "correct",
        o.csv + ": empty; expected a header 'document,queue' or 'path,queue'");
    return kExitFailed;
  }
  int doc_col = -1, queue_col = -1;
  const auto& header = records[0].fields;
  for (size_t i = 0; i < header.size(); ++i) {
    if (header[i] == "document" || header[i] == "path")
      doc_col = static_cast<int>(i);
    if (header[i] == "queue") queue_col = static_cast<int>(i);
  }
  if (doc_col < 0 || queue_col < 0) {
    Report("correct", o.csv + ": line " + std::to_string(records[0].line) +
                          ": the header has no " +
                          (doc_col < 0 ? "'document' (or 'path')" : "'queue'") +
                          " column; nothing was changed");
    return kExitFailed;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("correct", o.db, &store)) return kExitFailed;
  std::set<std::string> queues;
  {
    std::vector<QueueInfo> list;
    if (Status s = store->ListQueues(&list, Store::TermTally::kWithout); !s.ok()) {
      Report("correct", s.message());
      return kExitFailed;
    }
    for (const QueueInfo& q : list) queues.insert(q.name);
  }
  std::string folder;
  if (size_t slash = o.csv.rfind('/'); slash != std::string::npos) {
    folder = o.csv.substr(0, slash);
  }

  Tokenizer tokenizer(store->settings().tokenizer);
  TextCodec codec;  // packs the text of documents learned here, when kept
  std::vector<Line> lines;
  std::vector<CorrectMove> moves;
  std::vector<size_t> line_of_move;
  LearnBatch batch;
  std::vector<size_t> line_of_batch_doc;
  std::vector<std::string> terms;
  // In windows of lines: first each line's fields are checked, in order;
  // then the files are read and their digests taken on every core (most of
  // the time of naming); then, in order again, each name is looked up and
  // the line decided. Reports come out in line order.
  constexpr size_t kNamingWindow = 256;
  struct Pending {
    Line line;
    std::string problem;  // a refusal found by the first look, or empty
    NamedDocument named;
  };
  std::vector<Pending> window;
  for (size_t first = 1; first < records.size(); first += kNamingWindow) {
    const size_t last = std::min(records.size(), first + kNamingWindow);
    window.assign(last - first, Pending());
    for (size_t r = first; r < last; ++r) {
      const CsvRecord& rec = records[r];
      auto field = [&](int col) {
        return static_cast<size_t>(col) < rec.fields.size() ? rec.fields[col] : std::string();
      };
      Pending& p = window[r - first];
      p.line = Line{rec.line, field(doc_col), "", "", field(queue_col), "refused", ""};
      if (p.line.document.empty()) {
        p.problem = "no document";
      } else if (p.line.to.empty()) {
        p.problem = "no queue";
      } else if (!queues.count(p.line.to)) {
        if (!o.create_queues) {
          p.problem = "queue '" + p.line.to + "' does not exist (add --create-queues to create it)";
        } else if (Status v = ValidateQueueName(p.line.to); !v.ok()) {
          p.problem = v.message();
        } else {
          queues.insert(p.line.to);
        }
      }
    }
    ParallelFor(window.size(), o.threads, [&](size_t i, size_t) {
      Pending& p = window[i];
      if (p.problem.empty())
        NameDocument(p.line.document, folder, ReadOptions{o.max_bytes}, &p.named);
    });
    for (Pending& p : window) {
      Line& line = p.line;
      auto refuse = [&](std::string reason) {
        line.reason = std::move(reason);
        Report("correct", o.csv + ": line " + std::to_string(line.line) + ": " +
                              (line.document.empty() ? "" : line.document + ": ") + line.reason);
        lines.push_back(line);
      };
      if (!p.problem.empty()) {
        refuse(p.problem);
        continue;
      }
      NamedDocument& nd = p.named;
      Resolution res;
      if (Status s = store->ResolveDocument(nd.name, &res); !s.ok()) {
        Report("correct", s.message() + "; nothing was changed");
        return kExitFailed;
      }
      if (res.kind == Resolution::Kind::kFound) {
        line.digest = res.entry.digest;
        line.outcome = "corrected";  // or unchanged, once the store has said
        line_of_move.push_back(lines.size());
        moves.push_back({res.entry.digest, line.to});
        lines.push_back(line);
      } else if (res.kind == Resolution::Kind::kAmbiguous) {
        std::string list;
        for (size_t i = 0; i < res.candidates.size() && i < 5; ++i) {
          list += (i ? ", " : "") + ShortDigest(res.candidates[i]);
        }
        refuse("matches several learned documents (" + list +
               (res.candidates.size() > 5 ? ", ..." : "") + "); give more of the digest");
      } else if (nd.is_file && !nd.read_status.ok()) {
        refuse(ReasonOf(nd.read_status, nd.path));
      } else if (nd.is_file) {
        terms.clear();
        tokenizer.Tokenize(nd.document.text, &terms);
        if (terms.empty()) {
          refuse("not learned, and no terms to learn");
          continue;
        }
        std::string packed_text;
        if (store->settings().keep_text) {
          if (Status pk = codec.Pack(nd.document.text, &packed_text); !pk.ok()) {
            refuse(pk.message());
            continue;
          }
        }
        line.digest = nd.document.digest;
        line.outcome = "learned";
        line.reason = "was not learned before";
        batch.Add(nd.document.digest, line.to, SourcePath(nd.path), terms,
                  std::move(packed_text));
        line_of_batch_doc.push_back(lines.size());
        lines.push_back(line);
      } else {
        refuse(UnknownReason(line.document, nd));
      }
    }
  }

  CorrectResult result;
  if (!moves.empty() || !batch.empty()) {
    bool replaced = false;
    Status s = o.candidate ? store->CorrectCandidate(moves, batch, ChangeInfo{NowRfc3339(), o.by},
                                                     &result, &replaced)
                           : store->Correct(moves, batch, ChangeInfo{NowRfc3339(), o.by}, &result);
    if (s.ok() && o.candidate) {
      Report("correct", std::string(replaced ? "the earlier candidate was replaced; " : "") +
                            "the corrections went into a candidate, the current model did not "
                            "change; 'chute promote' compares them");
    }
    if (!s.ok()) {
      Report("correct", s.message() + "; nothing was changed");
      return kExitFailed;
    }
    for (size_t i = 0; i < moves.size(); ++i) {
      Line& l = lines[line_of_move[i]];
      l.from = result.from[i];
      if (l.from == l.to) {
        l.outcome = "unchanged";
        l.reason = "already in queue '" + l.to + "'";
      } else {
        l.reason = "moved from queue '" + l.from + "'";
      }
    }
    const LearnResult& learned = result.learned;
    for (size_t i = 0; i < learned.outcomes.size(); ++i) {
      Line& l = lines[line_of_batch_doc[i]];
      if (learned.outcomes[i] == LearnOutcome::kAlreadyLearned) {
        l.outcome = "unchanged";
        l.from = learned.known_queue[i];
        l.reason = "already in queue '" + l.to + "'";
      } else if (learned.outcomes[i] == LearnOutcome::kCorrected) {
        l.outcome = "corrected";
        l.from = learned.known_queue[i];
        l.reason = "moved from queue '" + l.from + "'";
      }
    }
  }
  if (o.format == OutputFormat::kTable) {
    PrintSummary(lines, o.by, store.get());
  } else {
    PrintLines(lines, o.format);
  }
  int64_t refused = 0, handled = 0;
  for (const Line& l : lines) (l.outcome == "refused" ? refused : handled) += 1;
  return BatchExit(handled, refused);
}

}  // namespace

CommandRun SetupCorrect(CLI::App* cmd) {
  auto o = std::make_shared<CorrectOptions>();
  AddDbOption(cmd, &o->db);
  auto* file = cmd->add_option("file", o->csv,
                               "a CSV file with the header document,queue (or path,queue)");
  auto* folders = cmd->add_option("--from-folders", o->from_folders,
                                  "learn what reviewers did in the folders 'route --into DEST' "
                                  "filled: documents moved into another queue's folder or out "
                                  "of _review")
                      ->type_name("DEST");
  file->excludes(folders);
  AddByOption(cmd, &o->by);
  cmd->add_flag("--create-queues", o->create_queues,
                "create queues the file (or a folder of DEST) names that do not exist yet");
  auto* candidate = cmd->add_flag(
      "--candidate", o->candidate,
      "put the corrections into a candidate for 'chute promote' instead of the current model");
  candidate->excludes(folders);
  cmd->add_option("--confirm-after", o->confirm_after,
                  "with --from-folders: learn documents left where chute put them as confirmed "
                  "once decided this long ago (30m, 24h, 7d) or before this RFC 3339 time; "
                  "documents held for review (audit too) are never confirmed this way")
      ->type_name("AGE")
      ->needs(folders);
  cmd->add_flag("--dry-run", o->dry_run,
                "with --from-folders: show the summary of what would be learned, learn nothing")
      ->needs(folders);
  AddFormatOption(cmd, &o->format);
  AddMaxBytesOption(cmd, &o->max_bytes);
  AddThreadsOption(cmd, &o->threads);
  cmd->footer(
      R"(Each line names a document and the queue it belongs in. The document is a
path (relative paths are relative to the CSV file; the digest of the file as
it is now, or else the path the store recorded when it learned it) or a
digest prefix of at least 8 hex digits. A learned document's counts move
exactly to the new queue; an unknown document whose file exists is learned.
Bad lines are reported by line number; the rest is applied in one
transaction.

With --from-folders DEST, the decision log says where each document was
delivered; a document a reviewer moved into another queue's folder (found by
its path, by its name, or by its content when renamed) or out of _review
into a queue's folder is learned under that queue, once per move. The
summary counts, per queue, the documents corrected, confirmed and skipped.

Examples:
  chute correct fixes.csv
  chute correct fixes.csv --by j.moreau --create-queues
  chute correct fixes.csv --candidate && chute promote
  chute correct fixes.csv --format jsonl > applied.jsonl
  chute correct --from-folders routed/ --by nightly
  chute correct --from-folders routed/ --confirm-after 24h --dry-run)");
  return [o]() -> int {
    if (!o->from_folders.empty()) {
      CorrectFromFoldersOptions f;
      f.db = o->db;
      f.dest = o->from_folders;
      f.confirm_after = o->confirm_after;
      f.by = o->by;
      f.create_queues = o->create_queues;
      f.dry_run = o->dry_run;
      f.format = o->format;
      f.max_bytes = o->max_bytes;
      return RunCorrectFromFolders(f);
    }
    if (o->csv.empty()) {
      Report("correct", "name a CSV file of corrections, or --from-folders DEST");
      return kExitUsage;
    }
    return RunCorrect(*o);
  };
}

}  // namespace chute
