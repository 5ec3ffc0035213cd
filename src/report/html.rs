//! The one-file report: the export's document ([`ExportDocument`], the same sections as the
//! Markdown export) as one self-contained XHTML page with the charts inline as SVG and a print
//! stylesheet. Nothing is fetched: no scripts, fonts, images or style sheets from anywhere.

mod markdown;

use super::export::ExportDocument;
use super::svg::escape;

/// Name of the HTML file in the export.
pub const HTML_FILE: &str = "report.html";

/// The page's style: the screen first, then print (A4 or Letter: the printer's own paper size,
/// margins that fit both, tables and figures never split across pages).
const STYLE: &str = "
body { font-family: sans-serif; font-size: 10.5pt; line-height: 1.35; color: #111;
  max-width: 62rem; margin: 1.5rem auto; padding: 0 1rem; }
h1 { font-size: 1.6em; margin: 0 0 0.4em; }
h2 { font-size: 1.25em; border-bottom: 1px solid #999; margin: 1.2em 0 0.4em; }
h3 { font-size: 1.05em; margin: 0.9em 0 0.3em; }
p, ul { margin: 0.3em 0 0.5em; }
table { border-collapse: collapse; margin: 0.3em 0 0.7em; font-size: 0.88em; }
th, td { border: 1px solid #bbb; padding: 0.1em 0.35em; vertical-align: top; }
th { background: #eef1f4; font-weight: 600; }
.num { text-align: right; font-variant-numeric: tabular-nums; }
pre { white-space: pre-wrap; font-size: 0.8em; background: #f5f5f5; border: 1px solid #ddd;
  padding: 0.35em 0.5em; margin: 0.3em 0 0.6em; }
code { font-size: 0.95em; }
blockquote, .caution { border-left: 4px solid #b03a2e; background: #fbf1ef; margin: 0.5em 0;
  padding: 0.3em 0.7em; }
nav ol { columns: 2; margin: 0.3em 0 0.6em; }
.charts { display: grid; grid-template-columns: repeat(auto-fill, minmax(22rem, 1fr));
  gap: 0.6rem; }
figure { margin: 0.4em 0; }
figure svg { display: block; width: 100%; height: auto; max-width: 760px; }
figcaption { font-size: 0.85em; color: #444; }
footer { margin-top: 2em; font-size: 0.8em; color: #555; }
@page { size: auto; margin: 10mm; }
@media print {
  body { font-size: 7pt; line-height: 1.2; max-width: none; margin: 0; padding: 0; }
  nav { display: none; }
  h2 { margin-top: 0.8em; break-after: avoid; page-break-after: avoid; }
  h3 { break-after: avoid; page-break-after: avoid; }
  table { font-size: 0.9em; }
  pre { font-size: 0.82em; background: none; }
  pre, figure, blockquote, tr { break-inside: avoid; page-break-inside: avoid; }
  .charts { grid-template-columns: 1fr 1fr 1fr; gap: 2mm; }
  .chart figure { width: 45%; }
  th { background: none; }
}
";

/// The report as one self-contained XHTML page (UTF-8).
pub fn to_html(doc: &ExportDocument) -> String {
    let chart = |name: &str| -> Option<String> {
        doc.charts
            .iter()
            .find(|file| file.name == name)
            .map(|file| inline_svg(&file.contents))
    };
    let title = escape(&doc.title);
    let mut html = String::from("<!DOCTYPE html>\n");
    html.push_str("<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\" xml:lang=\"en\">\n");
    html.push_str("<head>\n<meta charset=\"utf-8\"/>\n");
    html.push_str("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n");
    html.push_str(&format!(
        "<meta name=\"generator\" content=\"tidewright {}\"/>\n",
        env!("CARGO_PKG_VERSION")
    ));
    html.push_str(&format!(
        "<title>{title}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n"
    ));
    html.push_str(&format!("<header>\n<h1>{title}</h1>\n"));
    html.push_str(&format!(
        "<p class=\"caution\"><strong>Caution.</strong> {}</p>\n</header>\n",
        escape(&doc.caution)
    ));
    html.push_str("<nav>\n<ol>\n");
    for (index, section) in doc.sections.iter().enumerate() {
        html.push_str(&format!(
            "<li><a href=\"#{}\">{}</a></li>\n",
            anchor(index, &section.title),
            escape(&section.title)
        ));
    }
    html.push_str("</ol>\n</nav>\n");
    for (index, section) in doc.sections.iter().enumerate() {
        html.push_str(&format!(
            "<section id=\"{}\">\n<h2>{}</h2>\n{}</section>\n",
            anchor(index, &section.title),
            escape(&section.title),
            markdown::to_html(&section.body, &chart)
        ));
    }
    html.push_str(&format!(
        "<footer>Written by tidewright {}. All figures are estimates.</footer>\n</body>\n</html>\n",
        escape(crate::version_text())
    ));
    html
}

/// A chart file's SVG without its XML declaration, for inlining.
fn inline_svg(svg: &str) -> String {
    let svg = svg.trim_start();
    match svg.strip_prefix("<?xml") {
        Some(rest) => rest
            .split_once("?>")
            .map_or(svg, |(_, body)| body)
            .trim()
            .to_string(),
        None => svg.trim().to_string(),
    }
}

/// The section's id: its position and its title in lowercase ASCII words ("s3-pitch-recommendation").
fn anchor(index: usize, title: &str) -> String {
    let mut id = format!("s{}", index + 1);
    let mut dash = true;
    for c in title.chars() {
        if c.is_ascii_alphanumeric() {
            if dash {
                id.push('-');
            }
            id.push(c.to_ascii_lowercase());
            dash = false;
        } else {
            dash = true;
        }
    }
    id
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::export::{ExportFile, Section};

    fn doc() -> ExportDocument {
        ExportDocument {
            title: "Repower report: A & B".into(),
            caution: "Estimates only.".into(),
            sections: vec![
                Section {
                    title: "Engine sheet".into(),
                    body: "Rated 90 kW.\n".into(),
                },
                Section {
                    title: "Charts".into(),
                    body: "![Power](power.svg)\n".into(),
                },
            ],
            charts: vec![ExportFile {
                name: "power.svg".into(),
                contents: "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\"><title>Power</title></svg>\n".into(),
            }],
        }
    }

    #[test]
    fn the_page_is_well_formed_and_carries_every_section_and_chart() {
        let html = to_html(&doc());
        let parsed = roxmltree::Document::parse_with_options(
            &html,
            roxmltree::ParsingOptions {
                allow_dtd: true,
                ..Default::default()
            },
        )
        .expect("well-formed XHTML");
        let ids: Vec<&str> = parsed
            .descendants()
            .filter(|n| n.has_tag_name("section"))
            .filter_map(|n| n.attribute("id"))
            .collect();
        assert_eq!(ids, ["s1-engine-sheet", "s2-charts"]);
        assert_eq!(
            parsed
                .descendants()
                .filter(|n| n.tag_name().name() == "svg")
                .count(),
            1
        );
        assert!(
            !html.contains("<?xml"),
            "the chart's declaration is stripped"
        );
        assert!(html.contains("A &amp; B"));
    }

    #[test]
    fn anchors_are_plain_and_unique() {
        assert_eq!(
            anchor(0, "Sea-trial calibration"),
            "s1-sea-trial-calibration"
        );
        assert_ne!(anchor(1, "Shaft"), anchor(2, "Shaft"));
    }
}
