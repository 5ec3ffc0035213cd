//! Reading a boat file: TOML text → raw form → typed document, then validation.

use super::MAX_VARIANTS;
use super::ScrewShopDoc;
use super::raw::{
    CONDITIONS, DIRECTIONS, INTERACTIONS, METHODS, ROTATIONS, RawBoat, RawCase, RawHull, RawLoad,
    RawTrial, RawVariant, SIDES, WATERS,
};
use super::{
    AsFoundDoc, BoatDoc, CalibrationDoc, HistoryDoc, HullDoc, InstallationDoc, InteractionDoc,
    LoadCase, LoadDoc, MatchDoc, ResistanceDoc, ResistanceMethodDoc, TrialDoc, TrialRunDoc,
    TripDoc, VariantDoc, WaterDoc, WindageDoc,
};
use crate::profile::error::{Issue, ProfileError};
use crate::profile::fields::{UNIT_SYSTEMS, check_schema};
use crate::profile::quantity::{Reader, guess_system};
use crate::profile::template::refuse_blanks;
use crate::units::Kind;
use toml::Spanned;

impl BoatDoc {
    /// Reads a boat from TOML `source`; `file` names it in error messages.
    pub fn from_toml(source: &str, file: &str) -> Result<Self, ProfileError> {
        // A blank from `tidewright new` is named as such, not as a malformed value.
        refuse_blanks(file, source)?;
        let raw: RawBoat =
            toml::from_str(source).map_err(|e| ProfileError::from_toml(file, source, &e))?;
        let mut r = Reader::new(file, source);
        check_schema(&r, &raw.schema)?;
        let units = match &raw.units {
            Some(u) => r.choice("units", u, &UNIT_SYSTEMS)?,
            None => guess_system(
                [
                    &raw.hull.length_waterline,
                    &raw.hull.beam_waterline,
                    &raw.trip.tank,
                ]
                .into_iter()
                .chain(raw.variant.iter().map(|v| &v.diameter))
                .map(|s| s.get_ref().as_str()),
            ),
        };
        let hull = read_hull(&mut r, &raw.hull)?;
        let load = read_load(&mut r, &raw.load)?;
        let resistance = match &raw.resistance {
            None => ResistanceDoc {
                method: ResistanceMethodDoc::Auto,
                service_margin: 0.0,
                fouling: 0.0,
            },
            Some(res) => {
                let chosen = match &res.method {
                    Some(m) => r.choice("resistance.method", m, &METHODS)?,
                    None => 0,
                };
                let method_span = res.method.as_ref().map_or(0..0, |m| m.span());
                let method = match (chosen, &res.table) {
                    (0, _) => ResistanceMethodDoc::Auto,
                    (1, _) => ResistanceMethodDoc::HoltropMennen,
                    (2, _) => ResistanceMethodDoc::VanOortmerssen,
                    (_, Some(rows)) => {
                        r.spans.insert(
                            "resistance.table".into(),
                            rows.first().map_or(method_span.clone(), |(s, _)| s.span()),
                        );
                        let mut table = Vec::with_capacity(rows.len());
                        for (i, (speed, force)) in rows.iter().enumerate() {
                            let key = format!("resistance.table[{}]", i + 1);
                            table.push((
                                r.qty(&format!("{key}.speed"), speed, Kind::Speed)?,
                                r.qty(&format!("{key}.resistance"), force, Kind::Force)?,
                            ));
                        }
                        ResistanceMethodDoc::Table(table)
                    }
                    (_, None) => {
                        return Err(r.error(
                            "resistance.table",
                            method_span,
                            Issue::new("resistance.table", "", "missing; expected `table = [[speed, resistance], …]` for method = \"table\""),
                        ));
                    }
                };
                ResistanceDoc {
                    method,
                    service_margin: r
                        .opt_num("resistance.service_margin", &res.service_margin)
                        .unwrap_or(0.0),
                    fouling: r.opt_num("resistance.fouling", &res.fouling).unwrap_or(0.0),
                }
            }
        };
        let windage = match &raw.windage {
            None => None,
            Some(w) => Some(WindageDoc {
                frontal_area: r.qty("windage.frontal_area", &w.frontal_area, Kind::Area)?,
                drag_coefficient: r.num("windage.drag_coefficient", &w.drag_coefficient),
                headwind: r.opt_qty("windage.headwind", &w.headwind, Kind::Speed)?,
                air_density: r.opt_qty("windage.air_density", &w.air_density, Kind::Density)?,
            }),
        };
        let water = WaterDoc {
            kind: r.choice("water.kind", &raw.water.kind, &WATERS)?,
            temperature: r.qty(
                "water.temperature",
                &raw.water.temperature,
                Kind::Temperature,
            )?,
        };
        let interaction = match &raw.interaction {
            None => InteractionDoc::Auto,
            Some(i) => match match &i.method {
                Some(m) => r.choice("interaction.method", m, &INTERACTIONS)?,
                None => 0,
            } {
                0 => InteractionDoc::Auto,
                1 => InteractionDoc::Holtrop1984,
                2 => InteractionDoc::Taylor,
                3 => InteractionDoc::VanOortmerssen,
                _ => {
                    let mut need = |key: &str, v: &Option<Spanned<f64>>| {
                        let full = format!("interaction.{key}");
                        match v {
                            Some(v) => Ok(r.num(&full, v)),
                            None => Err(r.error(
                                &full,
                                i.method.as_ref().map_or(0..0, |m| m.span()),
                                Issue::new(
                                    full.clone(),
                                    "",
                                    format!("missing; expected `{key}` for method = \"user\""),
                                ),
                            )),
                        }
                    };
                    InteractionDoc::User {
                        wake_fraction: need("wake_fraction", &i.wake_fraction)?,
                        thrust_deduction: need("thrust_deduction", &i.thrust_deduction)?,
                        relative_rotative_efficiency: need(
                            "relative_rotative_efficiency",
                            &i.relative_rotative_efficiency,
                        )?,
                    }
                }
            },
        };
        let inst = &raw.installation;
        let installation = InstallationDoc {
            gear_ratio: r.ratio("installation.gear_ratio", &inst.gear_ratio)?,
            shaft_efficiency: r.num("installation.shaft_efficiency", &inst.shaft_efficiency),
            gear_efficiency: r.num("installation.gear_efficiency", &inst.gear_efficiency),
            shaft_immersion: r.opt_qty(
                "installation.shaft_immersion",
                &inst.shaft_immersion,
                Kind::Length,
            )?,
            shaft_diameter: r.opt_qty(
                "installation.shaft_diameter",
                &inst.shaft_diameter,
                Kind::ScrewLength,
            )?,
            shaft_material: inst
                .shaft_material
                .as_ref()
                .map(|m| r.text("installation.shaft_material", m)),
            max_screw_diameter: r.opt_qty(
                "installation.max_screw_diameter",
                &inst.max_screw_diameter,
                Kind::ScrewLength,
            )?,
            tip_clearance: r.opt_qty(
                "installation.tip_clearance",
                &inst.tip_clearance,
                Kind::ScrewLength,
            )?,
            weight_change: r.opt_qty(
                "installation.weight_change",
                &inst.weight_change,
                Kind::Mass,
            )?,
            shafts: match &inst.shafts {
                None => 1,
                Some(raw) => {
                    let count = *raw.get_ref();
                    r.num(
                        "installation.shafts",
                        &toml::Spanned::new(raw.span(), count as f64),
                    );
                    u32::try_from(count).unwrap_or(0)
                }
            },
            port_shaft_immersion: r.opt_qty(
                "installation.port_shaft_immersion",
                &inst.port_shaft_immersion,
                Kind::Length,
            )?,
        };
        if let Some(extra) = raw.variant.get(MAX_VARIANTS) {
            let key = format!("variant[{}]", MAX_VARIANTS + 1);
            return Err(r.error(
                &key,
                extra.label.span(),
                Issue::new(
                    key.clone(),
                    String::new(),
                    format!(
                        "{} [[variant]] tables; expected at most {MAX_VARIANTS} (the screws to compare on one boat)",
                        raw.variant.len()
                    ),
                ),
            ));
        }
        let mut variants = Vec::with_capacity(raw.variant.len());
        for (i, v) in raw.variant.iter().enumerate() {
            variants.push(read_variant(&mut r, &format!("variant[{}]", i + 1), v)?);
        }
        let active_variant = match &raw.active_variant {
            None => 0,
            Some(label) => {
                r.spans.insert("active_variant".into(), label.span());
                variants
                    .iter()
                    .position(|v| &v.label == label.get_ref())
                    .ok_or_else(|| {
                        let labels: Vec<String> =
                            variants.iter().map(|v| format!("{:?}", v.label)).collect();
                        r.error(
                            "active_variant",
                            label.span(),
                            Issue::new(
                                "active_variant",
                                format!("{:?}", label.get_ref()),
                                format!(
                                    "expected the label of a [[variant]]: {}",
                                    if labels.is_empty() {
                                        "none given".to_owned()
                                    } else {
                                        labels.join(", ")
                                    }
                                ),
                            ),
                        )
                    })?
            }
        };
        let t = &raw.trip;
        if let Some((speed, _)) = t.profile.as_ref().and_then(|p| p.first()) {
            r.spans.insert("trip.profile".into(), speed.span());
        }
        let trip = TripDoc {
            target_speed: r.qty("trip.target_speed", &t.target_speed, Kind::Speed)?,
            tank: r.qty("trip.tank", &t.tank, Kind::Volume)?,
            usable_fraction: r.num("trip.usable_fraction", &t.usable_fraction),
            reserve: r.num("trip.reserve", &t.reserve),
            profile: t
                .profile
                .iter()
                .flatten()
                .enumerate()
                .map(|(i, (speed, share))| {
                    let row = format!("trip.profile[{}]", i + 1);
                    Ok((
                        r.qty(&format!("{row}.speed"), speed, Kind::Speed)?,
                        r.num(&format!("{row}.fraction"), share),
                    ))
                })
                .collect::<Result<_, ProfileError>>()?,
        };
        let match_criteria = match raw.match_criteria.as_ref() {
            None => None,
            Some(m) => Some(MatchDoc {
                light_running: r.opt_num("match.light_running", &m.light_running),
                free_running_allowance: r
                    .opt_num("match.free_running_allowance", &m.free_running_allowance),
                repitch_limit: r.opt_qty(
                    "match.repitch_limit",
                    &m.repitch_limit,
                    Kind::ScrewLength,
                )?,
                repitch_fraction: r.opt_num("match.repitch_fraction", &m.repitch_fraction),
            }),
        };
        let trial = raw
            .trial
            .as_ref()
            .map(|tr| read_trial(&mut r, "trial", tr))
            .transpose()?;
        let calibration = raw.calibration.as_ref().map(|c| CalibrationDoc {
            resistance_factor: r.num("calibration.resistance_factor", &c.resistance_factor),
            wake_fraction: r.opt_num("calibration.wake_fraction", &c.wake_fraction),
            froude_factor: match (
                r.opt_num("calibration.froude_low", &c.froude_low),
                r.opt_num("calibration.factor_low", &c.factor_low),
                r.opt_num("calibration.froude_high", &c.froude_high),
                r.opt_num("calibration.factor_high", &c.factor_high),
            ) {
                (Some(froude_low), Some(low), Some(froude_high), Some(high)) => {
                    Some(crate::propulsion::hull::FroudeFactor {
                        froude_low,
                        low,
                        froude_high,
                        high,
                    })
                }
                // Part of the four: validation names what is missing.
                (None, None, None, None) => None,
                (a, b, c, d) => Some(crate::propulsion::hull::FroudeFactor {
                    froude_low: a.unwrap_or(f64::NAN),
                    low: b.unwrap_or(f64::NAN),
                    froude_high: c.unwrap_or(f64::NAN),
                    high: d.unwrap_or(f64::NAN),
                }),
            },
            trial_date: c.trial_date.clone(),
            note: c.note.clone(),
        });
        let as_found = match &raw.as_found {
            None => None,
            Some(a) => {
                r.spans.insert("as_found".into(), a.engine.span());
                Some(AsFoundDoc {
                    engine: r.text("as_found.engine", &a.engine),
                    gear_ratio: r.ratio("as_found.gear_ratio", &a.gear_ratio)?,
                    variant: r.text("as_found.variant", &a.variant),
                    shaft_efficiency: r.opt_num("as_found.shaft_efficiency", &a.shaft_efficiency),
                    gear_efficiency: r.opt_num("as_found.gear_efficiency", &a.gear_efficiency),
                })
            }
        };
        let mut history = Vec::with_capacity(raw.history.len());
        for (i, h) in raw.history.iter().enumerate() {
            let key = format!("history[{}]", i + 1);
            r.spans.insert(key.clone(), h.until.span());
            history.push(HistoryDoc {
                until: r.text(&format!("{key}.until"), &h.until),
                engine: r.text(&format!("{key}.engine"), &h.engine),
                gear_ratio: r.ratio(&format!("{key}.gear_ratio"), &h.gear_ratio)?,
                screw: r.text(&format!("{key}.screw"), &h.screw),
                trial: h
                    .trial
                    .as_ref()
                    .map(|tr| read_trial(&mut r, &format!("{key}.trial"), tr))
                    .transpose()?,
            });
        }
        let screw_shop = match &raw.screw_shop {
            None => None,
            Some(shop) => Some(ScrewShopDoc {
                pitch_step: r.opt_qty(
                    "screw_shop.pitch_step",
                    &shop.pitch_step,
                    Kind::ScrewLength,
                )?,
                taper: shop.taper.as_ref().map(|t| r.text("screw_shop.taper", t)),
                bore: r.opt_qty("screw_shop.bore", &shop.bore, Kind::ScrewLength)?,
                keyway: shop.keyway.as_ref().map(|k| r.text("screw_shop.keyway", k)),
            }),
        };
        let doc = BoatDoc {
            name: r.text("name", &raw.name),
            units,
            engine: r.text("engine", &raw.engine),
            reynolds_correction: raw.reynolds_correction.unwrap_or(true),
            hull,
            load,
            resistance,
            windage,
            water,
            interaction,
            installation,
            variants,
            active_variant,
            trip,
            match_criteria,
            trial,
            calibration,
            as_found,
            history,
            screw_shop,
        };
        match doc.validate().into_iter().next() {
            Some(issue) => Err(r.locate(issue)),
            None => Ok(doc),
        }
    }
}

fn read_hull(r: &mut Reader<'_>, h: &RawHull) -> Result<HullDoc, ProfileError> {
    let length = Kind::Length;
    let (draft_aft, draft_forward) = match (&h.draft, &h.draft_aft, &h.draft_forward) {
        (Some(d), None, None) => {
            let q = r.qty("hull.draft", d, length)?;
            r.aliases
                .insert("hull.draft_aft".into(), "hull.draft".into());
            r.aliases
                .insert("hull.draft_forward".into(), "hull.draft".into());
            (q.clone(), q)
        }
        (None, Some(a), Some(f)) => (
            r.qty("hull.draft_aft", a, length)?,
            r.qty("hull.draft_forward", f, length)?,
        ),
        (Some(d), _, _) => {
            return Err(r.error(
                "hull.draft",
                d.span(),
                Issue::new(
                    "hull.draft",
                    format!("{:?}", d.get_ref()),
                    "expected either `draft` or both `draft_aft` and `draft_forward`, not both",
                ),
            ));
        }
        (None, a, f) => {
            let span = a
                .as_ref()
                .or(f.as_ref())
                .map_or(r.spans.get("hull").cloned().unwrap_or(0..0), |s| s.span());
            return Err(r.error(
                "hull.draft",
                span,
                Issue::new(
                    "hull.draft",
                    "",
                    "missing; expected `draft` (even keel) or both `draft_aft` and `draft_forward`",
                ),
            ));
        }
    };
    Ok(HullDoc {
        length_waterline: r.qty("hull.length_waterline", &h.length_waterline, length)?,
        beam_waterline: r.qty("hull.beam_waterline", &h.beam_waterline, length)?,
        draft_aft,
        draft_forward,
        midship_coefficient: r.opt_num("hull.midship_coefficient", &h.midship_coefficient),
        waterplane_coefficient: r.opt_num("hull.waterplane_coefficient", &h.waterplane_coefficient),
        lcb_fraction: r.opt_num("hull.lcb_fraction", &h.lcb_fraction),
        wetted_surface: r.opt_qty("hull.wetted_surface", &h.wetted_surface, Kind::Area)?,
        half_entrance_angle: r.opt_qty(
            "hull.half_entrance_angle",
            &h.half_entrance_angle,
            Kind::Angle,
        )?,
        transom_area: r.opt_qty("hull.transom_area", &h.transom_area, Kind::Area)?,
        bulb_area: r.opt_qty("hull.bulb_area", &h.bulb_area, Kind::Area)?,
        bulb_centre_height: r.opt_qty("hull.bulb_centre_height", &h.bulb_centre_height, length)?,
        stern_coefficient: r.opt_num("hull.stern_coefficient", &h.stern_coefficient),
        appendage_area: r.opt_qty("hull.appendage_area", &h.appendage_area, Kind::Area)?,
        appendage_form_factor: r.opt_num("hull.appendage_form_factor", &h.appendage_form_factor),
    })
}

fn read_load(r: &mut Reader<'_>, l: &RawLoad) -> Result<LoadDoc, ProfileError> {
    r.spans.insert("load".into(), l.default.span());
    let default = r.choice("load.default", &l.default, &CONDITIONS)?;
    let mut case = |name: &str, c: &Option<RawCase>| -> Result<Option<LoadCase>, ProfileError> {
        let Some(c) = c else { return Ok(None) };
        let key = format!("load.{name}");
        r.spans.insert(key.clone(), c.displacement.span());
        Ok(Some(LoadCase {
            displacement: r.qty(&format!("{key}.displacement"), &c.displacement, Kind::Mass)?,
            draft_aft: r.opt_qty(&format!("{key}.draft_aft"), &c.draft_aft, Kind::Length)?,
            draft_forward: r.opt_qty(
                &format!("{key}.draft_forward"),
                &c.draft_forward,
                Kind::Length,
            )?,
        }))
    };
    Ok(LoadDoc {
        default,
        light: case("light", &l.light)?,
        half: case("half", &l.half)?,
        full: case("full", &l.full)?,
    })
}

fn read_variant(r: &mut Reader<'_>, key: &str, v: &RawVariant) -> Result<VariantDoc, ProfileError> {
    r.spans.insert(key.to_owned(), v.label.span());
    let blades_key = format!("{key}.blades");
    r.spans.insert(blades_key.clone(), v.blades.span());
    let blades = u32::try_from(*v.blades.get_ref()).map_err(|_| {
        r.error(
            &blades_key,
            v.blades.span(),
            Issue::new(
                blades_key.clone(),
                v.blades.get_ref().to_string(),
                "expected 2 to 9 blades",
            ),
        )
    })?;
    let open_water = v.open_water.as_ref().map(|rows| {
        if let Some(first) = rows.first() {
            r.spans.insert(format!("{key}.open_water"), first.0.span());
        }
        rows.iter()
            .enumerate()
            .map(|(i, (j, kt, kq))| {
                r.spans
                    .insert(format!("{key}.open_water[{}]", i + 1), j.span());
                (*j.get_ref(), *kt.get_ref(), *kq.get_ref())
            })
            .collect()
    });
    Ok(VariantDoc {
        label: r.text(&format!("{key}.label"), &v.label),
        blades,
        diameter: r.qty(&format!("{key}.diameter"), &v.diameter, Kind::ScrewLength)?,
        pitch: r.qty(&format!("{key}.pitch"), &v.pitch, Kind::ScrewLength)?,
        area_ratio: r.num(&format!("{key}.area_ratio"), &v.area_ratio),
        thickness_ratio: r.opt_num(&format!("{key}.thickness_ratio"), &v.thickness_ratio),
        rotation: v
            .rotation
            .as_ref()
            .map(|h| r.choice(&format!("{key}.rotation"), h, &ROTATIONS))
            .transpose()?,
        open_water,
    })
}

/// A sea-trial log under `key` ("trial", or "history[n].trial" for an earlier installation's).
fn read_trial(r: &mut Reader<'_>, key: &str, tr: &RawTrial) -> Result<TrialDoc, ProfileError> {
    let mut runs = Vec::with_capacity(tr.run.len());
    for (i, run) in tr.run.iter().enumerate() {
        let run_key = format!("{key}.run[{}]", i + 1);
        runs.push(TrialRunDoc {
            rpm: r.qty(&format!("{run_key}.rpm"), &run.rpm, Kind::Rotation)?,
            speed: r.qty(&format!("{run_key}.speed"), &run.speed, Kind::Speed)?,
            direction: run
                .direction
                .as_ref()
                .map(|d| r.choice(&format!("{run_key}.direction"), d, &DIRECTIONS))
                .transpose()?,
            fuel_rate: r.opt_qty(
                &format!("{run_key}.fuel_rate"),
                &run.fuel_rate,
                Kind::FuelRate,
            )?,
        });
    }
    Ok(TrialDoc {
        date: tr.date.clone(),
        note: tr.note.clone(),
        installation: tr
            .installation
            .as_ref()
            .map(|side| r.choice(&format!("{key}.installation"), side, &SIDES))
            .transpose()?,
        runs,
    })
}
