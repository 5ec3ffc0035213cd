//! The document's issues, found once per edit and tied to fields by type: a profile validation
//! issue by its file key ([`fields::file_key`]), a core warning by its [`Subject`].
//!
//! [`super::app::App::update`] rebuilds the list whenever the document or its solution changes;
//! the panes only look fields up in it, so drawing never validates.

use super::fields::{self, FieldId, Pane};
use super::solve::Solution;
use crate::profile::{BoatDoc, Issue};
use crate::propulsion::{Subject, Warning};

/// One issue shown beside one field.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldIssue {
    /// The field it is shown beside.
    pub field: FieldId,
    /// The text shown when the field is selected.
    pub text: String,
}

/// The issues of the document under edit, in the order they are shown per field.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Issues {
    /// Core warnings first (vessel, then the active variant), then validation problems.
    list: Vec<FieldIssue>,
}

impl Issues {
    /// The issues of `boat` and its `solution`: validates the document once.
    pub fn compute(boat: &BoatDoc, solution: &Solution) -> Self {
        let vessel = solution.solved().map(|s| s.warnings.as_slice());
        let variant = solution.active().map(|v| v.warnings.as_slice());
        let warnings = vessel.into_iter().chain(variant).flatten();
        Self::from_parts(boat, warnings, &boat.validate())
    }

    /// The issues from core `warnings` and profile validation `problems` of `boat`.
    pub fn from_parts<'a>(
        boat: &BoatDoc,
        warnings: impl IntoIterator<Item = &'a Warning>,
        problems: &[Issue],
    ) -> Self {
        let mut list = Vec::new();
        for warning in warnings {
            for &field in fields_of_subject(warning.subject) {
                list.push(FieldIssue {
                    field,
                    text: warning.to_string(),
                });
            }
        }
        for problem in problems {
            for field in fields_of_key(&problem.key, boat) {
                list.push(FieldIssue {
                    field,
                    text: problem.problem.clone(),
                });
            }
        }
        Self { list }
    }

    /// The first issue shown beside `field`, if any.
    pub fn first_for(&self, field: FieldId) -> Option<&str> {
        self.list
            .iter()
            .find(|issue| issue.field == field)
            .map(|issue| issue.text.as_str())
    }

    /// Every issue, in order.
    pub fn all(&self) -> &[FieldIssue] {
        &self.list
    }
}

/// The fields whose file key in `boat` is `key` (several fields can read one key, e.g. the
/// engine sheet's).
pub fn fields_of_key(key: &str, boat: &BoatDoc) -> Vec<FieldId> {
    Pane::ALL
        .into_iter()
        .flat_map(|pane| fields::fields_of(pane, boat))
        .filter(|&field| fields::file_key(field, boat) == key)
        .collect()
}

/// The fields a core warning about `subject` is shown beside; none for a subject without a
/// field of its own in the panes (it still shows in the checks and the report).
pub fn fields_of_subject(subject: Subject) -> &'static [FieldId] {
    use FieldId as F;
    use Subject as S;
    match subject {
        S::General => &[],
        S::Displacement | S::BlockCoefficient => &[F::Displacement],
        // The method's speed range is set by length (Froude number = V / √(g L)).
        S::LengthWaterline | S::FroudeNumber => &[F::LengthWaterline],
        S::BeamWaterline => &[F::BeamWaterline],
        S::Draft | S::Trim => &[F::DraftAft, F::DraftForward],
        S::LengthBeamRatio => &[F::LengthWaterline, F::BeamWaterline],
        S::BeamDraftRatio => &[F::BeamWaterline, F::DraftAft, F::DraftForward],
        S::WettedSurface => &[F::WettedSurface],
        S::HalfEntranceAngle => &[F::HalfEntranceAngle],
        S::TransomArea => &[F::TransomArea],
        // Hull-form inputs the panes do not show are inputs of the resistance method.
        S::PrismaticCoefficient
        | S::MidshipCoefficient
        | S::WaterplaneCoefficient
        | S::Lcb
        | S::Bulb
        | S::Appendages
        | S::ResistanceMethod
        | S::ResistanceTable => &[F::ResistanceMethod],
        S::Interaction => &[F::Interaction],
        S::Water => &[F::Water, F::WaterTemperature],
        S::Windage => &[F::WindageArea, F::Headwind],
        S::Blades => &[F::Blades],
        S::Diameter => &[F::Diameter],
        S::Pitch => &[F::Pitch],
        S::PitchRatio => &[F::PitchRatio, F::Pitch],
        S::AreaRatio => &[F::AreaRatio],
        S::GearRatio => &[F::GearRatio],
        S::Engine => &[F::EngineSheet, F::RatedRpm, F::RatedPower],
        S::Fuel => &[F::FuelDensity],
        S::Margins => &[F::ServiceMargin, F::Fouling],
        // Shown in the checks line and the views, not beside one field.
        S::OpenWaterTable | S::Cavitation | S::Shaft | S::Trial => &[],
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::profile::{Quantity, Store};

    fn demo_boat(name: &str) -> BoatDoc {
        let store = Store::at(std::env::temp_dir().join("tidewright-issues-tests-no-store"));
        crate::tui::open_app(&store, Some(name))
            .expect("demo boat opens")
            .doc
            .boat
    }

    #[test]
    fn core_warnings_land_on_the_fields_of_their_subject() {
        let boat = demo_boat("marram");
        // The texts are placeholders: the subject-to-field mapping is under test, not physics.
        let warnings = [
            Warning::about(Subject::PitchRatio, "B-series", "pitch ratio out of range"),
            Warning::about(
                Subject::LengthBeamRatio,
                "Holtrop-Mennen",
                "length-beam ratio out of range",
            ),
            Warning::about(
                Subject::General,
                "Holtrop-Mennen",
                "about the hull as a whole",
            ),
        ];
        let issues = Issues::from_parts(&boat, &warnings, &[]);
        let text = |f| issues.first_for(f);
        assert_eq!(
            text(F::PitchRatio),
            Some("B-series: pitch ratio out of range")
        );
        assert_eq!(text(F::Pitch), Some("B-series: pitch ratio out of range"));
        assert_eq!(
            text(F::LengthWaterline),
            Some("Holtrop-Mennen: length-beam ratio out of range")
        );
        assert_eq!(
            text(F::BeamWaterline),
            Some("Holtrop-Mennen: length-beam ratio out of range")
        );
        assert_eq!(text(F::Diameter), None);
        assert_eq!(issues.all().len(), 4, "General is beside no field");
    }

    use FieldId as F;

    #[test]
    fn validation_problems_land_on_the_field_of_their_file_key() {
        let mut boat = demo_boat("marram");
        boat.hull.length_waterline = Quantity::new(-1.0);
        boat.active_variant = boat.variants.len() - 1;
        let last = boat.active_variant;
        boat.variants[last].area_ratio = -0.5;
        let issues = Issues::from_parts(&boat, &[], &boat.validate());
        assert!(issues.first_for(F::LengthWaterline).is_some(), "{issues:?}");
        assert!(issues.first_for(F::AreaRatio).is_some(), "{issues:?}");
        assert_eq!(issues.first_for(F::Diameter), None);
        // A key of another variant is not beside the active variant's field.
        boat.active_variant = 0;
        let other = Issues::from_parts(&boat, &[], &boat.validate());
        assert_eq!(other.first_for(F::AreaRatio), None, "{other:?}");
        assert_eq!(
            fields_of_key("engine sheet", &boat),
            [F::RatedRpm, F::RatedPower, F::FuelDensity]
        );
    }

    #[test]
    fn a_core_warning_comes_before_a_validation_problem() {
        let mut boat = demo_boat("marram");
        boat.hull.length_waterline = Quantity::new(-1.0);
        let warnings = [Warning::about(Subject::LengthWaterline, "core", "first")];
        let issues = Issues::from_parts(&boat, &warnings, &boat.validate());
        assert_eq!(issues.first_for(F::LengthWaterline), Some("core: first"));
    }
}
