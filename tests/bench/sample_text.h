// Text for the tokenizer micro-benchmark: paragraphs of the kind an intake
// desk receives (letters, forms, e-mails), written for this benchmark, in
// several scripts. Each function repeats its paragraphs, in a fixed order,
// until the text holds at least min_bytes bytes of UTF-8.
#ifndef CHUTE_TESTS_BENCH_SAMPLE_TEXT_H_
#define CHUTE_TESTS_BENCH_SAMPLE_TEXT_H_

#include <cstddef>
#include <string>

namespace chute::bench {

// English prose with numbers, dates, amounts and reference codes.
std::string EnglishText(size_t min_bytes);

// German, French and Spanish prose: Latin letters with diacritics.
std::string EuropeanText(size_t min_bytes);

// Russian and Greek prose.
std::string CyrillicGreekText(size_t min_bytes);

// Japanese and Chinese prose (ICU segments these with its dictionaries).
std::string CjkText(size_t min_bytes);

// A mixed intake: mostly English, with the other paragraphs interleaved in
// roughly the share a European office might see (about 1 in 5 non-English,
// 1 in 20 non-Latin).
std::string MixedText(size_t min_bytes);

}  // namespace chute::bench

#endif  // CHUTE_TESTS_BENCH_SAMPLE_TEXT_H_
