//! Rule sets: the safe-route and hazardous-route tests as data, not code.
//!
//! A rule set is a small JSON document of our own (see `rules/default.json`,
//! `rules/pa-447.json` and `docs/methods.md`): each rule applies to a crossing or to a
//! stretch (a side walked along), lists conditions that must all hold, and gives a verdict
//! (`unsafe` or `hazardous`) with a reason and its source. Conditions a rule omits do not
//! restrict it.

use crate::error::{Error, Result};
use crate::input::{Control, Device, SideWalk, Street, Students};
use crate::network::{PedEdge, PedEdgeKind, PedGraph};
use crate::risk::control::guard_on_duty;
use crate::risk::{crossed_width_m, street_of, volume, RiskConfig};
use serde::{Deserialize, Serialize};

/// Metres in a foot (exact).
pub const M_PER_FT: f64 = 0.3048;

/// The rule sets shipped with catchwalk, by name.
pub const BUILTIN: [(&str, &str); 2] = [
    ("default", include_str!("../../rules/default.json")),
    ("pa-447", include_str!("../../rules/pa-447.json")),
];

/// What a rule concludes when it fires.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    /// The route is not a safe route.
    Unsafe,
    /// The route is hazardous (and so not safe either).
    Hazardous,
}

/// What a rule looks at.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Target {
    Crossing,
    Stretch,
    /// A rail grade crossing on the route (see `score::observed`).
    RailCrossing,
    /// Crash records joined to the route's crossings and sides (see `score::observed`).
    CrashHistory,
}

/// A feature of a crossing's control, as rules name it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ControlTag {
    Marked,
    Beacon,
    /// A yield (give-way) sign on the crossed leg: not a stop sign.
    Yield,
    Stop,
    AllWayStop,
    Signal,
    Refuge,
    Raised,
    /// An adult crossing guard on duty during the school travel windows.
    Guard,
}

/// How a width between two table rows is read.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BetweenRows {
    /// Use the next wider row (its lower threshold): conservative.
    #[default]
    NextWider,
    /// Interpolate linearly between the two rows.
    Interpolate,
}

/// Unit of a table's widths.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum WidthUnit {
    #[default]
    M,
    Ft,
}

impl WidthUnit {
    fn to_m(self, x: f64) -> f64 {
        match self {
            WidthUnit::M => x,
            WidthUnit::Ft => x * M_PER_FT,
        }
    }
}

/// One row: roadways up to `width` carry at most these vehicles in 15 minutes.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WidthRow {
    pub width: f64,
    pub elementary: f64,
    pub secondary: f64,
}

/// A 15-minute volume limit that depends on roadway width (and students' age band).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct VolumeTable {
    #[serde(default)]
    pub width_unit: WidthUnit,
    /// Rows in increasing width; wider than the last row reads the last row.
    pub rows: Vec<WidthRow>,
    #[serde(default)]
    pub between_rows: BetweenRows,
    /// A raised median at least this wide (table unit) makes two roadways.
    #[serde(default)]
    pub median_splits_at: Option<f64>,
    /// Share of the 15-minute volume on each roadway of a divided road (0.5: even split).
    #[serde(default = "half")]
    pub split_share: f64,
}

fn half() -> f64 {
    0.5
}

impl VolumeTable {
    /// The limit for a roadway `width_m` wide.
    ///
    /// ```
    /// use catchwalk::score::rules::{VolumeTable, WidthRow, WidthUnit, BetweenRows};
    /// use catchwalk::input::Students;
    /// let t = VolumeTable {
    ///     width_unit: WidthUnit::Ft, between_rows: BetweenRows::NextWider,
    ///     rows: vec![WidthRow { width: 20.0, elementary: 155.0, secondary: 175.0 },
    ///                WidthRow { width: 24.0, elementary: 130.0, secondary: 150.0 }],
    ///     median_splits_at: None, split_share: 0.5,
    /// };
    /// assert_eq!(t.limit(22.0 * 0.3048, Students::Elementary), Some(130.0));
    /// ```
    pub fn limit(&self, width_m: f64, students: Students) -> Option<f64> {
        let pick = |r: &WidthRow| match students {
            Students::Elementary => r.elementary,
            Students::Secondary => r.secondary,
        };
        let i = self
            .rows
            .iter()
            .position(|r| width_m <= self.width_unit.to_m(r.width) + 1e-9);
        match i {
            None => self.rows.last().map(pick),
            Some(0) => self.rows.first().map(pick),
            Some(i) => {
                let hi = self.rows.get(i)?;
                match self.between_rows {
                    BetweenRows::NextWider => Some(pick(hi)),
                    BetweenRows::Interpolate => {
                        let lo = self.rows.get(i - 1)?;
                        let (w0, w1) = (
                            self.width_unit.to_m(lo.width),
                            self.width_unit.to_m(hi.width),
                        );
                        let t = if w1 > w0 {
                            (width_m - w0) / (w1 - w0)
                        } else {
                            1.0
                        };
                        Some(pick(lo) + t * (pick(hi) - pick(lo)))
                    }
                }
            }
        }
    }

    /// The roadways a crossing is judged as: one, or two when a wide raised median divides
    /// it. Each is `(width_m, vehicles_15min)`. `width_has_median` says whether `width_m`
    /// includes the median (a measured kerb-to-kerb `width_m`) or not (lanes x lane width,
    /// which holds only the lanes): only the first subtracts the median.
    ///
    /// ```
    /// let pa = catchwalk::score::rules::RuleSet::builtin("pa-447").unwrap();
    /// let t = pa.rules.iter().find_map(|r| r.vehicles_15min_over_table.clone()).unwrap();
    /// // Four 3.6 m lanes and a 3 m median, no measured width: two 7.2 m roadways.
    /// let r = t.roadways(14.4, Some(3.0), 100.0, false);
    /// assert!((r[0].0 - 7.2).abs() < 1e-9 && (r[0].1 - 50.0).abs() < 1e-9);
    /// ```
    pub fn roadways(
        &self,
        width_m: f64,
        median_m: Option<f64>,
        v15: f64,
        width_has_median: bool,
    ) -> Vec<(f64, f64)> {
        match (self.median_splits_at, median_m) {
            (Some(at), Some(m)) if m + 1e-9 >= self.width_unit.to_m(at) => {
                let lanes_only = if width_has_median {
                    width_m - m
                } else {
                    width_m
                };
                let each = (lanes_only / 2.0).max(0.0);
                let share = self.split_share.clamp(0.0, 1.0);
                vec![(each, v15 * share), (each, v15 * (1.0 - share))]
            }
            _ => vec![(width_m, v15)],
        }
    }
}

/// One rule. Every condition present must hold for the rule to fire.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Rule {
    pub id: String,
    pub on: Target,
    pub verdict: Verdict,
    pub reason: String,
    #[serde(default)]
    pub source: String,
    /// What the data cannot show and a site visit must check.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub site_check: Option<String>,
    /// A condition of the rule that the layers never carry (for example trucks with three
    /// or more axles). When set, the rule never fires on the data alone: where its other
    /// conditions hold, the route is a *candidate* and this goes to the home's site checks.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub needs_on_site: Option<String>,
    /// Only for schools of this age band.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub students: Option<Students>,
    // Crossing conditions.
    /// The rule does not fire if the crossing has any of these.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub unless_control: Vec<ControlTag>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub lanes_ge: Option<u32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub width_m_gt: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub vehicles_15min_over_table: Option<VolumeTable>,
    // Both.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub speed_kmh_gt: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub speed_kmh_ge: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub vehicles_15min_gt: Option<f64>,
    // Stretch conditions.
    /// Fires only on sides whose sidewalk is one of these.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub sidewalk_in: Vec<SideWalk>,
    /// Shoulder narrower than this (a missing shoulder is 0 m).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shoulder_m_lt: Option<f64>,
    /// Roadway (kerb-to-kerb) narrower than this.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub roadway_width_m_lt: Option<f64>,
    /// The route must walk more than this along matching sides before the rule fires.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub min_length_m: Option<f64>,
    // Rail crossing conditions.
    /// At least this many tracks.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tracks_ge: Option<u32>,
    /// The rule does not fire where flashing lights, gates or a crossing guard protect it.
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub unless_rail_protected: bool,
    // Crash history conditions.
    /// At least this many crashes involving a pedestrian joined to the route.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pedestrian_crashes_ge: Option<u32>,
    /// Only crashes within this many years before the layer's latest crash date count.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub crash_years: Option<f64>,
    /// Only crashes inside the school travel windows count (a crash with no time counts).
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub crashes_in_school_windows: bool,
}

/// A named rule set.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RuleSet {
    pub name: String,
    #[serde(default)]
    pub title: String,
    #[serde(default)]
    pub source: String,
    #[serde(default)]
    pub notes: Vec<String>,
    /// Posted speeds within this of a rule's speed threshold count as equal to it, so a
    /// speed posted in mph compares as posted: 25 mph (40.23 km/h) is not "above 40 km/h",
    /// 37 mph (59.5 km/h) is not "60 km/h or more"... but 59.6 km/h would be. 0.5 km/h by
    /// default: every whole-mph and whole-km/h posting lies at least 0.1 km/h from a
    /// multiple of 10 km/h unless it is one (our choice; see docs/methods.md).
    #[serde(default = "default_speed_tolerance")]
    pub speed_tolerance_kmh: f64,
    /// Walk-zone distances by kind of pupil (network metres); absent: the `benefit`
    /// settings' `walk_zone_m` for everyone.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub walk_zone_m: Option<WalkZones>,
    pub rules: Vec<Rule>,
}

/// A rule set's own walking distances by kind of pupil.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WalkZones {
    pub elementary: f64,
    pub secondary: f64,
    #[serde(default)]
    pub source: String,
}

impl WalkZones {
    /// The walk-zone distance for this kind of pupil.
    pub fn of(&self, students: Students) -> f64 {
        match students {
            Students::Elementary => self.elementary,
            Students::Secondary => self.secondary,
        }
    }
}

fn default_speed_tolerance() -> f64 {
    0.5
}

impl Default for RuleSet {
    /// The shipped `default` set (tested to parse; empty only if it ever failed to).
    fn default() -> Self {
        RuleSet::builtin("default").unwrap_or(RuleSet {
            name: "default".into(),
            title: String::new(),
            source: String::new(),
            notes: Vec::new(),
            speed_tolerance_kmh: default_speed_tolerance(),
            walk_zone_m: None,
            rules: Vec::new(),
        })
    }
}

impl RuleSet {
    /// Parses a rule set from JSON; unknown fields are refused so a typo does not pass.
    pub fn from_json(text: &str) -> Result<RuleSet> {
        serde_json::from_str(text).map_err(|e| {
            Error::Config(format!(
                "rules: {e}; see docs/methods.md (rule sets) for the fields a rule may use"
            ))
        })
    }
    /// A shipped rule set by name (`default`, `pa-447`).
    ///
    /// ```
    /// let pa = catchwalk::score::rules::RuleSet::builtin("pa-447").unwrap();
    /// assert_eq!(pa.name, "pa-447");
    /// ```
    pub fn builtin(name: &str) -> Option<RuleSet> {
        BUILTIN
            .iter()
            .find(|(n, _)| *n == name)
            .and_then(|(_, text)| RuleSet::from_json(text).ok())
    }
}

/// Facts about one crossing that rules read.
#[derive(Debug, Clone, PartialEq)]
pub struct CrossingFacts {
    pub tags: Vec<ControlTag>,
    pub width_m: f64,
    pub lanes: u32,
    pub speed_kmh: f64,
    pub vehicles_15min: f64,
    pub median_m: Option<f64>,
    /// `width_m` is the street's measured kerb-to-kerb width (which holds any median), not
    /// lanes x lane width (which holds none).
    pub width_has_median: bool,
    /// Speed tolerance of the rule set being applied (see [`RuleSet::speed_tolerance_kmh`]).
    pub speed_tolerance_kmh: f64,
}

/// Facts about one side walked along.
#[derive(Debug, Clone, PartialEq)]
pub struct StretchFacts {
    pub sidewalk: SideWalk,
    pub shoulder_m: f64,
    pub roadway_width_m: f64,
    /// The width is the street's own `width_m`, not an estimate from lanes x lane width.
    pub width_known: bool,
    pub speed_kmh: f64,
    pub vehicles_15min: f64,
    pub speed_tolerance_kmh: f64,
}

/// The tags of a control, with guards counted only when on duty at school times.
pub fn control_tags(c: &Control, risk: &RiskConfig) -> Vec<ControlTag> {
    let mut t = Vec::new();
    match c.device {
        Device::None => {}
        Device::Marked => t.push(ControlTag::Marked),
        Device::Yield => t.push(ControlTag::Yield),
        Device::Beacon => t.push(ControlTag::Beacon),
        Device::Stop => t.push(ControlTag::Stop),
        Device::AllWayStop => t.push(ControlTag::AllWayStop),
        Device::Signal => t.push(ControlTag::Signal),
    }
    if c.refuge_island {
        t.push(ControlTag::Refuge);
    }
    if c.raised {
        t.push(ControlTag::Raised);
    }
    if guard_on_duty(&c.guard, &risk.school_windows) {
        t.push(ControlTag::Guard);
    }
    t
}

/// Roadway width of a street: its width, else lanes x lane width.
pub fn roadway_width_m(street: &Street, risk: &RiskConfig) -> f64 {
    street
        .width_m
        .filter(|w| *w > 0.0)
        .unwrap_or(street.lanes.max(1) as f64 * risk.lane_width_m)
}

/// What rules see of an edge, if it is a crossing or side of a road (foot-only: nothing).
pub enum EdgeFacts {
    Crossing(CrossingFacts),
    Stretch(StretchFacts),
}

/// Reads the facts of an edge.
pub fn edge_facts(
    graph: &PedGraph,
    edge: &PedEdge,
    streets: &[Street],
    risk: &RiskConfig,
) -> Option<EdgeFacts> {
    let street = street_of(graph, edge, streets)?;
    if street.class.is_foot_only() {
        return None;
    }
    let v15 = volume::vehicles_15min(street, &risk.volume);
    match &edge.kind {
        PedEdgeKind::Crossing { control, .. } => Some(EdgeFacts::Crossing(CrossingFacts {
            tags: control_tags(control, risk),
            width_m: crossed_width_m(edge, street, risk),
            lanes: street.lanes,
            speed_kmh: street.speed_kmh,
            vehicles_15min: v15,
            median_m: street.median_m,
            width_has_median: street.width_m.is_some_and(|w| w > 0.0),
            speed_tolerance_kmh: default_speed_tolerance(),
        })),
        PedEdgeKind::Side { sidewalk, .. } => Some(EdgeFacts::Stretch(StretchFacts {
            sidewalk: *sidewalk,
            shoulder_m: street.shoulder_m.unwrap_or(0.0),
            roadway_width_m: roadway_width_m(street, risk),
            width_known: street.width_m.is_some_and(|w| w > 0.0),
            speed_kmh: street.speed_kmh,
            vehicles_15min: v15,
            speed_tolerance_kmh: default_speed_tolerance(),
        })),
        PedEdgeKind::Path { .. } => None,
    }
}

impl RuleSet {
    /// Whether any rule flags this edge on its own: a crossing rule that fires on it, or a
    /// stretch rule it matches (a stretch rule's minimum length is not applied here, so the
    /// safe-route search avoids every matching side: conservative).
    pub fn flags_edge(
        &self,
        graph: &PedGraph,
        edge: &PedEdge,
        streets: &[Street],
        risk: &RiskConfig,
        students: Students,
    ) -> bool {
        match self.edge_facts(graph, edge, streets, risk) {
            Some(EdgeFacts::Crossing(f)) => {
                self.rules.iter().any(|r| r.fires_on_crossing(&f, students))
            }
            Some(EdgeFacts::Stretch(f)) => {
                self.rules.iter().any(|r| r.matches_stretch(&f, students))
            }
            None => false,
        }
    }

    /// [`edge_facts`] with this rule set's speed tolerance.
    pub fn edge_facts(
        &self,
        graph: &PedGraph,
        edge: &PedEdge,
        streets: &[Street],
        risk: &RiskConfig,
    ) -> Option<EdgeFacts> {
        let tol = if self.speed_tolerance_kmh.is_finite() {
            self.speed_tolerance_kmh.max(0.0)
        } else {
            0.0
        };
        edge_facts(graph, edge, streets, risk).map(|f| match f {
            EdgeFacts::Crossing(mut c) => {
                c.speed_tolerance_kmh = tol;
                EdgeFacts::Crossing(c)
            }
            EdgeFacts::Stretch(mut s) => {
                s.speed_tolerance_kmh = tol;
                EdgeFacts::Stretch(s)
            }
        })
    }

    /// The walk-zone distance for this kind of pupil: the rule set's own, else `fallback_m`.
    ///
    /// ```
    /// use catchwalk::input::Students;
    /// let pa = catchwalk::score::rules::RuleSet::builtin("pa-447").unwrap();
    /// assert!((pa.walk_zone_for(Students::Elementary, 1600.0) - 2414.016).abs() < 1e-6);
    /// assert_eq!(catchwalk::score::rules::RuleSet::default().walk_zone_for(Students::Secondary, 1600.0), 1600.0);
    /// ```
    pub fn walk_zone_for(&self, students: Students, fallback_m: f64) -> f64 {
        self.walk_zone_m
            .as_ref()
            .map(|z| z.of(students))
            .filter(|m| m.is_finite() && *m > 0.0)
            .unwrap_or(fallback_m)
    }
}

/// Speed thresholds with a tolerance: `above x` means above `x + tol`, `at least x` means at
/// least `x - tol`.
fn speed_ok(rule: &Rule, speed: f64, tol: f64) -> bool {
    rule.speed_kmh_gt.is_none_or(|x| speed > x + tol)
        && rule.speed_kmh_ge.is_none_or(|x| speed >= x - tol)
}

/// What a rule makes of an edge: no match, a match, or a match that depends on a fact the
/// layers do not hold (each such fact listed as what to check on site).
#[derive(Debug, Clone, PartialEq)]
pub enum RuleMatch {
    No,
    Yes,
    Check(Vec<String>),
}

impl Rule {
    fn students_ok(&self, students: Students) -> bool {
        self.students.is_none_or(|s| s == students)
    }

    /// Whether the rule fires on a crossing with these facts (on the data alone).
    pub fn fires_on_crossing(&self, f: &CrossingFacts, students: Students) -> bool {
        self.crossing_match(f, students) == RuleMatch::Yes
    }

    /// The rule on a crossing: a rule with `needs_on_site` gives a check where it would fire.
    pub fn crossing_match(&self, f: &CrossingFacts, students: Students) -> RuleMatch {
        if !self.crossing_conditions(f, students) {
            return RuleMatch::No;
        }
        match &self.needs_on_site {
            Some(c) => RuleMatch::Check(vec![c.clone()]),
            None => RuleMatch::Yes,
        }
    }

    fn crossing_conditions(&self, f: &CrossingFacts, students: Students) -> bool {
        if self.on != Target::Crossing || !self.students_ok(students) {
            return false;
        }
        if self.unless_control.iter().any(|t| f.tags.contains(t)) {
            return false;
        }
        let table_ok = self.vehicles_15min_over_table.as_ref().is_none_or(|t| {
            t.roadways(f.width_m, f.median_m, f.vehicles_15min, f.width_has_median)
                .iter()
                .any(|(w, v)| t.limit(*w, students).is_some_and(|lim| *v > lim))
        });
        speed_ok(self, f.speed_kmh, f.speed_tolerance_kmh)
            && self.lanes_ge.is_none_or(|n| f.lanes >= n)
            && self.width_m_gt.is_none_or(|w| f.width_m > w)
            && self.vehicles_15min_gt.is_none_or(|v| f.vehicles_15min > v)
            && table_ok
    }

    /// Whether a side with these facts matches the rule on the data alone (the length test
    /// is the route's).
    pub fn matches_stretch(&self, f: &StretchFacts, students: Students) -> bool {
        self.stretch_match(f, students) == RuleMatch::Yes
    }

    /// The rule on a side, with unknown facts read as a check rather than a pass: a side
    /// whose sidewalk is `unknown` where the rule needs `absent`, a roadway-width limit on a
    /// street whose width is only lanes x lane width, and `needs_on_site`.
    pub fn stretch_match(&self, f: &StretchFacts, students: Students) -> RuleMatch {
        if self.on != Target::Stretch
            || !self.students_ok(students)
            || !self.shoulder_m_lt.is_none_or(|s| f.shoulder_m < s)
            || !speed_ok(self, f.speed_kmh, f.speed_tolerance_kmh)
            || !self.vehicles_15min_gt.is_none_or(|v| f.vehicles_15min > v)
        {
            return RuleMatch::No;
        }
        let mut checks = Vec::new();
        if !(self.sidewalk_in.is_empty() || self.sidewalk_in.contains(&f.sidewalk)) {
            if f.sidewalk == SideWalk::Unknown && self.sidewalk_in.contains(&SideWalk::Absent) {
                checks.push("whether this side has a sidewalk (unknown in the data)".to_string());
            } else {
                return RuleMatch::No;
            }
        }
        if let Some(w) = self.roadway_width_m_lt {
            if f.roadway_width_m >= w {
                if f.width_known {
                    return RuleMatch::No;
                }
                checks.push(format!(
                    "the roadway surface width (not in the data; lanes x lane width gives {:.1} ft, the rule needs under {:.1} ft)",
                    f.roadway_width_m / M_PER_FT,
                    w / M_PER_FT
                ));
            }
        }
        if let Some(c) = &self.needs_on_site {
            checks.push(c.clone());
        }
        if checks.is_empty() {
            RuleMatch::Yes
        } else {
            RuleMatch::Check(checks)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shipped_sets_parse() {
        for (name, text) in BUILTIN {
            let set = RuleSet::from_json(text).unwrap_or_else(|e| panic!("{name}: {e}"));
            assert_eq!(set.name, name);
            assert!(!set.rules.is_empty());
        }
        assert_eq!(RuleSet::default().name, "default");
        assert!(RuleSet::builtin("nope").is_none());
    }

    #[test]
    fn a_typo_is_refused_with_a_pointer_to_the_docs() {
        let e = RuleSet::from_json(r#"{"name":"x","rules":[{"id":"a","on":"crossing","verdict":"unsafe","reason":"r","speed_gt":3}]}"#)
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("speed_gt") && e.contains("docs/methods.md"),
            "{e}"
        );
    }

    fn pa_table() -> VolumeTable {
        let pa = RuleSet::builtin("pa-447").unwrap();
        pa.rules
            .iter()
            .find_map(|r| r.vehicles_15min_over_table.clone())
            .unwrap()
    }

    /// 67 Pa. Code § 447.4(a)(2), Table I (read at casetext.com and pacodeandbulletin.gov):
    /// roadway width (ft) 20 or less / 24 / 30 / 36 / 48 -> vehicles in any 15 minutes,
    /// elementary 155 / 130 / 100 / 80 / 40, secondary 175 / 150 / 120 / 100 / 60.
    #[test]
    fn pa_447_table_i_values() {
        let t = pa_table();
        let ft = |x: f64| x * M_PER_FT;
        for (w, e, s) in [
            (20.0, 155.0, 175.0),
            (24.0, 130.0, 150.0),
            (30.0, 100.0, 120.0),
            (36.0, 80.0, 100.0),
            (48.0, 40.0, 60.0),
        ] {
            assert_eq!(t.limit(ft(w), Students::Elementary), Some(e), "{w} ft");
            assert_eq!(t.limit(ft(w), Students::Secondary), Some(s), "{w} ft");
        }
        // "20 or less"; between rows the next wider row (conservative); beyond 48 ft, 48.
        assert_eq!(t.limit(ft(12.0), Students::Elementary), Some(155.0));
        assert_eq!(t.limit(ft(20.5), Students::Elementary), Some(130.0));
        assert_eq!(t.limit(ft(31.0), Students::Secondary), Some(100.0));
        assert_eq!(t.limit(ft(60.0), Students::Elementary), Some(40.0));
    }

    /// Table I footnote: a raised median at least 8 ft wide with non-mountable curbs makes
    /// the roadway two separate roadways.
    #[test]
    fn pa_447_median_rule() {
        let pa = RuleSet::builtin("pa-447").unwrap();
        let rule = pa
            .rules
            .iter()
            .find(|r| r.vehicles_15min_over_table.is_some())
            .unwrap();
        // 56 ft kerb to kerb, 100 vehicles in 15 minutes: over the 48 ft row's 40.
        let mut f = CrossingFacts {
            tags: vec![],
            width_m: 56.0 * M_PER_FT,
            lanes: 4,
            speed_kmh: 56.0,
            vehicles_15min: 100.0,
            median_m: None,
            width_has_median: true,
            speed_tolerance_kmh: 0.5,
        };
        assert!(rule.fires_on_crossing(&f, Students::Elementary));
        // An 8 ft median: two 24 ft roadways of 50 vehicles each, under 24 ft's 130.
        f.median_m = Some(8.0 * M_PER_FT);
        assert!(!rule.fires_on_crossing(&f, Students::Elementary));
        // A 7 ft median does not divide it.
        f.median_m = Some(7.0 * M_PER_FT);
        assert!(rule.fires_on_crossing(&f, Students::Elementary));
        // Signal, stop sign or an adult guard take the crossing out of the rule.
        f.median_m = None;
        for tag in [ControlTag::Signal, ControlTag::Stop, ControlTag::Guard] {
            f.tags = vec![tag];
            assert!(!rule.fires_on_crossing(&f, Students::Elementary), "{tag:?}");
        }
        // A marked crosswalk alone does not.
        f.tags = vec![ControlTag::Marked];
        assert!(rule.fires_on_crossing(&f, Students::Elementary));
    }

    fn table_rule(set: &RuleSet) -> &Rule {
        set.rules
            .iter()
            .find(|r| r.vehicles_15min_over_table.is_some())
            .unwrap()
    }

    /// Worked by hand, Table I and its footnote (67 Pa. Code § 447.4(a)(2)): four 3.6 m lanes
    /// (no measured width) and a raised 3 m median (9.84 ft >= 8 ft): two roadways of two
    /// lanes, 7.2 m = 23.62 ft each, so the 24 ft row: 130 elementary. 300 vehicles in 15
    /// minutes split evenly (our assumption): 150 per roadway > 130, fires; 250: 125, does
    /// not. Subtracting the median from lanes x width would give (14.4 - 3) / 2 = 5.7 m =
    /// 18.7 ft, the 20 ft row's 155: 150 would wrongly pass.
    #[test]
    fn pa_447_divided_street_without_width_worked_by_hand() {
        let pa = RuleSet::builtin("pa-447").unwrap();
        let rule = table_rule(&pa);
        let t = rule.vehicles_15min_over_table.as_ref().unwrap();
        let r = t.roadways(14.4, Some(3.0), 300.0, false);
        assert_eq!(r.len(), 2);
        assert!((r[0].0 / M_PER_FT - 23.622).abs() < 1e-3);
        assert_eq!(t.limit(r[0].0, Students::Elementary), Some(130.0));
        let mut f = CrossingFacts {
            tags: vec![],
            width_m: 14.4,
            lanes: 4,
            speed_kmh: 56.0,
            vehicles_15min: 300.0,
            median_m: Some(3.0),
            width_has_median: false,
            speed_tolerance_kmh: 0.5,
        };
        assert!(rule.fires_on_crossing(&f, Students::Elementary));
        f.vehicles_15min = 250.0;
        assert!(!rule.fires_on_crossing(&f, Students::Elementary));
        // A measured 56 ft kerb-to-kerb width with an 8 ft median: (56 - 8) / 2 = 24 ft.
        let r = t.roadways(56.0 * M_PER_FT, Some(8.0 * M_PER_FT), 100.0, true);
        assert!((r[0].0 / M_PER_FT - 24.0).abs() < 1e-9);
    }

    /// § 447.4(a)(2) exempts crossings "controlled by either traffic control signals or a
    /// stop sign" or protected by an adult crossing guard: a yield sign is neither. Worked by
    /// hand: a 20 ft two-lane street with 160 vehicles in 15 minutes (> 155) and a yield
    /// sign fires; the same with a stop sign does not.
    #[test]
    fn pa_447_yield_is_not_exempt() {
        let pa = RuleSet::builtin("pa-447").unwrap();
        let rule = table_rule(&pa);
        let yield_sign = Control {
            device: Device::Yield,
            ..Control::UNCONTROLLED
        };
        let risk = RiskConfig::default();
        let mut f = CrossingFacts {
            tags: control_tags(&yield_sign, &risk),
            width_m: 20.0 * M_PER_FT,
            lanes: 2,
            speed_kmh: 40.0,
            vehicles_15min: 160.0,
            median_m: None,
            width_has_median: true,
            speed_tolerance_kmh: 0.5,
        };
        assert_eq!(f.tags, vec![ControlTag::Yield]);
        assert!(rule.fires_on_crossing(&f, Students::Elementary));
        f.tags = vec![ControlTag::Stop];
        assert!(!rule.fires_on_crossing(&f, Students::Elementary));
    }

    /// The default set's "above 40 km/h": a 25 mph street (40.234 km/h) is not above it
    /// within the 0.5 km/h tolerance; 30 mph (48.28 km/h) is; "60 km/h or more" takes
    /// 37.3 mph = 60.03 km/h and not 35 mph = 56.3 km/h.
    #[test]
    fn speeds_compare_as_posted_within_the_tolerance() {
        let set = RuleSet::default();
        let rule = set
            .rules
            .iter()
            .find(|r| r.id == "no-sidewalk-beside-traffic")
            .unwrap();
        let mut f = StretchFacts {
            sidewalk: SideWalk::Absent,
            shoulder_m: 0.0,
            roadway_width_m: 7.2,
            width_known: false,
            speed_kmh: 25.0 * 1.609_344,
            vehicles_15min: 30.0,
            speed_tolerance_kmh: set.speed_tolerance_kmh,
        };
        assert!(!rule.matches_stretch(&f, Students::Elementary));
        f.speed_kmh = 30.0 * 1.609_344;
        assert!(rule.matches_stretch(&f, Students::Elementary));
        let sixty = set.rules.iter().find(|r| r.id == "no-sidewalk-60").unwrap();
        f.speed_kmh = 35.0 * 1.609_344;
        assert!(!sixty.matches_stretch(&f, Students::Elementary));
        f.speed_kmh = 60.0;
        assert!(sixty.matches_stretch(&f, Students::Elementary));
    }

    /// § 447.4(b)(1)(i): no sidewalk, shoulders under 4 ft, and for elementary students a
    /// roadway surface under 20 ft "and" trucks with three or more axles. The truck condition
    /// is never in the layers, so the rule gives a site check, never a finding; an unknown
    /// sidewalk or a width known only from lanes is listed as a check too.
    #[test]
    fn pa_447_b_1_i_is_a_candidate_with_site_checks() {
        let pa = RuleSet::builtin("pa-447").unwrap();
        let rule = pa.rules.iter().find(|r| r.id == "447.4(b)(1)(i)").unwrap();
        let mut f = StretchFacts {
            sidewalk: SideWalk::Absent,
            shoulder_m: 0.3,
            roadway_width_m: 18.0 * M_PER_FT,
            width_known: true,
            speed_kmh: 40.0,
            vehicles_15min: 20.0,
            speed_tolerance_kmh: 0.5,
        };
        let checks = |m: RuleMatch| match m {
            RuleMatch::Check(c) => c,
            other => panic!("expected a site check, got {other:?}"),
        };
        let c = checks(rule.stretch_match(&f, Students::Elementary));
        assert_eq!(c.len(), 1);
        assert!(c[0].contains("three or more axles"), "{c:?}");
        assert!(!rule.matches_stretch(&f, Students::Elementary));
        // Measured 22 ft: not under 20 ft, no match at all.
        f.roadway_width_m = 22.0 * M_PER_FT;
        assert_eq!(rule.stretch_match(&f, Students::Elementary), RuleMatch::No);
        // Two lanes with no width (2 x 3.6 m = 23.6 ft estimated): the width is to check.
        f.width_known = false;
        f.sidewalk = SideWalk::Unknown;
        let c = checks(rule.stretch_match(&f, Students::Elementary));
        assert_eq!(c.len(), 3, "{c:?}");
        assert!(c[0].contains("sidewalk") && c[1].contains("width"), "{c:?}");
        // A sidewalk present: no match; secondary students: the rule is elementary only.
        f.sidewalk = SideWalk::Present;
        assert_eq!(rule.stretch_match(&f, Students::Elementary), RuleMatch::No);
        f.sidewalk = SideWalk::Absent;
        assert_eq!(rule.stretch_match(&f, Students::Secondary), RuleMatch::No);
    }

    /// Walk zones by kind of pupil: 1.5 miles (24 P.S. § 13-1362) and 2 miles (§ 25-2541,
    /// from memory); 1 mile = 1,609.344 m exactly.
    #[test]
    fn pa_447_walk_zones() {
        let pa = RuleSet::builtin("pa-447").unwrap();
        assert!((pa.walk_zone_for(Students::Elementary, 1600.0) - 1.5 * 1609.344).abs() < 1e-9);
        assert!((pa.walk_zone_for(Students::Secondary, 1600.0) - 2.0 * 1609.344).abs() < 1e-9);
    }

    #[test]
    fn interpolation_reads_between_rows() {
        let mut t = pa_table();
        t.between_rows = BetweenRows::Interpolate;
        let v = t.limit(22.0 * M_PER_FT, Students::Elementary).unwrap();
        assert!((v - 142.5).abs() < 1e-9);
    }
}
