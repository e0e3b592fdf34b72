#ifndef CHUTE_CLI_FORMAT_NUMBER_H_
#define CHUTE_CLI_FORMAT_NUMBER_H_

#include <string>

namespace chute {

// The shortest decimal form that reads back to the same double
// (std::to_chars); "inf", "-inf" or "nan" for those values.
std::string FormatShortest(double v);

// A fixed number of decimals, for tables a person reads.
std::string FormatFixed(double v, int decimals);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_NUMBER_H_
