//! The "Serviceability" section of the summary: story drift, beam deflection and seismic
//! drift under the serviceability table's cases, each against its limit, as text, Markdown
//! and CSV tables in the model's units (JSON carries [`ServiceReport`] in SI).

use super::num;
use super::summary::Table;
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
                    let d = case(&s.largest_case)
                        .map_or(0.0, |c| c.stories[s.story - 1].drift());
                    (d, "none".into(), "-".into(), s.largest_case.clone(), "no limit".into())
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
        name: "service_stories",
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
        name: "service_beams",
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
        name: "service_seismic",
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
        format!("Service cases: {} ({})", r.table_line, r.table),
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
