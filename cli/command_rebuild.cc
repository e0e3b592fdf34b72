// chute rebuild: recounts the model under new settings from the documents'
// kept text, beside the current counts, and swaps the recount in (or keeps
// it as a candidate for `chute promote`). The work is in cli/recount.h.
#include <CLI/CLI.hpp>
#include <optional>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/number.h"
#include "cli/recount.h"

namespace chute {

namespace {

struct RebuildOptions {
  std::string db;
  std::string by;
  size_t threads = 1;
  bool candidate = false;
  // Settings to change; the others stay as the store has them.
  std::optional<double> alpha;
  std::optional<PriorMode> prior;
  std::optional<bool> bigrams;
  std::optional<NumberMode> numbers;
  std::optional<int32_t> min_length;
  std::optional<int32_t> max_length;
  std::optional<bool> keep_text;
};

std::string Describe(const StoreSettings& st) {
  return "alpha " + FormatShortest(st.model.alpha) + ", prior " +
         (st.model.prior == PriorMode::kUniform ? "uniform" : "learned") +
         ", bigrams " + (st.tokenizer.bigrams ? "on" : "off") + ", numbers " +
         (st.tokenizer.numbers == NumberMode::kFold ? "fold" : "keep") +
         ", terms of " + std::to_string(st.tokenizer.min_length) + " to " +
         std::to_string(st.tokenizer.max_length) + " characters, keep-text " +
         (st.keep_text ? "on" : "off");
}

int RunRebuild(const RebuildOptions& o) {
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("rebuild", o.db, &store)) return kExitFailed;
  RebuildRequest request;
  StoreSettings& t = request.target;
  t = store->settings();
  if (o.alpha) t.model.alpha = *o.alpha;
  if (o.prior) t.model.prior = *o.prior;
  if (o.bigrams) t.tokenizer.bigrams = *o.bigrams;
  if (o.numbers) t.tokenizer.numbers = *o.numbers;
  if (o.min_length) t.tokenizer.min_length = *o.min_length;
  if (o.max_length) t.tokenizer.max_length = *o.max_length;
  if (o.keep_text) t.keep_text = *o.keep_text;
  if (t.tokenizer.min_length > t.tokenizer.max_length) {
    Report("rebuild", "--min-length would be greater than --max-length");
    return kExitUsage;
  }
  request.candidate = o.candidate;
  request.threads = o.threads;
  request.change = ChangeInfo{NowRfc3339(), o.by};
  RebuildOutcome out;
  Status s = Rebuild(store.get(), request, &out);
  if (!s.ok()) {
    Report("rebuild", s.message());
    return kExitFailed;
  }
  if (out.replaced_candidate) Print("the earlier candidate was replaced\n");
  if (out.tokenizing_changed) {
    Print("recounted " + std::to_string(out.recounted) +
          " documents from their kept text in " + std::to_string(out.batches) +
          " batches\n");
  }
  if (o.candidate) {
    Print("candidate made (" + Describe(t) +
          "); 'chute promote' compares it with the current model\n");
  } else {
    if (out.tokenizing_changed) {
      Print("swapped in " + FormatShortest(out.swap_seconds) + " s; " +
            std::to_string(out.swap.caught_up) +
            " documents learned meanwhile recounted, " +
            std::to_string(out.swap.resynced) + " moved meanwhile followed\n");
    }
    Print("version " + std::to_string(out.made.version) +
          " (rebuild): " + Describe(t) + "\n");
  }
  return kExitDone;
}

}  // namespace

CommandRun SetupRebuild(CLI::App* cmd) {
  auto o = std::make_shared<RebuildOptions>();
  AddDbOption(cmd, &o->db);
  AddByOption(cmd, &o->by);
  AddThreadsOption(cmd, &o->threads);
  cmd->add_flag("--candidate", o->candidate,
                "stop before the swap: keep the result as the candidate for "
                "'chute promote'");
  cmd->add_option_function<double>(
         "--alpha", [o](const double& v) { o->alpha = v; },
         "smoothing added to every count: 1 is Laplace, 0 < alpha < 1 Lidstone")
      ->check(PositiveReal())
      ->type_name("ALPHA");
  AddChoiceOption<std::optional<PriorMode>>(
      cmd, "--prior", &o->prior,
      {{"learned", PriorMode::kLearned}, {"uniform", PriorMode::kUniform}},
      "prior of queues without a hand-set prior");
  AddChoiceOption<std::optional<bool>>(
      cmd, "--bigrams", &o->bigrams, {{"on", true}, {"off", false}},
      "also count pairs of adjacent terms (needs kept text)");
  AddChoiceOption<std::optional<NumberMode>>(
      cmd, "--numbers", &o->numbers,
      {{"keep", NumberMode::kKeep}, {"fold", NumberMode::kFold}},
      "keep numbers, or fold them into one term <num> (needs kept text)");
  cmd->add_option_function<int32_t>(
         "--min-length", [o](const int32_t& v) { o->min_length = v; },
         "drop terms shorter than this many characters (needs kept text)")
      ->check(CLI::Range(1, 1000));
  cmd->add_option_function<int32_t>(
         "--max-length", [o](const int32_t& v) { o->max_length = v; },
         "drop terms longer than this many characters (needs kept text)")
      ->check(CLI::Range(1, 1000));
  AddChoiceOption<std::optional<bool>>(
      cmd, "--keep-text", &o->keep_text, {{"on", true}, {"off", false}},
      "keep the text of documents learned from now on (texts kept so far stay "
      "until purge)");
  cmd->footer(
      R"(Settings not given stay as they are. Changing --alpha or --prior needs no
text; changing how documents are tokenized (--bigrams, --numbers,
--min-length, --max-length) recounts every learned document from the text
the store kept, in short transactions beside the current model, and swaps
the result in with one short transaction: routing goes on meanwhile with the
old model, then the new one.

Examples:
  chute rebuild --alpha 0.5
  chute rebuild --bigrams on --candidate
  chute promote)");
  return [o] { return RunRebuild(*o); };
}

}  // namespace chute
