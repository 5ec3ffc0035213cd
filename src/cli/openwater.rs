//! `tidewright openwater`: the open-water table of a B-series screw.

use std::io::Write;

use super::{OpenwaterArgs, PlainFormat, UsageError};
use crate::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel, open_water_rows};
use crate::report::openwater::{OpenWaterReport, OpenWaterRow};

/// J step of the default table, which runs from 0 to the zero-thrust advance ratio.
const DEFAULT_J_STEP: f64 = 0.05;
/// More advance ratios than this is a typing mistake, not a table anyone reads.
const MAX_POINTS: usize = 10_000;

/// Runs the command.
pub fn run(args: &OpenwaterArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let advance_ratios = match (&args.j, &args.j_range) {
        (Some(list), _) => Some(parse_j_list(list)?),
        (None, Some(range)) => Some(parse_j_range(range)?),
        (None, None) => None,
    };
    let report = open_water_report(
        args.blades,
        args.area_ratio,
        args.pitch_ratio,
        args.reynolds,
        advance_ratios.as_deref(),
    )?;
    match args.format {
        PlainFormat::Text => out.write_all(crate::report::openwater::text(&report).as_bytes())?,
        PlainFormat::Json => out.write_all(crate::report::json::to_string(&report)?.as_bytes())?,
    }
    Ok(())
}

/// Builds the open-water report for a screw of the given ratios at each advance ratio
/// (`None`: from 0 to zero thrust in steps of 0.05).
pub fn open_water_report(
    blades: u32,
    area_ratio: f64,
    pitch_ratio: f64,
    reynolds: Option<f64>,
    advance_ratios: Option<&[f64]>,
) -> anyhow::Result<OpenWaterReport> {
    positive(
        "--area-ratio",
        "an expanded area ratio AE/A0 such as 0.55",
        area_ratio,
    )?;
    positive(
        "--pitch-ratio",
        "a pitch ratio P/D such as 0.9",
        pitch_ratio,
    )?;
    if let Some(rn) = reynolds {
        positive("--reynolds", "a blade Reynolds number such as 2e7", rn)?;
    }
    if advance_ratios.is_some_and(<[f64]>::is_empty) {
        return Err(UsageError("the list of advance ratios J is empty; give e.g. --j 0.1,0.2,0.3 or --j-range 0:1.2:0.05".into()).into());
    }
    // The coefficients depend only on the ratios, so a unit diameter is exact.
    let geometry = ScrewGeometry {
        blades,
        diameter: 1.0,
        pitch: pitch_ratio,
        area_ratio,
    };
    let screw = ScrewModel::BSeries(
        BSeriesScrew::new(geometry)
            .map_err(|e| UsageError(format!("cannot build the B-series screw: {e}")))?,
    );
    let zero_thrust_j = screw.zero_thrust_advance_ratio(reynolds);
    let default_js;
    let advance_ratios = match advance_ratios {
        Some(js) => js,
        None => {
            let stop = if zero_thrust_j.is_finite() && zero_thrust_j > 0.0 {
                zero_thrust_j
            } else {
                1.6
            };
            default_js = parse_j_range(&format!("0:{stop}:{DEFAULT_J_STEP}"))?;
            &default_js
        }
    };
    let mut points = Vec::with_capacity(advance_ratios.len());
    let mut omitted = Vec::new();
    for row in open_water_rows(&screw, advance_ratios, reynolds) {
        let (j, kt, kq) = (
            row.advance_ratio,
            row.thrust_coefficient,
            row.torque_coefficient,
        );
        match row.efficiency {
            Some(eta0)
                if !row.past_zero_thrust
                    && kt.is_finite()
                    && kq.is_finite()
                    && eta0.is_finite() =>
            {
                points.push(OpenWaterRow { j, kt, kq, eta0 })
            }
            _ => omitted.push(j),
        }
    }
    let mut warnings: Vec<String> = screw.warnings().iter().map(ToString::to_string).collect();
    if !omitted.is_empty() {
        let list: Vec<String> = omitted.iter().map(|j| format!("{j:.3}")).collect();
        warnings.push(format!(
            "omitted J = {}: past zero thrust (KT = 0 near J = {:.3}), where efficiency has no meaning",
            list.join(", "),
            zero_thrust_j
        ));
    }
    Ok(OpenWaterReport {
        blades,
        area_ratio,
        pitch_ratio,
        reynolds,
        zero_thrust_j: zero_thrust_j.is_finite().then_some(zero_thrust_j),
        points,
        warnings,
    })
}

fn positive(option: &str, expected: &str, value: f64) -> anyhow::Result<()> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(UsageError(format!(
            "{option}: expected {expected} (a positive number), got {value}"
        ))
        .into())
    }
}

fn parse_j(text: &str, option: &str) -> Result<f64, UsageError> {
    let value: f64 = text.trim().parse().map_err(|_| {
        UsageError(format!(
            "{option}: {text:?} is not a number; expected an advance ratio such as 0.45"
        ))
    })?;
    if !value.is_finite() || value < 0.0 {
        return Err(UsageError(format!(
            "{option}: advance ratio {text:?} must be a finite number ≥ 0"
        )));
    }
    Ok(value)
}

/// Parses `--j 0.1,0.2,…`; an empty list is an error.
pub fn parse_j_list(text: &str) -> Result<Vec<f64>, UsageError> {
    let items: Vec<&str> = text
        .split(',')
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .collect();
    if items.is_empty() {
        return Err(UsageError(
            "--j: the list of advance ratios is empty; give e.g. --j 0.1,0.2,0.3".into(),
        ));
    }
    if items.len() > MAX_POINTS {
        return Err(UsageError(format!(
            "--j: {} advance ratios is more than the {MAX_POINTS} allowed",
            items.len()
        )));
    }
    items.into_iter().map(|s| parse_j(s, "--j")).collect()
}

/// Parses `--j-range START:STOP:STEP` (STOP included when it falls on a step).
pub fn parse_j_range(text: &str) -> Result<Vec<f64>, UsageError> {
    let parts: Vec<&str> = text.split(':').collect();
    let [start, stop, step] = parts.as_slice() else {
        return Err(UsageError(format!(
            "--j-range: expected START:STOP:STEP such as 0:1.2:0.05, got {text:?}"
        )));
    };
    let (start, stop, step) = (
        parse_j(start, "--j-range START")?,
        parse_j(stop, "--j-range STOP")?,
        parse_j(step, "--j-range STEP")?,
    );
    if step <= 0.0 {
        return Err(UsageError("--j-range: STEP must be greater than 0".into()));
    }
    if stop < start {
        return Err(UsageError(format!(
            "--j-range: STOP {stop} is below START {start}; the list of advance ratios is empty"
        )));
    }
    let intervals = ((stop - start) / step + 1e-9).floor();
    if intervals >= MAX_POINTS as f64 {
        return Err(UsageError(format!(
            "--j-range: more than {MAX_POINTS} advance ratios; use a larger STEP"
        )));
    }
    // Multiplying rather than accumulating keeps 0.05·k free of creeping round-off.
    Ok((0..=intervals as usize)
        .map(|k| start + step * k as f64)
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn range_includes_stop_and_avoids_round_off() {
        let js = parse_j_range("0:1.2:0.05").unwrap();
        assert_eq!(js.len(), 25);
        assert!((js[24] - 1.2).abs() < 1e-12);
        assert_eq!(parse_j_range("0.5:0.5:0.1").unwrap(), vec![0.5]);
    }

    #[test]
    fn bad_ranges_and_lists_are_clear_errors() {
        assert!(parse_j_range("1:0:0.1").unwrap_err().0.contains("empty"));
        assert!(parse_j_range("0:1:0").unwrap_err().0.contains("STEP"));
        assert!(parse_j_range("0:1").is_err());
        assert!(parse_j_range("0:1:1e-9").is_err());
        assert!(parse_j_list("").unwrap_err().0.contains("empty"));
        assert!(parse_j_list(" , ").unwrap_err().0.contains("empty"));
        assert!(
            parse_j_list("0.1,x")
                .unwrap_err()
                .0
                .contains("not a number")
        );
        assert!(parse_j_list("-0.1").is_err());
        assert!(parse_j_list("NaN").is_err());
        assert_eq!(parse_j_list("0.1, 0.2").unwrap(), vec![0.1, 0.2]);
    }

    #[test]
    fn zero_pitch_ratio_is_refused_before_the_model() {
        let err = open_water_report(4, 0.55, 0.0, None, Some(&[0.1])).unwrap_err();
        assert!(format!("{err}").contains("--pitch-ratio"), "{err}");
        let err = open_water_report(4, f64::NAN, 0.8, None, Some(&[0.1])).unwrap_err();
        assert!(format!("{err}").contains("--area-ratio"), "{err}");
    }
}
