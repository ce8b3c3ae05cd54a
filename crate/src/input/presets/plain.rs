//! The plain preset: the project's own property names (see `docs/input.md`), read through
//! [`LayerFields`] so that a mapping file can rename properties and translate values.

use crate::error::{Error, Result};
use crate::input::fields::{Got, LayerFields};
use crate::input::geojson_read::{check_lonlat, Props};
use crate::input::model::*;
use crate::input::speed::{parse_length_m, parse_speed_kmh, LengthUnit, SpeedUnit};
use crate::input::values::*;
use crate::input::warnings::{Ctx, Warnings};
use serde_json::Value;

/// The feature's id: the mapped `id` property, else the GeoJSON `id` member.
pub fn feature_id(props: &Props, member: Option<String>, f: &LayerFields) -> Option<String> {
    f.text("id", props).map(|g| g.text).or(member)
}

fn speed_unit(f: &LayerFields, name: &str) -> SpeedUnit {
    match f.get(name).unit.as_deref() {
        Some("mph") => SpeedUnit::Mph,
        _ => SpeedUnit::Kmh,
    }
}

fn length_unit(f: &LayerFields, name: &str) -> LengthUnit {
    match f.get(name).unit.as_deref() {
        Some("ft") => LengthUnit::Ft,
        _ => LengthUnit::M,
    }
}

fn unknown_value(
    w: &mut Warnings,
    kind: &'static str,
    ctx: &Ctx,
    g: &Got,
    allowed: &str,
    used: &str,
) {
    w.push(
        kind,
        ctx.at_prop(&g.property),
        format!(
            "unknown value '{}'; allowed: {allowed}; used {used}. Fix the value or map it in a \
             mapping file",
            g.text
        ),
    );
}

fn optional_number(
    ctx: &Ctx,
    props: &Props,
    f: &LayerFields,
    name: &'static str,
    w: &mut Warnings,
) -> Option<f64> {
    let g = f.text(name, props)?;
    let v = if name.ends_with("_m") {
        parse_length_m(&g.text, length_unit(f, name))
    } else {
        parse_non_negative(&g.text)
    };
    if v.is_none() {
        w.push(
            "number",
            ctx.at_prop(&g.property),
            format!(
                "'{}' is not a non-negative number; ignored it (left empty)",
                g.text
            ),
        );
    }
    v
}

/// One street feature's attributes; `line` is left empty for the caller to fill per part.
pub fn street(ctx: &Ctx, props: &Props, f: &LayerFields, w: &mut Warnings) -> Street {
    let class = match f.text("class", props) {
        Some(g) => parse_class(&g.text).unwrap_or_else(|| {
            unknown_value(w, "class", ctx, &g, CLASS_VALUES, "local");
            RoadClass::Local
        }),
        None => {
            w.push(
                "class",
                ctx.at_prop("class"),
                format!("no road class; used local. Give one of: {CLASS_VALUES}"),
            );
            RoadClass::Local
        }
    };
    let (speed_kmh, speed_source) = match f.text("speed_kmh", props) {
        Some(g) => match parse_speed_kmh(&g.text, speed_unit(f, "speed_kmh")) {
            Some(v) => (v, SpeedSource::Posted),
            None => {
                let d = default_speed_kmh(class);
                w.push(
                    "speed",
                    ctx.at_prop(&g.property),
                    format!(
                        "cannot read a speed from '{}'; used the {} default {d} km/h. Write a \
                         number (km/h, or '30 mph')",
                        g.text,
                        class.as_str()
                    ),
                );
                (d, SpeedSource::ClassDefault)
            }
        },
        None => (default_speed_kmh(class), SpeedSource::ClassDefault),
    };
    let lanes = match f.text("lanes", props) {
        Some(g) => match parse_int(&g.text) {
            Some(n) if (1..=i64::from(MAX_LANES)).contains(&n) => n as u32,
            Some(0) if class.is_foot_only() => 0,
            _ => {
                let d = default_lanes(class);
                w.push(
                    "lanes",
                    ctx.at_prop(&g.property),
                    format!(
                        "'{}' is not a lane count (a whole number from 1 to {MAX_LANES} on a \
                         road); used the {} default {d}",
                        g.text,
                        class.as_str()
                    ),
                );
                d
            }
        },
        None => default_lanes(class),
    };
    let (left, right) = match f.text("sidewalk", props) {
        Some(g) => parse_sidewalk(&g.text).unwrap_or_else(|| {
            unknown_value(w, "sidewalk", ctx, &g, SIDEWALK_VALUES, "unknown");
            (SideWalk::Unknown, SideWalk::Unknown)
        }),
        None => (SideWalk::Unknown, SideWalk::Unknown),
    };
    let oneway = match f.text("oneway", props) {
        Some(g) => parse_bool(&g.text).unwrap_or_else(|| {
            unknown_value(w, "oneway", ctx, &g, BOOL_VALUES, "false");
            false
        }),
        None => false,
    };
    let layer = match f.text("layer", props) {
        Some(g) => match parse_int(&g.text).and_then(|n| i32::try_from(n).ok()) {
            Some(n) => n,
            None => {
                w.push(
                    "number",
                    ctx.at_prop(&g.property),
                    format!(
                        "layer '{}' is not a whole number; used 0 (at grade)",
                        g.text
                    ),
                );
                0
            }
        },
        None => 0,
    };
    Street {
        feature: ctx.index,
        id: ctx.id.clone().unwrap_or_else(|| ctx.index.to_string()),
        name: f.text("name", props).map(|g| g.text),
        class,
        speed_kmh,
        speed_source,
        lanes,
        left,
        right,
        oneway,
        layer,
        aadt: optional_number(ctx, props, f, "aadt", w),
        width_m: optional_number(ctx, props, f, "width_m", w),
        vehicles_15min: optional_number(ctx, props, f, "vehicles_15min", w),
        median_m: optional_number(ctx, props, f, "median_m", w),
        shoulder_m: optional_number(ctx, props, f, "shoulder_m", w),
        line: Vec::new(),
    }
}

/// One crossing point's control and scope.
pub fn crossing(
    ctx: &Ctx,
    props: &Props,
    f: &LayerFields,
    w: &mut Warnings,
) -> (Control, ControlScope) {
    let mut control = match f.text("control", props) {
        Some(g) => {
            let (c, unknown) = parse_control(&g.text);
            if !unknown.is_empty() {
                w.push(
                    "control",
                    ctx.at_prop(&g.property),
                    format!(
                        "unknown control value(s) '{}'; allowed: {CONTROL_VALUES}; ignored them",
                        unknown.join(";")
                    ),
                );
            }
            c
        }
        None => {
            w.push(
                "control",
                ctx.at_prop("control"),
                format!(
                    "no control given; used none (uncontrolled). Give one of: {CONTROL_VALUES}"
                ),
            );
            Control::UNCONTROLLED
        }
    };
    if let Some(g) = f.text("guard_hours", props) {
        let windows = parse_guard_hours(&g.text).unwrap_or_else(|bad| {
            w.push(
                "guard_hours",
                ctx.at_prop(&g.property),
                format!(
                    "cannot read the time window '{bad}'; write windows like \
                     07:30-08:45,14:45-15:30; took the guard as on duty at school travel times"
                ),
            );
            Vec::new()
        });
        control.guard = Some(windows);
    }
    let scope = scope_of(control.device);
    (control, scope)
}

/// A school's id (required), name and students.
pub fn school_attrs(
    ctx: &Ctx,
    props: &Props,
    f: &LayerFields,
    w: &mut Warnings,
) -> Result<(String, String, Students)> {
    let Some(id) = ctx.id.clone() else {
        return Err(Error::input(
            ctx.at_prop("id"),
            "the school has no id; give every school a unique 'id' property (homes and \
             catchments refer to it)",
        ));
    };
    let name = f.text("name", props).map_or_else(|| id.clone(), |g| g.text);
    let students = match f.text("students", props) {
        Some(g) => parse_students(&g.text).unwrap_or_else(|| {
            unknown_value(w, "students", ctx, &g, STUDENTS_VALUES, "elementary");
            Students::Elementary
        }),
        None => Students::default(),
    };
    // A school's grades, when given and readable, decide (67 Pa. Code § 447.2's bands).
    let students = match f.text("grades", props) {
        Some(g) => crate::input::values::students_of_grades(&g.text).unwrap_or_else(|| {
            unknown_value(
                w,
                "grades",
                ctx,
                &g,
                "grades such as K-5, 6-8, 9-12",
                "the students value",
            );
            students
        }),
        None => students,
    };
    Ok((id, name, students))
}

/// A school's `entrances` property: `[[lon, lat], ...]`. Bad coordinates are errors like any
/// coordinate; a malformed list is a warning (the geometry is used instead).
pub fn entrances(
    ctx: &Ctx,
    props: &Props,
    f: &LayerFields,
    w: &mut Warnings,
) -> Result<Vec<LonLat>> {
    let Some((name, value)) = f.get("entrances").raw(props) else {
        return Ok(Vec::new());
    };
    let at = || ctx.at_prop(name);
    let mut out = Vec::new();
    let list = match value {
        Value::Array(list) => list,
        _ => {
            w.push(
                "entrances",
                at(),
                "entrances must be an array of [lon, lat]; used the geometry",
            );
            return Ok(out);
        }
    };
    for item in list {
        match item.as_array().map(|a| a.as_slice()) {
            Some([x, y, ..]) => match (x.as_f64(), y.as_f64()) {
                (Some(x), Some(y)) => out.push(check_lonlat(x, y, &at)?),
                _ => {
                    w.push(
                        "entrances",
                        at(),
                        "an entrance is not [lon, lat] numbers; skipped it",
                    );
                }
            },
            _ => w.push(
                "entrances",
                at(),
                "an entrance is not [lon, lat]; skipped it",
            ),
        }
    }
    Ok(out)
}

/// A home at `at`: its id (default the feature index), children and assigned school.
pub fn home(ctx: &Ctx, at: LonLat, props: &Props, f: &LayerFields, w: &mut Warnings) -> Home {
    let (children, school) = home_attrs(ctx, props, f, w);
    Home {
        feature: ctx.index,
        id: ctx.id.clone().unwrap_or_else(|| ctx.index.to_string()),
        at,
        children,
        school,
    }
}

/// A home's children (positive whole number, default 1) and assigned school.
pub fn home_attrs(
    ctx: &Ctx,
    props: &Props,
    f: &LayerFields,
    w: &mut Warnings,
) -> (u32, Option<String>) {
    let children = match f.text("children", props) {
        Some(g) => match parse_int(&g.text).and_then(|n| u32::try_from(n).ok()) {
            Some(n) if n >= 1 => n,
            _ => {
                w.push(
                    "children",
                    ctx.at_prop(&g.property),
                    format!(
                        "children '{}' is not a positive whole number; used 1",
                        g.text
                    ),
                );
                1
            }
        },
        None => 1,
    };
    (children, f.text("school", props).map(|g| g.text))
}

/// A catchment's school id (required).
pub fn catchment_school(ctx: &Ctx, props: &Props, f: &LayerFields) -> Result<String> {
    f.text("school", props).map(|g| g.text).ok_or_else(|| {
        let names = f.get("school").from.join("' or '");
        Error::input(
            ctx.at_prop(
                f.get("school")
                    .from
                    .first()
                    .map_or("school", |s| s.as_str()),
            ),
            format!("the catchment names no school; add a '{names}' property with the school's id"),
        )
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::LayerName;
    use crate::input::fields::{Field, CROSSINGS, HOMES, SCHOOLS, STREETS};
    use serde_json::json;

    fn props(v: Value) -> Props {
        v.as_object().cloned().unwrap_or_default()
    }
    fn ctx(layer: LayerName) -> Ctx {
        Ctx {
            layer,
            index: 4,
            id: Some("f4".into()),
        }
    }
    fn street_of(v: Value) -> (Street, Vec<crate::error::Warning>) {
        let mut w = Warnings::default();
        let s = street(
            &ctx(LayerName::Streets),
            &props(v),
            &LayerFields::plain(STREETS),
            &mut w,
        );
        (s, w.finish())
    }

    #[test]
    fn every_class_and_its_defaults() {
        let cases = [
            ("arterial", RoadClass::Arterial, 60.0, 4),
            ("collector", RoadClass::Collector, 50.0, 2),
            ("local", RoadClass::Local, 40.0, 2),
            ("service", RoadClass::Service, 20.0, 1),
            ("path", RoadClass::Path, 0.0, 0),
            ("steps", RoadClass::Steps, 0.0, 0),
        ];
        for (t, class, speed, lanes) in cases {
            let (s, w) = street_of(json!({ "class": t }));
            assert!(w.is_empty(), "{t}: {w:?}");
            assert_eq!(
                (s.class, s.speed_kmh, s.lanes),
                (class, speed, lanes),
                "{t}"
            );
            assert_eq!(s.speed_source, SpeedSource::ClassDefault);
            assert_eq!((s.left, s.right), (SideWalk::Unknown, SideWalk::Unknown));
            assert_eq!((s.oneway, s.layer, s.id.as_str()), (false, 0, "f4"));
        }
    }

    #[test]
    fn every_street_property() {
        let (s, w) = street_of(json!({
            "name": "Elm Row", "class": "collector", "speed_kmh": 30, "lanes": "3",
            "sidewalk": "left", "oneway": "yes", "layer": -1, "aadt": 4200,
            "width_m": "9.5", "vehicles_15min": 80, "median_m": 2, "shoulder_m": 0.5
        }));
        assert!(w.is_empty(), "{w:?}");
        assert_eq!(s.name.as_deref(), Some("Elm Row"));
        assert_eq!(
            (s.speed_kmh, s.speed_source, s.lanes),
            (30.0, SpeedSource::Posted, 3)
        );
        assert_eq!((s.left, s.right), (SideWalk::Present, SideWalk::Absent));
        assert_eq!((s.oneway, s.layer), (true, -1));
        assert_eq!(
            (s.aadt, s.width_m, s.vehicles_15min),
            (Some(4200.0), Some(9.5), Some(80.0))
        );
        assert_eq!((s.median_m, s.shoulder_m), (Some(2.0), Some(0.5)));
        for (t, l, r) in [
            ("both", SideWalk::Present, SideWalk::Present),
            ("right", SideWalk::Absent, SideWalk::Present),
            ("none", SideWalk::Absent, SideWalk::Absent),
            ("unknown", SideWalk::Unknown, SideWalk::Unknown),
            ("separate", SideWalk::Separate, SideWalk::Separate),
        ] {
            let (s, _) = street_of(json!({ "class": "local", "sidewalk": t }));
            assert_eq!((s.left, s.right), (l, r), "{t}");
        }
        for (t, b) in [
            ("true", true),
            ("false", false),
            ("no", false),
            ("yes", true),
        ] {
            assert_eq!(
                street_of(json!({ "class": "local", "oneway": t })).0.oneway,
                b
            );
        }
        assert!(
            street_of(json!({ "class": "local", "oneway": true }))
                .0
                .oneway
        );
        let (s, _) = street_of(json!({ "class": "local", "speed_kmh": "25 mph" }));
        assert!((s.speed_kmh - 40.2336).abs() < 1e-9);
    }

    #[test]
    fn unknown_and_unreadable_values_warn_and_default() {
        let (s, w) = street_of(json!({
            "class": "highway", "speed_kmh": "fast", "lanes": 0, "sidewalk": "some",
            "oneway": "maybe", "layer": "top", "aadt": "lots"
        }));
        assert_eq!((s.class, s.speed_kmh, s.lanes), (RoadClass::Local, 40.0, 2));
        assert_eq!(s.speed_source, SpeedSource::ClassDefault);
        assert_eq!(
            (s.left, s.oneway, s.layer, s.aadt),
            (SideWalk::Unknown, false, 0, None)
        );
        let props: Vec<_> = w.iter().filter_map(|x| x.at.property.clone()).collect();
        assert_eq!(
            props,
            [
                "class",
                "speed_kmh",
                "lanes",
                "sidewalk",
                "oneway",
                "layer",
                "aadt"
            ]
        );
        assert!(w[0].message.contains("'highway'") && w[0].message.contains("arterial, collector"));
        assert!(w[0].message.contains("used local"));
        assert!(w
            .iter()
            .all(|x| x.at.feature == Some(4) && x.at.id.as_deref() == Some("f4")));
        let (s, w) = street_of(json!({}));
        assert_eq!((s.class, w.len()), (RoadClass::Local, 1));
        assert!(w[0].message.contains("no road class"));
    }

    #[test]
    fn crossings_controls_and_guard_hours() {
        let f = LayerFields::plain(CROSSINGS);
        let c = ctx(LayerName::Crossings);
        let mut w = Warnings::default();
        let (ctl, scope) = crossing(
            &c,
            &props(json!({"control": "signal;guard", "guard_hours": "07:30-08:45,14:45-15:30"})),
            &f,
            &mut w,
        );
        assert_eq!((ctl.device, scope), (Device::Signal, ControlScope::AllLegs));
        let g = ctl.guard.unwrap_or_default();
        assert_eq!(
            g,
            vec![
                TimeWindow {
                    start_min: 450,
                    end_min: 525
                },
                TimeWindow {
                    start_min: 885,
                    end_min: 930
                }
            ]
        );
        let (ctl, scope) = crossing(&c, &props(json!({"control": "marked;refuge"})), &f, &mut w);
        assert_eq!(
            (ctl.device, ctl.refuge_island, ctl.guard, scope),
            (Device::Marked, true, None, ControlScope::NearestLeg)
        );
        let (ctl, scope) = crossing(&c, &props(json!({"control": "all_way_stop"})), &f, &mut w);
        assert_eq!(
            (ctl.device, scope),
            (Device::AllWayStop, ControlScope::AllLegs)
        );
        assert!(w.finish().is_empty());
        let mut w = Warnings::default();
        let (ctl, _) = crossing(
            &c,
            &props(json!({"control": "guard;zebra", "guard_hours": "mornings"})),
            &f,
            &mut w,
        );
        assert_eq!((ctl.device, ctl.guard), (Device::None, Some(vec![])));
        let (ctl, _) = crossing(&c, &props(json!({})), &f, &mut w);
        assert!(ctl.is_uncontrolled());
        let w = w.finish();
        let props: Vec<_> = w.iter().filter_map(|x| x.at.property.clone()).collect();
        assert_eq!(props, ["control", "guard_hours", "control"]);
    }

    #[test]
    fn schools_homes_catchments() {
        let f = LayerFields::plain(SCHOOLS);
        let mut w = Warnings::default();
        let c = ctx(LayerName::Schools);
        let (id, name, st) = school_attrs(&c, &props(json!({"students": "secondary"})), &f, &mut w)
            .unwrap_or_default_school();
        assert_eq!(
            (id.as_str(), name.as_str(), st),
            ("f4", "f4", Students::Secondary)
        );
        // Grades decide over `students` (67 Pa. Code § 447.2: K-6 elementary).
        let st = |v: serde_json::Value| {
            school_attrs(&c, &props(v), &f, &mut Warnings::default())
                .unwrap_or_default_school()
                .2
        };
        assert_eq!(
            st(json!({"students": "secondary", "grades": "6-8"})),
            Students::Elementary
        );
        assert_eq!(st(json!({"grades": "9-12"})), Students::Secondary);
        assert_eq!(st(json!({"students": "middle"})), Students::Elementary);
        let (_, name, st) = school_attrs(
            &c,
            &props(json!({"name": "Hill School", "students": "adults"})),
            &f,
            &mut w,
        )
        .unwrap_or_default_school();
        assert_eq!((name.as_str(), st), ("Hill School", Students::Elementary));
        let no_id = Ctx {
            id: None,
            ..c.clone()
        };
        let e = school_attrs(&no_id, &props(json!({"name": "X"})), &f, &mut w);
        assert!(
            matches!(e, Err(Error::Input { at, .. }) if at.feature == Some(4) && at.property.as_deref() == Some("id"))
        );
        let e = entrances(
            &c,
            &props(json!({"entrances": [[1.0, 2.0], [1.5, 2.5]]})),
            &f,
            &mut w,
        );
        assert_eq!(e.ok(), Some(vec![[1.0, 2.0], [1.5, 2.5]]));
        let e = entrances(
            &c,
            &props(json!({"entrances": [[500000.0, 2.0]]})),
            &f,
            &mut w,
        );
        assert!(matches!(e, Err(Error::Projected { .. })));

        let hf = LayerFields::plain(HOMES);
        let h = ctx(LayerName::Homes);
        assert_eq!(
            home_attrs(
                &h,
                &props(json!({"children": 3, "school": "s1"})),
                &hf,
                &mut w
            ),
            (3, Some("s1".into()))
        );
        for bad in [json!(0), json!(-2), json!(1.5), json!("two")] {
            assert_eq!(
                home_attrs(&h, &props(json!({ "children": bad })), &hf, &mut w),
                (1, None)
            );
        }
        let mut cf = LayerFields::plain(crate::input::fields::CATCHMENTS);
        assert_eq!(
            catchment_school(&c, &props(json!({"school_id": "s2"})), &cf).ok(),
            Some("s2".into())
        );
        assert!(catchment_school(&c, &props(json!({"name": "s2"})), &cf).is_err());
        cf.set("school", Field::named(&["SCH"]));
        assert_eq!(
            catchment_school(&c, &props(json!({"SCH": 9})), &cf).ok(),
            Some("9".into())
        );
        let w = w.finish();
        assert_eq!(
            w.iter()
                .filter(|x| x.at.property.as_deref() == Some("children"))
                .count(),
            4
        );
        assert_eq!(
            w.iter()
                .filter(|x| x.at.property.as_deref() == Some("students"))
                .count(),
            1
        );
    }

    trait OrDefaultSchool {
        fn unwrap_or_default_school(self) -> (String, String, Students);
    }
    impl OrDefaultSchool for Result<(String, String, Students)> {
        fn unwrap_or_default_school(self) -> (String, String, Students) {
            self.unwrap_or_else(|_| (String::new(), String::new(), Students::Elementary))
        }
    }
}
