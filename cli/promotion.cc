#include "cli/promotion.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <unordered_map>

#include "classify/held_out.h"
#include "classify/metrics.h"
#include "cli/format/json_writer.h"
#include "cli/recount.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

// Figures within this of each other are taken as equal: sums of doubles in
// another order must not block a promotion (common practice).
constexpr double kTolerance = 1e-9;

struct HeldOut {
  int64_t ledger_id = 0;
  int64_t truth_queue = 0;
};

// Chooses the held-out documents (promotion.h explains the rule).
void ChooseHeldOut(const Candidate& candidate,
                   const std::vector<Correction>& log,
                   const std::vector<std::pair<int64_t, int64_t>>& current,
                   const GateOptions& o, std::vector<HeldOut>* out,
                   GateReport* report) {
  std::vector<HeldOut> pool;
  const bool own = !candidate.moves.empty();
  if (own) {
    std::set<int64_t> seen;
    for (auto m = candidate.moves.rbegin(); m != candidate.moves.rend(); ++m) {
      if (seen.insert(m->ledger_id).second)
        pool.push_back({m->ledger_id, m->to_queue});
    }
  } else {
    for (const Correction& c : log) pool.push_back({c.ledger_id, c.to_queue});
  }
  report->held_out_from = "corrections";
  bool capped = own;
  if (static_cast<int64_t>(pool.size()) < kMinCorrections) {
    // Newest first within each queue, the queues in turn, so that a batch
    // learned queue by queue does not lose a whole queue.
    pool.clear();
    std::map<int64_t, std::vector<int64_t>> of_queue;
    for (auto m = current.rbegin(); m != current.rend(); ++m)
      of_queue[m->second].push_back(m->first);
    for (size_t k = 0; pool.size() < current.size(); ++k) {
      for (const auto& [queue, ids] : of_queue) {
        if (k < ids.size()) pool.push_back({ids[k], queue});
      }
    }
    report->held_out_from = "newest learned documents";
    capped = false;
  }
  const auto size = static_cast<int64_t>(pool.size());
  int64_t n = 0;
  if (o.hold_out) {
    n = *o.hold_out;
  } else if (o.hold_out_share) {
    n = static_cast<int64_t>(
        std::ceil(*o.hold_out_share * static_cast<double>(size)));
  } else {
    n = std::max(std::min(kHoldOutFloor, size),
                 static_cast<int64_t>(std::ceil(kDefaultHoldOutShare *
                                                static_cast<double>(size))));
  }
  if (capped) n = std::min(n, size / 2);
  n = std::clamp<int64_t>(n, 0, size);
  report->pool = size;
  out->assign(pool.begin(), pool.begin() + n);
}

// One model's predictions on the held-out documents.
Status Predict(Store* store,
               const std::vector<std::pair<int64_t, int64_t>>& members,
               bool recounted, const ModelOptions& options,
               const std::vector<HeldOut>& held,
               const std::vector<std::string>& labels,
               const std::unordered_map<int64_t, std::string>& name_of,
               std::vector<Prediction>* out) {
  ModelCounts counts;
  Status s = store->CountsOfMembers(members, recounted, &counts);
  if (!s.ok()) return s;
  std::vector<int64_t> ids;
  for (const HeldOut& h : held) ids.push_back(h.ledger_id);
  std::vector<std::vector<TermCount>> terms;
  if (s = store->DocumentTerms(ids, recounted, &terms); !s.ok()) return s;
  std::unordered_map<std::string, uint32_t> column, label;
  for (size_t q = 0; q < counts.queues.size(); ++q) {
    column[counts.queues[q].name] = static_cast<uint32_t>(q);
  }
  for (size_t l = 0; l < labels.size(); ++l)
    label[labels[l]] = static_cast<uint32_t>(l);
  const std::unordered_map<int64_t, int64_t> member(members.begin(),
                                                    members.end());
  std::vector<HeldOutDocument> docs(held.size());
  for (size_t i = 0; i < held.size(); ++i) {
    auto m = member.find(held[i].ledger_id);
    if (m != member.end()) {
      auto c = column.find(name_of.at(m->second));
      if (c != column.end()) docs[i].counted = c->second;
    }
    docs[i].truth = label.at(name_of.at(held[i].truth_queue));
    docs[i].terms = std::move(terms[i]);
  }
  std::string error;
  if (!EvaluateHeldOut(std::move(counts), docs, labels, options, out, &error)) {
    return Status::Corruption(store->path() + ": " + error);
  }
  return Status::Ok();
}

bool Lower(const std::optional<double>& candidate,
           const std::optional<double>& current, double margin) {
  return candidate && current && *candidate < *current - margin - kTolerance;
}

void AddFigures(JsonWriter& w, const std::optional<double>& macro_f1,
                const std::optional<double>& accuracy, const GateReport& r,
                bool candidate) {
  w.BeginObject().Key("macro_f1");
  macro_f1 ? w.Number(*macro_f1) : w.Null();
  w.Key("accuracy");
  accuracy ? w.Number(*accuracy) : w.Null();
  w.Key("recall").BeginObject();
  for (const GateQueue& q : r.queues) {
    const std::optional<double>& v =
        candidate ? q.recall_candidate : q.recall_current;
    w.Key(q.queue);
    v ? w.Number(*v) : w.Null();
  }
  w.EndObject().EndObject();
}

}  // namespace

std::string GateJson(const GateReport& r, double margin) {
  JsonWriter w;
  w.BeginObject().Key("candidate").String(r.candidate.kind);
  w.Key("base_version").Int(r.candidate.base_version);
  w.Key("settings");
  WriteSettings(r.candidate.settings, &w);
  w.Key("margin").Number(margin);
  w.Key("held_out")
      .Int(r.held_out)
      .Key("held_out_from")
      .String(r.held_out_from);
  w.Key("current");
  AddFigures(w, r.macro_f1_current, r.accuracy_current, r, false);
  w.Key("candidate_figures");
  AddFigures(w, r.macro_f1_candidate, r.accuracy_candidate, r, true);
  w.Key("blocked_by").BeginArray();
  if (r.macro_f1_blocks) w.String("macro_f1");
  for (const GateQueue& q : r.queues) {
    if (q.blocks) w.String("recall:" + q.queue);
  }
  w.EndArray();
  w.Key("decision")
      .String(r.passed     ? "promoted"
              : r.promoted ? "forced"
                           : "refused");
  return w.EndObject().Take();
}

Status RunPromotion(Store* store, const GateOptions& o, GateReport* r) {
  *r = GateReport();
  std::optional<Candidate> candidate;
  Status s = store->LoadCandidate(&candidate);
  if (!s.ok()) return s;
  if (!candidate) {
    return Status::NotFound(
        store->path() +
        ": there is no candidate (make one with rebuild --candidate or "
        "correct --candidate)");
  }
  r->candidate = *candidate;
  const bool recounted =
      !SameTokenizing(candidate->settings, store->settings());
  if (recounted && (s = CatchUpRecount(store, o.threads), !s.ok())) return s;

  std::vector<std::pair<int64_t, int64_t>> current, proposed;
  if (s = store->CurrentMembers(&current); !s.ok()) return s;
  if (s = store->CandidateMembers(*candidate, &proposed); !s.ok()) return s;
  std::vector<Correction> log;
  if (candidate->moves.empty()) {
    if (s = store->NewestCorrections(INT64_MAX, &log); !s.ok()) return s;
  }
  std::vector<HeldOut> held;
  ChooseHeldOut(*candidate, log, current, o, &held, r);
  r->held_out = static_cast<int64_t>(held.size());

  // Labels: every queue with documents in either model, and every truth.
  std::vector<std::pair<int64_t, std::string>> names;
  if (s = store->QueueNames(&names); !s.ok()) return s;
  const std::unordered_map<int64_t, std::string> name_of(names.begin(),
                                                         names.end());
  std::set<std::string> label_set;
  for (const auto* members : {&current, &proposed}) {
    for (const auto& [id, queue] : *members)
      label_set.insert(name_of.at(queue));
  }
  for (const HeldOut& h : held) label_set.insert(name_of.at(h.truth_queue));
  const std::vector<std::string> labels(label_set.begin(), label_set.end());

  if (!held.empty()) {
    std::vector<Prediction> now, next;
    s = Predict(store, current, false, store->settings().model, held, labels,
                name_of, &now);
    if (s.ok()) {
      s = Predict(store, proposed, recounted, candidate->settings.model, held,
                  labels, name_of, &next);
    }
    if (!s.ok()) return s;
    const ClassificationMetrics a =
        ComputeClassificationMetrics(now, labels.size());
    const ClassificationMetrics b =
        ComputeClassificationMetrics(next, labels.size());
    r->macro_f1_current = a.macro.f1;
    r->macro_f1_candidate = b.macro.f1;
    r->accuracy_current = a.accuracy;
    r->accuracy_candidate = b.accuracy;
    r->macro_f1_blocks = Lower(b.macro.f1, a.macro.f1, o.margin);
    for (size_t l = 0; l < labels.size(); ++l) {
      GateQueue q{labels[l], a.per_queue[l].support, a.per_queue[l].recall,
                  b.per_queue[l].recall, false};
      q.blocks = Lower(q.recall_candidate, q.recall_current, o.margin);
      r->queues.push_back(std::move(q));
    }
  }
  const bool blocked = r->macro_f1_blocks ||
                       std::any_of(r->queues.begin(), r->queues.end(),
                                   [](const GateQueue& q) { return q.blocks; });
  r->passed = !held.empty() && !blocked;
  r->promoted = r->passed || o.force;
  const std::string details = GateJson(*r, o.margin);
  if (!r->promoted) {
    if (s = store->SetCandidateDetails(details); !s.ok()) return s;
    if (held.empty()) {
      return Status::InvalidArgument(
          "no document can be held out (the store has no correction and no "
          "learned document); "
          "use --force to promote without the gate");
    }
    return Status::Ok();
  }
  Tokenizer tokenizer(candidate->settings.tokenizer);
  RollbackResult made;
  s = store->PromoteCandidate(
      o.change, details,
      [&](const std::string& text, RecountedDocument* doc) {
        return RecountText(&tokenizer, text, doc);
      },
      &made);
  if (!s.ok()) return s;
  r->made = made.made;
  return Status::Ok();
}

}  // namespace chute
