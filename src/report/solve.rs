//! Report of one load case's first-order solution (`plumbline solve`).

use serde::Serialize;

use super::{CAUTION, OutputFormat, num, table_of};
use crate::model::{Model, Restraint};
use crate::solve::Solution;
use crate::units::Dimension;

/// JSON document of a solution; every value in SI base units (see `units`).
#[derive(Debug, Serialize)]
struct Doc<'a> {
    title: &'a str,
    case: &'a str,
    units: Units,
    displacements: Vec<NodeDisp<'a>>,
    reactions: Vec<NodeReaction<'a>>,
    members: Vec<MemberEnds<'a>>,
    residual: Residual,
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
}

#[derive(Debug, Serialize)]
struct Residual {
    force_x: f64,
    force_y: f64,
    moment: f64,
    max_nodal: f64,
    relative: f64,
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

/// Render the first-order `solution` of load case `case` of `model`.
///
/// Member-end values are the end actions in member-local axes (forces the nodes exert on
/// the member: axial along i→j, shear along local y, moment counter-clockwise).
pub fn render(model: &Model, case: &str, solution: &Solution, format: OutputFormat) -> String {
    match format {
        OutputFormat::Json => json(model, case, solution),
        OutputFormat::Table | OutputFormat::Csv => text(model, case, solution, format),
    }
}

fn json(model: &Model, case: &str, s: &Solution) -> String {
    let doc = Doc {
        title: &model.title,
        case,
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
            .map(|(m, e)| MemberEnds {
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
            })
            .collect(),
        residual: Residual {
            force_x: s.residual.global[0],
            force_y: s.residual.global[1],
            moment: s.residual.global[2],
            max_nodal: s.residual.max_nodal,
            relative: s.residual.relative(),
        },
        caution: CAUTION,
    };
    serde_json::to_string_pretty(&doc).expect("a solution serializes") + "\n"
}

fn text(model: &Model, case: &str, s: &Solution, format: OutputFormat) -> String {
    let u = &model.units;
    let (ld, lf, lm) = (
        u.label(Dimension::Displacement),
        u.label(Dimension::Force),
        u.label(Dimension::Moment),
    );
    let d = |v: f64| num(u.from_si(v, Dimension::Displacement), 4);
    let f = |v: f64| num(u.from_si(v, Dimension::Force), 3);
    let m = |v: f64| num(u.from_si(v, Dimension::Moment), 3);
    let disp_rows: Vec<Vec<String>> = model
        .nodes
        .iter()
        .zip(&s.displacements)
        .map(|(n, x)| vec![n.id.clone(), d(x[0]), d(x[1]), num(x[2], 6)])
        .collect();
    let reac_rows: Vec<Vec<String>> = supported(model)
        .into_iter()
        .map(|n| {
            let r = s.reactions[n];
            vec![model.nodes[n].id.clone(), f(r[0]), f(r[1]), m(r[2])]
        })
        .collect();
    let end_rows: Vec<Vec<String>> = model
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
        .collect();
    if format == OutputFormat::Csv {
        let mut out = String::new();
        out.push_str(&format!("member,axial_i ({lf}),shear_i ({lf}),moment_i ({lm}),axial_j ({lf}),shear_j ({lf}),moment_j ({lm})\n"));
        for r in end_rows {
            out.push_str(&r.join(","));
            out.push('\n');
        }
        return out;
    }
    let mut out = format!(
        "{}\nLoad case {case}: first-order solution\n\n",
        model.title
    );
    out.push_str("Displacements (global axes; rotation counter-clockwise, rad)\n");
    out.push_str(&table_of(
        &[
            "node",
            &format!("ux ({ld})"),
            &format!("uy ({ld})"),
            "rz (rad)",
        ],
        disp_rows,
    ));
    out.push_str("\n\nReactions (forces the supports exert on the frame)\n");
    out.push_str(&table_of(
        &[
            "node",
            &format!("Rx ({lf})"),
            &format!("Ry ({lf})"),
            &format!("Mz ({lm})"),
        ],
        reac_rows,
    ));
    out.push_str(
        "\n\nMember end actions (member-local axes, i→j; forces the nodes exert on the member, \
         moments counter-clockwise)\n",
    );
    out.push_str(&table_of(
        &[
            "member".to_string(),
            format!("N i ({lf})"),
            format!("V i ({lf})"),
            format!("M i ({lm})"),
            format!("N j ({lf})"),
            format!("V j ({lf})"),
            format!("M j ({lm})"),
        ],
        end_rows,
    ));
    out.push_str(&format!(
        "\n\nEquilibrium residual: {:.2e} of the largest applied load\n\n{CAUTION}\n",
        s.residual.relative()
    ));
    out
}
