//! Report of one load case's first-order solution (`plumbline solve`).

use serde::Serialize;

use super::page::Table;
use super::{CAUTION, num, table_of};
use crate::model::{LocalLoad, Model, Restraint};
use crate::solve::Solution;
use crate::solve::first_order::{combined_member_loads, member_diagram, member_extremes};
use crate::solve::mesh::member_stiffness;
use crate::units::Dimension;

/// JSON document of a solution; every value in SI base units (see `units`).
#[derive(Debug, Serialize)]
struct Doc<'a> {
    title: &'a str,
    case: &'a str,
    /// The member stiffness preset of the solution (`gross` unless asked otherwise).
    stiffness: String,
    /// That preset in words, with its clause.
    stiffness_description: &'static str,
    units: Units,
    displacements: Vec<NodeDisp<'a>>,
    reactions: Vec<NodeReaction<'a>>,
    members: Vec<MemberEnds<'a>>,
    residual: Residual<'a>,
    caution: &'a str,
}

#[derive(Debug, Serialize)]
struct Units {
    length: &'static str,
    displacement: &'static str,
    rotation: &'static str,
    force: &'static str,
    moment: &'static str,
}

const SI: Units = Units {
    length: "m",
    displacement: "m",
    rotation: "rad",
    force: "N",
    moment: "N*m",
};

#[derive(Debug, Serialize)]
struct NodeDisp<'a> {
    node: &'a str,
    ux: f64,
    uy: f64,
    rz: f64,
}

#[derive(Debug, Serialize)]
struct NodeReaction<'a> {
    node: &'a str,
    fx: f64,
    fy: f64,
    mz: f64,
}

#[derive(Debug, Serialize)]
struct End {
    axial: f64,
    shear: f64,
    moment: f64,
}

#[derive(Debug, Serialize)]
struct MemberEnds<'a> {
    member: &'a str,
    i: End,
    j: End,
    /// Extreme internal moments along the member, found exactly.
    span: Span,
    /// Internal forces and transverse deflection at stations along the member.
    stations: Vec<StationDoc>,
}

#[derive(Debug, Serialize)]
struct Extreme {
    x: f64,
    moment: f64,
}

#[derive(Debug, Serialize)]
struct Span {
    max: Extreme,
    min: Extreme,
}

#[derive(Debug, Serialize)]
struct StationDoc {
    x: f64,
    axial: f64,
    shear: f64,
    moment: f64,
    deflection: f64,
}

/// Stations per member in the JSON diagrams (plus every load breakpoint).
pub const STATIONS: usize = 11;

#[derive(Debug, Serialize)]
struct Residual<'a> {
    force_x: f64,
    force_y: f64,
    moment: f64,
    max_nodal: f64,
    relative: f64,
    /// Out-of-balance at each node: applied load + reaction − member end actions.
    nodes: Vec<NodeReaction<'a>>,
}

/// Nodes with any support restraint or spring.
fn supported(model: &Model) -> Vec<usize> {
    let mut v: Vec<usize> = model
        .supports
        .iter()
        .filter(|s| s.dofs.iter().any(|d| *d != Restraint::Free))
        .map(|s| s.node)
        .collect();
    v.sort_unstable();
    v.dedup();
    v
}

/// What the report of one load case's solution reads: the first-order `solution` of load
/// case number `case` of `model`.
///
/// Member-end values are the end actions in member-local axes (forces the nodes exert on
/// the member: axial along i→j, shear along local y, moment counter-clockwise); span
/// extremes and stations are internal forces (N tension positive, M positive with the
/// local −y face in tension).
pub struct SolveView<'a> {
    pub model: &'a Model,
    pub case: usize,
    pub solution: &'a Solution,
}

impl SolveView<'_> {
    /// The load case's member loads in member axes.
    fn loads(&self) -> Vec<Vec<LocalLoad>> {
        combined_member_loads(self.model, &[(self.case, 1.0)])
    }

    /// The load case's id.
    fn id(&self) -> &str {
        &self.model.load_cases[self.case].id
    }
}

/// The solution as one JSON document in SI base units, with the member diagrams at
/// [`STATIONS`] stations.
pub fn json(v: &SolveView) -> String {
    let (model, case, s, loads) = (v.model, v.id(), v.solution, &v.loads());
    let stiffness = member_stiffness(model);
    let doc = Doc {
        title: &model.title,
        case,
        stiffness: model.analysis.stiffness.to_string(),
        stiffness_description: stiffness_words(model.analysis.stiffness),
        units: SI,
        displacements: model
            .nodes
            .iter()
            .zip(&s.displacements)
            .map(|(n, d)| NodeDisp {
                node: &n.id,
                ux: d[0],
                uy: d[1],
                rz: d[2],
            })
            .collect(),
        reactions: supported(model)
            .into_iter()
            .map(|n| NodeReaction {
                node: &model.nodes[n].id,
                fx: s.reactions[n][0],
                fy: s.reactions[n][1],
                mz: s.reactions[n][2],
            })
            .collect(),
        members: model
            .members
            .iter()
            .zip(&s.end_forces)
            .enumerate()
            .map(|(k, (m, e))| {
                let ext = member_extremes(model, s, k, &loads[k]);
                MemberEnds {
                    member: &m.id,
                    i: End {
                        axial: e.i[0],
                        shear: e.i[1],
                        moment: e.i[2],
                    },
                    j: End {
                        axial: e.j[0],
                        shear: e.j[1],
                        moment: e.j[2],
                    },
                    span: Span {
                        max: Extreme {
                            x: ext.max.0,
                            moment: ext.max.1,
                        },
                        min: Extreme {
                            x: ext.min.0,
                            moment: ext.min.1,
                        },
                    },
                    stations: member_diagram(model, &stiffness, s, k, &loads[k], STATIONS)
                        .into_iter()
                        .map(|st| StationDoc {
                            x: st.x,
                            axial: st.n,
                            shear: st.v,
                            moment: st.m,
                            deflection: st.deflection,
                        })
                        .collect(),
                }
            })
            .collect(),
        residual: Residual {
            force_x: s.residual.global[0],
            force_y: s.residual.global[1],
            moment: s.residual.global[2],
            max_nodal: s.residual.max_nodal,
            relative: s.residual.relative(),
            nodes: model
                .nodes
                .iter()
                .zip(&s.residual.nodal)
                .map(|(n, r)| NodeReaction {
                    node: &n.id,
                    fx: r[0],
                    fy: r[1],
                    mz: r[2],
                })
                .collect(),
        },
        caution: CAUTION,
    };
    serde_json::to_string_pretty(&doc).expect("a solution serializes") + "\n"
}

/// The solution's tables in the model's units: displacements, reactions, member end
/// actions and the extreme moments along each member.
pub fn tables(v: &SolveView) -> [Table; 4] {
    tables_with(v.model, v.solution, &v.loads())
}

/// [`tables`] of solution `s` under member loads `loads`.
fn tables_with(model: &Model, s: &Solution, loads: &[Vec<LocalLoad>]) -> [Table; 4] {
    let u = &model.units;
    let (ld, lf, lm, ll) = (
        u.label(Dimension::Displacement),
        u.label(Dimension::Force),
        u.label(Dimension::Moment),
        u.label(Dimension::Length),
    );
    let d = |v: f64| num(u.from_si(v, Dimension::Displacement), 4);
    let f = |v: f64| num(u.from_si(v, Dimension::Force), 3);
    let m = |v: f64| num(u.from_si(v, Dimension::Moment), 3);
    let x = |v: f64| num(u.from_si(v, Dimension::Length), 3);
    let owned = |h: &[String]| h.to_vec();
    let displacements = Table {
        name: "displacements",
        title: "Displacements (global axes; rotation counter-clockwise, rad)".into(),
        header: owned(&[
            "node".into(),
            format!("ux ({ld})"),
            format!("uy ({ld})"),
            "rz (rad)".into(),
        ]),
        rows: model
            .nodes
            .iter()
            .zip(&s.displacements)
            .map(|(n, x)| vec![n.id.clone(), d(x[0]), d(x[1]), num(x[2], 6)])
            .collect(),
    };
    let reactions = Table {
        name: "reactions",
        title: "Reactions (forces the supports exert on the frame)".into(),
        header: owned(&[
            "node".into(),
            format!("Rx ({lf})"),
            format!("Ry ({lf})"),
            format!("Mz ({lm})"),
        ]),
        rows: supported(model)
            .into_iter()
            .map(|n| {
                let r = s.reactions[n];
                vec![model.nodes[n].id.clone(), f(r[0]), f(r[1]), m(r[2])]
            })
            .collect(),
    };
    let end_actions = Table {
        name: "end_actions",
        title: "Member end actions (member-local axes, i→j; forces the nodes exert on the \
                member, moments counter-clockwise)"
            .into(),
        header: owned(&[
            "member".into(),
            format!("N i ({lf})"),
            format!("V i ({lf})"),
            format!("M i ({lm})"),
            format!("N j ({lf})"),
            format!("V j ({lf})"),
            format!("M j ({lm})"),
        ]),
        rows: model
            .members
            .iter()
            .zip(&s.end_forces)
            .map(|(mem, e)| {
                vec![
                    mem.id.clone(),
                    f(e.i[0]),
                    f(e.i[1]),
                    m(e.i[2]),
                    f(e.j[0]),
                    f(e.j[1]),
                    m(e.j[2]),
                ]
            })
            .collect(),
    };
    let span_moments = Table {
        name: "span_moments",
        title: "Extreme internal moments along each member (positive with the local −y face \
                in tension; x from end i)"
            .into(),
        header: owned(&[
            "member".into(),
            format!("M max ({lm})"),
            format!("at x ({ll})"),
            format!("M min ({lm})"),
            format!("at x ({ll})"),
        ]),
        rows: (0..model.members.len())
            .map(|k| {
                let e = member_extremes(model, s, k, &loads[k]);
                vec![
                    model.members[k].id.clone(),
                    m(e.max.1),
                    x(e.max.0),
                    m(e.min.1),
                    x(e.min.0),
                ]
            })
            .collect(),
    };
    [displacements, reactions, end_actions, span_moments]
}

/// The solution as text: the tables under their titles, the equilibrium residual and the
/// caution.
pub fn text(v: &SolveView) -> String {
    let (model, case, s, loads) = (v.model, v.id(), v.solution, &v.loads());
    let mut out = format!(
        "{}\nLoad case {case}: first-order solution, stiffness {}\n",
        model.title,
        stiffness_words(model.analysis.stiffness)
    );
    for t in tables_with(model, s, loads) {
        out.push_str(&format!("\n{}\n{}\n", t.title, table_of(&t.header, t.rows)));
    }
    out.push_str(&format!(
        "\nEquilibrium residual: {:.2e} of the largest applied load\n\n{CAUTION}\n",
        s.residual.relative()
    ));
    out
}

/// Plain words for a stiffness preset, with its clause.
pub fn stiffness_words(p: crate::model::StiffnessPreset) -> &'static str {
    use crate::model::StiffnessPreset;
    match p {
        StiffnessPreset::Gross => "gross: gross section properties",
        StiffnessPreset::AciCracked => {
            "aci-cracked: ACI 318-19 Table 6.6.3.1.1(a), 0.70 Ig columns, 0.35 Ig beams, 1.0 Ag"
        }
        StiffnessPreset::AiscDirect => {
            "aisc-direct: AISC 360-16 §C2.3 direct-analysis rules, 0.8·τb·EI with τb = 1.0, 0.8·EA"
        }
        StiffnessPreset::AciService => crate::service::stiffness_words(p),
    }
}
