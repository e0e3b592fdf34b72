// chute why: a routing decision taken apart, term by term.
#include <CLI/CLI.hpp>

#include <cmath>

#include "classify/explanation.h"
#include "classify/model.h"
#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"
#include "cli/read/document_reader.h"
#include "cli/read/input_walker.h"
#include "cli/read/utf8.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

struct WhyOptions {
  std::string db;
  std::vector<std::string> inputs;
  OutputFormat format = OutputFormat::kTable;
  int top = 15;
  int64_t max_bytes = kDefaultMaxBytes;
};

const std::string& QueueName(const Model& model, uint32_t q) { return model.queues()[q].name; }

std::string JsonLine(const std::string& file, const Model& model, const Explanation& e) {
  JsonWriter w;
  w.BeginObject();
  w.Key("file").String(file);
  w.Key("queue").String(QueueName(model, e.queue));
  if (e.runner_up) {
    w.Key("runner_up").String(QueueName(model, *e.runner_up));
    w.Key("score_gap").Number(e.score_gap);
    w.Key("prior_share").Number(e.prior_share);
  } else {
    w.Key("runner_up").Null();
    w.Key("score_gap").Null();
    w.Key("prior_share").Null();
  }
  w.Key("posteriors").BeginArray();
  for (const QueuePosterior& p : e.decision.ranked) {
    w.BeginObject()
        .Key("queue").String(QueueName(model, p.queue))
        .Key("posterior").Number(p.posterior)
        .Key("log_posterior").Number(p.log_posterior)
        .EndObject();
  }
  w.EndArray();
  w.Key("terms").BeginArray();
  for (const auto* list : {&e.toward_queue, &e.toward_runner_up}) {
    for (const TermContribution& t : *list) {
      w.BeginObject()
          .Key("term").String(t.term)
          .Key("count").Int(t.count)
          .Key("contribution").Number(t.contribution)
          .EndObject();
    }
  }
  w.EndArray();
  w.Key("ignored").BeginArray();
  for (const IgnoredTerm& t : e.ignored) {
    w.BeginObject().Key("term").String(t.term).Key("count").Int(t.count).EndObject();
  }
  w.EndArray().EndObject();
  return w.Take() + "\n";
}

std::string CsvRows(const std::string& file, const Model& model, const Explanation& e) {
  const std::string& queue = QueueName(model, e.queue);
  const std::string runner_up = e.runner_up ? QueueName(model, *e.runner_up) : "";
  std::string out;
  for (const TermContribution& t : e.toward_queue) {
    out += CsvRecordLine({file, queue, runner_up, "toward_queue", t.term, std::to_string(t.count),
                          FormatShortest(t.contribution)});
  }
  for (const TermContribution& t : e.toward_runner_up) {
    out += CsvRecordLine({file, queue, runner_up, "toward_runner_up", t.term,
                          std::to_string(t.count), FormatShortest(t.contribution)});
  }
  out += CsvRecordLine({file, queue, runner_up, "prior", "", "",
                        e.runner_up ? FormatShortest(e.prior_share) : ""});
  for (const IgnoredTerm& t : e.ignored) {
    out += CsvRecordLine({file, queue, runner_up, "ignored", t.term, std::to_string(t.count), ""});
  }
  return out;
}

// Text for a sentence on a terminal: well-formed UTF-8, control characters
// (C0, DEL, C1) shown as '?', as TableWriter does in its cells.
std::string Printable(const std::string& text) {
  std::string valid;
  ToValidUtf8(text, &valid);
  std::string out;
  for (size_t i = 0; i < valid.size(); ++i) {
    const auto c = static_cast<unsigned char>(valid[i]);
    const bool c1 = c == 0xC2 && i + 1 < valid.size() &&
                    static_cast<unsigned char>(valid[i + 1]) >= 0x80 &&
                    static_cast<unsigned char>(valid[i + 1]) < 0xA0;
    if (c < 0x20 || c == 0x7F || c1) {
      out += '?';
      if (c1) ++i;
    } else {
      out += valid[i];
    }
  }
  return out;
}

std::string Signed(double v) { return (v > 0 ? "+" : "") + FormatFixed(v, 3); }

// "e^gap times as likely", in words a person reads.
std::string TimesAsLikely(double gap) {
  if (gap > std::log(1e6)) return "more than a million times";
  const double ratio = std::exp(gap);
  return (ratio < 10 ? FormatFixed(ratio, 2) : FormatFixed(std::round(ratio), 0)) + " times";
}

// Appends text, indented, wrapped at about 78 columns at spaces.
void AppendWrapped(const std::string& text, std::string* out) {
  constexpr size_t kWidth = 76;
  size_t start = 0;
  while (start < text.size()) {
    size_t end = text.size();
    if (end - start > kWidth) {
      const size_t space = text.rfind(' ', start + kWidth);
      end = space != std::string::npos && space > start ? space : text.find(' ', start + kWidth);
      if (end == std::string::npos) end = text.size();
    }
    *out += "  " + text.substr(start, end - start) + "\n";
    start = end < text.size() ? end + 1 : end;
  }
}

void AppendIndented(const std::string& block, std::string* out) {
  size_t start = 0;
  while (start < block.size()) {
    size_t end = block.find('\n', start);
    if (end == std::string::npos) end = block.size();
    *out += "  " + block.substr(start, end - start) + "\n";
    start = end + 1;
  }
}

std::string TermTable(const std::vector<TermContribution>& terms) {
  TableWriter t({{"term"},
                 {"count", TableWriter::Align::kRight},
                 {"pull", TableWriter::Align::kRight}});
  for (const TermContribution& c : terms) {
    t.AddRow({c.term, std::to_string(c.count), Signed(c.contribution)});
  }
  return t.Render();
}

// The explanation for a supervisor: plain sentences around small tables.
std::string TableText(const std::string& file, const Model& model, const Explanation& e,
                      size_t top) {
  const std::string queue = Printable(QueueName(model, e.queue));
  const QueuePosterior& best = e.decision.ranked.front();
  std::string out = "== " + Printable(file) + "\n";
  AppendWrapped("Routed to " + queue + ", with confidence " + FormatFixed(best.posterior, 3) +
                    ": the probability the model gives " + queue +
                    " for this document (naive Bayes is often over-confident; see README,"
                    " \"Cautions\").",
                &out);
  if (e.decision.no_terms()) {
    AppendWrapped("No term of this document is known to the model: the decision rests on the"
                  " prior (how common each queue is) alone.",
                  &out);
  }
  out += "\n";
  TableWriter posteriors({{"queue"}, {"posterior", TableWriter::Align::kRight}});
  for (const QueuePosterior& p : e.decision.ranked) {
    posteriors.AddRow({QueueName(model, p.queue), FormatFixed(p.posterior, 3)});
  }
  AppendIndented(posteriors.Render(), &out);

  if (!e.runner_up) {
    out += "\n";
    AppendWrapped(queue + " is the only queue the model can route to, so there is nothing to"
                          " compare it with and no term pulls either way.",
                  &out);
  } else {
    const std::string runner_up = Printable(QueueName(model, *e.runner_up));
    auto list = [&](const std::vector<TermContribution>& terms, size_t in_all,
                    const std::string& toward) {
      out += "\n";
      if (terms.empty()) {
        AppendWrapped("No term pulled towards " + toward + ".", &out);
        return;
      }
      std::string head = "Terms that pulled most towards " + toward;
      head += in_all > terms.size() ? " (the strongest " + std::to_string(terms.size()) +
                                          " of " + std::to_string(in_all) + "):"
                                    : ":";
      AppendWrapped(head, &out);
      AppendIndented(TermTable(terms), &out);
    };
    if (!e.decision.no_terms()) {
      list(e.toward_queue, e.terms_toward_queue, queue);
      list(e.toward_runner_up, e.terms_toward_runner_up, runner_up + ", the runner-up");
    }
    out += "\n";
    AppendWrapped("The prior (how common each queue is) pulled " + Signed(e.prior_share) +
                      (e.prior_share >= 0 ? " towards " + queue : " towards " + runner_up) + ".",
                  &out);
  }

  if (!e.ignored.empty()) {
    int64_t occurrences = 0;
    for (const IgnoredTerm& t : e.ignored) occurrences += t.count;
    std::string line = "Ignored, never learned by the model (" + std::to_string(e.ignored.size()) +
                       (e.ignored.size() == 1 ? " term, " : " terms, ") +
                       std::to_string(occurrences) + (occurrences == 1 ? " time" : " times") +
                       "):";
    for (size_t i = 0; i < e.ignored.size() && i < top; ++i) {
      line += (i == 0 ? " " : ", ") + Printable(e.ignored[i].term);
      if (e.ignored[i].count > 1) line += " (" + std::to_string(e.ignored[i].count) + ")";
    }
    if (e.ignored.size() > top) line += " and " + std::to_string(e.ignored.size() - top) + " more";
    out += "\n";
    AppendWrapped(line + ".", &out);
  }

  if (e.runner_up) {
    const std::string runner_up = Printable(QueueName(model, *e.runner_up));
    const size_t pulling = e.terms_toward_queue + e.terms_toward_runner_up;
    out += "\n";
    const std::string parts =
        pulling == 0 ? "With no term pulling either way, the prior's share alone is"
                     : "The pulls of all " + std::to_string(pulling) +
                           (pulling == 1 ? " different known term" : " different known terms") +
                           " plus the prior's share add up to";
    AppendWrapped("Pulls are in log-odds units (natural logarithm). " + parts +
                      " the score gap of " + FormatFixed(e.score_gap, 3) + " between " + queue +
                      " and " + runner_up + ": for this document the model finds " + queue +
                      " " + TimesAsLikely(e.score_gap) + " as likely as " + runner_up + ".",
                  &out);
  }
  return out;
}

int RunWhy(const WhyOptions& o) {
  if (o.inputs.empty()) {
    Report("why", "nothing to explain: name files, folders, or - for standard input");
    return kExitUsage;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("why", o.db, &store)) return kExitFailed;
  std::optional<Model> loaded;
  if (!LoadModelOrReport("why", store.get(), &loaded)) return kExitFailed;
  const Model& model = *loaded;

  std::vector<InputFile> files;
  std::vector<WalkProblem> problems;
  WalkInputs(o.inputs, &files, &problems);
  int64_t refused = 0, explained = 0;
  for (const WalkProblem& p : problems) {
    Report("why", p.path + ": " + p.reason);
    ++refused;
  }

  Tokenizer tokenizer(store->settings().tokenizer);
  const ReadOptions read_options{o.max_bytes};
  const ExplainOptions explain{static_cast<size_t>(o.top)};
  std::vector<std::string> terms;
  Document doc;
  if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"file", "queue", "runner_up", "kind", "term", "count", "contribution"}));
  }
  for (const InputFile& f : files) {
    if (Status r = ReadDocument(f.path, read_options, &doc); !r.ok()) {
      Report("why", r.message());
      ++refused;
      continue;
    }
    if (doc.replaced > 0) {
      Report("why", f.path + ": " + std::to_string(doc.replaced) +
                        " invalid UTF-8 sequences replaced by U+FFFD");
    }
    tokenizer.Tokenize(doc.text, &terms);
    const Explanation e = ExplainTerms(model, terms, explain);
    switch (o.format) {
      case OutputFormat::kJsonl:
        Print(JsonLine(f.path, model, e));
        break;
      case OutputFormat::kCsv:
        Print(CsvRows(f.path, model, e));
        break;
      case OutputFormat::kTable:
        Print((explained > 0 ? "\n" : "") + TableText(f.path, model, e, explain.top));
        break;
    }
    ++explained;
  }
  if (refused == 0) return kExitDone;
  return explained > 0 ? kExitSomeRefused : kExitFailed;
}

}  // namespace

CommandRun SetupWhy(CLI::App* cmd) {
  auto o = std::make_shared<WhyOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("inputs", o->inputs, "files, folders (walked recursively), or - for standard input");
  AddFormatOption(cmd, &o->format);
  cmd->add_option("--top", o->top,
                  "terms listed towards the chosen queue and towards the runner-up, each"
                  " (default 15)")
      ->check(CLI::PositiveNumber);
  AddMaxBytesOption(cmd, &o->max_bytes);
  cmd->footer(R"(Each known term's pull (contribution) is count x (log theta(queue, term) -
log theta(runner-up, term)); with the prior's share, log prior(queue) -
log prior(runner-up), the pulls of all known terms add up to the score gap
between the chosen queue and the runner-up. Terms the model never learned
are listed as ignored. See README, "chute why", for the fields.

Examples:
  chute why letter.txt
  chute why letter.txt --top 5 --format jsonl
  cat scan.txt | chute why - --format csv)");
  return [o] { return RunWhy(*o); };
}

}  // namespace chute
