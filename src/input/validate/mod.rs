//! From the raw file to the validated [`Model`]: units applied, ids resolved, geometry and
//! loads checked. Every problem is a [`FileError`] that names the file, line, column and
//! field, and says what was expected.

mod geometry;
mod loads;
mod options;
mod references;
pub mod values;

use crate::limits::{MAX_LOAD_CASES, MAX_MEMBERS, MAX_NODES, exceeded};
use std::collections::HashMap;
use std::sync::Arc;

use super::generate::generate;
use super::raw::RawModel;
use crate::diag::FileError;
use crate::model::{AnalysisOptions, Member, Model, Node, Support};
use crate::units::Dimension;
pub use geometry::{MAX_COORDINATE, resolve_role};
use geometry::{check_geometry, check_story_levels, support};
use loads::load_cases;
pub use options::{
    AISC_NOTIONAL_COEFFICIENT, DIRECTION_NAMES, METHOD_NAMES, ROLE_NAMES, SERVICE_STIFFNESS_NAMES,
    STIFFNESS_NAMES,
};
use options::{analysis, combinations, unit_system};
use references::{materials, reference, register, resolve, sections, too_many};
pub use values::{Ctx, MemberDef, NodeDef, Ref, SupportDef};

/// Validate a parsed model file and build the [`Model`].
pub fn build(raw: RawModel, file: &str, text: Arc<str>) -> Result<Model, FileError> {
    let units = unit_system(file, &text, raw.units.as_ref())?;
    let ctx = Ctx {
        file: file.to_string(),
        text,
        units,
    };

    let (materials, material_index) = materials(&ctx, &raw)?;
    let (sections, section_index) = sections(&ctx, &raw)?;
    let generated = match &raw.frame {
        Some(f) => generate(&ctx, f)?,
        None => Default::default(),
    };

    // Nodes: generated first, then explicit.
    let mut node_defs = generated.nodes;
    for (k, n) in raw.node.iter().enumerate() {
        let n = n.get_ref();
        let field = |name: &str| format!("node[{}].{name}", k + 1);
        node_defs.push(NodeDef {
            at: reference(&n.id, field("id")),
            x: ctx.quantity(&n.x, Dimension::Length, &field("x"))?,
            y: ctx.quantity(&n.y, Dimension::Length, &field("y"))?,
            written: Some([(n.x.span(), field("x")), (n.y.span(), field("y"))]),
        });
    }
    if let Some(m) = exceeded("nodes", node_defs.len(), MAX_NODES, "MAX_NODES") {
        return Err(too_many(&ctx, &node_defs[MAX_NODES].at, m));
    }
    let mut node_index = HashMap::new();
    for n in &node_defs {
        register(&ctx, &mut node_index, &n.at, "node")?;
    }

    // Members: generated first, then explicit.
    let mut member_defs = generated.members;
    for (k, m) in raw.member.iter().enumerate() {
        let m = m.get_ref();
        let field = |name: &str| format!("member[{}].{name}", k + 1);
        let release = match &m.hinge {
            None => [false, false],
            Some(h) => match h.get_ref().as_str() {
                "none" => [false, false],
                "i" => [true, false],
                "j" => [false, true],
                "both" => [true, true],
                other => {
                    return Err(ctx.err(
                        h.span(),
                        &field("hinge"),
                        format!("expected one of none, i, j, both, got \"{other}\""),
                    ));
                }
            },
        };
        member_defs.push(MemberDef {
            at: reference(&m.id, field("id")),
            i: reference(&m.i, field("i")),
            j: reference(&m.j, field("j")),
            section: reference(&m.section, field("section")),
            material: reference(&m.material, field("material")),
            release,
        });
    }
    if let Some(m) = exceeded("members", member_defs.len(), MAX_MEMBERS, "MAX_MEMBERS") {
        return Err(too_many(&ctx, &member_defs[MAX_MEMBERS].at, m));
    }
    let nodes: Vec<Node> = node_defs
        .iter()
        .map(|n| Node {
            id: n.at.id.clone(),
            x: n.x,
            y: n.y,
        })
        .collect();
    let mut member_index = HashMap::new();
    let mut members = Vec::with_capacity(member_defs.len());
    for d in &member_defs {
        register(&ctx, &mut member_index, &d.at, "member")?;
        let (i, j) = (
            resolve(&ctx, &node_index, &d.i, "node")?,
            resolve(&ctx, &node_index, &d.j, "node")?,
        );
        let section = resolve(&ctx, &section_index, &d.section, "section")?;
        let material = resolve(&ctx, &material_index, &d.material, "material")?;
        let (dx, dy) = (nodes[j].x - nodes[i].x, nodes[j].y - nodes[i].y);
        let role = sections[section].role.unwrap_or(resolve_role(dx, dy));
        members.push(Member {
            id: d.at.id.clone(),
            i,
            j,
            section,
            material,
            release_i: d.release[0],
            release_j: d.release[1],
            role,
        });
    }
    check_geometry(&ctx, &nodes, &node_defs, &members, &member_defs)?;

    // Supports: generated bases first, then explicit.
    let mut support_defs = generated.supports;
    for (k, s) in raw.support.iter().enumerate() {
        support_defs.push(support(&ctx, s, &format!("support[{}]", k + 1))?);
    }
    let mut supports: Vec<Support> = Vec::new();
    let mut supported: HashMap<usize, usize> = HashMap::new();
    for s in &support_defs {
        let node = resolve(&ctx, &node_index, &s.node, "node")?;
        if let Some(&first) = supported.get(&node) {
            return Err(ctx.err(
                s.node.span.clone(),
                &s.node.field,
                format!(
                    "node \"{}\" already has a support (line {}): expected one support per node, \
                     with a restraint or spring per direction",
                    s.node.id,
                    ctx.line(first)
                ),
            ));
        }
        supported.insert(node, s.node.span.start);
        supports.push(Support { node, dofs: s.dofs });
    }
    if supports.is_empty() {
        return Err(ctx.err(
            0..0,
            "support",
            "the model has no supports: expected at least one [[support]] or a [frame] with a base",
        ));
    }

    let mut model = Model {
        title: raw
            .title
            .as_ref()
            .map(|t| t.get_ref().clone())
            .unwrap_or_default(),
        units: ctx.units.clone(),
        nodes,
        materials,
        sections,
        members,
        supports,
        load_cases: Vec::new(),
        combos: combinations(&ctx, raw.combinations.as_ref())?,
        analysis: AnalysisOptions::default(),
        stories: None,
    };
    let (analysis, stories) = analysis(&ctx, raw.analysis.as_ref())?;
    model.analysis = analysis;
    model.stories = stories;
    check_story_levels(&ctx, raw.analysis.as_ref(), &model)?;
    if let Some(m) = exceeded(
        "load cases",
        raw.case.len(),
        MAX_LOAD_CASES,
        "MAX_LOAD_CASES",
    ) {
        let case = &raw.case[MAX_LOAD_CASES];
        return Err(ctx
            .err(
                case.span(),
                &format!("case[{}]", MAX_LOAD_CASES + 1),
                format!("the model has {m}"),
            )
            .with_help("the limits are listed in docs/model-file.md"));
    }
    model.load_cases = load_cases(&ctx, &raw.case, &model)?;
    for c in &raw.case {
        let c = c.get_ref();
        let span = c.level.as_ref().map_or(c.id.span(), |l| l.span());
        model
            .combos
            .written
            .cases
            .insert(c.id.get_ref().clone(), span);
    }
    Ok(model)
}

#[cfg(test)]
mod tests {
    use std::str::FromStr;

    use super::*;
    use crate::model::{LoadDirection, Role, SecondOrderMethod, StiffnessPreset};

    #[test]
    fn listed_names_parse() {
        for n in METHOD_NAMES {
            assert!(SecondOrderMethod::from_str(n).is_ok(), "{n}");
        }
        for n in STIFFNESS_NAMES {
            assert!(StiffnessPreset::from_str(n).is_ok(), "{n}");
        }
        for n in ROLE_NAMES {
            assert!(Role::from_str(n).is_ok(), "{n}");
        }
        for n in DIRECTION_NAMES {
            assert!(LoadDirection::from_str(n).is_ok(), "{n}");
        }
    }

    #[test]
    fn role_from_orientation() {
        // Within 45° of vertical: column (45° itself counts as column).
        assert_eq!(resolve_role(0.0, 3.0), Role::Column);
        assert_eq!(resolve_role(1.0, 1.0), Role::Column);
        assert_eq!(resolve_role(4.0, 1.0), Role::Beam);
        assert_eq!(resolve_role(-4.0, -3.0), Role::Beam);
    }
}
