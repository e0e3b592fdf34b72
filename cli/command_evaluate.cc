// chute evaluate: how well each queue is served, by cross-validation over
// the ledger (no document is read again) or on a labelled holdout; a
// summary on the terminal and report files (JSON, CSV, HTML).
#include <CLI/CLI.hpp>
#include <algorithm>
#include <map>
#include <optional>
#include <numeric>
#include <set>

#include "classify/cross_validation.h"
#include "classify/evaluation.h"
#include "classify/folds.h"
#include "classify/model.h"
#include "classify/prior.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/atomic_file.h"
#include "cli/format/evaluation_csv.h"
#include "cli/format/evaluation_html.h"
#include "cli/format/evaluation_json.h"
#include "cli/format/evaluation_report.h"
#include "cli/format/evaluation_text.h"
#include "cli/format/number.h"
#include "cli/format/progress.h"
#include "cli/format/report_files.h"
#include "cli/evaluate_from_log.h"
#include "cli/read/document_reader.h"
#include "cli/read/fold_manifest.h"
#include "cli/read/labelled_inputs.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

constexpr char kCommand[] = "evaluate";
// Documents are named by this many hex digits of their digest in reports.
constexpr size_t kDigestPrefix = 12;

struct EvaluateOptions {
  std::string db;
  int64_t folds = 5;
  uint64_t seed = 1;
  std::string folds_csv;
  std::string holdout;
  std::string holdout_csv;
  std::optional<double> target;
  std::string json;
  std::string csv;
  std::string html;
  bool with_paths = false;
  bool with_probabilities = false;
  int64_t max_bytes = kDefaultMaxBytes;
  bool from_log = false;  // production figures (evaluate_from_log.h)
  std::string since;
};

// A learned document as the ledger names it.
struct LedgerItem {
  std::string digest;
  std::string source;
};

std::string FileName(const std::string& path) {
  size_t slash = path.rfind('/');
  return slash == std::string::npos ? path : path.substr(slash + 1);
}

// The store's queues with documents, with the priors its full model uses.
std::vector<ReportQueue> QueuesOf(const ModelCounts& counts, PriorMode mode) {
  std::vector<QueueCounts> routed;
  for (const QueueCounts& q : counts.queues) {
    if (q.documents > 0) routed.push_back(q);
  }
  const std::vector<double> priors = ComputePriors(routed, mode);
  std::vector<ReportQueue> out;
  for (size_t i = 0; i < routed.size(); ++i) {
    out.push_back({routed[i].name, routed[i].documents, routed[i].set_prior, priors[i]});
  }
  return out;
}

void FillModelSummary(const Store& store, const ModelCounts& counts, EvaluationReport* r) {
  r->settings = store.settings();
  r->store = FileName(store.path());
  r->queues = QueuesOf(counts, store.settings().model.prior);
  r->store_documents = 0;
  for (const ReportQueue& q : r->queues) r->store_documents += q.documents;
}

// Reads the whole counts and the ledger from one snapshot, each document by
// rows of the counts. Returns false (with *inconsistent set) when they do not
// agree, which only a damaged store can do.
bool ReadCounted(Store* store, ModelCounts* whole, std::vector<CountedDocument>* docs,
                 std::vector<LedgerItem>* items, bool* inconsistent) {
  *inconsistent = false;
  docs->clear();
  items->clear();
  std::map<std::string, uint32_t, std::less<>> column;
  std::optional<CountsRowIndex> index;
  Status s = store->ReadCountsAndLedger(whole, [&](LedgerDocument& d) {
    if (!index) {  // the counts are read before the first document
      for (size_t q = 0; q < whole->queues.size(); ++q) {
        column.emplace(whole->queues[q].name, static_cast<uint32_t>(q));
      }
      index.emplace(*whole);
    }
    if (*inconsistent) return;
    auto col = column.find(d.queue);
    if (col == column.end()) {
      *inconsistent = true;
      return;
    }
    CountedDocument c;
    c.queue = col->second;
    c.rows.reserve(d.terms.size());
    for (const auto& [term, n] : d.terms) {
      const int64_t row = index->Find(term);
      if (row < 0) {
        *inconsistent = true;
        return;
      }
      c.rows.emplace_back(static_cast<uint32_t>(row), n);
    }
    std::sort(c.rows.begin(), c.rows.end());
    docs->push_back(std::move(c));
    items->push_back({std::move(d.digest), std::move(d.source)});
  });
  if (!s.ok()) {
    Report(kCommand, s.message());
    return false;
  }
  return !*inconsistent;
}

// Assigns the folds of a --folds-csv file. Returns the number of folds, or
// 0 after reporting why the file cannot be used.
int64_t FoldsFromFile(const EvaluateOptions& o, const std::vector<LedgerItem>& items,
                      const ModelCounts& whole, std::vector<CountedDocument>* docs) {
  std::vector<FoldRow> rows;
  if (Status s = ReadFoldManifest(o.folds_csv, &rows); !s.ok()) {
    Report(kCommand, s.message());
    return 0;
  }
  // Ledger digests, sorted, for prefix look-ups.
  std::vector<std::pair<std::string, size_t>> by_digest;
  for (size_t i = 0; i < items.size(); ++i) by_digest.emplace_back(items[i].digest, i);
  std::sort(by_digest.begin(), by_digest.end());
  std::set<int64_t> fold_numbers;
  for (const FoldRow& row : rows) fold_numbers.insert(row.fold);
  std::map<int64_t, uint32_t> fold_index;
  for (int64_t f : fold_numbers) fold_index.emplace(f, static_cast<uint32_t>(fold_index.size()));
  if (fold_index.size() < 2) {
    Report(kCommand, o.folds_csv + ": names fewer than 2 folds; cross-validation needs 2 or more");
    return 0;
  }
  std::vector<int64_t> given(items.size(), -1);
  Document doc;
  for (const FoldRow& row : rows) {
    const std::string where = o.folds_csv + ": line " + std::to_string(row.line) + ": ";
    std::string digest = row.digest;
    if (!row.path.empty()) {
      if (Status r = ReadDocument(row.path, ReadOptions{o.max_bytes}, &doc); !r.ok()) {
        Report(kCommand, where + r.message());
        return 0;
      }
      digest = doc.digest;
    }
    auto it = std::lower_bound(by_digest.begin(), by_digest.end(),
                               std::make_pair(digest, size_t{0}));
    const bool found = it != by_digest.end() && it->first.compare(0, digest.size(), digest) == 0;
    if (!found) {
      Report(kCommand, where + (row.path.empty() ? "digest " + digest : row.path) +
                           ": not a learned document of this store");
      return 0;
    }
    if (std::next(it) != by_digest.end() &&
        std::next(it)->first.compare(0, digest.size(), digest) == 0) {
      Report(kCommand, where + "digest prefix " + digest + " names more than one document");
      return 0;
    }
    const size_t i = it->second;
    const std::string& queue = whole.queues[(*docs)[i].queue].name;
    if (!row.queue.empty() && row.queue != queue) {
      Report(kCommand, where + "queue '" + row.queue + "', but the document was learned under '" +
                           queue + "'");
      return 0;
    }
    const int64_t fold = fold_index.at(row.fold);
    if (given[i] >= 0 && given[i] != fold) {
      Report(kCommand, where + "the document " + digest.substr(0, kDigestPrefix) +
                           " is already in another fold");
      return 0;
    }
    given[i] = fold;
  }
  int64_t missing = 0;
  for (size_t i = 0; i < items.size(); ++i) {
    if (given[i] < 0) {
      if (missing++ == 0) {
        Report(kCommand, o.folds_csv + ": gives no fold to the learned document " +
                             items[i].digest.substr(0, kDigestPrefix) +
                             (items[i].source.empty() ? "" : " (" + items[i].source + ")"));
      }
    } else {
      (*docs)[i].fold = static_cast<uint32_t>(given[i]);
    }
  }
  if (missing > 0) {
    Report(kCommand, o.folds_csv + ": " + std::to_string(missing) +
                         " learned documents have no fold; every learned document needs one");
    return 0;
  }
  return static_cast<int64_t>(fold_index.size());
}

int CrossValidateStore(const EvaluateOptions& o, Store* store, EvaluationReport* r) {
  ModelCounts whole;
  std::vector<CountedDocument> docs;
  std::vector<LedgerItem> items;
  bool inconsistent = false;
  if (!ReadCounted(store, &whole, &docs, &items, &inconsistent)) {
    if (inconsistent) {
      Report(kCommand, o.db + ": the ledger and the counts disagree; run 'chute check'");
    }
    return kExitFailed;
  }
  if (docs.empty()) {
    Report(kCommand, o.db + ": has learned no documents yet; run 'chute learn' first");
    return kExitFailed;
  }
  FillModelSummary(*store, whole, r);
  r->method = EvaluationMethod::kCrossValidation;

  if (o.folds_csv.empty() && o.folds > static_cast<int64_t>(docs.size())) {
    Report(kCommand, "--folds " + std::to_string(o.folds) + " is more than the " +
                         std::to_string(docs.size()) + " learned documents");
    return kExitUsage;
  }
  if (o.folds_csv.empty()) {
    // Folds depend on the documents (ordered by digest) and the seed, not on
    // the order they were learned in.
    std::vector<uint32_t> order(docs.size());
    std::iota(order.begin(), order.end(), 0u);
    std::sort(order.begin(), order.end(),
              [&](uint32_t a, uint32_t b) { return items[a].digest < items[b].digest; });
    std::vector<uint32_t> labels;
    for (uint32_t i : order) labels.push_back(docs[i].queue);
    const std::vector<uint32_t> fold =
        AssignStratifiedFolds(labels, static_cast<uint32_t>(whole.queues.size()),
                              static_cast<uint32_t>(o.folds), o.seed);
    for (size_t k = 0; k < order.size(); ++k) docs[order[k]].fold = fold[k];
    r->folds = o.folds;
    r->seed = o.seed;
  } else {
    r->folds = FoldsFromFile(o, items, whole, &docs);
    if (r->folds == 0) return kExitFailed;
    r->folds_file = o.folds_csv;
  }

  CrossValidation cv;
  std::string error;
  if (!CrossValidate(&whole, docs, static_cast<uint32_t>(r->folds), store->settings().model, &cv,
                     &error)) {
    Report(kCommand, o.db + ": " + error);
    return kExitFailed;
  }
  // |V| of the store's full model: terms with a count in some queue.
  r->vocabulary = 0;
  const size_t nq = whole.queues.size();
  for (size_t row = 0; row < whole.terms.size(); ++row) {
    r->vocabulary += std::any_of(whole.counts.begin() + static_cast<std::ptrdiff_t>(row * nq),
                                 whole.counts.begin() + static_cast<std::ptrdiff_t>((row + 1) * nq),
                                 [](int64_t n) { return n != 0; });
  }
  for (size_t i = 0; i < docs.size(); ++i) {
    // A purged entry has no path left; its digest names it instead.
    r->documents.push_back(o.with_paths && !items[i].source.empty()
                               ? items[i].source
                               : items[i].digest.substr(0, kDigestPrefix));
    r->fold_of.push_back(static_cast<int64_t>(docs[i].fold) + 1);
  }
  // Warnings: small queues, queues a fold's model could not route to.
  std::vector<int64_t> support(cv.labels.size(), 0);
  for (const Prediction& p : cv.predictions) ++support[p.truth];
  for (size_t q = 0; q < cv.labels.size(); ++q) {
    if (support[q] < r->folds) {
      r->warnings.push_back("queue '" + cv.labels[q] + "' has " + std::to_string(support[q]) +
                            " documents, fewer than the " + std::to_string(r->folds) +
                            " folds: some folds hold none of it, and its figures rest on very "
                            "few documents");
    }
  }
  for (size_t f = 0; f < cv.folds.size(); ++f) {
    for (uint32_t q : cv.folds[f].queues_left_out) {
      r->warnings.push_back("fold " + std::to_string(f + 1) + " holds every document of queue '" +
                            cv.labels[q] + "', so that fold's model could not route to it: "
                            "those documents count as errors");
    }
  }
  r->fold_summaries = std::move(cv.folds);
  r->predictions = std::move(cv.predictions);
  r->evaluation.labels = std::move(cv.labels);
  return kExitDone;
}

int EvaluateHoldout(const EvaluateOptions& o, Store* store, EvaluationReport* r,
                    int64_t* refused) {
  ModelCounts counts;
  if (Status s = store->LoadModelCounts(&counts); !s.ok()) {
    Report(kCommand, s.message());
    return kExitFailed;
  }
  FillModelSummary(*store, counts, r);
  r->method = EvaluationMethod::kHoldout;
  r->holdout = o.holdout.empty() ? o.holdout_csv : o.holdout;
  const Model model = Model::Build(counts, store->settings().model);
  r->vocabulary = static_cast<int64_t>(model.vocabulary_size());
  counts = ModelCounts();
  if (model.queue_count() == 0) {
    Report(kCommand, o.db + ": has learned no documents yet; run 'chute learn' first");
    return kExitFailed;
  }

  std::vector<LabelledFile> files;
  std::vector<WalkProblem> problems;
  Status s = !o.holdout.empty() ? CollectTree(o.holdout, &files, &problems)
                                : CollectManifest(o.holdout_csv, &files, &problems);
  if (!s.ok()) {
    Report(kCommand, s.message());
    return kExitFailed;
  }
  for (const WalkProblem& p : problems) {
    Report(kCommand, p.path + ": " + p.reason);
    ++*refused;
  }
  // Labels: the model's queues and the holdout's, in byte order.
  std::set<std::string> model_queues;
  for (const QueueCounts& q : model.queues()) model_queues.insert(q.name);
  std::set<std::string> names = model_queues;
  for (const LabelledFile& f : files) names.insert(f.queue);
  std::vector<std::string> labels(names.begin(), names.end());
  const std::vector<uint32_t> label_of_queue = LabelsOfQueues(model, labels);
  std::map<std::string, int64_t> unknown_queue_documents;

  Tokenizer tokenizer(store->settings().tokenizer);
  std::vector<std::string> terms;
  DocumentRows rows;
  Document doc;
  int64_t learned = 0;
  Progress progress(kCommand, files.size());
  for (const LabelledFile& f : files) {
    progress.Tick();
    const std::string where = f.context.empty() ? f.path : f.context + ": " + f.path;
    if (Status rd = ReadDocument(f.path, ReadOptions{o.max_bytes}, &doc); !rd.ok()) {
      Report(kCommand, f.context.empty() ? rd.message() : f.context + ": " + rd.message());
      ++*refused;
      continue;
    }
    if (doc.replaced > 0) {
      Report(kCommand, where + ": " + std::to_string(doc.replaced) +
                           " invalid UTF-8 sequences replaced by U+FFFD");
    }
    std::optional<LedgerEntry> known;
    if (Status k = store->FindDocument(doc.digest, &known); !k.ok()) {
      Report(kCommand, k.message());
      return kExitFailed;
    }
    learned += known.has_value();
    tokenizer.Tokenize(doc.text, &terms);
    int64_t unknown = 0;
    model.ToRows(terms, &rows, &unknown);
    const Decision d = model.Decide(rows, unknown);
    const uint32_t truth = static_cast<uint32_t>(
        std::lower_bound(labels.begin(), labels.end(), f.queue) - labels.begin());
    r->predictions.push_back(PredictionFromDecision(d, label_of_queue, labels.size(), truth));
    r->documents.push_back(o.with_paths ? f.path : doc.digest.substr(0, kDigestPrefix));
    if (!model_queues.contains(f.queue)) ++unknown_queue_documents[f.queue];
  }
  for (const auto& [queue, n] : unknown_queue_documents) {
    r->warnings.push_back("holdout queue '" + queue + "' (" + std::to_string(n) +
                          " documents) is unknown to the model: its documents count as errors");
  }
  if (learned > 0) {
    r->warnings.push_back(std::to_string(learned) + " of the " +
                          std::to_string(r->predictions.size()) +
                          " holdout documents were learned by the store: figures on them are "
                          "optimistic");
  }
  r->evaluation.labels = std::move(labels);
  return kExitDone;
}

// Writes the report files; false after reporting a failure.
bool WriteReports(const EvaluateOptions& o, const EvaluationReport& r) {
  ReportFiles files;
  files.json_path = o.json;
  if (!o.json.empty()) files.json = EvaluationJson(r);
  files.html_path = o.html;
  if (!o.html.empty()) files.html = EvaluationHtml(r);
  files.csv_dir = o.csv;
  if (!o.csv.empty()) files.csv_files = EvaluationCsvFiles(r);
  if (Status s = WriteReportFiles(files); !s.ok()) {
    Report(kCommand, s.message());
    return false;
  }
  return true;
}

int RunEvaluate(const EvaluateOptions& o) {
  if (o.from_log) {
    if (o.target || o.with_paths || o.with_probabilities) {
      Report(kCommand,
             "--target-accuracy, --with-paths and --with-probabilities do not apply to "
             "--from-log");
      return kExitUsage;
    }
    EvaluateFromLogOptions l;
    l.db = o.db;
    l.since = o.since;
    l.json = o.json;
    l.csv = o.csv;
    l.html = o.html;
    return RunEvaluateFromLog(l);
  }
  if (!o.since.empty()) {
    Report(kCommand, "--since needs --from-log");
    return kExitUsage;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport(kCommand, o.db, &store)) return kExitFailed;
  EvaluationReport r;
  r.generated_at = NowRfc3339();
  r.chute_version = CHUTE_VERSION;
  r.with_probabilities = o.with_probabilities;
  int64_t refused = 0;
  const bool holdout = !o.holdout.empty() || !o.holdout_csv.empty();
  const int rc = holdout ? EvaluateHoldout(o, store.get(), &r, &refused)
                         : CrossValidateStore(o, store.get(), &r);
  if (rc != kExitDone) return rc;
  if (r.predictions.empty()) {
    Report(kCommand, "no document to evaluate");
    return kExitFailed;
  }
  EvaluationOptions options;
  options.target_accuracy = o.target;
  std::vector<std::string> labels = std::move(r.evaluation.labels);
  r.evaluation = Evaluate(std::move(labels), r.predictions, options);

  for (const std::string& w : r.warnings) Report(kCommand, "warning: " + w);
  if (!WriteReports(o, r)) return kExitFailed;
  Print(EvaluationSummary(r));
  if (!o.json.empty()) Print("report written: " + o.json + "\n");
  if (!o.csv.empty()) Print("CSV files written to: " + o.csv + "\n");
  if (!o.html.empty()) Print("HTML report written: " + o.html + "\n");
  return BatchExit(static_cast<int64_t>(r.predictions.size()), refused);
}

}  // namespace

CommandRun SetupEvaluate(CLI::App* cmd) {
  auto o = std::make_shared<EvaluateOptions>();
  AddDbOption(cmd, &o->db);
  auto* folds = cmd->add_option("--folds", o->folds,
                                "cross-validation: the number of folds (default 5)")
                    ->check(CLI::Range(int64_t{2}, int64_t{1000000}))
                    ->type_name("K");
  // Seeds stay within the integers JSON readers hold exactly (RFC 8259, §6).
  auto* seed = cmd->add_option("--seed", o->seed,
                               "cross-validation: the seed of the fold assignment (default 1)")
                   ->check(CLI::Range(uint64_t{0}, (uint64_t{1} << 53) - 1))
                   ->type_name("S");
  auto* folds_csv = cmd->add_option(
      "--folds-csv", o->folds_csv,
      "cross-validation on given folds: a CSV file with the header fold and digest or path "
      "(optionally queue)")->type_name("FILE");
  auto* holdout = cmd->add_option(
      "--holdout", o->holdout, "evaluate on a labelled folder ROOT/<queue>/... instead")
      ->type_name("DIR");
  auto* holdout_csv = cmd->add_option(
      "--holdout-csv", o->holdout_csv,
      "evaluate on a CSV manifest with the header path,queue instead")->type_name("FILE");
  folds_csv->excludes(folds)->excludes(seed);
  holdout->excludes(holdout_csv)->excludes(folds)->excludes(seed)->excludes(folds_csv);
  holdout_csv->excludes(folds)->excludes(seed)->excludes(folds_csv);
  cmd->add_option_function<double>(
         "--target-accuracy", [o](double v) { o->target = v; },
         "recommend the lowest confidence threshold at which the documents routed "
         "automatically reach this accuracy")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("P");
  cmd->add_option("--json", o->json, "write the full report as JSON to this file")
      ->type_name("FILE");
  cmd->add_option("--html", o->html,
                  "write a self-contained, printable HTML page with charts to this file")
      ->type_name("FILE");
  cmd->add_option("--csv", o->csv,
                  "write per_queue.csv, confusion.csv, sweep.csv, reliability.csv and "
                  "predictions.csv into this folder")
      ->type_name("DIR");
  cmd->add_flag("--with-paths", o->with_paths,
                "name documents by their path in reports (default: the first 12 hex digits of "
                "their SHA-256; paths can be personal data)");
  cmd->add_flag("--with-probabilities", o->with_probabilities,
                "add every queue's posterior to each prediction in the JSON report");
  AddMaxBytesOption(cmd, &o->max_bytes);
  auto* from_log = cmd->add_flag(
      "--from-log", o->from_log,
      "production figures instead: precision per queue from the audit sample of the decision "
      "log (route --into --audit-share), with counts of what was held and reviewed");
  cmd->add_option("--since", o->since,
                  "with --from-log: only decisions since this age (30m, 24h, 30d) or RFC 3339 "
                  "time")
      ->type_name("AGE");
  for (CLI::Option* other : {folds, seed, folds_csv, holdout, holdout_csv}) {
    from_log->excludes(other);
  }
  cmd->footer(R"(Cross-validation (the default) uses the documents the store has learned:
each fold's model is the store's counts minus the fold's documents, so no
file is read again. A holdout is read, and routed by the store's model.

Examples:
  chute evaluate
  chute evaluate --folds 10 --seed 7 --target-accuracy 0.98
  chute evaluate --holdout labelled-2026-12/ --json review.json --csv review/
  chute evaluate --target-accuracy 0.98 --html review.html
  chute evaluate --folds-csv folds.csv --json cv.json
  chute evaluate --from-log --since 30d --html production.html)");
  return [o] { return RunEvaluate(*o); };
}

}  // namespace chute
