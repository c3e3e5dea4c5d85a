// The progress line: its text, and that it is drawn only on a terminal.

#include <gtest/gtest.h>

#include <fcntl.h>
#include <stdlib.h>
#include <unistd.h>

#include <cstdio>

#include "qftplan/survey/survey_progress.hpp"

namespace qftplan {
namespace {

TEST(SurveyProgress, TextGivesCountRateAndTimeLeft) {
  EXPECT_EQ(format_survey_progress(0, 40, 0), "survey 0/40 runs");
  EXPECT_EQ(format_survey_progress(10, 40, 5), "survey 10/40 runs, 2 runs/s, about 15 s left");
  EXPECT_EQ(format_survey_progress(40, 40, 8), "survey 40/40 runs, 5 runs/s");
  EXPECT_EQ(format_survey_progress(1, 1000, 1), "survey 1/1000 runs, 1 runs/s, about 17 min left");
  EXPECT_EQ(format_survey_progress(1, 100000, 1), "survey 1/100000 runs, 1 runs/s, about 27 h 47 min left");
}

// isatty(3) is false for a pipe and true for the slave side of a pseudo-terminal (POSIX
// posix_openpt/grantpt/unlockpt/ptsname).
TEST(SurveyProgress, TerminalDetection) {
  int fds[2];
  ASSERT_EQ(pipe(fds), 0);
  EXPECT_FALSE(is_terminal(fds[1]));
  close(fds[0]);
  close(fds[1]);
  const int master = posix_openpt(O_RDWR | O_NOCTTY);
  if (master < 0) GTEST_SKIP() << "no pseudo-terminals here";
  ASSERT_EQ(grantpt(master), 0);
  ASSERT_EQ(unlockpt(master), 0);
  const int slave = open(ptsname(master), O_RDWR | O_NOCTTY);
  ASSERT_GE(slave, 0);
  EXPECT_TRUE(is_terminal(slave));
  close(slave);
  close(master);
}

TEST(SurveyProgress, DisabledWritesNothingEnabledErasesItsLine) {
  char* buf = nullptr;
  std::size_t len = 0;
  std::FILE* f = open_memstream(&buf, &len);
  ASSERT_NE(f, nullptr);
  {
    SurveyProgress off(f, false);
    off.update(1, 2);
    off.finish();
  }
  std::fflush(f);
  EXPECT_EQ(len, 0u);
  SurveyProgress on(f, true);
  on.update(1, 2);
  on.update(2, 2);  // the last update is always drawn
  on.finish();
  std::fclose(f);
  const std::string text(buf, len);
  free(buf);
  EXPECT_NE(text.find("\rsurvey 1/2 runs"), std::string::npos) << text;
  EXPECT_NE(text.find("\rsurvey 2/2 runs"), std::string::npos) << text;
  EXPECT_EQ(text.back(), '\r');  // erased: the table starts on a clean line
}

}  // namespace
}  // namespace qftplan
