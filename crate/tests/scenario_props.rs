//! Property tests on random grid towns with two schools: a re-audit from a previous audit
//! equals the audit from scratch with the same interventions, and removing the interventions
//! gives back the original audit exactly. (A compact two-school variant of the random towns
//! in `monotonicity.rs`, which have one school and so cannot show schools left alone.)

use catchwalk::config::Config;
use catchwalk::export::homes_csv;
use catchwalk::input::{Control, Home, Layers, RoadClass, School, SideWalk, Street, Students};
use catchwalk::pipeline::{audit_layers, AuditOutput, Silent};
use catchwalk::scenario::reaudit::{audit_overlay, reaudit};
use catchwalk::scenario::{Change, Intervention, Origin, SideChoice};
use proptest::prelude::*;
use std::sync::Arc;

const STEP: f64 = 0.0012; // about 133 m at the equator

fn town(nx: usize, ny: usize, specs: &[(u8, u8)], homes: &[usize], schools: [usize; 2]) -> Layers {
    let at = |i: usize, j: usize| [i as f64 * STEP, j as f64 * STEP];
    let mut lines = Vec::new();
    for j in 0..ny {
        for i in 0..nx - 1 {
            lines.push(vec![at(i, j), at(i + 1, j)]);
        }
    }
    for i in 0..nx {
        for j in 0..ny - 1 {
            lines.push(vec![at(i, j), at(i, j + 1)]);
        }
    }
    let streets = lines
        .into_iter()
        .enumerate()
        .map(|(k, line)| {
            let (speed, sw) = specs[k % specs.len()];
            let side = [SideWalk::Present, SideWalk::Absent, SideWalk::Unknown][sw as usize % 3];
            Street {
                id: format!("s{k}"),
                left: side,
                right: side,
                ..Street::new(
                    k,
                    [RoadClass::Arterial, RoadClass::Collector, RoadClass::Local]
                        [speed as usize % 3],
                    [30.0, 40.0, 50.0, 60.0][speed as usize % 4],
                    2,
                    line,
                )
            }
        })
        .collect();
    let node = |k: usize| at(k % nx, (k / nx) % ny);
    let homes = homes
        .iter()
        .enumerate()
        .map(|(f, &k)| {
            let p = at(k % (nx - 1), (k / nx) % ny);
            Home {
                feature: f,
                id: format!("h{f}"),
                at: [p[0] + STEP * 0.5, p[1] + 0.00009],
                children: 1 + (f as u32 % 3),
                school: None,
            }
        })
        .collect();
    let schools = schools
        .iter()
        .enumerate()
        .map(|(f, &k)| {
            let p = node(k);
            School {
                feature: f,
                id: format!("S{f}"),
                name: format!("School {f}"),
                entrances: vec![[p[0] + 0.00004, p[1] + 0.00004]],
                students: Students::Elementary,
            }
        })
        .collect();
    Layers {
        streets,
        schools,
        homes,
        ..Layers::default()
    }
}

fn intervention(code: (u8, usize, usize), layers: &Layers, nx: usize) -> Intervention {
    let (kind, a, b) = code;
    let n_streets = layers.streets.len().max(1);
    let street = format!("s{}", a % n_streets);
    let node = |k: usize| [(k % nx) as f64 * STEP, (k / nx % nx) as f64 * STEP];
    let control = |c: Control| Change::Control {
        at: node(a % (nx * nx)),
        scope: catchwalk::input::values::scope_of(c.device),
        control: c,
    };
    let change = match kind % 7 {
        0 => control(Control {
            device: catchwalk::input::Device::Signal,
            ..Control::UNCONTROLLED
        }),
        1 => control(Control {
            guard: Some(vec![]),
            ..Control::UNCONTROLLED
        }),
        2 => control(Control {
            refuge_island: true,
            ..Control::UNCONTROLLED
        }),
        3 => Change::Speed {
            street,
            speed_kmh: 20.0,
        },
        4 => Change::Sidewalk {
            street,
            side: [SideChoice::Both, SideChoice::Left, SideChoice::Right][b % 3],
        },
        5 => Change::Close { street },
        _ => Change::Path {
            line: vec![node(a % (nx * nx)), node((a + nx + 1) % (nx * nx))],
        },
    };
    Intervention {
        feature: 0,
        id: None,
        kind: "generated".into(),
        change,
        at: None,
        origin: Origin::Proposal,
        note: None,
    }
}

fn same(a: &AuditOutput, b: &AuditOutput) -> Result<(), TestCaseError> {
    prop_assert_eq!(homes_csv(a), homes_csv(b));
    prop_assert_eq!(&a.homes, &b.homes);
    prop_assert_eq!(&a.scores, &b.scores);
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(40))]
    #[test]
    fn reaudit_equals_scratch_and_removal_restores(
        n in 3usize..6,
        specs in prop::collection::vec((any::<u8>(), any::<u8>()), 4..10),
        homes in prop::collection::vec(0usize..30, 1..8),
        schools in (0usize..30, 0usize..30),
        codes in prop::collection::vec((any::<u8>(), 0usize..60, 0usize..3), 1..4),
    ) {
        let layers = town(n, n, &specs, &homes, [schools.0 % (n * n), schools.1 % (n * n)]);
        let config = Config::default();
        let base = match audit_layers(layers.clone(), &config, &mut Silent) {
            Ok(o) => o,
            Err(e) => return Err(TestCaseError::fail(e.to_string())),
        };
        prop_assert!(base.homes.iter().all(|h| h.shortest.is_some()), "every home is routed");
        let mut list: Vec<Intervention> = codes.iter().map(|&c| intervention(c, &layers, n)).collect();
        for (k, iv) in list.iter_mut().enumerate() {
            iv.feature = k;
        }
        // Closures may remove a street a later intervention names: both paths must agree
        // on the error too.
        let scratch = audit_overlay(Arc::new(layers.clone()), list.clone(), &config, &mut Silent);
        let re = reaudit(&base, list, &mut Silent);
        match (scratch, re) {
            (Ok(s), Ok((r, _))) => {
                same(&s, &r)?;
                let back = match reaudit(&r, Vec::new(), &mut Silent) {
                    Ok((b, _)) => b,
                    Err(e) => return Err(TestCaseError::fail(e.to_string())),
                };
                same(&back, &base)?;
            }
            (Err(a), Err(b)) => prop_assert_eq!(a.to_string(), b.to_string()),
            (a, b) => return Err(TestCaseError::fail(format!("scratch {:?} vs re-audit {:?}", a.err(), b.err()))),
        }
    }
}
