//! The upgrade planner's chosen upgrades as an interventions layer.
