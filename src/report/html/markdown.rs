//! The Markdown subset the export's sections are written in ([`super::super::export::Section`]),
//! laid out as XHTML. Only what the export writes is understood; anything else stays a
//! paragraph of escaped text, so nothing a section holds is ever dropped or taken as markup.

use crate::report::svg::escape;

/// The HTML of one section body; `chart` returns the inline SVG of a chart named by an
/// `![title](NAME)` line, or `None` when the export has no such chart.
pub fn to_html(markdown: &str, chart: &dyn Fn(&str) -> Option<String>) -> String {
    let lines: Vec<&str> = markdown.lines().collect();
    let mut html = String::new();
    let mut paragraph: Vec<&str> = Vec::new();
    let mut i = 0;
    while i < lines.len() {
        let line = lines[i];
        let trimmed = line.trim_start();
        let block_start = trimmed.is_empty()
            || trimmed.starts_with("```")
            || trimmed.starts_with("### ")
            || trimmed.starts_with("- ")
            || trimmed.starts_with('|')
            || trimmed.starts_with("> ")
            || image(trimmed).is_some();
        if !block_start {
            paragraph.push(trimmed);
            i += 1;
            continue;
        }
        flush_paragraph(&mut paragraph, &mut html);
        if trimmed.is_empty() {
            i += 1;
        } else if trimmed.starts_with("```") {
            // The fence's language (`text`) only tells Markdown viewers not to highlight.
            let mut body = String::new();
            i += 1;
            while i < lines.len() && !lines[i].trim_start().starts_with("```") {
                body.push_str(lines[i]);
                body.push('\n');
                i += 1;
            }
            i += 1; // the closing fence (or the end of a body that forgot it)
            html.push_str(&format!("<pre>{}</pre>\n", escape(&body)));
        } else if let Some(heading) = trimmed.strip_prefix("### ") {
            html.push_str(&format!("<h3>{}</h3>\n", inline(heading)));
            i += 1;
        } else if trimmed.starts_with("- ") {
            html.push_str("<ul>\n");
            while i < lines.len() && lines[i].trim_start().starts_with("- ") {
                let item = &lines[i].trim_start()[2..];
                html.push_str(&format!("<li>{}</li>\n", inline(item)));
                i += 1;
            }
            html.push_str("</ul>\n");
        } else if trimmed.starts_with('|') {
            let start = i;
            while i < lines.len() && lines[i].trim_start().starts_with('|') {
                i += 1;
            }
            html.push_str(&table(&lines[start..i]));
        } else if trimmed.starts_with("> ") {
            let mut quote: Vec<&str> = Vec::new();
            while i < lines.len() && lines[i].trim_start().starts_with("> ") {
                quote.push(&lines[i].trim_start()[2..]);
                i += 1;
            }
            html.push_str(&format!(
                "<blockquote><p>{}</p></blockquote>\n",
                inline(&quote.join(" "))
            ));
        } else {
            // A run of chart lines (blank lines between them allowed) is one row of figures.
            let mut figures = Vec::new();
            while i < lines.len() {
                let next = lines[i].trim();
                if let Some((title, name)) = image(next) {
                    figures.push(figure(title, name, chart));
                    i += 1;
                    continue;
                }
                let more = next.is_empty()
                    && lines[i + 1..]
                        .iter()
                        .find(|l| !l.trim().is_empty())
                        .is_some_and(|l| image(l.trim()).is_some());
                if !more {
                    break;
                }
                i += 1;
            }
            let class = if figures.len() > 1 { "charts" } else { "chart" };
            html.push_str(&format!(
                "<div class=\"{class}\">\n{}</div>\n",
                figures.concat()
            ));
        }
    }
    flush_paragraph(&mut paragraph, &mut html);
    html
}

fn flush_paragraph(paragraph: &mut Vec<&str>, html: &mut String) {
    if !paragraph.is_empty() {
        html.push_str(&format!("<p>{}</p>\n", inline(&paragraph.join(" "))));
        paragraph.clear();
    }
}

/// `![title](name)` on a line of its own: the title (with Markdown escapes) and the file name.
fn image(line: &str) -> Option<(&str, &str)> {
    let rest = line.strip_prefix("![")?.strip_suffix(')')?;
    let (title, name) = rest.rsplit_once("](")?;
    (!name.is_empty() && !name.contains(char::is_whitespace)).then_some((title, name))
}

fn figure(title: &str, name: &str, chart: &dyn Fn(&str) -> Option<String>) -> String {
    match chart(name) {
        Some(svg) => format!(
            "<figure>\n{}\n<figcaption>{}</figcaption>\n</figure>\n",
            svg.trim(),
            inline(title)
        ),
        // Never a link to a file the one-file report does not carry.
        None => format!(
            "<figure><figcaption>{} (chart not drawn)</figcaption></figure>\n",
            inline(title)
        ),
    }
}

/// A pipe table: a header row, the rule row (`---:` right-aligns its column), body rows.
fn table(rows: &[&str]) -> String {
    let cells: Vec<Vec<String>> = rows.iter().map(|r| split_row(r)).collect();
    let is_rule = |row: &Vec<String>| {
        !row.is_empty()
            && row
                .iter()
                .all(|c| !c.is_empty() && c.chars().all(|ch| matches!(ch, '-' | ':')))
    };
    let Some(rule_at) = cells.iter().position(is_rule).filter(|&at| at == 1) else {
        // Not a table after all: keep the text.
        return format!("<p>{}</p>\n", inline(&rows.join(" ")));
    };
    let right: Vec<bool> = cells[rule_at]
        .iter()
        .map(|c| c.ends_with(':') && !c.starts_with(':'))
        .collect();
    let class = |col: usize| {
        if right.get(col).copied().unwrap_or(false) {
            " class=\"num\""
        } else {
            ""
        }
    };
    let mut html = String::from("<table>\n<thead><tr>");
    for (col, cell) in cells[0].iter().enumerate() {
        html.push_str(&format!("<th{}>{}</th>", class(col), inline(cell)));
    }
    html.push_str("</tr></thead>\n<tbody>\n");
    for row in &cells[2..] {
        html.push_str("<tr>");
        for (col, cell) in row.iter().enumerate() {
            html.push_str(&format!("<td{}>{}</td>", class(col), inline(cell)));
        }
        html.push_str("</tr>\n");
    }
    html.push_str("</tbody>\n</table>\n");
    html
}

/// The cells of `| a | b \| c |`, split at unescaped pipes; escapes stay for [`inline`].
fn split_row(row: &str) -> Vec<String> {
    let inner = row.trim();
    let inner = inner.strip_prefix('|').unwrap_or(inner);
    let inner = inner
        .strip_suffix('|')
        .filter(|i| !i.ends_with('\\'))
        .unwrap_or(inner);
    let mut cells = Vec::new();
    let mut cell = String::new();
    let mut chars = inner.chars();
    while let Some(c) = chars.next() {
        match c {
            '\\' => {
                cell.push('\\');
                if let Some(next) = chars.next() {
                    cell.push(next);
                }
            }
            '|' => cells.push(std::mem::take(&mut cell).trim().to_string()),
            c => cell.push(c),
        }
    }
    cells.push(cell.trim().to_string());
    cells
}

/// Inline Markdown as escaped XHTML: `**bold**`, `` `code` `` and backslash escapes.
fn inline(text: &str) -> String {
    let chars: Vec<char> = text.chars().collect();
    let mut html = String::new();
    let mut plain = String::new();
    let mut bold = false;
    let mut i = 0;
    let flush = |plain: &mut String, html: &mut String| {
        html.push_str(&escape(plain));
        plain.clear();
    };
    while i < chars.len() {
        match chars[i] {
            '\\' if i + 1 < chars.len() && chars[i + 1].is_ascii_punctuation() => {
                plain.push(chars[i + 1]);
                i += 2;
            }
            '`' => match chars[i + 1..].iter().position(|&c| c == '`') {
                Some(len) => {
                    flush(&mut plain, &mut html);
                    let code: String = chars[i + 1..i + 1 + len].iter().collect();
                    html.push_str(&format!("<code>{}</code>", escape(&code)));
                    i += len + 2;
                }
                None => {
                    plain.push('`');
                    i += 1;
                }
            },
            '*' if chars.get(i + 1) == Some(&'*')
                && (bold || chars[i + 2..].windows(2).any(|w| w == ['*', '*'])) =>
            {
                flush(&mut plain, &mut html);
                html.push_str(if bold { "</strong>" } else { "<strong>" });
                bold = !bold;
                i += 2;
            }
            c => {
                plain.push(c);
                i += 1;
            }
        }
    }
    flush(&mut plain, &mut html);
    if bold {
        html.push_str("</strong>");
    }
    html
}

#[cfg(test)]
mod tests {
    use super::*;

    fn no_charts(_: &str) -> Option<String> {
        None
    }

    #[test]
    fn inline_markup_is_escaped_and_converted() {
        assert_eq!(
            inline("**Recommended** a < b & `x|y` \\* \\|"),
            "<strong>Recommended</strong> a &lt; b &amp; <code>x|y</code> * |"
        );
        // A lone `**` or backtick is text, not an unclosed tag.
        assert_eq!(inline("2 ** 3 `"), "2 ** 3 `");
    }

    #[test]
    fn tables_split_at_unescaped_pipes_and_align_numbers() {
        let md = "| name | speed (kn) |\n| :--- | ---: |\n| a \\| b | 7.0 |\n";
        let html = to_html(md, &no_charts);
        assert!(
            html.contains("<th>name</th><th class=\"num\">speed (kn)</th>"),
            "{html}"
        );
        assert!(
            html.contains("<td>a | b</td><td class=\"num\">7.0</td>"),
            "{html}"
        );
    }

    #[test]
    fn blocks_become_their_elements() {
        let md = "Intro line\nwrapped.\n\n### Screw a\n\n- one\n- two\n\n```text\n  x < y\n```\n\n> **Caution.** decide\n";
        let html = to_html(md, &no_charts);
        for want in [
            "<p>Intro line wrapped.</p>",
            "<h3>Screw a</h3>",
            "<ul>\n<li>one</li>\n<li>two</li>\n</ul>",
            "<pre>  x &lt; y\n</pre>",
            "<blockquote><p><strong>Caution.</strong> decide</p></blockquote>",
        ] {
            assert!(html.contains(want), "{want} missing from {html}");
        }
    }

    #[test]
    fn chart_lines_are_inlined_and_an_unknown_chart_is_never_linked() {
        let svg = |name: &str| (name == "a.svg").then(|| "<svg><title>A</title></svg>".to_string());
        let html = to_html("![A chart](a.svg)\n\n![B chart](b.svg)\n", &svg);
        assert!(html.contains("<div class=\"charts\">"), "{html}");
        assert!(html.contains("<svg><title>A</title></svg>"));
        assert!(html.contains("B chart (chart not drawn)"));
        assert!(!html.contains("b.svg") && !html.contains("src=") && !html.contains("href="));
    }
}
