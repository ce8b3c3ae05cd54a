//! The upgrade planner on the demo town (plain preset): its re-router reproduces the audit's
//! routes, its choices raise the safe-route share by exactly the children it reports, and a
//! street-level choice, applied to the layers and audited from scratch, gains what it said.

mod common;
use common::demo_town;

use catchwalk::config::Config;
use catchwalk::input::Layers;
use catchwalk::pipeline::{audit_layers, AuditOutput, Silent};
use catchwalk::score::plan::{
    plan_upgrades, plan_upgrades_afresh, recommended_costs, reroute_school, RouteContext, Upgrade,
};

fn audit(layers: &Layers) -> AuditOutput {
    match audit_layers(layers.clone(), &Config::default(), &mut Silent) {
        Ok(out) => out,
        Err(e) => panic!("audit failed: {e}"),
    }
}

fn safe_children(out: &AuditOutput) -> f64 {
    out.scores
        .catchments
        .iter()
        .map(|c| c.children_safe_route)
        .sum()
}

#[test]
fn the_planner_reroutes_exactly_as_the_audit_does() {
    let out = audit(&demo_town());
    let g = &out.network.graph;
    let cost = recommended_costs(g, &out.layers.streets, &out.config);
    for s in 0..out.layers.schools.len() {
        let members: Vec<usize> = (0..out.homes.len())
            .filter(|&i| out.homes[i].assignment.school == Some(s))
            .collect();
        let safe_cost = catchwalk::pipeline::safe_costs(
            g,
            &out.layers.streets,
            &out.config,
            out.layers.schools[s].students,
        );
        let ctx = RouteContext {
            graph: g,
            streets: &out.layers.streets,
            config: &out.config,
            cost: &cost,
            safe_cost: &safe_cost,
        };
        let again = reroute_school(&ctx, &out.school_att[s], &members, &out.homes, None);
        assert_eq!(again.len(), members.len());
        for (i, h, _) in again {
            assert_eq!(h.recommended, out.homes[i].recommended, "home {i}");
            assert_eq!(h.safe, out.homes[i].safe, "home {i}");
            assert_eq!(h.over_detour_cap, out.homes[i].over_detour_cap, "home {i}");
        }
    }
}

#[test]
fn a_budget_of_five_raises_the_safe_route_share_by_what_it_reports() {
    let layers = demo_town();
    let out = audit(&layers);
    let plan = plan_upgrades(&out, &out.scores.homes, 5);
    assert_eq!(plan.safe_children_before, safe_children(&out));
    assert!(!plan.steps.is_empty() && plan.steps.len() <= 5);
    assert!(plan.safe_children_after > plan.safe_children_before);
    let gained: f64 = plan.steps.iter().map(|s| s.children_gained).sum();
    assert_eq!(plan.safe_children_after - plan.safe_children_before, gained);
    // Every chosen step helps: children gained, or risk cut.
    assert!(plan
        .steps
        .iter()
        .all(|s| s.children_gained > 0.0 || s.risk_reduction > 0.0));
    for (b, a) in plan.before.iter().zip(&plan.after) {
        assert!(
            a.children_safe_route >= b.children_safe_route,
            "{}",
            b.school_id
        );
    }
    let zero = plan_upgrades(&out, &out.scores.homes, 0);
    assert!(zero.steps.is_empty() && zero.after == zero.before);

    // A street-wide choice, applied to the layers and audited from scratch, gains what the
    // planner said (the first such step, before later steps interact with it).
    if let Some(step) = plan
        .steps
        .first()
        .filter(|s| matches!(s.upgrade, Upgrade::SpeedReduction | Upgrade::Sidewalk))
    {
        let mut l2 = layers.clone();
        let st = l2
            .streets
            .iter_mut()
            .find(|s| s.id == step.street_id)
            .expect("the planned street exists");
        match step.upgrade {
            Upgrade::SpeedReduction => st.speed_kmh = st.speed_kmh.min(30.0),
            _ => {
                st.left = catchwalk::input::SideWalk::Present;
                st.right = catchwalk::input::SideWalk::Present;
            }
        }
        let after = audit(&l2);
        assert_eq!(
            safe_children(&after) - safe_children(&out),
            step.children_gained
        );
    }
}

#[test]
fn kept_tries_and_both_cores_give_the_plan_of_trying_everything_on_one_thread() {
    // The planner keeps a candidate's try across rounds while no choice could alter it and
    // tries candidates on every core; neither may change a figure.
    let out = audit(&demo_town());
    let kept = plan_upgrades(&out, &out.scores.homes, 8);
    let one_thread = match rayon::ThreadPoolBuilder::new().num_threads(1).build() {
        Ok(pool) => pool,
        Err(e) => panic!("no thread pool: {e}"),
    };
    let afresh = one_thread.install(|| plan_upgrades_afresh(&out, &out.scores.homes, 8));
    assert!(kept.steps.len() >= 2, "{} steps", kept.steps.len());
    assert_eq!(kept, afresh);
}
