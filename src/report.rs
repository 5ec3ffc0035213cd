//! Reports of solved boats: text, CSV, JSON, Markdown and SVG charts.
