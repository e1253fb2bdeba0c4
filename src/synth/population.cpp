#include "medload/synth/population.h"

#include <algorithm>
#include <array>
#include <string_view>

namespace medload {
namespace {

constexpr uint64_t kPracticeSalt = 0x70726163746963ULL;  // keeps practice draws apart
constexpr uint64_t kIdSalt = 0x7061746965ULL;
constexpr uint64_t kPatientsPerPractice = 7500;

// Invented place words and practice kinds; combined, they name every practice.
constexpr std::array<std::string_view, 16> kPlaces = {
    "Wrenfold Road", "Millbeck Lane", "Kestrel Green", "Orchard Rise",
    "Hollyfen",      "Brackenmere",   "Larkspur Street", "Ferncombe",
    "Ashdyke",       "Tollbridge",    "Pennyfold",     "Marram Quay",
    "Otterbrook",    "Linnetgate",    "Sorrel Hill",   "Thistleby"};
constexpr std::array<std::string_view, 6> kKinds = {
    "Surgery", "Medical Centre", "Health Centre", "Medical Practice", "Family Practice",
    "Group Practice"};

// Age mix by five-year band (per 1,000) and women per 1,000 in each band: close to the
// 2021 Census for England (ONS), from memory; registered lists are similar.
constexpr std::array<AgeBand, 19> kAgeBands = {{
    {0, 4, 54, 488},    {5, 9, 59, 488},    {10, 14, 60, 488},  {15, 19, 57, 490},
    {20, 24, 60, 495},  {25, 29, 68, 502},  {30, 34, 69, 505},  {35, 39, 67, 505},
    {40, 44, 63, 505},  {45, 49, 64, 507},  {50, 54, 69, 508},  {55, 59, 67, 508},
    {60, 64, 58, 512},  {65, 69, 50, 515},  {70, 74, 50, 525},  {75, 79, 37, 545},
    {80, 84, 25, 575},  {85, 89, 15, 615},  {90, 100, 8, 690},
}};

std::string ZeroPadded(uint64_t value, size_t width) {
  std::string digits = std::to_string(value);
  if (digits.size() < width) digits.insert(0, width - digits.size(), '0');
  return digits;
}

// A balanced Feistel network on `bits` bits (even), keyed: a bijection on [0, 2^bits).
uint64_t Feistel(uint64_t value, int bits, uint64_t key) {
  const int half = bits / 2;
  const uint64_t mask = (uint64_t{1} << half) - 1;
  uint64_t left = value >> half;
  uint64_t right = value & mask;
  for (uint64_t round = 0; round < 4; ++round) {
    uint64_t state = (right << 8) ^ (key + round);
    const uint64_t f = SplitMix64(state) & mask;
    const uint64_t next = left ^ f;
    left = right;
    right = next;
  }
  return (left << half) | right;
}

// The last day of month `month` of `year`, or `day` if that is earlier.
Date ClampedDay(int year, int month, int day) {
  const Date last = EndOfMonth(Date::FromCivil(year, month, 1));
  return Date::FromCivil(year, month, std::min(day, last.day()));
}

int DrawAge(SynthRandom& random, size_t& band_index) {
  std::array<int, kAgeBands.size()> weights{};
  for (size_t i = 0; i < kAgeBands.size(); ++i) weights[i] = kAgeBands[i].per_1000;
  band_index = random.PickWeighted(weights);
  const AgeBand& band = kAgeBands[band_index];
  if (band.min_age == 90) {
    // Few people are over 95: keep most of the top band in its first years.
    return random.Chance(7500) ? random.Between(90, 94) : random.Between(95, band.max_age);
  }
  return random.Between(band.min_age, band.max_age);
}

// A birth date that makes the patient exactly `age` on `end`.
Date DrawBirthDate(int age, Date end, SynthRandom& random) {
  const Date latest = ClampedDay(end.year() - age, end.month(), end.day());
  const Date earliest = ClampedDay(end.year() - age - 1, end.month(), end.day()) + 1;
  const auto span = static_cast<uint32_t>(latest - earliest + 1);
  return earliest + static_cast<int32_t>(random.Below(span));
}

// Deaths per 10,000 a year by age (from memory, rounded: England life tables).
int DeathsPer10000(int age) {
  if (age >= 90) return 1600;
  if (age >= 80) return 650;
  if (age >= 70) return 230;
  if (age >= 60) return 90;
  return 15;
}

Date DrawDay(Date from, Date to, SynthRandom& random) {
  if (to <= from) return from;
  return from + static_cast<int32_t>(random.Below(static_cast<uint32_t>(to - from + 1)));
}

void DrawRegistration(SynthPatient& patient, const SynthWindow& window, int months,
                      SynthRandom& random) {
  const int years_scale = std::max(1, months);
  if (!patient.in_registry) {
    // A temporary resident: a stay of two weeks to three months inside the window.
    const Date arrived = DrawDay(std::max(window.start, patient.birth_date), window.end, random);
    patient.registered_from = arrived;
    patient.registered_to = std::min(window.end, arrived + random.Between(14, 90));
    return;
  }
  Date from;
  if (patient.birth_date > window.start - 30) {
    from = std::min(window.end, patient.birth_date + random.Between(7, 42));
  } else if (random.Chance(std::min(5000, 800 * years_scale / 12))) {
    from = std::max(patient.birth_date, DrawDay(window.start, window.end, random));
  } else {
    const Date earliest = std::max(patient.birth_date, window.start - 25 * 365);
    from = DrawDay(earliest, window.start - 1, random);
  }
  if (!random.Chance(300)) patient.registered_from = from;
  const int leave = 600 * years_scale / 12 + DeathsPer10000(patient.age_at_end) * years_scale / 12;
  if (random.Chance(leave)) {
    patient.registered_to = DrawDay(std::max(from, window.start), window.end, random);
  }
}

}  // namespace

SynthNetwork MakeNetwork(uint64_t patients, uint64_t seed) {
  SynthNetwork network;
  network.name = "Wrenfold Vale Care Network";
  const uint64_t count = std::max<uint64_t>(3, (patients + kPatientsPerPractice / 2) /
                                                   kPatientsPerPractice);
  SynthRandom random(seed ^ kPracticeSalt);
  for (uint64_t i = 0; i < count; ++i) {
    SynthPractice practice;
    practice.code = "WV" + ZeroPadded(i + 1, 3);
    practice.name = std::string(kPlaces[i % kPlaces.size()]) + " " +
                    std::string(kKinds[(i / kPlaces.size() + i) % kKinds.size()]);
    const uint64_t round = i / (kPlaces.size() * kKinds.size());
    if (round > 0) practice.name += " " + std::to_string(round + 1);
    practice.weight = random.Between(60, 160);
    network.practices.push_back(std::move(practice));
  }
  return network;
}

SynthWindow MakeWindow(Date end, int months) {
  const Date last = EndOfMonth(end);
  int month_index = last.year() * 12 + (last.month() - 1) - (months - 1);
  return SynthWindow{Date::FromCivil(month_index / 12, month_index % 12 + 1, 1), last};
}

std::span<const AgeBand> SynthAgeBands() { return kAgeBands; }

std::string SynthPatientId(uint64_t index, uint64_t patients, uint64_t seed) {
  // Seven digits while ids stay sparse (at most half the space used), else nine.
  const bool wide = patients > 5'000'000;
  const int bits = wide ? 30 : 24;
  const uint64_t limit = wide ? 1'000'000'000ULL : 10'000'000ULL;
  uint64_t key_state = seed ^ kIdSalt;
  const uint64_t key = SplitMix64(key_state);
  uint64_t value = index;
  do {
    value = Feistel(value, bits, key);  // cycle-walk until the value is in range
  } while (value >= limit);
  return "Q" + ZeroPadded(value, wide ? 9 : 7);
}

SynthPatient MakePatient(uint64_t index, uint64_t patients, uint64_t seed,
                         const SynthNetwork& network, const SynthWindow& window,
                         SynthRandom& random) {
  SynthPatient patient;
  patient.index = index;
  patient.patient_id = SynthPatientId(index, patients, seed);
  size_t band = 0;
  patient.age_at_end = DrawAge(random, band);
  patient.birth_date = DrawBirthDate(patient.age_at_end, window.end, random);
  patient.birth_year_only = random.Chance(300);
  if (random.Chance(5)) {
    patient.sex = "unknown";
  } else {
    patient.sex = random.Chance(kAgeBands[band].female_per_1000 * 10) ? "female" : "male";
  }
  std::vector<int> weights;
  weights.reserve(network.practices.size());
  for (const SynthPractice& practice : network.practices) weights.push_back(practice.weight);
  patient.practice = random.PickWeighted(weights);
  patient.in_registry = !random.Chance(50);
  const int months = (window.end.year() - window.start.year()) * 12 + window.end.month() -
                     window.start.month() + 1;
  DrawRegistration(patient, window, months, random);
  return patient;
}

}  // namespace medload
