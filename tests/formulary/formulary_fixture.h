// Shared by the formulary tests: the bundled formulary loaded once, and a temporary
// folder that a test fills with tables and that removes itself.
#pragma once

#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include <unistd.h>

#include "medload/formulary/formulary.h"

namespace medload::testing {

// The bundled formulary/ folder, loaded once; fails the test if it does not load.
inline const Formulary& BundledFormulary() {
  static const Formulary formulary = [] {
    auto loaded = LoadFormulary(MEDLOAD_SOURCE_FORMULARY);
    if (!loaded.ok()) FAIL("bundled formulary does not load: " << loaded.status().message());
    return std::move(loaded).value();
  }();
  return formulary;
}

// A fresh folder under the system temporary folder, removed with its contents.
class TempFolder {
 public:
  TempFolder() {
    static int counter = 0;
    path_ = std::filesystem::temp_directory_path() /
            ("medload-formulary-test-" + std::to_string(::getpid()) + "-" + std::to_string(++counter));
    std::filesystem::remove_all(path_);
    std::filesystem::create_directories(path_ / "anticholinergic");
  }
  ~TempFolder() {
    std::error_code error;
    std::filesystem::remove_all(path_, error);
  }
  TempFolder(const TempFolder&) = delete;
  TempFolder& operator=(const TempFolder&) = delete;

  void Write(const std::string& relative, const std::string& content) const {
    std::ofstream out(path_ / relative, std::ios::binary | std::ios::trunc);
    out << content;
  }
  std::string path() const { return path_.string(); }

 private:
  std::filesystem::path path_;
};

// A small valid formulary: three ingredients, an ACB scale, one DBI row, and every other
// required table with its header only (no rules).
inline void WriteMinimalFormulary(const TempFolder& folder) {
  folder.Write("products.csv",
               "product,requires,ingredients,form,route,dose_unit,supply_days_per_unit,source\n");
  folder.Write("codes.csv", "code_system,code,product_or_ingredient,source\n");
  folder.Write("non_medicines.csv", "term,category,source\n");
  folder.Write("dbi_classes.csv", "class,effect,source\n");
  folder.Write("brands.csv", "brand,ingredients,source\n");
  folder.Write("rules.json", "{\"rules\": []}\n");
  folder.Write("ingredients.csv",
               "ingredient,synonyms,atc,classes,source\n"
               "chlorphenamine,chlorpheniramine,R06AB04,antihistamine-sedating,test\n"
               "ibuprofen,,M01AE01,nsaid,test\n"
               "ramipril,,C09AA05,ace-inhibitor,test\n");
  folder.Write("anticholinergic/acb.csv", "ingredient,score,source\nchlorpheniramine,3,test\n");
  folder.Write("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,4,both,test\n");
}

}  // namespace medload::testing
