//! Sea-trial log and calibration of the model against it.

/// Direction of a trial run, used to pair runs in opposite directions against current.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum RunDirection {
    /// The first heading of a pair (e.g. upstream / outbound).
    Out,
    /// The reciprocal heading.
    Back,
}

/// One measured run: engine rpm held, speed over ground measured (SI, rpm named).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct TrialRun {
    /// Engine speed held during the run, rpm.
    pub engine_rpm: f64,
    /// Measured speed over ground, m/s.
    pub speed_over_ground: f64,
    /// Direction of the run, if logged; runs at the same rpm in opposite directions are averaged.
    pub direction: Option<RunDirection>,
    /// Measured fuel volume flow, m³/s, if logged.
    pub fuel_volume_flow: Option<f64>,
}
