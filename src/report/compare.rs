//! The side-by-side report of `plumbline compare` (issue 23): the variants, the headline,
//! per member and quantity the value under each variant with its case and ratio to the
//! reference, per story the verdict and deciding figure. Text, Markdown, CSV and HTML in the
//! reference model's units; JSON in SI base units. Every form carries the caution.

use serde::Serialize;

use super::html::html_table;
use super::summary::{Table, md_cell, md_table};
use super::{CAUTION, num, table_of};
use crate::compare::{Change, Comparison, LeftOut, Quantity, Row, Value, VariantInfo};
use crate::model::Model;
use crate::units::Dimension;

/// What the reports of a comparison read.
pub struct CompareView<'a> {
    /// The reference's model: member ids and units.
    pub model: &'a Model,
    /// The variants that ran, the reference first.
    pub variants: Vec<VariantInfo>,
    pub left_out: &'a [LeftOut],
    pub comparison: &'a Comparison,
}

/// Version of the JSON document of `compare`.
pub const COMPARE_SCHEMA_VERSION: u32 = 1;

fn dimension(q: Quantity) -> Dimension {
    if q.is_moment() {
        Dimension::Moment
    } else {
        Dimension::Force
    }
}

/// A quantity as the tables name it.
fn quantity_name(q: Quantity) -> &'static str {
    match q {
        Quantity::MomentEndI => "M end i",
        Quantity::MomentSpan => "M span",
        Quantity::MomentEndJ => "M end j",
        Quantity::Compression => "N compression",
        Quantity::Tension => "N tension",
        Quantity::Shear => "V",
    }
}

/// `value (case) part` in the model's units, or `-`.
fn value_cell(model: &Model, q: Quantity, v: &Option<Value>, decimals: usize) -> String {
    match v {
        Some(v) => {
            let part = match v.governs.as_deref() {
                Some("sway") => " S",
                Some(_) => " NS",
                None => "",
            };
            format!(
                "{} ({}){part}",
                num(model.units.from_si(v.value, dimension(q)), decimals),
                v.case
            )
        }
        None => "-".into(),
    }
}

fn ratio_cell(r: Option<f64>) -> String {
    r.map_or("-".into(), |r| format!("{r:.3}"))
}

/// The variants table: label, table, method, the settings the variant changes.
pub fn variants_table(run: &CompareView) -> Table {
    let mut rows: Vec<Vec<String>> = run
        .variants
        .iter()
        .enumerate()
        .map(|(k, v)| {
            vec![
                if k == 0 {
                    format!("{} (reference)", v.label)
                } else {
                    v.label.clone()
                },
                v.table.clone(),
                v.method.clone(),
                v.settings.clone(),
            ]
        })
        .collect();
    rows.extend(run.left_out.iter().map(|l: &LeftOut| {
        vec![
            format!("{} (left out)", l.label),
            "-".into(),
            "-".into(),
            l.settings.clone(),
        ]
    }));
    Table {
        name: "compare-variants",
        title: "Variants".into(),
        header: ["variant", "table", "method", "settings"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}

/// One member row of the tables: member, quantity, unit, then per variant the value and
/// (after the reference) the ratio, and the governing variant.
fn member_row(model: &Model, c: &Comparison, r: &Row, decimals: usize) -> Vec<String> {
    let q = r.quantity;
    let mut row = vec![
        r.member.clone(),
        quantity_name(q).to_string(),
        model.units.label(dimension(q)),
    ];
    for (k, v) in r.values.iter().enumerate() {
        row.push(value_cell(model, q, v, decimals));
        if k > 0 {
            row.push(ratio_cell(r.ratios[k]));
        }
    }
    row.push(r.governs.map_or("-".into(), |k| c.variants[k].clone()));
    row
}

fn member_header(c: &Comparison) -> Vec<String> {
    let mut h = vec!["member".to_string(), "quantity".into(), "unit".into()];
    for (k, v) in c.variants.iter().enumerate() {
        h.push(v.clone());
        if k > 0 {
            h.push(format!("{v}/{}", c.variants[0]));
        }
    }
    h.push("largest".into());
    h
}

/// The member table: every compared quantity of every member.
pub fn member_table(model: &Model, c: &Comparison, decimals: usize) -> Table {
    Table {
        name: "compare-members",
        title: "Members: governing design values under each variant (case; NS/S: the no-sway or \
                sway part governs), ratio to the reference"
            .into(),
        header: member_header(c),
        rows: c
            .rows
            .iter()
            .map(|r| member_row(model, c, r, decimals))
            .collect(),
    }
}

/// The story table: verdict and deciding figure under each variant.
pub fn story_table(c: &Comparison) -> Table {
    let mut header = vec!["story".to_string()];
    header.extend(c.variants.iter().cloned());
    header.push("changed".into());
    let rows = c
        .stories
        .iter()
        .map(|s| {
            let mut row = vec![s.story.to_string()];
            for (v, f) in s.verdicts.iter().zip(&s.figures) {
                row.push(match f {
                    Some(f) => format!("{v}; {} {} ({})", f.name, num(f.value, 3), f.case),
                    None => v.clone(),
                });
            }
            row.push(if s.changed { "yes" } else { "no" }.into());
            row
        })
        .collect();
    Table {
        name: "compare-stories",
        title: "Stories: verdict and the figure that decides it under each variant's method".into(),
        header,
        rows,
    }
}

/// One change in words.
fn change_text(model: &Model, c: &Comparison, ch: &Change) -> String {
    let _ = model;
    format!(
        "{} {} × {:.3} under {}",
        ch.member,
        quantity_name(ch.quantity),
        ch.ratio,
        c.variants[ch.variant]
    )
}

/// The headline lines.
pub fn headline_lines(model: &Model, run: &CompareView) -> Vec<String> {
    let c = run.comparison;
    let h = &c.headline;
    let mut out = vec![format!(
        "Members whose largest design moment each variant gives: {}",
        c.variants
            .iter()
            .zip(&h.members_governed)
            .map(|(v, n)| format!("{v} {n}"))
            .collect::<Vec<_>>()
            .join(", ")
    )];
    out.push(format!(
        "Largest increase against {}: {}",
        c.variants[0],
        h.largest_increase
            .as_ref()
            .map_or("none".into(), |ch| change_text(model, c, ch))
    ));
    out.push(format!(
        "Largest decrease against {}: {}",
        c.variants[0],
        h.largest_decrease
            .as_ref()
            .map_or("none".into(), |ch| change_text(model, c, ch))
    ));
    out.push(if h.changed_stories.is_empty() {
        "Stories whose verdict changes: none".into()
    } else {
        format!(
            "Stories whose verdict changes: {}",
            h.changed_stories
                .iter()
                .map(|s| s.to_string())
                .collect::<Vec<_>>()
                .join(", ")
        )
    });
    for l in run.left_out {
        out.push(format!(
            "Left out: {} ({}), the reason is under the tables",
            l.label, l.settings
        ));
    }
    out
}

/// The reference's model (members, units).
fn model_of<'a>(run: &CompareView<'a>) -> &'a Model {
    run.model
}

/// `text` wrapped to the terminal's width ([`super::text_width`]), continuation lines
/// indented by two spaces.
fn wrap(text: &str) -> String {
    super::wrap_text(text, super::text_width(), 2) + "\n"
}

/// The text report.
pub fn text(run: &CompareView) -> String {
    let model = model_of(run);
    let c = run.comparison;
    let mut out = format!(
        "{}\nComparison of {} variants{}; the reference is {}\n\n",
        model.title,
        c.variants.len(),
        if run.left_out.is_empty() {
            String::new()
        } else {
            format!(" ({} left out)", run.left_out.len())
        },
        c.variants[0]
    );
    for l in headline_lines(model, run) {
        out.push_str(&wrap(&l));
    }
    out.push('\n');
    for t in [
        variants_table(run),
        story_table(c),
        member_table(model, c, 1),
    ] {
        out.push_str(&wrap(&t.title));
        out.push_str(&format!("{}\n\n", table_of(&t.header, t.rows)));
    }
    for l in run.left_out {
        out.push_str(&wrap(&format!("Left out {}: {}", l.label, l.reason)));
    }
    out.push_str(&wrap(super::summary::SIGN_NOTE));
    out.push_str(&wrap(CAUTION));
    out
}

/// The Markdown report.
pub fn markdown(run: &CompareView) -> String {
    let model = model_of(run);
    let c = run.comparison;
    let mut out = format!("# {}: variants compared\n\n", md_cell(&model.title));
    out.push_str(&format!("> **Caution.** {CAUTION}\n\n"));
    for l in headline_lines(model, run) {
        out.push_str(&format!("- {}\n", md_cell(&l)));
    }
    out.push('\n');
    for t in [
        variants_table(run),
        story_table(c),
        member_table(model, c, 1),
    ] {
        out.push_str(&md_table(&t));
    }
    out.push_str(&format!("{}\n\n{CAUTION}\n", super::summary::SIGN_NOTE));
    out
}

/// The CSV tables: variants, stories, members (tidy: one row per member, quantity and
/// variant).
pub fn csv_tables(run: &CompareView) -> [Table; 3] {
    let model = model_of(run);
    let c = run.comparison;
    let mut tidy = Vec::new();
    for r in &c.rows {
        for (k, v) in r.values.iter().enumerate() {
            let Some(v) = v else { continue };
            tidy.push(vec![
                r.member.clone(),
                r.role.clone(),
                r.quantity.to_string(),
                model.units.label(dimension(r.quantity)),
                c.variants[k].clone(),
                num(model.units.from_si(v.value, dimension(r.quantity)), 3),
                v.case.clone(),
                v.governs.clone().unwrap_or_default(),
                r.ratios[k].map_or(String::new(), |x| format!("{x:.6}")),
                (r.governs == Some(k)).to_string(),
            ]);
        }
    }
    let members = Table {
        name: "compare-members",
        title: String::new(),
        header: [
            "member", "role", "quantity", "unit", "variant", "value", "case", "part", "ratio",
            "largest",
        ]
        .map(String::from)
        .to_vec(),
        rows: tidy,
    };
    [variants_table(run), story_table(c), members]
}

/// The JSON document of `compare`.
#[derive(Debug, Serialize)]
struct CompareDoc<'a> {
    schema_version: u32,
    program: String,
    title: &'a str,
    units: &'static str,
    variants: &'a [VariantInfo],
    left_out: &'a [LeftOut],
    comparison: &'a Comparison,
    caution: &'static str,
}

/// The JSON text of `compare` (SI base units: N, N·m).
pub fn json(run: &CompareView) -> String {
    let doc = CompareDoc {
        schema_version: COMPARE_SCHEMA_VERSION,
        program: format!("plumbline {}", env!("CARGO_PKG_VERSION")),
        title: &model_of(run).title,
        units: "SI base units: forces N, moments N*m",
        variants: &run.variants,
        left_out: run.left_out,
        comparison: run.comparison,
        caution: CAUTION,
    };
    serde_json::to_string_pretty(&doc).expect("a comparison serializes") + "\n"
}

/// Marks of the ratio chart, one shape per variant after the reference.
const MARKS: [&str; 4] = ["#1f7a5a", "#b5452b", "#2a5d9f", "#8a4b08"];

/// The ratio chart: members along the horizontal axis, for each variant after the
/// reference one mark at the ratio of the member's largest design moment to the
/// reference's (the line at 1 is the reference).
pub fn ratio_chart(c: &Comparison) -> String {
    use std::fmt::Write;
    let mut members: Vec<&str> = c.rows.iter().map(|r| r.member.as_str()).collect();
    members.dedup();
    // Per member and variant: the ratio of the largest |design moment|.
    let ratio = |m: &str, k: usize| -> Option<f64> {
        let best = |k: usize| {
            c.rows
                .iter()
                .filter(|r| r.member == m && r.quantity.is_moment())
                .filter_map(|r| r.values[k].as_ref().map(|v| v.value.abs()))
                .fold(None::<f64>, |a, v| Some(a.map_or(v, |a| a.max(v))))
        };
        let reference = best(0).filter(|&v| v > 0.0)?;
        // Only members whose moments are significant in the frame.
        let frame = c
            .rows
            .iter()
            .filter(|r| r.quantity.is_moment())
            .filter_map(|r| r.values[0].as_ref().map(|v| v.value.abs()))
            .fold(0.0, f64::max);
        (reference >= crate::compare::SIGNIFICANT_SHARE * frame)
            .then(|| best(k).unwrap_or(0.0) / reference)
    };
    let points: Vec<(usize, usize, f64)> = members
        .iter()
        .enumerate()
        .flat_map(|(i, m)| (1..c.variants.len()).filter_map(move |k| Some((i, k, ratio(m, k)?))))
        .collect();
    let (lo, hi) = points
        .iter()
        .fold((1.0f64, 1.0f64), |(lo, hi), p| (lo.min(p.2), hi.max(p.2)));
    let (lo, hi) = ((lo - 0.05).max(0.0), hi + 0.05);
    let (w, h, left, right, top, bottom) = (960.0, 360.0, 60.0, 20.0, 20.0, 90.0);
    let step = (w - left - right) / members.len().max(1) as f64;
    let y = |r: f64| top + (hi - r) / (hi - lo) * (h - top - bottom);
    let x = |i: usize| left + (i as f64 + 0.5) * step;
    let mut out = format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" class="drawing" viewBox="0 0 {w} {h}" width="{w}" height="{h}" role="img" aria-label="ratio of each member's largest design moment to the reference" font-family="inherit">"#
    );
    let _ = write!(
        out,
        r##"<line x1="{left}" y1="{y1:.1}" x2="{x2}" y2="{y1:.1}" stroke="#5c6b73" stroke-dasharray="4 3"/><text x="{tx}" y="{ty:.1}" font-size="10" text-anchor="end">1.00</text>"##,
        y1 = y(1.0),
        x2 = w - right,
        tx = left - 6.0,
        ty = y(1.0) + 3.0
    );
    for t in [lo, hi] {
        let _ = write!(
            out,
            r#"<text x="{tx}" y="{ty:.1}" font-size="10" text-anchor="end">{t:.2}</text>"#,
            tx = left - 6.0,
            ty = y(t) + 3.0
        );
    }
    // Member names vertical under the axis; every one when they fit, else every n-th.
    let every = ((11.0 / step).ceil() as usize).max(1);
    for (i, m) in members.iter().enumerate().filter(|(i, _)| i % every == 0) {
        let _ = write!(
            out,
            r#"<text x="{x:.1}" y="{yy}" font-size="10" text-anchor="end" transform="rotate(-90 {x:.1} {yy})">{}</text>"#,
            super::svg::esc(m),
            x = x(i) + 3.0,
            yy = h - bottom + 8.0
        );
    }
    for (i, k, r) in points {
        let _ = write!(
            out,
            r#"<circle class="ratio" cx="{:.1}" cy="{:.1}" r="3.5" fill="{}"><title>{}: {} × {r:.3}</title></circle>"#,
            x(i) + (k as f64 - 1.0) * 3.0,
            y(r),
            MARKS[(k - 1) % MARKS.len()],
            super::svg::esc(members[i]),
            super::svg::esc(&c.variants[k]),
        );
    }
    out.push_str("</svg>");
    out
}

/// The HTML page: title, caution, headline, the ratio chart, the tables, the caution.
pub fn html(run: &CompareView) -> String {
    use super::svg::esc;
    let model = model_of(run);
    let c = run.comparison;
    let table = |t: &Table| format!("<h2>{}</h2>{}", esc(&t.title), html_table(t));
    let mut out = format!(
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>{} — variants compared</title>\
         <style>body{{font-family:system-ui,sans-serif;max-width:1060px;margin:24px auto;padding:0 16px;color:#1d262d}}\
         table{{border-collapse:collapse;font-size:12px;width:100%}}th,td{{border-bottom:1px solid #c9d1d6;padding:3px 6px;text-align:left}}\
         th{{background:#eef3f1}}.caution{{border-left:6px solid #8a4b08;background:#fbf3e8;padding:8px 12px;font-size:13px}}\
         svg.drawing{{max-width:100%;height:auto;border:1px solid #c9d1d6}}</style></head><body>",
        esc(&model.title)
    );
    out.push_str(&format!(
        "<h1>{} — variants compared</h1><div class=\"caution\"><strong>Caution.</strong> {}</div><ul>",
        esc(&model.title),
        esc(CAUTION)
    ));
    for l in headline_lines(model, run) {
        out.push_str(&format!("<li>{}</li>", esc(&l)));
    }
    out.push_str("</ul><figure>");
    out.push_str(&ratio_chart(c));
    out.push_str("<figcaption>Each member's largest design moment under each variant divided by the reference's (dashed line at 1); colours by variant in order: ");
    out.push_str(
        &c.variants
            .iter()
            .enumerate()
            .skip(1)
            .map(|(k, v)| {
                format!(
                    "<span style=\"color:{}\">● {}</span>",
                    MARKS[(k - 1) % MARKS.len()],
                    esc(v)
                )
            })
            .collect::<Vec<_>>()
            .join(", "),
    );
    out.push_str(". Members whose moments are insignificant in the frame are left out.</figcaption></figure>");
    out.push_str(&table(&variants_table(run)));
    out.push_str(&table(&story_table(c)));
    out.push_str(&table(&member_table(model, c, 1)));
    out.push_str(&format!(
        "<p>{}</p><div class=\"caution\"><strong>Caution.</strong> {}</div></body></html>\n",
        esc(super::summary::SIGN_NOTE),
        esc(CAUTION)
    ));
    out
}

/// Output format of `compare` (each one names its exporter, `report::export`).
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum, strum::Display, strum::EnumString,
)]
#[strum(serialize_all = "kebab-case")]
pub enum CompareFormat {
    /// Aligned plain-text tables in the model's units.
    #[default]
    Table,
    /// One JSON document in SI base units.
    Json,
    /// One CSV file per table (write them with -o DIR).
    Csv,
    /// A Markdown page.
    Md,
    /// A self-contained HTML page with the ratio chart.
    Html,
}
