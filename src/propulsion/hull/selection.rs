//! The default resistance method: the one whose published parameter ranges hold the hull.
//!
//! One place decides, so the report, the TUI and the JSON say the same thing.

use super::{HullForm, ResistanceMethod, holtrop, oortmerssen};

/// Longest waterline of van Oortmerssen's small-ship sample, m (8–80 m; from memory). Up to it
/// a hull counts as small craft and the small-ship regression is preferred.
pub const SMALL_SHIP_MAX_LENGTH: f64 = 80.0;

/// Which method was picked for a boat that names none, and why.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MethodChoice {
    /// The method used for every figure.
    pub method: ResistanceMethod,
    /// One sentence saying why, for the report, the TUI and the JSON.
    pub reason: String,
    /// The other method, computed beside it because its spread is a real uncertainty; `None`
    /// when only the chosen method's ranges hold the hull.
    pub alternative: Option<ResistanceMethod>,
}

/// How far a hull lies outside a method's ranges: the sum of each excess over the range's
/// width (0 inside), dimensionless.
fn distance(outside: &[(&str, f64, f64, f64)]) -> f64 {
    outside
        .iter()
        .map(|&(_, value, min, max)| {
            let excess = if value < min {
                min - value
            } else {
                value - max
            };
            excess.max(0.0) / (max - min)
        })
        .sum()
}

fn list(outside: &[(&str, f64, f64, f64)]) -> String {
    outside
        .iter()
        .map(|&(name, value, min, max)| format!("{name} {value:.2} outside {min}–{max}"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// The method for `hull` when the boat names none.
///
/// Van Oortmerssen (1971) when its sample's ranges hold the hull, Holtrop–Mennen when only
/// its ranges do; inside both, the small-ship regression for a hull up to
/// [`SMALL_SHIP_MAX_LENGTH`] and Holtrop–Mennen above; inside neither, the small-ship
/// regression for a small craft, else the nearer one (the sum of the excesses over each
/// range's width). When both or
/// neither hold the hull, the other method is the `alternative`.
pub fn choose_method(hull: &HullForm) -> MethodChoice {
    let vo_out = oortmerssen::outside_ranges(hull);
    let hm_out = holtrop::outside_ranges(hull);
    let small = hull.input.length_waterline <= SMALL_SHIP_MAX_LENGTH;
    let vo = ResistanceMethod::VanOortmerssen;
    let hm = ResistanceMethod::HoltropMennen;
    match (vo_out.is_empty(), hm_out.is_empty()) {
        (true, false) => MethodChoice {
            method: vo,
            reason: format!(
                "the hull lies inside van Oortmerssen's small-ship ranges but not Holtrop-Mennen's ({})",
                list(&hm_out)
            ),
            alternative: None,
        },
        (false, true) => MethodChoice {
            method: hm,
            reason: format!(
                "the hull lies inside Holtrop-Mennen's ranges but not van Oortmerssen's ({})",
                list(&vo_out)
            ),
            alternative: None,
        },
        (true, true) if small => MethodChoice {
            method: vo,
            reason: format!(
                "the hull lies inside both methods' ranges; the small-ship regression is preferred up to {SMALL_SHIP_MAX_LENGTH} m"
            ),
            alternative: Some(hm),
        },
        (true, true) => MethodChoice {
            method: hm,
            reason: format!(
                "the hull lies inside both methods' ranges; at over {SMALL_SHIP_MAX_LENGTH} m Holtrop-Mennen's ship sample is nearer"
            ),
            alternative: Some(vo),
        },
        (false, false) => {
            let (d_vo, d_hm) = (distance(&vo_out), distance(&hm_out));
            // Small craft are what van Oortmerssen's sample holds; past it, the nearer method.
            let pick_vo = small || d_vo < d_hm;
            let (method, alternative) = if pick_vo { (vo, hm) } else { (hm, vo) };
            MethodChoice {
                reason: format!(
                    "the hull lies outside both methods' ranges (van Oortmerssen: {}; Holtrop-Mennen: {}); {} is used ({}), both are extrapolations",
                    list(&vo_out),
                    list(&hm_out),
                    method.name(),
                    if small {
                        "the small-ship regression for a small craft"
                    } else {
                        "the nearer"
                    }
                ),
                method,
                alternative: Some(alternative),
            }
        }
    }
}
