// The promotion gate: the candidate (store.h, Candidate) and the current
// model are evaluated on the same held-out documents, each model with
// those documents subtracted exactly (classify/held_out.h), and the
// candidate replaces the current model only when it is not worse by more
// than a margin: its macro-F1 not lower by more than the margin, and no
// queue's recall lower by more than the margin (metrics.h gives both). The
// figures and the decision are kept with the version a promotion makes, or
// with the candidate when the gate refuses.
//
// Held-out documents: the newest corrections (documents moved between
// queues), newest first, each labelled with the queue its newest correction
// put it in: the candidate's own corrections when it has some, else those
// of the change log. With fewer than kMinCorrections of them, the newest
// learned documents of the current model are held out instead, labelled
// with their queue (newest first within each queue, the queues in turn, so
// that a batch learned queue by queue does not lose a whole queue). How many:
// --hold-out N or a share; by default kDefaultHoldOutShare of them, at least
// min(kHoldOutFloor, all); of a candidate's own corrections never more than
// half, so that the candidate keeps learning from the rest.
#ifndef CHUTE_CLI_PROMOTION_H_
#define CHUTE_CLI_PROMOTION_H_

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "store/store.h"

namespace chute {

inline constexpr int64_t kMinCorrections = 5;
inline constexpr double kDefaultHoldOutShare = 0.2;
inline constexpr int64_t kHoldOutFloor = 10;

struct GateOptions {
  double margin = 0.01;                  // REQUIRES: >= 0
  std::optional<int64_t> hold_out;       // a number of documents (>= 1)
  std::optional<double> hold_out_share;  // or a share, 0 < share <= 1
  bool force = false;
  size_t threads = 1;
  ChangeInfo change;
};

struct GateQueue {
  std::string queue;
  int64_t held_out = 0;  // held-out documents labelled with it (support)
  std::optional<double> recall_current;
  std::optional<double> recall_candidate;
  bool blocks = false;  // its recall fell by more than the margin
};

struct GateReport {
  Candidate candidate;
  std::string held_out_from;  // "corrections" or "newest learned documents"
  int64_t pool = 0;           // documents it could hold out
  int64_t held_out = 0;
  std::optional<double> macro_f1_current, macro_f1_candidate;
  std::optional<double> accuracy_current, accuracy_candidate;
  std::vector<GateQueue> queues;  // by name
  bool macro_f1_blocks = false;
  bool passed = false;    // the gate let it through
  bool promoted = false;  // passed, or forced
  VersionInfo made;       // the version "promote" recorded
};

// Evaluates the candidate against the current model and promotes it when
// the gate passes or options.force; otherwise keeps the figures with the
// candidate. NotFound when there is no candidate; InvalidArgument when no
// document can be held out (and not forced).
Status RunPromotion(Store* store, const GateOptions& options,
                    GateReport* report);

// The figures and the decision as a JSON object (a version's details).
std::string GateJson(const GateReport& report, double margin);

}  // namespace chute

#endif  // CHUTE_CLI_PROMOTION_H_
