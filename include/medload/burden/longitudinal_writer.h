// How the longitudinal measures (falls, tsdd, pdc) and the 12-month trajectory read in
// outputs: JSON fragments and plain sentences that the meds and worklist writers place
// in every format. Takes finished values; runs no queries and computes no measure.
#pragma once

#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/burden/burden.h"
#include "medload/burden/trajectory.h"

namespace medload {

// One PDC as shown: a medicine ("atorvastatin") or a group of classes ("ace-inhibitor|arb").
struct AdherenceEntry {
  std::string name;
  bool group = false;
  bool active = true;  // a medicine active on the date (a group: any of its medicines)
  PdcFigure figure;
};

// The medicines with a PDC, then the class groups, in the measures' order.
std::vector<AdherenceEntry> AdherenceEntries(const Timeline& timeline, const Burden& burden);

// "62%" (whole per cent, rounded down so that 79.9% never reads as 80%).
std::string PdcPercent(double pdc);

// {"falls", "falls_ingredients", "tsdd", "tsdd_band", "tsdd_from", "tsdd_contributions",
//  "tsdd_incomplete", "adherence": [{"medicine","pdc","dispensings","active",...}],
//  "adherence_groups"}
nlohmann::json LongitudinalJson(const Timeline& timeline, const Burden& burden);
// {"on", "data", "items", "acb", "dbi", "falls", "tsdd" (null without figures), "comparable",
//  "started", "stopped"}
nlohmann::json TrajectoryJson(const Trajectory& trajectory);

// Sentences for one patient's page: falls-risk medicines, exposure, adherence.
std::vector<std::string> LongitudinalLines(const Timeline& timeline, const Burden& burden);
// Reasons for a worklist row: only what stands out (falls-risk medicines, any exposure,
// PDCs below the threshold of adherence).
std::vector<std::string> LongitudinalReasons(const Timeline& timeline, const Burden& burden);
// Warnings: ingredients whose exposure is not known (no strength).
std::vector<std::string> LongitudinalWarnings(const LongitudinalMeasures& measures);

}  // namespace medload
