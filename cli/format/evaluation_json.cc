#include "cli/format/evaluation_json.h"

#include "classify/calibration.h"
#include "cli/format/evaluation_text.h"
#include "cli/format/json_writer.h"

namespace chute {

namespace {

void Figure(JsonWriter* w, const char* key, const std::optional<double>& v) {
  w->Key(key);
  v ? w->Number(*v) : w->Null();
}

void Averages3(JsonWriter* w, const char* key, const Averages& a) {
  w->Key(key).BeginObject();
  Figure(w, "precision", a.precision);
  Figure(w, "recall", a.recall);
  Figure(w, "f1", a.f1);
  w->EndObject();
}

void ModelObject(JsonWriter* w, const EvaluationReport& r) {
  const StoreSettings& s = r.settings;
  w->Key("model").BeginObject();
  w->Key("version").Null();  // the store keeps no model versions yet
  w->Key("store").String(r.store);
  w->Key("settings").BeginObject();
  w->Key("alpha").Number(s.model.alpha);
  w->Key("prior").String(s.model.prior == PriorMode::kUniform ? "uniform" : "learned");
  w->Key("bigrams").Bool(s.tokenizer.bigrams);
  w->Key("numbers").String(s.tokenizer.numbers == NumberMode::kFold ? "fold" : "keep");
  w->Key("min_length").Int(s.tokenizer.min_length);
  w->Key("max_length").Int(s.tokenizer.max_length);
  w->EndObject();
  w->Key("documents").Int(r.store_documents);
  w->Key("vocabulary").Int(r.vocabulary);
  w->Key("queues").BeginArray();
  for (const ReportQueue& q : r.queues) {
    w->BeginObject().Key("queue").String(q.name).Key("documents").Int(q.documents);
    Figure(w, "prior", q.prior);
    Figure(w, "set_prior", q.set_prior);
    w->EndObject();
  }
  w->EndArray().EndObject();
}

}  // namespace

std::string EvaluationJson(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  const ClassificationMetrics& m = e.classification;
  const bool cv = r.method == EvaluationMethod::kCrossValidation;
  JsonWriter w;
  w.BeginObject();
  w.Key("method").String(cv ? "cross-validation" : "holdout");
  if (cv) {
    w.Key("folds").Int(r.folds);
    w.Key("seed");
    r.seed ? w.Int(static_cast<int64_t>(*r.seed)) : w.Null();
    w.Key("folds_file");
    r.folds_file.empty() ? w.Null() : w.String(r.folds_file);
  } else {
    w.Key("holdout").String(r.holdout);
  }
  w.Key("documents").Int(m.documents);
  Figure(&w, "accuracy", m.accuracy);

  w.Key("per_queue").BeginArray();
  for (size_t q = 0; q < e.labels.size(); ++q) {
    const QueueMetrics& x = m.per_queue[q];
    w.BeginObject().Key("queue").String(e.labels[q]);
    Figure(&w, "precision", x.precision);
    Figure(&w, "recall", x.recall);
    Figure(&w, "f1", x.f1);
    w.Key("support").Int(x.support).EndObject();
  }
  w.EndArray();
  Averages3(&w, "macro", m.macro);
  Averages3(&w, "weighted", m.weighted);
  w.Key("macro_left_out").BeginObject();
  w.Key("precision").Int(m.macro.precision_left_out);
  w.Key("recall").Int(m.macro.recall_left_out);
  w.Key("f1").Int(m.macro.f1_left_out);
  w.EndObject();
  Averages3(&w, "micro", m.micro);

  w.Key("confusion").BeginObject().Key("labels").BeginArray();
  for (const std::string& l : e.labels) w.String(l);
  w.EndArray().Key("matrix").BeginArray();
  for (const auto& row : m.confusion) {
    w.BeginArray();
    for (int64_t n : row) w.Int(n);
    w.EndArray();
  }
  w.EndArray().EndObject();

  Figure(&w, "log_loss", e.calibration.log_loss);
  w.Key("log_loss_clip").Number(kLogLossEpsilon);
  Figure(&w, "brier", e.calibration.brier);
  Figure(&w, "ece", e.calibration.ece);
  w.Key("reliability").BeginArray();
  for (const ReliabilityBin& b : e.calibration.reliability) {
    w.BeginObject().Key("bin_low").Number(b.low).Key("bin_high").Number(b.high);
    w.Key("count").Int(b.count);
    Figure(&w, "mean_confidence", b.mean_confidence);
    Figure(&w, "accuracy", b.accuracy);
    w.EndObject();
  }
  w.EndArray();

  w.Key("sweep").BeginArray();
  for (const SweepPoint& s : e.sweep) {
    w.BeginObject().Key("threshold").Number(s.threshold).Key("auto_share").Number(s.auto_share);
    Figure(&w, "accuracy", s.accuracy);
    w.Key("documents").Int(s.documents).EndObject();
  }
  w.EndArray();

  w.Key("recommended");
  if (!e.recommendation) {
    w.Null();
  } else {
    const auto& p = e.recommendation->point;
    w.BeginObject().Key("target_accuracy").Number(e.recommendation->target);
    w.Key("reached").Bool(p.has_value());
    Figure(&w, "threshold", p ? std::optional<double>(p->threshold) : std::nullopt);
    Figure(&w, "auto_share", p ? std::optional<double>(p->auto_share) : std::nullopt);
    w.Key("documents");
    p ? w.Int(p->documents) : w.Null();
    Figure(&w, "accuracy", p ? p->accuracy : std::nullopt);
    w.Key("sentence").String(RecommendationSentence(r));
    w.EndObject();
  }

  ModelObject(&w, r);

  if (cv) {
    w.Key("fold_summary").BeginArray();
    for (size_t f = 0; f < r.fold_summaries.size(); ++f) {
      const FoldSummary& s = r.fold_summaries[f];
      w.BeginObject().Key("fold").Int(static_cast<int64_t>(f + 1));
      w.Key("documents").Int(s.held_out).Key("correct").Int(s.correct);
      Figure(&w, "accuracy",
             s.held_out > 0 ? std::optional<double>(static_cast<double>(s.correct) /
                                                    static_cast<double>(s.held_out))
                            : std::nullopt);
      w.Key("learned").Int(s.learned).Key("vocabulary").Int(s.vocabulary);
      w.Key("queues_left_out").BeginArray();
      for (uint32_t q : s.queues_left_out) w.String(e.labels[q]);
      w.EndArray().EndObject();
    }
    w.EndArray();
  }
  w.Key("no_terms").Int(e.no_terms);
  w.Key("warnings").BeginArray();
  for (const std::string& s : r.warnings) w.String(s);
  w.EndArray();
  w.Key("generated_at").String(r.generated_at);
  w.Key("chute_version").String(r.chute_version);

  w.Key("predictions").BeginArray();
  for (size_t i = 0; i < r.predictions.size(); ++i) {
    const Prediction& p = r.predictions[i];
    w.BeginObject().Key("document").String(r.documents[i]);
    w.Key("truth").String(e.labels[p.truth]).Key("queue").String(e.labels[p.predicted]);
    w.Key("confidence").Number(p.confidence);
    if (!r.fold_of.empty()) w.Key("fold").Int(r.fold_of[i]);
    if (r.with_probabilities) {
      w.Key("probabilities").BeginArray();
      for (double v : p.probabilities) w.Number(v);
      w.EndArray();
    }
    w.EndObject();
  }
  w.EndArray();
  w.EndObject();
  return w.Take() + "\n";
}

}  // namespace chute
