//! The OpenStreetMap preset: tags as flat properties, as `osmium export` writes them. Which
//! ways are walkable is decided here, once; `docs/input.md` has the table.

use crate::error::LayerName;
use crate::input::geojson_read::Props;
use crate::input::model::*;
use crate::input::speed::{parse_length_m, parse_speed_kmh, LengthUnit, SpeedUnit};
use crate::input::values::{default_lanes, default_speed_kmh, find_time_windows, parse_int};
use crate::input::warnings::{Ctx, Warnings};

fn tag<'a>(props: &'a Props, key: &str) -> Option<&'a str> {
    props
        .get(key)
        .and_then(|v| v.as_str())
        .map(str::trim)
        .filter(|s| !s.is_empty())
}

fn is(props: &Props, key: &str, values: &[&str]) -> bool {
    tag(props, key).is_some_and(|v| values.contains(&v))
}

/// The OSM id: property `@id`, else the feature's `id` member, else property `id`.
pub fn feature_id(props: &Props, member: Option<String>) -> Option<String> {
    tag(props, "@id")
        .map(str::to_string)
        .or(member)
        .or_else(|| tag(props, "id").map(str::to_string))
}

/// `highway` value -> class, or why the way is not walked.
pub fn class_of(highway: &str) -> Result<RoadClass, &'static str> {
    Ok(match highway {
        "trunk" | "trunk_link" | "primary" | "primary_link" | "secondary" | "secondary_link" => {
            RoadClass::Arterial
        }
        "tertiary" | "tertiary_link" => RoadClass::Collector,
        "residential" | "unclassified" | "living_street" | "road" => RoadClass::Local,
        "service" => RoadClass::Service,
        "footway" | "path" | "pedestrian" | "cycleway" | "bridleway" | "track" | "corridor" => {
            RoadClass::Path
        }
        "steps" => RoadClass::Steps,
        "motorway" | "motorway_link" => return Err("motorways are not walkable"),
        "construction" | "proposed" | "abandoned" | "disused" | "razed" => {
            return Err("ways under construction, proposed or abandoned")
        }
        "raceway" | "bus_guideway" | "busway" | "platform" | "escape" => {
            return Err("raceways, bus guideways, busways, platforms, escape lanes")
        }
        _ => return Err("other highway values (not a way children walk)"),
    })
}

/// Whether access tags close the way to walkers.
fn closed_to_foot(props: &Props) -> bool {
    if is(props, "foot", &["no"]) {
        return true;
    }
    is(props, "access", &["no", "private"])
        && !is(props, "foot", &["yes", "designated", "permissive"])
}

fn side_value(v: &str) -> Option<SideWalk> {
    match v {
        "yes" => Some(SideWalk::Present),
        "no" | "none" => Some(SideWalk::Absent),
        "separate" => Some(SideWalk::Separate),
        _ => None,
    }
}

/// Sidewalks from `sidewalk`, refined by `sidewalk:both`, `sidewalk:left`, `sidewalk:right`.
fn sidewalks(ctx: &Ctx, props: &Props, w: &mut Warnings) -> (SideWalk, SideWalk) {
    use SideWalk::*;
    let mut sides = match tag(props, "sidewalk") {
        None => (Unknown, Unknown),
        Some("both" | "yes") => (Present, Present),
        Some("left") => (Present, Absent),
        Some("right") => (Absent, Present),
        Some("no" | "none") => (Absent, Absent),
        Some("separate") => (Separate, Separate),
        Some(other) => {
            w.push(
                "sidewalk",
                ctx.at_prop("sidewalk"),
                format!("unknown sidewalk value '{other}' (expected both, left, right, no, separate); used unknown"),
            );
            (Unknown, Unknown)
        }
    };
    for (key, left, right) in [
        ("sidewalk:both", true, true),
        ("sidewalk:left", true, false),
        ("sidewalk:right", false, true),
    ] {
        let Some(v) = tag(props, key) else { continue };
        match side_value(v) {
            Some(s) => {
                if left {
                    sides.0 = s;
                }
                if right {
                    sides.1 = s;
                }
            }
            None => w.push(
                "sidewalk",
                ctx.at_prop(key),
                format!("unknown value '{v}' (expected yes, no, separate); kept the other tags' reading"),
            ),
        }
    }
    sides
}

/// One way's attributes, or `None` when it is not walked (counted in the skip summary).
pub fn street(ctx: &Ctx, props: &Props, w: &mut Warnings) -> Option<Street> {
    let layer_name = LayerName::Streets;
    let Some(highway) = tag(props, "highway") else {
        w.skip(
            layer_name,
            "features without a 'highway' tag (buildings, land use, ...)",
        );
        return None;
    };
    if is(props, "area", &["yes"]) {
        w.skip(layer_name, "highway areas (area=yes)");
        return None;
    }
    let class = match class_of(highway) {
        Ok(c) => c,
        Err(reason) => {
            w.skip(layer_name, format!("not walkable: {reason}"));
            return None;
        }
    };
    if closed_to_foot(props) {
        w.skip(
            layer_name,
            "closed to walkers (foot=no, or access=no/private without foot=yes)",
        );
        return None;
    }
    let posted = [
        "maxspeed",
        "maxspeed:forward",
        "maxspeed:backward",
        "zone:maxspeed",
    ]
    .iter()
    .filter_map(|k| tag(props, k).map(|v| (k, v)))
    .find_map(|(k, v)| parse_speed_kmh(v, SpeedUnit::Kmh).map(|s| (k, s)));
    let (speed_kmh, speed_source) = match posted {
        Some((_, s)) => (s, SpeedSource::Posted),
        None => {
            if let Some(v) = tag(props, "maxspeed") {
                w.push(
                    "maxspeed",
                    ctx.at_prop("maxspeed"),
                    format!(
                        "no speed number in maxspeed '{v}'; used the {} default {} km/h",
                        class.as_str(),
                        default_speed_kmh(class)
                    ),
                );
            }
            (default_speed_kmh(class), SpeedSource::ClassDefault)
        }
    };
    let oneway = is(props, "oneway", &["yes", "true", "1", "-1", "reversible"])
        || (tag(props, "oneway").is_none() && is(props, "junction", &["roundabout", "circular"]));
    // Without `lanes`: the lanes by direction add up; else the class default, halved on a
    // one-way carriageway (one of a divided road's two ways carries half its lanes).
    let by_direction: u32 = ["lanes:forward", "lanes:backward", "lanes:both_ways"]
        .iter()
        .filter_map(|k| tag(props, k).and_then(parse_int))
        .filter(|n| (1..=16).contains(n))
        .map(|n| n as u32)
        .sum();
    let class_lanes = if oneway {
        (default_lanes(class) / 2).max(1)
    } else {
        default_lanes(class)
    };
    let lanes = match tag(props, "lanes") {
        None if by_direction > 0 => by_direction,
        None => class_lanes,
        Some(v) => match v.split(';').filter_map(parse_int).max() {
            Some(n) if (1..=i64::from(crate::input::values::MAX_LANES)).contains(&n) => n as u32,
            _ => {
                w.push(
                    "lanes",
                    ctx.at_prop("lanes"),
                    format!(
                        "cannot read lanes '{v}' (a whole number from 1 to {}); used the {} default",
                        crate::input::values::MAX_LANES,
                        class.as_str()
                    ),
                );
                class_lanes
            }
        },
    };
    let (left, right) = sidewalks(ctx, props, w);
    let layer =
        match tag(props, "layer").map(|v| (v, parse_int(v).and_then(|n| i32::try_from(n).ok()))) {
            Some((_, Some(n))) => n,
            other => {
                if let Some((v, None)) = other {
                    w.push(
                        "layer",
                        ctx.at_prop("layer"),
                        format!("cannot read layer '{v}'; used bridge/tunnel tags or 0"),
                    );
                }
                if tag(props, "bridge").is_some_and(|v| v != "no") {
                    1
                } else if tag(props, "tunnel").is_some_and(|v| v != "no") {
                    -1
                } else {
                    0
                }
            }
        };
    let width_m = tag(props, "width").and_then(|v| {
        let m = parse_length_m(v, LengthUnit::M);
        if m.is_none() {
            w.push(
                "width",
                ctx.at_prop("width"),
                format!("cannot read width '{v}' (metres); ignored it"),
            );
        }
        m
    });
    Some(Street {
        feature: ctx.index,
        id: ctx.id.clone().unwrap_or_else(|| ctx.index.to_string()),
        name: tag(props, "name").map(str::to_string),
        class,
        speed_kmh,
        speed_source,
        lanes,
        left,
        right,
        oneway,
        layer,
        aadt: None,
        width_m,
        vehicles_15min: None,
        median_m: None,
        shoulder_m: None,
        line: Vec::new(),
    })
}

/// A node's crossing control, or `None` when the node is no crossing or traffic control.
pub fn crossing(props: &Props) -> Option<(Control, ControlScope)> {
    let mut c = Control::UNCONTROLLED;
    let mut scope = None;
    match tag(props, "highway") {
        Some("traffic_signals") => {
            c.device = Device::Signal;
            // Signals only for a crossing on one road (not the junction's signals).
            if !is(props, "traffic_signals", &["crossing_only"]) {
                scope = Some(ControlScope::AllLegs);
            }
        }
        Some("stop") => {
            if is(props, "stop", &["all"]) {
                c.device = Device::AllWayStop;
            } else {
                c.device = Device::Stop;
            }
        }
        Some("give_way") => c.device = Device::Yield,
        Some("crossing") => {}
        _ if tag(props, "crossing").is_some() && tag(props, "railway").is_none() => {}
        _ => return None,
    }
    let raise = |c: &mut Control, d: Device| c.device = c.device.max(d);
    match tag(props, "crossing") {
        Some("traffic_signals") => raise(&mut c, Device::Signal),
        Some("marked" | "zebra" | "uncontrolled") => raise(&mut c, Device::Marked),
        Some("island") => c.refuge_island = true,
        _ => {}
    }
    if tag(props, "crossing:markings").is_some_and(|v| v != "no") {
        raise(&mut c, Device::Marked);
    }
    match tag(props, "crossing_ref") {
        Some("zebra" | "tiger") => raise(&mut c, Device::Marked),
        Some("pelican" | "toucan" | "puffin" | "pegasus") => raise(&mut c, Device::Signal),
        _ => {}
    }
    if is(props, "crossing:signals", &["yes"]) {
        raise(&mut c, Device::Signal);
    }
    if is(
        props,
        "flashing_lights",
        &["yes", "button", "always", "sensor"],
    ) {
        raise(&mut c, Device::Beacon);
    }
    if is(props, "crossing:island", &["yes"]) {
        c.refuge_island = true;
    }
    if is(props, "traffic_calming", &["table", "hump"]) || is(props, "crossing:raised", &["yes"]) {
        c.raised = true;
    }
    for key in ["supervised", "crossing:supervision"] {
        if let Some(v) = tag(props, key).filter(|v| *v != "no") {
            c.guard = Some(find_time_windows(v));
        }
    }
    // A signal on a crossing way (crossing=traffic_signals) controls only that road.
    let scope = scope.unwrap_or(match c.device {
        Device::AllWayStop => ControlScope::AllLegs,
        _ => ControlScope::NearestLeg,
    });
    Some((c, scope))
}

/// A school's students from `isced:level` (0-1 elementary, 2-3 secondary), default elementary.
pub fn students(props: &Props) -> Students {
    // `grades` (US mapping practice, e.g. `K-5`) decides when readable.
    if let Some(s) = tag(props, "grades").and_then(crate::input::values::students_of_grades) {
        return s;
    }
    match tag(props, "isced:level") {
        Some(v) if v.contains('2') || v.contains('3') => {
            if v.contains('1') || v.contains('0') {
                Students::Elementary
            } else {
                Students::Secondary
            }
        }
        _ => Students::Elementary,
    }
}

/// Whether a feature is a school (`amenity=school`).
pub fn is_school(props: &Props) -> bool {
    is(props, "amenity", &["school"])
}

/// A school's name from `name`.
pub fn name(props: &Props) -> Option<String> {
    tag(props, "name").map(str::to_string)
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::{json, Value};

    fn props(v: Value) -> Props {
        v.as_object().cloned().unwrap_or_default()
    }
    fn ctx() -> Ctx {
        Ctx {
            layer: LayerName::Streets,
            index: 2,
            id: Some("w7".into()),
        }
    }
    fn way(v: Value) -> (Option<Street>, Warnings) {
        let mut w = Warnings::default();
        (street(&ctx(), &props(v), &mut w), w)
    }

    #[test]
    fn highway_classes() {
        let table = [
            (
                RoadClass::Arterial,
                &[
                    "trunk",
                    "trunk_link",
                    "primary",
                    "primary_link",
                    "secondary",
                    "secondary_link",
                ][..],
            ),
            (RoadClass::Collector, &["tertiary", "tertiary_link"]),
            (
                RoadClass::Local,
                &["residential", "unclassified", "living_street", "road"],
            ),
            (RoadClass::Service, &["service"]),
            (
                RoadClass::Path,
                &[
                    "footway",
                    "path",
                    "pedestrian",
                    "cycleway",
                    "bridleway",
                    "track",
                    "corridor",
                ],
            ),
            (RoadClass::Steps, &["steps"]),
        ];
        for (class, values) in table {
            for v in values {
                let (s, w) = way(json!({ "highway": v }));
                let s = s.unwrap_or_else(|| panic!("{v} skipped"));
                assert_eq!(s.class, class, "{v}");
                assert_eq!(
                    (s.speed_kmh, s.lanes),
                    (default_speed_kmh(class), default_lanes(class))
                );
                assert_eq!(s.speed_source, SpeedSource::ClassDefault);
                assert_eq!((s.left, s.right), (SideWalk::Unknown, SideWalk::Unknown));
                assert!(w.finish().is_empty());
            }
        }
    }

    #[test]
    fn ways_not_walked_are_skipped_and_counted() {
        let skipped = [
            json!({"highway": "motorway"}),
            json!({"highway": "motorway_link"}),
            json!({"highway": "construction"}),
            json!({"highway": "proposed"}),
            json!({"highway": "abandoned"}),
            json!({"highway": "raceway"}),
            json!({"highway": "bus_guideway"}),
            json!({"highway": "platform"}),
            json!({"highway": "cycleway", "foot": "no"}),
            json!({"highway": "service", "access": "private"}),
            json!({"highway": "residential", "access": "no"}),
            json!({"highway": "pedestrian", "area": "yes"}),
            json!({"building": "yes"}),
        ];
        let mut w = Warnings::default();
        for p in &skipped {
            assert!(street(&ctx(), &props(p.clone()), &mut w).is_none(), "{p}");
        }
        assert_eq!(w.skipped_in(LayerName::Streets), skipped.len());
        for p in [
            json!({"highway": "service", "access": "private", "foot": "yes"}),
            json!({"highway": "track", "access": "no", "foot": "designated"}),
            json!({"highway": "cycleway", "foot": "permissive"}),
        ] {
            assert!(street(&ctx(), &props(p.clone()), &mut w).is_some(), "{p}");
        }
        let out = w.finish();
        assert!(out.iter().all(|x| x.message.starts_with("skipped")));
    }

    #[test]
    fn maxspeed_lanes_layer_oneway_width_name() {
        let (s, _) = way(
            json!({"highway": "primary", "maxspeed": "30 mph", "lanes": "3", "name": "High Road", "width": "12 m"}),
        );
        let s = s.unwrap_or_else(|| panic!("skipped"));
        assert!((s.speed_kmh - 48.28).abs() < 0.01);
        assert_eq!(
            (s.speed_source, s.lanes, s.name.as_deref(), s.width_m),
            (SpeedSource::Posted, 3, Some("High Road"), Some(12.0))
        );
        let speed = |v: Value| way(v).0.map(|s| (s.speed_kmh, s.speed_source));
        assert_eq!(
            speed(json!({"highway": "living_street", "maxspeed": "walk"})),
            Some((7.0, SpeedSource::Posted))
        );
        assert_eq!(
            speed(json!({"highway": "residential", "maxspeed": "DE:zone30"})),
            Some((30.0, SpeedSource::Posted))
        );
        assert_eq!(
            speed(
                json!({"highway": "residential", "maxspeed:forward": "50", "maxspeed:backward": "30"})
            ),
            Some((50.0, SpeedSource::Posted))
        );
        for code in ["none", "signals", "DE:urban"] {
            let (s, w) = way(json!({"highway": "tertiary", "maxspeed": code}));
            assert_eq!(
                s.map(|s| (s.speed_kmh, s.speed_source)),
                Some((50.0, SpeedSource::ClassDefault))
            );
            let w = w.finish();
            assert_eq!(w.len(), 1, "{code}");
            assert_eq!(w[0].at.property.as_deref(), Some("maxspeed"));
        }
        let layer = |v: Value| way(v).0.map(|s| s.layer);
        assert_eq!(
            layer(json!({"highway": "footway", "bridge": "yes"})),
            Some(1)
        );
        assert_eq!(
            layer(json!({"highway": "footway", "tunnel": "yes"})),
            Some(-1)
        );
        assert_eq!(
            layer(json!({"highway": "footway", "bridge": "yes", "layer": "2"})),
            Some(2)
        );
        assert_eq!(
            layer(json!({"highway": "footway", "bridge": "no"})),
            Some(0)
        );
        let oneway = |v: Value| way(v).0.map(|s| s.oneway);
        assert_eq!(
            oneway(json!({"highway": "residential", "oneway": "yes"})),
            Some(true)
        );
        assert_eq!(
            oneway(json!({"highway": "residential", "oneway": "-1"})),
            Some(true)
        );
        assert_eq!(
            oneway(json!({"highway": "residential", "oneway": "no"})),
            Some(false)
        );
        assert_eq!(
            oneway(json!({"highway": "primary", "junction": "roundabout"})),
            Some(true)
        );
        let (s, w) = way(json!({"highway": "residential", "lanes": "many", "width": "wide"}));
        assert_eq!(s.map(|s| (s.lanes, s.width_m)), Some((2, None)));
        assert_eq!(w.finish().len(), 2);
    }

    /// A divided road drawn as two one-way ways (OpenStreetMap wiki, "Key:oneway" and
    /// "Key:lanes": `lanes` on a one-way way counts that carriageway's lanes; common mapping
    /// practice): each way is one roadway; without `lanes` it gets half the class's lanes.
    #[test]
    fn one_way_carriageways_and_lanes_by_direction() {
        let lanes = |v: Value| way(v).0.map(|s| (s.lanes, s.oneway));
        assert_eq!(
            lanes(json!({"highway": "primary", "oneway": "yes"})),
            Some((2, true))
        );
        assert_eq!(
            lanes(json!({"highway": "primary", "oneway": "yes", "lanes": "3"})),
            Some((3, true))
        );
        assert_eq!(
            lanes(json!({"highway": "secondary", "lanes:forward": "2", "lanes:backward": "1"})),
            Some((3, false))
        );
        assert_eq!(
            lanes(json!({"highway": "residential", "oneway": "yes"})),
            Some((1, true))
        );
    }

    #[test]
    fn sidewalk_tags() {
        use SideWalk::*;
        let cases = [
            (json!({"sidewalk": "both"}), (Present, Present)),
            (json!({"sidewalk": "yes"}), (Present, Present)),
            (json!({"sidewalk": "left"}), (Present, Absent)),
            (json!({"sidewalk": "right"}), (Absent, Present)),
            (json!({"sidewalk": "no"}), (Absent, Absent)),
            (json!({"sidewalk": "none"}), (Absent, Absent)),
            (json!({"sidewalk": "separate"}), (Separate, Separate)),
            (json!({"sidewalk:both": "separate"}), (Separate, Separate)),
            (json!({"sidewalk:left": "yes"}), (Present, Unknown)),
            (json!({"sidewalk:right": "no"}), (Unknown, Absent)),
            (
                json!({"sidewalk": "both", "sidewalk:right": "separate"}),
                (Present, Separate),
            ),
            (json!({}), (Unknown, Unknown)),
        ];
        for (tags, want) in cases {
            let mut p = props(tags.clone());
            p.insert("highway".into(), json!("residential"));
            let mut w = Warnings::default();
            let s = street(&ctx(), &p, &mut w).map(|s| (s.left, s.right));
            assert_eq!(s, Some(want), "{tags}");
        }
        let (s, w) = way(json!({"highway": "service", "sidewalk": "perhaps"}));
        assert_eq!(s.map(|s| s.left), Some(Unknown));
        assert_eq!(w.finish().len(), 1);
    }

    #[test]
    fn crossing_nodes() {
        use ControlScope::*;
        use Device as D;
        let c = |v: Value| {
            crossing(&props(v))
                .map(|(c, s)| (c.device, c.refuge_island, c.raised, c.guard.is_some(), s))
        };
        assert_eq!(
            c(json!({"highway": "traffic_signals"})),
            Some((D::Signal, false, false, false, AllLegs))
        );
        assert_eq!(
            c(json!({"highway": "traffic_signals", "traffic_signals": "crossing_only"})),
            Some((D::Signal, false, false, false, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing": "traffic_signals"})),
            Some((D::Signal, false, false, false, NearestLeg))
        );
        for m in ["marked", "zebra", "uncontrolled"] {
            assert_eq!(
                c(json!({"highway": "crossing", "crossing": m})),
                Some((D::Marked, false, false, false, NearestLeg)),
                "{m}"
            );
        }
        for m in ["unmarked", "no"] {
            assert_eq!(
                c(json!({"highway": "crossing", "crossing": m})),
                Some((D::None, false, false, false, NearestLeg)),
                "{m}"
            );
        }
        assert_eq!(
            c(json!({"highway": "crossing", "crossing:markings": "zebra"})),
            Some((D::Marked, false, false, false, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing:markings": "no"})).map(|x| x.0),
            Some(D::None)
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing_ref": "zebra"})).map(|x| x.0),
            Some(D::Marked)
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing_ref": "toucan"})).map(|x| x.0),
            Some(D::Signal)
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing:island": "yes"})),
            Some((D::None, true, false, false, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing": "island"})),
            Some((D::None, true, false, false, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing": "marked", "supervised": "yes"})),
            Some((D::Marked, false, false, true, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing": "marked", "flashing_lights": "button"}))
                .map(|x| x.0),
            Some(D::Beacon)
        );
        assert_eq!(
            c(json!({"highway": "crossing", "crossing": "marked", "traffic_calming": "table"})),
            Some((D::Marked, false, true, false, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "crossing", "traffic_calming": "hump"})).map(|x| x.2),
            Some(true)
        );
        assert_eq!(
            c(json!({"highway": "stop"})),
            Some((D::Stop, false, false, false, NearestLeg))
        );
        assert_eq!(
            c(json!({"highway": "stop", "stop": "all"})),
            Some((D::AllWayStop, false, false, false, AllLegs))
        );
        assert_eq!(
            // A give-way sign is a yield, not a stop (67 Pa. Code § 447.4(a)(2) exempts only
            // signals and stop signs).
            c(json!({"highway": "give_way"})),
            Some((D::Yield, false, false, false, NearestLeg))
        );
        assert_eq!(c(json!({"highway": "bus_stop"})), None);
        assert_eq!(c(json!({"amenity": "bench"})), None);
        assert_eq!(
            c(json!({"railway": "crossing", "crossing": "uncontrolled"})),
            None
        );
        let hours = crossing(&props(
            json!({"highway": "crossing", "supervised": "Mo-Fr 07:45-08:30"}),
        ))
        .and_then(|x| x.0.guard);
        assert_eq!(
            hours,
            Some(vec![TimeWindow {
                start_min: 465,
                end_min: 510
            }])
        );
    }

    #[test]
    fn ids_and_students() {
        assert_eq!(
            feature_id(&props(json!({"@id": "w5"})), Some("w9".into())),
            Some("w5".into())
        );
        assert_eq!(
            feature_id(&props(json!({})), Some("w9".into())),
            Some("w9".into())
        );
        assert_eq!(
            students(&props(json!({"isced:level": "2;3"}))),
            Students::Secondary
        );
        assert_eq!(
            students(&props(json!({"isced:level": "1"}))),
            Students::Elementary
        );
    }
}
