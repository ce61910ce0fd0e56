//! The "Serviceability" section of the summary: story drift, beam deflection and seismic
//! drift under the serviceability table's cases, each against its limit, as text, Markdown
//! and CSV tables in the model's units (JSON carries [`ServiceReport`] in SI).

use super::num;
use super::page::Table;
use crate::model::Model;
use crate::service::{Governing, ServiceReport};
use crate::units::Dimension;

/// A drift or deflection ratio as `1/N` (`0` when there is none).
pub fn one_over(r: f64) -> String {
    if r > 0.0 && r.is_finite() {
        format!("1/{:.0}", 1.0 / r)
    } else {
        "0".into()
    }
}

/// A displacement in the model's units.
fn disp(model: &Model, v: f64) -> String {
    num(model.units.from_si(v, Dimension::Displacement), 3)
}

/// A length in the model's units.
fn len(model: &Model, v: f64) -> String {
    num(model.units.from_si(v, Dimension::Length), 2)
}

/// `ok` or `EXCEEDS` for a ratio against 1.
fn verdict(ratio: f64) -> String {
    if ratio <= 1.0 { "ok" } else { "EXCEEDS" }.into()
}

/// The story drift table: each story's governing service drift against h/N.
pub fn story_table(model: &Model, r: &ServiceReport) -> Table {
    let du = model.units.label(Dimension::Displacement);
    let lu = model.units.label(Dimension::Length);
    let rows = r
        .stories
        .iter()
        .map(|s| {
            let case = |id: &str| r.cases.iter().find(|c| c.id == id);
            let (drift, limit, ratio, id, verdict_text) = match &s.governing {
                Some(g) => {
                    let n = s.height / g.limit;
                    (
                        g.value,
                        format!("h/{n:.0}"),
                        num(g.ratio, 2),
                        g.case.clone(),
                        verdict(g.ratio),
                    )
                }
                None => {
                    let d = case(&s.largest_case).map_or(0.0, |c| c.stories[s.story - 1].drift());
                    (
                        d,
                        "none".into(),
                        "-".into(),
                        s.largest_case.clone(),
                        "no limit".into(),
                    )
                }
            };
            let amp = case(&id)
                .and_then(|c| c.stories[s.story - 1].amplification)
                .map_or("-".into(), |a| num(a, 3));
            let verdict_text = match &s.unstable_case {
                Some(c) => format!("UNSTABLE at service load ({c})"),
                None => verdict_text,
            };
            vec![
                s.story.to_string(),
                len(model, s.height),
                disp(model, drift),
                one_over((drift / s.height).abs()),
                limit,
                ratio,
                amp,
                id,
                verdict_text,
            ]
        })
        .collect();
    Table {
        name: "service-stories",
        title: "Story drift under service loads (P-Δ at service load), governing case against \
                its limit"
            .into(),
        header: vec![
            "story".into(),
            format!("h ({lu})"),
            format!("drift ({du})"),
            "drift/h".into(),
            "limit".into(),
            "ratio".into(),
            "Δ2nd/Δ1st".into(),
            "case".into(),
            "verdict".into(),
        ],
        rows,
    }
}

/// The beam deflection table: live and total deflection relative to the chord against L/N.
pub fn beam_table(model: &Model, r: &ServiceReport) -> Table {
    let du = model.units.label(Dimension::Displacement);
    let lu = model.units.label(Dimension::Length);
    let n_of = |g: &Governing, l: f64| format!("L/{:.0}", l / g.limit);
    let part = |g: &Option<Governing>, l: f64| -> [String; 3] {
        match g {
            Some(g) => [disp(model, g.value), n_of(g, l), g.case.clone()],
            None => ["-".into(), "none".into(), "-".into()],
        }
    };
    let rows = r
        .beams
        .iter()
        .map(|b| {
            let [lv, ll, lc] = part(&b.live, b.limit_length);
            let [tv, tl, tc] = part(&b.total, b.limit_length);
            let (ratio, v) = match b.ratio() {
                Some(x) => (num(x, 2), verdict(x)),
                None => ("-".into(), "no limit".into()),
            };
            let l = if b.cantilever {
                format!("{} (cantilever)", len(model, b.length))
            } else {
                len(model, b.length)
            };
            vec![b.member.clone(), l, lv, ll, lc, tv, tl, tc, ratio, v]
        })
        .collect();
    Table {
        name: "service-beams",
        title: "Beam deflection relative to the chord: variable gravity part (live) and whole \
                case (total)"
            .into(),
        header: vec![
            "beam".into(),
            format!("L ({lu})"),
            format!("live ({du})"),
            "limit".into(),
            "case".into(),
            format!("total ({du})"),
            "limit".into(),
            "case".into(),
            "ratio".into(),
            "verdict".into(),
        ],
        rows,
    }
}

/// The seismic drift table (ASCE/SEI 7-16 §12.8.6 against Table 12.12-1).
pub fn seismic_table(model: &Model, r: &ServiceReport) -> Table {
    let du = model.units.label(Dimension::Displacement);
    let rows = r
        .seismic
        .iter()
        .map(|s| {
            vec![
                s.story.to_string(),
                s.case.clone(),
                disp(model, s.delta_xe),
                disp(model, s.delta),
                disp(model, s.allowable),
                num(s.ratio, 2),
                verdict(s.ratio),
            ]
        })
        .collect();
    let title = match &r.limits.seismic {
        Some(l) => format!(
            "Seismic story drift, ASCE/SEI 7-16 §12.8.6 Δ = Cd·δxe/Ie (Cd = {}, Ie = {}) against \
             Table 12.12-1 Δa = {}·hsx, risk category {}",
            num(l.cd, 2),
            num(l.ie, 2),
            num(l.allowable_ratio, 3),
            l.risk_category
        ),
        None => "Seismic story drift".into(),
    };
    Table {
        name: "service-seismic",
        title,
        header: vec![
            "story".into(),
            "case".into(),
            format!("δxe ({du})"),
            format!("Δ ({du})"),
            format!("Δa ({du})"),
            "ratio".into(),
            "verdict".into(),
        ],
        rows,
    }
}

/// The section's tables in page order, empty ones left out.
pub fn tables(model: &Model, r: &ServiceReport) -> Vec<Table> {
    [
        story_table(model, r),
        beam_table(model, r),
        seismic_table(model, r),
    ]
    .into_iter()
    .filter(|t| !t.rows.is_empty())
    .collect()
}

/// The section's opening lines: the table, the stiffness, the limits.
pub fn heading_lines(r: &ServiceReport) -> Vec<String> {
    let l = &r.limits;
    let drift: Vec<String> = l
        .drift
        .iter()
        .map(|(c, n)| format!("{c} h/{}", num(*n, 0)))
        .collect();
    let defl = |n: Option<f64>| n.map_or("none".to_string(), |n| format!("L/{}", num(n, 0)));
    vec![
        format!("Service cases: {} ({})", r.table, r.table_line),
        format!(
            "Service stiffness: {}; P-Δ at service load; no notional loads, no amplifiers",
            r.stiffness
        ),
        format!(
            "Limits: story drift {}; beam deflection live {}, total {}{}",
            if drift.is_empty() {
                "none".into()
            } else {
                drift.join(", ")
            },
            defl(l.deflection_live),
            defl(l.deflection_total),
            if l.cantilever_factor != 1.0 {
                format!(", cantilevers on {}·L", num(l.cantilever_factor, 1))
            } else {
                String::new()
            }
        ),
    ]
}

/// What the strength half's drifts are when the run also has a serviceability half.
pub const STRENGTH_DRIFT_NOTE: &str = "Drifts in the strength tables are under factored loads, with the analysis stiffness and notional loads: strength figures. The serviceability drifts are those of the Serviceability section.";

/// The closing verdict line.
pub fn verdict_line(r: &ServiceReport) -> String {
    let unstable: Vec<&str> = r
        .cases
        .iter()
        .filter(|c| !c.converged)
        .map(|c| c.id.as_str())
        .collect();
    if !unstable.is_empty() {
        return format!(
            "Serviceability: UNSTABLE at service load in {}",
            unstable.join(", ")
        );
    }
    if r.all_within_limits() {
        "Serviceability: every figure with a limit is within it".into()
    } else {
        "Serviceability: some figures EXCEED their limits (see the verdicts above)".into()
    }
}

/// Colours of the service drawings (our own, print-friendly).
mod colour {
    pub const LIMIT: &str = "#b5452b";
    pub const AXIS: &str = "#5c6b73";
    pub const UNDEFORMED: &str = "#c9d1d6";
    pub const SHAPE: &str = "#2a5d9f";
    /// One per case line of the drift profile, in turn.
    pub const CASES: [&str; 5] = ["#2a5d9f", "#1f7a5a", "#8a4b08", "#6b3fa0", "#1d262d"];
}

/// The cases drawn in the drift profile: each story's governing (or largest) case, once.
fn profile_cases(r: &ServiceReport) -> Vec<&str> {
    let mut out: Vec<&str> = Vec::new();
    for s in &r.stories {
        let id = s
            .governing
            .as_ref()
            .map_or(s.largest_case.as_str(), |g| g.case.as_str());
        if !out.contains(&id) {
            out.push(id);
        }
    }
    out
}

/// The drift profile: story height against drift ratio |Δ|/h, one stepped line per
/// governing case and the limit h/N drawn dashed. SVG, `width` px wide.
pub fn drift_profile_svg(r: &ServiceReport, width: f64) -> String {
    use std::fmt::Write;
    let height = 360.0;
    let (left, right, top, bottom) = (70.0, 20.0, 20.0, 50.0);
    // Levels measured from the base, story heights stacked.
    let mut levels = vec![0.0];
    for h in r.stories.iter().map(|s| s.height) {
        let last = *levels.last().unwrap_or(&0.0);
        levels.push(last + h);
    }
    let total_h = levels.last().copied().unwrap_or(1.0).max(1e-9);
    let cases = profile_cases(r);
    let ratio_of = |c: &crate::service::ServiceCase, s: usize| {
        (c.stories[s].drift() / c.stories[s].height).abs()
    };
    let limit_ratio = |s: usize| {
        r.stories[s]
            .governing
            .as_ref()
            .map(|g| g.limit / r.stories[s].height)
    };
    let mut xmax = 0.0_f64;
    for id in &cases {
        if let Some(c) = r.cases.iter().find(|c| c.id == *id) {
            for s in 0..c.stories.len() {
                xmax = xmax.max(ratio_of(c, s));
            }
        }
    }
    for s in 0..r.stories.len() {
        xmax = xmax.max(limit_ratio(s).unwrap_or(0.0));
    }
    let xmax = if xmax > 0.0 && xmax.is_finite() {
        xmax * 1.1
    } else {
        1.0
    };
    let px = |x: f64| left + (width - left - right) * x / xmax;
    let py = |y: f64| height - bottom - (height - top - bottom) * y / total_h;
    let mut out = format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" class="drawing drift-profile" viewBox="0 0 {width:.0} {height:.0}" width="{width:.0}" height="{height:.0}" role="img" aria-label="Story drift profile" font-family="inherit">"#
    );
    // Axes, level lines and ticks.
    let _ = write!(
        out,
        r#"<line x1="{l:.1}" y1="{b:.1}" x2="{r:.1}" y2="{b:.1}" stroke="{a}"/><line x1="{l:.1}" y1="{b:.1}" x2="{l:.1}" y2="{t:.1}" stroke="{a}"/>"#,
        l = left,
        r = width - right,
        b = height - bottom,
        t = top,
        a = colour::AXIS
    );
    for (k, y) in levels.iter().enumerate() {
        let _ = write!(
            out,
            r#"<line x1="{l:.1}" y1="{y:.1}" x2="{r:.1}" y2="{y:.1}" stroke="{u}" stroke-dasharray="2 4"/><text x="{tx:.1}" y="{ty:.1}" font-size="11" text-anchor="end">level {k}</text>"#,
            l = left,
            r = width - right,
            y = py(*y),
            u = colour::UNDEFORMED,
            tx = left - 6.0,
            ty = py(*y) + 4.0
        );
    }
    for k in 1..=4 {
        let x = xmax * k as f64 / 4.0;
        let _ = write!(
            out,
            r#"<text x="{:.1}" y="{:.1}" font-size="11" text-anchor="middle">{}</text>"#,
            px(x),
            height - bottom + 16.0,
            one_over(x)
        );
    }
    let _ = write!(
        out,
        r#"<text x="{:.1}" y="{:.1}" font-size="12" text-anchor="middle">story drift ratio |Δ|/h</text>"#,
        left + (width - left - right) / 2.0,
        height - 10.0
    );
    // The limit, story by story.
    for s in 0..r.stories.len() {
        if let Some(lr) = limit_ratio(s) {
            let _ = write!(
                out,
                r#"<line class="limit" x1="{x:.1}" y1="{y0:.1}" x2="{x:.1}" y2="{y1:.1}" stroke="{c}" stroke-width="2" stroke-dasharray="6 4"/>"#,
                x = px(lr),
                y0 = py(levels[s]),
                y1 = py(levels[s + 1]),
                c = colour::LIMIT
            );
        }
    }
    // One stepped line per case.
    for (n, id) in cases.iter().enumerate() {
        let Some(c) = r.cases.iter().find(|c| c.id == *id) else {
            continue;
        };
        let col = colour::CASES[n % colour::CASES.len()];
        let mut pts = Vec::new();
        for s in 0..c.stories.len() {
            let x = px(ratio_of(c, s));
            pts.push(format!("{x:.1},{:.1}", py(levels[s])));
            pts.push(format!("{x:.1},{:.1}", py(levels[s + 1])));
        }
        let _ = write!(
            out,
            r#"<polyline class="drift" data-case="{}" points="{}" fill="none" stroke="{col}" stroke-width="2"/>"#,
            super::svg::esc(id),
            pts.join(" ")
        );
        let _ = write!(
            out,
            r#"<text x="{:.1}" y="{:.1}" font-size="11" fill="{col}" text-anchor="end">{}</text>"#,
            width - right - 4.0,
            top + 14.0 * (n + 1) as f64,
            super::svg::esc(id)
        );
    }
    out.push_str("</svg>");
    out
}

/// The deflected shape of the governing service case: the members drawn dashed as built
/// and solid between their displaced ends, the displacements magnified to a visible size
/// (the factor is returned). SVG, `width` px wide.
pub fn deflected_shape_svg(model: &Model, r: &ServiceReport, width: f64) -> Option<(String, f64)> {
    use std::fmt::Write;
    let case = r.shape.as_ref()?;
    // The largest displacement is drawn SHOWN px long, inside the margin.
    const SHOWN: f64 = 50.0;
    let v = super::svg::View::fit(model, width, SHOWN + 20.0);
    let largest = case
        .displacements
        .iter()
        .map(|d| d[0].hypot(d[1]))
        .fold(0.0, f64::max);
    let factor = if largest > 0.0 && largest.is_finite() {
        SHOWN / (v.scale * largest)
    } else {
        1.0
    };
    let mut out = format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" class="drawing deflected" viewBox="0 0 {w:.0} {h:.0}" width="{w:.0}" height="{h:.0}" role="img" aria-label="Deflected shape, case {id}" font-family="inherit">"#,
        w = v.width,
        h = v.height,
        id = super::svg::esc(&case.case)
    );
    for mem in &model.members {
        let (a, b) = (&model.nodes[mem.i], &model.nodes[mem.j]);
        let (x1, y1) = v.at(a.x, a.y);
        let (x2, y2) = v.at(b.x, b.y);
        let _ = write!(
            out,
            r#"<line x1="{x1:.1}" y1="{y1:.1}" x2="{x2:.1}" y2="{y2:.1}" stroke="{}" stroke-width="2" stroke-dasharray="5 4"/>"#,
            colour::UNDEFORMED
        );
        let (da, db) = (case.displacements[mem.i], case.displacements[mem.j]);
        let (x1, y1) = v.at(a.x + factor * da[0], a.y + factor * da[1]);
        let (x2, y2) = v.at(b.x + factor * db[0], b.y + factor * db[1]);
        let _ = write!(
            out,
            r#"<line class="shape" data-shape="{}" x1="{x1:.1}" y1="{y1:.1}" x2="{x2:.1}" y2="{y2:.1}" stroke="{}" stroke-width="2.5"/>"#,
            super::svg::esc(&mem.id),
            colour::SHAPE
        );
    }
    out.push_str("</svg>");
    Some((out, factor))
}
