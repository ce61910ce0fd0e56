//! The approximate check beside the stiffness solution: one table per factored case, in
//! the model's units, or a JSON value in SI base units.

use crate::approx::{ApproxReport, CaseEstimate, Flag, Location};
use crate::model::Model;
use crate::report::{num, table_of};
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
fn flags_text(flags: &[Flag]) -> String {
    flags
        .iter()
        .map(|f| match *f {
            Flag::Sign { at } => format!("sign {}", at_text(at)),
            Flag::Ratio { at, ratio } => format!("ratio {} {}", num(ratio, 2), at_text(at)),
            Flag::Load { factor } => format!("load ×{} of median beam", num(factor, 2)),
        })
        .collect::<Vec<_>>()
        .join("; ")
}

/// One case's table: per member and location, computed and approximate moments.
fn case_table(model: &Model, c: &CaseEstimate) -> String {
    let u = &model.units;
    let lm = u.label(Dimension::Moment);
    let lu = u.label(Dimension::Length);
    let m = |v: f64| num(u.from_si(v, Dimension::Moment), 1);
    let mut rows = Vec::new();
    for e in &c.members {
        for (k, r) in e.rows.iter().enumerate() {
            rows.push(vec![
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
                match (k, e.estimated) {
                    (0, true) => flags_text(&e.flags),
                    (0, false) => "not judged: sloped beam".into(),
                    _ => String::new(),
                },
            ]);
        }
    }
    let mut out = format!("Case {}: {}\n", c.id, c.expression);
    out.push_str(&table_of(
        &[
            "member".to_string(),
            "at".into(),
            format!("x ({lu})"),
            format!("M computed ({lm})"),
            format!("M approx ({lm})"),
            format!("gravity ({lm})"),
            format!("lateral ({lm})"),
            "ratio".into(),
            "flags".into(),
        ],
        rows,
    ));
    out.push_str("\n\n");
    out
}

/// The approximate check as text: method line, thresholds, one table per case, a count
/// of flagged members with the hint, and the caution.
pub fn render_text(model: &Model, r: &ApproxReport) -> String {
    let th = &r.thresholds;
    let mut out = format!(
        "Approximate check (first-order, each case's own loads; common practice, no source)\n\
         Beams under gravity: inflection points at {a}·L from each continuous end \
         (end moments −{e}·wL², mid-span +{s}·wL² with both ends continuous). Columns: \
         unbalanced beam-end moments by stiffness, half carried to the other end (none to a pinned base). Lateral \
         load: portal method. Sloped beams (over 5°) and the columns they meet are not judged.\n\
         Flagged: opposite sign, or ratio computed/approx above {ra} or below 1/{ra}, where \
         the approximate |M| reaches {sig} of the case's largest moment of the same role; a beam load more \
         than {ld} times (or under 1/{ld} of) the case's median beam load.\n\n",
        a = r.inflection,
        e = num(r.inflection * (1.0 - r.inflection) / 2.0, 3),
        s = num((1.0 - 2.0 * r.inflection).powi(2) / 8.0, 3),
        ra = th.ratio,
        sig = th.significant,
        ld = th.load,
    );
    for c in &r.cases {
        out.push_str(&case_table(model, c));
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
    out
}

/// The approximate check as a JSON value (SI base units).
pub fn to_json(r: &ApproxReport) -> serde_json::Value {
    serde_json::to_value(r).unwrap_or(serde_json::Value::Null)
}
