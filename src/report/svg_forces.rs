//! The hand-off drawing of the HTML report (issue 17): the frame with the factored
//! reaction envelope written under each support and the design axial forces of the braces
//! (and of the beams the axial table shows) at their members.

use std::fmt::Write;

use super::num;
use super::svg::{View, esc, members, open, style, supports};
use crate::envelope::{AxialEnvelope, COMPONENTS, Envelope};
use crate::model::Model;
use crate::units::Dimension;

/// Font size of the labels, px, and the width of one character as drawn (a conservative
/// estimate for a proportional sans-serif font; common practice, no source).
const FONT: f64 = 10.0;
const CHAR_WIDTH: f64 = 6.2;
/// Line height of a label block, px.
const LINE: f64 = 12.0;

/// The lines written under one support: per restrained component `Rx max / min`.
fn support_lines(model: &Model, s: &crate::envelope::SupportEnvelope) -> Vec<String> {
    s.components
        .iter()
        .map(|c| {
            let d = if c.component == COMPONENTS[2] {
                Dimension::Moment
            } else {
                Dimension::Force
            };
            let v = |r: &Option<crate::envelope::ReactionRow>| {
                r.as_ref()
                    .map_or("-".into(), |r| num(model.units.from_si(r.value, d), 1))
            };
            format!("{} {} / {}", c.component, v(&c.max), v(&c.min))
        })
        .collect()
}

/// The width of `line` as drawn, px.
fn width_of(line: &str) -> f64 {
    line.chars().count() as f64 * CHAR_WIDTH
}

/// The axial label of a member: `id: T 60.1 / C 60.1` (largest tension and compression).
fn axial_label(model: &Model, a: &AxialEnvelope) -> Option<String> {
    let f = |v: f64| num(model.units.from_si(v.abs(), Dimension::Force), 1);
    let parts: Vec<String> = [("T", &a.tension), ("C", &a.compression)]
        .into_iter()
        .filter_map(|(k, r)| r.as_ref().map(|r| format!("{k} {}", f(r.axial))))
        .collect();
    (!parts.is_empty()).then(|| format!("{}: {}", a.member, parts.join(" / ")))
}

/// The drawing: members, supports, a block of reaction extremes under each support
/// (staggered downwards where neighbours would overlap) and the axial labels of the members
/// in `shown`.
pub fn drawing(model: &Model, env: &Envelope, shown: &[&AxialEnvelope], width: f64) -> String {
    let v = View::fit(model, width, 60.0);
    // Place the support blocks first, to know how much room they need below the frame.
    let mut blocks: Vec<(f64, f64, Vec<String>)> = Vec::new();
    let mut placed: Vec<(f64, f64, usize)> = Vec::new(); // (left, right, row)
    let mut order: Vec<(usize, f64, f64)> = env
        .reactions
        .iter()
        .enumerate()
        .filter_map(|(k, s)| {
            let n = model.nodes.iter().find(|n| n.id == s.node)?;
            let (x, y) = v.at(n.x, n.y);
            Some((k, x, y))
        })
        .collect();
    order.sort_by(|a, b| a.1.total_cmp(&b.1));
    let mut rows_used = 0;
    for (k, x, y) in order {
        let mut lines = vec![env.reactions[k].node.clone()];
        lines.extend(support_lines(model, &env.reactions[k]));
        let w = lines.iter().map(|l| width_of(l)).fold(0.0, f64::max);
        let (left, right) = (
            (x - w / 2.0).max(2.0),
            (x + w / 2.0).max(2.0 + w).min(width - 2.0),
        );
        let row = (0..)
            .find(|&r| {
                !placed
                    .iter()
                    .any(|&(l, rr, row)| row == r && left < rr + 6.0 && l < right + 6.0)
            })
            .unwrap_or(0);
        rows_used = rows_used.max(row + 1);
        placed.push((left, right, row));
        let block_height = LINE * lines.len() as f64 + 4.0;
        blocks.push((
            (left + right) / 2.0,
            y + 26.0 + row as f64 * block_height,
            lines,
        ));
    }
    let below = blocks
        .iter()
        .map(|(_, top, lines)| top + LINE * lines.len() as f64)
        .fold(v.height, f64::max);
    let mut outer = v;
    outer.height = below + 8.0;
    let mut out = open(&outer, "reactions and axial forces");
    out.push_str(&members(model, &v, false));
    out.push_str(&supports(model, &v));
    for (cx, top, lines) in &blocks {
        let _ = write!(
            out,
            r#"<text class="reaction" x="{cx:.1}" y="{top:.1}" font-size="{FONT}" fill="{c}" text-anchor="middle">"#,
            c = style::SUPPORT
        );
        for (i, l) in lines.iter().enumerate() {
            let _ = write!(
                out,
                r#"<tspan x="{cx:.1}" dy="{}"{}>{}</tspan>"#,
                if i == 0 { 0.0 } else { LINE },
                if i == 0 { r#" font-weight="600""# } else { "" },
                esc(l)
            );
        }
        out.push_str("</text>");
    }
    // Axial labels along each shown member, at 40 % or 60 % of its length alternately so
    // that crossing braces keep their labels apart.
    for (n, a) in shown.iter().enumerate() {
        let Some(label) = axial_label(model, a) else {
            continue;
        };
        let Some(m) = model.members.iter().position(|m| m.id == a.member) else {
            continue;
        };
        let mem = &model.members[m];
        let (p, q) = (&model.nodes[mem.i], &model.nodes[mem.j]);
        let t = if n % 2 == 0 { 0.4 } else { 0.6 };
        let (x, y) = v.at(p.x + t * (q.x - p.x), p.y + t * (q.y - p.y));
        let w = width_of(&label);
        let x = x.clamp(w / 2.0 + 2.0, width - w / 2.0 - 2.0);
        let _ = write!(
            out,
            r#"<text class="axial" x="{x:.1}" y="{:.1}" font-size="{FONT}" fill="{c}" text-anchor="middle" paint-order="stroke" stroke="white" stroke-width="3">{}</text>"#,
            y - 4.0,
            esc(&label),
            c = style::MEMBER
        );
    }
    out.push_str("</svg>");
    out
}
