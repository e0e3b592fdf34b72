// Micro-benchmarks of the scorer: chute::Model::Build from synthetic counts
// (8 queues × 50,000 terms by default) and the per-document path a route
// takes, Model::ToRows then Model::Decide (documents/s).
//
// The counts are synthetic and seeded: each queue draws its terms from a
// Zipf distribution over the vocabulary (term frequencies in text follow
// Zipf's law: Zipf, "Human Behavior and the Principle of Least Effort",
// 1949; Manning, Raghavan & Schütze, Introduction to Information Retrieval,
// 2008, §5.1.2), each queue over its own shuffled ranking, so queues share
// terms but favour different ones.
#include <benchmark/benchmark.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <numeric>
#include <random>
#include <string>
#include <vector>

#include "classify/model.h"
#include "classify/model_counts.h"

namespace chute::bench {
namespace {

constexpr uint64_t kSeed = 20240611;
constexpr double kZipfExponent = 1.0;  // common practice for word frequencies

// A pronounceable pseudo-word for row r, distinct for distinct r (the
// syllable sequence is r written in base 24, plus a tail that keeps words of
// varied length).
std::string PseudoWord(uint64_t r) {
  static constexpr const char* kSyllables[] = {
      "ka", "re", "mi", "to", "su", "lan", "dor", "pe", "vi", "no", "tra",
      "ches", "ment", "al", "ion", "ber", "gu", "fo", "sta", "ri", "qu",
      "ow", "ex", "ly"};
  constexpr uint64_t kBase = std::size(kSyllables);
  std::string w;
  do {
    w += kSyllables[r % kBase];
    r /= kBase;
  } while (r != 0);
  return w;
}

// Cumulative Zipf weights over n ranks.
std::vector<double> ZipfCumulative(size_t n) {
  std::vector<double> c(n);
  double sum = 0;
  for (size_t i = 0; i < n; ++i) {
    sum += 1.0 / std::pow(static_cast<double>(i + 1), kZipfExponent);
    c[i] = sum;
  }
  return c;
}

size_t DrawRank(const std::vector<double>& cumulative, std::mt19937_64& rng) {
  std::uniform_real_distribution<double> u(0.0, cumulative.back());
  return static_cast<size_t>(
      std::upper_bound(cumulative.begin(), cumulative.end(), u(rng)) -
      cumulative.begin()) %
         cumulative.size();
}

struct Synthetic {
  ModelCounts counts;
  // Per queue: rank -> row.
  std::vector<std::vector<uint32_t>> ranking;
  std::vector<double> cumulative;
};

// Counts of `queues` queues over `terms` terms, about `tokens_per_queue`
// tokens each (scaled down for the skewed later queues).
Synthetic MakeCounts(size_t queues, size_t terms, int64_t tokens_per_queue) {
  std::mt19937_64 rng(kSeed);
  Synthetic s;
  s.cumulative = ZipfCumulative(terms);
  s.counts.terms.reserve(terms);
  for (size_t r = 0; r < terms; ++r) s.counts.terms.push_back(PseudoWord(r));
  s.counts.counts.assign(terms * queues, 0);
  for (size_t q = 0; q < queues; ++q) {
    std::vector<uint32_t> rank(terms);
    std::iota(rank.begin(), rank.end(), 0u);
    // The first 200 ranks (function words) are shared by all queues; the
    // rest is shuffled per queue.
    std::shuffle(rank.begin() + std::min<size_t>(200, terms), rank.end(), rng);
    const int64_t tokens = tokens_per_queue / static_cast<int64_t>(q + 1);
    for (int64_t i = 0; i < tokens; ++i) {
      ++s.counts.counts[rank[DrawRank(s.cumulative, rng)] * queues + q];
    }
    QueueCounts qc;
    qc.name = "queue" + std::to_string(q);
    qc.tokens = tokens;
    qc.documents = std::max<int64_t>(1, tokens / 800);
    s.counts.queues.push_back(qc);
    s.ranking.push_back(std::move(rank));
  }
  return s;
}

// Terms of a document of `length` tokens drawn like queue q's text, with
// about 3 in 100 tokens that the model has never seen.
std::vector<std::string> MakeDocument(const Synthetic& s, size_t q,
                                      size_t length, std::mt19937_64& rng) {
  std::vector<std::string> doc;
  doc.reserve(length);
  std::uniform_int_distribution<int> percent(0, 99);
  for (size_t i = 0; i < length; ++i) {
    if (percent(rng) < 3) {
      doc.push_back("unseen" + std::to_string(rng() % 100000));
    } else {
      doc.push_back(s.counts.terms[s.ranking[q][DrawRank(s.cumulative, rng)]]);
    }
  }
  return doc;
}

// Arguments: queues, terms.
void BM_ModelBuild(benchmark::State& state) {
  const Synthetic s = MakeCounts(static_cast<size_t>(state.range(0)),
                                 static_cast<size_t>(state.range(1)),
                                 4'000'000);
  ModelOptions options;
  size_t vocabulary = 0;
  for (auto _ : state) {
    Model m = Model::Build(s.counts, options);
    vocabulary = m.vocabulary_size();
    benchmark::DoNotOptimize(vocabulary);
  }
  state.SetItemsProcessed(static_cast<int64_t>(state.iterations()) *
                          state.range(1));
  state.counters["vocabulary"] = static_cast<double>(vocabulary);
}
BENCHMARK(BM_ModelBuild)
    ->Args({8, 50'000})
    ->Unit(benchmark::kMillisecond)
    ->Iterations(5);

// Arguments: queues, terms, tokens per document. One Model, 64 documents
// taken in turn; each iteration routes one document (ToRows + Decide).
void BM_RouteDocument(benchmark::State& state) {
  const size_t queues = static_cast<size_t>(state.range(0));
  const Synthetic s =
      MakeCounts(queues, static_cast<size_t>(state.range(1)), 4'000'000);
  const Model model = Model::Build(s.counts, ModelOptions{});
  std::mt19937_64 rng(kSeed + 1);
  std::vector<std::vector<std::string>> docs;
  for (size_t i = 0; i < 64; ++i) {
    docs.push_back(
        MakeDocument(s, i % queues, static_cast<size_t>(state.range(2)), rng));
  }
  DocumentRows rows;
  int64_t unknown = 0;
  size_t i = 0;
  int64_t terms = 0;
  for (auto _ : state) {
    const std::vector<std::string>& doc = docs[i++ % docs.size()];
    model.ToRows(doc, &rows, &unknown);
    Decision d = model.Decide(rows, unknown);
    benchmark::DoNotOptimize(d.ranked.data());
    terms += static_cast<int64_t>(doc.size());
  }
  state.SetItemsProcessed(static_cast<int64_t>(state.iterations()));
  state.counters["terms_per_s"] =
      benchmark::Counter(static_cast<double>(terms), benchmark::Counter::kIsRate);
}
BENCHMARK(BM_RouteDocument)
    ->Args({8, 50'000, 100})
    ->Args({8, 50'000, 1'000})
    ->Args({8, 50'000, 4'000});

}  // namespace
}  // namespace chute::bench
