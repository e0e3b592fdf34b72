#include "store/store_settings.h"

#include <charconv>
#include <cmath>
#include <set>
#include <string_view>

namespace chute {

namespace {

bool ParseDouble(std::string_view s, double* v) {
  auto r = std::from_chars(s.data(), s.data() + s.size(), *v);
  return r.ec == std::errc() && r.ptr == s.data() + s.size();
}

bool ParseInt(std::string_view s, int32_t* v) {
  auto r = std::from_chars(s.data(), s.data() + s.size(), *v);
  return r.ec == std::errc() && r.ptr == s.data() + s.size();
}

std::string FormatDouble(double v) {
  char buf[32];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, r.ptr);
}

}  // namespace

std::vector<std::pair<std::string, std::string>> EncodeSettings(const StoreSettings& settings) {
  const TokenizerOptions& t = settings.tokenizer;
  const ModelOptions& m = settings.model;
  return {
      {"alpha", FormatDouble(m.alpha)},
      {"prior", m.prior == PriorMode::kUniform ? "uniform" : "learned"},
      {"bigrams", t.bigrams ? "on" : "off"},
      {"numbers", t.numbers == NumberMode::kFold ? "fold" : "keep"},
      {"min_length", std::to_string(t.min_length)},
      {"max_length", std::to_string(t.max_length)},
      {"keep_text", settings.keep_text ? "on" : "off"},
  };
}

bool SameTokenizing(const StoreSettings& a, const StoreSettings& b) {
  const TokenizerOptions& x = a.tokenizer;
  const TokenizerOptions& y = b.tokenizer;
  return x.bigrams == y.bigrams && x.numbers == y.numbers && x.min_length == y.min_length &&
         x.max_length == y.max_length;
}

bool DecodeSettings(
    const std::vector<std::pair<std::string, std::string>>& rows,
    StoreSettings* out, std::string* why) {
  StoreSettings s;
  std::set<std::string> seen;
  auto bad = [&](const std::string& key, const std::string& value) {
    *why = "setting " + key + " has the value '" + value +
           "', which chute cannot use";
    return false;
  };
  for (const auto& [key, value] : rows) {
    bool known = true, good = true;
    if (key == "alpha") {
      good = ParseDouble(value, &s.model.alpha) &&
             std::isfinite(s.model.alpha) && s.model.alpha > 0;
    } else if (key == "prior") {
      good = value == "learned" || value == "uniform";
      s.model.prior =
          value == "uniform" ? PriorMode::kUniform : PriorMode::kLearned;
    } else if (key == "bigrams") {
      good = value == "on" || value == "off";
      s.tokenizer.bigrams = value == "on";
    } else if (key == "numbers") {
      good = value == "keep" || value == "fold";
      s.tokenizer.numbers =
          value == "fold" ? NumberMode::kFold : NumberMode::kKeep;
    } else if (key == "min_length") {
      good = ParseInt(value, &s.tokenizer.min_length) &&
             s.tokenizer.min_length >= 1;
    } else if (key == "max_length") {
      good = ParseInt(value, &s.tokenizer.max_length);
    } else if (key == "keep_text") {
      good = value == "on" || value == "off";
      s.keep_text = value == "on";
    } else {
      known = false;
    }
    if (!known) continue;
    if (!good) return bad(key, value);
    if (!seen.insert(key).second) {
      *why = "setting " + key + " appears twice";
      return false;
    }
  }
  for (const char* key :
       {"alpha", "prior", "bigrams", "numbers", "min_length", "max_length"}) {
    if (seen.count(key) == 0) {
      *why = std::string("setting ") + key + " is missing";
      return false;
    }
  }
  if (s.tokenizer.max_length < s.tokenizer.min_length) {
    *why = "setting max_length (" + std::to_string(s.tokenizer.max_length) +
           ") is below min_length (" + std::to_string(s.tokenizer.min_length) +
           ")";
    return false;
  }
  *out = s;
  return true;
}

}  // namespace chute
