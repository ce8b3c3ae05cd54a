//! Per-catchment balance: who lives in the walk zone, who has a safe route, the gap between
//! them, risk per trip, active minutes, and the quadrant of benefit against risk.

use super::home::HomeScore;
use super::ScoreConfig;
use serde::Serialize;

/// Where a catchment falls on the benefit-risk plane.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Quadrant {
    WalkableAndSafe,
    WalkableButUnsafe,
    FarButSafe,
    FarAndUnsafe,
    /// No child of the catchment has a route.
    NoChildrenRouted,
}

impl Quadrant {
    pub fn as_str(self) -> &'static str {
        match self {
            Quadrant::WalkableAndSafe => "walkable_and_safe",
            Quadrant::WalkableButUnsafe => "walkable_but_unsafe",
            Quadrant::FarButSafe => "far_but_safe",
            Quadrant::FarAndUnsafe => "far_and_unsafe",
            Quadrant::NoChildrenRouted => "no_children_routed",
        }
    }
}

/// Figures for one school's catchment. Shares are of the children routed (weighted by each
/// home's children).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CatchmentScore {
    pub school: usize,
    pub children: f64,
    pub children_routed: f64,
    pub children_in_walk_zone: f64,
    pub children_route_ok: f64,
    pub children_safe_route: f64,
    pub children_hazardous: f64,
    pub walk_zone_share: Option<f64>,
    /// Share whose recommended route no rule flags, whatever its length.
    pub route_ok_share: Option<f64>,
    pub safe_route_share: Option<f64>,
    /// Walk-zone share minus safe-route share: the infrastructure deficit.
    pub gap: Option<f64>,
    pub mean_risk_per_trip: Option<f64>,
    pub p90_risk_per_trip: Option<f64>,
    /// Mean daily active minutes of the children in the walk zone (those expected to walk).
    pub mean_active_minutes: Option<f64>,
    /// Mean daily risk (two trips) of the children in the walk zone.
    pub mean_daily_risk_walk_zone: Option<f64>,
    /// Active minutes per risk point for walk-zone children (None when risk is 0).
    pub minutes_per_risk_point: Option<f64>,
    pub quadrant: Quadrant,
    pub walkable_share_threshold: f64,
    pub safe_share_threshold: f64,
}

/// Weighted mean of `(value, weight)`.
pub fn weighted_mean(xs: &[(f64, f64)]) -> Option<f64> {
    let w: f64 = xs.iter().map(|x| x.1).sum();
    (w > 0.0).then(|| xs.iter().map(|x| x.0 * x.1).sum::<f64>() / w)
}

/// Weighted percentile: the smallest value whose cumulative weight reaches `q` of the total.
///
/// ```
/// use catchwalk::score::catchment::weighted_percentile;
/// assert_eq!(weighted_percentile(&[(1.0, 1.0), (5.0, 1.0), (3.0, 8.0)], 0.9), Some(3.0));
/// assert_eq!(weighted_percentile(&[(1.0, 1.0), (5.0, 1.0), (3.0, 8.0)], 0.95), Some(5.0));
/// ```
pub fn weighted_percentile(xs: &[(f64, f64)], q: f64) -> Option<f64> {
    let mut v: Vec<(f64, f64)> = xs.iter().copied().filter(|x| x.1 > 0.0).collect();
    let total: f64 = v.iter().map(|x| x.1).sum();
    if total <= 0.0 {
        return None;
    }
    v.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut cum = 0.0;
    for (x, w) in &v {
        cum += w;
        if cum + 1e-12 >= q * total {
            return Some(*x);
        }
    }
    v.last().map(|x| x.0)
}

/// Scores one catchment from its members `(home score, children)`.
pub fn score_catchment(
    school: usize,
    members: &[(&HomeScore, f64)],
    cfg: &ScoreConfig,
) -> CatchmentScore {
    let children: f64 = members.iter().map(|m| m.1).sum::<f64>() + 0.0;
    let routed: Vec<&(&HomeScore, f64)> = members.iter().filter(|m| m.0.routed).collect();
    let sum = |f: &dyn Fn(&HomeScore) -> bool| -> f64 {
        // `+ 0.0` turns the empty sum's -0.0 into 0.0 for output.
        routed.iter().filter(|m| f(m.0)).map(|m| m.1).sum::<f64>() + 0.0
    };
    let n = sum(&|_| true);
    let wz = sum(&|h| h.in_walk_zone);
    let ok = sum(&|h| h.route_ok);
    let safe = sum(&|h| h.safe_route);
    let haz = sum(&|h| h.hazardous);
    let share = |x: f64| (n > 0.0).then(|| x / n);
    let risk: Vec<(f64, f64)> = routed.iter().map(|m| (m.0.risk, m.1)).collect();
    let zone: Vec<&&(&HomeScore, f64)> = routed.iter().filter(|m| m.0.in_walk_zone).collect();
    let minutes = weighted_mean(
        &zone
            .iter()
            .map(|m| (m.0.active_minutes, m.1))
            .collect::<Vec<_>>(),
    );
    let daily_risk = weighted_mean(
        &zone
            .iter()
            .map(|m| (2.0 * m.0.risk, m.1))
            .collect::<Vec<_>>(),
    );
    let quadrant = match (share(wz), share(ok)) {
        (Some(w), Some(o)) => match (w >= cfg.walkable_share, o >= cfg.safe_share) {
            (true, true) => Quadrant::WalkableAndSafe,
            (true, false) => Quadrant::WalkableButUnsafe,
            (false, true) => Quadrant::FarButSafe,
            (false, false) => Quadrant::FarAndUnsafe,
        },
        _ => Quadrant::NoChildrenRouted,
    };
    CatchmentScore {
        school,
        children,
        children_routed: n,
        children_in_walk_zone: wz,
        children_route_ok: ok,
        children_safe_route: safe,
        children_hazardous: haz,
        walk_zone_share: share(wz),
        route_ok_share: share(ok),
        safe_route_share: share(safe),
        gap: share(wz).zip(share(safe)).map(|(a, b)| a - b),
        mean_risk_per_trip: weighted_mean(&risk),
        p90_risk_per_trip: weighted_percentile(&risk, 0.9),
        mean_active_minutes: minutes,
        mean_daily_risk_walk_zone: daily_risk,
        minutes_per_risk_point: minutes
            .zip(daily_risk)
            .and_then(|(m, r)| (r > 0.0).then(|| m / r)),
        quadrant,
        walkable_share_threshold: cfg.walkable_share,
        safe_share_threshold: cfg.safe_share,
    }
}
