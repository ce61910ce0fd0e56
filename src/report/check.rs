//! Report of `plumbline check`: the stories, then for each factored case the story figures
//! and the per-member moments (no-sway part, sway part, amplifiers, design value).

use super::page::RowStream;
use super::{num, opt, table_fitting, table_of, text_width};
use crate::check::story::StiffnessSource;
use crate::check::{CaseCheck, CheckReport, MemberCheck, StoryFigures};
use crate::model::{Model, SecondOrderMethod};
use crate::units::Dimension;

/// Heading of the per-case detail, printed after the summary (issue 20).
pub const DETAIL_HEADING: &str = "Per-case detail";

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

/// The per-case detail as text: the stories, then each case's story and member tables.
pub fn detail_text(model: &Model, report: &CheckReport) -> String {
    let u = &model.units;
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
    let mut out = String::from("Stories\n");
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
    out.push_str(PATTERN_LEGEND);
    out.push('\n');
    out.push_str(crate::check::story::DRIFT_NOTE);
    out.push_str("\n\n");
    out
}

/// The per-case detail as tables for CSV: one row per case and member, per case and story,
/// per case and support, and per case and member end. Each row is formed as it is written,
/// so the largest of them (a row per case and member) is never held whole. Without
/// `members` (a lean run, which keeps no case's member results) the two tables of member
/// rows are left out.
pub fn detail_tables<'a>(
    model: &'a Model,
    report: &'a CheckReport,
    members: bool,
) -> Vec<RowStream<'a>> {
    let mut header = vec!["case".to_string()];
    header.extend(member_header(model));
    header.push("stable".into());
    let case_members = RowStream {
        name: "case-members",
        header,
        rows: Box::new(report.cases.iter().flat_map(move |c| {
            c.members.iter().map(move |mc| {
                let mut row = vec![c.id.clone()];
                row.extend(member_row(model, mc, 3));
                row.push((c.stable && mc.stable).to_string());
                row
            })
        })),
    };
    let mut header = vec!["case".to_string()];
    header.extend(story_header(model));
    let stories = RowStream {
        name: "case-stories",
        header,
        rows: Box::new(report.cases.iter().flat_map(move |c| {
            c.stories.iter().map(move |s| {
                let mut row = vec![c.id.clone()];
                row.extend(story_row(model, s, 3));
                row
            })
        })),
    };
    let mut header = vec!["case".to_string()];
    header.extend(super::handoff::case_reaction_header(model));
    let reactions = RowStream {
        name: "case-reactions",
        header,
        rows: Box::new(report.cases.iter().flat_map(move |c| {
            super::handoff::case_reaction_rows(model, c, 3)
                .into_iter()
                .map(move |r| std::iter::once(c.id.clone()).chain(r).collect())
        })),
    };
    let end_actions = RowStream {
        name: "case-end-actions",
        header: super::handoff::case_end_action_header(model),
        rows: Box::new(
            report
                .cases
                .iter()
                .flat_map(move |c| super::handoff::case_end_action_rows(model, c)),
        ),
    };
    if members {
        vec![case_members, stories, reactions, end_actions]
    } else {
        vec![stories, reactions]
    }
}

/// The text block of one case.
pub fn case_text(model: &Model, c: &CaseCheck) -> String {
    let u = &model.units;
    let lf = u.label(Dimension::Force);
    let f = |v: f64| num(u.from_si(v, Dimension::Force), 1);
    let mut out = format!("Case {}: {}  [{}]\n", c.id, c.expression, c.basis);
    let mut buckling = c.alpha_cr.map_or("no sway mode".to_string(), |a| {
        format!("α_cr = {} (lowest sway mode)", num(a, 2))
    });
    if let Some(m) = &c.member_mode {
        buckling.push_str(&format!(
            "; member {} buckles on its own at {} (a member check)",
            m.member,
            num(m.alpha, 2)
        ));
    }
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
        // Each rule on its own line, so that no coefficient is raised silently.
        if c.notional_terms.len() > 1 {
            for t in &c.notional_terms {
                out.push_str(&format!("    of which {}: {}\n", t.rule, list(&t.forces)));
            }
        } else if let Some(t) = c.notional_terms.first() {
            out.push_str(&format!("    rule: {}\n", t.rule));
        }
    }
    let ld = u.label(Dimension::Displacement);
    let d = |v: f64| num(u.from_si(v, Dimension::Displacement), 2);
    out.push_str(&format!(
        "  top drift ({ld}): first-order {}, second-order {} (factored loads: not a \
         serviceability drift)\n",
        d(c.top_drift_first_order),
        c.top_drift_second_order.map_or("-".into(), d)
    ));
    if !c.stable {
        out.push_str("  UNSTABLE: the loads exceed a critical load; no design values are given\n");
    }
    let rows = c.stories.iter().map(|s| story_row(model, s, 1)).collect();
    out.push_str(&indent(&table_fitting(
        &story_header(model),
        rows,
        text_width().saturating_sub(INDENT),
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
    out.push_str(&indent(&table_fitting(
        &header,
        rows,
        text_width().saturating_sub(INDENT),
    )));
    out.push('\n');
    if !model.supports.is_empty() {
        out.push_str("  support reactions: design (second-order analysis) and first-order\n");
        out.push_str(&indent(&table_of(
            &super::handoff::case_reaction_header(model),
            super::handoff::case_reaction_rows(model, c, 1),
        )));
        out.push('\n');
    }
    out
}

/// Column heads of the per-story results of one case, in the model's units.
fn story_header(model: &Model) -> Vec<String> {
    let u = &model.units;
    let (lf, ld) = (u.label(Dimension::Force), u.label(Dimension::Displacement));
    vec![
        "story".to_string(),
        format!("ΣP ({lf})"),
        format!("H ({lf})"),
        format!("drift ({ld})"),
        "drift/h".into(),
        format!("drift 2nd ({ld})"),
        "Q".into(),
        "B2".into(),
        "δs".into(),
        "α_cr".into(),
        "Δ2/Δ1".into(),
        "sway amp".into(),
        "H/Δ from".into(),
        "verdict".into(),
        "decided by".into(),
    ]
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

/// One story's results under [`story_header`], forces to `decimals`.
fn story_row(model: &Model, s: &StoryFigures, decimals: usize) -> Vec<String> {
    let u = &model.units;
    let f = |v: f64| num(u.from_si(v, Dimension::Force), decimals);
    vec![
        s.story.to_string(),
        f(s.sum_p),
        f(s.shear),
        num(u.from_si(s.drift, Dimension::Displacement), decimals + 2),
        super::drift_ratio_text(s.drift_ratio),
        s.drift_second_order.map_or("-".into(), |d| {
            num(u.from_si(d, Dimension::Displacement), decimals + 2)
        }),
        num(s.q_index, 3),
        opt(s.b2, 3),
        opt(s.delta_s_q, 3),
        num(s.alpha_cr_story, 2),
        if s.drift_negligible && s.drift_amplification.is_none() {
            "negligible".into()
        } else {
            opt(s.drift_amplification, 3)
        },
        match s.route {
            crate::check::story::SwayRoute::SecondOrderAnalysis => "2nd-order".into(),
            _ => opt(s.sway_amplifier, 3),
        },
        pattern_label(s.stiffness_source).into(),
        s.classification.to_string(),
        s.criterion.clone(),
    ]
}

/// Indentation of the tables of one case.
const INDENT: usize = 2;

fn indent(s: &str) -> String {
    let pad = " ".repeat(INDENT);
    s.lines()
        .map(|l| {
            if l.is_empty() {
                "\n".to_string()
            } else {
                format!("{pad}{l}\n")
            }
        })
        .collect()
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
