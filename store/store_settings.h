#ifndef CHUTE_STORE_STORE_SETTINGS_H_
#define CHUTE_STORE_STORE_SETTINGS_H_

#include "classify/model_counts.h"
#include "tokenize/tokenizer_options.h"

namespace chute {

// Everything fixed at `init` and saved in the store's settings table.
struct StoreSettings {
  TokenizerOptions tokenizer;
  ModelOptions model;
};

}  // namespace chute

#endif  // CHUTE_STORE_STORE_SETTINGS_H_
