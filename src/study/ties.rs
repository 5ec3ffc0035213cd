//! The one tie rule of every ranked table (shortlist and sweep): a candidate ties with the
//! leader of its group when its ranked figure lies within that figure's own uncertainty of the
//! leader's; never chained to the row above. The uncertainty comes from the boat's uncertainty
//! band (displacement and wake spread) turned into each figure's terms.

use super::Study;
use super::what_if::WhatIfSettings;

/// Which figure a ranking orders by, for its uncertainty.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TieFigure {
    /// Fuel per distance at the target speed (or over the trip profile).
    FuelPerDistance,
    /// Range with the reserve at the target speed.
    Range,
    /// Top speed.
    TopSpeed,
    /// Free-running rpm margin at full throttle.
    RpmMargin,
    /// Propulsive efficiency at the target speed.
    PropulsiveEfficiency,
}

impl TieFigure {
    /// The figure in words, for the rank line ("fuel per distance", …).
    pub fn words(self) -> &'static str {
        match self {
            Self::FuelPerDistance => "fuel per distance",
            Self::Range => "range",
            Self::TopSpeed => "top speed",
            Self::RpmMargin => "rpm margin",
            Self::PropulsiveEfficiency => "propulsive efficiency",
        }
    }
}

/// How far apart two figures may be and still not be told apart.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TieRule {
    /// The figure ranked.
    pub figure: TieFigure,
    /// The band as a fraction: of the leader's value, or of rated rpm for the margin.
    pub band: f64,
}

impl TieRule {
    /// The rule for `figure` from the band's relative power spread at the target speed and
    /// the hull's effective-power exponent n (R·V ∝ Vⁿ) near top speed.
    ///
    /// At a given speed fuel flow follows power, so fuel per distance and range (its inverse)
    /// carry the power spread itself, as does propulsive efficiency; a top speed moves by the
    /// power spread over n; an rpm margin by a third of it, the propeller law P ∝ N³ (common
    /// practice), taken on rated rpm.
    pub fn of(figure: TieFigure, power_spread: f64, exponent: Option<f64>) -> Self {
        let n = exponent
            .filter(|n| n.is_finite() && *n >= 1.0)
            .unwrap_or(3.0);
        let band = match figure {
            TieFigure::FuelPerDistance | TieFigure::Range | TieFigure::PropulsiveEfficiency => {
                power_spread
            }
            TieFigure::TopSpeed => power_spread / n,
            TieFigure::RpmMargin => power_spread / 3.0,
        };
        Self {
            figure,
            band: band.max(0.0),
        }
    }

    /// The tolerance around a leader's value `leader` (its own unit; rpm for the margin).
    pub fn tolerance(&self, leader: f64, rated_rpm: f64) -> f64 {
        match self.figure {
            TieFigure::RpmMargin => self.band * rated_rpm,
            _ => self.band * leader.abs(),
        }
    }

    /// "within 3.1 % of its group's leader, the uncertainty of top speed".
    pub fn words(&self) -> String {
        let of = match self.figure {
            TieFigure::RpmMargin => "of rated rpm",
            _ => "of the leader's value",
        };
        format!(
            "within {:.1} % {of}, the uncertainty of {} from the band's power spread",
            self.band * 100.0,
            self.figure.words()
        )
    }
}

/// For figures already sorted best first (`None`: not solved), each one's group leader as a
/// 1-based position when it ties with it: a new group starts at the first figure outside the
/// current leader's tolerance, so ties never chain. `tolerance(i, leader_value)` gives the
/// tolerance around leader `i`'s value.
pub fn tie_groups(
    values: &[Option<f64>],
    tolerance: impl Fn(usize, f64) -> f64,
) -> Vec<Option<usize>> {
    let mut out = vec![None; values.len()];
    let mut leader: Option<(usize, f64)> = None;
    for (i, value) in values.iter().enumerate() {
        let Some(v) = value.filter(|v| v.is_finite()) else {
            continue;
        };
        match leader {
            Some((at, lead)) if (v - lead).abs() <= tolerance(at, lead) => out[i] = Some(at + 1),
            _ => leader = Some((i, v)),
        }
    }
    out
}

impl Study {
    /// The band's relative power spread at the target speed for the boat as given (high − low
    /// over nominal), the root of every tie rule; `None` without a band.
    pub fn power_spread(&self) -> Option<f64> {
        let band = self
            .band(
                super::active_variant(&self.vessel),
                &WhatIfSettings::default(),
            )
            .ok()?;
        let target = self.vessel.trip.target_speed;
        let nearest = band
            .points
            .iter()
            .filter(|p| p.nominal_speed.is_some())
            .min_by(|a, b| {
                let da = (a.nominal_speed.unwrap_or(0.0) - target).abs();
                let db = (b.nominal_speed.unwrap_or(0.0) - target).abs();
                da.total_cmp(&db)
            })?;
        let (low, high, nominal) = (
            nearest.low_power?,
            nearest.high_power?,
            nearest.nominal_power?,
        );
        let spread = (high - low) / nominal;
        (spread.is_finite() && spread >= 0.0).then_some(spread)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn groups_start_at_the_first_figure_outside_the_leaders_band_and_never_chain() {
        // 10 % band: 1.00, 1.05, 1.09 tie with 1.00; 1.12 is 12 % away, a new leader, and
        // 1.20 ties with it (7 % of 1.12) though it is 20 % from the first.
        let values = [
            Some(1.0),
            Some(1.05),
            Some(1.09),
            Some(1.12),
            Some(1.20),
            None,
        ];
        let groups = tie_groups(&values, |_, lead| 0.1 * lead);
        assert_eq!(groups, vec![None, Some(1), Some(1), None, Some(4), None]);
        // A chain of small steps is not one group.
        let steps: Vec<Option<f64>> = (0..6).map(|k| Some(1.0 + 0.04 * k as f64)).collect();
        let groups = tie_groups(&steps, |_, lead| 0.05 * lead);
        assert_eq!(groups, vec![None, Some(1), None, Some(3), None, Some(5)]);
    }

    #[test]
    fn each_figure_takes_the_power_spread_in_its_own_terms() {
        let fuel = TieRule::of(TieFigure::FuelPerDistance, 0.09, Some(4.5));
        assert!((fuel.band - 0.09).abs() < 1e-12);
        let top = TieRule::of(TieFigure::TopSpeed, 0.09, Some(4.5));
        assert!((top.band - 0.02).abs() < 1e-12);
        let margin = TieRule::of(TieFigure::RpmMargin, 0.09, None);
        assert!((margin.tolerance(0.0, 3000.0) - 90.0).abs() < 1e-9);
    }
}
