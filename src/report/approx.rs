//! The approximate check beside the stiffness solution: one table per factored case in the
//! model's units (text), one table for CSV, or a JSON value in SI base units.

use super::page::Table;
use crate::approx::{ApproxReport, CaseEstimate, Flag, Location, MemberEstimate};
use crate::model::Model;
use crate::report::{fit_lines, num, table_of, text_width};
use crate::units::Dimension;

use super::CAUTION;

/// Short text of a location.
fn at_text(at: Location) -> &'static str {
    match at {
        Location::EndI => "end-i",
        Location::EndJ => "end-j",
        Location::Span => "span",
    }
}

/// The flags of a member as one cell: `sign end-i`, `ratio 0.21 span`, `load ×1000`.
fn flags_text(e: &MemberEstimate) -> String {
    if !e.estimated {
        return "not judged: sloped, released or split beam here".into();
    }
    e.flags
        .iter()
        .map(|f| match *f {
            Flag::Sign { at } => format!("sign {}", at_text(at)),
            Flag::Ratio { at, ratio } => format!("ratio {} {}", num(ratio, 2), at_text(at)),
            Flag::Load { factor } => format!("load ×{} of median beam", num(factor, 2)),
        })
        .collect::<Vec<_>>()
        .join("; ")
}

/// Column headings in the model's units.
fn header(model: &Model) -> Vec<String> {
    let u = &model.units;
    let lm = u.label(Dimension::Moment);
    vec![
        "member".to_string(),
        "at".into(),
        format!("x ({})", u.label(Dimension::Length)),
        format!("M computed ({lm})"),
        format!("M approx ({lm})"),
        format!("gravity ({lm})"),
        format!("lateral ({lm})"),
        "ratio".into(),
        "flags".into(),
    ]
}

/// One case's rows: per member and location; the member id and flags on its first row.
fn rows(model: &Model, c: &CaseEstimate) -> Vec<Vec<String>> {
    let u = &model.units;
    let m = |v: f64| num(u.from_si(v, Dimension::Moment), 1);
    let mut out = Vec::new();
    for e in &c.members {
        for (k, r) in e.rows.iter().enumerate() {
            out.push(vec![
                if k == 0 {
                    e.member.clone()
                } else {
                    String::new()
                },
                at_text(r.at).into(),
                num(u.from_si(r.x, Dimension::Length), 2),
                m(r.computed),
                m(r.approximate),
                m(r.gravity),
                m(r.lateral),
                if r.significant && r.approximate != 0.0 {
                    num(r.computed / r.approximate, 2)
                } else {
                    "-".into()
                },
                if k == 0 { flags_text(e) } else { String::new() },
            ]);
        }
    }
    out
}

/// The approximate check as text: method line, thresholds, one table per case, a count
/// of flagged member results with the hint, and the caution.
pub fn render_text(model: &Model, r: &ApproxReport) -> String {
    let th = &r.thresholds;
    let mut out = format!(
        "Approximate check (first-order, each case's own loads; common practice, no source)\n\
         Beams under gravity: inflection points at {a}·L from each continuous end \
         (end moments −{e}·wL², mid-span +{s}·wL² with both ends continuous), {ap}·L from a \
         propped span's. Columns: unbalanced beam-end moments by stiffness, half carried to \
         the other end (none to a pinned base); in a story without a brace the net shear of \
         that estimate goes back through the portal method (sway under gravity). Lateral load: portal method over the moment-frame columns (none to \
         leaning columns; a braced story's shear to its brace). Sloped beams (over 5°) that \
         take moment, spans of several members and the members meeting them are not judged.\n\
         Flagged: opposite sign, or ratio computed/approx above {ra} or below 1/{ra}, where \
         the approximate |M| reaches {sig} of the case's largest moment of the same role and \
         its gravity and lateral parts do not cancel below {pa} of their sum; a \
         beam load more than {ld} times (or under 1/{ld} of) the case's median beam load, or \
         of the opposite sense.\n\n",
        a = r.inflection,
        ap = num(r.inflection_propped, 3),
        pa = th.parts,
        e = num(r.inflection * (1.0 - r.inflection) / 2.0, 3),
        s = num((1.0 - 2.0 * r.inflection).powi(2) / 8.0, 3),
        ra = th.ratio,
        sig = th.significant,
        ld = th.load,
    );
    for c in &r.cases {
        out.push_str(&format!("Case {}: {}\n", c.id, c.expression));
        out.push_str(&table_of(&header(model), rows(model, c)));
        out.push_str("\n\n");
    }
    let flagged: usize = r
        .cases
        .iter()
        .map(|c| c.members.iter().filter(|e| !e.flags.is_empty()).count())
        .sum();
    out.push_str(&format!(
        "{flagged} member result(s) flagged over {} case(s)",
        r.cases.len()
    ));
    if flagged > 0 {
        out.push_str(&format!("; {}", r.hint));
    }
    out.push_str(".\n");
    out.push_str(&format!("{CAUTION}\n"));
    fit_lines(&out, text_width())
}

/// The approximate check as one table (for CSV): a case column before the text rows.
pub fn table(model: &Model, r: &ApproxReport) -> Table {
    let mut header = header(model);
    header.insert(0, "case".into());
    let mut all = Vec::new();
    for c in &r.cases {
        let mut member = String::new();
        for mut row in rows(model, c) {
            // Every CSV row names its member.
            if row[0].is_empty() {
                row[0] = member.clone();
            } else {
                member = row[0].clone();
            }
            row.insert(0, c.id.clone());
            all.push(row);
        }
    }
    Table {
        name: "approximate",
        title: "Approximate check".into(),
        header,
        rows: all,
    }
}

/// The approximate check as a JSON value (SI base units).
pub fn to_json(r: &ApproxReport) -> serde_json::Value {
    serde_json::to_value(r).unwrap_or(serde_json::Value::Null)
}
