#include "medload/report/digest.h"

#include <cmath>
#include <sstream>

#include "medload/core/caution.h"
#include "medload/core/hash.h"
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

// Header values: printable ASCII on one line.
std::string HeaderValue(const std::string& text) {
  std::string value;
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    value += (byte >= 0x20 && byte < 0x7f) ? c : '?';
  }
  return value;
}

// "Name: value" folded at spaces so that no line exceeds 78 characters (RFC 5322 2.2.3).
std::string Header(const std::string& name, const std::string& value) {
  std::vector<std::string> lines = WrapText(name + ": " + HeaderValue(value), kLineWidth, 1);
  std::string text;
  for (const std::string& line : lines) text += line + "\r\n";
  return text;
}

std::optional<std::string> RiseFinding(const DigestMeasure& m, const DigestTriggers& t,
                                       const std::string& since) {
  if (!m.change.patients || *m.change.patients <= 0) return std::nullopt;
  const bool by_patients = t.rise_patients && *m.change.patients >= *t.rise_patients;
  const bool by_percent = t.rise_percent && m.change.percent && *m.change.percent >= *t.rise_percent;
  if (!by_patients && !by_percent) return std::nullopt;
  std::string text = m.key + ": up " + std::to_string(*m.change.patients) +
                     (*m.change.patients == 1 ? " patient" : " patients");
  if (m.change.percent) text += " (" + SignedPercent(*m.change.percent) + ")";
  return text + " since " + since;
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

void AddLimitFindings(const ReportModel& model, const ReportSeries& series, Digest& digest) {
  const size_t last = model.dates.size() - 1;
  const long n = series.registered[last];
  const long network_n = model.network.registered[last];
  if (n < 1 || network_n < 1) return;
  for (size_t k = 0; k < model.keys.size(); ++k) {
    if (!digest.measures[k].count) continue;
    const double p0 = static_cast<double>(model.network.counts[k][last]) / static_cast<double>(network_n);
    if (PositionOf(series.counts[k][last], n, p0, kDigestCoverage) != FunnelPosition::kAbove) continue;
    const ControlLimits limits = FunnelLimits(p0, n, kDigestCoverage);
    digest.findings.push_back(model.keys[k] + ": " + FormatNumber(*digest.measures[k].rate, 1) +
                              " per 1000 is above the upper 99.8% control limit (" +
                              FormatNumber(1000 * limits.upper, 1) + " per 1000; network " +
                              FormatNumber(1000 * p0, 1) + ")");
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
  for (const DigestMeasure& measure : digest.measures) {
    if (auto finding = RiseFinding(measure, config.triggers, since)) digest.findings.push_back(*finding);
  }
  if (config.triggers.above_upper_limit && comparable) AddLimitFindings(model, series, digest);
  if (digest.findings.empty()) return std::nullopt;
  digest.from = config.from;
  const auto it = config.practice_to.find(series.code);
  digest.to = it != config.practice_to.end() ? it->second : config.default_to;
  return digest;
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
