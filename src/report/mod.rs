//! Reports for people and programs: plain-text tables in the model's units, and JSON in SI
//! base units with the unit of every field stated in the document.
//!
//! The modules here build each document's forms (tables, text, the JSON writer); the
//! exporters of [`export`], one per format, choose, compose and write them. Every report
//! carries [`CAUTION`].

pub mod approx;
pub mod check;
pub mod combos;
pub mod compare;
pub mod diagram;
pub mod export;
pub mod handoff;
pub mod html;
pub mod json;
pub mod page;
pub mod service;
pub mod solve;
pub mod starter;
pub mod summary;
pub mod svg;
pub mod svg_forces;

use std::sync::atomic::{AtomicUsize, Ordering};

use tabled::builder::Builder;
use tabled::settings::Style;
use tabled::settings::style::HorizontalLine;

pub use crate::caution::CAUTION;

/// Output format of a report.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum, strum::Display, strum::EnumString,
)]
#[strum(serialize_all = "kebab-case")]
pub enum OutputFormat {
    /// Aligned plain-text tables in the model's units.
    #[default]
    Table,
    /// JSON in SI base units, with stable keys.
    Json,
    /// Comma-separated values.
    Csv,
}

/// Output format of `check`.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum, strum::Display, strum::EnumString,
)]
#[strum(serialize_all = "kebab-case")]
pub enum CheckFormat {
    /// The one-page summary as aligned plain-text tables in the model's units.
    #[default]
    Table,
    /// One JSON document in SI base units: summary, envelope and per-case detail.
    Json,
    /// One CSV file per table (write them with -o DIR), in the model's units.
    Csv,
    /// A calculation-package page in Markdown.
    Md,
}

/// Width of text output when neither `COLUMNS` nor a terminal says otherwise (issue 20).
pub const DEFAULT_TEXT_WIDTH: usize = 120;

/// The narrowest width text is fitted to: below it a table cannot stay readable.
pub const MIN_TEXT_WIDTH: usize = 40;

static TEXT_WIDTH: AtomicUsize = AtomicUsize::new(DEFAULT_TEXT_WIDTH);

/// Set the width that [`table_of`] and [`wrap_text`] fit text to (`main` sets it from
/// `COLUMNS` or the terminal); at least [`MIN_TEXT_WIDTH`].
pub fn set_text_width(width: usize) {
    TEXT_WIDTH.store(width.max(MIN_TEXT_WIDTH), Ordering::Relaxed);
}

/// The width text output is fitted to ([`DEFAULT_TEXT_WIDTH`] unless set).
pub fn text_width() -> usize {
    TEXT_WIDTH.load(Ordering::Relaxed)
}

/// A plain table of our own style (no frame, a dashed rule under the header row) fitted to
/// [`text_width`]: see [`table_fitting`].
pub fn table_of<S: AsRef<str>>(header: &[S], rows: Vec<Vec<String>>) -> String {
    table_fitting(header, rows, text_width())
}

/// A plain table of our own style, no line wider than `width` columns (when the columns
/// can be that narrow). A table too wide is fitted by [`column_widths`]: the widest columns
/// give way first, words are broken only when the columns cannot fit otherwise, and a
/// wrapped row continues on the next lines with the other cells blank. A table whose
/// columns cannot fit side by side even at their longest words is printed in parts
/// ([`column_panels`]), each repeating the first column. No line ends in spaces.
pub fn table_fitting<S: AsRef<str>>(header: &[S], rows: Vec<Vec<String>>, width: usize) -> String {
    let mut cells: Vec<Vec<String>> = vec![header.iter().map(|s| s.as_ref().to_string()).collect()];
    cells.extend(rows);
    let columns = cells.iter().map(Vec::len).max().unwrap_or(0);
    let words: Vec<usize> = (0..columns)
        .map(|c| column_extent(&cells, c, longest_word))
        .collect();
    column_panels(&words, width)
        .iter()
        .map(|panel| {
            let part: Vec<Vec<String>> = cells
                .iter()
                .map(|r| {
                    panel
                        .iter()
                        .map(|&c| r.get(c).cloned().unwrap_or_default())
                        .collect()
                })
                .collect();
            fitted_table(part, width)
        })
        .collect::<Vec<_>>()
        .join("\n\n")
}

/// Width of the spaces around `columns` columns: one either side of each, and one between.
fn frame_width(columns: usize) -> usize {
    3 * columns.saturating_sub(1) + 2
}

/// The columns of a table in parts that each fit `width` at the columns' longest words
/// (`words`); every part after the first starts with column 0, the row's key. One part when
/// the whole table fits.
pub fn column_panels(words: &[usize], width: usize) -> Vec<Vec<usize>> {
    let span =
        |cols: &[usize]| cols.iter().map(|&c| words[c]).sum::<usize>() + frame_width(cols.len());
    let mut panels = Vec::new();
    let mut current: Vec<usize> = (0..words.len().min(1)).collect();
    for c in 1..words.len() {
        current.push(c);
        if current.len() > 2 && span(&current) > width {
            current.pop();
            panels.push(std::mem::replace(&mut current, vec![0, c]));
        }
    }
    panels.push(current);
    panels
}

/// One table (header row first) fitted to `width` by [`column_widths`] and rendered.
fn fitted_table(mut cells: Vec<Vec<String>>, width: usize) -> String {
    let columns = cells.iter().map(Vec::len).max().unwrap_or(0);
    let natural: Vec<usize> = (0..columns)
        .map(|c| column_extent(&cells, c, display_width))
        .collect();
    let words: Vec<usize> = (0..columns)
        .map(|c| column_extent(&cells, c, longest_word))
        .collect();
    let fitted = column_widths(&natural, &words, width.saturating_sub(frame_width(columns)));
    if fitted != natural {
        for row in &mut cells {
            for (c, cell) in row.iter_mut().enumerate() {
                *cell = wrap_cell(cell, fitted[c]);
            }
        }
    }
    let mut b = Builder::default();
    for r in cells {
        b.push_record(r);
    }
    let mut t = b.build();
    t.with(Style::blank().horizontals([(1, HorizontalLine::new('-').intersection(' '))]));
    // The padding of the last column would leave trailing spaces on every row.
    t.to_string()
        .lines()
        .map(str::trim_end)
        .collect::<Vec<_>>()
        .join("\n")
}

/// The largest `measure` over the lines of column `c`'s cells.
fn column_extent(cells: &[Vec<String>], c: usize, measure: impl Fn(&str) -> usize) -> usize {
    cells
        .iter()
        .filter_map(|r| r.get(c))
        .flat_map(|cell| cell.lines())
        .map(&measure)
        .max()
        .unwrap_or(0)
}

/// The width of the longest word (run without spaces) of `text`.
fn longest_word(text: &str) -> usize {
    text.split(' ').map(display_width).max().unwrap_or(0)
}

/// The display width of `text` in terminal columns.
fn display_width(text: &str) -> usize {
    textwrap::core::display_width(text)
}

/// Column widths whose sum is at most `room`: the `natural` widths when they fit, else the
/// widest column narrowed one step at a time, first no narrower than its longest word
/// (`words`), then, if that is not enough, down to `MIN_COLUMN`.
pub fn column_widths(natural: &[usize], words: &[usize], room: usize) -> Vec<usize> {
    let mut w = natural.to_vec();
    for floor in [words.to_vec(), vec![MIN_COLUMN; natural.len()]] {
        while w.iter().sum::<usize>() > room {
            let widest = (0..w.len())
                .filter(|&c| w[c] > floor[c].max(MIN_COLUMN))
                .max_by_key(|&c| (w[c], std::cmp::Reverse(c)));
            match widest {
                Some(c) => w[c] -= 1,
                None => break,
            }
        }
    }
    w
}

/// The narrowest a column is made.
const MIN_COLUMN: usize = 4;

/// A cell wrapped at spaces to `width` (words longer than that broken).
fn wrap_cell(cell: &str, width: usize) -> String {
    cell.lines()
        .flat_map(|l| textwrap::wrap(l, wrap_options(width)))
        .collect::<Vec<_>>()
        .join("\n")
}

/// Wrapping at spaces only (never at a hyphen or slash inside an id such as
/// `2.3.1-4b/WL`), breaking a word only when it is longer than the line.
fn wrap_options<'a>(width: usize) -> textwrap::Options<'a> {
    textwrap::Options::new(width.max(1))
        .word_separator(textwrap::WordSeparator::AsciiSpace)
        .word_splitter(textwrap::WordSplitter::NoHyphenation)
        .break_words(true)
}

/// `text` wrapped at spaces to `width` columns (at least [`MIN_TEXT_WIDTH`]), continuation
/// lines indented by `indent` spaces (for long lists such as the cases that never govern).
pub fn wrap_text(text: &str, width: usize, indent: usize) -> String {
    let pad = " ".repeat(indent);
    let options = wrap_options(width.max(MIN_TEXT_WIDTH)).subsequent_indent(&pad);
    textwrap::wrap(text, options).join("\n")
}

/// `text` with every line wider than `width` wrapped, its continuation lines indented two
/// spaces more than the line (for text whose tables already fit, such as the per-case
/// detail).
pub fn fit_lines(text: &str, width: usize) -> String {
    let mut out = String::new();
    for line in text.lines() {
        if display_width(line) > width {
            let indent = line.len() - line.trim_start_matches(' ').len();
            out.push_str(&wrap_text(line, width, indent + 2));
        } else {
            out.push_str(line);
        }
        out.push('\n');
    }
    out
}

/// A number for a table: `digits` significant decimals, `-` for NaN, `∞` for infinity.
pub fn num(v: f64, decimals: usize) -> String {
    if v.is_nan() {
        "-".into()
    } else if v.is_infinite() {
        if v > 0.0 { "∞".into() } else { "-∞".into() }
    } else {
        let s = format!("{v:.decimals$}");
        // Avoid "-0.00".
        if s.trim_start_matches('-')
            .chars()
            .all(|c| c == '0' || c == '.')
        {
            s.trim_start_matches('-').to_string()
        } else {
            s
        }
    }
}

/// An optional number, `-` when absent.
pub fn opt(v: Option<f64>, decimals: usize) -> String {
    v.map_or_else(|| "-".into(), |v| num(v, decimals))
}

/// Below this |drift/h| a drift is round-off, not a figure (issue 7 item 9; common practice,
/// no source: 1/10 000 000 of a story height is far below any drift limit).
pub const NEGLIGIBLE_DRIFT_RATIO: f64 = 1e-7;

/// A drift ratio as `1/N`, `negligible` for round-off, `-` when it does not exist.
pub fn drift_ratio_text(r: f64) -> String {
    if !r.is_finite() {
        "-".into()
    } else if r.abs() < NEGLIGIBLE_DRIFT_RATIO {
        "negligible".into()
    } else {
        format!("1/{:.0}", 1.0 / r.abs())
    }
}
