#include "common/xml_text.h"

#include <gtest/gtest.h>

namespace fulmar {
namespace {

// Exact: entities of XML 1.0 (W3C Recommendation, section 4.6) for < > & ".
TEST(XmlText, EscapesMarkupCharacters) {
  EXPECT_EQ(xml_escaped("a<b>&\"c"), "a&lt;b&gt;&amp;&quot;c");
  EXPECT_EQ(xml_escaped("NACA 2412"), "NACA 2412");
}

}  // namespace
}  // namespace fulmar
