#ifndef CHUTE_CLI_READ_SHA256_H_
#define CHUTE_CLI_READ_SHA256_H_

#include <string>
#include <string_view>

namespace chute {

// SHA-256 (FIPS 180-4) of bytes, as 64 lowercase hex digits. Computed by
// OpenSSL's libcrypto.
std::string Sha256Hex(std::string_view bytes);

}  // namespace chute

#endif  // CHUTE_CLI_READ_SHA256_H_
