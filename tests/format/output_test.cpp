#include "medload/format/output.h"

#include <doctest/doctest.h>

#include <sstream>

#include "medload/core/caution.h"

namespace medload {

TEST_SUITE("format/output") {

TEST_CASE("CSV cells are quoted when they hold separators, quotes or line breaks") {
  // Source: RFC 4180, section 2 (fields with commas, quotes or line breaks are quoted,
  // and a quote inside is doubled).
  CHECK(CsvCell("plain") == "plain");
  CHECK(CsvCell("a,b") == "\"a,b\"");
  CHECK(CsvCell("say \"hi\"") == "\"say \"\"hi\"\"\"");
  CHECK(CsvCell("two\nlines") == "\"two\nlines\"");
  CHECK(CsvRow({"a", "b,c", ""}) == "a,\"b,c\",\n");
}

TEST_CASE("CSV cells that a spreadsheet would run as a formula are neutralised") {
  // Source: OWASP, "CSV Injection": prefix cells starting with = + - @ tab or CR.
  CHECK(CsvCell("=HYPERLINK(\"x\")") == "\"'=HYPERLINK(\"\"x\"\")\"");
  CHECK(CsvCell("+1+2") == "'+1+2");
  CHECK(CsvCell("@SUM(A1)") == "'@SUM(A1)");
  CHECK(CsvCell("-cmd") == "'-cmd");
  CHECK(CsvCell("-1.5") == "-1.5");  // a plain number stays a number
  CHECK(CsvCell("12") == "12");
}

TEST_CASE("a CSV comment line is one quoted field starting with a hash, whatever its text holds") {
  // Source: RFC 4180, section 2 (a field with commas, quotes or line breaks is enclosed
  // in quotes; a quote inside is doubled). Line breaks become spaces so that the comment
  // stays on one physical line.
  const struct {
    const char* text;
    const char* line;
  } cases[] = {
      {"plain", "\"# plain\"\n"},
      {"a, b, c", "\"# a, b, c\"\n"},
      {"say \"hi\"", "\"# say \"\"hi\"\"\"\n"},
      {"two\nlines\r\nthree", "\"# two lines  three\"\n"},
      {"=SUM(A1)", "\"# =SUM(A1)\"\n"},
      {"", "\"# \"\n"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    CHECK(CsvCommentLine(c.text) == c.line);
  }
  std::ostringstream out;
  WriteCsvCaution(out);
  CHECK(out.str() == "\"# " + std::string(kCaution) + "\"\n");
  CHECK(std::string(kCaution).find(',') != std::string::npos);  // why the quotes matter
}

TEST_CASE("HTML escaping covers text and attribute contexts") {
  CHECK(EscapeHtml("<script>alert('x')</script> & \"q\"") ==
        "&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; &quot;q&quot;");
}

TEST_CASE("HTML escaping shows control characters and bidi controls as visible escapes") {
  CHECK(EscapeHtml("Invented \x1b[31m<Net>") == "Invented \\x1b[31m&lt;Net&gt;");
  CHECK(EscapeHtml("P\xE2\x80\xAE" "1") == "P\\u202E1");  // U+202E (Unicode Standard Annex #9)
  CHECK(EscapeHtml("two\nlines") == "two\nlines");
}

TEST_CASE("an HTML page opens with the caution as a banner and escapes its title") {
  std::ostringstream out;
  WriteHtmlStart(out, "List <A&B>");
  WriteHtmlTable(out, {"name", "n"}, {{"<b>", "3"}});
  WriteHtmlEnd(out);
  const std::string html = out.str();
  CHECK(html.find("<title>List &lt;A&amp;B&gt;</title>") != std::string::npos);
  CHECK(html.find("class=\"caution\"") < html.find("<h1>"));
  CHECK(html.find("<td>&lt;b&gt;</td>") != std::string::npos);
  CHECK(html.find("<td class=\"num\">3</td>") != std::string::npos);
  CHECK(html.find("<b>") == std::string::npos);
  CHECK(html.find("http") == std::string::npos);  // self-contained: nothing fetched
  // The banner says "CAUTION:" once, in bold, then the rest of the caution.
  CHECK(html.find("<strong>CAUTION:</strong> this output supports clinical judgement") != std::string::npos);
  CHECK(html.find("CAUTION") == html.rfind("CAUTION"));
}

TEST_CASE("the page style prints on A4 with table headers repeated and rows and charts kept whole") {
  std::ostringstream out;
  WriteHtmlStart(out, "Page");
  const std::string html = out.str();
  const std::string print = html.substr(html.find("@media print{"));
  CHECK(html.find("@page{size:A4;margin:12mm}") != std::string::npos);
  CHECK(print.find("thead{display:table-header-group}") != std::string::npos);
  CHECK(print.find("tr,figure,.caution{break-inside:avoid}") != std::string::npos);
  CHECK(print.find(".screen{display:none}") != std::string::npos);
  CHECK(html.find("overflow-wrap:break-word") < html.find("@media print"));  // on screen too
}

TEST_CASE("text tables pad columns and right-align numbers") {
  std::ostringstream out;
  WriteTextTable(out, {"name", "items"}, {{"amlodipine", "1"}, {"é", "12"}});
  CHECK(out.str() ==
        "name        items\n"
        "----------  -----\n"
        "amlodipine      1\n"
        "é              12\n");
}

TEST_CASE("the text caution footer is wrapped and complete") {
  std::ostringstream out;
  WriteTextCaution(out);
  std::string joined;
  std::istringstream lines(out.str());
  for (std::string line; std::getline(lines, line);) {
    CHECK(line.size() <= 78);
    if (line.empty()) continue;
    if (!joined.empty()) joined += ' ';
    joined += line;
  }
  CHECK(joined == kCaution);
}

TEST_CASE("the one-line caution keeps the four points of the paragraph") {
  std::ostringstream out;
  WriteTextCautionLine(out);
  CHECK(out.str() == "\n" + std::string(kCautionLine) + "\n");
  const std::string line(kCautionLine);
  CHECK(line.find('\n') == std::string::npos);
  // Spec section 6: supports and does not replace judgement; depends on the tables and
  // the records; confirm with the patient and the record; local guidance prevails.
  for (const char* point : {"supports clinical judgement and does not replace it", "editable tables",
                            "complete records", "confirm each medicine with the patient and the clinical record",
                            "local guidance prevails"}) {
    CAPTURE(point);
    CHECK(line.find(point) != std::string::npos);
  }
  CHECK(line.rfind("CAUTION: this output supports clinical judgement", 0) == 0);
}

TEST_CASE("numbers print with trailing zeros removed") {
  CHECK(FormatNumber(1.5) == "1.5");
  CHECK(FormatNumber(2.0) == "2");
  CHECK(FormatNumber(0.90909, 2) == "0.91");
  CHECK(FormatNumber(-0.0001, 2) == "0");
}

}  // TEST_SUITE

}  // namespace medload
