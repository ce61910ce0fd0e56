//! Reports for people and programs: plain-text tables in the model's units, and JSON in SI
//! base units with the unit of every field stated in the document.
//!
//! Every report carries [`CAUTION`].

pub mod approx;
pub mod check;
pub mod diagram;
pub mod html;
pub mod json;
pub mod solve;
pub mod starter;
pub mod summary;
pub mod svg;

use tabled::builder::Builder;
use tabled::settings::Style;
use tabled::settings::style::HorizontalLine;

pub use crate::CAUTION;

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

/// A plain table of our own style: no frame, a dashed rule under the header row.
pub fn table_of<S: AsRef<str>>(header: &[S], rows: Vec<Vec<String>>) -> String {
    let mut b = Builder::default();
    b.push_record(header.iter().map(|s| s.as_ref().to_string()));
    for r in rows {
        b.push_record(r);
    }
    let mut t = b.build();
    t.with(Style::blank().horizontals([(1, HorizontalLine::new('-').intersection(' '))]));
    t.to_string()
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
