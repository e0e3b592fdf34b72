#include "cli/format/drift_report.h"

#include "cli/format/csv_writer.h"
#include "cli/format/evaluation_text.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"

namespace chute {

namespace {

bool Flagged(const DriftReport& r, const std::string& date, DriftFigure figure,
             const std::string& queue) {
  for (const DriftAlert& a : r.alerts) {
    if (a.date == date && a.figure == figure && a.queue == queue) return true;
  }
  return false;
}

std::string OptionalPercent(const std::optional<double>& v) { return v ? Percent(*v) : "n/a"; }

}  // namespace

std::string DriftSentence(const DriftAlert& a) {
  const std::string on = "On " + a.date + ", ";
  switch (a.figure) {
    case DriftFigure::kQueueShare:
      return on + Percent(a.value) + " of documents went to " + a.queue + ", against " +
             Percent(a.baseline) + " of the documents the model learned.";
    case DriftFigure::kHeldShare:
      return on + Percent(a.value) + " of documents went to review, against " +
             Percent(a.baseline) + " over the period.";
    case DriftFigure::kMeanConfidence:
      return on + "the mean confidence was " + FormatFixed(a.value, 2) + ", against " +
             FormatFixed(a.baseline, 2) + " over the period.";
    case DriftFigure::kUnknownShare:
      return on + Percent(a.value) + " of terms were unknown to the model, against " +
             Percent(a.baseline) + " over the period.";
  }
  return "";
}

std::string DriftTable(const DriftReport& r, const std::string& since,
                       const DriftOptions& options) {
  std::string out = "Decisions since " + since + ": " + std::to_string(r.period.decisions) +
                    " over " + std::to_string(r.days.size()) +
                    (r.days.size() == 1 ? " day" : " days") + " (UTC dates).\n\n";
  TableWriter daily({{"date"},
                     {"decisions", TableWriter::Align::kRight},
                     {"held", TableWriter::Align::kRight},
                     {"mean confidence", TableWriter::Align::kRight},
                     {"unknown terms", TableWriter::Align::kRight}});
  for (const DriftDay& d : r.days) {
    const DriftFigures& f = d.figures;
    daily.AddRow({d.date, std::to_string(f.decisions), Percent(f.held_share),
                  FormatFixed(f.mean_confidence, 3), OptionalPercent(f.unknown_share)});
  }
  daily.AddRow({"period", std::to_string(r.period.decisions), Percent(r.period.held_share),
                FormatFixed(r.period.mean_confidence, 3),
                OptionalPercent(r.period.unknown_share)});
  out += daily.Render() + "\n";

  std::vector<TableWriter::Column> columns = {{"date"}};
  for (const std::string& q : r.queues) columns.push_back({q, TableWriter::Align::kRight});
  TableWriter mix(columns);
  for (const DriftDay& d : r.days) {
    std::vector<std::string> row = {d.date};
    for (double share : d.figures.queue_share) row.push_back(Percent(share));
    mix.AddRow(row);
  }
  std::vector<std::string> learned = {"learned"};
  for (double share : r.ledger_share) learned.push_back(Percent(share));
  mix.AddRow(learned);
  out += "Queue mix of the decisions, beside the " + std::to_string(r.ledger_documents) +
         " documents the model learned:\n" + mix.Render() + "\n";

  if (r.alerts.empty()) {
    out += "No figure of a day with at least " + std::to_string(options.min_decisions) +
           " decisions moved by more than " + FormatShortest(options.change) + ".\n";
  }
  for (const DriftAlert& a : r.alerts) out += DriftSentence(a) + "\n";
  return out;
}

std::string DriftJsonl(const DriftReport& r) {
  std::string out;
  for (const DriftDay& d : r.days) {
    const DriftFigures& f = d.figures;
    JsonWriter w;
    w.BeginObject().Key("date").String(d.date).Key("decisions").Int(f.decisions);
    w.Key("held_share").Number(f.held_share);
    w.Key("held_share_baseline").Number(r.period.held_share);
    w.Key("mean_confidence").Number(f.mean_confidence);
    w.Key("mean_confidence_baseline").Number(r.period.mean_confidence);
    for (const auto& [key, value] :
         {std::pair<const char*, std::optional<double>>{"unknown_share", f.unknown_share},
          {"unknown_share_baseline", r.period.unknown_share}}) {
      w.Key(key);
      if (value) {
        w.Number(*value);
      } else {
        w.Null();
      }
    }
    w.Key("queues").BeginArray();
    for (size_t q = 0; q < r.queues.size(); ++q) {
      w.BeginObject().Key("queue").String(r.queues[q]);
      w.Key("decisions").Int(f.queue_decisions[q]).Key("share").Number(f.queue_share[q]);
      w.Key("learned_share").Number(r.ledger_share[q]).EndObject();
    }
    w.EndArray().Key("changes").BeginArray();
    for (const DriftAlert& a : r.alerts) {
      if (a.date == d.date) w.String(DriftSentence(a));
    }
    w.EndArray();
    out += w.EndObject().Take() + "\n";
  }
  return out;
}

std::string DriftCsv(const DriftReport& r) {
  std::string out =
      CsvRecordLine({"date", "decisions", "figure", "queue", "value", "baseline", "moved"});
  for (const DriftDay& d : r.days) {
    const DriftFigures& f = d.figures;
    const std::string n = std::to_string(f.decisions);
    auto row = [&](const char* figure, DriftFigure kind, const std::string& queue,
                   const std::optional<double>& value, const std::optional<double>& baseline) {
      out += CsvRecordLine({d.date, n, figure, queue, value ? FormatShortest(*value) : "",
                            baseline ? FormatShortest(*baseline) : "",
                            Flagged(r, d.date, kind, queue) ? "true" : "false"});
    };
    for (size_t q = 0; q < r.queues.size(); ++q) {
      row("queue_share", DriftFigure::kQueueShare, r.queues[q], f.queue_share[q],
          r.ledger_share[q]);
    }
    row("held_share", DriftFigure::kHeldShare, "", f.held_share, r.period.held_share);
    row("mean_confidence", DriftFigure::kMeanConfidence, "", f.mean_confidence,
        r.period.mean_confidence);
    row("unknown_share", DriftFigure::kUnknownShare, "", f.unknown_share,
        r.period.unknown_share);
  }
  return out;
}

}  // namespace chute
