//! The hand-off tables beside the moments (issue 17): design axial forces of braces and
//! beams, design shears at member ends, the factored reaction envelope and the unfactored
//! reactions of every service load case. One builder per table serves text, Markdown and
//! CSV (`tidy`: every row and the concurrent values, more decimals).

use super::num;
use super::page::{Setting, Summary, Table};
use crate::envelope::{AxialEnvelope, COMPONENTS, ComponentEnvelope, Location};
use crate::model::SecondOrderMethod;
use crate::units::Dimension;

/// A beam's axial row appears on the page when its largest |N| is at least this share of
/// the largest |N| of any member (a display threshold, common practice, no source: the CSV
/// and JSON hold every member).
pub const BEAM_AXIAL_SHOWN: f64 = 0.02;

/// Values in the model's units.
struct Units<'a>(&'a crate::model::Model);

impl Units<'_> {
    fn label(&self, d: Dimension) -> String {
        self.0.units.label(d)
    }
    fn v(&self, v: f64, d: Dimension, decimals: usize) -> String {
        num(self.0.units.from_si(v, d), decimals)
    }
    fn f(&self, v: f64, decimals: usize) -> String {
        self.v(v, Dimension::Force, decimals)
    }
    fn m(&self, v: f64, decimals: usize) -> String {
        self.v(v, Dimension::Moment, decimals)
    }
}

/// The dimension of reaction component `k` of `[Rx, Ry, Mz]`.
fn component_dimension(name: &str) -> Dimension {
    if name == COMPONENTS[2] {
        Dimension::Moment
    } else {
        Dimension::Force
    }
}

/// The assumptions row that says where the design axial forces, shears and reactions come
/// from, with the clause.
pub fn handoff_setting(method: SecondOrderMethod) -> Setting {
    let forces = match method {
        SecondOrderMethod::AiscB1B2 => {
            "N = Pnt + B2·Plt (AISC 360-16 A-8-2) and V = Vnt + B2·Vlt (from memory)"
        }
        SecondOrderMethod::AciMagnifier => {
            "N and V first-order: ACI 318-19 6.6.4.6.1 magnifies moments only (from memory)"
        }
        SecondOrderMethod::Ec3AlphaCr => {
            "N and V with sway effects × 1/(1 − 1/α_cr) (EN 1993-1-1 5.2.2(5)B)"
        }
        SecondOrderMethod::Direct => "N and V of the second-order analysis",
    };
    Setting {
        setting: "axial forces, shears, reactions".into(),
        value: format!(
            "{forces}, or the second-order analysis where the moments come from it; factored \
             reactions from each case's second-order analysis (notional forces included), \
             since a fixed base resists the column's second-order moment: ΣRx and ΣRy equal \
             that analysis's loads, ΣMz balances them in the deformed geometry"
        ),
        source: "program default".into(),
    }
}

/// The largest |N| of a member's axial envelope, N.
fn largest_axial(a: &AxialEnvelope) -> f64 {
    [&a.tension, &a.compression]
        .into_iter()
        .flatten()
        .fold(0.0, |m, r| m.max(r.axial.abs()))
}

/// Design axial forces: on the page braces, and beams that carry a significant axial force
/// ([`BEAM_AXIAL_SHOWN`]); with `tidy` every member.
pub fn axial_table(s: &Summary, tidy: bool) -> Table {
    let u = Units(s.model);
    let d = if tidy { 3 } else { 1 };
    let (lm, lf) = (u.label(Dimension::Moment), u.label(Dimension::Force));
    let frame_largest = s
        .envelope
        .axial
        .iter()
        .map(largest_axial)
        .fold(0.0, f64::max);
    let shown = |a: &AxialEnvelope| {
        tidy || a.role == "brace"
            || (a.role == "beam" && largest_axial(a) >= BEAM_AXIAL_SHOWN * frame_largest)
    };
    let mut rows = Vec::new();
    for a in s.envelope.axial.iter().filter(|a| shown(a)) {
        for (kind, r) in [("tension", &a.tension), ("compression", &a.compression)] {
            let Some(r) = r else { continue };
            let mut row = vec![
                a.member.clone(),
                a.role.clone(),
                kind.to_string(),
                u.f(r.axial, d),
                u.m(r.moment_i, d),
                u.m(r.moment_j, d),
                u.m(r.moment_span, d),
                u.f(r.shear, d),
                r.case.clone(),
            ];
            if tidy {
                row.push(r.expression.clone());
            }
            rows.push(row);
        }
    }
    let mut header = vec![
        "member".to_string(),
        "role".into(),
        "largest".into(),
        format!("N ({lf})"),
        format!("M i ({lm})"),
        format!("M j ({lm})"),
        format!("M span ({lm})"),
        format!("V ({lf})"),
        "case".into(),
    ];
    if tidy {
        header.push("expression".into());
    }
    Table {
        name: "axial",
        title: if tidy {
            "Design axial forces: largest tension and compression of every member".into()
        } else {
            format!(
                "Braces and beams: largest design tension and compression with the concurrent \
                 design moments (beams with |N| under {:.0} % of the frame's largest: CSV, JSON)",
                100.0 * BEAM_AXIAL_SHOWN
            )
        },
        header,
        rows,
    }
}

/// Design shears: on the page one row per member with both ends; with `tidy` one row per
/// end with the concurrent moment and axial force.
pub fn shear_table(s: &Summary, tidy: bool) -> Table {
    let u = Units(s.model);
    let (lm, lf) = (u.label(Dimension::Moment), u.label(Dimension::Force));
    if tidy {
        let rows = s
            .envelope
            .shear
            .iter()
            .map(|r| {
                vec![
                    r.member.clone(),
                    r.role.clone(),
                    r.location.to_string(),
                    u.f(r.shear, 3),
                    u.m(r.moment, 3),
                    u.f(r.axial, 3),
                    r.case.clone(),
                    r.expression.clone(),
                ]
            })
            .collect();
        return Table {
            name: "shear",
            title: "Design shears: the largest |V| at each member end".into(),
            header: vec![
                "member".into(),
                "role".into(),
                "end".into(),
                format!("V ({lf})"),
                format!("M ({lm})"),
                format!("N ({lf})"),
                "case".into(),
                "expression".into(),
            ],
            rows,
        };
    }
    let mut rows: Vec<Vec<String>> = Vec::new();
    for r in &s.envelope.shear {
        let cells = [u.f(r.shear, 1), r.case.clone()];
        match rows.last_mut() {
            Some(row) if row[0] == r.member && r.location == Location::EndJ => {
                row[4..6].clone_from_slice(&cells);
            }
            _ => {
                let mut row = vec![r.member.clone(), r.role.clone()];
                if r.location == Location::EndI {
                    row.extend(cells);
                    row.extend(["-".to_string(), "-".to_string()]);
                } else {
                    row.extend(["-".to_string(), "-".to_string()]);
                    row.extend(cells);
                }
                rows.push(row);
            }
        }
    }
    Table {
        name: "shear",
        title: "Design shears: the largest |V| at each member end (concurrent M and N: CSV, JSON)"
            .into(),
        header: vec![
            "member".into(),
            "role".into(),
            format!("V i ({lf})"),
            "case".into(),
            format!("V j ({lf})"),
            "case".into(),
        ],
        rows,
    }
}

/// One component's value in the model's units.
fn component_value(u: &Units, c: &ComponentEnvelope, v: f64, decimals: usize) -> String {
    u.v(v, component_dimension(&c.component), decimals)
}

/// The factored reaction envelope: per support and restrained component, the largest and
/// smallest value with its case; with `tidy` one row per extreme with the concurrent
/// components.
pub fn reaction_table(s: &Summary, tidy: bool) -> Table {
    let u = Units(s.model);
    let d = if tidy { 3 } else { 1 };
    let (lm, lf) = (u.label(Dimension::Moment), u.label(Dimension::Force));
    let name = |c: &ComponentEnvelope| {
        if c.spring {
            format!("{} (spring)", c.component)
        } else {
            c.component.clone()
        }
    };
    let mut rows = Vec::new();
    for sup in &s.envelope.reactions {
        for c in &sup.components {
            if tidy {
                for (kind, r) in [("max", &c.max), ("min", &c.min)] {
                    let Some(r) = r else { continue };
                    rows.push(vec![
                        sup.node.clone(),
                        name(c),
                        kind.into(),
                        component_value(&u, c, r.value, d),
                        u.f(r.reaction[0], d),
                        u.f(r.reaction[1], d),
                        u.m(r.reaction[2], d),
                        r.case.clone(),
                        r.expression.clone(),
                    ]);
                }
            } else {
                let cell = |r: &Option<crate::envelope::ReactionRow>| match r {
                    Some(r) => [component_value(&u, c, r.value, d), r.case.clone()],
                    None => ["-".into(), "-".into()],
                };
                let mut row = vec![sup.node.clone(), name(c)];
                row.extend(cell(&c.max));
                row.extend(cell(&c.min));
                rows.push(row);
            }
        }
    }
    let title = "Factored support reactions, largest and smallest (the force on the frame; \
                 global X right, Y up, Mz counter-clockwise)";
    if tidy {
        return Table {
            name: "reactions",
            title: title.into(),
            header: vec![
                "support".into(),
                "component".into(),
                "extreme".into(),
                "value".into(),
                format!("Rx ({lf})"),
                format!("Ry ({lf})"),
                format!("Mz ({lm})"),
                "case".into(),
                "expression".into(),
            ],
            rows,
        };
    }
    Table {
        name: "reactions",
        title: format!("{title}; forces in {lf}, moments in {lm}"),
        header: ["support", "component", "max", "case", "min", "case"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}

/// The unfactored first-order reactions of every service load case (arrangement pieces
/// left out of the page; in the CSV with `tidy`): one row per support and restrained
/// component, one column per load case.
pub fn service_reaction_table(s: &Summary, tidy: bool) -> Table {
    let u = Units(s.model);
    let d = if tidy { 3 } else { 1 };
    let (lm, lf) = (u.label(Dimension::Moment), u.label(Dimension::Force));
    let cases: Vec<&crate::check::LoadCaseReactions> = s
        .report
        .service_reactions
        .iter()
        .filter(|c| tidy || !c.case.contains('@'))
        .collect();
    let mut rows = Vec::new();
    for (i, sup) in s.report.supports.iter().enumerate() {
        for k in (0..3).filter(|&k| sup.restrained[k]) {
            let mut row = vec![sup.node.clone(), COMPONENTS[k].to_string()];
            row.extend(cases.iter().map(|c| {
                let v = c.reactions[i][k];
                u.v(v, component_dimension(COMPONENTS[k]), d)
            }));
            rows.push(row);
        }
    }
    let mut header = vec!["support".to_string(), "component".into()];
    header.extend(cases.iter().map(|c| c.case.clone()));
    Table {
        name: "service-reactions",
        title: format!(
            "Unfactored reactions of each load case (first order, the run's stiffness, no \
             notional forces; forces in {lf}, moments in {lm})"
        ),
        header,
        rows,
    }
}

/// Column heads of a case's reactions, in the model's units.
pub fn case_reaction_header(model: &crate::model::Model) -> Vec<String> {
    let u = Units(model);
    let (lm, lf) = (u.label(Dimension::Moment), u.label(Dimension::Force));
    vec![
        "support".to_string(),
        format!("Rx ({lf})"),
        format!("Ry ({lf})"),
        format!("Mz ({lm})"),
        format!("Rx 1st ({lf})"),
        format!("Ry 1st ({lf})"),
        format!("Mz 1st ({lm})"),
    ]
}

/// One row per support of case `c`: the design reactions (second-order analysis; `-` where
/// it did not converge), then the first-order reactions of the factored loads alone; free
/// components are blank.
pub fn case_reaction_rows(
    model: &crate::model::Model,
    c: &crate::check::CaseCheck,
    decimals: usize,
) -> Vec<Vec<String>> {
    let u = Units(model);
    let cell = |s: &crate::check::SupportInfo, k: usize, v: Option<f64>| match v {
        _ if !s.restrained[k] => String::new(),
        Some(v) => u.v(v, component_dimension(COMPONENTS[k]), decimals),
        None => "-".into(),
    };
    crate::check::support_info(model)
        .iter()
        .enumerate()
        .map(|(i, s)| {
            let mut row = vec![s.node.clone()];
            row.extend((0..3).map(|k| cell(s, k, c.reactions.as_ref().map(|r| r[i][k]))));
            row.extend((0..3).map(|k| cell(s, k, Some(c.reactions_first_order[i][k]))));
            row
        })
        .collect()
}

/// Column heads of the design end actions of every member by case (CSV).
pub fn case_end_action_header(model: &crate::model::Model) -> Vec<String> {
    let u = Units(model);
    let (lm, lf) = (u.label(Dimension::Moment), u.label(Dimension::Force));
    vec![
        "case".to_string(),
        "member".into(),
        "end".into(),
        format!("N ({lf})"),
        format!("V ({lf})"),
        format!("M ({lm})"),
    ]
}

/// The design axial force, shear and moment at both ends of every member of case `c`.
pub fn case_end_action_rows(
    model: &crate::model::Model,
    c: &crate::check::CaseCheck,
) -> Vec<Vec<String>> {
    let u = Units(model);
    c.members
        .iter()
        .flat_map(|m| {
            [Location::EndI, Location::EndJ]
                .into_iter()
                .enumerate()
                .map(|(k, end)| {
                    vec![
                        c.id.clone(),
                        m.member.clone(),
                        end.to_string(),
                        u.f(m.end_actions[k].axial, 3),
                        u.f(m.end_actions[k].shear, 3),
                        u.m(m.ends[k].design, 3),
                    ]
                })
        })
        .collect()
}
