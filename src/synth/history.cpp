#include "medload/synth/history.h"

#include <algorithm>

#include "medload/synth/catalogue.h"

namespace medload {
namespace {

// The days on which this patient can be dispensed to: the window cut to the registration.
struct Period {
  Date from;
  Date to;
  bool empty() const { return to < from; }
  int days() const { return to - from + 1; }
};

Period ActivePeriod(const SynthPatient& patient, const SynthWindow& window) {
  Period period{window.start, window.end};
  if (patient.registered_from) period.from = std::max(period.from, *patient.registered_from);
  if (patient.registered_to) period.to = std::min(period.to, *patient.registered_to);
  return period;
}

Date DrawDay(Date from, Date to, SynthRandom& random) {
  if (to <= from) return from;
  return from + static_cast<int32_t>(random.Below(static_cast<uint32_t>(to - from + 1)));
}

// Community pharmacies are mostly closed on Sundays: a Sunday supply moves to Monday.
Date OpenDay(Date date) {
  const int weekday = ((date.days() % 7) + 7) % 7;  // 0 = Thursday (1970-01-01)
  return weekday == 3 ? date + 1 : date;
}

// Days early (negative) or late of a repeat against its due date: mostly on time, some
// early, some late, a few long gaps.
int RefillOffset(SynthRandom& random) {
  const uint32_t draw = random.Below(10000);
  if (draw < 7000) return random.Between(-3, 3);
  if (draw < 8500) return random.Between(-9, -4);
  if (draw < 9700) return random.Between(4, 14);
  return random.Between(15, 75);
}

int PickText(const CatalogueProduct& product, SynthRandom& random) {
  const auto& texts = product.dosage->texts;
  int index = 0;
  if (texts.size() > 1 && !random.Chance(5000)) {
    index = 1 + static_cast<int>(random.Below(static_cast<uint32_t>(texts.size() - 1)));
  }
  return texts[static_cast<size_t>(index)].empty() ? -1 : index;
}

// What the line records: about 62% days supply and text, 30% text only, 3% days only and
// 5% neither where days supply can be known; text or nothing where it cannot.
void Record(Date date, size_t product_index, double quantity, int text, SynthRandom& random,
            SynthHistory& history) {
  const CatalogueProduct& product = SynthCatalogue()[product_index];
  SynthDispensing line;
  line.dispensed_on = date;
  line.product = product_index;
  line.quantity = quantity;
  const std::optional<int> days = DaysCovered(product, quantity);
  const uint32_t draw = random.Below(10000);
  bool write_text = true;
  if (days) {
    if (draw < 6200 || (draw >= 9200 && draw < 9500)) line.days_supply = days;
    write_text = draw < 9200;
  } else {
    write_text = draw < 9000;
  }
  line.dosage_text = write_text ? text : -1;
  line.structured_dosage =
      line.dosage_text >= 0 && UnitsPerDay(*product.dosage).has_value() && random.Chance(4000);
  if (random.Chance(150)) line.voided_copy = random.Chance(6667) ? 1 : 2;
  history.dispensings.push_back(line);
}

// Another strength of the same medicine, if the catalogue has one.
std::optional<size_t> OtherStrength(size_t product_index, SynthRandom& random) {
  const auto& catalogue = SynthCatalogue();
  std::vector<size_t> others;
  for (size_t i = 0; i < catalogue.size(); ++i) {
    if (i != product_index && catalogue[i].medicine == catalogue[product_index].medicine &&
        catalogue[i].use == catalogue[product_index].use) {
      others.push_back(i);
    }
  }
  if (others.empty()) return std::nullopt;
  return others[random.Below(static_cast<uint32_t>(others.size()))];
}

// Days from one supply to the next, before the early/late offset.
int BaseInterval(const CatalogueProduct& product, double quantity, SynthRandom& random) {
  const int covered = DaysCovered(product, quantity).value_or(28);
  switch (product.use) {
    case CatalogueUse::kRegular:
      return covered;
    case CatalogueUse::kAsNeeded: {
      const int usual = product.repeat_days > 0 ? product.repeat_days : covered;
      return std::max(7, usual * random.Between(60, 250) / 100);
    }
    case CatalogueUse::kAppliance:
    case CatalogueUse::kCourse:
      break;
  }
  const int usual = product.repeat_days > 0 ? product.repeat_days : covered;
  return std::max(7, usual * random.Between(75, 130) / 100);
}

struct Repeat {
  PlannedMedicine medicine;
  std::optional<Date> stop;  // the first day with no more supplies
};

void ScheduleRepeat(const Repeat& repeat, const Period& period, const SynthWindow& window,
                    SynthRandom& random, SynthHistory& history) {
  size_t product_index = repeat.medicine.product;
  double quantity = repeat.medicine.quantity;
  const CatalogueProduct* product = &SynthCatalogue()[product_index];
  int text = PickText(*product, random);
  const int scale = std::max(1, period.days() * 10000 / 365);  // per 10,000 of a year
  std::optional<Date> change_on;
  std::optional<size_t> change_to;
  if (random.Chance(500 * scale / 10000)) {
    change_to = OtherStrength(product_index, random);
    if (change_to) change_on = DrawDay(period.from, period.to, random);
  }
  const Date last = repeat.stop ? std::min(period.to, *repeat.stop - 1) : period.to;
  const int first_interval = BaseInterval(*product, quantity, random);
  Date date;
  if (repeat.medicine.starts_in_window) {
    date = OpenDay(DrawDay(period.from, period.to, random));
  } else if (period.from > window.start) {
    date = OpenDay(period.from + random.Between(0, 13));  // a new registration's first supply
  } else {
    date = OpenDay(window.start - static_cast<int32_t>(random.Below(
                                      static_cast<uint32_t>(first_interval))));
  }
  while (date <= last) {
    if (change_on && date >= *change_on) {
      product_index = *change_to;
      product = &SynthCatalogue()[product_index];
      const double months = quantity / SynthCatalogue()[repeat.medicine.product].quantity;
      quantity = product->quantity * months;
      text = PickText(*product, random);
      change_on.reset();
    }
    if (date >= period.from) Record(date, product_index, quantity, text, random, history);
    const int interval = BaseInterval(*product, quantity, random);
    const int offset = product->use == CatalogueUse::kRegular ? RefillOffset(random) : 0;
    date = OpenDay(date + std::max(std::max(1, interval / 2), interval + offset));
  }
}

// A structured medication review for older or heavily treated patients, which may stop
// one medicine that is a usual target of review.
void PlanReview(const CarePlan& plan, const SynthPatient& patient, const Period& period,
                SynthRandom& random, SynthHistory& history, std::vector<Repeat>& repeats) {
  const int count = static_cast<int>(plan.medicines.size());
  int per_year = 0;
  if (patient.age_at_end >= 65 && count >= 5) per_year = 2500;
  if (count >= 10) per_year = 4000;
  if (per_year == 0 || !random.Chance(per_year * period.days() / 365)) return;
  const Date reviewed_on = DrawDay(period.from, period.to, random);
  history.reviewed_on = reviewed_on;
  std::vector<size_t> targets;
  for (size_t i = 0; i < repeats.size(); ++i) {
    if (SynthCatalogue()[repeats[i].medicine.product].review_target) targets.push_back(i);
  }
  if (targets.empty() || !random.Chance(5000)) return;
  Repeat& stopped = repeats[targets[random.Below(static_cast<uint32_t>(targets.size()))]];
  const Date stop = reviewed_on + random.Between(0, 21);
  if (!stopped.stop || stop < *stopped.stop) stopped.stop = stop;
}

}  // namespace

void BuildHistory(const CarePlan& plan, const SynthPatient& patient, const SynthWindow& window,
                  SynthRandom& random, SynthHistory& history) {
  history.dispensings.clear();
  history.reviewed_on.reset();
  const Period period = ActivePeriod(patient, window);
  if (period.empty()) return;
  std::vector<Repeat> repeats;
  repeats.reserve(plan.medicines.size());
  for (const PlannedMedicine& medicine : plan.medicines) {
    Repeat repeat{medicine, std::nullopt};
    const bool can_stop = SynthCatalogue()[medicine.product].use != CatalogueUse::kAppliance;
    if (can_stop && random.Chance(700 * period.days() / 365)) {
      repeat.stop = DrawDay(period.from, period.to, random);
    }
    repeats.push_back(repeat);
  }
  if (patient.in_registry) PlanReview(plan, patient, period, random, history, repeats);
  for (const Repeat& repeat : repeats) ScheduleRepeat(repeat, period, window, random, history);
  for (const PlannedCourse& course : plan.courses) {
    const Date date = OpenDay(window.start + course.day);
    if (date < period.from || date > period.to) continue;
    const CatalogueProduct& product = SynthCatalogue()[course.product];
    Record(date, course.product, product.quantity, PickText(product, random), random, history);
  }
  std::stable_sort(history.dispensings.begin(), history.dispensings.end(),
                   [](const SynthDispensing& a, const SynthDispensing& b) {
                     return a.dispensed_on < b.dispensed_on;
                   });
}

}  // namespace medload
