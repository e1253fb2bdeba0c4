// Which long-term conditions an invented patient has and which catalogue products treat
// them, with the usual co-prescription (an ACE inhibitor with a diuretic, an opioid with
// a laxative), and which short courses the patient receives. Prevalences are rough,
// age-banded and documented in docs/synthetic-data.md. It does not date any supply
// (history.h does).
#pragma once

#include <array>
#include <string_view>
#include <vector>

#include "medload/synth/random.h"

namespace medload {

// One product choice of a treatment step, with its relative weight, and a companion
// product that may come with it (pen needles with insulin, a PPI with an NSAID).
struct CareOption {
  std::string_view product;  // a catalogue key
  int weight;
  std::string_view companion = {};  // a catalogue key or empty
  int companion_per_10000 = 0;
};

// One treatment step of a condition: given with probability per_10000, as one of
// `options`.
struct CareStep {
  int per_10000;
  std::vector<CareOption> options;
};

// Extra short courses that a condition brings (rescue packs for COPD).
struct CareExtraCourse {
  std::string_view product;  // a catalogue key
  int per_10000_year;
};

// Age bands of the prevalence tables: 0-17, 18-39, 40-49, 50-59, 60-69, 70-79, 80+.
inline constexpr std::array<int, 7> kCareAgeBandStarts = {0, 18, 40, 50, 60, 70, 80};

struct CareCondition {
  std::string_view name;
  std::array<int, 7> per_10000;  // prevalence by age band before the frailty factor
  int female_percent;            // prevalence multiplier for women (100 = none)
  int male_percent;              // and for men
  std::vector<CareStep> steps;   // a condition present gets at least its first step
  std::vector<CareExtraCourse> extra_courses = {};
};

// The long-term conditions, in a fixed order.
const std::vector<CareCondition>& SynthConditions();

// A short course: a product and its rate (per 10,000 patients a year) by age band.
struct CareCourse {
  std::string_view product;
  std::array<int, 7> per_10000_year;
  int female_percent;
  int male_percent;
};

// The short courses (antibiotics, NSAID and steroid courses, creams), in a fixed order.
const std::vector<CareCourse>& SynthCourses();

struct PlannedMedicine {
  size_t product = 0;          // index into SynthCatalogue()
  size_t condition = 0;        // index into SynthConditions()
  double quantity = 0;         // per dispensing: the usual quantity times 1, 2 or 3
  bool starts_in_window = false;  // newly started: the first supply falls inside the window
};

struct PlannedCourse {
  size_t product = 0;  // index into SynthCatalogue()
  int day = 0;         // day of the window, 0-based
};

struct CarePlan {
  std::vector<size_t> conditions;           // indexes into SynthConditions()
  std::vector<PlannedMedicine> medicines;   // repeats: regular, as-needed and appliances
  std::vector<PlannedCourse> courses;       // in day order
  int frailty_percent = 100;                // how much likelier than usual conditions are
};

// The patient's plan for a window of `window_days` days. `age` is the age at the end of
// the window. Each medicine appears at most once. REQUIRES: window_days >= 1.
CarePlan PlanCare(int age, bool female, int window_days, SynthRandom& random);

}  // namespace medload
