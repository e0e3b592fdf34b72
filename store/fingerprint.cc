#include "store/fingerprint.h"

#include <openssl/evp.h>

#include <algorithm>
#include <charconv>
#include <cstdio>
#include <memory>
#include <numeric>

namespace chute {

namespace {

// Streams text into SHA-256 through a buffer, so that millions of short
// lines cost one digest update per 64 KiB.
class Hasher {
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

// One reusable SHA-256 context for row digests (row digests are many and
// short: a context per row would cost more than the hashing).
class RowHasher {
 public:
  // The digest is fetched once: EVP_sha256() makes OpenSSL 3 look its
  // implementation up again at every initialisation (measured: half of the
  // time of a row digest). OpenSSL, "crypto(7)", section "Explicit
  // fetching", openssl.org/docs/man3.0/man7/crypto.html.
  RowHasher() : ctx_(EVP_MD_CTX_new()), md_(EVP_MD_fetch(nullptr, "SHA256", nullptr)) {}
  ~RowHasher() {
    EVP_MD_CTX_free(ctx_);
    EVP_MD_free(md_);
  }
  RowHasher(const RowHasher&) = delete;
  RowHasher& operator=(const RowHasher&) = delete;

  void Digest(std::string_view term, std::string_view queue, int64_t n, unsigned char out[32]) {
    buf_.clear();
    buf_ += "t ";
    AppendInt(static_cast<int64_t>(term.size()));
    buf_ += ':';
    buf_.append(term);
    buf_ += ' ';
    AppendInt(static_cast<int64_t>(queue.size()));
    buf_ += ':';
    buf_.append(queue);
    buf_ += ' ';
    AppendInt(n);
    unsigned int len = 0;
    EVP_DigestInit_ex2(ctx_, md_ ? md_ : EVP_sha256(), nullptr);
    EVP_DigestUpdate(ctx_, buf_.data(), buf_.size());
    EVP_DigestFinal_ex(ctx_, out, &len);
  }

 private:
  void AppendInt(int64_t v) {
    char tmp[24];
    auto r = std::to_chars(tmp, tmp + sizeof tmp, v);
    buf_.append(tmp, static_cast<size_t>(r.ptr - tmp));
  }
  EVP_MD_CTX* ctx_;
  EVP_MD* md_;  // null when the fetch failed: EVP_sha256() then
  std::string buf_;
};

RowHasher& ThreadRowHasher() {
  thread_local RowHasher hasher;
  return hasher;
}

}  // namespace

void CountsSum::Add(const CountsSum& other) {
  uint64_t carry = 0;
  for (size_t i = 0; i < 4; ++i) {
    const uint64_t t = limbs_[i] + other.limbs_[i];
    const uint64_t c1 = t < other.limbs_[i] ? 1 : 0;
    limbs_[i] = t + carry;
    carry = c1 | (limbs_[i] < t ? 1 : 0);
  }
}

void CountsSum::Add(std::string_view term, std::string_view queue, int64_t n, int sign) {
  unsigned char md[32];
  ThreadRowHasher().Digest(term, queue, n, md);
  // The digest's bytes as a big-endian 256-bit number, into limbs.
  std::array<uint64_t, 4> d{};
  for (int limb = 0; limb < 4; ++limb) {
    uint64_t v = 0;
    for (int b = 0; b < 8; ++b) v = (v << 8) | md[(3 - limb) * 8 + b];
    d[static_cast<size_t>(limb)] = v;
  }
  if (sign >= 0) {
    uint64_t carry = 0;
    for (size_t i = 0; i < 4; ++i) {
      uint64_t t = limbs_[i] + d[i];
      uint64_t c1 = t < d[i] ? 1 : 0;
      limbs_[i] = t + carry;
      carry = c1 | (limbs_[i] < t ? 1 : 0);
    }
  } else {
    uint64_t borrow = 0;
    for (size_t i = 0; i < 4; ++i) {
      uint64_t a = limbs_[i];
      uint64_t r = a - d[i] - borrow;
      borrow = (a < d[i] || (a == d[i] && borrow)) ? 1 : 0;
      limbs_[i] = r;
    }
  }
}

std::string CountsSum::Hex() const {
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out;
  for (size_t limb = 4; limb-- > 0;) {
    for (int shift = 60; shift >= 0; shift -= 4) out.push_back(kHex[(limbs_[limb] >> shift) & 15]);
  }
  return out;
}

bool CountsSum::FromHex(std::string_view hex, CountsSum* out) {
  if (hex.size() != 64) return false;
  CountsSum s;
  for (size_t i = 0; i < 64; ++i) {
    char c = hex[i];
    int v = c >= '0' && c <= '9' ? c - '0' : c >= 'a' && c <= 'f' ? c - 'a' + 10 : -1;
    if (v < 0) return false;
    size_t limb = 3 - i / 16;
    s.limbs_[limb] = (s.limbs_[limb] << 4) | static_cast<uint64_t>(v);
  }
  *out = s;
  return true;
}

CountsSum SumOfCounts(const ModelCounts& counts) {
  CountsSum sum;
  const size_t nq = counts.queues.size();
  for (size_t row = 0; row < counts.terms.size(); ++row) {
    for (size_t q = 0; q < nq; ++q) {
      if (int64_t n = counts.counts[row * nq + q]; n > 0) sum.Add(counts.terms[row], counts.queues[q].name, n);
    }
  }
  return sum;
}

std::string ModelFingerprint(const StoreSettings& settings, const ModelCounts& counts) {
  return ModelFingerprint(settings, counts, SumOfCounts(counts));
}

std::string ModelFingerprint(const StoreSettings& settings, const ModelCounts& counts,
                             const CountsSum& sum) {
  Hasher h;
  const TokenizerOptions& t = settings.tokenizer;
  const ModelOptions& m = settings.model;
  h.Add("chute-model 2\nalpha ");
  h.Add(m.alpha);
  h.Add(m.prior == PriorMode::kUniform ? "\nprior uniform" : "\nprior learned");
  h.Add(t.bigrams ? "\nbigrams on" : "\nbigrams off");
  h.Add(t.numbers == NumberMode::kFold ? "\nnumbers fold" : "\nnumbers keep");
  h.Add("\nmin_length ");
  h.Add(static_cast<int64_t>(t.min_length));
  h.Add("\nmax_length ");
  h.Add(static_cast<int64_t>(t.max_length));
  h.Add("\n");

  const size_t nq = counts.queues.size();
  std::vector<size_t> order;  // queues with documents, by name
  for (size_t q = 0; q < nq; ++q) {
    if (counts.queues[q].documents > 0) order.push_back(q);
  }
  std::sort(order.begin(), order.end(), [&](size_t a, size_t b) {
    return counts.queues[a].name < counts.queues[b].name;
  });
  for (size_t q : order) {
    const QueueCounts& qc = counts.queues[q];
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
  h.Add("counts ");
  h.Add(sum.Hex());
  h.Add("\n");
  return h.Hex();
}

}  // namespace chute
