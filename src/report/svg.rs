//! SVG drawings of the frame for the HTML report: the elevation to scale with ids,
//! supports and releases; the loads of a load case; moment diagrams on the members.
//!
//! World coordinates are the model's (m, Y up); [`View`] maps them to the drawing (px,
//! y down) with one scale for both axes, so the elevation is to scale. Moments are drawn
//! on the tension side of each member: a positive moment (local −y face in tension) is
//! offset towards local −y.

use std::fmt::Write;

use crate::model::{LocalLoad, Model, Restraint};
use crate::units::Dimension;

/// Colours and strokes of our own, chosen to stay apart in print and in greyscale.
pub mod style {
    /// Members.
    pub const MEMBER: &str = "#22303c";
    /// Node markers and ids.
    pub const NODE: &str = "#5c6b73";
    /// Supports.
    pub const SUPPORT: &str = "#7a5c3e";
    /// Loads.
    pub const LOAD: &str = "#2a5d9f";
    /// Positive moments (local −y face in tension).
    pub const POSITIVE: &str = "#1f7a5a";
    /// Negative moments (local +y face in tension).
    pub const NEGATIVE: &str = "#b5452b";
}

/// The mapping from model coordinates to the drawing.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct View {
    /// Drawing size, px.
    pub width: f64,
    pub height: f64,
    /// px per m.
    pub scale: f64,
    /// Model point drawn at the drawing's origin offset.
    pub x0: f64,
    pub y0: f64,
    pub margin: f64,
}

impl View {
    /// A view of `model` in a drawing `width` px wide, with `margin` px around the frame;
    /// the height follows the frame's proportions.
    pub fn fit(model: &Model, width: f64, margin: f64) -> View {
        let xs = model.nodes.iter().map(|n| n.x);
        let ys = model.nodes.iter().map(|n| n.y);
        let (xmin, xmax) = xs.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(v), b.max(v))
        });
        let (ymin, ymax) = ys.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(v), b.max(v))
        });
        let w = (xmax - xmin).max(1e-9);
        let h = (ymax - ymin).max(1e-9);
        // Limit the height of tall, narrow frames to a page.
        let scale = ((width - 2.0 * margin) / w).min((900.0 - 2.0 * margin) / h);
        View {
            width,
            height: h * scale + 2.0 * margin,
            scale,
            x0: xmin,
            y0: ymin,
            margin,
        }
    }

    /// Drawing coordinates of the model point `(x, y)`.
    pub fn at(&self, x: f64, y: f64) -> (f64, f64) {
        (
            self.margin + (x - self.x0) * self.scale,
            self.height - self.margin - (y - self.y0) * self.scale,
        )
    }

    /// The frame's size in the drawing: the larger of width and height, m.
    pub fn span(&self) -> f64 {
        ((self.width - 2.0 * self.margin).max(self.height - 2.0 * self.margin)) / self.scale
    }
}

/// Escape text for SVG and HTML.
pub fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// `<svg>` opening tag of a drawing of `view`'s size.
pub(super) fn open(view: &View, label: &str) -> String {
    format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" class="drawing" viewBox="0 0 {w:.0} {h:.0}" width="{w:.0}" height="{h:.0}" role="img" aria-label="{label}" font-family="inherit">"#,
        w = view.width,
        h = view.height,
        label = esc(label)
    )
}

/// A point along member `m` at distance `x` from end i, offset by `off` (m) along local
/// −y, in model coordinates.
fn along(model: &Model, m: usize, x: f64, off: f64) -> (f64, f64) {
    let mem = &model.members[m];
    let (c, s) = model.cosines(m);
    let ni = &model.nodes[mem.i];
    // Local y is (−s, c); local −y is (s, −c).
    (ni.x + c * x + s * off, ni.y + s * x - c * off)
}

/// The members as lines (`class="member"`, one per member, with `data-member`), with
/// their ids, the hinges as open circles, and the nodes.
pub(super) fn members(model: &Model, v: &View, ids: bool) -> String {
    let mut out = String::new();
    for (k, mem) in model.members.iter().enumerate() {
        let (a, b) = (&model.nodes[mem.i], &model.nodes[mem.j]);
        let (x1, y1) = v.at(a.x, a.y);
        let (x2, y2) = v.at(b.x, b.y);
        let _ = write!(
            out,
            r#"<line class="member" data-member="{id}" x1="{x1:.2}" y1="{y1:.2}" x2="{x2:.2}" y2="{y2:.2}" stroke="{c}" stroke-width="3" stroke-linecap="round"/>"#,
            id = esc(&mem.id),
            c = style::MEMBER
        );
        if ids {
            // Beside the member, never on its line: a column's id on the inner side, a
            // beam's above it.
            let (mx, my) = v.at((a.x + b.x) / 2.0, (a.y + b.y) / 2.0);
            let (dx, dy) = (x2 - x1, y2 - y1);
            let (tx, ty, anchor) = if dy.abs() > dx.abs() && mx > v.width / 2.0 {
                (mx - 7.0, my + 4.0, "end")
            } else if dy.abs() > dx.abs() {
                (mx + 7.0, my + 4.0, "start")
            } else {
                (mx, my - 7.0, "middle")
            };
            let _ = write!(
                out,
                r#"<text x="{tx:.1}" y="{ty:.1}" font-size="11" fill="{}" text-anchor="{anchor}" paint-order="stroke" stroke="white" stroke-width="3">{}</text>"#,
                style::MEMBER,
                esc(&mem.id)
            );
        }
        let l = model.length(k);
        let d = (12.0 / v.scale).min(0.25 * l);
        for (released, x) in [(mem.release_i, d), (mem.release_j, l - d)] {
            if released {
                let (px, py) = along(model, k, x, 0.0);
                let (cx, cy) = v.at(px, py);
                let _ = write!(
                    out,
                    r#"<circle class="hinge" cx="{cx:.1}" cy="{cy:.1}" r="4.5" fill="white" stroke="{}" stroke-width="1.8"/>"#,
                    style::MEMBER
                );
            }
        }
    }
    for n in &model.nodes {
        let (x, y) = v.at(n.x, n.y);
        let _ = write!(
            out,
            r#"<rect x="{:.1}" y="{:.1}" width="5" height="5" fill="{}"/>"#,
            x - 2.5,
            y - 2.5,
            style::NODE
        );
        if ids {
            let _ = write!(
                out,
                r#"<text x="{:.1}" y="{:.1}" font-size="10" fill="{}">{}</text>"#,
                x + 5.0,
                y - 5.0,
                style::NODE,
                esc(&n.id)
            );
        }
    }
    out
}

/// The supports: a fixed base as a hatched bar, a pin as a triangle, a roller as a
/// triangle on two wheels, springs as a zig-zag note.
pub(super) fn supports(model: &Model, v: &View) -> String {
    let mut out = String::new();
    let c = style::SUPPORT;
    for s in &model.supports {
        let n = &model.nodes[s.node];
        let (x, y) = v.at(n.x, n.y);
        let fixed = |r: Restraint| matches!(r, Restraint::Fixed);
        let spring = s.dofs.iter().any(|r| matches!(r, Restraint::Spring(_)));
        match (fixed(s.dofs[0]), fixed(s.dofs[1]), fixed(s.dofs[2])) {
            (true, true, true) => {
                let _ = write!(
                    out,
                    r#"<g class="support fixed"><line x1="{a:.1}" y1="{y:.1}" x2="{b:.1}" y2="{y:.1}" stroke="{c}" stroke-width="3"/>"#,
                    a = x - 14.0,
                    b = x + 14.0
                );
                for k in 0..5 {
                    let hx = x - 12.0 + 6.0 * k as f64;
                    let _ = write!(
                        out,
                        r#"<line x1="{hx:.1}" y1="{y:.1}" x2="{:.1}" y2="{:.1}" stroke="{c}" stroke-width="1.2"/>"#,
                        hx - 5.0,
                        y + 7.0
                    );
                }
                out.push_str("</g>");
            }
            (tx, ty, _) if tx || ty => {
                let roller = !(tx && ty);
                let _ = write!(
                    out,
                    r#"<g class="support {kind}"><path d="M{x:.1},{y:.1} L{:.1},{:.1} L{:.1},{:.1} Z" fill="none" stroke="{c}" stroke-width="1.8"/>"#,
                    x - 9.0,
                    y + 14.0,
                    x + 9.0,
                    y + 14.0,
                    kind = if roller { "roller" } else { "pinned" }
                );
                if roller {
                    for dx in [-5.0, 5.0] {
                        let _ = write!(
                            out,
                            r#"<circle cx="{:.1}" cy="{:.1}" r="2.6" fill="none" stroke="{c}" stroke-width="1.4"/>"#,
                            x + dx,
                            y + 17.0
                        );
                    }
                }
                out.push_str("</g>");
            }
            _ => {}
        }
        if spring {
            let _ = write!(
                out,
                r#"<text x="{:.1}" y="{:.1}" font-size="10" fill="{c}">spring</text>"#,
                x + 10.0,
                y + 26.0
            );
        }
    }
    out
}

/// An arrow from `(x1, y1)` to its tip `(x2, y2)` (drawing coordinates).
fn arrow(x1: f64, y1: f64, x2: f64, y2: f64, colour: &str) -> String {
    let (dx, dy) = (x2 - x1, y2 - y1);
    let l = (dx * dx + dy * dy).sqrt().max(1e-9);
    let (ux, uy) = (dx / l, dy / l);
    let (hx, hy) = (x2 - 7.0 * ux, y2 - 7.0 * uy);
    format!(
        r#"<line x1="{x1:.1}" y1="{y1:.1}" x2="{hx:.1}" y2="{hy:.1}" stroke="{colour}" stroke-width="1.4"/><path d="M{x2:.1},{y2:.1} L{:.1},{:.1} L{:.1},{:.1} Z" fill="{colour}"/>"#,
        hx - 3.5 * uy,
        hy + 3.5 * ux,
        hx + 3.5 * uy,
        hy - 3.5 * ux
    )
}

/// The frame elevation to scale: members with ids, nodes, supports and releases.
pub fn elevation(model: &Model, width: f64) -> String {
    let v = View::fit(model, width, 60.0);
    let mut out = open(&v, "frame elevation");
    out.push_str(&members(model, &v, true));
    out.push_str(&supports(model, &v));
    out.push_str(&scale_bar(model, &v));
    out.push_str("</svg>");
    out
}

/// A scale bar of a round length in the model's units.
fn scale_bar(model: &Model, v: &View) -> String {
    let u = &model.units;
    let target = u.from_si(0.2 * v.span(), Dimension::Length);
    let step = 10f64.powf(target.log10().floor());
    let nice = [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .map(|f| f * step)
        .rfind(|&s| s <= target)
        .unwrap_or(step);
    let len_px = u.to_si(nice, Dimension::Length) * v.scale;
    let (x, y) = (v.margin, v.height - 12.0);
    format!(
        r#"<g class="scale"><line x1="{x:.1}" y1="{y:.1}" x2="{:.1}" y2="{y:.1}" stroke="{c}" stroke-width="2"/><text x="{:.1}" y="{:.1}" font-size="10" fill="{c}">{} {}</text></g>"#,
        x + len_px,
        x + len_px + 6.0,
        y + 3.0,
        super::num(nice, 0),
        esc(&u.label(Dimension::Length)),
        c = style::NODE
    )
}

/// The loads of load case `case` on the frame: nodal forces and moments, and the
/// transverse component of member loads as arrows onto the member.
pub fn loads(model: &Model, case: usize, width: f64) -> String {
    let v = View::fit(model, width, 60.0);
    let u = &model.units;
    let lc = &model.load_cases[case];
    let mut out = open(&v, &format!("loads of load case {}", lc.id));
    out.push_str(&members(model, &v, false));
    out.push_str(&supports(model, &v));
    let fl = u.label(Dimension::Force);
    let mut placer = Placer::new(&v);
    for n in &lc.nodal {
        let node = &model.nodes[n.node];
        let (x, y) = v.at(node.x, node.y);
        for (f, dx, dy) in [(n.fx, 1.0, 0.0), (n.fy, 0.0, -1.0)] {
            if f != 0.0 {
                let sgn = f.signum();
                let (tx, ty) = (x - sgn * dx * 40.0, y - sgn * dy * 40.0);
                out.push_str(&arrow(tx, ty, x, y, style::LOAD));
                let text = format!(
                    "{} {}",
                    super::num(u.from_si(f.abs(), Dimension::Force), 1),
                    fl
                );
                if let Some((lx, ly, anchor)) = placer.place(tx, ty - 4.0, &text, 10.0, "middle") {
                    let _ = write!(
                        out,
                        r#"<text x="{lx:.1}" y="{ly:.1}" font-size="10" fill="{}" text-anchor="{anchor}">{}</text>"#,
                        style::LOAD,
                        esc(&text)
                    );
                }
            }
        }
        if n.mz != 0.0 {
            let _ = write!(
                out,
                r#"<path d="M{:.1},{:.1} A14,14 0 1,{} {:.1},{:.1}" fill="none" stroke="{c}" stroke-width="1.4"/><text x="{:.1}" y="{:.1}" font-size="10" fill="{c}">{} {}</text>"#,
                x + 14.0,
                y,
                if n.mz > 0.0 { 0 } else { 1 },
                x,
                y - 14.0,
                x + 16.0,
                y - 16.0,
                super::num(u.from_si(n.mz, Dimension::Moment), 1),
                esc(&u.label(Dimension::Moment)),
                c = style::LOAD
            );
        }
    }
    let locals = model.local_loads(case);
    let peak = locals
        .iter()
        .flatten()
        .map(|l| match *l {
            LocalLoad::Linear { qy_a, qy_b, .. } => qy_a.abs().max(qy_b.abs()),
            _ => 0.0,
        })
        .fold(0.0, f64::max);
    let wl = u.label(Dimension::LineLoad);
    for (m, list) in locals.iter().enumerate() {
        let mut total_line = 0.0;
        for l in list {
            match *l {
                LocalLoad::Linear {
                    a, b, qy_a, qy_b, ..
                } if qy_a != 0.0 || qy_b != 0.0 => {
                    total_line += 0.5 * (qy_a + qy_b) * (b - a);
                    let n = (((b - a) * v.scale / 28.0).ceil() as usize).clamp(2, 40);
                    let mut tails = Vec::new();
                    for k in 0..=n {
                        let t = k as f64 / n as f64;
                        let q = qy_a + (qy_b - qy_a) * t;
                        // Arrow from the tail on the side the load comes from to the member.
                        let len = 30.0 * q.abs() / peak.max(1e-12) / v.scale;
                        let x = a + (b - a) * t;
                        let tail = along(model, m, x, len * q.signum());
                        let tip = along(model, m, x, 0.0);
                        let (x1, y1) = v.at(tail.0, tail.1);
                        let (x2, y2) = v.at(tip.0, tip.1);
                        if q != 0.0 {
                            out.push_str(&arrow(x1, y1, x2, y2, style::LOAD));
                        }
                        tails.push(format!("{x1:.1},{y1:.1}"));
                    }
                    let _ = write!(
                        out,
                        r#"<polyline points="{}" fill="none" stroke="{}" stroke-width="1"/>"#,
                        tails.join(" "),
                        style::LOAD
                    );
                }
                LocalLoad::Point { a, py, .. } if py != 0.0 => {
                    let tail = along(model, m, a, 40.0 / v.scale * py.signum());
                    let tip = along(model, m, a, 0.0);
                    let (x1, y1) = v.at(tail.0, tail.1);
                    let (x2, y2) = v.at(tip.0, tip.1);
                    out.push_str(&arrow(x1, y1, x2, y2, style::LOAD));
                    let text = format!(
                        "{} {}",
                        super::num(u.from_si(py.abs(), Dimension::Force), 1),
                        fl
                    );
                    if let Some((lx, ly, anchor)) = placer.place(x1 + 4.0, y1, &text, 10.0, "start")
                    {
                        let _ = write!(
                            out,
                            r#"<text x="{lx:.1}" y="{ly:.1}" font-size="10" fill="{}" text-anchor="{anchor}">{}</text>"#,
                            style::LOAD,
                            esc(&text)
                        );
                    }
                }
                LocalLoad::Moment { a, m: mz } if mz != 0.0 => {
                    let p = along(model, m, a, 0.0);
                    let (x, y) = v.at(p.0, p.1);
                    let _ = write!(
                        out,
                        r#"<circle cx="{x:.1}" cy="{y:.1}" r="9" fill="none" stroke="{c}" stroke-dasharray="3 2"/><text x="{:.1}" y="{:.1}" font-size="10" fill="{c}">{} {}</text>"#,
                        x + 11.0,
                        y - 11.0,
                        super::num(u.from_si(mz, Dimension::Moment), 1),
                        esc(&u.label(Dimension::Moment)),
                        c = style::LOAD
                    );
                }
                _ => {}
            }
        }
        if total_line != 0.0 {
            // Label the member's distributed loads once, as the engineer typed them.
            let l = model.length(m);
            let q = total_line / l;
            let p = along(model, m, 0.5 * l, (34.0 / v.scale) * q.signum());
            let (x, y) = v.at(p.0, p.1);
            let typed = typed_line_loads(model, lc, m);
            let text = if typed.is_empty() {
                format!(
                    "{} {}",
                    super::num(u.from_si(q.abs(), Dimension::LineLoad), 2),
                    wl
                )
            } else {
                typed.join(" + ")
            };
            if let Some((lx, ly, anchor)) = placer.place(x, y - 3.0, &text, 10.0, "middle") {
                let _ = write!(
                    out,
                    r#"<text x="{lx:.1}" y="{ly:.1}" font-size="10" fill="{}" text-anchor="{anchor}" paint-order="stroke" stroke="white" stroke-width="3">{}</text>"#,
                    style::LOAD,
                    esc(&text)
                );
            }
        }
    }
    out.push_str("</svg>");
    out
}

/// The distributed loads of load case `lc` on member `m` as typed: intensity in the
/// model's units, direction, and for a sloped member loaded in a global direction the
/// length it is spread over ("0.25 kip/ft down, on plan").
fn typed_line_loads(model: &Model, lc: &crate::model::LoadCase, m: usize) -> Vec<String> {
    use crate::model::{LoadDirection, Measure, MemberLoadKind};
    let u = &model.units;
    let (c, s) = model.cosines(m);
    let sloped = c.abs() > 1e-6 && s.abs() > 1e-6;
    lc.member
        .iter()
        .filter(|ml| ml.member == m)
        .filter_map(|ml| match &ml.kind {
            MemberLoadKind::Distributed {
                w_a,
                w_b,
                direction,
                measure,
                ..
            } => {
                let w = |v: f64| super::num(u.from_si(v, Dimension::LineLoad), 2);
                let value = if w_a == w_b {
                    w(*w_a)
                } else {
                    format!("{}…{}", w(*w_a), w(*w_b))
                };
                let dir = match direction {
                    LoadDirection::Gravity => " down",
                    LoadDirection::GlobalX => " in X",
                    LoadDirection::GlobalY => " in Y",
                    LoadDirection::LocalY => " across",
                    LoadDirection::LocalX => " along",
                };
                let global = !matches!(direction, LoadDirection::LocalX | LoadDirection::LocalY);
                let over = match measure {
                    Measure::Projected if sloped && global => {
                        if matches!(direction, LoadDirection::GlobalX) {
                            ", on elevation"
                        } else {
                            ", on plan"
                        }
                    }
                    Measure::AlongMember if sloped && global => ", along the member",
                    _ => "",
                };
                Some(format!(
                    "{value} {}{dir}{over}",
                    u.label(Dimension::LineLoad)
                ))
            }
            _ => None,
        })
        .collect()
}

/// The largest fraction t ≤ 1 of the diagram scale `k` (m per N·m) that keeps every point
/// of `curves` at least `pad` px inside the drawing: a point is its base on the member plus
/// an offset proportional to k, so each point bounds t linearly.
fn fill_fraction(model: &Model, v: &View, curves: &[Vec<Curve>], k: f64, pad: f64) -> f64 {
    let mut t: f64 = 1.0;
    for (m, list) in curves.iter().enumerate() {
        for &(x, mo) in list.iter().flatten() {
            let base = along(model, m, x, 0.0);
            let tip = along(model, m, x, mo * k);
            let (bx, by) = v.at(base.0, base.1);
            let (px, py) = v.at(tip.0, tip.1);
            for (b, o, hi) in [(bx, px - bx, v.width - pad), (by, py - by, v.height - pad)] {
                if o > 0.0 && b + o > hi {
                    t = t.min(((hi - b) / o).max(0.0));
                } else if o < 0.0 && b + o < pad {
                    t = t.min(((b - pad) / -o).max(0.0));
                }
            }
        }
    }
    t
}

/// Where a value's label may go relative to its point, px, in order of preference: right
/// and above, left and above, right and below, left and below, then further out.
const LABEL_SPOTS: [(f64, f64, &str); 8] = [
    (3.0, -3.0, "start"),
    (-3.0, -3.0, "end"),
    (3.0, 11.0, "start"),
    (-3.0, 11.0, "end"),
    (3.0, -15.0, "start"),
    (-3.0, -15.0, "end"),
    (3.0, 25.0, "start"),
    (-3.0, 25.0, "end"),
];

/// A text's box in the drawing, px: an estimate from the character count (0.66 em per
/// character, 1 em high above the baseline, 0.25 em below), with the white halo.
#[derive(Debug, Clone, Copy, PartialEq)]
struct Box2 {
    x0: f64,
    y0: f64,
    x1: f64,
    y1: f64,
}

impl Box2 {
    /// The box of `text` at font size `size` with its baseline at `(x, y)`.
    fn text(x: f64, y: f64, text: &str, size: f64, anchor: &str) -> Box2 {
        let w = 0.66 * size * text.chars().count() as f64 + 3.0;
        let x0 = match anchor {
            "end" => x - w,
            "middle" => x - w / 2.0,
            _ => x,
        };
        Box2 {
            x0,
            y0: y - size - 1.5,
            x1: x0 + w,
            y1: y + 0.25 * size + 1.5,
        }
    }

    fn overlaps(&self, o: &Box2) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }

    fn inside(&self, width: f64, height: f64) -> bool {
        self.x0 >= 0.0 && self.y0 >= 0.0 && self.x1 <= width && self.y1 <= height
    }
}

/// Labels placed so far on one drawing: each new label goes to the first free place near
/// its point, inside the drawing, or is dropped.
struct Placer {
    width: f64,
    height: f64,
    taken: Vec<Box2>,
}

impl Placer {
    fn new(v: &View) -> Placer {
        Placer {
            width: v.width,
            height: v.height,
            taken: Vec::new(),
        }
    }

    /// A free baseline point and anchor for `text` near `(x, y)`, preferring `anchor`
    /// there; the place is then taken.
    fn place(
        &mut self,
        x: f64,
        y: f64,
        text: &str,
        size: f64,
        anchor: &'static str,
    ) -> Option<(f64, f64, &'static str)> {
        for dy in [0.0, -12.0, 12.0, -24.0, 24.0] {
            for a in [anchor, "end", "start", "middle"] {
                let b = Box2::text(x, y + dy, text, size, a);
                if b.inside(self.width, self.height) && !self.taken.iter().any(|t| t.overlaps(&b)) {
                    self.taken.push(b);
                    return Some((x, y + dy, a));
                }
            }
        }
        None
    }
}

/// One curve of moments along a member: `(x, M)` pairs, N·m.
pub type Curve = Vec<(f64, f64)>;

/// A labelled value on a diagram: member, x, moment (N·m).
pub type Label = (usize, f64, f64);

/// Moment diagrams on the members: for each member, curves filled to the member axis
/// (positive in one colour, negative in the other) and labels at the given points.
pub fn diagrams(
    model: &Model,
    curves: &[Vec<Curve>],
    labels: &[Label],
    title: &str,
    width: f64,
) -> String {
    let v = View::fit(model, width, 70.0);
    let u = &model.units;
    let peak = curves
        .iter()
        .flatten()
        .flatten()
        .map(|(_, m)| m.abs())
        .fold(0.0, f64::max);
    // The largest moment is drawn at 12 % of the frame's size, less where a fill would
    // leave the drawing (an outer column's moments drawn outward).
    let k = if peak > 0.0 {
        0.12 * v.span() / peak
    } else {
        0.0
    };
    let k = k * fill_fraction(model, &v, curves, k, 4.0);
    let mut out = open(&v, title);
    out.push_str(&members(model, &v, false));
    for (m, list) in curves.iter().enumerate() {
        for curve in list {
            if curve.len() < 2 {
                continue;
            }
            for (colour, keep) in [(style::POSITIVE, 1.0f64), (style::NEGATIVE, -1.0f64)] {
                let mut pts = Vec::new();
                let (x0, _) = curve[0];
                let base0 = along(model, m, x0, 0.0);
                let (bx, by) = v.at(base0.0, base0.1);
                pts.push(format!("{bx:.1},{by:.1}"));
                for &(x, mo) in curve {
                    let val = if mo * keep > 0.0 { mo } else { 0.0 };
                    let p = along(model, m, x, val * k);
                    let (px, py) = v.at(p.0, p.1);
                    pts.push(format!("{px:.1},{py:.1}"));
                }
                let (xl, _) = curve[curve.len() - 1];
                let base1 = along(model, m, xl, 0.0);
                let (ex, ey) = v.at(base1.0, base1.1);
                pts.push(format!("{ex:.1},{ey:.1}"));
                let _ = write!(
                    out,
                    r#"<polygon points="{}" fill="{colour}" fill-opacity="0.22" stroke="{colour}" stroke-width="1.3"/>"#,
                    pts.join(" ")
                );
            }
        }
    }
    let ml = u.label(Dimension::Moment);
    let title_text = format!("{} ({})", title, ml);
    // The title's box is taken first; labels go largest value first, each to the first
    // free place around its point, and a label with no free place is dropped (a lesser
    // value where two coincide).
    let mut taken = vec![Box2::text(8.0, 16.0, &title_text, 11.0, "start")];
    let mut order: Vec<&Label> = labels.iter().collect();
    order.sort_by(|a, b| b.2.abs().total_cmp(&a.2.abs()));
    for &(m, x, mo) in order {
        let p = along(model, m, x, mo * k);
        let (px, py) = v.at(p.0, p.1);
        let colour = if mo >= 0.0 {
            style::POSITIVE
        } else {
            style::NEGATIVE
        };
        let text = super::num(u.from_si(mo, Dimension::Moment), 1);
        let spot = LABEL_SPOTS.iter().find_map(|&(dx, dy, anchor)| {
            let b = Box2::text(px + dx, py + dy, &text, 10.0, anchor);
            (b.inside(v.width, v.height) && !taken.iter().any(|t| t.overlaps(&b))).then_some((
                px + dx,
                py + dy,
                anchor,
                b,
            ))
        });
        let Some((tx, ty, anchor, b)) = spot else {
            continue;
        };
        taken.push(b);
        let _ = write!(
            out,
            r#"<circle cx="{px:.1}" cy="{py:.1}" r="2.2" fill="{colour}"/><text x="{tx:.1}" y="{ty:.1}" font-size="10" fill="{colour}" text-anchor="{anchor}" paint-order="stroke" stroke="white" stroke-width="3">{}</text>"#,
            text
        );
    }
    let _ = write!(
        out,
        r#"<text x="8" y="16" font-size="11" fill="{}">{}</text>"#,
        style::MEMBER,
        esc(&title_text)
    );
    out.push_str("</svg>");
    out
}
