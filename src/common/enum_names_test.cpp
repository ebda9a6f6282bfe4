#include "common/enum_names.h"

#include <gtest/gtest.h>

namespace fulmar {
namespace {

enum class Colour { red, green, blue };
const EnumNames<Colour> kColours{
    {Colour::red, "red"}, {Colour::green, "green"}, {Colour::blue, "blue"}};

TEST(EnumNames, NamesAndValuesRoundTrip) {
  for (Colour c : {Colour::red, Colour::green, Colour::blue})
    EXPECT_EQ(kColours.parse(kColours.name(c), "x", "colour"), c);
  EXPECT_EQ(kColours.list(), "red, green, blue");
  EXPECT_EQ(kColours.names().size(), 3u);
}

TEST(EnumNames, FindReturnsTheValueOrNothing) {
  EXPECT_EQ(kColours.find("green"), Colour::green);
  EXPECT_EQ(kColours.find("mauve"), std::nullopt);
  EXPECT_EQ(kColours.find("Green"), std::nullopt);  // exact match, as parse
  EXPECT_EQ(kColours.find(""), std::nullopt);
}

TEST(EnumNames, UnknownNameListsEveryChoiceAndThePlace) {
  try {
    kColours.parse("mauve", "case.json: /paint", "colour");
    FAIL() << "mauve accepted";
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "case.json: /paint: unknown colour \"mauve\" (one of red, green, blue)");
  }
}

}  // namespace
}  // namespace fulmar
