//! The repower shortlist: every candidate engine sheet × offered gear ratio for one boat, each
//! with its screw sized to the aperture and pitched to the default target, ranked for the
//! owner's choice. A candidate's figures are those `report`/`pitch` give when the boat file is
//! set to that engine, gear and screw: the boat document is changed and rebuilt through the
//! profile's to-vessel, never patched in the core's vessel. All values are SI.

use super::checks::{cavitation, shaft_check};
use super::progress::Progress;
use super::solve::{SolveOptions, solve_variant};
use super::what_if::WhatIfSettings;
use super::{Study, active_variant};
use crate::profile::{BoatDoc, EngineDoc, Quantity, Store};
use crate::propulsion::screw::cavitation::CavitationReport;
use crate::propulsion::solver::cruise::cruise_at_speed;
use crate::propulsion::solver::pitch::{PitchOptions, SearchStop, recommend_pitch};
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
    /// 1-based position of the candidate above it in the ranking when the two differ by less
    /// than the resolution (a near-tie).
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
    /// The relative resolution below which two candidates are not told apart: the uncertainty
    /// band's power spread at the target speed over the nominal power (boat as given).
    pub resolution: Option<f64>,
    /// The trip profile the fuel ranking used: (speed m/s, fraction of engine hours).
    pub trip_profile: Vec<(f64, f64)>,
    /// Target speed, m/s.
    pub target_speed: f64,
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
        let mut candidates = solved.ok_or(ShortlistError::Cancelled)?;
        let resolution = self.resolution();
        let trip = !self.doc.trip.profile.is_empty();
        rank_candidates(&mut candidates, options.rank, trip, resolution);
        Ok(Shortlist {
            boat: self.name().to_string(),
            profile_name: self.profile_name.clone(),
            rank: options.rank,
            candidates,
            resolution,
            trip_profile: self.trip_profile(),
            target_speed: self.vessel.trip.target_speed,
        })
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

    /// The band's relative power spread at the target speed, for the boat as given.
    fn resolution(&self) -> Option<f64> {
        let band = self
            .band(active_variant(&self.vessel), &WhatIfSettings::default())
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
        for &diameter in &diameters {
            match self.sized_candidate(offer, gear, diameter, problems.clone()) {
                Ok(candidate) => return candidate,
                Err(why) => reason = why,
            }
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

    /// The candidate with a screw of `diameter`, or why no pitch meets the target with it.
    fn sized_candidate(
        &self,
        offer: &Offer,
        gear: f64,
        diameter: f64,
        problems: Vec<String>,
    ) -> Result<Candidate, String> {
        let index = active_variant(&self.vessel);
        let boat_area = self.vessel.variants[index].screw.geometry().area_ratio;
        let mut area_ratio = boat_area;
        let mut area_raised = false;
        // Two passes at most: pitch with the boat's area, then with Keller's minimum at the
        // top speed that pitch gives, if the boat's area falls short of it.
        loop {
            let study = self.rebuilt(offer, gear, diameter, area_ratio, None)?;
            let rec = recommend_pitch(&study.vessel, index, &PitchOptions::default())
                .map_err(|e| format!("no pitch recommendation: {e}"))?;
            let pitch = rec.recommended_pitch.ok_or_else(|| match &rec.stop {
                SearchStop::BracketLost(why) => why.clone(),
                other => format!("the pitch search stopped: {other:?}"),
            })?;
            let study = self.rebuilt(offer, gear, diameter, area_ratio, Some(pitch))?;
            let candidate = study.figures(offer, gear, pitch, area_raised, problems.clone());
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
        Study::from_documents(
            doc,
            offer.doc.clone(),
            self.units,
            self.profile_name.clone(),
            None,
        )
        .map_err(|e| format!("the boat with engine {} cannot be built: {e}", offer.name))
    }

    /// The candidate figures of this (rebuilt) study's active variant.
    fn figures(
        &self,
        offer: &Offer,
        gear: f64,
        pitch: f64,
        area_raised: bool,
        mut problems: Vec<String>,
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
            boat: self.doc.clone(),
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
/// near-ties: a candidate whose figure differs from the one above by less than `resolution`
/// of it. For the rpm margin the resolution is taken on the rated rpm over three (the
/// propeller law P ∝ n³ turns a power spread into a third of it in rpm, common practice).
/// With `trip` the fuel ranking is over the trip profile.
pub fn rank_candidates(
    candidates: &mut [Candidate],
    rank: ShortlistRank,
    trip: bool,
    resolution: Option<f64>,
) {
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
    let resolution = resolution.unwrap_or(0.0);
    // Ranked again (the terminal UI re-sorts), the first has no one above it to tie with.
    if let Some(first) = candidates.first_mut() {
        first.tie_with = None;
    }
    for i in 1..candidates.len() {
        let (above, here) = (&candidates[i - 1], &candidates[i]);
        let tie = match (
            above.ranked_value(rank, trip),
            here.ranked_value(rank, trip),
        ) {
            (Some(x), Some(y)) => {
                let scale = match rank {
                    ShortlistRank::Margin => above.rated_rpm / 3.0,
                    _ => x.abs(),
                };
                (x - y).abs() <= resolution * scale
            }
            _ => false,
        };
        candidates[i].tie_with = tie.then_some(i);
    }
}
