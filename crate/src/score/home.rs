//! Per-home scores: risk, benefit, walk zone, safe route and hazard, with the reason.

use super::edge_rules::{fires, EdgeRuleLookup, EdgeRules, OnTheFly};
use super::rules::{RuleMatch, RuleSet, Target, Verdict};
use crate::benefit;
use crate::config::Config;
use crate::input::{Street, Students};
use crate::network::PedGraph;
use crate::pipeline::{AuditedRoute, HomeResult};
use crate::risk::crossing_delay::Los;
use crate::risk::street_of;
use crate::route::Route;
use serde::Serialize;

/// One rule that fired on a route.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Finding {
    pub rule: String,
    pub verdict: Verdict,
    pub on: Target,
    pub reason: String,
    pub source: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub site_check: Option<String>,
    /// The worst matching edge (highest risk; crossings: the crossing itself).
    pub edge: u32,
    pub street: String,
    /// Metres walked along matching sides (stretch rules; 0 for crossings).
    pub length_m: f64,
    /// Risk points of that edge.
    pub edge_risk: f64,
}

impl Finding {
    /// One line for a table: `rule: reason (street)`.
    pub fn line(&self) -> String {
        let mut s = format!("{}: {} ({})", self.rule, self.reason, self.street);
        if let Some(c) = &self.site_check {
            s.push_str("; check on site: ");
            s.push_str(c);
        }
        s
    }
}

/// Everything scored for one home.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct HomeScore {
    /// The home has both routes.
    pub routed: bool,
    /// Risk points of one trip on the recommended route.
    pub risk: f64,
    /// Active minutes a day walking the recommended route both ways.
    pub active_minutes: f64,
    /// Share of the WHO 60-minute guideline.
    pub guideline_share: f64,
    pub energy_kcal: f64,
    /// Shortest route's network length within the walk zone.
    pub in_walk_zone: bool,
    /// No rule fires on the recommended route.
    pub route_ok: bool,
    /// A route that no rule flags exists (the safe route) and lies inside the walk zone.
    pub safe_route: bool,
    /// Network length of that safe route, if one exists at any length.
    pub safe_network_m: Option<f64>,
    pub unsafe_reason: String,
    pub hazardous: bool,
    pub hazard_reason: String,
    /// Longest HCM average wait at an uncontrolled crossing of the route (s) and its LOS.
    pub longest_wait_s: f64,
    pub longest_wait_los: Option<Los>,
    pub findings: Vec<Finding>,
    /// What a site visit must settle on the recommended route: rules that would fire but
    /// for a fact the layers do not hold (a candidate, never counted hazardous), one line
    /// each, `rule (street): check ...`.
    pub site_checks: Vec<String>,
    /// The walk-zone distance applied to this home (the rule set's for its kind of pupil,
    /// else the `benefit` setting).
    pub walk_zone_m: f64,
}

/// The site checks a route needs: every rule that matches an edge of the route except for
/// facts the layers do not hold (unknown sidewalk, a width estimated from lanes, a condition
/// the rule says is never in the data). Stretch rules keep their minimum length. One line per
/// rule and street, in route order.
pub fn route_site_checks(
    rules: &RuleSet,
    route: &Route,
    graph: &PedGraph,
    streets: &[Street],
    students: Students,
    config: &Config,
) -> Vec<String> {
    let live = OnTheFly {
        rules,
        graph,
        streets,
        config,
    };
    route_site_checks_with(&live, rules, route, graph, streets, students)
}

/// [`route_site_checks`] reading each edge's rule matches from `lookup`.
pub fn route_site_checks_with(
    lookup: &dyn EdgeRuleLookup,
    rules: &RuleSet,
    route: &Route,
    graph: &PedGraph,
    streets: &[Street],
    students: Students,
) -> Vec<String> {
    // (rule index, street label) -> (metres, what to check)
    let mut found: Vec<(usize, String, f64, Vec<String>)> = Vec::new();
    for step in &route.steps {
        let Some(edge) = graph.edges.get(step.edge as usize) else {
            continue;
        };
        for (k, m) in lookup.hits(step.edge, students).iter() {
            let RuleMatch::Check(what) = m else {
                continue;
            };
            let k = *k as usize;
            let metres = match rules.rules.get(k) {
                Some(r) if r.on == Target::Stretch => step.share() * edge.length_m,
                _ => 0.0,
            };
            let street = street_of(graph, edge, streets)
                .map(street_label)
                .unwrap_or_default();
            match found.iter_mut().find(|x| x.0 == k && x.1 == street) {
                Some(x) => {
                    x.2 += metres;
                    for w in what {
                        if !x.3.contains(w) {
                            x.3.push(w.clone());
                        }
                    }
                }
                None => found.push((k, street, metres, what.clone())),
            }
        }
    }
    found
        .into_iter()
        .filter_map(|(k, street, metres, what)| {
            let rule = rules.rules.get(k)?;
            if rule.on == Target::Stretch && metres <= rule.min_length_m.unwrap_or(0.0) {
                return None;
            }
            let len = if rule.on == Target::Stretch {
                format!(", {metres:.0} m walked along it")
            } else {
                String::new()
            };
            Some(format!(
                "{} ({street}{len}): check {}",
                rule.id,
                what.join("; and ")
            ))
        })
        .collect()
}

/// A readable name for a street: its name, else `street <id>`.
pub fn street_label(s: &Street) -> String {
    match &s.name {
        Some(n) if !n.is_empty() => n.clone(),
        _ => format!("street {}", s.id),
    }
}

/// The rules that fire on a route, worst first (hazardous before unsafe, then by risk).
pub fn route_findings(
    rules: &RuleSet,
    route: &Route,
    graph: &PedGraph,
    streets: &[Street],
    students: Students,
    config: &Config,
) -> Vec<Finding> {
    let live = OnTheFly {
        rules,
        graph,
        streets,
        config,
    };
    route_findings_with(&live, rules, route, graph, streets, students)
}

/// [`route_findings`] reading each edge's rule matches and risk from `lookup`.
pub fn route_findings_with(
    lookup: &dyn EdgeRuleLookup,
    rules: &RuleSet,
    route: &Route,
    graph: &PedGraph,
    streets: &[Street],
    students: Students,
) -> Vec<Finding> {
    let mut out: Vec<Finding> = Vec::new();
    // Per stretch rule: metres matched and the worst edge so far.
    let mut stretch: Vec<(f64, Option<(u32, f64)>)> = vec![(0.0, None); rules.rules.len()];
    for step in &route.steps {
        let Some(edge) = graph.edges.get(step.edge as usize) else {
            continue;
        };
        let hits = lookup.hits(step.edge, students);
        if hits.is_empty() {
            continue;
        }
        let risk = lookup.risk_points(step.edge);
        for hit in hits.iter() {
            let k = hit.0 as usize;
            let Some(rule) = rules.rules.get(k) else {
                continue;
            };
            match fires(rules, hit) {
                Some(Target::Crossing)
                    if !out.iter().any(|x| x.rule == rule.id && x.edge == step.edge) =>
                {
                    out.push(finding(rule, step.edge, 0.0, risk, graph, streets));
                }
                Some(Target::Stretch) => {
                    let m = step.share() * edge.length_m;
                    if let Some(acc) = stretch.get_mut(k) {
                        acc.0 += m;
                        if acc.1.is_none_or(|(_, r)| risk > r) {
                            acc.1 = Some((step.edge, risk));
                        }
                    }
                }
                _ => {}
            }
        }
    }
    for (rule, (len, worst)) in rules.rules.iter().zip(stretch) {
        if let Some((edge, risk)) = worst {
            if len > rule.min_length_m.unwrap_or(0.0) {
                out.push(finding(rule, edge, len, risk, graph, streets));
            }
        }
    }
    out.sort_by(|a, b| {
        b.verdict
            .cmp(&a.verdict)
            .then(b.edge_risk.total_cmp(&a.edge_risk))
    });
    out
}

fn finding(
    rule: &super::rules::Rule,
    edge: u32,
    length_m: f64,
    risk: f64,
    graph: &PedGraph,
    streets: &[Street],
) -> Finding {
    let street = graph
        .edges
        .get(edge as usize)
        .and_then(|e| street_of(graph, e, streets))
        .map(street_label)
        .unwrap_or_default();
    Finding {
        rule: rule.id.clone(),
        verdict: rule.verdict,
        on: rule.on,
        reason: rule.reason.clone(),
        source: rule.source.clone(),
        site_check: rule.site_check.clone(),
        edge,
        street,
        length_m,
        edge_risk: risk,
    }
}

/// Longest HCM gap-acceptance wait (s) among the route's crossings that no signal, stop
/// sign or guard controls.
pub fn longest_wait_s(route: &Route, graph: &PedGraph, streets: &[Street], config: &Config) -> f64 {
    let live = OnTheFly {
        rules: &config.score.rules,
        graph,
        streets,
        config,
    };
    longest_wait_s_with(&live, route)
}

/// [`longest_wait_s`] reading each crossing's wait from `lookup`.
pub fn longest_wait_s_with(lookup: &dyn EdgeRuleLookup, route: &Route) -> f64 {
    route
        .steps
        .iter()
        .map(|s| lookup.wait_s(s.edge))
        .fold(0.0, f64::max)
}

/// Scores one home from its routes. `shortest_network_m` decides the walk zone.
pub fn score_home(
    shortest: Option<&AuditedRoute>,
    recommended: Option<&AuditedRoute>,
    safe: Option<&AuditedRoute>,
    students: Students,
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
) -> HomeScore {
    let live = OnTheFly {
        rules: &config.score.rules,
        graph,
        streets,
        config,
    };
    score_routes(
        &live,
        [shortest, recommended, safe],
        students,
        graph,
        streets,
        config,
    )
}

/// [`score_home`] on a home's `[shortest, recommended, safe]` routes, reading each edge's
/// rule matches, risk and wait from `lookup` (built for `config`'s rule set).
pub fn score_routes(
    lookup: &dyn EdgeRuleLookup,
    [shortest, recommended, safe]: [Option<&AuditedRoute>; 3],
    students: Students,
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
) -> HomeScore {
    let (Some(sh), Some(rec)) = (shortest, recommended) else {
        return HomeScore {
            unsafe_reason: "no route to the school on the walking network".into(),
            ..HomeScore::default()
        };
    };
    let b = &config.benefit;
    let active = benefit::active_minutes_per_day(rec.audit.walked_m, b);
    let walk_zone_m = config.score.rules.walk_zone_for(students, b.walk_zone_m);
    let in_zone = sh.audit.network_m <= walk_zone_m;
    let rules = &config.score.rules;
    let findings = route_findings_with(lookup, rules, &rec.route, graph, streets, students);
    let route_ok = findings.is_empty();
    let safe_network_m = safe.map(|r| r.audit.network_m);
    let safe_route = safe_network_m.is_some_and(|m| m <= walk_zone_m);
    let first = findings.first().map(Finding::line);
    let unsafe_reason = if !in_zone {
        format!(
            "outside the walk zone: {:.0} m > {:.0} m",
            sh.audit.network_m, walk_zone_m
        )
    } else if safe_route {
        String::new()
    } else if let Some(m) = safe_network_m {
        let mut why = format!(
            "the only routes that avoid every flagged crossing and stretch are {m:.0} m, beyond the {walk_zone_m:.0} m walk zone"
        );
        if let Some(f) = &first {
            why.push_str("; on the recommended route: ");
            why.push_str(f);
        }
        why
    } else {
        first.unwrap_or_else(|| {
            "no route to the school avoids every flagged crossing and stretch".into()
        })
    };
    // A child with a safe route has a walk that is not hazardous.
    let hazard = findings
        .iter()
        .find(|f| f.verdict == Verdict::Hazardous)
        .filter(|_| !safe_route);
    let wait = longest_wait_s_with(lookup, &rec.route);
    HomeScore {
        routed: true,
        risk: rec.risk,
        active_minutes: active,
        guideline_share: benefit::guideline_share(active, b),
        energy_kcal: benefit::energy_kcal_per_day(active, b),
        in_walk_zone: in_zone,
        route_ok,
        safe_route,
        safe_network_m,
        unsafe_reason,
        hazardous: hazard.is_some(),
        hazard_reason: hazard.map(Finding::line).unwrap_or_default(),
        longest_wait_s: wait,
        longest_wait_los: (wait > 0.0).then(|| Los::of_delay_s(wait)),
        findings,
        site_checks: route_site_checks_with(lookup, rules, &rec.route, graph, streets, students),
        walk_zone_m,
    }
}

/// Scores every home of an audit.
pub fn score_homes(
    homes: &[HomeResult],
    schools: &[crate::input::School],
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
) -> Vec<HomeScore> {
    // Only the recommended route is scored: its edges are looked up once each.
    let live = OnTheFly {
        rules: &config.score.rules,
        graph,
        streets,
        config,
    };
    let walked = homes
        .iter()
        .filter_map(|h| h.recommended.as_ref())
        .flat_map(|r| r.route.steps.iter().map(|s| s.edge));
    let table = EdgeRules::build(live, walked);
    let one = |h: &HomeResult| {
        let students = h
            .assignment
            .school
            .and_then(|s| schools.get(s))
            .map(|s| s.students)
            .unwrap_or_default();
        let routes = [&h.shortest, &h.recommended, &h.safe].map(Option::as_ref);
        score_routes(&table, routes, students, graph, streets, config)
    };
    // Each home's score reads only its own routes: natively on every core, collected in home
    // order, so the scores are the same on any number of threads.
    crate::cores::map(homes, one)
}
