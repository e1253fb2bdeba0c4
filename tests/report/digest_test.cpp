#include "medload/report/digest.h"

#include <doctest/doctest.h>

#include "medload/core/caution.h"
#include "report/report_fixture.h"

namespace medload {
namespace {

std::vector<std::string> SplitCrlf(const std::string& text) {
  std::vector<std::string> lines;
  size_t start = 0;
  for (size_t end = text.find("\r\n"); end != std::string::npos; end = text.find("\r\n", start)) {
    lines.push_back(text.substr(start, end - start));
    start = end + 2;
  }
  lines.push_back(text.substr(start));
  return lines;
}

Digest SampleDigest() {
  Digest digest;
  digest.practice = "WV001";
  digest.practice_name = "Invented Surgery";
  digest.network = "Invented Network";
  digest.title = "Invented monthly report";
  digest.on = Date::FromCivil(2026, 10, 31);
  digest.registered = 1034;
  digest.baseline = "the report of 2026-09-30";
  digest.page = "practice-WV001.html";
  digest.suppress_below = 5;
  digest.measures.push_back({"items>=10", 52, 50.3, Change{6, 13.04}});
  digest.measures.push_back({"acb>=3", std::nullopt, std::nullopt, Change{}});
  digest.findings.push_back("items>=10: up 6 patients (+13%) since 2026-09-30");
  digest.from = "team <team@example.invalid>";
  digest.to = {"a@example.invalid", "b@example.invalid"};
  return digest;
}

}  // namespace

TEST_SUITE("report/digest") {

TEST_CASE("the Date header is the census date at midnight UTC with its weekday") {
  // 2026-10-31 is a Saturday; 1970-01-01 a Thursday (common practice: calendar).
  CHECK(MessageDate(Date::FromCivil(2026, 10, 31)) == "Sat, 31 Oct 2026 00:00:00 +0000");
  CHECK(MessageDate(Date::FromCivil(1970, 1, 1)) == "Thu, 01 Jan 1970 00:00:00 +0000");
  CHECK(MessageDate(Date::FromCivil(2024, 2, 29)) == "Thu, 29 Feb 2024 00:00:00 +0000");
}

TEST_CASE("a digest is an RFC 5322 message with CRLF line ends and lines of at most 78 characters") {
  const std::string text = FormatDigest(SampleDigest());
  // No bare LF: every LF is preceded by CR.
  for (size_t i = 0; i < text.size(); ++i) {
    if (text[i] == '\n') CHECK((i > 0 && text[i - 1] == '\r'));
  }
  const std::vector<std::string> lines = SplitCrlf(text);
  for (const std::string& line : lines) {
    CAPTURE(line);
    CHECK(line.size() <= 78);
  }
  CHECK(lines[0] == "From: team <team@example.invalid>");
  CHECK(lines[1] == "To: a@example.invalid, b@example.invalid");
  CHECK(lines[2] == "Subject: [Invented Network] WV001: counts moved, census 2026-10-31");
  CHECK(lines[3] == "Date: Sat, 31 Oct 2026 00:00:00 +0000");
  CHECK(lines[4].rfind("Message-ID: <", 0) == 0);
  CHECK(lines[5] == "MIME-Version: 1.0");
  CHECK(lines[6] == "Content-Type: text/plain; charset=utf-8");
  CHECK(text.find("\r\n\r\nInvented monthly report\r\n") != std::string::npos);
  CHECK(text.find("- items>=10: 52 patients, 50.3 per 1000; change +6 (+13%)") != std::string::npos);
  CHECK(text.find("- acb>=3: fewer than 5 patients (withheld)") != std::string::npos);
  CHECK(text.find("CAUTION: this output supports clinical judgement") != std::string::npos);
}

TEST_CASE("the Message-ID depends on network, practice and date only") {
  Digest a = SampleDigest();
  Digest b = SampleDigest();
  b.findings.clear();
  const auto id = [](const Digest& d) { return SplitCrlf(FormatDigest(d))[4]; };
  CHECK(id(a) == id(b));
  b.practice = "WV002";
  CHECK(id(a) != id(b));
}

TEST_CASE("header values cannot inject headers or carry non-ASCII bytes") {
  Digest digest = SampleDigest();
  digest.network = "Net\r\nBcc: evil@example.invalid \xc3\xa9";
  const std::string text = FormatDigest(digest);
  const std::string headers = text.substr(0, text.find("\r\n\r\n"));
  CHECK(headers.find("\r\nBcc:") == std::string::npos);
  for (const char c : headers) CHECK(static_cast<unsigned char>(c) < 0x80);
}

TEST_CASE("control characters and bidi controls in a title or names reach the body as visible escapes") {
  Digest digest = SampleDigest();
  digest.title = "Invented \x1b[2Jreport";
  digest.practice_name = "Invented \xE2\x80\xAE" "Surgery";  // U+202E RIGHT-TO-LEFT OVERRIDE
  const std::string text = FormatDigest(digest);
  CHECK(text.find('\x1b') == std::string::npos);
  CHECK(text.find("\xE2\x80\xAE") == std::string::npos);
  CHECK(text.find("Invented \\x1b[2Jreport\r\n") != std::string::npos);
  CHECK(text.find("Practice: WV001 Invented \\u202ESurgery\r\n") != std::string::npos);
}

TEST_CASE("non-ASCII words in headers become RFC 2047 encoded words") {
  // Encoded words and their limits: RFC 2047 sections 2 and 5; base64: RFC 4648 section 4.
  struct Case {
    std::string network;
    std::string subject;
  };
  const Case cases[] = {
      {"Vall\xc3\xa9" "e", "Subject: =?UTF-8?B?W1ZhbGzDqWVd?= WV001: counts moved, census 2026-10-31"},
      // Two such words are encoded together, so that the space between them survives.
      {"Caf\xc3\xa9 Cr\xc3\xa8me", "Subject: =?UTF-8?B?W0NhZsOpIENyw6htZV0=?= WV001: counts moved, census 2026-10-31"},
      {"Plain", "Subject: [Plain] WV001: counts moved, census 2026-10-31"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.network);
    Digest digest = SampleDigest();
    digest.network = c.network;
    const std::string text = FormatDigest(digest);
    std::string headers = text.substr(0, text.find("\r\n\r\n"));
    for (size_t fold = headers.find("\r\n "); fold != std::string::npos; fold = headers.find("\r\n ")) {
      headers.replace(fold, 3, " ");  // unfold (RFC 5322 section 2.2.3)
    }
    CHECK(SplitCrlf(headers)[2] == c.subject);
  }
}

TEST_CASE("a long non-ASCII word is split into encoded words between characters, lines kept to 78") {
  Digest digest = SampleDigest();
  std::string long_word;
  for (int i = 0; i < 30; ++i) long_word += "\xc3\xa9";  // 60 bytes: 44 + 16, never half a character
  digest.from = long_word + " <team@example.invalid>";
  const std::vector<std::string> lines = SplitCrlf(FormatDigest(digest));
  CHECK(lines[0] == "From: =?UTF-8?B?w6nDqcOpw6nDqcOpw6nDqcOpw6nDqcOpw6nDqcOpw6nDqcOpw6nDqcOpw6k=?=");
  CHECK(lines[1] == " =?UTF-8?B?w6nDqcOpw6nDqcOpw6nDqQ==?= <team@example.invalid>");
  // An address cannot be encoded: its other bytes become '?'.
  digest.from = "t\xc3\xa9" "am@example.invalid";
  CHECK(SplitCrlf(FormatDigest(digest))[0] == "From: t??am@example.invalid");
}

TEST_CASE("the triggers say whether any one or all of them send a digest") {
  DigestTriggers triggers;
  triggers.rise_patients = 3;
  CHECK(TriggerRule(triggers) ==
        "a rise of at least 3 patients (rise_patients) OR a rate above the upper 99.8% control limit "
        "(above_upper_limit): any one is enough (combine: any)");
  triggers.all = true;
  triggers.rise_percent = 10;
  CHECK(TriggerRule(triggers) ==
        "a rise of at least 3 patients (rise_patients) AND a rise of at least 10% (rise_percent) AND a rate above "
        "the upper 99.8% control limit (above_upper_limit): all of them, on one criterion (combine: all)");
  triggers.above_upper_limit = false;
  triggers.rise_percent.reset();
  CHECK(TriggerRule(triggers) == "a rise of at least 3 patients (rise_patients)");
}

TEST_CASE("with combine all a practice needs every trigger set crossed by one criterion") {
  testing::ReportPopulation population;
  ReportConfig config = testing::TestConfig();  // rise_patients 2, above_upper_limit (default) true
  auto any = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(any.ok());
  const size_t a1 = any->practices[0].code == "A1" ? 0 : 1;
  REQUIRE(BuildDigest(*any, a1, "p.html").has_value());
  config.digests.triggers.all = true;
  config.digests.triggers.rise_percent = 1000;  // no rise from zero has a percentage: never crossed
  auto all = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(all.ok());
  CHECK_FALSE(BuildDigest(*all, a1, "p.html").has_value());
  config.digests.triggers.rise_percent.reset();
  config.digests.triggers.above_upper_limit = false;
  auto rise_only = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(rise_only.ok());
  CHECK(BuildDigest(*rise_only, a1, "p.html").has_value());
}

TEST_CASE("long header values are folded and long words split to keep 78 columns") {
  Digest digest = SampleDigest();
  digest.to.assign(6, "a-rather-long-address-for-folding@example.invalid");
  digest.findings.push_back(std::string(120, 'x'));
  for (const std::string& line : SplitCrlf(FormatDigest(digest))) CHECK(line.size() <= 78);
}

TEST_CASE("text wraps at the width with an indent on continuation lines") {
  const auto lines = WrapText("one two three four five", 9, 2);
  REQUIRE(lines.size() == 4);
  CHECK(lines[0] == "one two");
  CHECK(lines[1] == "  three");
  CHECK(lines[2] == "  four");
  CHECK(lines[3] == "  five");
  CHECK(WrapText("", 10, 0) == std::vector<std::string>{""});
}

TEST_CASE("a practice whose count rose by the trigger gets a digest without any patient identifier") {
  testing::ReportPopulation population;
  const ReportConfig config = testing::TestConfig();
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  REQUIRE(model->practices.size() == 2);
  const size_t a1 = model->practices[0].code == "A1" ? 0 : 1;
  auto digest = BuildDigest(*model, a1, "practice-A1.html");
  REQUIRE(digest.has_value());
  CHECK(digest->baseline == "the previous month, 2024-05-31 (no earlier report)");
  const std::string text = FormatDigest(*digest);
  // 0 patients on 2024-05-31, 6 on 2024-06-30: a rise of 6 (no percentage from zero).
  CHECK(text.find("- acb>=3: up 6 patients since 2024-05-31 [rise_patients 2]\r\n") != std::string::npos);
  CHECK(text.find("Triggers: a rise of at least 2 patients (rise_patients) OR a rate above the\r\n") !=
        std::string::npos);
  CHECK(text.find("To: team@example.invalid") != std::string::npos);
  for (const std::string& id : testing::PatientIds()) {
    CAPTURE(id);
    CHECK(text.find(id) == std::string::npos);
  }
}

TEST_CASE("a practice whose counts did not move gets no digest") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const size_t odd = model->practices[0].code == "A1" ? 1 : 0;
  CHECK_FALSE(BuildDigest(*model, odd, "p.html").has_value());
}

TEST_CASE("no digest is made when digests are not configured") {
  testing::ReportPopulation population;
  ReportConfig config = testing::TestConfig();
  config.digests.enabled = false;
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  for (size_t i = 0; i < model->practices.size(); ++i) CHECK_FALSE(BuildDigest(*model, i, "p.html").has_value());
}

}

}  // namespace medload
