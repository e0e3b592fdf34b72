// The compressed form in which the ledger keeps a document's text (the
// UTF-8 text chute tokenized): one Zstandard frame per document, with its
// content size and a checksum of the content in the frame header and
// trailer, so that damage is found when the text is unpacked.
//
// Format: Y. Collet, M. Kucherawy (ed.), "Zstandard Compression and the
// 'application/zstd' Media Type", RFC 8878, 2021, section 3.1.1 (frames,
// Frame_Content_Size, Content_Checksum); the reference recalled from
// memory. Library: libzstd.
#ifndef CHUTE_STORE_TEXT_CODEC_H_
#define CHUTE_STORE_TEXT_CODEC_H_

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>

#include "store/status.h"

// libzstd's context types (zstd.h), declared here so that only
// text_codec.cc includes the library's header.
struct ZSTD_CCtx_s;
struct ZSTD_DCtx_s;

namespace chute {

// The compression level of kept text (zstd's own default,
// ZSTD_CLEVEL_DEFAULT). Measured on this machine, each document packed on
// its own with a checksum, as the ledger keeps it:
//   demo corpus (476 documents, 371 KB): level 1 keeps 66.7% of the bytes,
//     3 keeps 66.7%, 9 keeps 66.2%, 19 keeps 65.9%; packing runs at 63, 56,
//     32 and 9 MB/s;
//   4 MB of the benchmark corpus (tests/bench/make_corpus.py, 0.5-20 KB
//     documents): 54.8%, 54.3%, 52.9%, 51.8% at 104, 71, 21 and 5 MB/s.
// Higher levels save at most 2.5 points for 3 to 14 times the time; level
// 1 saves nothing worth having in speed: a whole learn of those 4 MB took
// as long at level 1 as at 3 within the noise of a busy machine, and its
// store came out 20 KB larger.
inline constexpr int kTextLevel = 3;

// The largest text Unpack accepts (a damaged content size must not make it
// allocate without bound): 4 GiB, far above any --max-bytes in use.
inline constexpr uint64_t kMaxUnpackedText = uint64_t{4} << 30;

// Packs and unpacks texts, reusing zstd's working memory between calls.
// Not thread-safe: one codec per thread.
class TextCodec {
 public:
  TextCodec();
  ~TextCodec();
  TextCodec(const TextCodec&) = delete;  // owns zstd contexts
  TextCodec& operator=(const TextCodec&) = delete;

  // One zstd frame holding text, its size and its checksum. Fails only when
  // zstd does (out of memory).
  Status Pack(std::string_view text, std::string* packed);
  // The text of a frame made by Pack. Fails with kCorruption, in plain
  // words, when packed is not exactly one whole frame, names no content size
  // or one above kMaxUnpackedText, does not decompress, or does not match
  // its checksum.
  Status Unpack(std::string_view packed, std::string* text);

 private:
  struct CctxFree {
    void operator()(ZSTD_CCtx_s* c) const;
  };
  struct DctxFree {
    void operator()(ZSTD_DCtx_s* d) const;
  };
  std::unique_ptr<ZSTD_CCtx_s, CctxFree> cctx_;  // made on first Pack
  std::unique_ptr<ZSTD_DCtx_s, DctxFree> dctx_;  // made on first Unpack
};

// One-off forms of TextCodec::Pack and Unpack.
Status PackText(std::string_view text, std::string* packed);
Status UnpackText(std::string_view packed, std::string* text);

}  // namespace chute

#endif  // CHUTE_STORE_TEXT_CODEC_H_
