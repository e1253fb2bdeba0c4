#include "medload/core/hash.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("core/hash") {

TEST_CASE("SHA-256 matches the published test vectors") {
  // Source: NIST FIPS 180-4 / FIPS 180-2 Appendix B.1 ("abc") and the empty message.
  CHECK(Sha256Hex("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  CHECK(Sha256Hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

TEST_CASE("HMAC-SHA-256 matches the published test vectors") {
  // Source: RFC 4231, test case 2 (key "Jefe", data "what do ya want for nothing?").
  CHECK(HmacSha256Hex("Jefe", "what do ya want for nothing?") ==
        "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843");
  // Source: RFC 4231, test case 1 (key 20 bytes of 0x0b, data "Hi There").
  CHECK(HmacSha256Hex(std::string(20, '\x0b'), "Hi There") ==
        "b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7");
}

}  // TEST_SUITE

}  // namespace medload
