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

#include <array>
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "classify/model_counts.h"
#include "store/decision_log.h"
#include "store/fingerprint.h"
#include "store/learn_batch.h"
#include "store/sqlite.h"
#include "store/status.h"
#include "store/store_settings.h"
#include "store/term_counts_codec.h"
#include "store/version_codec.h"

namespace chute {

// How long a writer waits for another writer's lock before giving up.
inline constexpr int kBusyTimeoutMs = 60000;

struct QueueInfo {
  std::string name;
  int64_t documents = 0;
  int64_t tokens = 0;          // N(q)
  int64_t distinct_terms = 0;  // terms with N(q, w) > 0
  std::optional<double> set_prior;
  bool retired = false;  // routes nothing; its documents are out of the model
};

struct LedgerEntry {
  std::string digest;
  std::string queue;
  std::string source;
  std::string learned_at;
  int64_t tokens = 0;
  // False for a document kept only for history: a rollback took it out of
  // the model, or its queue was retired. It routes nothing and a new learn
  // of it counts it again.
  bool in_model = true;
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
  kCorrected,       // same digest learned under another queue: its stored
                    // counts were moved to this document's queue
};

struct LearnResult {
  std::vector<LearnOutcome> outcomes;
  // For kCorrected and kAlreadyLearned: the queue the digest was learned
  // under just before this document (for kCorrected, the queue it left).
  std::vector<std::string> known_queue;
  int64_t learned = 0;
  int64_t corrected = 0;
  int64_t new_terms = 0;  // terms the vocabulary did not have
};

// The store's clock: now, RFC 3339 UTC, to the second. Used when a
// ChangeInfo leaves `now` empty.
std::string StoreClockNow();

// Who makes a change, and when; recorded with the version the change makes.
struct ChangeInfo {
  std::string now;  // RFC 3339 UTC; empty: the store's clock
  std::string by;   // the person or job that asked for the change
};

// One committed change of the model (see schema.h, "versions").
struct VersionInfo {
  int64_t version = 0;
  std::string time;     // RFC 3339 UTC
  std::string command;  // init, learn, correct, forget, rebuild, promote, ...
  std::string by;
  int64_t added = 0;    // documents that entered the model
  int64_t moved = 0;    // documents moved between queues
  int64_t removed = 0;  // documents that left the model
  std::string fingerprint;  // fingerprint.h, of the model after the change
  std::string details;      // JSON kept with the version (promote), or empty
};

// What the model of a version was made of: its settings, its queues and
// which learned documents it counted, in which queue. Documents forgotten
// since are not among the members (forget erases them from the history).
struct VersionState {
  VersionInfo info;
  StoreSettings settings;
  std::vector<VersionQueue> queues;
  std::vector<std::pair<int64_t, int64_t>> members;  // (ledger id, queue id), by ledger id
};

// A document entering the model (from_queue 0), leaving it (to_queue 0) or
// moving between queues; queue and ledger ids as in the store.
struct MemberChange {
  int64_t ledger_id = 0;
  int64_t from_queue = 0;
  int64_t to_queue = 0;
};

// What a change did to the model, for its version row and the change log.
struct VersionDelta {
  int64_t added = 0;
  int64_t moved = 0;
  int64_t removed = 0;
  std::vector<MemberChange> changes;
  std::string details;  // JSON, or empty
};

struct RollbackResult {
  VersionInfo made;  // the new version the rollback created
  int64_t added = 0, moved = 0, removed = 0;
};

// A snapshot of the membership is written every this many versions, so a
// version's model is found from at most this many versions of change log.
inline constexpr int64_t kSnapshotEvery = 64;

// How a user names a learned document. Tried in this order: the exact
// digest of the file as it is now, the stored source path, a digest prefix.
// Empty fields are skipped.
struct DocumentName {
  std::string digest;  // SHA-256 of a file's current bytes, lowercase hex
  std::string source;  // a source path as the ledger stores it
  std::string prefix;  // lowercase hex, 8 to 64 digits
};

struct Resolution {
  enum class Kind { kFound, kAmbiguous, kUnknown };
  Kind kind = Kind::kUnknown;
  LedgerEntry entry;                    // kFound
  std::vector<std::string> candidates;  // kAmbiguous: some matching digests
};

// One line of a correction: the learned document `digest` belongs in
// `queue` (created when missing).
struct CorrectMove {
  std::string digest;
  std::string queue;
};

struct CorrectResult {
  // Per move, in order: the queue the document was in just before it (equal
  // to the move's queue when nothing changed).
  std::vector<std::string> from;
  int64_t moved = 0;
  LearnResult learned;  // the batch of new documents
};

struct ForgetResult {
  std::vector<LedgerEntry> forgotten;  // in the order asked
  int64_t removed_terms = 0;           // terms whose count reached zero
  // Digests asked for that were never learned but were in the decision log
  // (routed into folders) or among unreadable files: erased from there.
  std::vector<std::string> log_only;
  int64_t decisions = 0;  // decision log rows erased (all digests)
  // False when other connections kept reading so long that the write-ahead
  // log could not be emptied (the old pages stay there until the next
  // checkpoint).
  bool checkpointed = false;
};

// A document's term counts under a rebuild's tokenizing settings.
struct RecountedDocument {
  int64_t ledger_id = 0;
  int64_t tokens = 0;            // sum of the counts; > 0
  std::vector<TermCount> terms;  // sorted by bytes, distinct, counts > 0
};

// Recounts one kept text (doc->ledger_id is set by the caller). Fails, with
// a reason, for a text that gives no term under the new settings.
using RecountFunction = std::function<Status(const std::string& text, RecountedDocument* doc)>;

// A recount in progress, or kept for a candidate (schema.h: rebuild).
struct RecountInfo {
  int64_t base_version = 0;  // the current version when it began
  StoreSettings settings;    // the settings it counts with
  std::string started;
  std::string by;
};

// What a swap did besides renaming the recounted tables into place.
struct SwapResult {
  VersionInfo made;        // the version it recorded
  int64_t caught_up = 0;   // documents learned meanwhile, recounted in the swap
  int64_t resynced = 0;    // documents whose membership changed meanwhile
};

// A model that `promote` may make current (schema.h: candidate).
struct Candidate {
  std::string kind;  // "rebuild" or "correct"
  int64_t base_version = 0;
  std::string made;
  std::string by;
  StoreSettings settings;
  std::vector<VersionQueue> queues;                  // when it was made
  std::vector<std::pair<int64_t, int64_t>> members;  // when it was made
  // Its own corrections, oldest first: from_queue 0 for a document that
  // was not in the model (new, or kept only for history).
  std::vector<MemberChange> moves;
  std::string details;  // the figures of the last refused promotion, or empty
};

// A document whose queue a reviewer changed, newest correction first.
struct Correction {
  int64_t ledger_id = 0;
  int64_t to_queue = 0;  // the queue the newest correction put it in
};

// A ledger entry with its kept text, for a rebuild that counts documents
// again.
struct LedgerText {
  int64_t ledger_id = 0;
  std::string digest;
  std::string queue;
  bool in_model = true;  // counted in the current model
  std::string learned_at;
  // The text chute tokenized when it learned the document; nullopt when
  // the store keeps no text or the entry was purged.
  std::optional<std::string> text;
};

struct PurgeResult {
  // Ledger entries learned before the cutoff that still held a text or a
  // source path, and so were purged (or, in a dry run, would be); the texts
  // and source paths among them. In queue order of name.
  struct Queue {
    std::string name;
    int64_t entries = 0;
    int64_t texts = 0;
    int64_t sources = 0;
  };
  std::vector<Queue> queues;
  int64_t entries = 0;
  int64_t texts = 0;
  int64_t sources = 0;
  // Decision log rows decided before the cutoff, and unreadable files first
  // seen before it: deleted whole (they hold paths).
  int64_t decisions = 0;
  int64_t unreadable = 0;
  // As ForgetResult::checkpointed; true in a dry run.
  bool checkpointed = false;
};

class Store {
 public:
  // Creates a new store at path with the given settings. Fails when the file
  // exists. REQUIRES: settings valid (see cli/common_options.h).
  // Records version 1 ("init", an empty model).
  static Status Create(const std::string& path, const StoreSettings& settings,
                       std::unique_ptr<Store>* out, const ChangeInfo& change = {});
  // Opens an existing store, upgrading an older schema. Fails with a clear
  // message for a missing file, a file that is not a chute store, or a store
  // of a newer schema.
  static Status Open(const std::string& path, std::unique_ptr<Store>* out);

  Store(const Store&) = delete;  // owns the connection
  Store& operator=(const Store&) = delete;

  const std::string& path() const { return path_; }
  const StoreSettings& settings() const { return settings_; }

  // Queues ordered by name. Without distinct_terms, QueueInfo's
  // distinct_terms stays 0 and counts is not read (a pass over every count).
  enum class TermTally { kWith, kWithout };
  Status ListQueues(std::vector<QueueInfo>* out, TermTally tally = TermTally::kWith);
  // |V|: the number of terms with a non-zero count.
  Status VocabularySize(int64_t* out);
  // The counts a Model is built from, queues ordered by name, terms in byte
  // order of their text (so the model does not depend on learning order).
  // With version, also the current version (read in the same snapshot).
  // Retired queues are left out. settings() is read again in the same
  // snapshot, so that it is the settings these counts were made with even
  // when a rebuild changed them after Open.
  Status LoadModelCounts(ModelCounts* out, VersionInfo* version = nullptr);

  // LoadModelCounts without terms and counts: the queues only.
  Status LoadQueueCounts(ModelCounts* out);

  // Versions, oldest first (those pruned are gone).
  Status ListVersions(std::vector<VersionInfo>* out);
  // The newest version: the current model's.
  Status CurrentVersion(VersionInfo* out);
  // The settings, queues and members of version v, from the nearest
  // snapshot at or before it and the change log. NotFound for a version
  // that does not exist or was pruned.
  Status LoadVersionState(int64_t v, VersionState* out);
  // The counts of version v's model, summed from its members' stored term
  // counts, with the settings it used. Works only while the ledger's term
  // counts were made with v's tokenizing settings (no rebuild changed them
  // since): otherwise InvalidArgument saying so; the documents must then be
  // recounted from their kept text (see the rebuild in cli/).
  Status ModelAtVersion(int64_t v, VersionInfo* info, StoreSettings* settings,
                        ModelCounts* out);
  // Makes the model version v's again, as a new version ("rollback"):
  // documents v counted and the current model does not are counted again
  // (from the ledger), documents it did not count leave the model (kept in
  // the ledger, in_model = 0), moved ones move back; queue names, hand-set
  // priors, retirements and the model settings become v's. Same limits as
  // ModelAtVersion. One transaction.
  Status Rollback(int64_t v, const ChangeInfo& change, RollbackResult* result);
  // Makes the model the one target describes (its members, queues and
  // model settings; target.info is not used) as a new version named
  // `command` with `details` (JSON or empty), in one transaction: the
  // general form of Rollback, for promote. REQUIRES the store's tokenizing
  // settings (InvalidArgument otherwise). Members must be ledger ids.
  Status ApplyState(const VersionState& target, const std::string& command,
                    const ChangeInfo& change, const std::string& details,
                    RollbackResult* result);
  // Drops the history before version `before`: a snapshot is written at
  // `before`, older versions, snapshots and change log rows are deleted.
  // *dropped gets the number of versions deleted.
  Status PruneVersions(int64_t before, int64_t* dropped);
  // The ledger entry of a digest; *out is empty when it is not learned.
  Status FindDocument(const std::string& digest,
                      std::optional<LedgerEntry>* out);

  // Calls fn for every learned document, in the order they were learned,
  // inside one read transaction (a consistent view). Fails on a ledger blob
  // that does not decode.
  Status ReadLedger(const std::function<void(LedgerDocument&)>& fn);
  // LoadModelCounts and ReadLedger from one snapshot: the counts are exactly
  // the sum of the documents given to fn, even while others learn.
  Status ReadCountsAndLedger(ModelCounts* counts,
                             const std::function<void(LedgerDocument&)>& fn);

  // Learns a batch in one transaction. Queues are created on demand;
  // documents already in the ledger are not counted again, and one known
  // under another queue is moved there, as Correct does (see
  // LearnOutcome); counts are summed in memory and written in key order.
  // `now` is the RFC 3339 UTC time recorded in the ledger.
  Status Learn(const LearnBatch& batch, const ChangeInfo& change,
               LearnResult* result);

  // Finds the one learned document a name stands for, or says that none or
  // several do. Prefixes use a range query, digest >= p AND digest < p+"g".
  Status ResolveDocument(const DocumentName& name, Resolution* out);

  // Applies moves in order and learns the batch, all in one transaction.
  // A move takes the document's stored term counts out of its queue
  // (deleting rows that reach zero) and adds them to the new queue, with
  // both queues' documents and N(q); |V| does not change. Fails, changing
  // nothing, when a digest is not learned or a queue name is invalid.
  Status Correct(const std::vector<CorrectMove>& moves, const LearnBatch& batch,
                 const ChangeInfo& change, CorrectResult* result);

  // Unlearns documents exactly, in one transaction: their stored counts are
  // subtracted from their queues (rows that reach zero deleted; terms whose
  // total reaches zero deleted, so |V| stays the number of terms with a
  // non-zero count), the queues' documents and N(q) decremented (a queue
  // left empty stays, and routes nothing) and the ledger rows deleted. The
  // connection runs with PRAGMA secure_delete = ON, so freed content is
  // overwritten with zeros, and after the commit the write-ahead log is
  // checkpointed and truncated (PRAGMA wal_checkpoint(TRUNCATE)).
  // Every decision log row and unreadable-file row of the digests goes too.
  // A digest never learned but in the decision log or among unreadable
  // files is erased from there (ForgetResult::log_only).
  // REQUIRES: digests distinct. Fails, changing nothing, when one is in
  // neither the ledger nor the log.
  Status Forget(const std::vector<std::string>& digests, const ChangeInfo& change,
                ForgetResult* result);

  // --- Rebuild: a recount beside the current counts (store_rebuild.cc) ---
  //
  // BeginRecount drops any earlier recount and any candidate (*replaced
  // says whether there was one), makes the side tables and records the
  // current version as the recount's base. WriteRecounted adds documents to
  // the side tables in one short transaction, each counted in the queue it
  // is in now (documents forgotten meanwhile are skipped). SwapRecount,
  // in one transaction: recounts (with `recount`) documents learned since
  // they were last looked for, brings every document whose membership
  // changed since its recount (the change log since the base version says
  // which; forget keeps the side tables right itself) to its queue, checks
  // that every ledger document is recounted and that every queue has as
  // many documents as the current model, replaces every ledger entry's term
  // counts, renames the recounted vocabulary and counts into place, saves
  // the settings and records a version named `command` with `details`.
  // Readers in a transaction keep the old model; the next read sees the
  // new one. DropRecountLeftovers (its own transaction) then drops the old
  // tables and empties the side tables; SwapRecount calls it.
  Status BeginRecount(const StoreSettings& target, const ChangeInfo& change,
                      int64_t* base_version, bool* replaced);
  Status LoadRecount(std::optional<RecountInfo>* out);
  Status WriteRecounted(const std::vector<RecountedDocument>& docs);
  // Ledger ids with no recount yet, ascending.
  Status UnrecountedDocuments(std::vector<int64_t>* ids);
  // Ledger entries and those of them without a kept text.
  Status CountKeptTexts(int64_t* documents, int64_t* without_text);
  // Calls fn for each id (skipping those no longer in the ledger) with its
  // kept text, or nullopt.
  Status ReadTextsOf(const std::vector<int64_t>& ids,
                     const std::function<Status(int64_t id, const std::optional<std::string>&)>& fn);
  Status SwapRecount(const std::string& command, const ChangeInfo& change,
                     const std::string& details, const RecountFunction& recount,
                     SwapResult* result);

  // Drops the recount and any candidate (one transaction).
  Status DiscardRecount();

  // Rollback to a version v whose tokenizing settings are not the store's
  // (a rebuild changed them since): with a recount begun with v's settings
  // (BeginRecount) and written, swaps it in and makes the model v's
  // (ApplyState), as one version "rollback" in one transaction.
  // InvalidArgument when the recount's tokenizing is not v's.
  Status RollbackWithRecount(int64_t v, const ChangeInfo& change, const RecountFunction& recount,
                             RollbackResult* result);

  // --- Candidates (store_candidate.cc) ---
  //
  // Makes the candidate a rebuild's: its settings, the current queues and
  // members. With a recount (LoadRecount) of other tokenizing settings, the
  // recount stays for the promotion; otherwise any recount is dropped.
  // Replaces any earlier candidate (*replaced).
  Status SaveRebuildCandidate(const StoreSettings& settings, const ChangeInfo& change,
                              bool* replaced);
  // Like Correct, but into a new candidate (replacing any earlier one and
  // any recount): the current model does not change. Moves are made on
  // the candidate's members; new documents go into the ledger out of the
  // model (in_model = 0) and are members of the candidate only.
  Status CorrectCandidate(const std::vector<CorrectMove>& moves, const LearnBatch& batch,
                          const ChangeInfo& change, CorrectResult* result, bool* replaced);
  Status LoadCandidate(std::optional<Candidate>* out);
  // Keeps the figures of a promotion the gate refused with the candidate.
  Status SetCandidateDetails(const std::string& details);
  // Makes the candidate current, in one transaction, as version "promote"
  // with details: with the store's tokenizing settings, the model becomes
  // the current members with the candidate's own corrections made again,
  // and the candidate's model settings (as ApplyState); with other ones, the
  // recount is swapped in (as SwapRecount). The candidate is removed.
  // NotFound when there is no candidate.
  Status PromoteCandidate(const ChangeInfo& change, const std::string& details,
                          const RecountFunction& recount, RollbackResult* result);
  // The candidate's members as promote would make them: the current
  // members with its own corrections made again (documents forgotten since
  // left out).
  Status CandidateMembers(const Candidate& candidate,
                          std::vector<std::pair<int64_t, int64_t>>* out);
  // The current members (ledger id, queue id), by ledger id.
  Status CurrentMembers(std::vector<std::pair<int64_t, int64_t>>* out);
  // Changes the settings that do not concern tokenizing (smoothing, prior,
  // keep_text) as a new version named `command` with details, in one
  // transaction. InvalidArgument for other tokenizing settings.
  Status ChangeModelSettings(const StoreSettings& settings, const std::string& command,
                             const ChangeInfo& change, const std::string& details,
                             VersionInfo* made);

  // The newest corrections (documents moved between queues, from the change
  // log), each document once, newest first; at most `limit`.
  Status NewestCorrections(int64_t limit, std::vector<Correction>* out);
  // The counts of a model of the given members (ledger id, queue id) over
  // the store's queues that are not retired, by name, terms in byte order:
  // from the ledger's term counts, or (recounted) from the recount's.
  Status CountsOfMembers(const std::vector<std::pair<int64_t, int64_t>>& members,
                         bool recounted, ModelCounts* out);
  // Each document's own term counts, from the ledger or the recount.
  Status DocumentTerms(const std::vector<int64_t>& ids, bool recounted,
                       std::vector<std::vector<TermCount>>* out);
  // Queue id -> name, every queue.
  Status QueueNames(std::vector<std::pair<int64_t, std::string>>* out);

  // Queue changes, each one transaction and a version ("queues").
  // AddQueue: a new, empty queue (routed once it has documents), or a
  // retired one brought back. Fails when an active queue has the name.
  Status AddQueue(const std::string& name, const ChangeInfo& change);
  // RenameQueue: the same queue (id, documents, history) under a new name.
  // Fails when `to` is taken (by an active or retired queue) or invalid.
  Status RenameQueue(const std::string& from, const std::string& to, const ChangeInfo& change);
  // MergeQueue: from's documents and counts are added to into's (N(into, w)
  // += N(from, w)); from is retired. *moved: documents moved.
  Status MergeQueue(const std::string& from, const std::string& into, const ChangeInfo& change,
                    int64_t* moved);
  // RetireQueue: the queue's counts leave the model (terms no other queue
  // has leave the vocabulary); its documents stay in the ledger, out of the
  // model. It routes nothing; AddQueue or learning under its name brings
  // it back, empty. *removed: documents taken out of the model.
  Status RetireQueue(const std::string& name, const ChangeInfo& change, int64_t* removed);

  // Sets (or with nullopt clears) a queue's hand-set prior.
  // REQUIRES: 0 < prior < 1. Fails when the queue does not exist or the hand-
  // set priors would sum to more than 1.
  Status SetPrior(const std::string& queue, std::optional<double> prior,
                  const ChangeInfo& change = {});

  // Calls fn for every ledger entry, in ledger id order, with its kept text
  // unpacked, inside one read transaction (a consistent view). Stops at the
  // first Status fn returns that is not Ok and returns it. Fails with
  // kCorruption, naming the digest, on a kept text that does not unpack.
  // REQUIRES: fn does not write through this Store (its snapshot is open).
  // Cost: one text unpacked at a time; memory of the largest text.
  Status ReadLedgerTexts(const std::function<Status(const LedgerText&)>& fn);

  // Erases the kept text and the source path (both set to NULL) of every
  // ledger entry learned before `before`, and deletes the decision log rows
  // decided before it and unreadable files first seen before it (they hold
  // paths); counts, digests and queues stay,
  // so the model and its version do not change. Runs as Forget does: with
  // PRAGMA secure_delete = ON, in one transaction, then a checkpoint that
  // empties the write-ahead log. With dry_run, only counts what would be
  // purged. REQUIRES: before is RFC 3339 UTC as chute writes it,
  // YYYY-MM-DDTHH:MM:SSZ (then text order is time order); otherwise fails
  // with kInvalidArgument.
  Status Purge(const std::string& before, bool dry_run, PurgeResult* result);

  // --- Routing into folders: the decision log (store_decisions.cc) ---
  //
  // Inserts the decisions with delivered = false in one transaction and
  // sets each record's id. Call before delivering the files.
  Status LogIntended(std::vector<DecisionRecord>* records);
  // Changes the intended destination of an undelivered decision (the name
  // was taken meanwhile and the delivery chose the next one).
  Status SetDestination(int64_t id, const std::string& destination);
  // Marks decisions delivered, in one transaction.
  Status MarkDelivered(const std::vector<int64_t>& ids);
  // Deletes undelivered decisions whose delivery did not happen (the
  // source stayed where it was), in one transaction.
  Status DropIntended(const std::vector<int64_t>& ids);
  // Every undelivered decision, oldest first.
  Status PendingDeliveries(std::vector<DecisionRecord>* out);
  // The digests among `digests` that some delivered decision delivered
  // with mode copy or link (so that --copy and --link skip them).
  Status DeliveredCopies(const std::vector<std::string>& digests,
                         std::vector<std::string>* delivered);
  // Calls fn for each decision the query selects, oldest first (by time,
  // then id), inside one read transaction. Stops at the first Status fn
  // returns that is not Ok and returns it.
  Status ReadDecisions(const DecisionQuery& query,
                       const std::function<Status(const DecisionRecord&)>& fn);
  // Learns `batch` (as Learn: a digest known under another queue is moved)
  // and writes the review marks, in one transaction, as one version
  // "correct". The marks say which decisions these documents came from.
  Status LearnReviewed(const LearnBatch& batch, const std::vector<ReviewMark>& marks,
                       const ChangeInfo& change, LearnResult* result);

  // The digests of documents in the decision log or among unreadable files
  // that a name stands for (as ResolveDocument, over the log: the digest, a
  // source or destination path, a prefix), for forgetting documents that
  // were routed but never learned. Distinct, at most 10.
  Status FindLogged(const DocumentName& name, std::vector<std::string>* digests);

  // Unreadable files: remembered by path; Remember replaces an earlier row
  // of the same path (the file changed). Find gives nullopt when unknown.
  Status RememberUnreadable(const UnreadableFile& file);
  Status FindUnreadable(const std::string& path, std::optional<UnreadableFile>* out);
  Status ForgetUnreadable(const std::string& path);
  Status ListUnreadable(std::vector<UnreadableFile>* out);

  // Every queue's routing rules, by name (one short read, no counts).
  Status QueuePolicies(std::vector<QueuePolicy>* out);
  // Sets (or with nullopt clears) a queue's threshold, 0 < t <= 1, or its
  // minimum of learned documents, >= 0. NotFound for an unknown queue.
  // Not a change of the model: no version.
  Status SetQueueThreshold(const std::string& queue, std::optional<double> threshold);
  Status SetQueueMinDocuments(const std::string& queue, std::optional<int64_t> min_documents);

 private:
  Store(std::string path, sql::DbHandle db);
  Status LoadSettings();
  // Learn, and LearnReviewed with its marks: one transaction, one version
  // named `command`.
  Status LearnAsVersion(const LearnBatch& batch, const std::vector<ReviewMark>& marks,
                        const std::string& command, const ChangeInfo& change,
                        LearnResult* result);
  // Writes review marks (decision_log.h) inside the caller's transaction.
  Status MarkReviewsInTransaction(const std::vector<ReviewMark>& marks, const std::string& now);
  // The bodies of Learn and Correct, inside a transaction the caller holds.
  // Adds the version's members and changes to *delta.
  Status LearnInTransaction(const LearnBatch& batch, const std::string& now,
                            LearnResult* result, VersionDelta* delta);
  // Moves learned documents, in order: (digest, queue id) each to its queue;
  // (*from)[i] gets the queue document i was in. Nothing changes for one
  // already there. A document out of the model enters it in the new queue.
  Status MoveInTransaction(const std::vector<std::pair<std::string, int64_t>>& moves,
                           std::vector<std::string>* from, VersionDelta* delta);
  // Records the change just made as a new version, inside the caller's
  // write transaction (schema.h: versions, changes, snapshots). Computes
  // the fingerprint of the model as it now is. *made (optional) gets it.
  Status RecordVersionInTransaction(const std::string& command, const ChangeInfo& change,
                                    const VersionDelta& delta, VersionInfo* made = nullptr);
  // The members of the current model, (ledger id, queue id) by ledger id.
  Status CurrentMembersInTransaction(std::vector<std::pair<int64_t, int64_t>>* out);
  Status ApplyStateInTransaction(const VersionState& target, const std::string& command,
                                 const ChangeInfo& change, const std::string& details,
                                 RollbackResult* result);
  // The counts of members over the given queues (those not retired are the
  // columns, by name), each document's counts from the ledger or the
  // recount; inside the caller's read or write transaction.
  Status SumMembers(const std::vector<VersionQueue>& queues,
                    const std::vector<std::pair<int64_t, int64_t>>& members, bool recounted,
                    ModelCounts* out);
  // The queues as a version's header lists them, by id.
  Status CurrentQueuesInTransaction(std::vector<VersionQueue>* out);
  // Takes forgotten ledger ids out of the candidate's members and moves.
  Status EraseFromCandidateInTransaction(const std::vector<int64_t>& ids);
  // The side tables' part of Forget: the document's recount leaves them.
  Status ForgetRecountInTransaction(int64_t ledger_id);
  Status WriteRecountedInTransaction(const std::vector<RecountedDocument>& docs);
  // With an empty command, records no version (the caller records one).
  Status SwapRecountInTransaction(const std::string& command, const ChangeInfo& change,
                                  const std::string& details, const RecountFunction& recount,
                                  SwapResult* result);
  Status DropRecountLeftovers();
  // Empties the recount and candidate tables, inside the caller's write
  // transaction; *had_candidate says whether a candidate was there.
  Status ClearCandidateInTransaction(bool* had_candidate);
  // Takes forgotten ledger ids out of every snapshot that holds them.
  Status EraseFromSnapshotsInTransaction(const std::vector<int64_t>& ids);
  // Writes a snapshot of the current membership for version v.
  Status WriteSnapshotInTransaction(int64_t v);
  // The id of a queue, created (validated) when missing.
  Status QueueIdInTransaction(const std::string& name, const std::string& now, int64_t* id,
                              bool* created);
  Status SaveSettings(const StoreSettings& settings);
  // Writes the settings rows and sets settings_, inside the caller's write
  // transaction.
  Status SaveSettingsInTransaction(const StoreSettings& settings);
  // A store upgraded from schema version 1 has no version yet: records
  // version 1 ("upgrade"), with every learned document entering the model.
  Status EnsureFirstVersion();

  std::string path_;
  sql::DbHandle db_;
  // ResolveDocument's statements (by digest, by source, by prefix),
  // prepared on first use.
  std::array<sql::Statement, 3> resolve_statements_;
  StoreSettings settings_;
  // Prepared once: learn asks for every document it reads.
  sql::Statement find_document_;
  // The sum of count digests (fingerprint.h) while a change keeps it up to
  // date row by row: kFresh between changes; kRunning once a change loaded
  // it and updates it with every count it writes; kInvalid once counts were
  // written without updating it (the version then sums every count).
  enum class SumState { kFresh, kRunning, kInvalid };
  SumState sum_state_ = SumState::kFresh;
  CountsSum running_sum_;
  // Loads running_sum_ (settings row counts_sum, else summed from every
  // count) and sets kRunning, when kFresh.
  Status StartRunningSumInTransaction();
};

}  // namespace chute

#endif  // CHUTE_STORE_STORE_H_
