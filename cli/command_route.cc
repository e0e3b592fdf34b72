// chute route: the queue of each document, with its posterior; with
// --into, also delivers each document into its queue's folder (or the
// review folder) and logs the decision (cli/deliver/folder_router.h).
#include <CLI/CLI.hpp>

#include <chrono>
#include <filesystem>

#include "classify/model.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/delivery_options.h"
#include "cli/deliver/folder_router.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/decision_lines.h"
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
  // Routing into folders (--into and the options that go with it).
  DeliveryChoices d;
  bool again = false, dry_run = false;
  // Options given on the command line, to tell a default from a choice.
  std::vector<std::pair<std::string, CLI::Option*>> into_only;
  CLI::Option* top_option = nullptr;
  CLI::Option* at_version_option = nullptr;
};

// The destination below DEST, for a person: "billing/0001.txt".
std::string BelowRoot(const std::string& path, const std::string& root) {
  if (!root.empty() && path.compare(0, root.size(), root) == 0 && path.size() > root.size() &&
      path[root.size()] == '/') {
    return path.substr(root.size() + 1);
  }
  return path;
}

int RunRouteInto(const RouteOptions& o) {
  if (std::string why = ModeProblem(o.d); !why.empty()) {
    const bool none = !o.d.move && !o.d.copy && !o.d.link;
    Report("route", (none ? "--into " : "") + why);
    return kExitUsage;
  }
  if (o.top_option->count() > 0 || o.at_version_option->count() > 0) {
    Report("route", std::string(o.top_option->count() > 0 ? "--top" : "--at-version") +
                        " is for route without --into (folders are routed with the current "
                        "model)");
    return kExitUsage;
  }
  if (o.inputs.empty()) {
    Report("route", "nothing to route: name the inbox folder or files");
    return kExitUsage;
  }
  for (const std::string& in : o.inputs) {
    if (in == "-") {
      Report("route", "standard input cannot be delivered into a folder: name files or folders");
      return kExitUsage;
    }
  }
  // DEST inside an input folder would have its documents routed again.
  for (const std::string& in : o.inputs) {
    std::error_code ec;
    if (std::filesystem::is_directory(in, ec) && LiesInside(o.d.into, in)) {
      Report("route", "--into " + o.d.into + " lies inside the input folder " + in +
                          ": its documents would be routed again; choose a DEST outside it");
      return kExitUsage;
    }
  }
  FolderRouteOptions fo;
  ToFolderRouteOptions(o.d, &fo);  // a seed from the clock unless one is given
  fo.again = o.again;
  fo.dry_run = o.dry_run;
  fo.threads = o.threads;
  fo.max_bytes = o.max_bytes;

  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("route", o.db, &store)) return kExitFailed;

  int64_t refused = 0;
  std::string root;  // DEST as the router resolved it, for the table
  TableWriter table({{"file"},
                     {"queue"},
                     {"confidence", TableWriter::Align::kRight},
                     {"runner-up"},
                     {"its posterior", TableWriter::Align::kRight},
                     {"held"},
                     {(o.dry_run ? "would go to (below " : "now at (below ") + o.d.into + ")"}});
  if (o.format == OutputFormat::kCsv) Print(DecisionCsvHeader());
  auto report = [&](const RoutedDocument& d) {
    using Outcome = RoutedDocument::Outcome;
    switch (d.outcome) {
      case Outcome::kDelivered:
      case Outcome::kWouldDeliver: {
        if (!d.reason.empty()) Report("route", d.path + ": " + d.reason);
        const DecisionRecord& r = d.record;
        if (o.format == OutputFormat::kJsonl) {
          Print(DecisionJsonLine(r));
        } else if (o.format == OutputFormat::kCsv) {
          Print(DecisionCsvLine(r));
        } else {
          table.AddRow({d.path, r.queue, FormatFixed(r.confidence, 3), r.runner_up,
                        r.runner_up_posterior ? FormatFixed(*r.runner_up_posterior, 3) : "",
                        std::string(HeldName(r.held)), BelowRoot(r.destination, root)});
        }
        break;
      }
      case Outcome::kSkipped:
        break;  // counted in the summary
      case Outcome::kUnreadable:
        Report("route", d.path + ": " + d.reason +
                            (d.record.destination.empty()
                                 ? ""
                                 : std::string(o.dry_run ? "; would be set aside at "
                                                         : "; set aside at ") +
                                       d.record.destination));
        ++refused;
        break;
      case Outcome::kFailed:
        Report("route", d.path + ": " + d.reason);
        ++refused;
        break;
    }
  };

  FolderRouteTally tally;
  std::unique_ptr<FolderRouter> router;
  Status s = FolderRouter::Open(store.get(), fo, &router, &tally, report);
  if (s.ok()) {
    root = router->root();  // tables show paths below it
    // The inputs are listed once the deliveries an interrupted run left
    // were finished (those files have left the inbox).
    std::vector<InputFile> files;
    std::vector<WalkProblem> problems;
    WalkInputs(o.inputs, &files, &problems);
    for (const WalkProblem& p : problems) {
      Report("route", p.path + ": " + p.reason);
      ++refused;
    }
    s = router->Route(files, report, &tally);
  }
  if (!s.ok()) {
    Report("route", s.message());
    return kExitFailed;
  }
  if (o.format == OutputFormat::kTable) Print(table.Render());
  const bool seeded_by_clock = !o.d.audit_seed && o.d.audit_share > 0;
  if (o.format == OutputFormat::kTable) {
    std::string line = std::string(o.dry_run ? "dry run, nothing moved or logged: would deliver "
                                             : "delivered ") +
                       std::to_string(tally.delivered) + " (held for review " +
                       std::to_string(tally.held) + ", audit " + std::to_string(tally.audit) +
                       "), skipped " + std::to_string(tally.skipped) + ", unreadable " +
                       std::to_string(tally.unreadable) + ", failed " +
                       std::to_string(tally.failed);
    if (tally.finished_pending > 0) {
      line += "; " + std::to_string(tally.finished_pending) +
              " deliveries of an interrupted run finished";
    }
    if (o.d.audit_share > 0) line += "; audit seed " + std::to_string(fo.audit_seed);
    line += "; model version " + std::to_string(router->model_version());
    Report("route", line);
  } else if (seeded_by_clock) {
    Report("route", "audit seed " + std::to_string(fo.audit_seed) +
                        " (from the clock; --audit-seed repeats the draw)");
  }
  return refused > 0 ? kExitSomeRefused : kExitDone;
}

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
  if (!o.d.into.empty()) return RunRouteInto(o);
  for (const auto& [name, option] : o.into_only) {
    if (option->count() > 0) {
      Report("route", name + " goes with --into DEST");
      return kExitUsage;
    }
  }
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
  o->top_option = cmd->add_option("--top", o->top, "queues listed per document in jsonl (default 3)")
                      ->check(CLI::PositiveNumber);
  AddMaxBytesOption(cmd, &o->max_bytes);
  AddThreadsOption(cmd, &o->threads);
  o->at_version_option =
      cmd->add_option("--at-version", o->at_version,
                      "V: route with the model of an earlier version (read-only; see 'chute "
                      "versions')")
          ->check(CLI::PositiveNumber)
          ->type_name("V");
  cmd->add_option("--into", o->d.into,
                  "DEST: deliver each document into DEST/<queue>/ (unsure ones into "
                  "DEST/_review/) and log the decision")
      ->type_name("DEST");
  o->into_only = AddDeliveryOptions(cmd, &o->d, "with --into: ");
  o->into_only.emplace_back("--again", cmd->add_flag("--again", o->again,
                                                     "with --copy/--link: deliver documents "
                                                     "delivered before too"));
  o->into_only.emplace_back("--dry-run",
                            cmd->add_flag("--dry-run", o->dry_run,
                                          "with --into: show the decisions; move and log nothing"));
  cmd->footer(R"(Confidence is the posterior probability of the chosen queue. Naive Bayes
is often over-confident: have a person review documents below a threshold
you have measured (see README, "Cautions").

Examples:
  chute route corpora/port-authority/inbox/
  chute route letter.txt --format jsonl --top 3
  chute route letter.txt --at-version 41
  cat scan.txt | chute route - --format csv

Routing into folders (the decision is logged first, then the file moved;
nothing is overwritten; see 'chute log'):
  chute route inbox/ --into routed/ --move
  chute route inbox/ --into routed/ --move --hold-below 0.9 --audit-share 0.02
  chute route inbox/ --into routed/ --copy --dry-run
Queue folders are DEST/<queue>/; DEST/_review/ holds the documents held for
review (below the threshold, no known terms, a queue with too few learned
documents, or drawn for the audit sample); DEST/_unreadable/ those set aside
with --set-aside.)");
  return [o] { return RunRoute(*o); };
}

}  // namespace chute
