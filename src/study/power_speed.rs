//! What more power buys: each shortlist candidate's installed power at its top speed, beside
//! the hull's effective-power curve R·V, so a candidate that adds 80 % power for half a knot
//! is seen at a glance. Defined once here for the shortlist's text, TUI view and export.

use super::Study;
use super::shortlist::Shortlist;

/// Points of the hull's effective-power curve on the chart (count).
const HULL_POINTS: usize = 60;
/// The hull curve runs this far past the fastest candidate's top speed (fraction).
const HULL_OVERRUN: f64 = 0.08;
/// The hull curve starts at this fraction of the slowest top speed: below it the curve says
/// nothing about the choice and would squeeze the candidates into a corner of the chart.
const HULL_START: f64 = 0.5;
/// Half-width of the speed interval the effective-power exponent is measured over (fraction).
const EXPONENT_SPAN: f64 = 0.01;

/// One speed of the hull's effective-power curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HullPower {
    /// Boat speed, m/s.
    pub speed: f64,
    /// Effective power R·V (calm water, air and margins), W.
    pub effective_power: f64,
    /// Whether the resistance there is the method's own, inside its range.
    pub in_method_range: bool,
}

/// One candidate on the chart: its installed power at the top speed it reaches.
#[derive(Debug, Clone, PartialEq)]
pub struct PowerPoint {
    /// The engine sheet's store name (with `gear_ratio`, which candidate this is).
    pub engine: String,
    /// Reduction ratio, engine rpm / shaft rpm.
    pub gear_ratio: f64,
    /// Rated power of all the boat's engines together (one per shaft), W.
    pub installed_power: f64,
    /// Top speed, m/s.
    pub top_speed: f64,
    /// Whether the top speed is inside the resistance method's range.
    pub in_method_range: bool,
    /// Installed power over the least powerful candidate's, less one (fraction).
    pub power_gain: f64,
    /// Top speed over the least powerful candidate's, m/s.
    pub speed_gain: f64,
    /// The hull's effective power at this top speed over the installed power: the share of the
    /// engines' rating that reaches the water as resistance × speed (dimensionless).
    pub effective_share: f64,
}

/// The chart's data: the hull curve and the candidates with a top speed.
#[derive(Debug, Clone, PartialEq)]
pub struct PowerForSpeed {
    /// The hull's effective power from half the slowest top speed to a little past the fastest.
    pub hull: Vec<HullPower>,
    /// The candidates with a top speed, by rising installed power (ties: by top speed).
    pub candidates: Vec<PowerPoint>,
    /// The effective-power exponent n (R·V ∝ Vⁿ) at the fastest top speed: there one per cent
    /// more speed takes about n per cent more power (dimensionless).
    pub exponent_at_top: Option<f64>,
    /// The fastest candidate's top speed, m/s.
    pub fastest: f64,
}

impl PowerForSpeed {
    /// The least powerful candidate, the one the gains are counted from.
    pub fn base(&self) -> Option<&PowerPoint> {
        self.candidates.first()
    }
}

impl Study {
    /// The hull's effective-power exponent n at `speed` m/s (R·V ∝ Vⁿ, from a ±1 % step):
    /// there one per cent more speed takes about n per cent more power.
    pub fn power_exponent_at(&self, speed: f64) -> Option<f64> {
        let model = &self.vessel.resistance;
        let effective = |v: f64| {
            model
                .resistance(v)
                .ok()
                .map(|parts| parts.total * v)
                .filter(|p| p.is_finite() && *p > 0.0)
        };
        if !(speed.is_finite() && speed > 0.0) {
            return None;
        }
        let (low, high) = (
            effective(speed * (1.0 - EXPONENT_SPAN))?,
            effective(speed * (1.0 + EXPONENT_SPAN))?,
        );
        let n = (high / low).ln() / ((1.0 + EXPONENT_SPAN) / (1.0 - EXPONENT_SPAN)).ln();
        n.is_finite().then_some(n)
    }

    /// What more power buys on this hull for the candidates of `list`, or `None` when no
    /// candidate reaches a top speed.
    pub fn power_for_speed(&self, list: &Shortlist) -> Option<PowerForSpeed> {
        let shafts = f64::from(self.vessel.installation.shafts.max(1));
        let model = &self.vessel.resistance;
        let effective = |speed: f64| {
            model
                .resistance(speed)
                .ok()
                .map(|parts| parts.total * speed)
                .filter(|p| p.is_finite() && *p > 0.0)
        };
        let mut points: Vec<PowerPoint> = list
            .candidates
            .iter()
            .filter_map(|c| {
                let top_speed = c.top_speed.filter(|v| v.is_finite() && *v > 0.0)?;
                let installed_power = c.rated_power.filter(|p| p.is_finite() && *p > 0.0)? * shafts;
                Some(PowerPoint {
                    engine: c.engine.clone(),
                    gear_ratio: c.gear_ratio,
                    installed_power,
                    top_speed,
                    in_method_range: c.top_speed_in_method_range.unwrap_or(false),
                    power_gain: 0.0,
                    speed_gain: 0.0,
                    effective_share: effective(top_speed).map_or(0.0, |p| p / installed_power),
                })
            })
            .collect();
        if points.is_empty() {
            return None;
        }
        points.sort_by(|a, b| {
            a.installed_power
                .total_cmp(&b.installed_power)
                .then(a.top_speed.total_cmp(&b.top_speed))
        });
        let (base_power, base_speed) = (points[0].installed_power, points[0].top_speed);
        for p in &mut points {
            p.power_gain = p.installed_power / base_power - 1.0;
            p.speed_gain = p.top_speed - base_speed;
        }
        let fastest = points.iter().map(|p| p.top_speed).fold(0.0, f64::max);
        let ceiling = model
            .hull
            .speed_at_froude(crate::propulsion::solver::matching::MAX_FROUDE_NUMBER);
        let end = (fastest * (1.0 + HULL_OVERRUN)).min(ceiling);
        let slowest = points
            .iter()
            .map(|p| p.top_speed)
            .fold(f64::INFINITY, f64::min);
        let start = HULL_START * slowest;
        let hull = (0..HULL_POINTS)
            .filter_map(|k| {
                let speed = start + (end - start) * k as f64 / (HULL_POINTS - 1) as f64;
                Some(HullPower {
                    speed,
                    effective_power: effective(speed)?,
                    in_method_range: model.validity_at(speed).in_method_range,
                })
            })
            .collect();
        let exponent_at_top = self.power_exponent_at(fastest);
        Some(PowerForSpeed {
            hull,
            candidates: points,
            exponent_at_top,
            fastest,
        })
    }
}
