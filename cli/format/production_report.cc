#include "cli/format/production_report.h"

#include <cmath>

#include "cli/format/csv_writer.h"
#include "cli/format/html_escape.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"

namespace chute {

namespace {

// The counts in the order of the JSON and CSV names.
std::vector<std::pair<const char*, int64_t>> CountFields(const DecisionCounts& c) {
  return {{"decisions", c.decisions},
          {"routed", c.routed},
          {"held_threshold", c.held_threshold},
          {"held_no_terms", c.held_no_terms},
          {"held_min_documents", c.held_min_documents},
          {"audit_drawn", c.audit_drawn},
          {"audit_reviewed", c.audit_reviewed},
          {"audit_correct", c.audit_correct},
          {"audit_unknown", c.audit_unknown},
          {"corrections", c.corrections},
          {"held_confirmed", c.held_confirmed},
          {"left_confirmed", c.left_confirmed}};
}

void JsonCounts(const DecisionCounts& c, JsonWriter* w) {
  for (const auto& [name, value] : CountFields(c)) w->Key(name).Int(value);
  for (const auto& [name, value] :
       {std::pair<const char*, std::optional<double>>{
            "precision", c.precision ? std::optional(c.precision->estimate) : std::nullopt},
        {"precision_low", c.precision ? std::optional(c.precision->low) : std::nullopt},
        {"precision_high", c.precision ? std::optional(c.precision->high) : std::nullopt}}) {
    w->Key(name);
    if (value) {
      w->Number(*value);
    } else {
      w->Null();
    }
  }
}

std::vector<std::string> CsvCounts(const DecisionCounts& c) {
  std::vector<std::string> fields;
  for (const auto& [name, value] : CountFields(c)) fields.push_back(std::to_string(value));
  if (c.precision) {
    fields.push_back(FormatShortest(c.precision->estimate));
    fields.push_back(FormatShortest(c.precision->low));
    fields.push_back(FormatShortest(c.precision->high));
  } else {
    fields.insert(fields.end(), 3, "");
  }
  return fields;
}

std::vector<std::string> CsvHeader() {
  std::vector<std::string> names;
  for (const auto& [name, value] : CountFields({})) names.push_back(name);
  names.insert(names.end(), {"precision", "precision_low", "precision_high"});
  return names;
}

// "1 decision", "2 decisions".
std::string Count(int64_t n, const std::string& one, const std::string& many) {
  return std::to_string(n) + " " + (n == 1 ? one : many);
}

std::string LevelWords(double confidence) {
  return FormatShortest(std::round(confidence * 1000) / 10) + "%";
}

std::string Period(const ProductionReport& r) {
  const ProductionFigures& f = r.figures;
  std::string words = r.since.empty() ? "every logged decision" : "decisions since " + r.since;
  if (!f.first_time.empty()) words += " (" + f.first_time + " to " + f.last_time + ")";
  return words;
}

std::vector<std::string> CountSentences(const DecisionCounts& t) {
  const int64_t held = t.held_threshold + t.held_no_terms + t.held_min_documents + t.audit_drawn;
  return {
      Count(t.decisions, "decision", "decisions") + ": " + std::to_string(t.routed) +
          " routed to their queue's folder, " + std::to_string(held) + " held for review (" +
          std::to_string(t.held_threshold) + " below the threshold, " +
          std::to_string(t.held_no_terms) + " with no known term, " +
          std::to_string(t.held_min_documents) + " for a queue with too few documents, " +
          std::to_string(t.audit_drawn) + " drawn for the audit sample).",
      "Audit sample: " + std::to_string(t.audit_drawn) + " drawn, " +
          std::to_string(t.audit_reviewed) + " reviewed, " + std::to_string(t.audit_unknown) +
          " unknown (still in review: never counted as right).",
      "Outside the audit sample, reviewers corrected " +
          Count(t.corrections, "decision", "decisions") + " and confirmed " +
          Count(t.held_confirmed, "guess", "guesses") + " held for review; " +
          Count(t.left_confirmed, "document was", "documents were") +
          " confirmed by staying where chute put them.",
  };
}

}  // namespace

std::string PrecisionSentence(const std::string& queue, const DecisionCounts& c,
                              double confidence) {
  const std::string where = queue.empty() ? "in all" : "for " + queue;
  if (!c.precision) {
    return "No audited decision " + where + " has been reviewed yet (" +
           std::to_string(c.audit_drawn) + " drawn): no precision.";
  }
  return "Of " + Count(c.audit_reviewed, "audited decision", "audited decisions") + " " + where +
         ", " +
         std::to_string(c.audit_correct) + (c.audit_correct == 1 ? " was" : " were") +
         " right: precision " +
         FormatFixed(c.precision->estimate, 2) + ", between " + FormatFixed(c.precision->low, 2) +
         " and " + FormatFixed(c.precision->high, 2) + " with " + LevelWords(confidence) +
         " confidence.";
}

std::string ProductionSummary(const ProductionReport& r) {
  const ProductionFigures& f = r.figures;
  std::string out = "Production figures of " + r.store + ", from " + Period(r) + ".\n";
  for (const std::string& s : CountSentences(f.total)) out += s + "\n";
  out += "\n";
  const std::string level = LevelWords(r.confidence);
  TableWriter table({{"queue"},
                     {"decisions", TableWriter::Align::kRight},
                     {"held", TableWriter::Align::kRight},
                     {"audit drawn", TableWriter::Align::kRight},
                     {"reviewed", TableWriter::Align::kRight},
                     {"right", TableWriter::Align::kRight},
                     {"precision", TableWriter::Align::kRight},
                     {level + " interval", TableWriter::Align::kRight},
                     {"corrections", TableWriter::Align::kRight}});
  auto add = [&](const std::string& name, const DecisionCounts& c) {
    const int64_t held = c.held_threshold + c.held_no_terms + c.held_min_documents;
    table.AddRow({name, std::to_string(c.decisions), std::to_string(held),
                  std::to_string(c.audit_drawn), std::to_string(c.audit_reviewed),
                  std::to_string(c.audit_correct),
                  c.precision ? FormatFixed(c.precision->estimate, 3) : "n/a",
                  c.precision ? FormatFixed(c.precision->low, 3) + " - " +
                                    FormatFixed(c.precision->high, 3)
                              : "n/a",
                  std::to_string(c.corrections)});
  };
  for (const QueueProductionFigures& q : f.queues) add(q.queue, q.counts);
  add("all", f.total);
  out += table.Render() + "\n";
  for (const QueueProductionFigures& q : f.queues) {
    out += PrecisionSentence(q.queue, q.counts, r.confidence) + "\n";
  }
  out += PrecisionSentence("", f.total, r.confidence) + "\n";
  out += "Held counts exclude the audit sample. Precision: audited documents moved into the "
         "queue chute chose, of those moved out of review (Wilson score interval).\n";
  return out;
}

std::string ProductionJson(const ProductionReport& r) {
  const ProductionFigures& f = r.figures;
  JsonWriter w;
  w.BeginObject().Key("method").String("log");
  w.Key("since").StringOrNull(r.since);
  w.Key("first_time").StringOrNull(f.first_time);
  w.Key("last_time").StringOrNull(f.last_time);
  w.Key("generated_at").String(r.generated_at);
  w.Key("chute_version").String(r.chute_version);
  w.Key("store").String(r.store);
  w.Key("z").Number(r.z).Key("confidence").Number(r.confidence);
  w.Key("total").BeginObject();
  JsonCounts(f.total, &w);
  w.EndObject().Key("per_queue").BeginArray();
  for (const QueueProductionFigures& q : f.queues) {
    w.BeginObject().Key("queue").String(q.queue);
    JsonCounts(q.counts, &w);
    w.EndObject();
  }
  w.EndArray();
  return w.EndObject().Take() + "\n";
}

std::vector<std::pair<std::string, std::string>> ProductionCsvFiles(const ProductionReport& r) {
  std::vector<std::string> header = CsvHeader();
  std::string totals = CsvRecordLine(header) + CsvRecordLine(CsvCounts(r.figures.total));
  header.insert(header.begin(), "queue");
  std::string per_queue = CsvRecordLine(header);
  for (const QueueProductionFigures& q : r.figures.queues) {
    std::vector<std::string> row = CsvCounts(q.counts);
    row.insert(row.begin(), q.queue);
    per_queue += CsvRecordLine(row);
  }
  return {{"per_queue.csv", per_queue}, {"totals.csv", totals}};
}

std::string ProductionHtml(const ProductionReport& r) {
  const ProductionFigures& f = r.figures;
  const std::string level = LevelWords(r.confidence);
  std::string out =
      "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n"
      "<title>chute production figures: " +
      HtmlEscape(r.store) +
      "</title>\n<style>\n"
      "body { font-family: sans-serif; font-size: 14px; max-width: 1000px; margin: 24px auto; "
      "padding: 0 16px; line-height: 1.4; }\n"
      "table { border-collapse: collapse; margin: 8px 0; }\n"
      "th, td { padding: 3px 10px; border-bottom: 1px solid #bbb; text-align: right; }\n"
      "th { border-bottom: 2px solid #000; }\n"
      "th:first-child, td:first-child { text-align: left; }\n"
      ".na { font-style: italic; color: #555; }\n"
      "@page { size: A4; margin: 14mm; }\n"
      "</style>\n</head>\n<body>\n<h1>Production figures</h1>\n<p>Store " +
      HtmlEscape(r.store) + ", from " + HtmlEscape(Period(r)) + ". Generated " +
      HtmlEscape(r.generated_at) + " by chute " + HtmlEscape(r.chute_version) + ".</p>\n";
  for (const std::string& s : CountSentences(f.total)) out += "<p>" + HtmlEscape(s) + "</p>\n";
  out += "<h2>Precision from the audit sample</h2>\n<ul>\n";
  for (const QueueProductionFigures& q : f.queues) {
    out += "<li>" + HtmlEscape(PrecisionSentence(q.queue, q.counts, r.confidence)) + "</li>\n";
  }
  out += "<li>" + HtmlEscape(PrecisionSentence("", f.total, r.confidence)) + "</li>\n</ul>\n";
  out += "<table>\n<thead><tr><th scope=\"col\">queue</th><th scope=\"col\">decisions</th>"
         "<th scope=\"col\">audit drawn</th><th scope=\"col\">reviewed</th>"
         "<th scope=\"col\">right</th><th scope=\"col\">precision</th><th scope=\"col\">" +
         HtmlEscape(level) +
         " interval</th><th scope=\"col\">interval, 0 to 1</th>"
         "<th scope=\"col\">corrections</th></tr></thead>\n<tbody>\n";
  auto row = [&](const std::string& name, const DecisionCounts& c) {
    out += "<tr><td>" + HtmlEscape(name) + "</td><td>" + std::to_string(c.decisions) +
           "</td><td>" + std::to_string(c.audit_drawn) + "</td><td>" +
           std::to_string(c.audit_reviewed) + "</td><td>" + std::to_string(c.audit_correct) +
           "</td>";
    if (c.precision) {
      // The interval as a line on a 0..1 scale, the estimate as a dot.
      const double width = 200;
      const auto x = [&](double v) { return FormatFixed(v * width, 1); };
      out += "<td>" + FormatFixed(c.precision->estimate, 3) + "</td><td>" +
             FormatFixed(c.precision->low, 3) + " - " + FormatFixed(c.precision->high, 3) +
             "</td><td><svg xmlns=\"http://www.w3.org/2000/svg\" width=\"200\" height=\"12\" "
             "viewBox=\"0 0 200 12\" role=\"img\"><title>" +
             HtmlEscape(PrecisionSentence(name == "all" ? "" : name, c, r.confidence)) +
             "</title><line x1=\"0\" y1=\"6\" x2=\"200\" y2=\"6\" stroke=\"#bbb\"/>"
             "<line x1=\"" + x(c.precision->low) + "\" y1=\"6\" x2=\"" + x(c.precision->high) +
             "\" y2=\"6\" stroke=\"#0072B2\" stroke-width=\"3\"/><circle cx=\"" +
             x(c.precision->estimate) + "\" cy=\"6\" r=\"4\" fill=\"#000\"/></svg></td>";
    } else {
      out += "<td class=\"na\">n/a</td><td class=\"na\">n/a</td><td></td>";
    }
    out += "<td>" + std::to_string(c.corrections) + "</td></tr>\n";
  };
  for (const QueueProductionFigures& q : f.queues) row(q.queue, q.counts);
  row("all", f.total);
  out += "</tbody>\n</table>\n<h2>How the figures are made</h2>\n<p>" +
         HtmlEscape(
             "A random share of the documents chute would have routed automatically went to "
             "review instead, marked as audit. A reviewer who moves such a document into the "
             "folder of the queue chute chose confirms the decision; one who moves it elsewhere "
             "corrects it; a document still in review is unknown and counts neither way. "
             "Because the sample is random, the share of right decisions among the reviewed "
             "ones estimates the precision of all automatic decisions. The interval is the "
             "Wilson score interval (E. B. Wilson, JASA 22, 1927) at " +
             level + " confidence.") +
         "</p>\n</body>\n</html>\n";
  return out;
}

}  // namespace chute
