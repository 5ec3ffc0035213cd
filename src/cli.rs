//! Command-line subcommands: argument definitions, dispatch and the exit-code mapping.
//!
//! The binary stays thin: [`main_entry`] parses the arguments, runs one command and turns its
//! result into an exit code. Every command calls the library (profiles, solver, report); none
//! does physics of its own.

mod boat;
mod conditions;
mod design;
mod import;
mod new;
mod openwater;
mod order;
mod shell;
mod shortlist;
mod sides;
mod store;

use clap::{Args, Parser, Subcommand, ValueEnum};
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use crate::study::Study;
use crate::units::UnitSystem;

/// Exit code: the command did what was asked.
pub const EXIT_OK: u8 = 0;
/// Exit code: a runtime error (a profile that cannot be loaded, a file that cannot be written,
/// a boat that cannot be solved).
pub const EXIT_RUNTIME: u8 = 1;
/// Exit code: the command line itself is wrong (unknown option, missing or malformed value).
pub const EXIT_USAGE: u8 = 2;
/// Exit code: `check` found at least one invalid profile.
pub const EXIT_INVALID_FILES: u8 = 3;

/// Environment variable naming the profile directory when `--profiles` is not given.
pub const PROFILES_ENV: &str = "TIDEWRIGHT_PROFILES";

/// Repower planning for displacement motorboats: hull resistance, screw, engine match, pitch,
/// cruise and fuel. With no subcommand, opens the terminal UI.
#[derive(Debug, Parser)]
#[command(name = "tidewright", version = crate::version_text(), about, long_about = None)]
pub struct Cli {
    /// Profile directory holding boats/ and engines/ (default: the user's data directory;
    /// also taken from the TIDEWRIGHT_PROFILES environment variable).
    #[arg(long, global = true, value_name = "DIR")]
    pub profiles: Option<PathBuf>,
    /// Unit system for text, CSV, Markdown and charts (default: the boat file's own; JSON is
    /// always SI or the unit in the field's name).
    #[arg(long, global = true, value_enum)]
    pub units: Option<Units>,
    /// Plain ASCII output: "deg", "m2", "1/2", `+-|` borders and ASCII chart marks (also
    /// chosen when the locale is not UTF-8, e.g. LANG=C).
    #[arg(long, global = true)]
    pub ascii: bool,
    /// What to do; none opens the terminal UI.
    #[command(subcommand)]
    pub command: Option<Command>,
}

/// The unit system chosen on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Units {
    /// Metres, millimetres, kilowatts, litres.
    Metric,
    /// Feet and inches, horsepower, US gallons.
    Imperial,
}

impl From<Units> for UnitSystem {
    fn from(units: Units) -> Self {
        match units {
            Units::Metric => UnitSystem::Metric,
            Units::Imperial => UnitSystem::Imperial,
        }
    }
}

/// Output format of `report`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ReportFormat {
    /// Aligned plain-text tables.
    Text,
    /// One comma-separated table of every variant's operating points.
    Csv,
    /// A JSON document with SI values (or the unit in the field's name).
    Json,
    /// A Markdown document.
    Md,
}

/// Output format of the commands that print text or JSON.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum PlainFormat {
    /// Readable text.
    Text,
    /// JSON with SI values (or the unit in the field's name).
    Json,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Open a boat in the terminal UI.
    Open {
        /// A boat name in the profile store, or a path to a boat file.
        boat: String,
        /// Live instruments: tcp://HOST:PORT, udp://:PORT or a log file replayed in real time.
        #[arg(long, value_name = "FEED")]
        nmea: Option<String>,
    },
    /// Operating table, match verdict, top speed and cruise line of a boat, per screw variant.
    Report(ReportArgs),
    /// One cruise line at a given speed or engine rpm: rpm, speed, power, load, fuel, range.
    Cruise(CruiseArgs),
    /// Validate boat and engine profile files; exit code 0 only when all are valid.
    Check(CheckArgs),
    /// List the boats and engine sheets in the store (or in the built-in demo fleet).
    List(ListArgs),
    /// Create the profile store with the demo fleet (never overwrites a file).
    Init,
    /// Start a boat or engine sheet from a commented template in the store (metric unless
    /// `--units imperial`); never overwrites a file.
    New(NewArgs),
    /// Open-water table of a Wageningen B-series screw: J, KT, 10·KQ, η0.
    Openwater(OpenwaterArgs),
    /// Pitch that matches the engine, the change from the current pitch and rpm per inch.
    Pitch(PitchArgs),
    /// The order for the propeller shop: the screw with its pitch rounded to the shop's step,
    /// the effect of the rounding on rpm, rotation, shaft end, checks and cautions.
    Order(OrderArgs),
    /// Sweep diameter, gear ratio, blade count or area ratio; rank the candidates.
    Sweep(SweepArgs),
    /// Compare the sea-trial log with the prediction and fit a resistance correction.
    Trial(DesignArgs),
    /// What-if: light, half and full load, fouled hull and a seaway side by side, with the
    /// uncertainty band over displacement and wake.
    Conditions(ConditionsArgs),
    /// Write the report for the owner and the propeller shop: Markdown with SVG charts, or one
    /// self-contained HTML file.
    Export(ExportArgs),
    /// Every candidate engine sheet and gear with its screw sized and pitched, ranked.
    Shortlist(shortlist::ShortlistArgs),
    /// The hull's resistance curve: speed, Froude numbers, resistance and its parts,
    /// effective power and the formula at each speed.
    Resistance(ResistanceArgs),
    /// The installation in the boat now, the planned one and the earlier ones; `--swap`
    /// marks the repower done.
    Installations(sides::InstallationsArgs),
    /// Print the shell completion script for bash, zsh, fish, elvish or PowerShell.
    Completions(shell::CompletionsArgs),
    /// Print the manual page (roff), or write one page per subcommand with --out.
    Man(shell::ManArgs),
    /// Draw the terminal UI's first screen once as text, without a terminal.
    Screen(shell::ScreenArgs),
}

/// Arguments of `resistance`.
#[derive(Debug, Args)]
pub struct ResistanceArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Highest speed with its unit, e.g. 14kn (default: Froude number 1.0 on the waterline).
    #[arg(long, value_name = "SPEED")]
    pub to: Option<String>,
    /// Speed step with its unit (default: 0.5kn).
    #[arg(long, value_name = "SPEED")]
    pub step: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = ReportFormat::Text)]
    pub format: ReportFormat,
}

/// Arguments of `report`.
#[derive(Debug, Args)]
pub struct ReportArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Output format.
    #[arg(long, value_enum, default_value_t = ReportFormat::Text)]
    pub format: ReportFormat,
    /// Only this screw variant (its label).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// Engine-rpm step of the operating table (default: chosen from the rpm range).
    #[arg(long, value_name = "RPM", allow_hyphen_values = true, value_parser = rpm_step)]
    pub step: Option<String>,
}

/// Arguments of `cruise`.
#[derive(Debug, Args)]
#[command(group(clap::ArgGroup::new("at").required(true).args(["speed", "rpm"])))]
pub struct CruiseArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Boat speed with its unit, e.g. 7kn or 3.6m/s.
    #[arg(long, value_name = "SPEED")]
    pub speed: Option<String>,
    /// Engine speed, rpm.
    #[arg(long, value_name = "RPM")]
    pub rpm: Option<String>,
    /// Screw variant label (default: the boat's active variant).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// Arguments of `check`.
#[derive(Debug, Args)]
pub struct CheckArgs {
    /// Profile files or names in the store (boats or engine sheets, told apart by their
    /// content; a boat also by its display name).
    #[arg(required = true, value_name = "FILE|NAME")]
    pub files: Vec<String>,
}

/// What `new` starts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum NewKind {
    /// A boat sheet (`boats/NAME.toml`).
    Boat,
    /// An engine sheet (`engines/NAME.toml`).
    Engine,
}

/// Arguments of `new`.
#[derive(Debug, Args)]
pub struct NewArgs {
    /// Boat or engine sheet.
    #[arg(value_enum)]
    pub kind: NewKind,
    /// The profile name: letters, digits, '-', '_' or '.' (the file is NAME.toml).
    pub name: String,
}

/// Arguments of `list`.
#[derive(Debug, Args)]
pub struct ListArgs {
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// Arguments of `openwater`.
#[derive(Debug, Args)]
pub struct OpenwaterArgs {
    /// Number of blades Z.
    #[arg(long, value_name = "Z")]
    pub blades: u32,
    /// Expanded blade area ratio AE/A0.
    #[arg(long, value_name = "AE/A0")]
    pub area_ratio: f64,
    /// Pitch ratio P/D.
    #[arg(long, value_name = "P/D")]
    pub pitch_ratio: f64,
    /// Blade-section Reynolds number at 0.75R for the full-scale correction (none: model scale).
    #[arg(long, value_name = "RN")]
    pub reynolds: Option<f64>,
    /// Advance ratios as a comma-separated list, e.g. 0.1,0.2,0.3.
    #[arg(
        long,
        value_name = "LIST",
        conflicts_with = "j_range",
        allow_hyphen_values = true
    )]
    pub j: Option<String>,
    /// Advance ratios as START:STOP:STEP, e.g. 0:1.2:0.05 (default 0:1.6:0.05).
    #[arg(long, value_name = "START:STOP:STEP", allow_hyphen_values = true)]
    pub j_range: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// Arguments of `trial`.
#[derive(Debug, Args)]
pub struct DesignArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Only this screw variant (its label).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// Also fit a constant wake fraction (kept only when it beats the resistance factor alone).
    #[arg(long)]
    pub fit_wake: bool,
    /// Save the fitted correction in the boat's [calibration] (the previous file is kept as
    /// NAME.toml.bak); every later prediction applies it. With `--import`, the runs found also
    /// replace the boat's [trial] log (dated from the log).
    #[arg(long)]
    pub save: bool,
    /// With --save, save the two-parameter fit (a factor varying with Froude number between
    /// the trial's slowest and fastest speeds) instead of the single factor.
    #[arg(long)]
    pub by_froude: bool,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
    /// Fit the steady runs found in this instrument log (NMEA 0183 or CSV) instead of the
    /// boat's [trial] log.
    #[arg(long, value_name = "FILE")]
    pub import: Option<PathBuf>,
    /// The log's format (default: detected from its content).
    #[arg(long, value_enum, value_name = "FORMAT", requires = "import")]
    pub log_format: Option<LogFormatArg>,
    /// Shortest steady run kept, seconds after the settling time (default 60).
    #[arg(long, value_name = "SECONDS", requires = "import")]
    pub min_run: Option<f64>,
    /// rpm held within this many rpm of a run's mean (default 25, or 1.5 % when larger).
    #[arg(long, value_name = "RPM", requires = "import")]
    pub rpm_tolerance: Option<f64>,
    /// Largest speed scatter (standard deviation of SOG) of a steady run, knots (default 0.25).
    #[arg(long, value_name = "KN", requires = "import")]
    pub max_scatter: Option<f64>,
}

/// The format of an instrument log.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum LogFormatArg {
    /// NMEA 0183 sentences, one a line.
    Nmea,
    /// CSV with a header naming columns and units.
    Csv,
}

/// Output format of `order`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum OrderFormat {
    /// Readable text.
    Text,
    /// A Markdown document (the same as the export's section).
    Md,
    /// JSON with SI values (or the unit in the field's name).
    Json,
}

/// Arguments of `order`.
#[derive(Debug, Args)]
pub struct OrderArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// The screw variant to order (default: the boat's active variant).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = OrderFormat::Text)]
    pub format: OrderFormat,
}

/// Arguments of `pitch`.
#[derive(Debug, Args)]
pub struct PitchArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Only this screw variant (its label).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// Target: absorb this percentage of rated power at rated rpm instead (above 100 overloads
    /// the engine and is warned about).
    #[arg(long, value_name = "PERCENT", conflicts_with = "light_running")]
    pub absorb: Option<f64>,
    /// Target: meet the full-load curve this many rpm above rated (a light-running screw;
    /// default: the boat's [match] light_running, 2 % of rated rpm; 0 asks for exactly rated rpm).
    #[arg(
        long,
        value_name = "RPM",
        allow_hyphen_values = true,
        value_parser = rpm_margin
    )]
    pub light_running: Option<f64>,
    /// Largest re-pitch, a length with its unit (default: the boat's, else 2in).
    #[arg(long, value_name = "LENGTH")]
    pub repitch_limit: Option<String>,
    /// Also limit the re-pitch to this percentage of the current pitch (the smaller applies).
    #[arg(long, value_name = "PERCENT")]
    pub repitch_fraction: Option<f64>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// What a sweep varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum SweepOver {
    /// Screw diameter up to the largest the aperture takes with its tip clearance.
    Diameter,
    /// Reduction gear ratio.
    Gear,
    /// Blade count.
    Blades,
    /// Expanded area ratio AE/A0.
    Area,
}

/// How sweep candidates are ranked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum RankBy {
    /// Least fuel per nautical mile at the target speed.
    Fuel,
    /// Highest top speed.
    Speed,
    /// Highest propulsive efficiency at the target speed.
    Efficiency,
}

/// Arguments of `sweep`.
#[derive(Debug, Args)]
pub struct SweepArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// The screw variant to start from (default: the boat's active variant).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// What to vary.
    #[arg(long, value_enum, default_value_t = SweepOver::Diameter)]
    pub over: SweepOver,
    /// Values to try, comma-separated (gear ratios, blade counts or area ratios; not diameter).
    #[arg(long, value_name = "LIST")]
    pub values: Option<String>,
    /// Ranking criterion.
    #[arg(long, value_enum, default_value_t = RankBy::Fuel)]
    pub rank: RankBy,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// Arguments of `conditions`.
#[derive(Debug, Args)]
pub struct ConditionsArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// The screw variant (default: the boat's active variant).
    #[arg(long, value_name = "LABEL")]
    pub variant: Option<String>,
    /// Added friction of the fouled-hull case, % of friction resistance.
    #[arg(
        long,
        value_name = "PERCENT",
        default_value_t = 30.0,
        allow_hyphen_values = true
    )]
    pub fouled: f64,
    /// Sea-state margin of the seaway case, % of total resistance.
    #[arg(
        long,
        value_name = "PERCENT",
        default_value_t = 30.0,
        allow_hyphen_values = true
    )]
    pub sea_margin: f64,
    /// Uncertainty band: displacement spread either side, %.
    #[arg(
        long,
        value_name = "PERCENT",
        default_value_t = 10.0,
        allow_hyphen_values = true
    )]
    pub spread: f64,
    /// Uncertainty band: wake-fraction shift either side (a fraction such as 0.05).
    #[arg(
        long,
        value_name = "W",
        default_value_t = 0.05,
        allow_hyphen_values = true
    )]
    pub wake_shift: f64,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// Arguments of `export`.
#[derive(Debug, Args)]
pub struct ExportArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Directory to write the report and charts into (created if missing).
    #[arg(long, value_name = "DIR")]
    pub out: PathBuf,
    /// md: report.md with one SVG file per chart; html: one self-contained report.html with
    /// the charts inline and a print stylesheet.
    #[arg(long, value_enum, default_value_t = ExportFormat::Md)]
    pub format: ExportFormat,
}

/// Output format of `export`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ExportFormat {
    /// report.md and one SVG file per chart.
    Md,
    /// One self-contained report.html: charts inline as SVG, nothing fetched, print-ready.
    Html,
}

/// A mistake on the command line found after parsing (an empty list, a malformed value).
#[derive(Debug, thiserror::Error)]
#[error("{0}")]
pub struct UsageError(pub String);

/// Raised by `check` when some files are invalid; the problems were already printed.
#[derive(Debug, thiserror::Error)]
#[error("{invalid} of {total} profile files are invalid")]
pub struct InvalidFiles {
    /// Number of invalid files.
    pub invalid: usize,
    /// Number of files checked.
    pub total: usize,
}

/// Everything a command needs from the global options.
#[derive(Debug, Clone)]
pub struct Context {
    /// The profile directory given by flag or environment, if any.
    pub profiles: Option<PathBuf>,
    /// The display unit system asked for, if any (otherwise the boat file's own).
    pub units: Option<UnitSystem>,
}

impl Context {
    /// The display system for a boat whose file is written in `file_units`.
    pub fn units_or(&self, file_units: UnitSystem) -> UnitSystem {
        self.units.unwrap_or(file_units)
    }
}

/// Runs the program with the process arguments and returns its exit code.
pub fn main_entry() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(err) => {
            // clap prints help and version to stdout with success, usage errors to stderr.
            let code = if err.use_stderr() {
                EXIT_USAGE
            } else {
                EXIT_OK
            };
            let _ = err.print();
            return ExitCode::from(code);
        }
    };
    let mut stdout = std::io::stdout().lock();
    match run(cli, &mut stdout) {
        Ok(()) => ExitCode::from(EXIT_OK),
        Err(err) => {
            if is_broken_pipe(&err) {
                // The reader went away (e.g. `| head`): not an error worth reporting.
                return ExitCode::from(EXIT_OK);
            }
            let _ = stdout.flush();
            let code = exit_code_for(&err);
            // writeln! rather than eprintln!: a terminal that hung up fails the write, and
            // eprintln! would panic on it.
            let mut stderr = std::io::stderr();
            let _ = if code != EXIT_INVALID_FILES || !err.is::<InvalidFiles>() {
                writeln!(stderr, "error: {err:#}")
            } else {
                writeln!(stderr, "{err}")
            };
            ExitCode::from(code)
        }
    }
}

/// The documented exit code for an error that ended a command.
pub fn exit_code_for(err: &anyhow::Error) -> u8 {
    if err.is::<InvalidFiles>() {
        EXIT_INVALID_FILES
    } else if err.chain().any(|cause| cause.is::<UsageError>()) {
        EXIT_USAGE
    } else {
        EXIT_RUNTIME
    }
}

fn is_broken_pipe(err: &anyhow::Error) -> bool {
    err.chain().any(|cause| {
        cause
            .downcast_ref::<std::io::Error>()
            .is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
    })
}

/// Runs one parsed command line, writing its output to `out`.
pub fn run(cli: Cli, out: &mut dyn Write) -> anyhow::Result<()> {
    // Set once, before anything is formatted (the terminal UI also follows the locale).
    crate::units::set_ascii(cli.ascii);
    let profiles = cli.profiles.or_else(|| {
        std::env::var_os(PROFILES_ENV)
            .filter(|v| !v.is_empty())
            .map(PathBuf::from)
    });
    let ctx = Context {
        profiles,
        units: cli.units.map(UnitSystem::from),
    };
    match cli.command {
        None => open_terminal_ui(&ctx, None),
        Some(Command::Open { boat, nmea: None }) => open_terminal_ui(&ctx, Some(&boat)),
        Some(Command::Open {
            boat,
            nmea: Some(text),
        }) => {
            let source = crate::instruments::feed::FeedSource::parse(&text)
                .map_err(|e| UsageError(format!("--nmea: {e}")))?;
            crate::tui::run_with_feed(
                &store::store(&ctx),
                Some(&boat),
                ctx.units,
                Some((text, source)),
            )
        }
        Some(Command::Report(args)) => boat::report(&ctx, &args, out),
        Some(Command::Cruise(args)) => boat::cruise(&ctx, &args, out),
        Some(Command::Check(args)) => store::check(&ctx, &args, out),
        Some(Command::List(args)) => store::list(&ctx, &args, out),
        Some(Command::Init) => store::init(&ctx, out),
        Some(Command::New(args)) => new::run(&ctx, &args, out),
        Some(Command::Openwater(args)) => openwater::run(&args, out),
        Some(Command::Resistance(args)) => boat::resistance(&ctx, &args, out),
        Some(Command::Pitch(args)) => design::pitch(&ctx, &args, out),
        Some(Command::Order(args)) => order::run(&ctx, &args, out),
        Some(Command::Sweep(args)) => design::sweep(&ctx, &args, out),
        Some(Command::Trial(args)) if args.import.is_some() => import::trial(&ctx, &args, out),
        Some(Command::Trial(args)) => design::trial(&ctx, &args, out),
        Some(Command::Installations(args)) => sides::installations(&ctx, &args, out),
        Some(Command::Conditions(args)) => conditions::run(&ctx, &args, out),
        Some(Command::Export(args)) => boat::export(&ctx, &args, out),
        Some(Command::Shortlist(args)) => shortlist::run(&ctx, &args, out),
        Some(Command::Completions(args)) => shell::completions(&args, out),
        Some(Command::Man(args)) => shell::man(&args, out),
        Some(Command::Screen(args)) => shell::screen(&ctx, &args, out),
    }
}

fn open_terminal_ui(ctx: &Context, boat: Option<&str>) -> anyhow::Result<()> {
    // A terminal whose locale is not UTF-8 cannot show box drawing, braille or "°".
    if !crate::units::locale_is_utf8() {
        crate::units::set_ascii(true);
    }
    crate::tui::run(&store::store(ctx), boat, ctx.units)
}

/// Builds the study of the boat named (or at the path) `boat` in the store the options point at.
pub(crate) fn load_study(ctx: &Context, boat: &str) -> anyhow::Result<Study> {
    Study::load(&store::store(ctx), boat, ctx.units)
}

/// The variant `--variant LABEL` names, else the active one; an unknown label is a usage error.
pub(crate) fn variant_or_active(study: &Study, label: Option<&str>) -> anyhow::Result<usize> {
    study
        .variant(label)
        .map_err(|e| UsageError(format!("--variant: {e}")).into())
}

/// The variant `--variant LABEL` names, else all; an unknown label is a usage error.
pub(crate) fn variants_or_all(study: &Study, label: Option<&str>) -> anyhow::Result<Vec<usize>> {
    study
        .variants(label)
        .map_err(|e| UsageError(format!("--variant: {e}")).into())
}

/// Checks an `--step` value: a positive engine speed, plain or with its unit ("100", "100rpm").
fn rpm_step(text: &str) -> Result<String, String> {
    match rpm_value(text) {
        Some(v) if v > 0.0 => Ok(text.to_owned()),
        _ => Err(format!("--step: expected a positive rpm step, got {text}")),
    }
}

/// Parses an `--light-running` margin, rpm: plain or with its unit ("100", "100rpm"); 0 and
/// negative margins are the command's to judge.
fn rpm_margin(text: &str) -> Result<f64, String> {
    rpm_value(text).ok_or_else(|| {
        format!("--light-running: expected an rpm margin such as 50 or 50rpm, got {text}")
    })
}

/// An engine speed, rpm, written plain or with its unit, if it is a finite number.
fn rpm_value(text: &str) -> Option<f64> {
    let trimmed = text.trim();
    trimmed
        .parse::<f64>()
        .ok()
        .or_else(|| crate::units::parse(trimmed, crate::units::Kind::Rotation).ok())
        .filter(|v| v.is_finite())
}

/// Parses an engine speed given as a plain number or with its unit ("1800", "1800 rpm").
pub(crate) fn parse_rpm(text: &str, option: &str) -> anyhow::Result<f64> {
    let trimmed = text.trim();
    let value = match trimmed.parse::<f64>() {
        Ok(v) => v,
        Err(_) => crate::units::parse(trimmed, crate::units::Kind::Rotation).map_err(|e| {
            UsageError(format!(
                "{option}: expected an engine speed in rpm such as 1800, got {text:?} ({e})"
            ))
        })?,
    };
    if !value.is_finite() || value <= 0.0 {
        return Err(UsageError(format!(
            "{option}: expected a positive engine speed in rpm, got {text:?}"
        ))
        .into());
    }
    Ok(value)
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    #[test]
    fn clap_definitions_are_consistent() {
        Cli::command().debug_assert();
    }

    #[test]
    fn usage_errors_map_to_exit_code_two_even_with_context() {
        let err = anyhow::Error::new(UsageError("bad".into())).context("while reading --j");
        assert_eq!(exit_code_for(&err), EXIT_USAGE);
        let err = anyhow::anyhow!("profile broken");
        assert_eq!(exit_code_for(&err), EXIT_RUNTIME);
        let err = anyhow::Error::new(InvalidFiles {
            invalid: 1,
            total: 2,
        });
        assert_eq!(exit_code_for(&err), EXIT_INVALID_FILES);
    }

    #[test]
    fn rpm_accepts_plain_numbers_and_rejects_nonsense() {
        assert_eq!(parse_rpm("1800", "--rpm").unwrap(), 1800.0);
        assert!(parse_rpm("-5", "--rpm").is_err());
        assert!(parse_rpm("0", "--rpm").is_err());
        assert!(parse_rpm("NaN", "--rpm").is_err());
    }

    #[test]
    fn cruise_needs_speed_or_rpm() {
        assert!(Cli::try_parse_from(["tidewright", "cruise", "boat"]).is_err());
        assert!(Cli::try_parse_from(["tidewright", "cruise", "boat", "--rpm", "1800"]).is_ok());
        assert!(
            Cli::try_parse_from([
                "tidewright",
                "cruise",
                "boat",
                "--rpm",
                "1",
                "--speed",
                "7kn"
            ])
            .is_err()
        );
    }
}
