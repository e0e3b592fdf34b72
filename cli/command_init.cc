// chute init: creates a store with the model settings fixed for its life.
#include <CLI/CLI.hpp>

#include <cmath>


#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/number.h"

namespace chute {

namespace {

struct InitOptions {
  std::string db;
  StoreSettings settings;
  std::string by;
};

int RunInit(const InitOptions& o) {
  if (o.settings.tokenizer.min_length > o.settings.tokenizer.max_length) {
    Report("init", "--min-length is greater than --max-length");
    return kExitUsage;
  }
  std::unique_ptr<Store> store;
  Status s = Store::Create(o.db, o.settings, &store, ChangeInfo{NowRfc3339(), o.by});
  if (!s.ok()) {
    Report("init", s.message());
    return kExitFailed;
  }
  const StoreSettings& st = o.settings;
  Print("created " + o.db + " (alpha " + FormatShortest(st.model.alpha) + ", prior " +
        (st.model.prior == PriorMode::kUniform ? "uniform" : "learned") + ", bigrams " +
        (st.tokenizer.bigrams ? "on" : "off") + ", numbers " +
        (st.tokenizer.numbers == NumberMode::kFold ? "fold" : "keep") + ", terms of " +
        std::to_string(st.tokenizer.min_length) + " to " +
        std::to_string(st.tokenizer.max_length) + " characters, keep text " +
        (st.keep_text ? "on" : "off") + ")\n");
  return kExitDone;
}

}  // namespace

CommandRun SetupInit(CLI::App* cmd) {
  auto o = std::make_shared<InitOptions>();
  AddDbOption(cmd, &o->db);
  AddByOption(cmd, &o->by);
  StoreSettings& st = o->settings;
  cmd->add_option("--alpha", st.model.alpha,
                  "smoothing added to every count: 1 is Laplace, 0 < alpha < 1 Lidstone (default 1)")
      ->check(PositiveReal())
      ->type_name("ALPHA");
  AddChoiceOption<PriorMode>(cmd, "--prior", &st.model.prior,
                             {{"learned", PriorMode::kLearned}, {"uniform", PriorMode::kUniform}},
                             "prior of queues without a hand-set prior: learned (their share of "
                             "the documents, default) or uniform");
  AddChoiceOption<bool>(cmd, "--bigrams", &st.tokenizer.bigrams, {{"on", true}, {"off", false}},
                        "also count pairs of adjacent terms (default off)");
  AddChoiceOption<NumberMode>(cmd, "--numbers", &st.tokenizer.numbers,
                              {{"keep", NumberMode::kKeep}, {"fold", NumberMode::kFold}},
                              "keep every number as a term of its own, or fold all numbers into "
                              "one term <num> (default keep)");
  cmd->add_option("--min-length", st.tokenizer.min_length,
                  "drop terms shorter than this many characters (default 1)")
      ->check(CLI::Range(1, 1000));
  cmd->add_option("--max-length", st.tokenizer.max_length,
                  "drop terms longer than this many characters (default 64)")
      ->check(CLI::Range(1, 1000));
  AddChoiceOption<bool>(cmd, "--keep-text", &st.keep_text, {{"on", true}, {"off", false}},
                        "keep each learned document's text, compressed, so that a later "
                        "rebuild can count it again under new settings (default on)");
  cmd->footer(R"(The settings are fixed for the life of the store. With --keep-text off the
store keeps no text: a later rebuild can change the smoothing and priors, but
not the tokenizer settings, and takes less room.

Examples:
  chute init --db harbour.db
  chute init --db harbour.db --alpha 0.5 --bigrams on --numbers fold
  chute init --db harbour.db --keep-text off)");
  return [o] { return RunInit(*o); };
}

}  // namespace chute
