#include "store/text_codec.h"

#include <zstd.h>

namespace chute {

namespace {

Status ZstdError(const char* what, size_t code) {
  return Status::Corruption(std::string(what) +
                            " (zstd: " + ZSTD_getErrorName(code) + ")");
}

}  // namespace

void TextCodec::CctxFree::operator()(ZSTD_CCtx* c) const { ZSTD_freeCCtx(c); }
void TextCodec::DctxFree::operator()(ZSTD_DCtx* d) const { ZSTD_freeDCtx(d); }

TextCodec::TextCodec() = default;
TextCodec::~TextCodec() = default;

Status TextCodec::Pack(std::string_view text, std::string* packed) {
  if (!cctx_) {
    cctx_.reset(ZSTD_createCCtx());
    if (!cctx_) return Status::IoError("cannot pack text: out of memory");
    // The frame names its content size (ZSTD_compress2 writes it for a
    // one-shot call) and ends with a checksum of the content.
    size_t rc = ZSTD_CCtx_setParameter(cctx_.get(), ZSTD_c_compressionLevel,
                                       kTextLevel);
    if (!ZSTD_isError(rc))
      rc = ZSTD_CCtx_setParameter(cctx_.get(), ZSTD_c_checksumFlag, 1);
    if (ZSTD_isError(rc)) {
      cctx_.reset();
      return Status::IoError(std::string("cannot pack text: ") +
                             ZSTD_getErrorName(rc));
    }
  }
  packed->resize(ZSTD_compressBound(text.size()));
  size_t n = ZSTD_compress2(cctx_.get(), packed->data(), packed->size(),
                            text.data(), text.size());
  if (ZSTD_isError(n)) {
    packed->clear();
    return Status::IoError(std::string("cannot pack text: ") +
                           ZSTD_getErrorName(n));
  }
  packed->resize(n);
  return Status::Ok();
}

Status TextCodec::Unpack(std::string_view packed, std::string* text) {
  text->clear();
  size_t frame = ZSTD_findFrameCompressedSize(packed.data(), packed.size());
  if (ZSTD_isError(frame))
    return ZstdError("the kept text is not a whole zstd frame", frame);
  if (frame != packed.size()) {
    return Status::Corruption("the kept text has " +
                              std::to_string(packed.size() - frame) +
                              " bytes after its zstd frame");
  }
  unsigned long long size =
      ZSTD_getFrameContentSize(packed.data(), packed.size());
  if (size == ZSTD_CONTENTSIZE_ERROR) {
    return Status::Corruption("the kept text's zstd frame header is damaged");
  }
  if (size == ZSTD_CONTENTSIZE_UNKNOWN) {
    return Status::Corruption(
        "the kept text's zstd frame does not name its size");
  }
  if (size > kMaxUnpackedText) {
    return Status::Corruption("the kept text's zstd frame claims " +
                              std::to_string(size) +
                              " bytes, more than chute ever packs");
  }
  if (!dctx_) {
    dctx_.reset(ZSTD_createDCtx());
    if (!dctx_) return Status::IoError("cannot unpack text: out of memory");
  }
  text->resize(static_cast<size_t>(size));
  size_t n = ZSTD_decompressDCtx(dctx_.get(), text->data(), text->size(),
                                 packed.data(), packed.size());
  if (ZSTD_isError(n)) {
    text->clear();
    return ZstdError("the kept text does not decompress", n);
  }
  if (n != size) {
    text->clear();
    return Status::Corruption("the kept text decompresses to " +
                              std::to_string(n) + " bytes, not the " +
                              std::to_string(size) + " its frame names");
  }
  return Status::Ok();
}

Status PackText(std::string_view text, std::string* packed) {
  TextCodec codec;
  return codec.Pack(text, packed);
}

Status UnpackText(std::string_view packed, std::string* text) {
  TextCodec codec;
  return codec.Unpack(packed, text);
}

}  // namespace chute
