//! What an installed command-line tool carries beside its commands: shell completions, the
//! manual pages (both generated from the clap definitions, never written by hand) and a
//! headless draw of the terminal UI for smoke tests on machines without a terminal.

use std::io::Write;
use std::path::PathBuf;

use anyhow::Context as _;
use clap::{Args, CommandFactory};

use super::{Cli, Context, store};

/// Arguments of `completions`.
#[derive(Debug, Args)]
pub struct CompletionsArgs {
    /// The shell to write the completion script for.
    #[arg(value_enum)]
    pub shell: clap_complete::Shell,
}

/// Arguments of `man`.
#[derive(Debug, Args)]
pub struct ManArgs {
    /// Write tidewright.1 and one page per subcommand (tidewright-report.1, …) into DIR
    /// (created if missing) instead of printing the main page.
    #[arg(long, value_name = "DIR")]
    pub out: Option<PathBuf>,
}

/// Arguments of `screen`.
#[derive(Debug, Args)]
pub struct ScreenArgs {
    /// A boat name in the profile store, or a path to a boat file (default: the first boat,
    /// as the terminal UI opens).
    pub boat: Option<String>,
    /// Size of the drawn screen in cells, WIDTHxHEIGHT.
    #[arg(long, default_value = "80x24", value_parser = screen_size)]
    pub size: (u16, u16),
}

/// The program's name as the shells and man pages know it.
const BIN: &str = "tidewright";

/// Largest screen `screen --size` draws, cells per side (a typo such as 8000x24 is refused
/// rather than allocating a huge buffer).
const MAX_SCREEN_CELLS: u16 = 1000;

/// `completions SHELL`: the completion script on standard output.
pub fn completions(args: &CompletionsArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    clap_complete::generate(args.shell, &mut Cli::command(), BIN, out);
    Ok(())
}

/// `man [--out DIR]`: the manual page(s) in roff.
pub fn man(args: &ManArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let command = Cli::command().name(BIN);
    let Some(dir) = &args.out else {
        clap_mangen::Man::new(command).render(out)?;
        return Ok(());
    };
    std::fs::create_dir_all(dir).with_context(|| format!("cannot create {}", dir.display()))?;
    let mut pages = vec![(format!("{BIN}.1"), command.clone())];
    for sub in command.get_subcommands().filter(|s| !s.is_hide_set()) {
        let name = format!("{BIN}-{}", sub.get_name());
        pages.push((format!("{name}.1"), sub.clone().name(name)));
    }
    for (file, page) in pages {
        let mut roff = Vec::new();
        clap_mangen::Man::new(page).render(&mut roff)?;
        let path = dir.join(&file);
        std::fs::write(&path, roff).with_context(|| format!("cannot write {}", path.display()))?;
        writeln!(out, "wrote {}", path.display())?;
    }
    Ok(())
}

/// `screen [BOAT] --size WxH`: the terminal UI's first screen as text.
pub fn screen(ctx: &Context, args: &ScreenArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let (width, height) = args.size;
    let text = crate::tui::draw_headless(
        &store::store(ctx),
        args.boat.as_deref(),
        ctx.units,
        width,
        height,
    )?;
    out.write_all(text.as_bytes())?;
    Ok(())
}

/// Parses `--size WIDTHxHEIGHT` ("80x24").
fn screen_size(text: &str) -> Result<(u16, u16), String> {
    let bad = || format!("--size: expected WIDTHxHEIGHT in cells such as 80x24, got {text:?}");
    let (w, h) = text.trim().split_once(['x', 'X']).ok_or_else(bad)?;
    let cells = |part: &str| {
        part.trim()
            .parse::<u16>()
            .ok()
            .filter(|&n| (1..=MAX_SCREEN_CELLS).contains(&n))
    };
    match (cells(w), cells(h)) {
        (Some(w), Some(h)) => Ok((w, h)),
        _ => Err(bad()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn screen_size_parses_and_refuses_nonsense() {
        assert_eq!(screen_size("80x24"), Ok((80, 24)));
        assert_eq!(screen_size(" 120X40 "), Ok((120, 40)));
        for bad in ["80", "x24", "0x24", "80x", "80x-1", "8000x24", "axb"] {
            let err = screen_size(bad).unwrap_err();
            assert!(
                err.contains("--size") && err.contains("80x24"),
                "{bad}: {err}"
            );
        }
    }
}
