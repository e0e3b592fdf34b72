#include "cli/format/decision_lines.h"

#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"

namespace chute {

const std::vector<std::string>& DecisionFieldNames() {
  static const std::vector<std::string> kNames = {
      "digest", "source", "destination",   "queue", "confidence", "runner_up",
      "runner_up_posterior", "held", "model_version", "time", "by"};
  return kNames;
}

std::string DecisionCsvHeader() { return CsvRecordLine(DecisionFieldNames()); }

std::string DecisionCsvLine(const DecisionRecord& r) {
  return CsvRecordLine({r.digest, r.source, r.destination, r.queue,
                        FormatShortest(r.confidence), r.runner_up,
                        r.runner_up_posterior ? FormatShortest(*r.runner_up_posterior) : "",
                        std::string(HeldName(r.held)), std::to_string(r.model_version), r.time,
                        r.by});
}

std::string DecisionJsonLine(const DecisionRecord& r) {
  JsonWriter w;
  w.BeginObject();
  w.Key("digest").String(r.digest);
  w.Key("source").String(r.source);
  w.Key("destination").String(r.destination);
  w.Key("queue").String(r.queue);
  w.Key("confidence").Number(r.confidence);
  w.Key("runner_up").StringOrNull(r.runner_up);
  w.Key("runner_up_posterior");
  if (r.runner_up_posterior) {
    w.Number(*r.runner_up_posterior);
  } else {
    w.Null();
  }
  w.Key("held").StringOrNull(HeldName(r.held));
  w.Key("model_version").Int(r.model_version);
  w.Key("time").String(r.time);
  w.Key("by").String(r.by);
  w.EndObject();
  return w.Take() + "\n";
}

}  // namespace chute
