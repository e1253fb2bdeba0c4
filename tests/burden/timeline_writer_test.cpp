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
