//! The repower shortlist: every candidate engine sheet × offered gear ratio for one boat, each
//! with its screw sized to the aperture and pitched to the default target, ranked for the
//! owner's choice. A candidate's figures are those `report`/`pitch` give when the boat file is
//! set to that engine, gear and screw: the boat document is set to the engine and gear and
//! built through the profile's to-vessel once per candidate; each diameter tried is then that
//! vessel with its screw swapped, after the document set to the screw passes its checks — the
//! vessel its own build would give, bit for bit (checked by the integration test
//! `each_candidates_figures_are_its_own_boat_files`), and built from its own document where a
//! measured table or a frozen wake ties the boat to its screw. All values are SI.

use super::baseline::{Baseline, Headline};
use super::checks::{cavitation, shaft_check};
use super::power_speed::PowerForSpeed;
use super::progress::Progress;
use super::solve::{SolveOptions, solve_variant};
use super::ties::{TieFigure, TieRule, tie_groups};
use super::{Study, active_variant};
use crate::profile::{BoatDoc, EngineDoc, Quantity, Store};
use crate::propulsion::screw::cavitation::CavitationReport;
use crate::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel};
use crate::propulsion::solver::cruise::cruise_at_speed;
use crate::propulsion::solver::pitch::{PitchOptions, SearchStop, bseries_geometry, target_pitch};
use crate::propulsion::solver::shaft::ShaftCheck;
use crate::propulsion::solver::sweep::SweepParameter;
use crate::units::KNOT_MPS;
use rayon::prelude::*;

/// What the shortlist ranks by.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ShortlistRank {
    /// Least fuel per distance at the target speed, or over the trip profile's mix.
    #[default]
    Fuel,
    /// Longest range with the reserve at the target speed.
    Range,
    /// Highest top speed.
    Top,
    /// Largest free-running rpm margin.
    Margin,
}

impl ShortlistRank {
    /// Every ranking, in the order the options list them.
    pub const ALL: [ShortlistRank; 4] = [Self::Fuel, Self::Range, Self::Top, Self::Margin];

    /// The figure it orders by, for the tie rule.
    pub fn figure(self) -> TieFigure {
        match self {
            Self::Fuel => TieFigure::FuelPerDistance,
            Self::Range => TieFigure::Range,
            Self::Top => TieFigure::TopSpeed,
            Self::Margin => TieFigure::RpmMargin,
        }
    }

    /// The name on the command line and in JSON ("fuel", "range", "top", "margin").
    pub fn name(self) -> &'static str {
        match self {
            Self::Fuel => "fuel",
            Self::Range => "range",
            Self::Top => "top",
            Self::Margin => "margin",
        }
    }

    /// The ranking named `name`, if any.
    pub fn by_name(name: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|r| r.name() == name)
    }
}

/// One engine sheet offered to the shortlist: its store name and document.
#[derive(Debug, Clone, PartialEq)]
pub struct Offer {
    /// The sheet's profile name in the store (its file's stem).
    pub name: String,
    /// The sheet.
    pub doc: EngineDoc,
}

/// What the shortlist is asked: which engines, which gears, how to rank.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ShortlistOptions {
    /// Gear ratios to try with every engine; `None`: each sheet's `gears`, else the boat's own.
    pub gears: Option<Vec<f64>>,
    /// The ranking.
    pub rank: ShortlistRank,
}

/// One candidate: an engine, a gear and the screw sized for them, with its figures.
#[derive(Debug, Clone, PartialEq)]
pub struct Candidate {
    /// The engine sheet's store name.
    pub engine: String,
    /// The engine's display name.
    pub engine_name: String,
    /// The engine's rated speed, rpm.
    pub rated_rpm: f64,
    /// One engine's rated power (full load at rated rpm), W; `None` when its sheet cannot be read.
    pub rated_power: Option<f64>,
    /// Reduction ratio, engine rpm / shaft rpm.
    pub gear_ratio: f64,
    /// Blade count.
    pub blades: u32,
    /// Screw diameter, m.
    pub diameter: f64,
    /// Recommended pitch, m (`None`: no pitch meets the target).
    pub pitch: Option<f64>,
    /// Expanded area ratio AE/A0 (raised to Keller's minimum at top speed when needed).
    pub area_ratio: f64,
    /// Whether the area ratio was raised from the boat's to Keller's minimum.
    pub area_raised: bool,
    /// Top speed, m/s.
    pub top_speed: Option<f64>,
    /// Whether the top speed is inside the resistance method's range.
    pub top_speed_in_method_range: Option<bool>,
    /// Free-running rpm margin at the meeting point, rpm.
    pub rpm_margin: Option<f64>,
    /// Engine rpm at the target speed.
    pub cruise_rpm: Option<f64>,
    /// Load at the target speed, fraction of full-load power at that rpm.
    pub cruise_load: Option<f64>,
    /// Fuel volume flow at the target speed, m³/s.
    pub fuel_rate: Option<f64>,
    /// Fuel per distance at the target speed, m³/m.
    pub fuel_per_distance: Option<f64>,
    /// Fuel per distance over the trip profile (total fuel / total distance), m³/m.
    pub trip_fuel_per_distance: Option<f64>,
    /// Range with the reserve at the target speed, m.
    pub range: Option<f64>,
    /// The duty rating's note at the cruise point.
    pub duty: Option<String>,
    /// The shaft check with this engine's torque and gear, or why not made.
    pub shaft: Result<ShaftCheck, String>,
    /// Cavitation and blade loading at top speed, or why not checked.
    pub top_cavitation: Result<CavitationReport, String>,
    /// Why the candidate falls short (cannot reach the target speed, no pitch, …).
    pub problems: Vec<String>,
    /// 1-based position of the leader of its group when the two are not told apart (within
    /// the ranked figure's uncertainty; `study::ties`).
    pub tie_with: Option<usize>,
    /// The boat document set to this engine, gear and screw (its active variant).
    pub boat: BoatDoc,
}

impl Candidate {
    /// The figure ranked by `rank` (SI; fuel over the trip profile when `trip`), `None` when
    /// not solved.
    pub fn ranked_value(&self, rank: ShortlistRank, trip: bool) -> Option<f64> {
        match rank {
            ShortlistRank::Fuel if trip => self.trip_fuel_per_distance,
            ShortlistRank::Fuel => self.fuel_per_distance,
            ShortlistRank::Range => self.range,
            ShortlistRank::Top => self.top_speed,
            ShortlistRank::Margin => self.rpm_margin,
        }
    }

    /// The candidate's headline figures, to hold against the as-found baseline.
    pub fn headline(&self) -> Headline {
        Headline {
            top_speed: self.top_speed,
            rpm_margin: self.rpm_margin,
            cruise_rpm: self.cruise_rpm,
            cruise_load: self.cruise_load,
            fuel_rate: self.fuel_rate,
            fuel_per_distance: self.fuel_per_distance,
            range: self.range,
        }
    }

    /// Whether the candidate reaches the target speed within its engine's envelope.
    pub fn reaches_target(&self) -> bool {
        self.cruise_rpm.is_some()
    }
}

/// The shortlist of one boat.
#[derive(Debug, Clone, PartialEq)]
pub struct Shortlist {
    /// The boat's name.
    pub boat: String,
    /// The boat's profile name.
    pub profile_name: String,
    /// The ranking used.
    pub rank: ShortlistRank,
    /// The candidates, best first.
    pub candidates: Vec<Candidate>,
    /// The uncertainty band's power spread at the target speed over the nominal power (boat
    /// as given), the root of the tie rule.
    pub resolution: Option<f64>,
    /// The tie rule of the ranking: the ranked figure and its band (`None` without a band).
    pub tie_rule: Option<TieRule>,
    /// The trip profile the fuel ranking used: (speed m/s, fraction of engine hours).
    pub trip_profile: Vec<(f64, f64)>,
    /// Target speed, m/s.
    pub target_speed: f64,
    /// What more power buys: the candidates' installed power at their top speeds beside the
    /// hull's effective-power curve (`None`: no candidate reaches a top speed).
    pub power_for_speed: Option<PowerForSpeed>,
    /// The boat as it is today, every candidate's change is counted from (`None` without
    /// `[as_found]`).
    pub baseline: Option<Baseline>,
}

/// Why there is no shortlist at all.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ShortlistError {
    /// The store holds no engine sheet.
    #[error(
        "the profile store {0} holds no engine sheets to shortlist; add one with `tidewright new engine NAME`"
    )]
    NoEngines(String),
    /// A gear ratio asked for that no gearbox has.
    #[error("gear ratio {0}: expected a reduction ratio above 1 and at most 6")]
    BadGear(f64),
    /// The front end asked the shortlist to stop before it was done.
    #[error("the shortlist was cancelled")]
    Cancelled,
}

/// One engine's rated power from its sheet, W (`None` when the sheet cannot be read).
fn rated_power(offer: &Offer) -> Option<f64> {
    let power = offer.doc.to_engine_sheet().ok()?.rated_power();
    (power.is_finite() && power > 0.0).then_some(power)
}

impl Shortlist {
    /// The 1-based position of the candidate with this engine sheet and gear, if listed.
    pub fn position_of(&self, engine: &str, gear_ratio: f64) -> Option<usize> {
        self.candidates
            .iter()
            .position(|c| c.engine == engine && (c.gear_ratio - gear_ratio).abs() < 1e-9)
            .map(|i| i + 1)
    }
}

/// The engine sheets named (or all in `store` when `names` is `None`), each with its name.
pub fn offers_from_store(store: &Store, names: Option<&[String]>) -> anyhow::Result<Vec<Offer>> {
    let names = match names {
        Some(n) => n.to_vec(),
        None => store.list_engines()?,
    };
    if names.is_empty() {
        let place = store.root().map_or("the demo fleet".to_string(), |p| {
            format!("the profile store {}", p.display())
        });
        return Err(ShortlistError::NoEngines(place).into());
    }
    names
        .iter()
        .map(|name| {
            let loaded = store.load_engine(name)?;
            Ok(Offer {
                name: loaded.name,
                doc: loaded.doc,
            })
        })
        .collect()
}

impl Study {
    /// The shortlist of this boat over `offers`, ranked as `options` asks.
    pub fn shortlist(
        &self,
        offers: &[Offer],
        options: &ShortlistOptions,
    ) -> Result<Shortlist, ShortlistError> {
        self.shortlist_counted(offers, options, &Progress::new())
    }

    /// [`Study::shortlist`], counting each candidate solved in `progress` and stopping with
    /// [`ShortlistError::Cancelled`] once it is cancelled.
    pub fn shortlist_counted(
        &self,
        offers: &[Offer],
        options: &ShortlistOptions,
        progress: &Progress,
    ) -> Result<Shortlist, ShortlistError> {
        if offers.is_empty() {
            return Err(ShortlistError::NoEngines(
                "the list of engines given".into(),
            ));
        }
        if let Some(bad) = options
            .gears
            .iter()
            .flatten()
            .find(|g| !(**g > 1.0 && **g <= 6.0))
        {
            return Err(ShortlistError::BadGear(*bad));
        }
        let mut asked = Vec::new();
        for offer in offers {
            let gears = match &options.gears {
                Some(g) => g.clone(),
                None if !offer.doc.gears.is_empty() => offer.doc.gears.clone(),
                None => vec![self.doc.installation.gear_ratio],
            };
            asked.extend(gears.into_iter().map(|gear| (offer, gear)));
        }
        // Each candidate is its own study: solved on every core, collected in the order asked.
        progress.start(asked.len());
        let solved: Option<Vec<Candidate>> = asked
            .par_iter()
            .map(|&(offer, gear)| {
                if progress.is_cancelled() {
                    return None;
                }
                let candidate = self.candidate(offer, gear);
                progress.step();
                Some(candidate)
            })
            .collect();
        let candidates = solved.ok_or(ShortlistError::Cancelled)?;
        let mut list = Shortlist {
            boat: self.name().to_string(),
            profile_name: self.profile_name.clone(),
            rank: options.rank,
            candidates,
            resolution: self.power_spread(),
            tie_rule: None,
            trip_profile: self.trip_profile(),
            target_speed: self.vessel.trip.target_speed,
            power_for_speed: None,
            baseline: self.baseline_figures(),
        };
        list.power_for_speed = self.power_for_speed(&list);
        list.rank_by(options.rank);
        Ok(list)
    }

    /// The boat's trip profile in SI: (speed m/s, fraction of engine hours).
    pub fn trip_profile(&self) -> Vec<(f64, f64)> {
        self.doc
            .trip
            .profile
            .iter()
            .map(|(speed, share)| (speed.value, *share))
            .collect()
    }

    /// The boat document set to `offer`'s engine, `gear` and the active screw resized to the
    /// aperture (diameter) with `area_ratio` and `pitch`.
    pub fn candidate_doc(
        &self,
        offer: &Offer,
        gear: f64,
        diameter: f64,
        area_ratio: f64,
        pitch: Option<f64>,
    ) -> BoatDoc {
        let mut doc = self.doc.clone();
        doc.engine = offer.name.clone();
        doc.installation.gear_ratio = gear;
        let index = active_variant(&self.vessel).min(doc.variants.len().saturating_sub(1));
        if let Some(variant) = doc.variants.get_mut(index) {
            if (variant.diameter.value - diameter).abs() > 1e-9 {
                variant.diameter = Quantity::new(diameter);
                // A measured open-water table belongs to the old screw, not a new one.
                variant.open_water = None;
            }
            if (variant.area_ratio - area_ratio).abs() > 1e-12 {
                variant.area_ratio = area_ratio;
                variant.open_water = None;
            }
            if let Some(p) = pitch {
                variant.pitch = Quantity::new(p);
            }
        }
        doc
    }

    /// The diameters to try, largest first: from the largest the aperture takes with its tip
    /// clearance down the diameter sweep's range, else the boat's own.
    fn sized_diameters(&self, problems: &mut Vec<String>) -> Vec<f64> {
        let index = active_variant(&self.vessel);
        let current = self.vessel.variants[index].screw.geometry().diameter;
        let Some(largest) = self.inputs.max_screw_diameter else {
            problems.push(
                "no installation.max_screw_diameter: the boat's screw diameter is kept".into(),
            );
            return vec![current];
        };
        let clearance = self.inputs.tip_clearance.unwrap_or(0.0);
        match SweepParameter::diameters_up_to(current, largest, clearance) {
            Ok(SweepParameter::Diameter {
                min_diameter,
                aperture,
                count,
            }) => {
                let top = aperture.max_diameter();
                let steps = count.max(2) - 1;
                (0..=steps)
                    .map(|i| top - (top - min_diameter) * i as f64 / steps as f64)
                    .collect()
            }
            Ok(_) => vec![current],
            Err(e) => {
                problems.push(format!(
                    "installation.max_screw_diameter and tip_clearance: {e}; the boat's screw diameter is kept"
                ));
                vec![current]
            }
        }
    }

    fn candidate(&self, offer: &Offer, gear: f64) -> Candidate {
        let index = active_variant(&self.vessel);
        let mut problems = Vec::new();
        let diameters = self.sized_diameters(&mut problems);
        let geometry = *self.vessel.variants[index].screw.geometry();
        let mut reason = String::new();
        // Every diameter the aperture takes is pitched; the screw kept is the one the table
        // would rank first by fuel (as the diameter sweep ranks them), among those that pass
        // the cavitation checks when any does: a choice of the figures, never of the order
        // tried, so a re-run with another ranking keeps the same screw.
        // For a given power and rpm fuel has one minimum over diameter (the single optimum
        // diameter of the Bp–δ charts), so the descent from the largest stops once fuel rises
        // again past a screw that passes its checks.
        let mut best: Option<Candidate> = None;
        let mut last_fuel: Option<f64> = None;
        let mut search_on = self.search_study(offer, gear);
        for &diameter in &diameters {
            match self.sized_candidate(offer, gear, diameter, search_on.as_mut(), problems.clone())
            {
                Ok(candidate) => {
                    let fuel = candidate.fuel_per_distance;
                    let rising =
                        matches!((last_fuel, fuel), (Some(before), Some(now)) if now > before);
                    if best
                        .as_ref()
                        .is_none_or(|b| screw_order(&candidate, b).is_lt())
                    {
                        best = Some(candidate);
                    }
                    let settled = best.as_ref().is_some_and(|b| !fails_checks(b));
                    if rising && settled {
                        break;
                    }
                    last_fuel = fuel;
                }
                Err(why) => reason = why,
            }
        }
        if let Some(candidate) = best {
            return candidate;
        }
        let diameter = diameters.first().copied().unwrap_or(geometry.diameter);
        if diameters.len() > 1 {
            problems.push(format!(
                "no pitch meets the pitch target with any diameter from {:.0} to {:.0} mm: {reason}",
                diameters.last().copied().unwrap_or(diameter) * 1e3,
                diameter * 1e3
            ));
        } else {
            problems.push(reason);
        }
        // Whether the engine reaches the target speed at all, with the boat's pitch on the
        // largest screw: the usual reason no pitch meets the target.
        if let Ok(study) = self.rebuilt(offer, gear, diameter, geometry.area_ratio, None) {
            let vessel = &study.vessel;
            let target_kn = vessel.trip.target_speed / KNOT_MPS;
            let system = vessel.system(index);
            match cruise_at_speed(&system, &vessel.trip, vessel.trip.target_speed) {
                Ok(c) if c.beyond_full_load => problems.push(format!(
                    "cannot reach the target speed {target_kn:.1} kn: it needs {:.0} % of the engine's full-load power at {:.0} rpm",
                    c.point.load_fraction * 100.0,
                    c.point.engine_rpm
                )),
                Ok(_) => {}
                Err(e) => problems.push(format!(
                    "cannot reach the target speed {target_kn:.1} kn: {e}"
                )),
            }
        }
        Candidate {
            engine: offer.name.clone(),
            engine_name: offer.doc.name.clone(),
            rated_rpm: offer.doc.rated_rpm.value,
            rated_power: rated_power(offer),
            gear_ratio: gear,
            blades: geometry.blades,
            diameter,
            pitch: None,
            area_ratio: geometry.area_ratio,
            area_raised: false,
            top_speed: None,
            top_speed_in_method_range: None,
            rpm_margin: None,
            cruise_rpm: None,
            cruise_load: None,
            fuel_rate: None,
            fuel_per_distance: None,
            trip_fuel_per_distance: None,
            range: None,
            duty: None,
            shaft: Err("no screw sized".into()),
            top_cavitation: Err("no screw sized".into()),
            problems,
            tie_with: None,
            boat: self.candidate_doc(offer, gear, diameter, geometry.area_ratio, None),
        }
    }

    /// The study every diameter of a candidate is searched and solved on: the boat set to
    /// `offer`'s engine and `gear`, built once, its active screw swapped for each diameter —
    /// the vessel its boat file set to that screw would build. `None` where the screw is more than
    /// its geometry to the boat — a measured open-water table, or a fitted wake frozen with
    /// the screw it was fitted with — and each diameter is built from its own file.
    fn search_study(&self, offer: &Offer, gear: f64) -> Option<Study> {
        let own = &self.vessel.variants[active_variant(&self.vessel)].screw;
        let frozen_wake = self
            .doc
            .calibration
            .as_ref()
            .is_some_and(|c| c.wake_fraction.is_some());
        if matches!(own, ScrewModel::Table(_)) || frozen_wake {
            return None;
        }
        let geometry = own.geometry();
        self.rebuilt(offer, gear, geometry.diameter, geometry.area_ratio, None)
            .ok()
    }

    /// The candidate with a screw of `diameter`, or why no pitch meets the target with it;
    /// searched and solved on `search_on` ([`Study::search_study`]) when given.
    fn sized_candidate(
        &self,
        offer: &Offer,
        gear: f64,
        diameter: f64,
        mut search_on: Option<&mut Study>,
        problems: Vec<String>,
    ) -> Result<Candidate, String> {
        let index = active_variant(&self.vessel);
        let own = *self.vessel.variants[index].screw.geometry();
        let mut area_ratio = own.area_ratio;
        let mut area_raised = false;
        let cannot_build = |e: &dyn std::fmt::Display| {
            format!("the boat with engine {} cannot be built: {e}", offer.name)
        };
        // Two passes at most: pitch with the boat's area, then with Keller's minimum at the
        // top speed that pitch gives, if the boat's area falls short of it.
        loop {
            // The search starts from the boat's own pitch, whatever the diameter.
            let geometry = ScrewGeometry {
                diameter,
                area_ratio,
                ..own
            };
            let built;
            let searched = match search_on.as_deref() {
                Some(study) => study,
                None => {
                    built = self.rebuilt(offer, gear, diameter, area_ratio, None)?;
                    // A measured table kept for the boat's own diameter and area is refused.
                    bseries_geometry(&built.vessel, index)
                        .map_err(|e| format!("no pitch recommendation: {e}"))?;
                    &built
                }
            };
            // The pitch alone: the recommendation's figures around it (rpm per inch, the
            // cure) are for the boat's own screw, and the candidate's figures follow below.
            let found = target_pitch(&searched.vessel, geometry, &PitchOptions::default())
                .map_err(|e| format!("no pitch recommendation: {e}"))?;
            let pitch = found.pitch.ok_or_else(|| match &found.stop {
                SearchStop::BracketLost(why) => why.clone(),
                other => format!("the pitch search stopped: {other:?}"),
            })?;
            let candidate = match search_on.as_deref_mut() {
                Some(study) => {
                    // The boat file set to this screw must pass the checks its build would
                    // make; the vessel it would build is this one with the screw swapped.
                    let boat = self.candidate_doc(offer, gear, diameter, area_ratio, Some(pitch));
                    boat.check().map_err(|e| cannot_build(&e))?;
                    let screw = BSeriesScrew::new(ScrewGeometry { pitch, ..geometry })
                        .map_err(|e| cannot_build(&e))?;
                    study.vessel.variants[index].screw = ScrewModel::BSeries(screw);
                    study.figures(offer, gear, pitch, area_raised, problems.clone(), boat)
                }
                None => {
                    let study = self.rebuilt(offer, gear, diameter, area_ratio, Some(pitch))?;
                    let boat = study.doc.clone();
                    study.figures(offer, gear, pitch, area_raised, problems.clone(), boat)
                }
            };
            let keller = candidate
                .top_cavitation
                .as_ref()
                .ok()
                .map(|c| c.keller_area_ratio.limit);
            match keller {
                Some(min) if min.is_finite() && min > area_ratio + 1e-6 && !area_raised => {
                    // Two decimals, rounded up, as area ratios are offered.
                    area_ratio = (min * 100.0).ceil() / 100.0;
                    area_raised = true;
                }
                _ => {
                    return Ok(candidate);
                }
            }
        }
    }

    /// The study of the boat set to the candidate, or why it cannot be built.
    fn rebuilt(
        &self,
        offer: &Offer,
        gear: f64,
        diameter: f64,
        area_ratio: f64,
        pitch: Option<f64>,
    ) -> Result<Study, String> {
        let doc = self.candidate_doc(offer, gear, diameter, area_ratio, pitch);
        Study::planned_side(
            doc,
            offer.doc.clone(),
            self.as_found_engine.clone(),
            self.units,
            self.profile_name.clone(),
        )
        .map_err(|e| format!("the boat with engine {} cannot be built: {e}", offer.name))
    }

    /// The candidate figures of this (rebuilt) study's active variant, with `boat` the boat
    /// file they are the figures of.
    fn figures(
        &self,
        offer: &Offer,
        gear: f64,
        pitch: f64,
        area_raised: bool,
        mut problems: Vec<String>,
        boat: BoatDoc,
    ) -> Candidate {
        let vessel = &self.vessel;
        let index = active_variant(vessel);
        let geometry = *vessel.variants[index].screw.geometry();
        let options = SolveOptions {
            without_method_spread: true,
            ..SolveOptions::default()
        };
        let solution = solve_variant(vessel, index, &options);
        let target_kn = vessel.trip.target_speed / KNOT_MPS;
        let (top_speed, in_range, margin, top_cavitation) = match &solution.matched {
            Ok(m) => (
                Some(m.top_speed),
                Some(m.top_speed_in_method_range),
                Some(m.rpm_margin),
                match self.inputs.shaft_immersion {
                    Some(depth) => cavitation(vessel, geometry, &m.top_point, depth),
                    None => Err(
                        "the boat file gives no installation.shaft_immersion (depth of the shaft centreline)"
                            .to_string(),
                    ),
                },
            ),
            Err(e) => {
                problems.push(format!("no engine match: {e}"));
                (None, None, None, Err(e.clone()))
            }
        };
        let cruise = match &solution.cruise {
            Ok(c) if c.beyond_full_load => {
                problems.push(format!(
                    "cannot reach the target speed {target_kn:.1} kn: past the engine's full-load curve"
                ));
                None
            }
            Ok(c) => Some(c),
            Err(e) => {
                problems.push(format!(
                    "cannot reach the target speed {target_kn:.1} kn: {e}"
                ));
                None
            }
        };
        let trip_fuel_per_distance = self.trip_fuel(&mut problems);
        let (shaft, _) = shaft_check(vessel, &self.inputs);
        Candidate {
            engine: offer.name.clone(),
            engine_name: offer.doc.name.clone(),
            rated_rpm: offer.doc.rated_rpm.value,
            rated_power: rated_power(offer),
            gear_ratio: gear,
            blades: geometry.blades,
            diameter: geometry.diameter,
            pitch: Some(pitch),
            area_ratio: geometry.area_ratio,
            area_raised,
            top_speed,
            top_speed_in_method_range: in_range,
            rpm_margin: margin,
            cruise_rpm: cruise.map(|c| c.point.engine_rpm),
            cruise_load: cruise.map(|c| c.point.load_fraction),
            fuel_rate: cruise.map(|c| c.point.fuel_volume_flow),
            fuel_per_distance: cruise.map(|c| c.fuel_per_distance),
            trip_fuel_per_distance,
            range: cruise.map(|c| c.range),
            duty: cruise.and(solution.duty.clone()),
            shaft,
            top_cavitation,
            problems,
            tie_with: None,
            boat,
        }
    }

    /// Fuel per distance over the trip profile, m³/m: the fuel burnt in the mix's engine hours
    /// over the distance run in them (`None` without a profile or when a speed fails).
    fn trip_fuel(&self, problems: &mut Vec<String>) -> Option<f64> {
        let profile = self.trip_profile();
        if profile.is_empty() {
            return None;
        }
        let vessel = &self.vessel;
        let system = vessel.system(active_variant(vessel));
        let (mut fuel, mut distance) = (0.0, 0.0);
        for (speed, share) in profile {
            match cruise_at_speed(&system, &vessel.trip, speed) {
                Ok(c) if !c.beyond_full_load => {
                    fuel += share * c.point.fuel_volume_flow;
                    distance += share * speed;
                }
                Ok(_) => {
                    problems.push(format!(
                        "trip profile: {:.1} kn is past the engine's full-load curve",
                        speed / KNOT_MPS
                    ));
                    return None;
                }
                Err(e) => {
                    problems.push(format!("trip profile: {:.1} kn: {e}", speed / KNOT_MPS));
                    return None;
                }
            }
        }
        (distance > 0.0).then(|| fuel / distance)
    }
}

/// Sorts `candidates` best first by `rank` (unsolved last, in their given order) and marks
/// ties by the one rule of `study::ties`: a candidate ties with its group's leader when its
/// ranked figure is within that figure's uncertainty — the band's `power_spread` in the
/// figure's own terms (`exponent`: the hull's R·V ∝ Vⁿ near top speed). With `trip` the fuel
/// ranking is over the trip profile. Returns the rule used (`None` without a band: then only
/// equal figures tie).
pub fn rank_candidates(
    candidates: &mut [Candidate],
    rank: ShortlistRank,
    trip: bool,
    power_spread: Option<f64>,
    exponent: Option<f64>,
) -> Option<TieRule> {
    let lower_is_better = rank == ShortlistRank::Fuel;
    candidates.sort_by(
        |a, b| match (a.ranked_value(rank, trip), b.ranked_value(rank, trip)) {
            (Some(x), Some(y)) => {
                if lower_is_better {
                    x.total_cmp(&y)
                } else {
                    y.total_cmp(&x)
                }
            }
            (Some(_), None) => std::cmp::Ordering::Less,
            (None, Some(_)) => std::cmp::Ordering::Greater,
            (None, None) => std::cmp::Ordering::Equal,
        },
    );
    let rule = power_spread.map(|s| TieRule::of(rank.figure(), s, exponent));
    let values: Vec<Option<f64>> = candidates
        .iter()
        .map(|c| c.ranked_value(rank, trip))
        .collect();
    let groups = tie_groups(&values, |i, lead| {
        rule.map_or(0.0, |r| r.tolerance(lead, candidates[i].rated_rpm))
    });
    for (c, group) in candidates.iter_mut().zip(groups) {
        c.tie_with = group;
    }
    rule
}

impl Shortlist {
    /// Ranks the list again by `rank` (no re-solving: only the order and ties change).
    pub fn rank_by(&mut self, rank: ShortlistRank) {
        let trip = !self.trip_profile.is_empty();
        let exponent = self
            .power_for_speed
            .as_ref()
            .and_then(|p| p.exponent_at_top);
        self.tie_rule =
            rank_candidates(&mut self.candidates, rank, trip, self.resolution, exponent);
        self.rank = rank;
    }
}

/// The order of two sized screws for one engine and gear, better first: passing the cavitation
/// checks, then least fuel per distance at the target speed, then higher top speed, then the
/// larger diameter (a total order, so the choice is stable).
fn screw_order(a: &Candidate, b: &Candidate) -> std::cmp::Ordering {
    let fails = fails_checks;
    let fuel = |c: &Candidate| c.fuel_per_distance.unwrap_or(f64::INFINITY);
    let top = |c: &Candidate| c.top_speed.unwrap_or(0.0);
    fails(a)
        .cmp(&fails(b))
        .then(fuel(a).total_cmp(&fuel(b)))
        .then(top(b).total_cmp(&top(a)))
        .then(b.diameter.total_cmp(&a.diameter))
}

/// Whether the candidate's screw fails a cavitation or blade-loading check at top speed.
fn fails_checks(c: &Candidate) -> bool {
    c.top_cavitation.as_ref().is_ok_and(|r| !r.all_passed())
}
