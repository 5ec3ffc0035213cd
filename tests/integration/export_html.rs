//! `export --format html`: one self-contained page with the Markdown export's sections, and
//! the install helpers (`completions`, `man`, `screen`, `--version`). Structural checks only:
//! the solver's numbers are the Markdown export's and are checked there.

use assert_cmd::Command;
use predicates::prelude::*;

fn tidewright() -> Command {
    let mut cmd = Command::cargo_bin("tidewright").expect("binary built");
    cmd.env_remove("TIDEWRIGHT_PROFILES").env("NO_COLOR", "1");
    cmd
}

/// Exports `boat` of the demo fleet in `format` into a new folder and returns it.
fn export(boat: &str, format: &str) -> tempfile::TempDir {
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("no-store");
    tidewright()
        .arg("--profiles")
        .arg(&store)
        .args(["export", boat, "--format", format, "--out"])
        .arg(dir.path().join("out"))
        .assert()
        .success();
    dir
}

fn parse(html: &str) -> roxmltree::Document<'_> {
    let options = roxmltree::ParsingOptions {
        allow_dtd: true,
        ..Default::default()
    };
    roxmltree::Document::parse_with_options(html, options)
        .unwrap_or_else(|e| panic!("report.html is not well-formed XHTML: {e}"))
}

fn text_of(node: roxmltree::Node) -> String {
    node.descendants()
        .filter(|n| n.is_text())
        .filter_map(|n| n.text())
        .collect()
}

#[test]
fn html_export_is_one_file_with_the_markdown_sections_and_inline_charts() {
    for boat in ["pintle", "samphire"] {
        let md_dir = export(boat, "md");
        let html_dir = export(boat, "html");
        let files: Vec<String> = std::fs::read_dir(html_dir.path().join("out"))
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        assert_eq!(
            files,
            ["report.html"],
            "{boat}: one file, nothing beside it"
        );
        let md = std::fs::read_to_string(md_dir.path().join("out/report.md")).unwrap();
        let html = std::fs::read_to_string(html_dir.path().join("out/report.html")).unwrap();
        let doc = parse(&html);

        // The same section list, in the same order, as the Markdown export of the same boat.
        let md_sections: Vec<&str> = md.lines().filter_map(|l| l.strip_prefix("## ")).collect();
        let html_sections: Vec<String> = doc
            .descendants()
            .filter(|n| n.has_tag_name("h2"))
            .map(text_of)
            .collect();
        assert_eq!(
            html_sections, md_sections,
            "{boat}: sections differ from report.md"
        );
        let md_screws = md.lines().filter(|l| l.starts_with("### Screw ")).count();
        let html_screws = doc
            .descendants()
            .filter(|n| n.has_tag_name("h3") && text_of(*n).starts_with("Screw "))
            .count();
        assert_eq!(html_screws, md_screws, "{boat}: one subsection per screw");
        for section in [
            "Engine sheet",
            "Installation and trip",
            "Screws and match",
            "Pitch recommendation",
            "Repower shortlist",
            "Charts",
            "Caution",
        ] {
            assert!(
                html_sections.iter().any(|s| s == section),
                "{boat}: {section} missing"
            );
        }
        let body = text_of(doc.root_element());
        for needle in [
            "Cavitation and blade loading", // checks
            "rpm per inch",                 // pitch advice
            "Recommended screw",
            "calibration",
            "licensed marine surveyor or naval architect", // the caution
        ] {
            assert!(body.contains(needle), "{boat}: {needle:?} missing");
        }
        // The cruise line of each variant ("At 6.0 kn: …") and its operating table.
        let md_cruise = md.lines().filter(|l| l.starts_with("- At ")).count();
        let html_cruise = doc
            .descendants()
            .filter(|n| n.has_tag_name("li") && text_of(*n).starts_with("At "))
            .count();
        assert!(
            md_cruise > 0 && html_cruise == md_cruise,
            "{boat}: cruise lines"
        );
        let md_tables = md
            .lines()
            .filter(|l| l.starts_with("| ---:") || l.starts_with("| :---"))
            .count();
        let tables = doc
            .descendants()
            .filter(|n| n.has_tag_name("table"))
            .count();
        assert_eq!(
            tables, md_tables,
            "{boat}: every Markdown table is an HTML table"
        );
        // No Markdown left over in the text.
        for leftover in ["**", "```", "](", "| ---"] {
            assert!(
                !body.contains(leftover),
                "{boat}: Markdown {leftover:?} left in the page"
            );
        }

        // Every chart inline, an <svg> with axes, axis labels and a legend.
        let charts: Vec<_> = doc
            .descendants()
            .filter(|n| n.has_tag_name("svg"))
            .collect();
        let md_charts = md.matches(".svg)").count();
        assert!(
            md_charts >= 5,
            "{boat}: the Markdown export names its charts"
        );
        assert_eq!(
            charts.len(),
            md_charts,
            "{boat}: one inline chart per chart file"
        );
        for svg in &charts {
            let class = |c: &str| {
                svg.descendants()
                    .filter(|n| n.attribute("class") == Some(c))
                    .map(text_of)
                    .collect::<Vec<_>>()
            };
            assert_eq!(class("axes").len(), 1, "{boat}: a chart without axes");
            for label in ["x-label", "y-label"] {
                let text = class(label);
                assert!(
                    text.len() == 1 && text[0].contains('('),
                    "{boat}: {label} with its unit: {text:?}"
                );
            }
            assert!(!class("legend").concat().is_empty(), "{boat}: legend");
        }

        // Self-contained: no script, no link to anything outside the page.
        for node in doc.descendants().filter(|n| n.is_element()) {
            let tag = node.tag_name().name();
            assert!(
                !["script", "link", "img", "iframe", "object", "embed", "base"].contains(&tag),
                "{boat}: <{tag}> in a self-contained page"
            );
            for attr in node.attributes() {
                let name = attr.name();
                if name == "src" || name == "href" || name.ends_with(":href") {
                    assert!(
                        attr.value().starts_with('#'),
                        "{boat}: {name}={:?} points outside the page",
                        attr.value()
                    );
                }
                assert!(!name.starts_with("on"), "{boat}: event handler {name}");
            }
        }
        let style = doc
            .descendants()
            .find(|n| n.has_tag_name("style"))
            .map(text_of)
            .expect("a style sheet");
        assert!(style.contains("@media print") && style.contains("@page"));
        assert!(!style.contains("url(") && !style.contains("@import"));
        assert!(!html.contains("NaN"));
    }
}

#[test]
fn an_unknown_export_format_is_a_usage_error() {
    tidewright()
        .args([
            "export",
            "pintle",
            "--out",
            "/nonexistent",
            "--format",
            "pdf",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("pdf"));
}

#[test]
fn completions_are_written_for_each_shell() {
    for (shell, marker) in [
        ("bash", "complete -F"),
        ("zsh", "#compdef tidewright"),
        ("fish", "complete -c tidewright"),
    ] {
        let out = tidewright().args(["completions", shell]).assert().success();
        let script = String::from_utf8(out.get_output().stdout.clone()).unwrap();
        assert!(script.contains(marker), "{shell}: {marker} missing");
        // The subcommands come from the clap definitions, the new ones included.
        for command in ["report", "shortlist", "export", "completions"] {
            assert!(script.contains(command), "{shell}: {command} not completed");
        }
    }
    tidewright()
        .args(["completions", "tcsh"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("tcsh"));
}

#[test]
fn man_pages_come_from_the_clap_definitions() {
    let out = tidewright().arg("man").assert().success();
    let page = String::from_utf8(out.get_output().stdout.clone()).unwrap();
    assert!(page.contains(".TH tidewright 1"), "{page}");
    for needle in [".SH NAME", ".SH SYNOPSIS", "shortlist", "\\-\\-profiles"] {
        assert!(page.contains(needle), "{needle} missing from the man page");
    }
    let dir = tempfile::tempdir().unwrap();
    tidewright()
        .args(["man", "--out"])
        .arg(dir.path())
        .assert()
        .success();
    for name in ["tidewright.1", "tidewright-export.1", "tidewright-report.1"] {
        let page = std::fs::read_to_string(dir.path().join(name)).unwrap();
        assert!(page.starts_with(".ie") || page.contains(".TH"), "{name}");
    }
    let export = std::fs::read_to_string(dir.path().join("tidewright-export.1")).unwrap();
    assert!(export.contains("html"), "the export page names its formats");
}

#[test]
fn version_names_the_package_version() {
    let out = tidewright().arg("--version").assert().success();
    let line = String::from_utf8(out.get_output().stdout.clone()).unwrap();
    assert!(
        line.starts_with(&format!("tidewright {}", env!("CARGO_PKG_VERSION"))),
        "{line}"
    );
    // In a git checkout the build names its commit (hex); elsewhere the version stands alone.
    if let Some(commit) = line.split("(commit ").nth(1) {
        let hash = commit.trim().trim_end_matches(')');
        assert!(
            hash.len() >= 7 && hash.bytes().all(|b| b.is_ascii_hexdigit()),
            "{line}"
        );
    }
}

#[test]
fn screen_draws_the_terminal_ui_once_without_a_terminal() {
    let out = tidewright()
        .args(["screen", "marram", "--size", "80x24"])
        .assert()
        .success();
    let text = String::from_utf8(out.get_output().stdout.clone()).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), 24);
    assert!(lines.iter().all(|l| l.chars().count() <= 80));
    assert!(
        lines[0].contains("marram") && text.contains("Screw"),
        "{text}"
    );
    assert!(
        text.contains("licensed marine surveyor"),
        "the caution is on screen"
    );
    tidewright()
        .args(["screen", "marram", "--size", "80by24"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("WIDTHxHEIGHT"));
    tidewright()
        .args(["screen", "no-such-boat"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("no-such-boat"));
}
