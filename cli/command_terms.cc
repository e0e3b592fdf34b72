// chute terms: per queue, the terms that most set it apart from all the other
// queues (classify/term_ranking.h does the work).
#include <CLI/CLI.hpp>
#include <cmath>

#include "classify/term_ranking.h"
#include "classify/term_table.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"

namespace chute {

namespace {

struct TermsOptions {
  std::string db;
  std::string queue;  // empty: every queue
  OutputFormat format = OutputFormat::kTable;
  TermRankingOptions ranking;
};

// The counts the method needs, read in one consistent view of the store:
// log-odds works on occurrences (the store's counts); χ² and mutual
// information on documents per term, derived from the ledger on the fly
// (each learned document's own term set), with the occurrences summed from
// the same ledger.
Status LoadTable(Store* store, TermMethod method, TermTable* table) {
  if (method == TermMethod::kLogOdds) {
    ModelCounts counts;
    Status s = store->LoadModelCounts(&counts);
    if (s.ok()) *table = TermTableFromCounts(counts);
    return s;
  }
  std::vector<QueueInfo> queues;
  Status s = store->ListQueues(&queues, Store::TermTally::kWithout);
  if (!s.ok()) return s;
  TermTableBuilder builder;
  for (const QueueInfo& q : queues) builder.AddQueue(q.name);
  s = store->ReadLedger([&](LedgerDocument& doc) { builder.AddDocument(doc.queue, doc.terms); });
  if (s.ok()) *table = builder.Build();
  return s;
}

const char* MethodTitle(TermMethod m) {
  switch (m) {
    case TermMethod::kLogOdds:
      return "weighted log-odds with an informative prior";
    case TermMethod::kChiSquare:
      return "chi-square on the documents that contain each term";
    case TermMethod::kMutualInformation:
      return "mutual information on the documents that contain each term";
  }
  return "";
}

const char* HowToRead(TermMethod m) {
  switch (m) {
    case TermMethod::kLogOdds:
      return "How to read: \"per 10,000\" is how often the term occurs per 10,000 terms, in "
             "the queue and in all the other queues; z says how clearly that difference "
             "stands out from chance (larger: more typical of the queue).";
    case TermMethod::kChiSquare:
      return "How to read: \"per 10,000\" is how often the term occurs per 10,000 terms, in "
             "the queue and in all the other queues; chi-square says how strongly a "
             "document's containing the term goes with its being in the queue (larger: "
             "stronger).";
    case TermMethod::kMutualInformation:
      return "How to read: \"per 10,000\" is how often the term occurs per 10,000 terms, in "
             "the queue and in all the other queues; bits say how much knowing that a "
             "document contains the term tells about whether it belongs to the queue "
             "(larger: more).";
  }
  return "";
}

std::string OfDocuments(int64_t n, int64_t of) {
  return std::to_string(n) + " of " + std::to_string(of);
}

void PrintTable(const TermsOptions& o, const std::vector<QueueTerms>& lists,
                int64_t all_documents) {
  const TermMethod m = o.ranking.method;
  std::string out = "Terms that set each queue apart from all the other queues, by " +
                    std::string(MethodTitle(m));
  if (m == TermMethod::kLogOdds)
    out += " (prior strength " + FormatShortest(o.ranking.prior_strength) + ")";
  out += "; terms seen at least " + std::to_string(o.ranking.min_count) +
         " times in the queue, most telling first.\n" + HowToRead(m) + "\n";
  for (const QueueTerms& qt : lists) {
    out += "\n" + qt.queue + ": " + std::to_string(qt.documents) + " documents, " +
           std::to_string(qt.tokens) + " terms\n";
    if (qt.terms.empty()) {
      out += "  (no term is seen at least " + std::to_string(o.ranking.min_count) +
             " times here and more often than in the other queues)\n";
      continue;
    }
    const auto R = TableWriter::Align::kRight;
    if (m == TermMethod::kLogOdds) {
      TableWriter t({{"term"},
                     {"count", R},
                     {"per 10,000 here", R},
                     {"per 10,000 elsewhere", R},
                     {"log-odds", R},
                     {"z", R}});
      for (const RankedTerm& r : qt.terms) {
        t.AddRow({r.term, std::to_string(r.count), FormatFixed(r.rate_in, 1),
                  FormatFixed(r.rate_out, 1), FormatFixed(r.log_odds, 2), FormatFixed(r.z, 2)});
      }
      out += t.Render();
    } else {
      const bool chi = m == TermMethod::kChiSquare;
      TableWriter t({{"term"},
                     {"count", R},
                     {"per 10,000 here", R},
                     {"per 10,000 elsewhere", R},
                     {"documents here", R},
                     {"documents elsewhere", R},
                     {chi ? "chi-square" : "bits", R}});
      for (const RankedTerm& r : qt.terms) {
        t.AddRow({r.term, std::to_string(r.count), FormatFixed(r.rate_in, 1),
                  FormatFixed(r.rate_out, 1), OfDocuments(r.documents_in, qt.documents),
                  OfDocuments(r.documents_out, all_documents - qt.documents),
                  FormatFixed(r.score, chi ? 1 : 4)});
      }
      out += t.Render();
    }
  }
  Print(out);
}

void PrintJsonl(TermMethod m, const std::vector<QueueTerms>& lists) {
  JsonWriter w;
  std::string out;
  for (const QueueTerms& qt : lists) {
    for (const RankedTerm& r : qt.terms) {
      w.BeginObject().Key("queue").String(qt.queue).Key("term").String(r.term);
      w.Key("count").Int(r.count).Key("rate_in").Number(r.rate_in);
      w.Key("rate_out").Number(r.rate_out);
      if (m == TermMethod::kLogOdds) {
        w.Key("log_odds").Number(r.log_odds).Key("z").Number(r.z);
      } else {
        w.Key("score").Number(r.score);
      }
      out += w.EndObject().Take() + "\n";
    }
  }
  Print(out);
}

std::vector<std::string> CsvHeader(TermMethod m) {
  if (m == TermMethod::kLogOdds) {
    return {"queue", "term", "count", "rate_in", "rate_out", "log_odds", "z"};
  }
  return {"queue", "term", "count", "rate_in", "rate_out", "score"};
}

void PrintCsv(TermMethod m, const std::vector<QueueTerms>& lists) {
  std::string out = CsvRecordLine(CsvHeader(m));
  for (const QueueTerms& qt : lists) {
    for (const RankedTerm& r : qt.terms) {
      std::vector<std::string> row = {qt.queue, r.term, std::to_string(r.count),
                                      FormatShortest(r.rate_in), FormatShortest(r.rate_out)};
      if (m == TermMethod::kLogOdds) {
        row.push_back(FormatShortest(r.log_odds));
        row.push_back(FormatShortest(r.z));
      } else {
        row.push_back(FormatShortest(r.score));
      }
      out += CsvRecordLine(row);
    }
  }
  Print(out);
}

int RunTerms(const TermsOptions& o) {
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("terms", o.db, &store)) return kExitFailed;
  TermTable table;
  if (Status s = LoadTable(store.get(), o.ranking.method, &table); !s.ok()) {
    Report("terms", s.message());
    return kExitFailed;
  }

  std::vector<size_t> selected;
  if (!o.queue.empty()) {
    const int64_t q = table.FindQueue(o.queue);
    if (q < 0) {
      std::string known;
      for (const std::string& name : table.queues) known += (known.empty() ? "" : ", ") + name;
      Report("terms", o.db + ": no queue named '" + o.queue +
                          "' (queues: " + (known.empty() ? "none yet" : known) + ")");
      return kExitFailed;
    }
    selected.push_back(static_cast<size_t>(q));
  } else {
    for (size_t q = 0; q < table.queue_count(); ++q) selected.push_back(q);
  }

  std::vector<QueueTerms> lists;
  if (QueuesWithDocuments(table) < 2) {
    // Nothing to compare: not an error, but say so.
    Report("terms", o.db +
                        ": terms are ranked against the other queues, and fewer than two "
                        "queues have learned documents; nothing to show");
    if (o.format == OutputFormat::kCsv) PrintCsv(o.ranking.method, lists);
    return kExitDone;
  }
  for (size_t q : selected) lists.push_back(RankTerms(table, q, o.ranking));

  switch (o.format) {
    case OutputFormat::kJsonl:
      PrintJsonl(o.ranking.method, lists);
      break;
    case OutputFormat::kCsv:
      PrintCsv(o.ranking.method, lists);
      break;
    case OutputFormat::kTable: {
      int64_t all_documents = 0;
      for (int64_t d : table.documents) all_documents += d;
      PrintTable(o, lists, all_documents);
      break;
    }
  }
  return kExitDone;
}

}  // namespace

CommandRun SetupTerms(CLI::App* cmd) {
  auto o = std::make_shared<TermsOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("--queue", o->queue, "only this queue (default: every queue, by name)")
      ->type_name("QUEUE");
  cmd->add_option("--top", o->ranking.top, "terms listed per queue (default 25)")
      ->check(CLI::PositiveNumber)
      ->type_name("N");
  AddChoiceOption<TermMethod>(cmd, "--method", &o->ranking.method,
                              {{"log-odds", TermMethod::kLogOdds},
                               {"chi2", TermMethod::kChiSquare},
                               {"mi", TermMethod::kMutualInformation}},
                              "log-odds (default): weighted log-odds ratio on term occurrences; "
                              "chi2 or mi: chi-square or mutual information on the documents "
                              "that contain each term");
  cmd->add_option("--min-count", o->ranking.min_count,
                  "leave out terms that occur fewer times than this in the queue's documents "
                  "(default 5)")
      ->check(CLI::PositiveNumber)
      ->type_name("N");
  cmd->add_option("--prior-strength", o->ranking.prior_strength,
                  "log-odds only: the prior's weight in occurrences, spread over the terms by "
                  "their share of all terms; larger pulls rare terms' scores towards 0 "
                  "(default 500)")
      ->check(PositiveReal())
      ->type_name("A0");
  AddFormatOption(cmd, &o->format);
  cmd->footer(R"(Each queue is compared with all the other queues taken together. Only terms
that occur at least --min-count times in the queue, and relatively more often
there than elsewhere, are listed.

JSON Lines: one object per term, {"queue", "term", "count", "rate_in",
"rate_out", "log_odds", "z"} for log-odds, {"queue", "term", "count",
"rate_in", "rate_out", "score"} for chi2 and mi. CSV: the same names as header.

Examples (the demo store made by 'make demo'):
  chute terms --db build/demo/harbour.db --queue billing
  chute terms --db build/demo/harbour.db --top 10 --format csv > terms.csv
  chute terms --db build/demo/harbour.db --queue careers --method chi2 --min-count 3)");
  return [o] { return RunTerms(*o); };
}

}  // namespace chute
