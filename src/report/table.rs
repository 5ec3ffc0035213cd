//! A plain table of strings rendered three ways: aligned text, CSV and Markdown.

/// How a column's cells line up in text output.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Align {
    /// Flush left (labels).
    Left,
    /// Flush right (numbers).
    Right,
}

/// One column: its heading, the unit its cells are in (may be empty) and its alignment.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Column {
    /// The heading, e.g. "speed".
    pub heading: String,
    /// The unit of every cell, e.g. "kn"; empty for a dimensionless or text column.
    pub unit: String,
    /// Text alignment.
    pub align: Align,
}

impl Column {
    /// A right-aligned numeric column with a unit.
    pub fn number(heading: &str, unit: &str) -> Self {
        Self {
            heading: heading.into(),
            unit: unit.into(),
            align: Align::Right,
        }
    }
    /// A left-aligned text column.
    pub fn text(heading: &str) -> Self {
        Self {
            heading: heading.into(),
            unit: String::new(),
            align: Align::Left,
        }
    }
    /// "heading (unit)", or just the heading when there is no unit.
    pub fn heading_with_unit(&self) -> String {
        if self.unit.is_empty() {
            self.heading.clone()
        } else {
            format!("{} ({})", self.heading, self.unit)
        }
    }
}

/// A table of already formatted cells; rows shorter than the columns are padded with blanks.
#[derive(Debug, Clone, PartialEq, Eq, Default)]
pub struct Table {
    /// The columns.
    pub columns: Vec<Column>,
    /// The rows of cells.
    pub rows: Vec<Vec<String>>,
}

impl Table {
    /// An empty table with these columns.
    pub fn new(columns: Vec<Column>) -> Self {
        Self {
            columns,
            rows: Vec::new(),
        }
    }

    /// Appends a row.
    pub fn push(&mut self, row: Vec<String>) {
        self.rows.push(row);
    }

    fn cell(&self, row: &[String], index: usize) -> String {
        row.get(index).cloned().unwrap_or_default()
    }

    /// Aligned text: a heading line, a unit line, then the rows; every line starts with `indent`.
    pub fn to_text(&self, indent: &str) -> String {
        let count = self.columns.len();
        let mut widths: Vec<usize> = self
            .columns
            .iter()
            .map(|c| c.heading.chars().count().max(c.unit.chars().count()))
            .collect();
        for row in &self.rows {
            for (i, width) in widths.iter_mut().enumerate() {
                *width = (*width).max(self.cell(row, i).chars().count());
            }
        }
        let line = |cells: Vec<String>| -> String {
            let parts: Vec<String> = (0..count)
                .map(|i| {
                    let cell = &cells[i];
                    let pad = widths[i].saturating_sub(cell.chars().count());
                    match self.columns[i].align {
                        Align::Left => format!("{cell}{}", " ".repeat(pad)),
                        Align::Right => format!("{}{cell}", " ".repeat(pad)),
                    }
                })
                .collect();
            format!("{indent}{}\n", parts.join("  ").trim_end())
        };
        let mut out = line(self.columns.iter().map(|c| c.heading.clone()).collect());
        if self.columns.iter().any(|c| !c.unit.is_empty()) {
            out.push_str(&line(self.columns.iter().map(|c| c.unit.clone()).collect()));
        }
        for row in &self.rows {
            out.push_str(&line((0..count).map(|i| self.cell(row, i)).collect()));
        }
        out
    }

    /// CSV (RFC 4180 quoting): one header line "heading (unit)", then the rows.
    pub fn to_csv(&self) -> String {
        let mut out = String::new();
        let header: Vec<String> = self
            .columns
            .iter()
            .map(|c| csv_field(&c.heading_with_unit()))
            .collect();
        out.push_str(&header.join(","));
        out.push_str("\r\n");
        for row in &self.rows {
            let cells: Vec<String> = (0..self.columns.len())
                .map(|i| csv_field(&self.cell(row, i)))
                .collect();
            out.push_str(&cells.join(","));
            out.push_str("\r\n");
        }
        out
    }

    /// A GitHub-flavoured Markdown pipe table.
    pub fn to_markdown(&self) -> String {
        let mut out = String::new();
        let header: Vec<String> = self
            .columns
            .iter()
            .map(|c| md_cell(&c.heading_with_unit()))
            .collect();
        out.push_str(&format!("| {} |\n", header.join(" | ")));
        let rule: Vec<&str> = self
            .columns
            .iter()
            .map(|c| {
                if c.align == Align::Right {
                    "---:"
                } else {
                    ":---"
                }
            })
            .collect();
        out.push_str(&format!("| {} |\n", rule.join(" | ")));
        for row in &self.rows {
            let cells: Vec<String> = (0..self.columns.len())
                .map(|i| md_cell(&self.cell(row, i)))
                .collect();
            out.push_str(&format!("| {} |\n", cells.join(" | ")));
        }
        out
    }
}

/// Quotes a CSV field when it holds a comma, quote or line break.
pub fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_string()
    }
}

/// Escapes what would break a Markdown table cell.
pub fn md_cell(text: &str) -> String {
    text.replace('|', "\\|").replace(['\n', '\r'], " ")
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> Table {
        let mut t = Table::new(vec![Column::text("variant"), Column::number("speed", "kn")]);
        t.push(vec!["a, \"b\"".into(), "7.2".into()]);
        t.push(vec!["long label|x".into(), "10.25".into()]);
        t
    }

    #[test]
    fn text_aligns_numbers_right() {
        let text = sample().to_text("");
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(lines.len(), 4);
        assert!(lines[1].ends_with("kn"));
        assert!(lines[2].ends_with("  7.2"), "{text}");
        assert!(lines[3].ends_with("10.25"));
    }

    #[test]
    fn csv_quotes_commas_and_quotes() {
        let csv = sample().to_csv();
        assert!(csv.starts_with("variant,speed (kn)\r\n"));
        assert!(csv.contains("\"a, \"\"b\"\"\",7.2"));
    }

    #[test]
    fn markdown_escapes_pipes() {
        let md = sample().to_markdown();
        assert!(md.contains("long label\\|x"));
        assert!(md.contains("| :--- | ---: |"));
    }
}
