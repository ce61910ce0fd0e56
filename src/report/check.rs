//! Report of `plumbline check`: the stories, then for each factored case the story figures
//! and the per-member moments (no-sway part, sway part, amplifiers, design value).

use serde::Serialize;

use super::{CAUTION, OutputFormat, num, opt, table_of};
use crate::check::story::StiffnessSource;
use crate::check::{CaseCheck, CheckReport, MemberCheck};
use crate::envelope::{GoverningMoment, governing};
use crate::model::{Model, NotionalLoads, SecondOrderMethod, SettingOrigin, StiffnessPreset};
use crate::units::Dimension;

/// What the report says about the method in use.
pub fn method_title(m: SecondOrderMethod) -> &'static str {
    match m {
        SecondOrderMethod::AiscB1B2 => {
            "amplified first-order analysis, AISC 360-16 Appendix 8 (B1 on no-sway, B2 on sway moments)"
        }
        SecondOrderMethod::AciMagnifier => {
            "moment magnification, ACI 318-19 §6.6.4 (δ on no-sway, δs on sway moments)"
        }
        SecondOrderMethod::Ec3AlphaCr => {
            "EN 1993-1-1 §5.2 story criterion α_cr, sway effects amplified by 1/(1 − 1/α_cr)"
        }
        SecondOrderMethod::Direct => {
            "direct second-order elastic analysis (P-Δ and P-δ, members subdivided), iterated"
        }
    }
}

#[derive(Serialize)]
struct JsonDoc<'a> {
    title: &'a str,
    /// Unit of every field: SI base units throughout.
    units: JsonUnits,
    combinations: &'a str,
    method: SecondOrderMethod,
    method_description: &'a str,
    report: &'a CheckReport,
    /// The largest design moment of each member over the stable cases.
    governing: Vec<GoverningMoment>,
    caution: &'a str,
}

#[derive(Serialize)]
struct JsonUnits {
    length: &'static str,
    force: &'static str,
    moment: &'static str,
    stiffness: &'static str,
    displacement: &'static str,
}

/// Render `report` for `model` (whose units the tables use). `table_title` names the
/// combination table that produced the cases.
pub fn render(
    model: &Model,
    report: &CheckReport,
    table_title: &str,
    format: OutputFormat,
) -> String {
    match format {
        OutputFormat::Json => {
            let doc = JsonDoc {
                title: &model.title,
                units: JsonUnits {
                    length: "m",
                    force: "N",
                    moment: "N*m",
                    stiffness: "N/m",
                    displacement: "m",
                },
                combinations: table_title,
                method: report.method,
                method_description: method_title(report.method),
                report,
                governing: governing(report),
                caution: CAUTION,
            };
            serde_json::to_string_pretty(&doc).expect("a check report serializes") + "\n"
        }
        OutputFormat::Csv => csv(model, report),
        OutputFormat::Table => text(model, report, table_title),
    }
}

fn text(model: &Model, report: &CheckReport, table_title: &str) -> String {
    let u = &model.units;
    let mut out = String::new();
    out.push_str(&format!("{}\n", model.title));
    out.push_str(&format!("Combinations: {table_title}\n"));
    out.push_str(&format!(
        "Second-order method: {}\n",
        method_title(report.method)
    ));
    out.push_str(&settings_text(report));
    out.push('\n');
    let lu = u.label(Dimension::Length);
    let rows = report
        .stories
        .iter()
        .map(|s| {
            vec![
                s.number.to_string(),
                num(u.from_si(s.bottom, Dimension::Length), 2),
                num(u.from_si(s.top, Dimension::Length), 2),
                s.columns.join(" "),
            ]
        })
        .collect();
    out.push_str("Stories\n");
    out.push_str(&table_of(
        &[
            "story",
            &format!("bottom ({lu})"),
            &format!("top ({lu})"),
            "columns",
        ],
        rows,
    ));
    out.push_str("\n\n");
    for case in &report.cases {
        out.push_str(&case_text(model, case));
        out.push('\n');
    }
    out.push_str(&governing_text(model, report));
    let unstable: Vec<&str> = report
        .cases
        .iter()
        .filter(|c| !c.stable)
        .map(|c| c.id.as_str())
        .collect();
    if !unstable.is_empty() {
        out.push_str(&format!(
            "UNSTABLE cases (no design values): {}\n\n",
            unstable.join(", ")
        ));
    }
    out.push_str(PATTERN_LEGEND);
    out.push('\n');
    out.push_str(
        "Moments are internal bending moments, positive with the member's local −y face in \
         tension (sagging for a beam drawn left to right); N is positive in tension.\n",
    );
    out.push_str(&format!("{CAUTION}\n"));
    out
}

/// Plain words for where a setting came from.
fn origin_words(o: SettingOrigin, method: SecondOrderMethod) -> String {
    match o {
        SettingOrigin::Model => "from the model".into(),
        SettingOrigin::MethodDefault => format!("default of the {method} method"),
        SettingOrigin::CommandLine => "from the command line".into(),
    }
}

/// The heading lines on the analysis stiffness and the notional loads, each with where it
/// came from (issue 7 item 8).
pub fn settings_text(report: &CheckReport) -> String {
    let stiffness = match report.stiffness {
        StiffnessPreset::Gross => "gross section properties",
        StiffnessPreset::AciCracked => {
            "ACI 318-19 Table 6.6.3.1.1(a): 0.70 Ig columns, 0.35 Ig beams, 1.0 Ag"
        }
        StiffnessPreset::AiscDirect => {
            "AISC 360-16 §C2.3 direct-analysis rules: 0.8·τb·EI with τb = 1.0, 0.8·EA"
        }
    };
    let notional = match report.notional {
        NotionalLoads::Auto => match report.method {
            SecondOrderMethod::AiscB1B2 | SecondOrderMethod::Direct => {
                "AISC 360-16 §C2.2b, 0.002·Yi (+0.001·Yi per §C2.3(c) with τb = 1.0)".to_string()
            }
            SecondOrderMethod::Ec3AlphaCr => "EN 1993-1-1 §5.3.2 sway imperfection φ·N".into(),
            SecondOrderMethod::AciMagnifier => "none".into(),
        },
        NotionalLoads::None => "none".into(),
        NotionalLoads::Aisc { coefficient } => format!(
            "AISC 360-16 §C2.2b, {coefficient}·Yi{}",
            if report.stiffness == StiffnessPreset::AiscDirect {
                " (+0.001·Yi per §C2.3(c) with τb = 1.0, shown as its own term)"
            } else {
                ""
            }
        ),
        NotionalLoads::Ec3Imperfection => "EN 1993-1-1 §5.3.2 sway imperfection φ·N".into(),
    };
    format!(
        "Analysis stiffness: {} — {stiffness} ({})\nNotional loads: {notional} ({})\n",
        report.stiffness,
        origin_words(report.origin.stiffness, report.method),
        origin_words(report.origin.notional, report.method),
    )
}

/// The governing design moment of each member over the stable cases.
pub fn governing_text(model: &Model, report: &CheckReport) -> String {
    let u = &model.units;
    let (lm, lf, lu) = (
        u.label(Dimension::Moment),
        u.label(Dimension::Force),
        u.label(Dimension::Length),
    );
    let m = |v: f64| num(u.from_si(v, Dimension::Moment), 1);
    let rows = governing(report)
        .into_iter()
        .map(|g| {
            vec![
                g.member,
                m(g.moment),
                g.location.to_string(),
                num(u.from_si(g.x, Dimension::Length), 2),
                g.case,
                m(g.first_order),
                if g.first_order.abs() > 0.0 {
                    num(g.moment / g.first_order, 3)
                } else {
                    "-".into()
                },
                num(u.from_si(g.axial, Dimension::Force), 1),
                g.governs.to_string(),
            ]
        })
        .collect();
    let mut out = String::from("Governing design moments over the stable cases\n");
    out.push_str(&table_of(
        &[
            "member".to_string(),
            format!("M design ({lm})"),
            "at".into(),
            format!("x ({lu})"),
            "case".into(),
            format!("M first-order ({lm})"),
            "ratio".into(),
            format!("N ({lf})"),
            "larger part".into(),
        ],
        rows,
    ));
    out.push_str("\n\n");
    out
}

/// The text block of one case.
pub fn case_text(model: &Model, c: &CaseCheck) -> String {
    let u = &model.units;
    let (lf, ld) = (u.label(Dimension::Force), u.label(Dimension::Displacement));
    let f = |v: f64| num(u.from_si(v, Dimension::Force), 1);
    let mut out = format!("Case {}: {}  [{}]\n", c.id, c.expression, c.basis);
    let buckling = c
        .alpha_cr
        .map_or("no member in compression".to_string(), |a| {
            format!("α_cr = {}", num(a, 2))
        });
    let direct = if c.direct.converged {
        format!("converged in {} iterations", c.direct.iterations)
    } else {
        format!(
            "not converged: {}",
            c.direct.reason.clone().unwrap_or_default()
        )
    };
    out.push_str(&format!(
        "  elastic buckling: {buckling}; direct second-order analysis: {direct}\n"
    ));
    if c.notional.iter().any(|&n| n != 0.0) {
        let list = |v: &[f64]| v.iter().map(|&n| f(n)).collect::<Vec<String>>().join(", ");
        out.push_str(&format!(
            "  notional loads at story tops ({lf}): {}\n",
            list(&c.notional)
        ));
        if c.notional_terms.len() > 1 {
            for t in &c.notional_terms {
                out.push_str(&format!("    of which {}: {}\n", t.rule, list(&t.forces)));
            }
        } else if let Some(t) = c.notional_terms.first() {
            out.push_str(&format!("    rule: {}\n", t.rule));
        }
    }
    if !c.stable {
        out.push_str("  UNSTABLE: the loads exceed a critical load; no design values are given\n");
    }
    let rows = c
        .stories
        .iter()
        .map(|s| {
            vec![
                s.story.to_string(),
                f(s.sum_p),
                f(s.shear),
                num(u.from_si(s.drift, Dimension::Displacement), 3),
                if s.drift_ratio == 0.0 {
                    "0".into()
                } else {
                    format!("1/{:.0}", 1.0 / s.drift_ratio.abs())
                },
                num(s.q_index, 3),
                opt(s.b2, 3),
                opt(s.delta_s_q, 3),
                num(s.alpha_cr_story, 2),
                opt(s.drift_amplification, 3),
                opt(s.sway_amplifier, 3),
                pattern_label(s.stiffness_source).into(),
                s.classification.to_string(),
                s.criterion.clone(),
            ]
        })
        .collect();
    out.push_str(&indent(&table_of(
        &[
            "story".to_string(),
            format!("ΣP ({lf})"),
            format!("H ({lf})"),
            format!("drift ({ld})"),
            "drift/h".into(),
            "Q".into(),
            "B2".into(),
            "δs".into(),
            "α_cr".into(),
            "Δ2/Δ1".into(),
            "sway amp".into(),
            "H/Δ from".into(),
            "verdict".into(),
            "decided by".into(),
        ],
        rows,
    )));
    out.push('\n');
    let rows = c
        .members
        .iter()
        .map(|mc| {
            let mut row = member_row(model, mc, 1);
            row.push(mc.notes.join("; "));
            row
        })
        .collect();
    let mut header = member_header(model);
    header.push("notes".into());
    out.push_str(&indent(&table_of(&header, rows)));
    out.push('\n');
    out
}

/// Short label of the lateral pattern a story stiffness came from (legend in
/// [`PATTERN_LEGEND`]).
fn pattern_label(s: StiffnessSource) -> &'static str {
    match s {
        StiffnessSource::CaseSway => "case",
        StiffnessSource::GravityPattern => "gravity",
        StiffnessSource::UniformPattern => "uniform",
        StiffnessSource::Support => "support",
    }
}

/// What the "H/Δ from" column means.
pub const PATTERN_LEGEND: &str = "H/Δ from: the lateral pattern of each story's stiffness — case: \
the case's own level forces (they push every story the same way); gravity: level forces ∝ \
the level gravity loads Yi; uniform: equal level forces; support: the level is held. AISC \
360-16 App. 8 lets H and ΔH come from any lateral load (from memory).";

fn indent(s: &str) -> String {
    s.lines().map(|l| format!("  {l}\n")).collect()
}

fn csv(model: &Model, report: &CheckReport) -> String {
    let mut header = vec!["case".to_string()];
    header.extend(member_header(model));
    header.push("stable".into());
    let mut out = header.join(",") + "\n";
    for c in &report.cases {
        for mc in &c.members {
            let mut row = vec![c.id.clone()];
            row.extend(member_row(model, mc, 3));
            row.push((c.stable && mc.stable).to_string());
            out.push_str(&row.join(","));
            out.push('\n');
        }
    }
    out
}

/// Column heads of the per-member results, in the model's units.
fn member_header(model: &Model) -> Vec<String> {
    let u = &model.units;
    let (lf, lm, lu) = (
        u.label(Dimension::Force),
        u.label(Dimension::Moment),
        u.label(Dimension::Length),
    );
    vec![
        "member".to_string(),
        format!("N ({lf})"),
        format!("V ({lf})"),
        "non-sway amp".into(),
        "sway amp".into(),
        format!("Mns i ({lm})"),
        format!("Ms i ({lm})"),
        format!("M i ({lm})"),
        format!("Mns j ({lm})"),
        format!("Ms j ({lm})"),
        format!("M j ({lm})"),
        format!("x span ({lu})"),
        format!("M span ({lm})"),
        "larger part".into(),
    ]
}

/// One member's results under [`member_header`], forces and moments to `decimals`.
fn member_row(model: &Model, mc: &MemberCheck, decimals: usize) -> Vec<String> {
    let u = &model.units;
    let f = |v: f64| num(u.from_si(v, Dimension::Force), decimals);
    let m = |v: f64| num(u.from_si(v, Dimension::Moment), decimals);
    vec![
        mc.member.clone(),
        f(mc.axial),
        f(mc.shear),
        opt(mc.non_sway_amplifier, 3),
        opt(mc.sway_amplifier, 3),
        m(mc.ends[0].no_sway),
        m(mc.ends[0].sway),
        m(mc.ends[0].design),
        m(mc.ends[1].no_sway),
        m(mc.ends[1].sway),
        m(mc.ends[1].design),
        num(u.from_si(mc.span.x, Dimension::Length), 2),
        m(mc.span.design),
        mc.governs.to_string(),
    ]
}
