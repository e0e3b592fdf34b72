// Tests of the kept-text codec (store/text_codec.h): texts come back byte
// for byte, and damaged data is refused with a plain reason, never read as
// some other text.
#include "store/text_codec.h"

#include <gtest/gtest.h>

#include <random>
#include <string>
#include <vector>

namespace chute {
namespace {

std::string Packed(const std::string& text) {
  std::string packed;
  Status s = PackText(text, &packed);
  EXPECT_TRUE(s.ok()) << s.message();
  return packed;
}

TEST(TextCodecTest, TextsComeBackByteForByte) {
  std::mt19937 rng(4);
  std::string random_bytes(20000, '\0');
  for (char& c : random_bytes) c = static_cast<char>(rng() % 256);
  std::string repetitive;
  for (int i = 0; i < 2000; ++i)
    repetitive += "Berth 12 is booked for the MV Osprey. ";
  const std::vector<std::string> texts = {
      "",
      "a",
      "Dear harbour master,\nplease book berth 4 for Tuesday.\n",
      "Ελληνικά, кириллица, 中文, ไทย — and U+FFFD \xEF\xBF\xBD",
      std::string("NUL \0 inside", 12),
      random_bytes,
      repetitive,
  };
  TextCodec codec;  // one codec, reused across calls
  for (const std::string& text : texts) {
    std::string packed, back;
    ASSERT_TRUE(codec.Pack(text, &packed).ok());
    ASSERT_TRUE(codec.Unpack(packed, &back).ok());
    EXPECT_EQ(back, text);
    // The one-off forms agree with the codec.
    EXPECT_EQ(Packed(text), packed);
  }
}

TEST(TextCodecTest, RepetitiveTextShrinks) {
  std::string text;
  for (int i = 0; i < 1000; ++i) text += "Request for a berth at pier 7. ";
  EXPECT_LT(Packed(text).size(), text.size() / 10);
}

TEST(TextCodecTest, EveryFlippedByteIsFound) {
  const std::string text =
      "To the records office: under the access rules I ask for the minutes "
      "of the harbour board meetings of March and April.";
  const std::string packed = Packed(text);
  for (size_t i = 0; i < packed.size(); ++i) {
    std::string damaged = packed;
    damaged[i] = static_cast<char>(damaged[i] ^ 0x5a);
    std::string back;
    Status s = UnpackText(damaged, &back);
    // A flip may turn the frame into another valid frame only if content
    // and checksum still agree; then the text must still be the same.
    if (s.ok()) {
      EXPECT_EQ(back, text) << "byte " << i;
    } else {
      EXPECT_EQ(s.code(), Status::Code::kCorruption) << "byte " << i;
      EXPECT_TRUE(back.empty());
      EXPECT_EQ(s.message().find('\n'), std::string::npos);
    }
  }
}

TEST(TextCodecTest, DamagedFramesAreRefusedWithAReason) {
  const std::string packed =
      Packed("Invoice 2026-0412 for pilotage, due in 30 days.");
  struct Case {
    std::string name;
    std::string bytes;
    std::string reason;
  };
  const std::vector<Case> cases = {
      {"empty", "", "not a whole zstd frame"},
      {"not zstd", "plain text, not packed", "not a whole zstd frame"},
      {"cut short", packed.substr(0, packed.size() - 3),
       "not a whole zstd frame"},
      {"bytes after the frame", packed + "xyz", "3 bytes after its zstd frame"},
      {"checksum",
       packed.substr(0, packed.size() - 1) +
           static_cast<char>(packed.back() ^ 1),
       "does not decompress"},
  };
  for (const Case& c : cases) {
    std::string back = "left over";
    Status s = UnpackText(c.bytes, &back);
    EXPECT_EQ(s.code(), Status::Code::kCorruption) << c.name;
    EXPECT_NE(s.message().find(c.reason), std::string::npos)
        << c.name << ": " << s.message();
    EXPECT_TRUE(back.empty()) << c.name;
  }
}

}  // namespace
}  // namespace chute
