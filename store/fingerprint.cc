#include "store/fingerprint.h"

#include <openssl/evp.h>

#include <algorithm>
#include <charconv>
#include <cstdio>
#include <memory>
#include <numeric>

namespace chute {

// Streams text into SHA-256 through a buffer, so that millions of short
// lines cost one digest update per 64 KiB.
class ModelFingerprinter::Hasher {
 public:
  Hasher() : ctx_(EVP_MD_CTX_new()) { EVP_DigestInit_ex(ctx_.get(), EVP_sha256(), nullptr); }

  void Add(std::string_view s) {
    if (buf_.size() + s.size() > kFlushAt) Flush();
    buf_.append(s);
  }
  void Add(int64_t v) {
    char tmp[24];
    auto r = std::to_chars(tmp, tmp + sizeof tmp, v);
    Add(std::string_view(tmp, static_cast<size_t>(r.ptr - tmp)));
  }
  void Add(double v) {
    char tmp[32];
    auto r = std::to_chars(tmp, tmp + sizeof tmp, v);
    Add(std::string_view(tmp, static_cast<size_t>(r.ptr - tmp)));
  }
  // <length>:<bytes>, so that no byte inside can be read as a separator.
  void AddSized(std::string_view s) {
    Add(static_cast<int64_t>(s.size()));
    Add(":");
    Add(s);
  }

  std::string Hex() {
    Flush();
    unsigned char md[EVP_MAX_MD_SIZE];
    unsigned int n = 0;
    EVP_DigestFinal_ex(ctx_.get(), md, &n);
    static constexpr char kHex[] = "0123456789abcdef";
    std::string out;
    for (unsigned int i = 0; i < n; ++i) {
      out.push_back(kHex[md[i] >> 4]);
      out.push_back(kHex[md[i] & 15]);
    }
    return out;
  }

 private:
  static constexpr size_t kFlushAt = 1 << 16;
  void Flush() {
    EVP_DigestUpdate(ctx_.get(), buf_.data(), buf_.size());
    buf_.clear();
  }
  struct Free {
    void operator()(EVP_MD_CTX* c) const { EVP_MD_CTX_free(c); }
  };
  std::unique_ptr<EVP_MD_CTX, Free> ctx_;
  std::string buf_;
};

ModelFingerprinter::ModelFingerprinter(const StoreSettings& settings,
                                       const std::vector<QueueCounts>& queues)
    : hasher_(std::make_unique<Hasher>()) {
  Hasher& h = *hasher_;
  const TokenizerOptions& t = settings.tokenizer;
  const ModelOptions& m = settings.model;
  h.Add("chute-model 1\nalpha ");
  h.Add(m.alpha);
  h.Add(m.prior == PriorMode::kUniform ? "\nprior uniform" : "\nprior learned");
  h.Add(t.bigrams ? "\nbigrams on" : "\nbigrams off");
  h.Add(t.numbers == NumberMode::kFold ? "\nnumbers fold" : "\nnumbers keep");
  h.Add("\nmin_length ");
  h.Add(static_cast<int64_t>(t.min_length));
  h.Add("\nmax_length ");
  h.Add(static_cast<int64_t>(t.max_length));
  h.Add("\n");

  for (size_t q = 0; q < queues.size(); ++q) {
    if (queues[q].documents > 0) order_.push_back(q);
  }
  std::sort(order_.begin(), order_.end(),
            [&](size_t a, size_t b) { return queues[a].name < queues[b].name; });
  for (size_t q : order_) {
    const QueueCounts& qc = queues[q];
    h.Add("q ");
    h.AddSized(qc.name);
    h.Add(" ");
    h.Add(qc.documents);
    h.Add(" ");
    h.Add(qc.tokens);
    h.Add(" ");
    if (qc.set_prior) {
      h.Add(*qc.set_prior);
    } else {
      h.Add("-");
    }
    h.Add("\n");
  }
}

ModelFingerprinter::~ModelFingerprinter() = default;

void ModelFingerprinter::AddRow(std::string_view term, const int64_t* row) {
  Hasher& h = *hasher_;
  for (size_t i = 0; i < order_.size(); ++i) {
    if (row[order_[i]] == 0) continue;
    h.Add("t ");
    h.AddSized(term);
    h.Add(" ");
    h.Add(static_cast<int64_t>(i));
    h.Add(" ");
    h.Add(row[order_[i]]);
    h.Add("\n");
  }
}

std::string ModelFingerprinter::Hex() { return hasher_->Hex(); }

std::string ModelFingerprint(const StoreSettings& settings, const ModelCounts& counts) {
  ModelFingerprinter f(settings, counts.queues);
  const size_t nq = counts.queues.size();
  for (size_t row = 0; row < counts.terms.size(); ++row) {
    f.AddRow(counts.terms[row], counts.counts.data() + row * nq);
  }
  return f.Hex();
}

}  // namespace chute
