// Micro-benchmarks of the tokenizer: chute::Tokenizer::Tokenize on intake
// text in several scripts (bytes/s of UTF-8 input), and, to tell the parts
// apart, chute::Segmenter::Split alone on the same text.
#include <benchmark/benchmark.h>

#include <string>
#include <vector>

#include <unicode/ustring.h>

#include "tests/bench/sample_text.h"
#include "tokenize/segmenter.h"
#include "tokenize/tokenizer.h"

namespace chute::bench {
namespace {

using MakeText = std::string (*)(size_t);

// Tokenizes one document of state.range(0) bytes (rounded up to whole
// paragraphs) again and again with one Tokenizer, as a command does.
void BM_Tokenize(benchmark::State& state, MakeText make, bool bigrams) {
  const std::string text = make(static_cast<size_t>(state.range(0)));
  TokenizerOptions options;
  options.bigrams = bigrams;
  Tokenizer tokenizer(options);
  std::vector<std::string> terms;
  for (auto _ : state) {
    tokenizer.Tokenize(text, &terms);
    benchmark::DoNotOptimize(terms.data());
    benchmark::ClobberMemory();
  }
  state.SetBytesProcessed(static_cast<int64_t>(state.iterations()) *
                          static_cast<int64_t>(text.size()));
  state.counters["terms"] = static_cast<double>(terms.size());
  state.counters["terms_per_s"] = benchmark::Counter(
      static_cast<double>(terms.size()) *
          static_cast<double>(state.iterations()),
      benchmark::Counter::kIsRate);
}

BENCHMARK_CAPTURE(BM_Tokenize, english, &EnglishText, false)
    ->Arg(4 << 10)
    ->Arg(64 << 10);
BENCHMARK_CAPTURE(BM_Tokenize, european, &EuropeanText, false)->Arg(4 << 10);
BENCHMARK_CAPTURE(BM_Tokenize, cyrillic_greek, &CyrillicGreekText, false)
    ->Arg(4 << 10);
BENCHMARK_CAPTURE(BM_Tokenize, cjk, &CjkText, false)->Arg(4 << 10);
BENCHMARK_CAPTURE(BM_Tokenize, mixed, &MixedText, false)->Arg(4 << 10);
BENCHMARK_CAPTURE(BM_Tokenize, english_bigrams, &EnglishText, true)
    ->Arg(4 << 10);

// Word segmentation alone (ICU's UAX #29 iterator through chute::Segmenter)
// on the UTF-16 form of the same text: the share of Tokenize that ICU's
// break iterator takes.
void BM_Segment(benchmark::State& state, MakeText make) {
  const std::string utf8 = make(static_cast<size_t>(state.range(0)));
  std::u16string text(utf8.size(), u'\0');
  int32_t length = 0;
  UErrorCode status = U_ZERO_ERROR;
  u_strFromUTF8(reinterpret_cast<UChar*>(text.data()),
                static_cast<int32_t>(text.size()), &length, utf8.data(),
                static_cast<int32_t>(utf8.size()), &status);
  if (U_FAILURE(status)) {
    state.SkipWithError("UTF-8 to UTF-16 failed");
    return;
  }
  text.resize(static_cast<size_t>(length));
  Segmenter segmenter;
  std::vector<Segment> segments;
  for (auto _ : state) {
    segmenter.Split(text, &segments);
    benchmark::DoNotOptimize(segments.data());
    benchmark::ClobberMemory();
  }
  state.SetBytesProcessed(static_cast<int64_t>(state.iterations()) *
                          static_cast<int64_t>(utf8.size()));
  state.counters["segments"] = static_cast<double>(segments.size());
}

BENCHMARK_CAPTURE(BM_Segment, english, &EnglishText)->Arg(4 << 10);
BENCHMARK_CAPTURE(BM_Segment, mixed, &MixedText)->Arg(4 << 10);

}  // namespace
}  // namespace chute::bench
