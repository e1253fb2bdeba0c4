#include "medload/burden/timeline_writer.h"

#include <algorithm>
#include <ostream>

#include "medload/core/caution.h"
#include "medload/format/chart_layout.h"
#include "medload/format/output.h"

namespace medload {
namespace {

constexpr int kLabelWidth = 230;
constexpr int kPlotWidth = 640;
constexpr int kRowHeight = 22;
constexpr int kCountHeight = 90;
constexpr int kWidth = kLabelWidth + kPlotWidth + 20;
constexpr double kTickFont = 10;
constexpr double kKeyFont = 10;
constexpr std::string_view kKey =
    "Solid bars: days supplied. Pale dashed bars: tail days (supply run out; a refill may be late). "
    "Ticks: dispensings. Dashed line: census date. Supports, does not replace, clinical review.";

std::string Name(const Medicine& medicine) {
  std::string name;
  for (const auto& i : medicine.ingredients) name += (name.empty() ? "" : " + ") + i;
  return name;
}

struct Scale {
  Date from;
  int days;
  double X(Date d) const {
    return kLabelWidth + kPlotWidth * static_cast<double>(d - from) / static_cast<double>(days);
  }
};

// Months between labelled ticks: the least of 1, 2, 3, 6 or 12 that leaves room for a
// "YYYY-MM" label and a gap between neighbours.
int MonthStep(const Scale& scale) {
  const double month = kPlotWidth * 30.44 / static_cast<double>(scale.days);
  const double needed = TextWidth("0000-00", kTickFont) + 8;
  for (const int step : {1, 2, 3, 6}) {
    if (month * step >= needed) return step;
  }
  return 12;
}

// A grid line at the first day of each month, labelled every MonthStep months (months
// 1, 1+step, ...), and not where the label would reach past the edge.
void WriteAxis(std::ostream& out, const Scale& scale, Date to, int top, int bottom) {
  const int step = MonthStep(scale);
  const double half = TextWidth("0000-00", kTickFont) / 2;
  Date tick = scale.from.day() == 1 ? scale.from : EndOfMonth(scale.from) + 1;
  for (int guard = 0; tick <= to && guard < 4000; ++guard) {
    const double x = scale.X(tick);
    out << "<line x1=\"" << FormatNumber(x, 1) << "\" y1=\"" << top << "\" x2=\"" << FormatNumber(x, 1)
        << "\" y2=\"" << bottom << "\" stroke=\"" << ((tick.month() - 1) % step == 0 ? "#ccc" : "#eee") << "\"/>\n";
    if ((tick.month() - 1) % step == 0 && x - half >= 0 && x + half <= kWidth - 2) {
      out << "<text x=\"" << FormatNumber(x, 1) << "\" y=\"" << bottom + 14 << "\" font-size=\"" << kTickFont
          << "\" text-anchor=\"middle\">" << tick.ToIso().substr(0, 7) << "</text>\n";
    }
    tick = EndOfMonth(tick) + 1;
  }
}

void WriteRow(std::ostream& out, const TimelineModel& model, const Medicine& medicine, const Scale& scale, int y) {
  const Date to = model.to;
  out << "<g><title>" << EscapeHtml(Name(medicine)) << "</title>\n<text x=\"" << kLabelWidth - 6 << "\" y=\""
      << y + 15 << "\" font-size=\"12\" text-anchor=\"end\">" << EscapeHtml(FitText(Name(medicine), 12, kLabelWidth - 16))
      << "</text>\n";
  for (const Episode& episode : medicine.episodes) {
    if (episode.end < scale.from || episode.start > to) continue;
    // The whole episode as a pale, dashed bar (tail days: the supply has run out and a
    // refill may be late), then the supplied days over it, solid.
    const double x1 = scale.X(std::max(episode.start, scale.from));
    const double x2 = scale.X(std::min(episode.end, to) + 1);
    out << "<rect x=\"" << FormatNumber(x1, 1) << "\" y=\"" << y + 6 << "\" width=\""
        << FormatNumber(std::max(1.0, x2 - x1), 1)
        << "\" height=\"10\" fill=\"#e3ebf4\" stroke=\"#6b8fb8\" stroke-dasharray=\"3 2\">"
        << "<title>" << EscapeHtml(Name(medicine)) << ": episode " << episode.start.ToIso() << " to "
        << episode.end.ToIso() << "; pale days are tail days (supply run out, a refill may be late)</title></rect>\n";
    for (const auto& [start, end] : SuppliedSpans(episode)) {
      if (end < scale.from || start > to) continue;
      const double s1 = scale.X(std::max(start, scale.from));
      const double s2 = scale.X(std::min(end, to) + 1);
      out << "<rect x=\"" << FormatNumber(s1, 1) << "\" y=\"" << y + 4 << "\" width=\""
          << FormatNumber(std::max(1.0, s2 - s1), 1) << "\" height=\"14\" fill=\"#6b8fb8\" stroke=\"#1f3b5c\">"
          << "<title>" << EscapeHtml(Name(medicine)) << ": supplied " << start.ToIso() << " to " << end.ToIso()
          << "</title></rect>\n";
    }
  }
  for (const DispensingUse& use : medicine.uses) {
    if (use.dispensed_on < scale.from || use.dispensed_on > to) continue;
    const double x = scale.X(use.dispensed_on);
    out << "<line x1=\"" << FormatNumber(x, 1) << "\" y1=\"" << y + 1 << "\" x2=\"" << FormatNumber(x, 1)
        << "\" y2=\"" << y + 21 << "\" stroke=\"#000\" stroke-width=\"1.5\"><title>dispensed "
        << use.dispensed_on.ToIso() << ": " << EscapeHtml(RecordText(model.records, use, &DispensingRecord::product)) << ", " << use.supply.days
        << " days</title></line>\n";
  }
  out << "</g>\n";
}

void WriteCounts(std::ostream& out, const TimelineModel& model, const Scale& scale, int top) {
  const std::vector<int> counts = ConcurrentCounts(*model.timeline, model.from, model.to);
  const int peak = std::max(1, *std::max_element(counts.begin(), counts.end()));
  const int bottom = top + kCountHeight - 20;
  auto y_of = [&](int count) { return bottom - (bottom - top - 4) * static_cast<double>(count) / peak; };
  // A scale: a line and a value at 0, at the peak and (when it is a whole number apart
  // from both) halfway.
  std::vector<int> marks = {0, peak};
  if (peak >= 4 && peak % 2 == 0) marks.push_back(peak / 2);
  for (const int mark : marks) {
    out << "<line x1=\"" << kLabelWidth << "\" y1=\"" << FormatNumber(y_of(mark), 1) << "\" x2=\""
        << kLabelWidth + kPlotWidth << "\" y2=\"" << FormatNumber(y_of(mark), 1) << "\" stroke=\""
        << (mark == 0 ? "#888" : "#e2e2e2") << "\"/>\n<text x=\"" << kLabelWidth - 4 << "\" y=\""
        << FormatNumber(y_of(mark) + 3.5, 1) << "\" font-size=\"" << kTickFont << "\" text-anchor=\"end\">" << mark
        << "</text>\n";
  }
  out << "<text x=\"" << kLabelWidth - 24 << "\" y=\"" << (top + bottom) / 2 - 2
      << "\" font-size=\"12\" text-anchor=\"end\">medicines at once</text>\n<text x=\"" << kLabelWidth - 24
      << "\" y=\"" << (top + bottom) / 2 + 13 << "\" font-size=\"11\" text-anchor=\"end\" fill=\"#444\">(peak "
      << peak << ")</text>\n<polyline fill=\"none\" stroke=\"#333\" stroke-width=\"1.5\" points=\"";
  for (size_t i = 0; i < counts.size(); ++i) {
    const Date day = model.from + static_cast<int>(i);
    const double y = y_of(counts[i]);
    out << FormatNumber(scale.X(day), 1) << "," << FormatNumber(y, 1) << " " << FormatNumber(scale.X(day + 1), 1)
        << "," << FormatNumber(y, 1) << " ";
  }
  out << "\"><title>number of medicines with an episode on each day</title></polyline>\n";
}

// Products listed by name in the notes; the rest are counted.
constexpr size_t kNotesListed = 20;

long Items(const UnmatchedProduct& product) { return static_cast<long>(product.dispensed.size()); }

std::string Dispensings(long count) {
  return std::to_string(count) + (count == 1 ? " dispensing" : " dispensings");
}

void WriteSvgNotes(std::ostream& out, const std::vector<std::string>& notes, int top) {
  for (size_t i = 0; i < notes.size(); ++i) {
    out << "<text x=\"10\" y=\"" << top + 10 + static_cast<int>(i) * 14 << "\" font-size=\"11\" fill=\"#900\">"
        << EscapeHtml(notes[i]) << "</text>\n";
  }
}

}  // namespace

std::vector<std::string> NotDrawnNotes(const Timeline& timeline, long dropped, size_t kept) {
  std::vector<std::string> notes;
  if (dropped > 0) {
    notes.push_back("Not drawn: the oldest " + Dispensings(dropped) + " of the patient; a history is read up to its latest " +
                    std::to_string(kept) + " dispensings.");
  }
  long unmatched = 0;
  for (const UnmatchedProduct& product : timeline.unmatched) unmatched += Items(product);
  if (unmatched > 0) {
    notes.push_back("Not drawn: " + Dispensings(unmatched) + " of " + std::to_string(timeline.unmatched.size()) +
                    (timeline.unmatched.size() == 1 ? " product" : " products") +
                    " that nothing in the formulary recognises; each may be a medicine, so check them:");
  }
  long rest = 0;
  for (size_t i = 0; i < timeline.unmatched.size(); ++i) {
    const UnmatchedProduct& product = timeline.unmatched[i];
    if (i >= kNotesListed) {
      rest += Items(product);
      continue;
    }
    const std::string name = product.product.empty() ? "code " + product.code : "\"" + product.product + "\"";
    notes.push_back("  " + name + ": " + Dispensings(Items(product)) + ", the last on " +
                    (product.dispensed.empty() ? std::string("?") : product.dispensed.back().ToIso()));
  }
  if (timeline.unmatched.size() > kNotesListed) {
    notes.push_back("  and " + std::to_string(timeline.unmatched.size() - kNotesListed) + " more products: " +
                    Dispensings(rest));
  }
  if (timeline.non_medicine_items > 0) {
    notes.push_back("Not drawn: " + Dispensings(timeline.non_medicine_items) +
                    " of non-medicines (dressings, appliances, test strips...).");
  }
  if (timeline.excluded_items > 0) {
    notes.push_back("Not drawn: " + Dispensings(timeline.excluded_items) +
                    " left out by --exclude-prn or --exclude-route.");
  }
  if (timeline.not_dispensed_items > 0) {
    notes.push_back("Not drawn: " + Dispensings(timeline.not_dispensed_items) +
                    " whose status does not count (cancelled, entered in error...).");
  }
  return notes;
}

std::vector<std::pair<Date, Date>> SuppliedSpans(const Episode& episode) {
  std::vector<std::pair<Date, Date>> spans;
  for (const Coverage& coverage : episode.coverages) {  // by start
    if (!spans.empty() && coverage.start <= spans.back().second + 1) {
      spans.back().second = std::max(spans.back().second, coverage.end());
    } else {
      spans.emplace_back(coverage.start, coverage.end());
    }
  }
  return spans;
}

std::vector<int> ConcurrentCounts(const Timeline& timeline, Date from, Date to) {
  std::vector<int> delta(static_cast<size_t>(to - from) + 2, 0);
  for (const Medicine& medicine : timeline.medicines) {
    for (const Episode& episode : medicine.episodes) {
      if (episode.end < from || episode.start > to) continue;
      delta[static_cast<size_t>(std::max(episode.start, from) - from)] += 1;
      delta[static_cast<size_t>(std::min(episode.end, to) - from) + 1] -= 1;
    }
  }
  std::vector<int> counts(static_cast<size_t>(to - from) + 1, 0);
  int running = 0;
  for (size_t i = 0; i < counts.size(); ++i) counts[i] = running += delta[i];
  return counts;
}

void WriteTimelineSvg(std::ostream& out, const TimelineModel& model) {
  const Scale scale{model.from, std::max(1, model.to - model.from + 1)};
  const int rows = static_cast<int>(model.timeline->medicines.size());
  const int plot_top = 40;
  const int rows_bottom = plot_top + rows * kRowHeight;
  // What is not drawn (in red), then the key, each wrapped to the width.
  std::vector<std::string> notes;
  for (const std::string& note : NotDrawnNotes(*model.timeline, model.dropped, model.records.size())) {
    for (std::string& line : WrapText(note, 11, kWidth - 20)) notes.push_back(std::move(line));
  }
  const std::vector<std::string> key = WrapText(kKey, kKeyFont, kWidth - 20);
  const int notes_top = rows_bottom + 30 + kCountHeight + 10;
  const int key_top = notes_top + 14 * static_cast<int>(notes.size());
  const int height = key_top + 14 * static_cast<int>(key.size()) + 8;
  const std::string title = "Medication episodes of patient " + model.patient + ", " + model.from.ToIso() +
                            " to " + model.to.ToIso();
  out << "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 " << kWidth << " " << height << "\" width=\""
      << kWidth << "\" height=\"" << height << "\" role=\"img\" aria-labelledby=\"t\" font-family=\"sans-serif\">\n"
      << "<title id=\"t\">" << EscapeHtml(title) << "</title>\n<desc>" << EscapeHtml(kCaution) << "</desc>\n"
      << "<rect width=\"100%\" height=\"100%\" fill=\"#fff\"/>\n<text x=\"10\" y=\"18\" font-size=\"14\" "
         "font-weight=\"bold\">"
      << EscapeHtml(FitText(title, 14 * kBoldWidth, kWidth - 20)) << "</text>\n";
  WriteAxis(out, scale, model.to, plot_top, rows_bottom);
  for (int r = 0; r < rows; ++r) {
    WriteRow(out, model, model.timeline->medicines[static_cast<size_t>(r)], scale, plot_top + r * kRowHeight);
  }
  WriteCounts(out, model, scale, rows_bottom + 30);
  WriteSvgNotes(out, notes, notes_top);
  if (model.census && *model.census >= model.from && *model.census <= model.to) {
    const double x = scale.X(*model.census);
    const std::string label = "census " + model.census->ToIso();
    // Right of the line, or left of it when it would run past the edge.
    const bool left = x + 4 + TextWidth(label, 11) > kWidth - 2;
    out << "<line x1=\"" << FormatNumber(x, 1) << "\" y1=\"" << plot_top - 6 << "\" x2=\"" << FormatNumber(x, 1)
        << "\" y2=\"" << notes_top - 10 << "\" stroke=\"#b00\" stroke-width=\"2\" stroke-dasharray=\"6 3\"/>\n"
        << "<text x=\"" << FormatNumber(left ? x - 4 : x + 4, 1) << "\" y=\"" << plot_top - 5 << "\" font-size=\"11\""
        << (left ? " text-anchor=\"end\"" : "") << ">" << label << "</text>\n";
  }
  for (size_t i = 0; i < key.size(); ++i) {
    out << "<text x=\"10\" y=\"" << key_top + 10 + 14 * static_cast<int>(i) << "\" font-size=\"" << kKeyFont << "\">"
        << EscapeHtml(key[i]) << "</text>\n";
  }
  out << "</svg>\n";
}

void WriteTimelineHtml(std::ostream& out, const TimelineModel& model) {
  WriteHtmlStart(out, "Medication timeline of patient " + model.patient);
  WriteTimelineSvg(out, model);
  const std::vector<std::string> notes = NotDrawnNotes(*model.timeline, model.dropped, model.records.size());
  if (!notes.empty()) {
    out << "<ul class=\"notes\">\n";
    for (const std::string& note : notes) out << "<li>" << EscapeHtml(note) << "</li>\n";
    out << "</ul>\n";
  }
  WriteHtmlEnd(out);
}

namespace {

std::vector<std::vector<std::string>> EpisodeRows(const TimelineModel& model) {
  std::vector<std::vector<std::string>> rows;
  for (const Medicine& medicine : model.timeline->medicines) {
    for (const Episode& episode : medicine.episodes) {
      if (episode.end < model.from || episode.start > model.to) continue;
      int supplied = 0;
      for (const auto& [start, end] : SuppliedSpans(episode)) supplied += end - start + 1;
      const int days = episode.end - episode.start + 1;
      rows.push_back({Name(medicine), episode.start.ToIso(), episode.end.ToIso(), std::to_string(days),
                      std::to_string(supplied), std::to_string(days - supplied),
                      std::to_string(episode.coverages.size())});
    }
  }
  return rows;
}

}  // namespace

void WriteTimelineText(std::ostream& out, const TimelineModel& model) {
  out << "Medication episodes of patient " << model.patient << ", " << model.from.ToIso() << " to "
      << model.to.ToIso() << "\n\n";
  WriteTextTable(out, {"medicine", "start", "end", "days", "supplied", "tail or gap", "dispensings"},
                 EpisodeRows(model));
  const std::vector<std::string> notes = NotDrawnNotes(*model.timeline, model.dropped, model.records.size());
  if (!notes.empty()) out << "\n";
  for (const std::string& note : notes) out << note << "\n";
  WriteTextCaution(out);
}

void WriteTimelineCsv(std::ostream& out, const TimelineModel& model) {
  WriteCsvCaution(out);
  // What is not drawn: comment lines after the caution, before the header.
  for (const std::string& note : NotDrawnNotes(*model.timeline, model.dropped, model.records.size())) {
    WriteCsvComment(out, note);
  }
  out << CsvRow({"patient", "medicine", "start", "end", "days", "supplied_days", "tail_days", "dispensings"});
  for (auto& row : EpisodeRows(model)) {
    row.insert(row.begin(), model.patient);
    out << CsvRow(row);
  }
}

nlohmann::json TimelineJson(const TimelineModel& model) {
  nlohmann::json episodes = nlohmann::json::array();
  for (const Medicine& medicine : model.timeline->medicines) {
    for (const Episode& episode : medicine.episodes) {
      if (episode.end < model.from || episode.start > model.to) continue;
      nlohmann::json supplied = nlohmann::json::array();
      int supplied_days = 0;
      for (const auto& [start, end] : SuppliedSpans(episode)) {
        supplied.push_back({{"from", start.ToIso()}, {"to", end.ToIso()}});
        supplied_days += end - start + 1;
      }
      const int days = episode.end - episode.start + 1;
      episodes.push_back({{"medicine", Name(medicine)}, {"ingredients", medicine.ingredients},
                          {"start", episode.start.ToIso()}, {"end", episode.end.ToIso()}, {"days", days},
                          {"supplied_days", supplied_days}, {"tail_days", days - supplied_days},
                          {"supplied", supplied}, {"dispensings", episode.coverages.size()}});
    }
  }
  return {{"patient", model.patient}, {"from", model.from.ToIso()}, {"to", model.to.ToIso()},
          {"census", model.census ? nlohmann::json(model.census->ToIso()) : nlohmann::json(nullptr)},
          {"episodes", episodes}, {"caution", std::string(kCaution)}};
}

}  // namespace medload
