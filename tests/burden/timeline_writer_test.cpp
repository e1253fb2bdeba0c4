#include "medload/burden/timeline_writer.h"

#include <doctest/doctest.h>

#include <sstream>

#include "format/svg_checks.h"

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

// One medicine with two 28-day supplies, the second collected 10 days late (on 8 March,
// inside the first one's 28-day tail).
Timeline LateRefill() {
  Timeline timeline;
  Medicine medicine;
  medicine.key = "oxybutynin";
  medicine.ingredients = {"oxybutynin"};
  medicine.episodes = BuildEpisodes(std::vector<Coverage>{{D(2024, 2, 1), 28, 0}, {D(2024, 3, 8), 28, 1}},
                                    EpisodeOptions{30, false});
  timeline.medicines.push_back(medicine);
  return timeline;
}


// A product nothing recognised, dispensed `items` times on `on`.
UnmatchedProduct Unrecognised(const std::string& name, size_t items, Date on) {
  UnmatchedProduct product;
  product.product = name;
  product.dispensed.assign(items, on);
  return product;
}

// A timeline of one medicine and products nothing recognised: 10,000 dispensings of one,
// and 25 more products of two dispensings each.
Timeline WithUnrecognised() {
  Timeline timeline;
  Medicine medicine;
  medicine.key = "amlodipine";
  medicine.ingredients = {"amlodipine"};
  Episode episode;
  episode.start = Date::FromCivil(2024, 1, 1);
  episode.end = Date::FromCivil(2024, 2, 27);
  medicine.episodes.push_back(episode);
  timeline.medicines.push_back(medicine);
  timeline.unmatched.push_back(Unrecognised("Zelquorin 5mg tablets", 10000, Date::FromCivil(2024, 2, 1)));
  for (int i = 0; i < 25; ++i) {
    timeline.unmatched.push_back(Unrecognised("Invented product " + std::to_string(i), 2, Date::FromCivil(2024, 1, 5)));
  }
  timeline.non_medicine_items = 3;
  return timeline;
}

TimelineModel Model(const Timeline& timeline) {
  TimelineModel model;
  model.patient = "T1";
  model.from = Date::FromCivil(2024, 1, 1);
  model.to = Date::FromCivil(2024, 3, 1);
  model.timeline = &timeline;
  return model;
}

}  // namespace

TEST_SUITE("burden/timeline_writer") {

TEST_CASE("an episode's supplied days and its tail days are told apart") {
  const Timeline timeline = LateRefill();
  REQUIRE(timeline.medicines[0].episodes.size() == 1);
  const Episode& episode = timeline.medicines[0].episodes[0];
  // Supplied 1-28 February and 8 March - 4 April; the days between and after are tail.
  const auto spans = SuppliedSpans(episode);
  REQUIRE(spans.size() == 2);
  CHECK(spans[0] == std::make_pair(D(2024, 2, 1), D(2024, 2, 28)));
  CHECK(spans[1] == std::make_pair(D(2024, 3, 8), D(2024, 4, 4)));
  CHECK(episode.end == D(2024, 5, 2));

  TimelineModel model;
  model.patient = "T1";
  model.timeline = &timeline;
  model.from = D(2024, 2, 1);
  model.to = D(2024, 5, 31);
  std::ostringstream text;
  WriteTimelineText(text, model);
  // 92 days in the episode, 56 supplied, 36 in tails.
  CHECK(text.str().find("oxybutynin  2024-02-01  2024-05-02    92        56           36            2") !=
        std::string::npos);
  std::ostringstream svg;
  WriteTimelineSvg(svg, model);
  CHECK(svg.str().find("pale days are tail days") != std::string::npos);
  CHECK(svg.str().find("supplied 2024-03-08 to 2024-04-04") != std::string::npos);
}

TEST_CASE("every timeline format says how many dispensings of which unrecognised products are not drawn") {
  const Timeline timeline = WithUnrecognised();
  const std::vector<std::string> notes = NotDrawnNotes(timeline);
  REQUIRE(notes.size() == 23);
  CHECK(notes[0] ==
        "Not drawn: 10050 dispensings of 26 products that nothing in the formulary recognises; each may be a "
        "medicine, so check them:");
  CHECK(notes[1] == "  \"Zelquorin 5mg tablets\": 10000 dispensings, the last on 2024-02-01");
  CHECK(notes[21] == "  and 6 more products: 12 dispensings");
  CHECK(notes[22] == "Not drawn: 3 dispensings of non-medicines (dressings, appliances, test strips...).");
  using Writer = void (*)(std::ostream&, const TimelineModel&);
  for (const Writer write : {Writer{WriteTimelineText}, Writer{WriteTimelineCsv}, Writer{WriteTimelineSvg},
                             Writer{WriteTimelineHtml}}) {
    std::ostringstream out;
    write(out, Model(timeline));
    CHECK(out.str().find("Not drawn: 10050 dispensings of 26 products") != std::string::npos);
    CHECK(out.str().find("Zelquorin 5mg tablets") != std::string::npos);
  }
}

TEST_CASE("a timeline of a history cut by the store's bound says how many older dispensings it left out") {
  Timeline timeline = WithUnrecognised();
  timeline.unmatched.clear();
  timeline.non_medicine_items = 0;
  const std::vector<std::string> notes = NotDrawnNotes(timeline, 280000, 20000);
  REQUIRE(notes.size() == 1);
  CHECK(notes[0] == "Not drawn: the oldest 280000 dispensings of the patient; a history is read up to its latest "
                    "20000 dispensings.");
  TimelineModel model = Model(timeline);
  model.dropped = 1;
  std::ostringstream out;
  WriteTimelineCsv(out, model);
  CHECK(out.str().find("# Not drawn: the oldest 1 dispensing of the patient;") != std::string::npos);
}

TEST_CASE("a timeline that leaves nothing out has no notes") {
  Timeline timeline = WithUnrecognised();
  timeline.unmatched.clear();
  timeline.non_medicine_items = 0;
  CHECK(NotDrawnNotes(timeline).empty());
  std::ostringstream out;
  WriteTimelineText(out, Model(timeline));
  CHECK(out.str().find("Not drawn") == std::string::npos);
}

TEST_CASE("the timeline JSON gives each episode with its supplied spans, tail days and the caution") {
  const Timeline timeline = LateRefill();
  TimelineModel model;
  model.patient = "T1";
  model.timeline = &timeline;
  model.from = D(2024, 2, 1);
  model.to = D(2024, 5, 31);
  const nlohmann::json json = TimelineJson(model);
  CHECK(json.at("patient") == "T1");
  CHECK(json.at("census").is_null());
  REQUIRE(json.at("episodes").size() == 1);
  const nlohmann::json& episode = json.at("episodes")[0];
  CHECK(episode.at("medicine") == "oxybutynin");
  CHECK(episode.at("days") == 92);
  CHECK(episode.at("supplied_days") == 56);
  CHECK(episode.at("tail_days") == 36);
  CHECK(episode.at("supplied") == nlohmann::json::parse(R"([{"from": "2024-02-01", "to": "2024-02-28"},
                                                             {"from": "2024-03-08", "to": "2024-04-04"}])"));
  CHECK(episode.at("dispensings") == 2);
  CHECK(json.at("caution").get<std::string>().rfind("CAUTION:", 0) == 0);
  model.from = D(2024, 6, 1);  // nothing in range
  model.to = D(2024, 6, 30);
  CHECK(TimelineJson(model).at("episodes").empty());
}

TEST_CASE("the timeline's month labels, scale, census label and key neither overlap nor leave the chart") {
  // Ranges from four months to three years; the census date at the right edge, where its
  // label must turn to the left; a medicine name too long for the label column.
  Timeline timeline = LateRefill();
  timeline.medicines[0].ingredients = {"oxybutynin", "amitriptyline", "hydroxyzine", "chlorphenamine", "promethazine"};
  for (const int months : {4, 13, 24, 36}) {
    CAPTURE(months);
    TimelineModel model;
    model.patient = "T1";
    model.timeline = &timeline;
    model.from = D(2024, 1, 1);
    model.to = EndOfMonth(D(2024 + (months - 1) / 12, (months - 1) % 12 + 1, 1));
    model.census = model.to;
    std::ostringstream out;
    WriteTimelineSvg(out, model);
    const std::string svg = out.str();
    CHECK(testing::Listed(testing::Overlaps(testing::TextBoxes(svg))) == "");
    CHECK(testing::Listed(testing::OutsideDrawing(svg)) == "");
    CHECK(svg.find(">census " + model.to.ToIso() + "</text>") != std::string::npos);
    CHECK(svg.find(">medicines at once</text>") != std::string::npos);
    CHECK(svg.find("text-anchor=\"end\">0</text>") != std::string::npos);  // the scale starts at 0
    CHECK(svg.find("clinical review.</text>") != std::string::npos);        // the key is whole
    CHECK(svg.find(">2024-01</text>") != std::string::npos);
  }
}

}  // TEST_SUITE

}  // namespace medload
