// The form words of product descriptions ("tablets", "oral solution", "eye drops", inhaler
// device names...) and the form, route and dose unit each implies. Private to
// src/formulary/; descriptions are matched after ExpandAbbreviations.
#pragma once

#include <string_view>
#include <vector>

#include "formulary/name_index.h"
#include "medload/formulary/product.h"

namespace medload::formulary_internal {

struct FormWords {
  std::string_view words;      // as written in descriptions (singular)
  std::string_view form;       // the form it means ("modified-release tablet")
  Route route;                 // kUnknown when the words do not say ("spray")
  std::string_view dose_unit;  // what one unit of the quantity is ("tablet", "ml")
};

// The longest form phrase in `words` (leftmost on a tie); nullptr if none.
const FormWords* FindForm(const std::vector<Word>& words);

}  // namespace medload::formulary_internal
