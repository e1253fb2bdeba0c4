#include "medload/dose/pack_content.h"

#include <doctest/doctest.h>

#include <optional>

namespace medload {
namespace {

struct ContentCase {
  const char* description;
  std::optional<double> doses;
  std::optional<double> ml;
  std::optional<double> units_per_ml;
};

// Descriptions written the way dm+d pack names and RxNorm names spell them (common
// practice): the pack size follows the product ("... 200 dose", "... 2.5ml"), strengths
// are per dose or per ml and are not pack sizes.
const ContentCase kContentCases[] = {
    {"Salbutamol 100micrograms/dose inhaler CFC free 200 dose", 200, std::nullopt, std::nullopt},
    {"Seretide 125 Evohaler 120 doses", 120, std::nullopt, std::nullopt},
    {"Beclometasone 50micrograms/dose nasal spray 200-dose", 200, std::nullopt, std::nullopt},
    {"Tiotropium 2.5micrograms/dose Respimat 60 metered doses", 60, std::nullopt, std::nullopt},
    {"Ipratropium 20micrograms/dose inhaler 200 actuations", 200, std::nullopt, std::nullopt},
    {"Salbutamol 100micrograms/dose inhaler CFC free", std::nullopt, std::nullopt, std::nullopt},
    {"Latanoprost 50micrograms/ml eye drops 2.5ml", std::nullopt, 2.5, std::nullopt},
    {"Chloramphenicol 0.5% eye drops 10 ml", std::nullopt, 10, std::nullopt},
    {"Oramorph 10mg/5ml oral solution 100ml", std::nullopt, 100, std::nullopt},
    {"Morphine sulfate 10mg/5ml oral solution", std::nullopt, std::nullopt, std::nullopt},
    {"Insulin glargine 100units/ml solution for injection 3ml pre-filled pens", std::nullopt, 3,
     100},
    {"Humalog 200units/ml KwikPen 3ml pre-filled pen", std::nullopt, 3, 200},
    {"Insulin aspart 100 units/1ml 3ml cartridge", std::nullopt, 3, 100},
    {"insulin glargine 100 UNT/ML Pen Injector", std::nullopt, std::nullopt, 100},
    {"Humulin R U-500 KwikPen", std::nullopt, std::nullopt, 500},
    {"Toujeo 300 units per ml 1.5ml pen", std::nullopt, 1.5, 300},
    {"Amlodipine 5mg tablets 28 tablet", std::nullopt, std::nullopt, std::nullopt},
    {"", std::nullopt, std::nullopt, std::nullopt},
};

}  // namespace

TEST_SUITE("dose/pack_content") {

TEST_CASE("a description's pack size is read and its strengths are not") {
  for (const ContentCase& c : kContentCases) {
    CAPTURE(c.description);
    const PackContent content = ReadPackContent(c.description);
    CHECK(content.doses == c.doses);
    CHECK(content.ml == c.ml);
    CHECK(content.units_per_ml == c.units_per_ml);
  }
}

TEST_CASE("a device's usual doses come from its name, else from its form") {
  struct Case {
    const char* form;
    const char* description;
    size_t ingredients;
    std::optional<double> doses;
  };
  // From memory: usual UK pack sizes (Ellipta 30 doses; Accuhaler, Genuair, Respimat 60;
  // Spiromax, NEXThaler 120; salbutamol and beclometasone pressurised inhalers 200,
  // combination pressurised inhalers 120; the smallest common nasal spray 120).
  const Case cases[] = {
      {"inhalation powder", "Relvar Ellipta 92micrograms/22micrograms/dose", 2, 30},
      {"inhalation powder", "Seretide 500 Accuhaler", 2, 60},
      {"inhalation solution", "Spiriva Respimat 2.5micrograms/dose", 1, 60},
      {"inhalation powder", "DuoResp Spiromax 160/4.5", 2, 120},
      {"inhaler", "Salbutamol 100micrograms/dose inhaler CFC free", 1, 200},
      {"inhaler", "Fostair 100/6 inhaler", 2, 120},
      {"inhalation powder", "Budesonide 200micrograms/dose inhalation powder", 1, 60},
      {"nasal spray", "Fluticasone 50micrograms/dose nasal spray", 1, 120},
      {"eye drops", "Latanoprost 50micrograms/ml eye drops", 1, std::nullopt},
      {"tablet", "Amlodipine 5mg tablets", 1, std::nullopt},
  };
  for (const Case& c : cases) {
    CAPTURE(c.description);
    CHECK(UsualDosesPerDevice(c.form, c.description, c.ingredients) == c.doses);
  }
}

TEST_CASE("units that name a container are told from dose units") {
  for (const char* unit : {"inhaler", "Inhalers", "pen", "pens", "cartridge", "bottle(s)",
                           "pack", "device", "vial", "pre-filled pen",
                           "pre-filled disposable injection", "injection"}) {
    CAPTURE(unit);
    CHECK(IsContainerUnit(unit));
  }
  for (const char* unit : {"", "dose", "puff", "ml", "tablet", "unit", "spray", "packet of"}) {
    CAPTURE(unit);
    CHECK_FALSE(IsContainerUnit(unit));
  }
}

TEST_CASE("a small whole quantity that is not a multiple of one pack's content is packs") {
  struct Case {
    double quantity;
    double content;
    bool packs;
  };
  const Case cases[] = {
      {1, 200, true},   {2, 200, true},  {200, 200, false}, {120, 200, false},
      {5, 3, true},     {10, 3, true},   {15, 3, false},    {3, 3, false},
      {6, 3, false},    {1, 2.5, true},  {2.5, 2.5, false}, {5, 2.5, false},
      {11, 200, false}, {0, 200, false}, {1.5, 200, false}, {1, 0.5, false},
  };
  for (const Case& c : cases) {
    CAPTURE(c.quantity);
    CAPTURE(c.content);
    CHECK(LooksLikeContainers(c.quantity, c.content) == c.packs);
  }
}

}  // TEST_SUITE

}  // namespace medload
