#include "medload/store/import_summary.h"

#include <doctest/doctest.h>

#include <map>
#include <sstream>

#include "medload/core/caution.h"

namespace medload {
namespace {

ImportSummary Example(const std::string& file) {
  ImportSummary summary;
  summary.file = file;
  summary.kind = "dispensing";
  summary.format = "csv";
  summary.read = 10;
  summary.lines = 12;
  summary.header_lines = 1;
  summary.blank_lines = 1;
  summary.row_lines = 10;
  summary.imported = 6;
  summary.duplicates = 2;
  summary.rejected = 2;
  summary.reasons = {{"bad_date", 1}, {"bad_quantity", 1}};
  summary.examples = {file + ":3: quantity: \"abc\" is not a number"};
  return summary;
}

}  // namespace

TEST_SUITE("store/import_summary") {

TEST_CASE("the JSON has the fixed import shape with totals at the top") {
  // docs/input-formats.md, "The summary": {"read","imported","duplicates","rejected","reasons":{REASON:N},"caution"}.
  const nlohmann::ordered_json json = ImportJson({Example("a.csv"), Example("b.csv")});
  CHECK(json.at("read") == 20);
  CHECK(json.at("imported") == 12);
  CHECK(json.at("duplicates") == 4);
  CHECK(json.at("rejected") == 4);
  CHECK(json.at("reasons").at("bad_date") == 2);
  CHECK(json.at("caution") == std::string(kCaution));
  CHECK(json.at("files").size() == 2);
  CHECK(json.at("files").at(1).at("file") == "b.csv");
  CHECK_FALSE(json.contains("file"));
  CHECK(ImportJson({Example("a.csv")}).at("file") == "a.csv");
}

TEST_CASE("the text summary has a row per file, a total, the examples and the one-line caution") {
  std::ostringstream out;
  WriteImportText({Example("a.csv"), Example("b.csv")}, out);
  const std::string text = out.str();
  CHECK(text.find("a.csv") != std::string::npos);
  CHECK(text.find("total") != std::string::npos);
  CHECK(text.find("a.csv:3: quantity: \"abc\" is not a number") != std::string::npos);
  CHECK(text.find("a.csv: rejected by reason: bad_date 1, bad_quantity 1") != std::string::npos);
  CHECK(text.find("a.csv: ... and 1 more rejected rows") != std::string::npos);
  // A summary of counts ends with the caution in one line, not the paragraph.
  const std::string last_line = "\n" + std::string(kCautionLine) + "\n";
  REQUIRE(text.size() > last_line.size());
  CHECK(text.substr(text.size() - last_line.size()) == last_line);
  CHECK(text.find("take precedence.") == std::string::npos);
}

TEST_CASE("the CSV summary starts with the caution line") {
  std::ostringstream out;
  WriteImportCsv({Example("a.csv")}, out);
  const std::string text = out.str();
  CHECK(text.rfind("\"# CAUTION:", 0) == 0);
  CHECK(text.find("\nfile,kind,format,lines,blank_lines,row_lines,read,imported,duplicates,rejected,"
                  "stored,updated,rolled_back,reasons,not_counted,not_in_registry,not_in_registry_examples,"
                  "product_flags,shard,other_shards\n") != std::string::npos);
  CHECK(text.find("a.csv,dispensing,csv,12,1,10,10,6,2,2,6,0,false,bad_date=1;bad_quantity=1,,0,,,,0\n") !=
        std::string::npos);
}

TEST_CASE("the HTML summary has the banner and escapes every value") {
  std::ostringstream out;
  WriteImportHtml({Example("<script>x</script>.csv")}, out);
  const std::string html = out.str();
  CHECK(html.find("class=\"caution\"") != std::string::npos);
  CHECK(html.find("<script>") == std::string::npos);
  CHECK(html.find("&lt;script&gt;x&lt;/script&gt;.csv") != std::string::npos);
}

TEST_CASE("a rolled-back file says so with its rate and the limit") {
  ImportSummary summary = Example("a.csv");
  summary.rolled_back = true;
  summary.max_reject_rate = 0.1;
  CHECK(RollbackMessage(summary) ==
        "a.csv: 2 of 10 rows rejected (20%), above --max-reject-rate 0.1: the file was rolled "
        "back and nothing from it was stored");
  std::ostringstream out;
  WriteImportText({summary}, out);
  CHECK(out.str().find("rolled back") != std::string::npos);
}

TEST_CASE("a rolled-back file shows its valid rows as not stored, never as imported") {
  ImportSummary summary = Example("a.csv");
  summary.rolled_back = true;
  std::ostringstream text;
  WriteImportText({summary}, text);
  CHECK(text.str().find("0 (6 valid, not stored)") != std::string::npos);
  const nlohmann::ordered_json json = ImportJson({summary});
  CHECK(json.at("imported") == 6);  // what the file held: the counts still add up to read
  CHECK(json.at("stored") == 0);
  CHECK(json.at("files").at(0).at("stored") == 0);
  CHECK(ImportJson({Example("a.csv")}).at("stored") == 6);
}

TEST_CASE("the summary accounts for every physical line: header, blank and the lines of rows") {
  ImportSummary summary = Example("a.csv");
  std::ostringstream text;
  WriteImportText({summary}, text);
  CHECK(text.str().find("a.csv: 12 lines = 1 header + 1 blank + 10 in the 10 rows read\n") !=
        std::string::npos);
  summary.blank_lines = 0;
  summary.row_lines = 11;
  summary.multiline_rows = 1;
  std::ostringstream spans;
  WriteImportText({summary}, spans);
  CHECK(spans.str().find("a.csv: 12 lines = 1 header + 0 blank + 11 in the 10 rows read (1 row spans "
                         "several lines)\n") != std::string::npos);
  const nlohmann::ordered_json json = ImportJson({summary});
  CHECK(json.at("lines") == 12);
  CHECK(json.at("header_lines") == 1);
  CHECK(json.at("row_lines") == 11);
  CHECK(json.at("files").at(0).at("multiline_rows") == 1);
}

TEST_CASE("the rejects file quotes the original row and guards against formulas") {
  std::ostringstream out;
  WriteRejectsHeader(out);
  WriteRejectRow(out, "d.csv", 7, "bad_quantity", "d.csv:7: quantity: \"x\" is not a number",
                 "=HYPERLINK(\"x\"),P1");
  const std::string text = out.str();
  CHECK(text.rfind("\"# CAUTION:", 0) == 0);
  CHECK(text.find("\nfile,line,reason,message,original_row\n") != std::string::npos);
  // Source: OWASP, "CSV Injection": a leading '=' is neutralised with an apostrophe.
  CHECK(text.find("d.csv,7,bad_quantity,\"d.csv:7: quantity: \"\"x\"\" is not a number\","
                  "\"'=HYPERLINK(\"\"x\"\"),P1\"\n") != std::string::npos);
}

TEST_CASE("totals add every count and merge the reasons") {
  ImportSummary a = Example("a.csv");
  ImportSummary b = Example("b.csv");
  b.kind = "patients";
  b.not_counted = {{"cancelled", 3}};
  const ImportSummary total = TotalOf({a, b});
  CHECK(total.file == "total");
  CHECK(total.kind == "mixed");
  CHECK(total.read == 20);
  CHECK(total.reasons.at("bad_quantity") == 2);
  CHECK(total.not_counted.at("cancelled") == 3);
  b.product_flags = {{"partial", 4}};
  a.product_flags = {{"partial", 1}, {"unmatched", 2}};
  const ImportSummary flagged = TotalOf({a, b});
  CHECK(flagged.product_flags == std::map<std::string, long>{{"partial", 5}, {"unmatched", 2}});
}

TEST_CASE("the items of products not fully recognised are counted by kind in every format") {
  ImportSummary summary = Example("d.csv");
  summary.product_flags = {{"approximate", 1}, {"partial", 2}, {"unmatched", 3}};
  const std::string line = "d.csv: products to check (medload formulary unmatched lists them): 3 item(s) not "
                           "recognised (not counted), 2 item(s) recognised only in part, 1 item(s) read from a "
                           "close spelling";
  const nlohmann::ordered_json json = ImportJson({summary, summary});
  CHECK(json.at("product_flags").at("unmatched") == 6);
  CHECK(json.at("files").at(0).at("product_flags").at("partial") == 2);
  std::ostringstream text, csv, html;
  WriteImportText({summary}, text);
  WriteImportCsv({summary}, csv);
  WriteImportHtml({summary}, html);
  CHECK(text.str().find(line + "\n") != std::string::npos);
  CHECK(csv.str().find(",approximate=1;partial=2;unmatched=3,,0\n") != std::string::npos);
  CHECK(html.str().find("<li>" + line + "</li>") != std::string::npos);
  // Only the kinds present are named.
  summary.product_flags = {{"partial", 1}};
  std::ostringstream one;
  WriteImportText({summary}, one);
  CHECK(one.str().find("(medload formulary unmatched lists them): 1 item(s) recognised only in part\n") !=
        std::string::npos);
}

TEST_CASE("dispensings with no registry row are a warning in every format") {
  ImportSummary summary = Example("d.ndjson");
  summary.format = "fhir";
  summary.not_in_registry = 3;
  summary.not_in_registry_patients = 2;
  summary.not_in_registry_examples = {"d.ndjson:4: patient \"pt-x\"", "d.ndjson:9: patient \"pt-z\""};
  const std::string warning =
      "d.ndjson: warning: 3 imported dispensing(s) of 2 patient(s) have no row in the patient registry (no age, "
      "practice or registration for them until it is imported; check the patient ids), for example:";
  const nlohmann::ordered_json json = ImportJson({summary});
  CHECK(json.at("not_in_registry") == 3);
  CHECK(json.at("files").at(0).at("not_in_registry_patients") == 2);
  CHECK(json.at("files").at(0).at("not_in_registry_examples").at(1) == "d.ndjson:9: patient \"pt-z\"");
  std::ostringstream text, csv, html;
  WriteImportText({summary}, text);
  WriteImportCsv({summary}, csv);
  WriteImportHtml({summary}, html);
  CHECK(text.str().find(warning + "\n  d.ndjson:4: patient \"pt-x\"\n  d.ndjson:9: patient \"pt-z\"\n") !=
        std::string::npos);
  CHECK(csv.str().find("d.ndjson,dispensing,fhir,12,1,10,10,6,2,2,6,0,false,bad_date=1;bad_quantity=1,,3,"
                       "\"d.ndjson:4: patient \"\"pt-x\"\"; d.ndjson:9: patient \"\"pt-z\"\"\",,,0\n") != std::string::npos);
  CHECK(html.str().find("<li>" + warning + "</li>") != std::string::npos);
}

TEST_CASE("a split import shows the rows left to other shards in every format, and they add up") {
  ImportSummary summary = Example("d.csv");
  summary.shard = "2/4";
  summary.imported = 2;
  summary.other_shards = 4;
  summary.other_shards_rejected = 1;
  REQUIRE(summary.read == summary.imported + summary.duplicates + summary.rejected + summary.other_shards);
  const nlohmann::ordered_json json = ImportJson({summary, summary});
  CHECK(json.at("other_shards") == 8);
  CHECK(json.at("shard") == "2/4");
  CHECK(json.at("read") == json.at("imported").get<long>() + json.at("duplicates").get<long>() +
                               json.at("rejected").get<long>() + json.at("other_shards").get<long>());
  CHECK(json.at("files").at(0).at("other_shards_rejected") == 1);
  std::ostringstream text, csv, html;
  WriteImportText({summary}, text);
  WriteImportCsv({summary}, csv);
  WriteImportHtml({summary}, html);
  CHECK(text.str().find("rejected  other shards  outcome") != std::string::npos);
  CHECK(text.str().find("d.csv: shard 2/4: 4 of the rows read belong to other shards' patients (not stored here; "
                        "their own shard rejects 1 of them)\n") != std::string::npos);
  CHECK(csv.str().find(",product_flags,shard,other_shards\n") != std::string::npos);
  CHECK(csv.str().find(",2/4,4\n") != std::string::npos);
  CHECK(html.str().find("<th scope=\"col\">other shards</th>") != std::string::npos);
}

TEST_CASE("an import without --shard shows no shard column") {
  std::ostringstream text;
  WriteImportText({Example("d.csv")}, text);
  CHECK(text.str().find("other shards") == std::string::npos);
  CHECK(ImportJson({Example("d.csv")}).at("other_shards") == 0);
  CHECK_FALSE(ImportJson({Example("d.csv")}).contains("shard"));
}

}  // TEST_SUITE

}  // namespace medload
