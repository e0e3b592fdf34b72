// chute queues: the queues with their documents, terms, priors and routing
// rules, and the store's settings; sets or clears a queue's prior by hand,
// its review threshold and its minimum of learned documents.
#include <CLI/CLI.hpp>

#include <cmath>

#include "classify/prior.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"

namespace chute {

namespace {

struct QueuesOptions {
  std::string db;
  OutputFormat format = OutputFormat::kTable;
  std::vector<std::string> set_prior;  // queue, value
  std::string clear_prior;
  bool settings = false;
  std::string by;
  std::vector<std::string> rename;  // from, to
  std::string merge, into, retire, add;
  std::vector<std::string> set_threshold;      // queue, value or "none"
  std::vector<std::string> set_min_documents;  // queue, value or "none"
};

// The routing rules (--set-threshold, --set-min-documents): not changes of
// the model, so no version. Returns an exit code, or -1 when none was
// asked for.
int ApplyRoutingRules(const QueuesOptions& o, Store* store) {
  if (!o.set_threshold.empty()) {
    const std::string& queue = o.set_threshold[0];
    const std::string& v = o.set_threshold[1];
    std::optional<double> t;
    if (v != "none") {
      double p = 0;
      try {
        size_t used = 0;
        p = std::stod(v, &used);
        if (used != v.size()) throw std::invalid_argument("trailing");
      } catch (const std::exception&) {
        Report("queues", "--set-threshold " + queue + ": '" + v +
                             "' is not a number (or 'none' to clear it)");
        return kExitUsage;
      }
      if (!(p > 0 && p <= 1)) {
        Report("queues", "--set-threshold " + queue + ": a threshold lies in (0, 1]");
        return kExitUsage;
      }
      t = p;
    }
    if (Status s = store->SetQueueThreshold(queue, t); !s.ok()) {
      Report("queues", s.message());
      return kExitFailed;
    }
  }
  if (!o.set_min_documents.empty()) {
    const std::string& queue = o.set_min_documents[0];
    const std::string& v = o.set_min_documents[1];
    std::optional<int64_t> n;
    if (v != "none") {
      int64_t m = -1;
      try {
        size_t used = 0;
        m = std::stoll(v, &used);
        if (used != v.size()) throw std::invalid_argument("trailing");
      } catch (const std::exception&) {
        m = -1;
      }
      if (m < 0) {
        Report("queues", "--set-min-documents " + queue + ": '" + v +
                             "' is not a whole number >= 0 (or 'none' to clear it)");
        return kExitUsage;
      }
      n = m;
    }
    if (Status s = store->SetQueueMinDocuments(queue, n); !s.ok()) {
      Report("queues", s.message());
      return kExitFailed;
    }
  }
  return -1;
}

// --rename, --merge/--into, --retire, --add: one change, reported in one
// line on stdout (table) or stderr; returns an exit code, or -1 when no
// change was asked for.
int ApplyQueueChange(const QueuesOptions& o, Store* store) {
  const ChangeInfo change{NowRfc3339(), o.by};
  const int asked = !o.rename.empty() + !o.merge.empty() + !o.retire.empty() + !o.add.empty();
  if (asked == 0) {
    if (!o.into.empty()) {
      Report("queues", "--into names the queue that --merge puts another into");
      return kExitUsage;
    }
    return -1;
  }
  if (asked > 1) {
    Report("queues", "one queue change at a time: --rename, --merge, --retire or --add");
    return kExitUsage;
  }
  Status s;
  std::string done;
  if (!o.rename.empty()) {
    s = store->RenameQueue(o.rename[0], o.rename[1], change);
    done = "renamed queue '" + o.rename[0] + "' to '" + o.rename[1] + "'";
  } else if (!o.merge.empty()) {
    if (o.into.empty()) {
      Report("queues", "--merge " + o.merge + " needs --into QUEUE");
      return kExitUsage;
    }
    int64_t moved = 0;
    s = store->MergeQueue(o.merge, o.into, change, &moved);
    done = "merged queue '" + o.merge + "' into '" + o.into + "': " + std::to_string(moved) +
           " documents and their counts added; '" + o.merge + "' is retired";
  } else if (!o.retire.empty()) {
    int64_t removed = 0;
    s = store->RetireQueue(o.retire, change, &removed);
    done = "retired queue '" + o.retire + "': " + std::to_string(removed) +
           " documents out of the model, kept in the ledger";
  } else {
    s = store->AddQueue(o.add, change);
    done = "added queue '" + o.add + "'; it is routed to once it has learned documents";
  }
  if (!s.ok()) {
    Report("queues", s.message() + "; nothing was changed");
    return kExitFailed;
  }
  if (o.format == OutputFormat::kTable) Print(done + " (by " + o.by + ")\n\n");
  return kExitDone;
}

std::vector<std::pair<std::string, std::string>> SettingsRows(const StoreSettings& s,
                                                              int64_t vocabulary) {
  return {
      {"alpha", FormatShortest(s.model.alpha)},
      {"prior", s.model.prior == PriorMode::kUniform ? "uniform" : "learned"},
      {"bigrams", s.tokenizer.bigrams ? "on" : "off"},
      {"numbers", s.tokenizer.numbers == NumberMode::kFold ? "fold" : "keep"},
      {"min_length", std::to_string(s.tokenizer.min_length)},
      {"max_length", std::to_string(s.tokenizer.max_length)},
      {"keep_text", s.keep_text ? "on" : "off"},
      {"vocabulary", std::to_string(vocabulary)},
  };
}

int PrintSettings(const StoreSettings& s, int64_t vocabulary, OutputFormat format) {
  auto rows = SettingsRows(s, vocabulary);
  if (format == OutputFormat::kJsonl) {
    JsonWriter w;
    w.BeginObject();
    w.Key("alpha").Number(s.model.alpha);
    w.Key("prior").String(rows[1].second);
    w.Key("bigrams").Bool(s.tokenizer.bigrams);
    w.Key("numbers").String(rows[3].second);
    w.Key("min_length").Int(s.tokenizer.min_length);
    w.Key("max_length").Int(s.tokenizer.max_length);
    w.Key("keep_text").Bool(s.keep_text);
    w.Key("vocabulary").Int(vocabulary);
    Print(w.EndObject().Take() + "\n");
  } else if (format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"setting", "value"}));
    for (const auto& [k, v] : rows) Print(CsvRecordLine({k, v}));
  } else {
    TableWriter t({{"setting"}, {"value"}});
    for (const auto& [k, v] : rows) t.AddRow({k, v});
    Print(t.Render());
  }
  return kExitDone;
}

int RunQueues(const QueuesOptions& o) {
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("queues", o.db, &store)) return kExitFailed;
  if (int code = ApplyQueueChange(o, store.get()); code > 0) return code;
  if (int code = ApplyRoutingRules(o, store.get()); code >= 0) return code;
  if (!o.set_prior.empty()) {
    const std::string& queue = o.set_prior[0];
    double p = 0;
    try {
      size_t used = 0;
      p = std::stod(o.set_prior[1], &used);
      if (used != o.set_prior[1].size()) throw std::invalid_argument("trailing");
    } catch (const std::exception&) {
      Report("queues", "--set-prior " + queue + ": '" + o.set_prior[1] + "' is not a number");
      return kExitUsage;
    }
    if (!(p > 0 && p < 1)) {
      Report("queues", "--set-prior " + queue + ": a prior must lie strictly between 0 and 1");
      return kExitUsage;
    }
    if (Status s = store->SetPrior(queue, p, ChangeInfo{NowRfc3339(), o.by}); !s.ok()) {
      Report("queues", s.message());
      return kExitFailed;
    }
  }
  if (!o.clear_prior.empty()) {
    if (Status s = store->SetPrior(o.clear_prior, std::nullopt, ChangeInfo{NowRfc3339(), o.by}); !s.ok()) {
      Report("queues", s.message());
      return kExitFailed;
    }
  }
  int64_t vocabulary = 0;
  std::vector<QueueInfo> queues;
  Status s = store->VocabularySize(&vocabulary);
  if (s.ok()) s = store->ListQueues(&queues);
  if (!s.ok()) {
    Report("queues", s.message());
    return kExitFailed;
  }
  if (o.settings) return PrintSettings(store->settings(), vocabulary, o.format);
  std::vector<QueuePolicy> policy_list;
  if (Status p = store->QueuePolicies(&policy_list); !p.ok()) {
    Report("queues", p.message());
    return kExitFailed;
  }
  auto policy_of = [&](const std::string& name) -> QueuePolicy {
    for (const QueuePolicy& p : policy_list) {
      if (p.name == name) return p;
    }
    return QueuePolicy{};
  };

  // The prior each queue routes with (queues without documents have none).
  std::vector<QueueCounts> routed;
  for (const QueueInfo& q : queues) {
    if (q.documents > 0) routed.push_back({q.name, q.documents, q.tokens, q.set_prior});
  }
  std::vector<double> priors = ComputePriors(routed, store->settings().model.prior);
  auto prior_of = [&](const std::string& name) -> std::optional<double> {
    for (size_t i = 0; i < routed.size(); ++i) {
      if (routed[i].name == name) return priors[i];
    }
    return std::nullopt;
  };
  const std::string mode =
      store->settings().model.prior == PriorMode::kUniform ? "uniform" : "learned";

  if (o.format == OutputFormat::kJsonl) {
    JsonWriter w;
    for (const QueueInfo& q : queues) {
      auto p = prior_of(q.name);
      w.BeginObject().Key("queue").String(q.name);
      w.Key("documents").Int(q.documents).Key("tokens").Int(q.tokens);
      w.Key("distinct_terms").Int(q.distinct_terms).Key("prior");
      p ? w.Number(*p) : w.Null();
      w.Key("prior_source").String(q.retired ? "retired" : q.set_prior ? "set" : mode);
      w.Key("retired").Bool(q.retired);
      const QueuePolicy rule = policy_of(q.name);
      w.Key("threshold");
      rule.threshold ? w.Number(*rule.threshold) : w.Null();
      w.Key("min_documents");
      rule.min_documents ? w.Int(*rule.min_documents) : w.Null();
      Print(w.EndObject().Take() + "\n");
    }
    return kExitDone;
  }
  if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"queue", "documents", "tokens", "distinct_terms", "prior", "prior_source",
                         "threshold", "min_documents"}));
    for (const QueueInfo& q : queues) {
      auto p = prior_of(q.name);
      const QueuePolicy rule = policy_of(q.name);
      Print(CsvRecordLine({q.name, std::to_string(q.documents), std::to_string(q.tokens),
                           std::to_string(q.distinct_terms), p ? FormatShortest(*p) : "",
                           q.retired ? "retired" : q.set_prior ? "set" : mode,
                           rule.threshold ? FormatShortest(*rule.threshold) : "",
                           rule.min_documents ? std::to_string(*rule.min_documents) : ""}));
    }
    return kExitDone;
  }
  const StoreSettings& st = store->settings();
  Print("store " + store->path() + ": alpha " + FormatShortest(st.model.alpha) + ", prior " +
        mode + ", bigrams " + (st.tokenizer.bigrams ? "on" : "off") + ", numbers " +
        (st.tokenizer.numbers == NumberMode::kFold ? "fold" : "keep") + ", term length " +
        std::to_string(st.tokenizer.min_length) + "-" +
        std::to_string(st.tokenizer.max_length) + "; vocabulary " +
        std::to_string(vocabulary) + " terms\n\n");
  TableWriter t({{"queue"},
                 {"documents", TableWriter::Align::kRight},
                 {"tokens", TableWriter::Align::kRight},
                 {"distinct terms", TableWriter::Align::kRight},
                 {"prior", TableWriter::Align::kRight},
                 {"prior from"},
                 {"review below", TableWriter::Align::kRight},
                 {"min documents", TableWriter::Align::kRight}});
  for (const QueueInfo& q : queues) {
    auto p = prior_of(q.name);
    const QueuePolicy rule = policy_of(q.name);
    t.AddRow({q.name, std::to_string(q.documents), std::to_string(q.tokens),
              std::to_string(q.distinct_terms), p ? FormatFixed(*p, 4) : "-",
              q.retired ? "retired" : q.set_prior ? "set by hand" : mode,
              rule.threshold ? FormatShortest(*rule.threshold) : "-",
              rule.min_documents ? std::to_string(*rule.min_documents) : "-"});
  }
  Print(t.Render());
  return kExitDone;
}

}  // namespace

CommandRun SetupQueues(CLI::App* cmd) {
  auto o = std::make_shared<QueuesOptions>();
  AddDbOption(cmd, &o->db);
  AddFormatOption(cmd, &o->format);
  cmd->add_option("--set-prior", o->set_prior,
                  "QUEUE P: set the queue's prior to P (0 < P < 1); queues without one share the rest")
      ->expected(2)
      ->type_name("QUEUE P");
  cmd->add_option("--clear-prior", o->clear_prior, "QUEUE: the queue's prior is learned or uniform again");
  cmd->add_flag("--settings", o->settings, "print the store's settings instead of the queues");
  AddByOption(cmd, &o->by);
  cmd->add_option("--rename", o->rename, "A B: queue A is called B from now on (same documents)")
      ->expected(2)
      ->type_name("A B");
  cmd->add_option("--merge", o->merge, "A: add queue A's documents and counts to the --into queue")
      ->type_name("A");
  cmd->add_option("--into", o->into, "B: the queue --merge adds to")->type_name("B");
  cmd->add_option("--retire", o->retire,
                  "A: queue A routes nothing; its documents leave the model, kept in the ledger")
      ->type_name("A");
  cmd->add_option("--add", o->add, "Q: a new queue, routed to once it has learned documents")
      ->type_name("Q");
  cmd->add_option("--set-threshold", o->set_threshold,
                  "QUEUE P: route --into and watch send this queue's documents below confidence "
                  "P (0 < P <= 1) to review; 'none' clears it (--hold-below overrides it)")
      ->expected(2)
      ->type_name("QUEUE P");
  cmd->add_option("--set-min-documents", o->set_min_documents,
                  "QUEUE N: hold this queue's documents for review while it has learned fewer "
                  "than N documents; 'none' clears it")
      ->expected(2)
      ->type_name("QUEUE N");
  cmd->footer(R"(Examples:
  chute queues
  chute queues --format jsonl
  chute queues --set-prior environment 0.05
  chute queues --settings
  chute queues --rename harbour-dues billing
  chute queues --merge pilotage --into berth-bookings --by ops-lead
  chute queues --retire old-forms
  chute queues --add hazardous-cargo
  chute queues --set-threshold customs 0.95
  chute queues --set-min-documents hazardous-cargo 20
  chute queues --set-threshold customs none

Every change of the queues or priors is a version (see 'chute versions');
'chute rollback' undoes it. Thresholds and minimums are routing rules,
not part of the model: they make no version.)");
  return [o] { return RunQueues(*o); };
}

}  // namespace chute
