#include "medload/report/digest.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <sstream>

#include "medload/core/caution.h"
#include "medload/core/hash.h"
#include "medload/core/text.h"
#include "medload/format/output.h"
#include "medload/format/shown_text.h"
#include "medload/format/suppression.h"
#include "medload/report/funnel.h"
#include "medload/report/report_files.h"

namespace medload {
namespace {

constexpr size_t kLineWidth = 78;
constexpr double kDigestCoverage = 0.998;

std::optional<long> Shown(long count, long suppress_below) {
  if (IsSuppressed(count, suppress_below)) return std::nullopt;
  return count;
}

std::string Signed(long value) { return (value > 0 ? "+" : "") + std::to_string(value); }

std::string SignedPercent(double value) {
  return (value > 0 ? "+" : "") + FormatNumber(value, 1) + "%";
}

// Base64 of `bytes` (RFC 4648 section 4, with padding).
std::string Base64(std::string_view bytes) {
  static constexpr char kAlphabet[] = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
  std::string out;
  for (size_t i = 0; i < bytes.size(); i += 3) {
    uint32_t group = static_cast<uint32_t>(static_cast<unsigned char>(bytes[i])) << 16;
    if (i + 1 < bytes.size()) group |= static_cast<uint32_t>(static_cast<unsigned char>(bytes[i + 1])) << 8;
    if (i + 2 < bytes.size()) group |= static_cast<uint32_t>(static_cast<unsigned char>(bytes[i + 2]));
    out += kAlphabet[(group >> 18) & 63];
    out += kAlphabet[(group >> 12) & 63];
    out += i + 1 < bytes.size() ? kAlphabet[(group >> 6) & 63] : '=';
    out += i + 2 < bytes.size() ? kAlphabet[group & 63] : '=';
  }
  return out;
}

bool IsPrintableAscii(char c) {
  const auto byte = static_cast<unsigned char>(c);
  return byte >= 0x20 && byte < 0x7f;
}

// Encoded words for `run` (RFC 2047 section 2: "=?UTF-8?B?...?=", at most 75 characters
// each, so at most 45 bytes of text), cut between UTF-8 characters, separated by spaces
// (which a reader drops between encoded words).
std::string EncodedWords(std::string_view run) {
  constexpr size_t kMaxBytes = 45;
  std::string out;
  while (!run.empty()) {
    size_t take = std::min(run.size(), kMaxBytes);
    while (take < run.size() && take > 1 && (static_cast<unsigned char>(run[take]) & 0xC0) == 0x80) --take;
    out += (out.empty() ? "" : " ") + std::string("=?UTF-8?B?") + Base64(run.substr(0, take)) + "?=";
    run.remove_prefix(take);
  }
  return out;
}

// A header value as printable ASCII on one line: control characters become spaces, and
// runs of words holding other bytes become RFC 2047 encoded words (the spaces between
// those words inside the encoding, so they survive). A word holding '@' or '<' is part of
// an address, which cannot be encoded: its other bytes become '?'.
std::string HeaderValue(const std::string& text) {
  std::vector<std::string> words;
  std::string word;
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    if (c == ' ' || byte < 0x20 || byte == 0x7f) {
      if (!word.empty()) words.push_back(std::move(word));
      word.clear();
    } else {
      word += c;
    }
  }
  if (!word.empty()) words.push_back(std::move(word));
  std::string value;
  std::string run;  // words waiting to be encoded together
  const auto flush = [&] {
    if (run.empty()) return;
    value += (value.empty() ? "" : " ") + EncodedWords(run);
    run.clear();
  };
  for (std::string& w : words) {
    const bool ascii = std::all_of(w.begin(), w.end(), IsPrintableAscii);
    if (!ascii && w.find_first_of("@<") == std::string::npos) {
      run += (run.empty() ? "" : " ") + w;
      continue;
    }
    flush();
    if (!ascii) std::replace_if(w.begin(), w.end(), [](char c) { return !IsPrintableAscii(c); }, '?');
    value += (value.empty() ? "" : " ") + w;
  }
  flush();
  return value;
}

// "Name: value" folded at spaces so that no line exceeds 78 characters (RFC 5322 2.2.3).
std::string Header(const std::string& name, const std::string& value) {
  std::vector<std::string> lines = WrapText(name + ": " + HeaderValue(value), kLineWidth, 1);
  std::string text;
  for (const std::string& line : lines) text += line + "\r\n";
  return text;
}

// The rise triggers a measure crossed, each in words naming the trigger.
std::vector<std::string> RisesCrossed(const DigestMeasure& m, const DigestTriggers& t) {
  std::vector<std::string> crossed;
  if (!m.change.patients || *m.change.patients <= 0) return crossed;
  if (t.rise_patients && *m.change.patients >= *t.rise_patients) {
    crossed.push_back("rise_patients " + std::to_string(*t.rise_patients));
  }
  if (t.rise_percent && m.change.percent && *m.change.percent >= *t.rise_percent) {
    crossed.push_back("rise_percent " + FormatNumber(*t.rise_percent, 1));
  }
  return crossed;
}

// How many triggers are set.
size_t TriggersSet(const DigestTriggers& t) {
  return (t.rise_patients ? 1U : 0U) + (t.rise_percent ? 1U : 0U) + (t.above_upper_limit ? 1U : 0U);
}

// A measure that crossed: its rise (if any) and its limit finding (if any), each naming
// the trigger crossed in brackets.
std::string Finding(const DigestMeasure& m, const std::vector<std::string>& rises, const std::string& since,
                    const std::optional<std::string>& limit) {
  std::vector<std::string> parts;
  if (!rises.empty()) {
    std::string rise = "up " + std::to_string(*m.change.patients) + (*m.change.patients == 1 ? " patient" : " patients");
    if (m.change.percent) rise += " (" + SignedPercent(*m.change.percent) + ")";
    parts.push_back(rise + " since " + since + " [" + Join(rises, ", ") + "]");
  }
  if (limit) parts.push_back(*limit + " [above_upper_limit]");
  return m.key + ": " + Join(parts, "; ");
}

void AddMeasures(const ReportModel& model, const ReportSeries& series,
                 const std::vector<std::optional<long>>& before, Digest& digest) {
  const size_t last = model.dates.size() - 1;
  const long registered = series.registered[last];
  for (size_t k = 0; k < model.keys.size(); ++k) {
    DigestMeasure measure;
    measure.key = model.keys[k];
    measure.count = Shown(series.counts[k][last], model.config.suppress_below);
    if (measure.count && registered > 0) {
      measure.rate = 1000.0 * static_cast<double>(*measure.count) / static_cast<double>(registered);
    }
    std::optional<long> then = before[k];
    if (then && IsSuppressed(*then, model.config.suppress_below)) then.reset();
    measure.change = ChangeOf(measure.count, then);
    digest.measures.push_back(measure);
  }
}

// The control-limit finding of measure `k`: its rate above the upper 99.8% limit around
// the network's proportion (Spiegelhalter 2005), in words; nullopt otherwise.
std::optional<std::string> LimitFinding(const ReportModel& model, const ReportSeries& series, size_t k,
                                        const DigestMeasure& measure) {
  const size_t last = model.dates.size() - 1;
  const long n = series.registered[last];
  const long network_n = model.network.registered[last];
  if (n < 1 || network_n < 1 || !measure.count) return std::nullopt;
  const double p0 = static_cast<double>(model.network.counts[k][last]) / static_cast<double>(network_n);
  if (PositionOf(series.counts[k][last], n, p0, kDigestCoverage) != FunnelPosition::kAbove) return std::nullopt;
  const ControlLimits limits = FunnelLimits(p0, n, kDigestCoverage);
  return FormatNumber(*measure.rate, 1) + " per 1000 is above the upper 99.8% control limit (" +
         FormatNumber(1000 * limits.upper, 1) + " per 1000; network " + FormatNumber(1000 * p0, 1) + ")";
}

// Adds a finding for each measure that crossed the triggers: one set trigger is enough,
// or with "combine": "all" every set trigger must be crossed by that measure.
void AddFindings(const ReportModel& model, const ReportSeries& series, const std::string& since, bool comparable,
                 Digest& digest) {
  const DigestTriggers& t = model.config.digests.triggers;
  const size_t set = TriggersSet(t);
  for (size_t k = 0; k < digest.measures.size(); ++k) {
    const DigestMeasure& m = digest.measures[k];
    const std::vector<std::string> rises = RisesCrossed(m, t);
    const std::optional<std::string> limit =
        t.above_upper_limit && comparable ? LimitFinding(model, series, k, m) : std::nullopt;
    const size_t crossed = rises.size() + (limit ? 1U : 0U);
    if (crossed == 0 || (t.all && crossed < set)) continue;
    digest.findings.push_back(Finding(m, rises, since, limit));
  }
}

}  // namespace

std::optional<Digest> BuildDigest(const ReportModel& model, size_t index, const std::string& page) {
  const DigestConfig& config = model.config.digests;
  if (!config.enabled || model.dates.empty()) return std::nullopt;
  const ReportSeries& series = model.practices[index];
  // No figures on the census date: nothing to say. Short history: no change is computed.
  if (!HasFigures(series.data.back())) return std::nullopt;
  const bool comparable = Comparable(series.data.back());
  Digest digest;
  digest.practice = series.code;
  digest.practice_name = series.name;
  digest.network = model.config.network;
  digest.title = model.config.title;
  digest.on = model.on;
  digest.page = page;
  digest.suppress_below = model.config.suppress_below;
  digest.registered = series.registered.back();
  std::vector<std::optional<long>> before(model.keys.size());
  std::string since;
  const auto previous_state = model.previous ? model.previous->data.find(series.code)
                                             : std::map<std::string, DataState>::const_iterator();
  const bool previous_comparable =
      model.previous && (previous_state == model.previous->data.end() || Comparable(previous_state->second));
  if (!comparable) {
    digest.baseline = "none: the census date is in the short-history window of the practice's data";
  } else if (previous_comparable && model.previous->counts.count(series.code) != 0U) {
    const std::vector<long>& counts = model.previous->counts.at(series.code);
    for (size_t k = 0; k < before.size() && k < counts.size(); ++k) before[k] = counts[k];
    since = model.previous->on.ToIso();
    digest.baseline = "the report of " + since;
  } else if (model.dates.size() >= 2 && Comparable(series.data[model.dates.size() - 2])) {
    const size_t prior = model.dates.size() - 2;
    for (size_t k = 0; k < before.size(); ++k) before[k] = series.counts[k][prior];
    since = model.dates[prior].ToIso();
    digest.baseline = "the previous month, " + since + " (no earlier report)";
  } else {
    digest.baseline = "none: no earlier date with full figures";
  }
  AddMeasures(model, series, before, digest);
  AddFindings(model, series, since, comparable, digest);
  if (digest.findings.empty()) return std::nullopt;
  digest.trigger_rule = TriggerRule(config.triggers);
  digest.from = config.from;
  const auto it = config.practice_to.find(series.code);
  digest.to = it != config.practice_to.end() ? it->second : config.default_to;
  return digest;
}

std::string TriggerRule(const DigestTriggers& t) {
  std::vector<std::string> set;
  if (t.rise_patients) set.push_back("a rise of at least " + std::to_string(*t.rise_patients) + " patients (rise_patients)");
  if (t.rise_percent) set.push_back("a rise of at least " + FormatNumber(*t.rise_percent, 1) + "% (rise_percent)");
  if (t.above_upper_limit) set.push_back("a rate above the upper 99.8% control limit (above_upper_limit)");
  if (set.empty()) return "no trigger is set";
  if (set.size() == 1) return set.front();
  return Join(set, t.all ? " AND " : " OR ") +
         (t.all ? ": all of them, on one criterion (combine: all)" : ": any one is enough (combine: any)");
}

std::string MessageDate(Date on) {
  static constexpr const char* kDays[] = {"Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"};
  static constexpr const char* kMonths[] = {"Jan", "Feb", "Mar", "Apr", "May", "Jun",
                                            "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"};
  // 1970-01-01 was a Thursday (index 4).
  const int weekday = ((on.days() % 7) + 7 + 4) % 7;
  std::string day = std::to_string(on.day());
  if (day.size() < 2) day = "0" + day;
  return std::string(kDays[weekday]) + ", " + day + " " + kMonths[on.month() - 1] + " " +
         std::to_string(on.year()) + " 00:00:00 +0000";
}

std::vector<std::string> WrapText(const std::string& text, size_t width, size_t indent) {
  std::vector<std::string> lines;
  std::istringstream words(text);
  std::string word;
  std::string line;
  const auto prefix = [&] { return std::string(lines.empty() ? 0 : indent, ' '); };
  while (words >> word) {
    while (!word.empty()) {
      const size_t used = prefix().size() + line.size() + (line.empty() ? 0 : 1);
      if (used + word.size() <= width) {
        line += (line.empty() ? "" : " ") + word;
        word.clear();
      } else if (!line.empty()) {
        lines.push_back(prefix() + line);
        line.clear();
      } else {  // a word longer than a whole line is split
        const size_t take = width - prefix().size();
        lines.push_back(prefix() + word.substr(0, take));
        word = word.substr(take);
      }
    }
  }
  if (!line.empty() || lines.empty()) lines.push_back(prefix() + line);
  return lines;
}

std::string FormatDigest(const Digest& digest) {
  std::string to;
  for (const std::string& address : digest.to) to += (to.empty() ? "" : ", ") + address;
  if (to.empty()) to = "undisclosed-recipients:;";
  std::string text = Header("From", digest.from) + Header("To", to) +
                     Header("Subject", "[" + digest.network + "] " + digest.practice +
                                           ": counts moved, census " + digest.on.ToIso()) +
                     Header("Date", MessageDate(digest.on)) +
                     Header("Message-ID", "<" + Sha256Hex(digest.network + "\n" + digest.practice + "\n" +
                                                              digest.on.ToIso()).substr(0, 32) + "@medload.invalid>") +
                     Header("MIME-Version", "1.0") + Header("Content-Type", "text/plain; charset=utf-8") +
                     Header("Content-Transfer-Encoding", "8bit") + "\r\n";
  std::vector<std::string> body = {
      digest.title, "Practice: " + digest.practice + (digest.practice_name.empty() ? "" : " " + digest.practice_name),
      "Network: " + digest.network, "Census date: " + digest.on.ToIso(),
      "Registered patients: " + std::to_string(digest.registered), "Compared with: " + digest.baseline, ""};
  body.push_back("What crossed a trigger:");
  if (!digest.trigger_rule.empty()) body.push_back("Triggers: " + digest.trigger_rule + ".");
  for (const std::string& finding : digest.findings) body.push_back("- " + finding);
  body.push_back("");
  body.push_back("Counts on the census date:");
  for (const DigestMeasure& m : digest.measures) {
    std::string line = "- " + m.key + ": ";
    line += m.count ? std::to_string(*m.count) + " patients, " + FormatNumber(*m.rate, 1) + " per 1000"
                    : "fewer than " + std::to_string(digest.suppress_below) + " patients (withheld)";
    if (m.change.patients) {
      line += "; change " + Signed(*m.change.patients);
      if (m.change.percent) line += " (" + SignedPercent(*m.change.percent) + ")";
    }
    body.push_back(line);
  }
  body.push_back("");
  body.push_back("This message carries counts only. The ranked worklist is on the practice page " +
                 digest.page + " of the report folder.");
  body.push_back("");
  body.push_back(std::string(kCaution));
  for (const std::string& paragraph : body) {
    const bool item = paragraph.rfind("- ", 0) == 0;
    // Names and titles come from the data and the config: a control character or bidi
    // control is shown as an escape, never sent to the reader's mail program.
    for (const std::string& line : WrapText(ShownText(paragraph), kLineWidth, item ? 2 : 0)) text += line + "\r\n";
  }
  return text;
}

}  // namespace medload
