#include "medload/synth/population.h"

#include <doctest/doctest.h>

#include <cctype>
#include <cmath>
#include <set>
#include <string>

namespace medload {

namespace {

bool IsPatientId(const std::string& id, size_t digits) {
  if (id.size() != digits + 1 || id[0] != 'Q') return false;
  for (size_t i = 1; i < id.size(); ++i) {
    if (std::isdigit(static_cast<unsigned char>(id[i])) == 0) return false;
  }
  return true;
}

struct Mix {
  std::vector<int> by_band;
  std::vector<int> women_by_band;
  int total = 0;
};

// Draws `count` patients the way the generator does and tallies them by age band.
Mix DrawMix(uint64_t count, const SynthWindow& window, std::vector<SynthPatient>* keep) {
  const SynthNetwork network = MakeNetwork(count, 17);
  const auto bands = SynthAgeBands();
  Mix mix{std::vector<int>(bands.size()), std::vector<int>(bands.size()), 0};
  for (uint64_t i = 0; i < count; ++i) {
    SynthRandom random = SynthRandom::ForStream(17, i);
    SynthPatient patient = MakePatient(i, count, 17, network, window, random);
    for (size_t b = 0; b < bands.size(); ++b) {
      if (patient.age_at_end >= bands[b].min_age && patient.age_at_end <= bands[b].max_age) {
        ++mix.by_band[b];
        if (patient.sex == "female") ++mix.women_by_band[b];
      }
    }
    ++mix.total;
    if (keep != nullptr) keep->push_back(std::move(patient));
  }
  return mix;
}

const SynthWindow kWindow = MakeWindow(Date::FromCivil(2026, 10, 31), 15);

}  // namespace

TEST_SUITE("synth/population") {

TEST_CASE("a network has one practice per about 7500 patients and never fewer than three") {
  CHECK(MakeNetwork(1, 1).practices.size() == 3);
  CHECK(MakeNetwork(2500, 1).practices.size() == 3);
  CHECK(MakeNetwork(30000, 1).practices.size() == 4);
  CHECK(MakeNetwork(1'000'000, 1).practices.size() == 133);
}

TEST_CASE("practice codes and names are unique and the codes follow the invented scheme") {
  const SynthNetwork network = MakeNetwork(2'000'000, 9);
  std::set<std::string> codes;
  std::set<std::string> names;
  for (const SynthPractice& practice : network.practices) {
    CAPTURE(practice.code);
    CHECK(codes.insert(practice.code).second);
    CHECK(names.insert(practice.name).second);
    CHECK(practice.code.rfind("WV", 0) == 0);
    CHECK(practice.weight >= 60);
    CHECK(practice.weight <= 160);
  }
  CHECK(network.practices.front().code == "WV001");
  CHECK_FALSE(network.name.empty());
}

TEST_CASE("the window covers whole months ending on the last day of the end's month") {
  SynthWindow window = MakeWindow(Date::FromCivil(2026, 10, 31), 15);
  CHECK(window.start.ToIso() == "2025-08-01");
  CHECK(window.end.ToIso() == "2026-10-31");
  window = MakeWindow(Date::FromCivil(2024, 2, 10), 1);
  CHECK(window.start.ToIso() == "2024-02-01");
  CHECK(window.end.ToIso() == "2024-02-29");
  window = MakeWindow(Date::FromCivil(2025, 3, 31), 27);
  CHECK(window.start.ToIso() == "2023-01-01");
  CHECK(window.days() == 365 + 366 + 31 + 28 + 31);
}

TEST_CASE("the age bands add up to 1000 with about 18.5 per cent aged 65 and over") {
  int total = 0;
  int older = 0;
  int previous_max = -1;
  for (const AgeBand& band : SynthAgeBands()) {
    CHECK(band.min_age == previous_max + 1);
    previous_max = band.max_age;
    total += band.per_1000;
    if (band.min_age >= 65) older += band.per_1000;
  }
  CHECK(total == 1000);
  // Source: 2021 Census for England, share aged 65 and over about 18.4% (ONS); from memory.
  CHECK(older == 185);
}

TEST_CASE("patient ids are unique, opaque and not in index order") {
  std::set<std::string> ids;
  int neighbours = 0;
  std::string previous;
  for (uint64_t i = 0; i < 100000; ++i) {
    const std::string id = SynthPatientId(i, 100000, 5);
    REQUIRE(IsPatientId(id, 7));
    CHECK(ids.insert(id).second);
    if (!previous.empty() && std::stoll(id.substr(1)) == std::stoll(previous.substr(1)) + 1) {
      ++neighbours;
    }
    previous = id;
  }
  CHECK(neighbours < 100);
  CHECK(SynthPatientId(0, 100, 5) != SynthPatientId(0, 100, 6));
  CHECK(IsPatientId(SynthPatientId(7'000'000, 8'000'000, 5), 9));
}

TEST_CASE("the drawn ages and sexes follow the documented mix") {
  const Mix mix = DrawMix(40000, kWindow, nullptr);
  const auto bands = SynthAgeBands();
  int older = 0;
  for (size_t b = 0; b < bands.size(); ++b) {
    CAPTURE(bands[b].min_age);
    // Within 4.5 standard errors of the documented share.
    const double expected = bands[b].per_1000 / 1000.0;
    const double share = static_cast<double>(mix.by_band[b]) / mix.total;
    CHECK(std::abs(share - expected) < 4.5 * std::sqrt(expected * (1 - expected) / mix.total));
    if (bands[b].min_age >= 65) older += mix.by_band[b];
    const double expected_women = bands[b].female_per_1000 / 1000.0;
    const double women = static_cast<double>(mix.women_by_band[b]) / mix.by_band[b];
    CHECK(std::abs(women - expected_women) <
          4.5 * std::sqrt(expected_women * (1 - expected_women) / mix.by_band[b]));
  }
  const double older_share = static_cast<double>(older) / mix.total;
  CHECK(older_share > 0.175);
  CHECK(older_share < 0.195);
}

TEST_CASE("birth dates give the stated age and registrations are in order") {
  std::vector<SynthPatient> patients;
  DrawMix(20000, kWindow, &patients);
  int year_only = 0, left = 0, joined = 0, temporary = 0, no_start = 0;
  for (const SynthPatient& patient : patients) {
    CAPTURE(patient.patient_id);
    CHECK(CompletedYears(patient.birth_date, kWindow.end) == patient.age_at_end);
    CHECK(patient.practice < 3);
    if (patient.registered_from) {
      CHECK(*patient.registered_from >= patient.birth_date);
      CHECK(*patient.registered_from <= kWindow.end);
      if (*patient.registered_from > kWindow.start) ++joined;
    } else {
      ++no_start;
    }
    if (patient.registered_to) {
      CHECK(*patient.registered_to >= kWindow.start);
      CHECK(*patient.registered_to <= kWindow.end);
      if (patient.registered_from) CHECK(*patient.registered_to >= *patient.registered_from);
      ++left;
    }
    if (patient.birth_year_only) ++year_only;
    if (!patient.in_registry) ++temporary;
  }
  // Shares as documented in docs/synthetic-data.md, with wide margins.
  CHECK(year_only > 300);   // about 3%
  CHECK(year_only < 900);
  CHECK(left > 1000);       // leavers and deaths: about 8-9% over 15 months
  CHECK(joined > 1500);     // joiners and births: about 11% over 15 months
  CHECK(temporary > 40);    // about 0.5%
  CHECK(temporary < 200);
  CHECK(no_start > 300);    // about 3% of legacy rows have no start
}

}  // TEST_SUITE

}  // namespace medload
