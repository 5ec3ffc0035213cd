//! The order for the propeller shop, built once: the screw with its recommended pitch rounded
//! to the step the shop cuts, what the rounding does to the full-throttle rpm (the match solved
//! again at the rounded pitch and at the other neighbour), the hand of rotation, the shaft end
//! from `[installation]` and `[screw_shop]`, and the cavitation and shaft checks of the screw as
//! it will be cut. `report/order.rs` lays it out; `cli/order.rs` and the export print it.

use anyhow::Context as _;

use super::checks::{CheckPoint, cavitation, shaft_check};
use super::solve::{SolveOptions, solve_variant};
use super::{CAUTION, Study};
use crate::profile::Rotation;
use crate::propulsion::screw::cavitation::CavitationReport;
use crate::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel};
use crate::propulsion::solver::Vessel;
use crate::propulsion::solver::matching::{MatchResult, Verdict};
use crate::propulsion::solver::pitch::PitchOptions;
use crate::propulsion::solver::shaft::ShaftCheck;

/// The caution the order adds to the project's own: the shop cuts to what is on the shaft.
pub const SHOP_CAUTION: &str = "Confirm bore, taper and rotation on the shaft before cutting.";

/// A pitch rounded to the shop's step (all m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rounding {
    /// The pitch as recommended, m.
    pub exact: f64,
    /// The step the shop cuts pitch in, m.
    pub step: f64,
    /// The nearest multiple of the step, m (a half step rounds up).
    pub rounded: f64,
    /// The multiple on the other side of the exact pitch, m; `None` when the exact pitch is
    /// already a multiple of the step.
    pub other: Option<f64>,
}

/// `exact` (m) rounded to the nearest multiple of `step` (m, positive), with the other
/// neighbour.
pub fn round_pitch(exact: f64, step: f64) -> Rounding {
    let steps = exact / step;
    let rounded = steps.round() * step;
    // A pitch within a micrometre of a multiple is that multiple: nothing to choose.
    let on_step = (exact - rounded).abs() < 1e-6;
    let beyond = if rounded > exact {
        rounded - step
    } else {
        rounded + step
    };
    let other = (!on_step).then_some(beyond);
    Rounding {
        exact,
        step,
        rounded,
        other,
    }
}

/// The match of the screw at one pitch.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PitchMatch {
    /// The pitch, m.
    pub pitch: f64,
    /// Engine rpm at full throttle (where the screw meets the full-load curve, or the
    /// governor's top rpm), rpm.
    pub full_throttle_rpm: f64,
    /// The margin at full throttle, rpm (as `MatchResult::rpm_margin`: negative a shortfall).
    pub rpm_margin: f64,
    /// Whether the margin is only a lower bound.
    pub margin_is_lower_bound: bool,
    /// The verdict.
    pub verdict: Verdict,
    /// Boat speed at full throttle, m/s.
    pub top_speed: f64,
}

impl PitchMatch {
    fn of(m: &MatchResult, pitch: f64) -> Self {
        Self {
            pitch,
            full_throttle_rpm: m.meeting_rpm,
            rpm_margin: m.rpm_margin,
            margin_is_lower_bound: m.margin_is_lower_bound,
            verdict: m.verdict,
            top_speed: m.top_speed,
        }
    }
}

/// One cavitation check of the screw as it will be cut.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckAt {
    /// Which point.
    pub at: CheckPoint,
    /// Boat speed there, m/s.
    pub speed: f64,
    /// Engine speed there, rpm.
    pub engine_rpm: f64,
    /// The checks, or why they could not be made.
    pub outcome: Result<CavitationReport, String>,
}

/// The hand of the screws to order.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Hands {
    /// One screw of this hand (`None`: the boat file does not say).
    Single(Option<Rotation>),
    /// A twin: the variant's hand is the starboard screw's, the port screw turns the other way
    /// (`None`: the boat file does not say).
    Twin(Option<Rotation>),
}

/// The other hand.
pub fn opposite(hand: Rotation) -> Rotation {
    match hand {
        Rotation::Right => Rotation::Left,
        Rotation::Left => Rotation::Right,
    }
}

/// The order for the propeller shop of one screw variant.
#[derive(Debug, Clone, PartialEq)]
pub struct OrderSheet {
    /// The boat's name.
    pub boat: String,
    /// The variant's label.
    pub variant: String,
    /// Blade count.
    pub blades: u32,
    /// Diameter, m.
    pub diameter: f64,
    /// Expanded area ratio AE/A0.
    pub area_ratio: f64,
    /// The screw's pitch now, m.
    pub current_pitch: f64,
    /// The recommended pitch and its rounding to the shop's step.
    pub rounding: Rounding,
    /// Whether the step is the boat file's (`[screw_shop] pitch_step`), else the unit system's
    /// default.
    pub step_given: bool,
    /// The match at the exact recommended pitch.
    pub exact: Result<PitchMatch, String>,
    /// The match at the rounded pitch (what the shop cuts).
    pub rounded: Result<PitchMatch, String>,
    /// The match at the other neighbour, when there is one.
    pub other: Option<Result<PitchMatch, String>>,
    /// The engine's rated rpm, rpm.
    pub rated_rpm: f64,
    /// The hand of the screws.
    pub hands: Hands,
    /// Shaft diameter, m (`installation.shaft_diameter`).
    pub shaft_diameter: Option<f64>,
    /// Shaft taper as the shop writes it.
    pub taper: Option<String>,
    /// Hub bore at the large end of the taper, m.
    pub bore: Option<f64>,
    /// Keyway as the shop writes it.
    pub keyway: Option<String>,
    /// The geometry of the screw as it will be cut (rounded pitch).
    pub geometry: ScrewGeometry,
    /// Cavitation and blade loading of the screw as cut at the target speed and at top speed,
    /// or why they were not checked (no shaft immersion).
    pub cavitation: Result<Vec<CheckAt>, String>,
    /// Shafts fitted (1 or 2).
    pub shafts: u32,
    /// The shaft against the engine's torque, or why it could not be checked.
    pub shaft: Result<ShaftCheck, String>,
    /// A note on the shaft material, when it was assumed.
    pub shaft_note: Option<String>,
    /// The largest re-pitch of the screw, m (the boat's `[match]` limit or the default):
    /// a larger change from the current pitch needs a new screw.
    pub repitch_limit: f64,
    /// The pitch recommendation's warnings (re-pitch limit, range of the method), one line each.
    pub notes: Vec<String>,
    /// The project's caution, then the shop's ([`SHOP_CAUTION`]).
    pub cautions: Vec<String>,
}

impl OrderSheet {
    /// The change from the current pitch to the rounded one, m (positive: more pitch).
    pub fn change(&self) -> f64 {
        self.rounding.rounded - self.current_pitch
    }

    /// Whether the change is within the re-pitch limit (else a new screw is needed).
    pub fn within_repitch_limit(&self) -> bool {
        self.change().abs() <= self.repitch_limit + 1e-9
    }

    /// Whether the choice between the two neighbours changes the verdict: the rounded pitch's
    /// differs from the exact pitch's or from the other neighbour's.
    pub fn rounding_matters(&self) -> bool {
        let verdict = |m: &Result<PitchMatch, String>| m.as_ref().ok().map(|m| m.verdict);
        let rounded = verdict(&self.rounded);
        let other = self.other.as_ref().and_then(verdict);
        rounded != verdict(&self.exact) || (other.is_some() && other != rounded)
    }
}

impl Study {
    /// The order for the propeller shop of variant `index`: its recommended pitch (the same as
    /// `pitch` gives, default options) rounded to the boat's pitch step, and what follows.
    pub fn order(&self, index: usize) -> anyhow::Result<OrderSheet> {
        let rec = self
            .recommendations(&[index], &PitchOptions::default())?
            .pop()
            .context("no pitch recommendation")?;
        let label = self.label(index).to_owned();
        let exact = rec.recommended_pitch.filter(|p| p.is_finite()).with_context(|| {
            format!(
                "screw {label}: the pitch search found no pitch for the engine (see `tidewright pitch`), so there is no pitch to order"
            )
        })?;
        let (step, step_given) = self.doc.pitch_step();
        let rounding = round_pitch(exact, step);
        let at = |pitch: f64| -> Result<(Vessel, PitchMatch), String> {
            let vessel = with_pitch(&self.vessel, index, pitch)?;
            let m = solve_variant(&vessel, index, &SolveOptions::default())
                .matched
                .map(|m| PitchMatch::of(&m, pitch))?;
            Ok((vessel, m))
        };
        let exact_match = at(exact).map(|(_, m)| m);
        let other = rounding.other.map(|p| at(p).map(|(_, m)| m));
        let cut = with_pitch(&self.vessel, index, rounding.rounded)
            .map_err(anyhow::Error::msg)
            .with_context(|| format!("screw {label} at the rounded pitch"))?;
        let solved = solve_variant(&cut, index, &SolveOptions::default());
        let rounded = solved
            .matched
            .as_ref()
            .map(|m| PitchMatch::of(m, rounding.rounded))
            .map_err(Clone::clone);
        let geometry = solved.geometry;
        let cavitation = match self.inputs.shaft_immersion {
            None => Err(
                "skipped: the boat file gives no installation.shaft_immersion (depth of the shaft \
                 centreline below the waterline), which sets the static pressure at the screw"
                    .to_string(),
            ),
            Some(immersion) => {
                let mut points = Vec::new();
                if let Ok(c) = &solved.cruise {
                    points.push((CheckPoint::Target, c.point));
                }
                if let Ok(m) = &solved.matched {
                    points.push((CheckPoint::Top, m.top_point));
                }
                Ok(points
                    .into_iter()
                    .map(|(at, p)| CheckAt {
                        at,
                        speed: p.speed,
                        engine_rpm: p.engine_rpm,
                        outcome: cavitation(&cut, geometry, &p, immersion),
                    })
                    .collect())
            }
        };
        let (shaft, shaft_note) = shaft_check(&cut, &self.inputs);
        let variant = &self.doc.variants[index];
        let hand = variant.rotation;
        let shafts = self.vessel.installation.shafts;
        let shop = self.doc.screw_shop.clone().unwrap_or_default();
        Ok(OrderSheet {
            boat: self.vessel.name.clone(),
            variant: label,
            blades: geometry.blades,
            diameter: geometry.diameter,
            area_ratio: geometry.area_ratio,
            current_pitch: rec.current_pitch,
            rounding,
            step_given,
            exact: exact_match,
            rounded,
            other,
            rated_rpm: self.vessel.engine.rated_rpm,
            hands: if shafts >= 2 {
                Hands::Twin(hand)
            } else {
                Hands::Single(hand)
            },
            shaft_diameter: self.inputs.shaft_diameter,
            taper: shop.taper,
            bore: shop.bore.map(|b| b.value),
            keyway: shop.keyway,
            geometry,
            cavitation,
            shafts,
            shaft,
            shaft_note,
            repitch_limit: rec.repitch_limit,
            notes: rec.warnings.iter().map(ToString::to_string).collect(),
            cautions: vec![CAUTION.to_owned(), SHOP_CAUTION.to_owned()],
        })
    }
}

/// `vessel` with the B-series screw of variant `index` at `pitch` (m), built as the pitch
/// search builds it; a screw given by an open-water table cannot be re-pitched.
fn with_pitch(vessel: &Vessel, index: usize, pitch: f64) -> Result<Vessel, String> {
    let mut vessel = vessel.clone();
    let variant = vessel
        .variants
        .get_mut(index)
        .ok_or_else(|| format!("no screw variant {}", index + 1))?;
    let geometry = match &variant.screw {
        ScrewModel::BSeries(s) => *s.geometry(),
        ScrewModel::Table(_) => {
            return Err(format!(
                "screw {} is given by an open-water table, which a new pitch does not change",
                variant.label
            ));
        }
    };
    let screw =
        BSeriesScrew::new(ScrewGeometry { pitch, ..geometry }).map_err(|e| e.to_string())?;
    variant.screw = ScrewModel::BSeries(screw);
    Ok(vessel)
}

#[cfg(test)]
mod tests {
    use super::*;

    const INCH: f64 = 0.0254;

    #[test]
    fn a_pitch_rounds_to_the_nearest_step_with_the_other_neighbour() {
        // 17.3 in at a 0.5 in step: 34.6 half inches round to 35, so 17.5 in; 17.0 in below.
        let r = round_pitch(17.3 * INCH, 0.5 * INCH);
        assert!((r.rounded - 17.5 * INCH).abs() < 1e-12, "{r:?}");
        assert!((r.other.unwrap() - 17.0 * INCH).abs() < 1e-12, "{r:?}");
        // 412 mm at a 10 mm step: 41.2 steps round to 41, so 410 mm; 420 mm above.
        let r = round_pitch(0.412, 0.010);
        assert!((r.rounded - 0.410).abs() < 1e-12, "{r:?}");
        assert!((r.other.unwrap() - 0.420).abs() < 1e-12, "{r:?}");
        // A half step rounds up: 17.25 in → 17.5 in, 17.0 in the other.
        let r = round_pitch(17.25 * INCH, 0.5 * INCH);
        assert!((r.rounded - 17.5 * INCH).abs() < 1e-12, "{r:?}");
        assert!((r.other.unwrap() - 17.0 * INCH).abs() < 1e-12, "{r:?}");
        // Already on the step: nothing to choose.
        let r = round_pitch(0.290, 0.010);
        assert!(
            (r.rounded - 0.290).abs() < 1e-12 && r.other.is_none(),
            "{r:?}"
        );
    }
}
