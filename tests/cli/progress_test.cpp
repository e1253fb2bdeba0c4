#include "cli/progress.h"

#include <doctest/doctest.h>

#include <sstream>

namespace medload::cli {

TEST_SUITE("cli/progress") {

TEST_CASE("progress texts give what is done, of what, and the rate once a second has passed") {
  CHECK(GroupDigits(0) == "0");
  CHECK(GroupDigits(999) == "999");
  CHECK(GroupDigits(1000) == "1,000");
  CHECK(GroupDigits(2280000) == "2,280,000");
  CHECK(PassProgressText(PassProgress{true, 0, 0, 0}, 0) == "packing patient histories after the import (once)");
  CHECK(PassProgressText(PassProgress{false, 41, 100, 12288}, 0.5) == "41% of patients (12,288 read)");
  CHECK(PassProgressText(PassProgress{false, 41, 100, 12288}, 5) == "41% of patients (12,288 read, 2,458 a second)");
  CHECK(ImportProgressText(1000000, 95400000, 212000000, 2) ==
        "1,000,000 rows, 45% of 212 MB (500,000 rows a second)");
  CHECK(ImportProgressText(20000, 1000, 2500000, 0.2) == "20,000 rows, 0% of 2.5 MB");
  CHECK(ImportProgressText(20000, 1000, 0, 0.2) == "20,000 rows");
}

TEST_CASE("a progress line prints at most once per interval and nothing before the first interval") {
  std::ostringstream err;
  auto now = std::chrono::steady_clock::time_point();
  ProgressLine line(err, "review", std::chrono::seconds(2), [&] { return now; });
  line.Update("1%");
  CHECK(err.str().empty());  // a quick command prints nothing
  CHECK_FALSE(line.printed());
  now += std::chrono::milliseconds(2500);
  line.Update("40%");
  now += std::chrono::milliseconds(500);
  line.Update("50%");  // too soon
  now += std::chrono::milliseconds(1600);
  line.Update("90%");
  line.Update("100%", true);
  CHECK(err.str() == "medload: review: 40%\nmedload: review: 90%\nmedload: review: 100%\n");
  CHECK(line.Elapsed() == doctest::Approx(4.6));
}

TEST_CASE("no progress is printed with --quiet or when standard error is not a terminal") {
  std::ostringstream err;
  Context context;
  context.err = &err;
  context.err_is_terminal = false;
  CHECK_FALSE(ShowsProgress(context));
  CHECK_FALSE(static_cast<bool>(PassProgressPrinter(context, "review")));
  context.err_is_terminal = true;
  CHECK(ShowsProgress(context));
  const PassProgressFn quick = PassProgressPrinter(context, "review");
  REQUIRE(static_cast<bool>(quick));
  quick(PassProgress{false, 5, 10, 640});
  quick(PassProgress{false, 10, 10, 1280});  // a quick pass: nothing to close, nothing printed
  CHECK(err.str().empty());
  const PassProgressFn after_import = PassProgressPrinter(context, "review");
  after_import(PassProgress{true, 0, 0, 0});  // packing always shows, and the last line closes it
  after_import(PassProgress{false, 10, 10, 1280});
  CHECK(err.str() ==
        "medload: review: packing patient histories after the import (once)\nmedload: review: 100% of patients (1,280 "
        "read)\n");
  context.quiet = true;
  CHECK_FALSE(ShowsProgress(context));
}

}  // TEST_SUITE

}  // namespace medload::cli
