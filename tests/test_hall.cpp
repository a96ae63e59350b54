// Hall decoding against the geometric sensor model (ref::hall_code_at: each sensor high for half a
// turn from its rising edge; common practice, no source), the calibration table and the glitch filter.
#include "rotorq/hall.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "rotorq/host.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::hall_placement;

// Every angle of the sensor frame (3600 points, off the edges) reads the code of its sector.
TEST(Hall, DecodingMatchesTheSensorGeometry) {
  const double spaced_120[3] = {0.0, 1.0 / 3, 2.0 / 3};
  const double spaced_60[3] = {0.0, 1.0 / 6, 1.0 / 3};
  for (auto [placement, rising] :
       {std::pair{hall_placement::spaced_120, spaced_120}, std::pair{hall_placement::spaced_60, spaced_60}}) {
    int seen[8] = {};
    for (int k = 0; k < 3600; ++k) {
      const double turns = (k + 0.5) / 3600.0;
      const int code = rotorq::ref::hall_code_at(turns, rising);
      const rotorq::hall_reading r = rotorq::decode_hall(static_cast<uint8_t>(code), placement);
      ASSERT_TRUE(r.valid) << "code " << code;
      ASSERT_EQ(r.sector, rotorq::ref::hall_sector_of(turns)) << "angle " << 360 * turns << " code " << code;
      ASSERT_EQ(rotorq::hall_code(r.sector, placement), code);
      ++seen[code];
    }
    // exactly two codes never occur, and those decode as invalid; upper bits are ignored
    int unseen = 0;
    for (int code = 0; code < 8; ++code) {
      if (seen[code] == 0) {
        ++unseen;
        EXPECT_FALSE(rotorq::decode_hall(static_cast<uint8_t>(code), placement).valid) << code;
      }
      EXPECT_EQ(rotorq::decode_hall(static_cast<uint8_t>(code | 0xf8), placement).sector,
                rotorq::decode_hall(static_cast<uint8_t>(code), placement).sector);
    }
    EXPECT_EQ(unseen, 2);
  }
  EXPECT_FALSE(rotorq::decode_hall(0b000).valid);
  EXPECT_FALSE(rotorq::decode_hall(0b111).valid);
}

// The uniform table and the sector centres, against the double twin, for several frame offsets
// and a table with hysteresis.
TEST(Hall, CalibrationAndSectorCentres) {
  for (double offset : {0.0, 17.5, 181.0, 359.9}) {
    const rotorq::hall_calibration c = rotorq::uniform_hall_calibration(rotorq::turn32_from_degrees(offset));
    double forward[6], backward[6];
    for (int s = 0; s < 6; ++s) {
      forward[s] = rotorq::to_turns(c.entry_forward[s]);
      backward[s] = rotorq::to_turns(c.entry_backward[s]);
      EXPECT_NEAR(rotorq::ref::signed_difference_turns(forward[s], (offset + 60 * s) / 360), 0, 1e-9) << s;
      EXPECT_EQ(c.entry_backward[s], c.entry_forward[(s + 1) % 6]);
      EXPECT_EQ(rotorq::entry_angle(c, static_cast<uint8_t>(s), true), c.entry_forward[s]);
      EXPECT_EQ(rotorq::entry_angle(c, static_cast<uint8_t>(s), false), c.entry_backward[s]);
    }
    for (int s = 0; s < 6; ++s) {
      const double want = rotorq::ref::sector_centre(forward, backward, s);
      const double got = rotorq::to_turns(rotorq::sector_centre(c, static_cast<uint8_t>(s)));
      EXPECT_NEAR(rotorq::ref::signed_difference_turns(got, want), 0, 2e-9)
          << "offset " << offset << " sector " << s;
      EXPECT_NEAR(rotorq::ref::signed_difference_turns(got, (offset + 60 * s + 30) / 360), 0, 1e-9);
    }
  }
  // 2 degrees of hysteresis each way: the centres stay where they were
  rotorq::hall_calibration h = rotorq::uniform_hall_calibration();
  for (int s = 0; s < 6; ++s) {
    h.entry_forward[s] += rotorq::turn32_from_degrees(2.0);
    h.entry_backward[s] -= rotorq::turn32_from_degrees(2.0);
  }
  for (int s = 0; s < 6; ++s) {
    EXPECT_NEAR(rotorq::to_degrees(rotorq::sector_centre(h, static_cast<uint8_t>(s))), 60.0 * s + 30, 1e-6);
  }
}

// The glitch filter, on hand-written sequences (sector, time) -> accepted edges.
TEST(Hall, GlitchFilterNeedsTheMinimumDwell) {
  struct step {
    uint8_t sector;
    uint16_t time;
    bool edge;
    uint16_t edge_time;
  };
  const step sequence[] = {
      {2, 100, true, 80},    // the first sector, read since 80 (below): accepted after the dwell
      {3, 200, false, 0},    // candidate
      {2, 205, false, 0},    // bounce back: forgotten
      {3, 210, false, 0},    // candidate again
      {3, 229, false, 0},    // 19 ticks: not yet
      {3, 230, true, 210},   // 20 ticks: accepted, dated at its first reading
      {4, 65530, false, 0},  // a candidate just before the timer wraps
      {4, 14, true, 65530},  // 20 ticks later, across the wrap
      {5, 300, false, 0},    // seen by a poll first ...
      {5, 290, false, 0},    // ... captured earlier: the earlier time counts
      {5, 310, true, 290},
  };
  rotorq::hall_glitch_filter<16> filter(20);
  // the very first reading also waits for the dwell
  EXPECT_FALSE(filter.update(2, 80).happened);
  for (const step& s : sequence) {
    const rotorq::hall_edge<16> e = filter.update(s.sector, s.time);
    ASSERT_EQ(e.happened, s.edge) << "sector " << int{s.sector} << " at " << s.time;
    if (s.edge) {
      EXPECT_EQ(e.time, s.edge_time) << "sector " << int{s.sector} << " at " << s.time;
      EXPECT_EQ(e.sector, s.sector);
    }
  }
  EXPECT_EQ(filter.sector(), 5);
  // without a dwell every change is an edge; a dwell beyond half the timer range is capped
  rotorq::hall_glitch_filter<32> none(0);
  EXPECT_TRUE(none.update(1, 5).happened);
  EXPECT_TRUE(none.update(2, 6).happened);
  EXPECT_TRUE(none.update(1, 6).happened);
  EXPECT_EQ(rotorq::hall_glitch_filter<16>(100000).min_dwell(), 32767u);
}

}  // namespace
