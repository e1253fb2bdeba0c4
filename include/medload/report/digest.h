// Digest messages: a short RFC 5322 plain-text message per practice whose numbers crossed
// a configured trigger (a rise since the last report, a rate above the upper 99.8% control
// limit). Messages carry counts, rates and changes only, never a patient identifier. It
// does not send anything: the report writes the messages as files into digests/.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "medload/report/report.h"

namespace medload {

// One measure of one practice in a digest.
struct DigestMeasure {
  std::string key;                 // "items>=10", ..., "any"
  std::optional<long> count;       // null when suppressed
  std::optional<double> rate;      // per 1000 registered; null when suppressed
  Change change;                   // against the baseline; empty when either is suppressed
};

struct Digest {
  std::string practice;            // code
  std::string practice_name;
  std::string network;
  std::string title;               // the report's title
  Date on;
  long registered = 0;
  std::string baseline;            // "the report of 2026-09-30" or "the previous month (...)"
  std::string page;                // the practice page's file name in the report folder
  long suppress_below = 0;
  std::vector<DigestMeasure> measures;
  std::vector<std::string> findings;  // each criterion that crossed, with the triggers in brackets
  std::string trigger_rule;           // TriggerRule of the config: what sends a digest
  std::string from;
  std::vector<std::string> to;
};

// The digest of practice `index` of the model, or nullopt when no trigger was crossed
// (or digests are not configured). Baseline: the previous report's counts for the
// practice, else the previous census date of the series. A rise trigger needs both counts
// shown (not suppressed); the control-limit trigger compares the practice's proportion on
// the census date with the upper 99.8% limit around the network's proportion
// (Spiegelhalter 2005). `page` is the practice page's file name.
std::optional<Digest> BuildDigest(const ReportModel& model, size_t index, const std::string& page);

// The message: headers From, To, Subject, Date (the census date at 00:00 UTC, for
// reproducible files), Message-ID (a hash of network, practice and date), MIME-Version
// and Content-Type text/plain; charset=utf-8, then the body with the triggers, what
// crossed them and the caution. CRLF line ends; no line longer than 78 characters; header
// values are single-line printable ASCII: words with other bytes become RFC 2047 encoded
// words ("=?UTF-8?B?...?="), except inside an address, where they become '?'.
std::string FormatDigest(const Digest& digest);

// The configured triggers in words with how they combine: "a rise of at least 3 patients
// (rise_patients) OR a rate above the upper 99.8% control limit (above_upper_limit): any
// one is enough (combine: any)".
std::string TriggerRule(const DigestTriggers& triggers);

// Day-of-week date for a Date header: "Sat, 31 Oct 2026 00:00:00 +0000".
std::string MessageDate(Date on);

// Wraps `text` at `width` columns (by bytes; words longer than the width are split),
// indenting continuation lines by `indent` spaces. Lines are returned without ends.
std::vector<std::string> WrapText(const std::string& text, size_t width, size_t indent);

}  // namespace medload
