// The UK dm+d release as its XML files lay it out (element names as in the dm+d data
// model, from memory: check against the release's own documentation): f_vmp (VMPS/VMP
// with VPID, NM, INVALID; VIRTUAL_PRODUCT_INGREDIENT/VPI with VPID, ISID and strength
// value and unit codes), f_amp (AMPS/AMP with APID, VPID, NM, DESC, INVALID), f_ingredient
// (ING with ISID, NM) and, optionally, f_lookup (UNIT_OF_MEASURE/INFO with CD, DESC).
// Records are flat, so a small scanner reads them; no XML library is needed.
#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdlib>
#include <map>

#include "formulary/dictionary_release.h"

namespace medload::formulary_internal {
namespace {

using Record = std::map<std::string, std::string, std::less<>>;

void AppendEntity(std::string_view entity, std::string& out) {
  if (entity == "amp") out += '&';
  else if (entity == "lt") out += '<';
  else if (entity == "gt") out += '>';
  else if (entity == "quot") out += '"';
  else if (entity == "apos") out += '\'';
  else if (entity.size() > 1 && entity[0] == '#') {
    const bool hex = entity[1] == 'x' || entity[1] == 'X';
    const unsigned long code = std::strtoul(std::string(entity.substr(hex ? 2 : 1)).c_str(), nullptr, hex ? 16 : 10);
    if (code < 0x80) out += static_cast<char>(code);
    else if (code < 0x800) {
      out += static_cast<char>(0xC0 | (code >> 6));
      out += static_cast<char>(0x80 | (code & 0x3F));
    } else if (code < 0x10000) {
      out += static_cast<char>(0xE0 | (code >> 12));
      out += static_cast<char>(0x80 | ((code >> 6) & 0x3F));
      out += static_cast<char>(0x80 | (code & 0x3F));
    }
  }
}

std::string DecodeText(std::string_view text) {
  std::string out;
  for (size_t i = 0; i < text.size(); ++i) {
    const size_t semicolon = text[i] == '&' ? text.find(';', i) : std::string_view::npos;
    if (semicolon == std::string_view::npos || semicolon - i > 10) {
      out += text[i];
      continue;
    }
    AppendEntity(text.substr(i + 1, semicolon - i - 1), out);
    i = semicolon;
  }
  return out;
}

// The child elements of one flat record: <NAME>text</NAME> or <NAME/>.
Record ReadRecord(std::string_view body) {
  Record record;
  size_t i = 0;
  while ((i = body.find('<', i)) != std::string_view::npos) {
    const size_t close = body.find('>', i);
    if (close == std::string_view::npos) break;
    std::string_view tag = body.substr(i + 1, close - i - 1);
    i = close + 1;
    if (tag.empty() || tag.front() == '/' || tag.front() == '?' || tag.front() == '!') continue;
    if (tag.back() == '/') {
      record.emplace(std::string(tag.substr(0, tag.find_first_of(" /"))), "");
      continue;
    }
    const std::string name(tag.substr(0, tag.find(' ')));
    const size_t end = body.find("</" + name + ">", i);
    if (end == std::string_view::npos) break;
    record.emplace(name, DecodeText(body.substr(i, end - i)));
    i = end + name.size() + 3;
  }
  return record;
}

// Every <tag>...</tag> record in `xml`.
std::vector<Record> Records(std::string_view xml, const std::string& tag) {
  std::vector<Record> records;
  const std::string open = "<" + tag + ">", close = "</" + tag + ">";
  size_t i = 0;
  while ((i = xml.find(open, i)) != std::string_view::npos) {
    const size_t end = xml.find(close, i);
    if (end == std::string_view::npos) break;
    records.push_back(ReadRecord(xml.substr(i + open.size(), end - i - open.size())));
    i = end + close.size();
  }
  return records;
}

std::string Field(const Record& record, std::string_view name) {
  const auto it = record.find(name);
  return it == record.end() ? std::string() : it->second;
}

struct Release {
  std::vector<std::string> names;  // file names, for the source note
  std::map<std::string, std::string> vmp_names, substance_names, units;
  std::map<std::string, std::vector<Record>> ingredients_of;  // VPID -> VPI records
  std::vector<Record> amps;
};

Status ReadFiles(const std::vector<ReleaseFile>& files, Release& release) {
  bool vmp = false, amp = false, ingredient = false;
  for (const ReleaseFile& file : files) {
    const std::string_view xml = file.content;
    release.names.push_back(FileName(file.path));
    if (xml.find("<VIRTUAL_MED_PRODUCTS") != std::string_view::npos) {
      vmp = true;
      for (const Record& r : Records(xml, "VMP")) {
        if (Field(r, "INVALID") != "1") release.vmp_names[Field(r, "VPID")] = Field(r, "NM");
      }
      for (Record& r : Records(xml, "VPI")) release.ingredients_of[Field(r, "VPID")].push_back(std::move(r));
    } else if (xml.find("<ACTUAL_MEDICINAL_PRODUCTS") != std::string_view::npos) {
      amp = true;
      release.amps = Records(xml, "AMP");
    } else if (xml.find("<INGREDIENT_SUBSTANCES") != std::string_view::npos) {
      ingredient = true;
      for (const Record& r : Records(xml, "ING")) release.substance_names[Field(r, "ISID")] = Field(r, "NM");
    } else if (const size_t at = xml.find("<UNIT_OF_MEASURE>"); at != std::string_view::npos) {
      const std::string_view section = xml.substr(at, xml.find("</UNIT_OF_MEASURE>", at) - at);
      for (const Record& r : Records(section, "INFO")) release.units[Field(r, "CD")] = Field(r, "DESC");
    } else {
      return Status::Input(file.path + ": not a dm+d file (no VIRTUAL_MED_PRODUCTS, ACTUAL_MEDICINAL_PRODUCTS, "
                                       "INGREDIENT_SUBSTANCES or UNIT_OF_MEASURE element)");
    }
  }
  if (!vmp) return Status::Input("dm+d: the VMP file (root VIRTUAL_MED_PRODUCTS) is missing");
  if (!ingredient) return Status::Input("dm+d: the ingredient file (root INGREDIENT_SUBSTANCES) is missing");
  static_cast<void>(amp);  // AMPs are optional: without them only VMP codes and names resolve
  return Status::Ok();
}

bool Near(double a, double b) { return std::fabs(a - b) <= 1e-9 * std::max(1.0, std::fabs(b)); }

// The strength of one VPI as text from the lookup's units ("30mg", "5mg/5ml"), or "".
std::string UnitStrength(const Release& release, const Record& vpi) {
  const auto unit = release.units.find(Field(vpi, "STRNT_NMRTR_UOMCD"));
  if (Field(vpi, "STRNT_NMRTR_VAL").empty() || unit == release.units.end()) return "";
  std::string text = Field(vpi, "STRNT_NMRTR_VAL") + unit->second;
  if (!Field(vpi, "STRNT_DNMTR_VAL").empty()) {
    const auto per = release.units.find(Field(vpi, "STRNT_DNMTR_UOMCD"));
    if (per == release.units.end()) return "";
    text += "/" + Field(vpi, "STRNT_DNMTR_VAL") + per->second;
  }
  return ParseStrengths(NormaliseText(text)).size() == 1 ? text : "";
}

// "name=strength" elements for a combination, in the order the VMP name writes the
// strengths: from the lookup's units, else by matching each value with a strength of
// the name; "name=" (strength not known) for all when that fails.
std::vector<std::string> CombinationElements(const Release& release, const std::string& vmp_name,
                                             const std::vector<Record>& vpis, const std::vector<std::string>& names) {
  const std::vector<Strength> written = ParseStrengths(NormaliseText(vmp_name));
  std::vector<std::pair<size_t, std::string>> placed;
  std::vector<bool> used(written.size(), false);
  for (size_t i = 0; i < vpis.size(); ++i) {
    double value = 0;
    const std::string text = Field(vpis[i], "STRNT_NMRTR_VAL");
    const bool number = !text.empty() && std::from_chars(text.data(), text.data() + text.size(), value).ec == std::errc();
    size_t at = written.size();
    for (size_t k = 0; number && k < written.size() && at == written.size(); ++k) {
      const double amount = written[k].amount;
      if (!used[k] && (Near(value, amount) || Near(value, amount * 1000) || Near(value * 1000, amount))) at = k;
    }
    if (at == written.size()) {
      std::vector<std::string> unknown_strengths;
      for (const std::string& name : names) unknown_strengths.push_back(name + "=");
      return unknown_strengths;
    }
    used[at] = true;
    const std::string own = UnitStrength(release, vpis[i]);
    placed.emplace_back(at, names[i] + "=" + (own.empty() ? StrengthText(written[at]) : own));
  }
  std::sort(placed.begin(), placed.end());
  std::vector<std::string> elements;
  for (auto& [at, element] : placed) elements.push_back(std::move(element));
  return elements;
}

// The brand an AMP name carries: its words before the first with a digit, unless they
// are the VMP's own name or name a known ingredient (a generic AMP).
std::string BrandOf(const Formulary& formulary, const std::string& amp_name, const std::string& vmp_name) {
  std::string brand;
  size_t start = 0;
  while (start < amp_name.size()) {
    const size_t end = std::min(amp_name.find(' ', start), amp_name.size());
    const std::string_view word = std::string_view(amp_name).substr(start, end - start);
    if (word.find_first_of("0123456789(") != std::string_view::npos) break;
    brand += (brand.empty() ? "" : " ") + std::string(word);
    start = end + 1;
  }
  const std::string key = NameKey(brand);
  if (key.size() < 4 || NameKey(vmp_name).rfind(key, 0) == 0) return "";
  const MatchKind match = Resolve(formulary, brand).match;
  return match == MatchKind::kUnmatched || match == MatchKind::kProduct ? brand : "";
}

}  // namespace

Result<DictionaryLoad> ReadDmdRelease(const Formulary& formulary, const std::vector<ReleaseFile>& files) {
  Release release;
  if (Status status = ReadFiles(files, release); !status.ok()) return status;
  DictionaryLoad load;
  load.code_system = "dmd";
  std::set<std::string> unknown;
  std::string source = "dm+d release:";
  for (const std::string& name : release.names) source += " " + name;
  std::map<std::string, std::vector<std::string>> elements_of;  // VPID -> ingredients column
  for (const auto& [vpid, vmp_name] : release.vmp_names) {
    const auto vpis = release.ingredients_of.find(vpid);
    if (vpis == release.ingredients_of.end() || vpis->second.empty()) {
      ++load.skipped;
      continue;
    }
    std::vector<std::string> names;
    for (const Record& vpi : vpis->second) {
      const auto substance = release.substance_names.find(Field(vpi, "ISID"));
      const std::string substance_name = substance == release.substance_names.end() ? "substance " + Field(vpi, "ISID")
                                                                                       : substance->second;
      names.push_back(IngredientOfSubstance(formulary, substance_name, unknown));
    }
    elements_of[vpid] = names.size() == 1 ? names : CombinationElements(release, vmp_name, vpis->second, names);
    load.entries.push_back(DictionaryEntry{"dmd", vpid, vmp_name, "", elements_of[vpid], source + " (VMP)", 0});
  }
  for (const Record& amp : release.amps) {
    const auto elements = elements_of.find(Field(amp, "VPID"));
    if (Field(amp, "INVALID") == "1" || elements == elements_of.end()) continue;
    const std::string name = Field(amp, "DESC").empty() ? Field(amp, "NM") : Field(amp, "DESC");
    const std::string brand = BrandOf(formulary, Field(amp, "NM"), release.vmp_names[Field(amp, "VPID")]);
    load.entries.push_back(DictionaryEntry{"dmd", Field(amp, "APID"), name, brand, elements->second, source + " (AMP)", 0});
  }
  load.unknown_substances.assign(unknown.begin(), unknown.end());
  return load;
}

}  // namespace medload::formulary_internal
