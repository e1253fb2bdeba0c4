#include <doctest/doctest.h>

#include <string>

#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

TEST_SUITE("formulary/normalise") {

TEST_CASE("text is case-folded with accents removed and everything else kept") {
  CHECK(NormaliseText("Co-Codamol 30MG/500MG") == "co-codamol 30mg/500mg");
  CHECK(NormaliseText("Chlorphénamine") == "chlorphenamine");
  CHECK(NormaliseText("CAFÉ Ümlaut Ñ") == "cafe umlaut n");
  CHECK(NormaliseText("500\xC2\xB5g") == "500mcg");     // micro sign
  CHECK(NormaliseText("500\xCE\xBCg") == "500mcg");     // Greek small mu
  CHECK(NormaliseText("\xC2\xBD tablet") == "1/2 tablet");  // vulgar fraction one half
  CHECK(NormaliseText("") == "");
}

TEST_CASE("invalid UTF-8 becomes spaces instead of failing") {
  const std::string text = NormaliseText("abc\xff\xfe" "def");
  CHECK(text.find("abc") == 0);
  CHECK(text.find("def") != std::string::npos);
  CHECK(text.find('\xff') == std::string::npos);
}

TEST_CASE("name keys ignore case, accents and punctuation") {
  CHECK(NameKey("Omega-3-acid ethyl esters") == "omega 3 acid ethyl esters");
  CHECK(NameKey("  co--codamol  ") == "co codamol");
  CHECK(NameKey("Povidone-Iodine") == NameKey("povidone iodine"));
  CHECK(NameKey("Chlorphénamine") == "chlorphenamine");
  CHECK(NameKey("---") == "");
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
