// chute learn: counts labelled documents into the store, in one transaction.
#include <CLI/CLI.hpp>

#include <map>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/progress.h"
#include "cli/format/table_writer.h"
#include "cli/parallel.h"
#include "cli/read/document_reader.h"
#include "cli/read/labelled_inputs.h"
#include "store/text_codec.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

struct LearnOptions {
  std::string db;
  std::string tree;
  std::string csv;
  std::string queue;
  bool queue_given = false;  // --queue "" must reach the name check
  std::vector<std::string> inputs;
  OutputFormat format = OutputFormat::kTable;
  int64_t max_bytes = kDefaultMaxBytes;
  size_t threads = 1;
  std::string by;
};

// What became of one document, for the output.
struct Line {
  std::string file;
  std::string queue;
  std::string digest;
  std::string outcome;  // learned, already_learned, corrected, refused
  std::string reason;
};

void PrintLines(const std::vector<Line>& lines, OutputFormat format) {
  if (format == OutputFormat::kJsonl) {
    JsonWriter w;
    for (const Line& l : lines) {
      w.BeginObject().Key("file").String(l.file).Key("queue").String(l.queue);
      w.Key("digest").StringOrNull(l.digest);
      w.Key("outcome").String(l.outcome).Key("reason").StringOrNull(l.reason);
      Print(w.EndObject().Take() + "\n");
    }
  } else if (format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"file", "queue", "digest", "outcome", "reason"}));
    for (const Line& l : lines) {
      Print(CsvRecordLine({l.file, l.queue, l.digest, l.outcome, l.reason}));
    }
  }
}

void PrintSummary(const std::vector<Line>& lines, const LearnResult& result, Store* store) {
  struct Counts {
    int64_t learned = 0, known = 0, corrected = 0;
  };
  std::map<std::string, Counts> per_queue;
  for (const Line& l : lines) {
    if (l.outcome == "learned") ++per_queue[l.queue].learned;
    if (l.outcome == "already_learned") ++per_queue[l.queue].known;
    if (l.outcome == "corrected") ++per_queue[l.queue].corrected;
  }
  std::vector<QueueInfo> queues;
  store->ListQueues(&queues, Store::TermTally::kWithout);
  TableWriter table({{"queue"},
                     {"learned now", TableWriter::Align::kRight},
                     {"corrected into", TableWriter::Align::kRight},
                     {"already known", TableWriter::Align::kRight},
                     {"documents in all", TableWriter::Align::kRight}});
  for (const QueueInfo& q : queues) {
    auto it = per_queue.find(q.name);
    if (it == per_queue.end()) continue;
    table.AddRow({q.name, std::to_string(it->second.learned),
                  std::to_string(it->second.corrected), std::to_string(it->second.known),
                  std::to_string(q.documents)});
  }
  int64_t known = 0, refused = 0;
  for (const Line& l : lines) {
    known += l.outcome == "already_learned";
    refused += l.outcome == "refused";
  }
  Print(table.Render());
  Print("learned " + std::to_string(result.learned) + " documents (" +
        std::to_string(result.new_terms) + " new terms); " + std::to_string(known) +
        " already known; " + std::to_string(result.corrected) +
        " corrected (moved from another queue); " + std::to_string(refused) + " refused\n");
}

int RunLearn(const LearnOptions& o) {
  const int modes = !o.tree.empty() + !o.csv.empty() + o.queue_given;
  if (modes != 1) {
    Report("learn", "name the labelled documents with exactly one of --tree, --csv or --queue");
    return kExitUsage;
  }
  if (o.queue_given && o.inputs.empty()) {
    Report("learn", "--queue needs files, folders or - for standard input");
    return kExitUsage;
  }
  if (!o.queue_given && !o.inputs.empty()) {
    Report("learn", "files on the command line need --queue");
    return kExitUsage;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("learn", o.db, &store)) return kExitFailed;

  std::vector<LabelledFile> files;
  std::vector<WalkProblem> problems;
  Status s = !o.tree.empty() ? CollectTree(o.tree, &files, &problems)
             : !o.csv.empty() ? CollectManifest(o.csv, &files, &problems)
                              : CollectQueue(o.queue, o.inputs, &files, &problems);
  if (!s.ok()) {
    Report("learn", s.message());
    return kExitFailed;
  }
  std::vector<Line> lines;
  for (const WalkProblem& p : problems) {
    Report("learn", p.path + ": " + p.reason);
    lines.push_back({p.path, "", "", "refused", p.reason});
  }

  // Workers read and tokenize a window of documents while this thread takes
  // the previous window's results, in input order.
  // When the store keeps text, the workers also pack it, so that the store's
  // transaction only binds a blob.
  const bool keep_text = store->settings().keep_text;
  std::vector<std::unique_ptr<Tokenizer>> tokenizers;
  std::vector<std::unique_ptr<TextCodec>> codecs;
  for (size_t w = 0; w < o.threads; ++w) {
    tokenizers.push_back(std::make_unique<Tokenizer>(store->settings().tokenizer));
    codecs.push_back(std::make_unique<TextCodec>());
  }
  struct Slot {
    Status status;
    Document doc;
    std::vector<std::string> terms;
    std::string packed_text;  // empty unless kept
  };
  std::vector<Slot> windows[2] = {std::vector<Slot>(kParallelWindow),
                                  std::vector<Slot>(kParallelWindow)};
  const ReadOptions read_options{o.max_bytes};
  LearnBatch batch;
  std::vector<size_t> line_of_batch_doc;
  Progress progress("learn", files.size());
  bool failed = false;
  auto fill = [&](size_t start, size_t count, int buffer) {
    ParallelFor(count, o.threads, [&, start, buffer](size_t i, size_t worker) {
      Slot& slot = windows[buffer][i];
      slot.terms.clear();
      slot.packed_text.clear();
      slot.status = ReadDocument(files[start + i].path, read_options, &slot.doc);
      if (slot.status.ok()) tokenizers[worker]->Tokenize(slot.doc.text, &slot.terms);
      if (slot.status.ok() && keep_text && !slot.terms.empty()) {
        Status packed = codecs[worker]->Pack(slot.doc.text, &slot.packed_text);
        if (!packed.ok()) {
          slot.status = Status::IoError(files[start + i].path + ": " + packed.message());
        }
      }
    });
  };
  auto consume = [&](size_t start, size_t count, int buffer) -> bool {
    for (size_t i = 0; i < count; ++i) {
      progress.Tick();
      const LabelledFile& f = files[start + i];
      Slot& slot = windows[buffer][i];
      const Document& doc = slot.doc;
      const std::string where = f.context.empty() ? f.path : f.context + ": " + f.path;
      if (!slot.status.ok()) {
        const Status& r = slot.status;
        Report("learn", f.context.empty() ? r.message() : f.context + ": " + r.message());
        lines.push_back({f.path, f.queue, "", "refused", ReasonOf(r, f.path)});
        continue;
      }
      if (doc.replaced > 0) {
        Report("learn", where + ": " + std::to_string(doc.replaced) +
                            " invalid UTF-8 sequences replaced by U+FFFD");
      }
      std::optional<LedgerEntry> known;
      if (Status k = store->FindDocument(doc.digest, &known); !k.ok()) {
        Report("learn", k.message());
        failed = true;
        return false;
      }
      if (known && known->queue == f.queue) {
        lines.push_back({f.path, f.queue, doc.digest, "already_learned", ""});
        continue;
      }
      // A known document under another queue is a correction: the store
      // moves its stored counts (the outcome is set from its answer below).
      if (slot.terms.empty()) {
        std::string reason = "no terms to learn (empty, or nothing but spaces and punctuation)";
        Report("learn", where + ": " + reason);
        lines.push_back({f.path, f.queue, doc.digest, "refused", reason});
        continue;
      }
      batch.Add(doc.digest, f.queue, SourcePath(f.path), slot.terms,
                std::move(slot.packed_text));
      line_of_batch_doc.push_back(lines.size());
      lines.push_back({f.path, f.queue, doc.digest, "learned", ""});
    }
    return true;
  };
  PipelineWindows(files.size(), fill, consume);
  if (failed) return kExitFailed;

  LearnResult result;
  if (!batch.empty()) {
    s = store->Learn(batch, ChangeInfo{NowRfc3339(), o.by}, &result);
    if (!s.ok()) {
      Report("learn", s.message() + "; nothing was learned");
      return kExitFailed;
    }
    for (size_t i = 0; i < result.outcomes.size(); ++i) {
      Line& l = lines[line_of_batch_doc[i]];
      if (result.outcomes[i] == LearnOutcome::kAlreadyLearned) {
        l.outcome = "already_learned";
      } else if (result.outcomes[i] == LearnOutcome::kCorrected) {
        l.outcome = "corrected";
        l.reason = "was learned under queue '" + result.known_queue[i] + "'; moved";
      }
    }
  }
  int64_t already = 0;
  for (const Line& l : lines) already += l.outcome == "already_learned";
  if (already > 0) {
    Report("learn", std::to_string(already) +
                        " documents were already learned under the same queue; nothing "
                        "changed for them");
  }
  if (o.format == OutputFormat::kTable) {
    PrintSummary(lines, result, store.get());
  } else {
    PrintLines(lines, o.format);
  }
  int64_t refused = 0, accepted = 0;
  for (const Line& l : lines) (l.outcome == "refused" ? refused : accepted) += 1;
  return BatchExit(accepted, refused);
}

}  // namespace

CommandRun SetupLearn(CLI::App* cmd) {
  auto o = std::make_shared<LearnOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("--tree", o->tree, "a folder ROOT/<queue>/...: every file below a queue's folder");
  cmd->add_option("--csv", o->csv,
                  "a CSV file with the header path,queue (relative paths are relative to the CSV)");
  cmd->add_option("--queue", o->queue, "learn the files named after it for this queue")
      ->each([o](const std::string&) { o->queue_given = true; });
  cmd->add_option("files", o->inputs, "with --queue: files, folders, or - for standard input");
  AddFormatOption(cmd, &o->format);
  AddMaxBytesOption(cmd, &o->max_bytes);
  AddThreadsOption(cmd, &o->threads);
  AddByOption(cmd, &o->by);
  cmd->footer(R"(Everything is learned in one transaction: all of it, or nothing.
A document already learned under the same queue changes nothing; one learned
under another queue is a correction: its counts move to the new queue.

Examples:
  chute learn --tree corpora/port-authority/labelled/
  chute learn --csv manifest.csv
  chute learn --queue marina letter-0412.txt scans/
  chute learn --tree labelled/ --format jsonl > learned.jsonl)");
  return [o] { return RunLearn(*o); };
}

}  // namespace chute
