//! The HTML report of `plumbline report`: one self-contained file (inline CSS and SVG, no
//! scripts, no fonts or images from elsewhere) that reads on screen and prints to PDF.
//!
//! Contents: title block (model file and its SHA-256, table and edition, program
//! version), caution, assumptions, frame elevation, the loads of each load case, the
//! design-moment envelope on the members and the diagram of each governing case, then
//! the story, member and column tables, and the caution again.

use std::collections::BTreeSet;

use super::diagram::{design_diagram, diagram_at, stations};
use super::summary::{
    SIGN_NOTE, Summary, Table, assumptions_table, closing_lines, column_table, member_table,
    story_table,
};
use super::svg::{self, Curve, Label, esc};
use crate::caution::CAUTION;
use crate::combos::FactoredCase;
use crate::envelope::{Location, Sign};
use crate::model::{LocalLoad, Model};
use crate::solve::first_order::combined_member_loads;

/// The hand-off section (issue 17): the reactions and axial-force drawing, then the axial,
/// shear and reaction tables.
fn handoff_section(out: &mut String, s: &Summary) {
    use super::handoff::{axial_table, reaction_table, service_reaction_table, shear_table};
    out.push_str("<h2 class=\"pagebreak\" id=\"handoff\">Axial forces, shears and reactions</h2>");
    let axial = axial_table(s, false);
    let shown: Vec<&crate::envelope::AxialEnvelope> = s
        .envelope
        .axial
        .iter()
        .filter(|a| axial.rows.iter().any(|r| r[0] == a.member))
        .collect();
    out.push_str("<figure>");
    out.push_str(&super::svg_forces::drawing(
        s.model, s.envelope, &shown, WIDTH,
    ));
    out.push_str(&format!(
        "<figcaption>Factored support reactions under each support, largest / smallest over \
         the stable cases (forces in {}, moments in {}; the force on the frame, X right, Y up, \
         Mz counter-clockwise), and the largest design tension T and compression C of the \
         braces and of the beams with a significant axial force.</figcaption></figure>",
        esc(&s.model.units.label(crate::units::Dimension::Force)),
        esc(&s.model.units.label(crate::units::Dimension::Moment)),
    ));
    for t in [
        axial,
        shear_table(s, false),
        reaction_table(s, false),
        service_reaction_table(s, false),
    ] {
        if !t.rows.is_empty() {
            out.push_str(&format!("<h3>{}</h3>", esc(&t.title)));
            out.push_str(&html_table(&t));
        }
    }
}

/// Drawing width, px (fits an A4/Letter page in portrait at print scale).
const WIDTH: f64 = 1000.0;

/// Stations per member for envelope curves.
const STATIONS: usize = 24;

const CSS: &str = r#"
:root { --ink: #1d262d; --muted: #5c6b73; --rule: #c9d1d6; --band: #eef3f1; --warn: #8a4b08; }
* { box-sizing: border-box; }
body { font-family: system-ui, -apple-system, "Segoe UI", "DejaVu Sans", Arial, sans-serif;
       color: var(--ink); margin: 24px auto; max-width: 1060px; padding: 0 16px; line-height: 1.4; }
h1 { font-size: 22px; margin: 0 0 4px; }
h2 { font-size: 17px; border-bottom: 2px solid var(--ink); padding-bottom: 2px; margin-top: 28px; }
h3 { font-size: 14px; margin: 16px 0 6px; color: var(--muted); }
.titleblock { display: grid; grid-template-columns: 180px 1fr; border: 2px solid var(--ink); }
.titleblock div { padding: 4px 8px; border-bottom: 1px solid var(--rule); font-size: 13px; }
.titleblock div:nth-child(odd) { background: var(--band); font-weight: 600; }
.caution { border-left: 6px solid var(--warn); background: #fbf3e8; padding: 8px 12px; margin: 14px 0; font-size: 13px; }
table { border-collapse: collapse; font-size: 12px; margin: 6px 0 12px; width: 100%; }
th, td { border-bottom: 1px solid var(--rule); padding: 3px 6px; text-align: left; vertical-align: top; }
th { background: var(--band); font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
tr.max td { font-weight: 700; }
figure { margin: 8px 0 18px; page-break-inside: avoid; break-inside: avoid; }
figcaption { font-size: 12px; color: var(--muted); }
svg.drawing { max-width: 100%; height: auto; border: 1px solid var(--rule); background: #fff; }
.legend span { display: inline-block; margin-right: 14px; font-size: 12px; }
.swatch { display: inline-block; width: 14px; height: 10px; margin-right: 4px; vertical-align: middle; }
.mono { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 12px; word-break: break-all; }
ul { font-size: 13px; }
@media print {
  body { margin: 0; max-width: none; }
  h2 { break-after: avoid; }
  table { page-break-inside: auto; }
  tr { break-inside: avoid; }
  .pagebreak { break-before: page; }
}
"#;

/// A table as HTML; cells that read as numbers are right-aligned, and a row whose last
/// cell is the member-maximum marker is set in bold.
pub(super) fn html_table(t: &Table) -> String {
    let align = t.name != "assumptions";
    let mut out = String::from("<table><thead><tr>");
    for h in &t.header {
        out.push_str(&format!("<th>{}</th>", esc(h)));
    }
    out.push_str("</tr></thead><tbody>");
    for r in &t.rows {
        let max = r.last().is_some_and(|c| c == "◀");
        out.push_str(if max { "<tr class=\"max\">" } else { "<tr>" });
        for c in r {
            let numeric = align && c.parse::<f64>().is_ok();
            out.push_str(&format!(
                "<td{}>{}</td>",
                if numeric { " class=\"num\"" } else { "" },
                esc(c)
            ));
        }
        out.push_str("</tr>");
    }
    out.push_str("</tbody></table>");
    out
}

/// The factored case a case check came from: the longest factored-case id that begins its
/// id (a notional-load variant adds `/N+` or `/N-`).
fn factored<'a>(cases: &'a [FactoredCase], id: &str) -> Option<&'a FactoredCase> {
    cases
        .iter()
        .filter(|c| id.starts_with(c.id.as_str()))
        .max_by_key(|c| c.id.len())
}

/// Member loads of a case check, per member.
fn case_loads(model: &Model, cases: &[FactoredCase], id: &str) -> Vec<Vec<LocalLoad>> {
    factored(cases, id).map_or_else(
        || vec![Vec::new(); model.members.len()],
        |fc| combined_member_loads(model, &fc.factors),
    )
}

/// The envelope of the design diagrams of every stable case: per member, the curve of the
/// largest and of the smallest moment at each station.
fn envelope_curves(s: &Summary, cases: &[FactoredCase]) -> Vec<Vec<Curve>> {
    let model = s.model;
    let xs: Vec<Vec<f64>> = (0..model.members.len())
        .map(|m| stations(model.length(m), STATIONS))
        .collect();
    let mut hi: Vec<Vec<f64>> = xs.iter().map(|x| vec![0.0; x.len()]).collect();
    let mut lo = hi.clone();
    for c in s.report.cases.iter().filter(|c| c.stable) {
        let loads = case_loads(model, cases, &c.id);
        for (m, mc) in c.members.iter().enumerate() {
            let d = diagram_at(
                model.length(m),
                mc.ends[0].design,
                mc.ends[1].design,
                &loads[m],
                &xs[m],
            );
            for (k, (_, v)) in d.into_iter().enumerate() {
                hi[m][k] = hi[m][k].max(v);
                lo[m][k] = lo[m][k].min(v);
            }
        }
    }
    xs.iter()
        .enumerate()
        .map(|(m, x)| {
            vec![
                x.iter().copied().zip(hi[m].iter().copied()).collect(),
                x.iter().copied().zip(lo[m].iter().copied()).collect(),
            ]
        })
        .collect()
}

/// Labels at the enveloped design moments of every member.
fn envelope_labels(s: &Summary) -> Vec<Label> {
    let mut out = Vec::new();
    for (m, env) in s.envelope.members.iter().enumerate() {
        for (_, _, d) in super::summary::entries(env) {
            out.push((m, d.x, d.moment));
        }
    }
    out
}

/// The design diagram of one case on every member, labelled at the member ends and at
/// the interior extremes.
fn case_diagram(s: &Summary, cases: &[FactoredCase], id: &str) -> Option<String> {
    let model = s.model;
    let c = s.report.cases.iter().find(|c| c.id == id)?;
    let loads = case_loads(model, cases, id);
    let mut curves = Vec::new();
    let mut labels = Vec::new();
    for (m, mc) in c.members.iter().enumerate() {
        let l = model.length(m);
        curves.push(vec![design_diagram(
            l,
            mc.ends[0].design,
            mc.ends[1].design,
            &loads[m],
            STATIONS,
        )]);
        for e in &mc.ends {
            if e.design.abs() > 1e-6 {
                labels.push((m, e.x, e.design));
            }
        }
        for x in [&mc.span_max, &mc.span_min] {
            let interior = x.x > 1e-6 * l && x.x < l * (1.0 - 1e-6);
            if interior && x.design.abs() > 1e-6 {
                labels.push((m, x.x, x.design));
            }
        }
    }
    let title = format!("Case {}: {}", c.id, c.expression);
    Some(svg::diagrams(model, &curves, &labels, &title, WIDTH))
}

/// The ids of the cases behind each member's largest moment, in order of appearance.
fn governing_cases(s: &Summary) -> Vec<String> {
    let mut seen = BTreeSet::new();
    let mut out = Vec::new();
    for m in &s.envelope.members {
        if let Some(g) = &m.governing
            && seen.insert(g.case.clone())
        {
            out.push(g.case.clone());
        }
    }
    out
}

/// The members whose largest moment a case gives, for the figure captions.
fn governed_by(s: &Summary, id: &str) -> Vec<String> {
    s.envelope
        .members
        .iter()
        .filter_map(|m| {
            let g = m.governing.as_ref()?;
            (g.case == id).then(|| {
                format!(
                    "{} ({} {}, {} part larger)",
                    m.member,
                    match g.location {
                        Location::EndI => "end i",
                        Location::EndJ => "end j",
                        Location::Span => "span",
                    },
                    match g.sign {
                        Sign::Positive => "+",
                        Sign::Negative => "−",
                    },
                    g.governs
                )
            })
        })
        .collect()
}

/// The serviceability section: its heading lines, the drift profile, the deflected shape of
/// the governing service case and the tables.
fn service_section(model: &Model, r: &crate::service::ServiceReport) -> String {
    use super::service;
    let mut out =
        String::from("<h2 class=\"pagebreak\" id=\"serviceability\">Serviceability</h2><ul>");
    for l in service::heading_lines(r) {
        out.push_str(&format!("<li>{}</li>", esc(&l)));
    }
    out.push_str("</ul><figure>");
    out.push_str(&service::drift_profile_svg(r, WIDTH));
    out.push_str(
        "<figcaption>Story drift ratio under service loads (P-Δ at service load) against \
         height, one line per governing case; the dashed red line is each story's limit \
         h/N.</figcaption></figure>",
    );
    if let (Some((svg, factor)), Some(c)) = (
        service::deflected_shape_svg(model, r, WIDTH),
        r.shape.as_ref(),
    ) {
        out.push_str("<figure>");
        out.push_str(&svg);
        out.push_str(&format!(
            "<figcaption>Deflected shape of the governing service case {}: members drawn \
             straight between their displaced ends, displacements magnified {}×; dashed: \
             as built.</figcaption></figure>",
            esc(&c.case),
            super::num(factor, 0)
        ));
    }
    for t in service::tables(model, r) {
        out.push_str(&format!("<h3>{}</h3>", esc(&t.title)));
        out.push_str(&html_table(&t));
    }
    out.push_str(&format!(
        "<p>{}</p><p>{}</p>",
        esc(&service::verdict_line(r)),
        r.notes.iter().map(|n| esc(n)).collect::<Vec<_>>().join(" ")
    ));
    out
}

/// The whole report.
pub fn render(s: &Summary, cases: &[FactoredCase]) -> String {
    let model = s.model;
    let mut out = String::new();
    out.push_str("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">");
    out.push_str(&format!(
        "<title>{} — plumbline report</title><style>{CSS}</style></head><body>",
        esc(&model.title)
    ));
    out.push_str(&format!("<h1>{}</h1>", esc(&model.title)));
    let block = [
        ("Model file", esc(&s.model_file)),
        (
            "SHA-256",
            format!("<span class=\"mono\">{}</span>", esc(&s.model_sha256)),
        ),
        (
            "Combinations",
            format!(
                "{} — {}, edition {} (<span class=\"mono\">{}</span>)",
                esc(&s.table.title),
                esc(&s.table.standard),
                esc(&s.table.edition),
                esc(&s.table.name)
            ),
        ),
        if s.has_strength() {
            (
                "Second-order method",
                esc(&format!(
                    "{}: {}",
                    s.report.method,
                    super::check::method_title(s.report.method)
                )),
            )
        } else {
            (
                "Analysis",
                "serviceability: P-Δ at service load, no notional loads, no amplifiers".into(),
            )
        },
        ("Cases", esc(&s.selection.heading())),
        (
            "Program",
            format!("plumbline {}", env!("CARGO_PKG_VERSION")),
        ),
    ];
    out.push_str("<div class=\"titleblock\">");
    for (k, v) in block {
        out.push_str(&format!("<div>{k}</div><div>{v}</div>"));
    }
    out.push_str("</div>");
    out.push_str(&format!(
        "<div class=\"caution\"><strong>Caution.</strong> {}<br>{}</div>",
        esc(CAUTION),
        esc(&s.table.caution)
    ));

    out.push_str("<h2>Assumptions</h2>");
    out.push_str(&html_table(&assumptions_table(s)));
    if !s.selection.remarks.is_empty() {
        out.push_str("<ul>");
        for r in &s.selection.remarks {
            out.push_str(&format!("<li>{}</li>", esc(r)));
        }
        out.push_str("</ul>");
    }

    out.push_str("<h2 id=\"frame\">Frame</h2><figure>");
    out.push_str(&svg::elevation(model, WIDTH));
    out.push_str(
        "<figcaption>Elevation to scale: node ids beside the nodes, member ids at mid-length; \
         a hatched bar is a fixed support, a triangle a pin, a triangle on wheels a roller; \
         an open circle on a member is a moment release.</figcaption></figure>",
    );

    out.push_str("<h2>Load cases</h2>");
    for (k, lc) in model.load_cases.iter().enumerate() {
        out.push_str(&format!(
            "<figure><h3>{} — {} ({})</h3>",
            esc(&lc.id),
            esc(&lc.description),
            lc.category
        ));
        out.push_str(&svg::loads(model, k, WIDTH));
        out.push_str(
            "<figcaption>Service loads as given: nodal forces and moments, and the \
             transverse part of member loads (self-weight included), each member's line \
             loads labelled as typed in the model (intensity, direction, and on a sloped \
             member whether per length of plan or of member).</figcaption></figure>",
        );
    }

    if !s.has_strength() {
        // A serviceability table alone: no design moments, stories or member envelope.
        if let Some(r) = s.service {
            out.push_str(&service_section(model, r));
        }
        out.push_str(&format!(
            "<div class=\"caution\"><strong>Caution.</strong> {} Combination table source: {}.</div>",
            esc(CAUTION),
            esc(&s.table.source)
        ));
        out.push_str("</body></html>\n");
        return out;
    }
    out.push_str("<h2 class=\"pagebreak\" id=\"moments\">Design moments</h2>");
    out.push_str(&format!(
        "<p class=\"legend\"><span><i class=\"swatch\" style=\"background:{}\"></i>positive (local −y face in tension: sagging of a beam)</span>\
         <span><i class=\"swatch\" style=\"background:{}\"></i>negative (local +y face in tension: hogging)</span></p>",
        svg::style::POSITIVE,
        svg::style::NEGATIVE
    ));
    out.push_str("<figure>");
    out.push_str(&svg::diagrams(
        model,
        &envelope_curves(s, cases),
        &envelope_labels(s),
        "Design-moment envelope over the stable cases",
        WIDTH,
    ));
    out.push_str(
        "<figcaption>Each member's largest and smallest design moment over the stable cases, \
         drawn on the tension side; values are the enveloped design moments of the table \
         below. Between the ends the curves join the design end moments by the statics of \
         the span loads.</figcaption></figure>",
    );
    for id in governing_cases(s) {
        if let Some(d) = case_diagram(s, cases, &id) {
            out.push_str("<figure>");
            out.push_str(&d);
            out.push_str(&format!(
                "<figcaption>Governs the largest moment of: {}.</figcaption></figure>",
                esc(&governed_by(s, &id).join("; "))
            ));
        }
    }

    out.push_str("<h2 class=\"pagebreak\">Stories</h2>");
    out.push_str(&html_table(&story_table(s)));
    out.push_str("<h2>Member envelope</h2>");
    out.push_str(&html_table(&member_table(s, false)));
    let columns = column_table(s, false);
    if !columns.rows.is_empty() {
        out.push_str("<h2>Columns</h2>");
        out.push_str(&html_table(&columns));
    }
    handoff_section(&mut out, s);
    if let Some(r) = s.service {
        out.push_str(&service_section(model, r));
    }
    out.push_str("<ul>");
    for l in closing_lines(s) {
        out.push_str(&format!("<li>{}</li>", esc(&l)));
    }
    out.push_str(&format!("<li>{}</li>", esc(SIGN_NOTE)));
    out.push_str(&format!(
        "<li>{}</li></ul>",
        esc(crate::check::story::DRIFT_NOTE)
    ));
    out.push_str(&format!(
        "<div class=\"caution\"><strong>Caution.</strong> {} Combination table source: {}.</div>",
        esc(CAUTION),
        esc(&s.table.source)
    ));
    out.push_str("</body></html>\n");
    out
}
