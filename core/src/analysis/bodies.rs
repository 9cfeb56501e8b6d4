//! Channel-body statistics across a project: the body table, thickness summary, proportions by
//! interval and CSV writers for modellers.
