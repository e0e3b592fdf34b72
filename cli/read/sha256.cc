#include "cli/read/sha256.h"

#include <openssl/evp.h>

#include <stdexcept>

namespace chute {

std::string Sha256Hex(std::string_view bytes) {
  unsigned char md[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  if (EVP_Digest(bytes.data(), bytes.size(), md, &len, EVP_sha256(), nullptr) != 1) {
    throw std::runtime_error("SHA-256 failed in libcrypto");
  }
  static const char kHex[] = "0123456789abcdef";
  std::string out(2 * len, '0');
  for (unsigned int i = 0; i < len; ++i) {
    out[2 * i] = kHex[md[i] >> 4];
    out[2 * i + 1] = kHex[md[i] & 15];
  }
  return out;
}

}  // namespace chute
