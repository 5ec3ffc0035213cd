//! The invented demo fleet from the repository's `profiles/`, embedded in the binary so that
//! the first run works with no set-up. Read-only; `tidewright init` copies it into the store.

/// Demo boats: (profile name, file text).
pub const BOATS: &[(&str, &str)] = &[
    ("marram", include_str!("../../profiles/boats/marram.toml")),
    ("pintle", include_str!("../../profiles/boats/pintle.toml")),
    (
        "samphire",
        include_str!("../../profiles/boats/samphire.toml"),
    ),
    ("sorrel", include_str!("../../profiles/boats/sorrel.toml")),
];

/// Demo engine sheets: (profile name, file text).
pub const ENGINES: &[(&str, &str)] = &[
    (
        "brindmoor-3b40",
        include_str!("../../profiles/engines/brindmoor-3b40.toml"),
    ),
    (
        "brindmoor-4b62",
        include_str!("../../profiles/engines/brindmoor-4b62.toml"),
    ),
    (
        "harrowby-h48",
        include_str!("../../profiles/engines/harrowby-h48.toml"),
    ),
    (
        "quellan-qd90",
        include_str!("../../profiles/engines/quellan-qd90.toml"),
    ),
];

/// The text of demo boat `name`.
pub fn boat(name: &str) -> Option<&'static str> {
    BOATS.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// The text of demo engine sheet `name`.
pub fn engine(name: &str) -> Option<&'static str> {
    ENGINES.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// Names of the demo boats, sorted.
pub fn boat_names() -> Vec<&'static str> {
    BOATS.iter().map(|(n, _)| *n).collect()
}

/// Names of the demo engine sheets, sorted.
pub fn engine_names() -> Vec<&'static str> {
    ENGINES.iter().map(|(n, _)| *n).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_embedded_lists_match_the_profiles_folder() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles");
        for (sub, names) in [("boats", boat_names()), ("engines", engine_names())] {
            let mut on_disk: Vec<String> = std::fs::read_dir(dir.join(sub))
                .unwrap()
                .map(|e| e.unwrap().path())
                .filter(|p| p.extension().is_some_and(|x| x == "toml"))
                .map(|p| p.file_stem().unwrap().to_string_lossy().into_owned())
                .collect();
            on_disk.sort();
            assert_eq!(
                on_disk, names,
                "profiles/{sub} and the embedded list differ"
            );
        }
    }

    /// The demo fleet's core warnings — hull and method ranges, each screw, and the pitch
    /// recommendation of each variant — carry the subject of the input their message names,
    /// so a screen can place them without reading words. The expected subject of each message
    /// start is the quantity that message itself names.
    #[test]
    fn demo_warnings_that_name_an_input_carry_its_subject() {
        use crate::profile::{BoatDoc, EngineDoc};
        use crate::propulsion::Subject;
        use crate::propulsion::solver::pitch::{PitchOptions, recommend_pitch};
        let named: [(&str, Subject); 12] = [
            ("L/B", Subject::LengthBeamRatio),
            ("B/T", Subject::BeamDraftRatio),
            ("Cp", Subject::PrismaticCoefficient),
            ("Cm", Subject::MidshipCoefficient),
            ("LCB", Subject::Lcb),
            ("half angle of entrance", Subject::HalfEntranceAngle),
            ("block coefficient", Subject::BlockCoefficient),
            ("waterplane coefficient", Subject::WaterplaneCoefficient),
            ("pitch ratio P/D", Subject::PitchRatio),
            ("the recommended pitch ratio P/D", Subject::PitchRatio),
            ("area ratio AE/A0", Subject::AreaRatio),
            ("Froude number", Subject::FroudeNumber),
        ];
        let mut checked = 0;
        for (name, text) in BOATS {
            let boat = BoatDoc::from_toml(text, name).unwrap();
            let engine =
                EngineDoc::from_toml(super::engine(&boat.engine).unwrap(), &boat.engine).unwrap();
            let vessel = boat.to_default_vessel(&engine).unwrap();
            let mut warnings = vessel.resistance.warnings();
            for (index, variant) in vessel.variants.iter().enumerate() {
                warnings.extend(variant.screw.warnings());
                if let Ok(rec) = recommend_pitch(&vessel, index, &PitchOptions::default()) {
                    warnings.extend(rec.warnings);
                }
            }
            for warning in &warnings {
                let expected = named
                    .iter()
                    .filter(|(start, _)| warning.message.starts_with(start))
                    .max_by_key(|(start, _)| start.len());
                if let Some((_, subject)) = expected {
                    assert_eq!(warning.subject, *subject, "{name}: {warning}");
                    checked += 1;
                }
            }
        }
        assert!(
            checked > 0,
            "no demo warning names an input: the test checks nothing"
        );
    }
}
