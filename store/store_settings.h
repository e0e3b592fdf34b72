#ifndef CHUTE_STORE_STORE_SETTINGS_H_
#define CHUTE_STORE_STORE_SETTINGS_H_

#include <string>
#include <utility>
#include <vector>

#include "classify/model_counts.h"
#include "tokenize/tokenizer_options.h"

namespace chute {

// Everything fixed at `init` and saved in the store's settings table.
struct StoreSettings {
  TokenizerOptions tokenizer;
  ModelOptions model;
  // Keep each learned document's text in the ledger, zstd-compressed
  // (text_codec.h), so that a later rebuild can recount it under new
  // tokenizer settings. Setting keep_text, "on" or "off".
  bool keep_text = true;
};

// The settings table's (key, value) rows for settings, in a fixed order.
std::vector<std::pair<std::string, std::string>> EncodeSettings(const StoreSettings& settings);

// True when two settings tokenize every document alike (the ledger's term
// counts made under one are valid under the other).
bool SameTokenizing(const StoreSettings& a, const StoreSettings& b);

// Reads the settings table's (key, value) rows. Returns false, with the
// reason in plain words in *why, when a setting is missing, repeated or has
// a value chute cannot use (alpha not a positive number, an unknown word,
// a minimum length below 1 or a maximum below the minimum). Keys chute does
// not know are ignored.
bool DecodeSettings(
    const std::vector<std::pair<std::string, std::string>>& rows,
    StoreSettings* out, std::string* why);

}  // namespace chute

#endif  // CHUTE_STORE_STORE_SETTINGS_H_
