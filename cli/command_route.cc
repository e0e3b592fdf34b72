// chute route: the queue of each document, with its posterior.
#include <CLI/CLI.hpp>

#include "classify/model.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/progress.h"
#include "cli/format/table_writer.h"
#include "cli/parallel.h"
#include "cli/read/document_reader.h"
#include "cli/read/input_walker.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

struct RouteOptions {
  std::string db;
  std::vector<std::string> inputs;
  OutputFormat format = OutputFormat::kTable;
  int top = 3;
  int64_t max_bytes = kDefaultMaxBytes;
  size_t threads = 1;
  int64_t at_version = 0;
};

std::string JsonLine(const std::string& file, const Model& model, const VersionInfo& version,
                     const Decision& d, int top) {
  JsonWriter w;
  const QueuePosterior& best = d.ranked.front();
  w.BeginObject();
  w.Key("file").String(file);
  w.Key("queue").String(model.queues()[best.queue].name);
  w.Key("confidence").Number(best.posterior);
  w.Key("no_terms").Bool(d.no_terms());
  w.Key("top").BeginArray();
  for (size_t i = 0; i < d.ranked.size() && i < static_cast<size_t>(top); ++i) {
    const QueuePosterior& p = d.ranked[i];
    w.BeginObject()
        .Key("queue").String(model.queues()[p.queue].name)
        .Key("posterior").Number(p.posterior)
        .Key("log_posterior").Number(p.log_posterior)
        .EndObject();
  }
  w.EndArray();
  w.Key("model_version").Int(version.version);
  w.Key("fingerprint").String(version.fingerprint);
  w.EndObject();
  return w.Take() + "\n";
}

int RunRoute(const RouteOptions& o) {
  if (o.inputs.empty()) {
    Report("route", "nothing to route: name files, folders, or - for standard input");
    return kExitUsage;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("route", o.db, &store)) return kExitFailed;
  LoadedModel loaded;
  if (!LoadModelOrReport("route", store.get(), o.at_version, &loaded)) return kExitFailed;
  const Model& model = *loaded.model;
  const VersionInfo& version = loaded.version;
  const std::string model_version = std::to_string(version.version);

  std::vector<InputFile> files;
  std::vector<WalkProblem> problems;
  WalkInputs(o.inputs, &files, &problems);
  int64_t refused = 0, routed = 0;
  for (const WalkProblem& p : problems) {
    Report("route", p.path + ": " + p.reason);
    ++refused;
  }

  // Workers read, tokenize and score a window of documents at a time (the
  // model is shared read-only); this thread prints in input order.
  std::vector<std::unique_ptr<Tokenizer>> tokenizers;
  for (size_t w = 0; w < o.threads; ++w) {
    tokenizers.push_back(std::make_unique<Tokenizer>(loaded.settings.tokenizer));
  }
  struct Slot {
    Status status;
    Document doc;
    std::vector<std::string> terms;
    DocumentRows rows;
    Decision decision;
  };
  std::vector<Slot> window(kParallelWindow);
  const ReadOptions read_options{o.max_bytes};
  TableWriter table({{"file"},
                     {"queue"},
                     {"confidence", TableWriter::Align::kRight},
                     {"runner-up"},
                     {"its posterior", TableWriter::Align::kRight},
                     {"note"}});
  if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"file", "queue", "confidence", "runner_up", "runner_up_posterior",
                         "model_version", "fingerprint"}));
  }
  Progress progress("route", files.size());
  for (size_t start = 0; start < files.size(); start += kParallelWindow) {
    const size_t count = std::min(kParallelWindow, files.size() - start);
    ParallelFor(count, o.threads, [&](size_t i, size_t worker) {
      Slot& slot = window[i];
      slot.status = ReadDocument(files[start + i].path, read_options, &slot.doc);
      if (!slot.status.ok()) return;
      tokenizers[worker]->Tokenize(slot.doc.text, &slot.terms);
      int64_t unknown = 0;
      model.ToRows(slot.terms, &slot.rows, &unknown);
      slot.decision = model.Decide(slot.rows, unknown);
    });
    std::string out;
    for (size_t i = 0; i < count; ++i) {
      progress.Tick();
      const InputFile& f = files[start + i];
      const Slot& slot = window[i];
      if (!slot.status.ok()) {
        Report("route", slot.status.message());
        ++refused;
        continue;
      }
      if (slot.doc.replaced > 0) {
        Report("route", f.path + ": " + std::to_string(slot.doc.replaced) +
                            " invalid UTF-8 sequences replaced by U+FFFD");
      }
      const Decision& d = slot.decision;
      ++routed;
      const QueuePosterior& best = d.ranked.front();
      const QueuePosterior* second = d.ranked.size() > 1 ? &d.ranked[1] : nullptr;
      const std::string& queue = model.queues()[best.queue].name;
      switch (o.format) {
        case OutputFormat::kJsonl:
          out += JsonLine(f.path, model, version, d, o.top);
          break;
        case OutputFormat::kCsv:
          out += CsvRecordLine({f.path, queue, FormatShortest(best.posterior),
                                second ? model.queues()[second->queue].name : "",
                                second ? FormatShortest(second->posterior) : "",
                                model_version, version.fingerprint});
          break;
        case OutputFormat::kTable:
          table.AddRow({f.path, queue, FormatFixed(best.posterior, 3),
                        second ? model.queues()[second->queue].name : "",
                        second ? FormatFixed(second->posterior, 3) : "",
                        d.no_terms() ? "no known terms: prior only" : ""});
          break;
      }
    }
    Print(out);
  }
  if (o.format == OutputFormat::kTable) {
    Print(table.Render());
    Print("model version " + model_version + " (fingerprint " + version.fingerprint.substr(0, 12) +
          ")\n");
  }
  return BatchExit(routed, refused);
}

}  // namespace

CommandRun SetupRoute(CLI::App* cmd) {
  auto o = std::make_shared<RouteOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("inputs", o->inputs, "files, folders (walked recursively), or - for standard input");
  AddFormatOption(cmd, &o->format);
  cmd->add_option("--top", o->top, "queues listed per document in jsonl (default 3)")
      ->check(CLI::PositiveNumber);
  AddMaxBytesOption(cmd, &o->max_bytes);
  AddThreadsOption(cmd, &o->threads);
  cmd->add_option("--at-version", o->at_version,
                  "V: route with the model of an earlier version (read-only; see 'chute versions')")
      ->check(CLI::PositiveNumber)
      ->type_name("V");
  cmd->footer(R"(Confidence is the posterior probability of the chosen queue. Naive Bayes
is often over-confident: have a person review documents below a threshold
you have measured (see README, "Cautions").

Examples:
  chute route corpora/port-authority/inbox/
  chute route letter.txt --format jsonl --top 3
  chute route letter.txt --at-version 41
  cat scan.txt | chute route - --format csv)");
  return [o] { return RunRoute(*o); };
}

}  // namespace chute
