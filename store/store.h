// The store: one SQLite file that holds a model's settings, queues,
// vocabulary, per-queue counts and the ledger of learned documents
// (schema.h describes every table). The only place in chute that knows SQL.
//
// WAL mode: readers never block the writer. Every change is one
// transaction, taken with BEGIN IMMEDIATE and a busy timeout, so it happens
// whole or not at all. The file is created with mode 0600.
//
// Not thread-safe: one Store per thread (SQLite connections are cheap).
#ifndef CHUTE_STORE_STORE_H_
#define CHUTE_STORE_STORE_H_

#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "classify/model_counts.h"
#include "store/learn_batch.h"
#include "store/sqlite.h"
#include "store/status.h"
#include "store/store_settings.h"
#include "store/term_counts_codec.h"

namespace chute {

// How long a writer waits for another writer's lock before giving up.
inline constexpr int kBusyTimeoutMs = 60000;

struct QueueInfo {
  std::string name;
  int64_t documents = 0;
  int64_t tokens = 0;          // N(q)
  int64_t distinct_terms = 0;  // terms with N(q, w) > 0
  std::optional<double> set_prior;
};

struct LedgerEntry {
  std::string digest;
  std::string queue;
  std::string source;
  std::string learned_at;
  int64_t tokens = 0;
};

// A learned document with its own term counts, as the ledger keeps it.
struct LedgerDocument {
  std::string digest;
  std::string queue;
  std::string source;
  std::string learned_at;
  int64_t tokens = 0;
  std::vector<TermCount> terms;  // sorted by term bytes, counts > 0
};

// What happened to each document of a LearnBatch, in batch order.
enum class LearnOutcome {
  kLearned,
  kAlreadyLearned,  // same digest, same queue: nothing changed
  kOtherQueue,      // same digest learned under another queue: refused
};

struct LearnResult {
  std::vector<LearnOutcome> outcomes;
  // For kOtherQueue and kAlreadyLearned: the queue the digest is learned under.
  std::vector<std::string> known_queue;
  int64_t learned = 0;
  int64_t new_terms = 0;  // terms the vocabulary did not have
};

class Store {
 public:
  // Creates a new store at path with the given settings. Fails when the file
  // exists. REQUIRES: settings valid (see cli/common_options.h).
  static Status Create(const std::string& path, const StoreSettings& settings,
                       std::unique_ptr<Store>* out);
  // Opens an existing store, upgrading an older schema. Fails with a clear
  // message for a missing file, a file that is not a chute store, or a store
  // of a newer schema.
  static Status Open(const std::string& path, std::unique_ptr<Store>* out);

  Store(const Store&) = delete;  // owns the connection
  Store& operator=(const Store&) = delete;

  const std::string& path() const { return path_; }
  const StoreSettings& settings() const { return settings_; }

  // Queues ordered by name.
  Status ListQueues(std::vector<QueueInfo>* out);
  // |V|: the number of terms with a non-zero count.
  Status VocabularySize(int64_t* out);
  // The counts a Model is built from, queues ordered by name, terms by id.
  Status LoadModelCounts(ModelCounts* out);
  // The ledger entry of a digest; *out is empty when it is not learned.
  Status FindDocument(const std::string& digest,
                      std::optional<LedgerEntry>* out);

  // Calls fn for every learned document, in the order they were learned,
  // inside one read transaction (a consistent view). Fails on a ledger blob
  // that does not decode.
  Status ReadLedger(const std::function<void(LedgerDocument&)>& fn);

  // Learns a batch in one transaction. Queues are created on demand;
  // documents already in the ledger are not counted again (see
  // LearnOutcome); counts are summed in memory and written in key order.
  // `now` is the RFC 3339 UTC time recorded in the ledger.
  Status Learn(const LearnBatch& batch, const std::string& now,
               LearnResult* result);

  // Sets (or with nullopt clears) a queue's hand-set prior.
  // REQUIRES: 0 < prior < 1. Fails when the queue does not exist or the hand-
  // set priors would sum to more than 1.
  Status SetPrior(const std::string& queue, std::optional<double> prior);

 private:
  Store(std::string path, sql::DbHandle db);
  Status LoadSettings();
  Status SaveSettings(const StoreSettings& settings);

  std::string path_;
  sql::DbHandle db_;
  StoreSettings settings_;
  // Prepared once: learn asks for every document it reads.
  sql::Statement find_document_;
};

}  // namespace chute

#endif  // CHUTE_STORE_STORE_H_
