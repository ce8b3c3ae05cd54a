//! Scores: per home, per catchment, hotspots, upgrade planner.
