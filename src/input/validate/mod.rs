//! From the raw file to the validated [`Model`]: units applied, ids resolved, geometry and
//! loads checked. Every problem is a [`FileError`] that names the file, line, column and
//! field, and says what was expected.

use crate::limits::{MAX_LOAD_CASES, MAX_MEMBERS, MAX_NODES, exceeded};
use std::collections::{BTreeMap, HashMap};
use std::ops::Range;
use std::str::FromStr;
use std::sync::Arc;

use strum::IntoEnumIterator;

pub mod values;

use super::generate::generate;
use super::raw::{
    Num, Patterns, RawAnalysis, RawCase, RawCombinations, RawMemberLoad, RawModel, S,
};
use super::select;
use crate::diag::FileError;
use crate::model::{
    ActionCategory, AnalysisOptions, ComboChoice, LevelConversion, LivePatterns, LoadCase,
    LoadDirection, LoadLevel, Material, Measure, Member, MemberLoad, MemberLoadKind, Model,
    ModelSpans, NodalLoad, Node, NotionalLoads, Restraint, Role, SecondOrderMethod, Section,
    SettingOrigin, StiffnessPreset, StoryDeclaration, Support,
};
use crate::units::{Dimension, UnitSystem};
pub use values::{Ctx, MemberDef, NodeDef, Ref, SupportDef};

/// Names accepted for [`SecondOrderMethod`] (kebab-case, as the enum parses them).
pub const METHOD_NAMES: [&str; 4] = ["aisc-b1b2", "aci-magnifier", "ec3-alpha-cr", "direct"];
/// Names accepted for [`StiffnessPreset`].
pub const STIFFNESS_NAMES: [&str; 3] = ["gross", "aci-cracked", "aisc-direct"];

/// The stiffness presets of a serviceability analysis.
pub const SERVICE_STIFFNESS_NAMES: [&str; 2] = ["gross", "aci-service"];
/// Names accepted for [`Role`].
pub const ROLE_NAMES: [&str; 3] = ["column", "beam", "brace"];
/// Names accepted for [`LoadDirection`].
pub const DIRECTION_NAMES: [&str; 5] = ["local-x", "local-y", "global-x", "global-y", "down"];
/// AISC 360-16 §C2.2b(1): notional load Ni = 0.002·α·Yi; the default coefficient.
pub const AISC_NOTIONAL_COEFFICIENT: f64 = 0.002;

/// Relative tolerance on lengths for geometric coincidence (fraction of a member length).
const GEOMETRY_TOL: f64 = 1e-6;

/// Register a new id in `index`, rejecting empty ids, wildcards and duplicates.
fn register(
    ctx: &Ctx,
    index: &mut HashMap<String, (usize, usize)>,
    at: &Ref,
    what: &str,
) -> Result<(), FileError> {
    if at.id.trim().is_empty() || at.id.contains('*') {
        return Err(ctx.err(
            at.span.clone(),
            &at.field,
            format!(
                "expected a {what} id without spaces around it and without '*', got \"{}\"",
                at.id
            ),
        ));
    }
    if let Some(&(_, pos)) = index.get(&at.id) {
        return Err(ctx.err(
            at.span.clone(),
            &at.field,
            format!(
                "duplicate {what} id \"{}\": expected unique ids (first defined at line {})",
                at.id,
                ctx.line(pos)
            ),
        ));
    }
    let n = index.len();
    index.insert(at.id.clone(), (n, at.span.start));
    Ok(())
}

/// Index of the entity an id refers to, or an error naming the known ids.
fn resolve(
    ctx: &Ctx,
    index: &HashMap<String, (usize, usize)>,
    r: &Ref,
    what: &str,
) -> Result<usize, FileError> {
    if let Some(&(k, _)) = index.get(&r.id) {
        return Ok(k);
    }
    let mut known: Vec<&String> = index.keys().collect();
    known.sort();
    let shown: Vec<String> = known.iter().take(8).map(|s| format!("\"{s}\"")).collect();
    let more = if known.len() > 8 { ", …" } else { "" };
    let expected = if known.is_empty() {
        format!("no {what} is defined")
    } else {
        format!("expected one of {}{more}", shown.join(", "))
    };
    Err(ctx.err(
        r.span.clone(),
        &r.field,
        format!("unknown {what} \"{}\": {expected}", r.id),
    ))
}

/// A reference from a spanned string field.
fn reference(v: &S<String>, field: String) -> Ref {
    Ref {
        id: v.get_ref().clone(),
        span: v.span(),
        field,
    }
}

/// The unit system from the `units` key: a preset name or a table with `preset` and
/// per-dimension overrides.
fn unit_system(
    file: &str,
    text: &Arc<str>,
    raw: Option<&S<toml::Value>>,
) -> Result<UnitSystem, FileError> {
    let err = |span: Range<usize>, msg: String| FileError::at(file, text, Some(span), "units", msg);
    let presets = crate::units::PRESET_NAMES.join(", ");
    let Some(v) = raw else {
        return Err(err(
            0..0,
            format!("missing units: expected e.g. units = \"kN-m\" (one of {presets})"),
        ));
    };
    let span = v.span();
    match v.get_ref() {
        toml::Value::String(name) => UnitSystem::preset(name).map_err(|e| err(span, e.to_string())),
        toml::Value::Table(t) => {
            let Some(toml::Value::String(name)) = t.get("preset") else {
                return Err(err(
                    span,
                    format!("expected a `preset` name in the units table (one of {presets})"),
                ));
            };
            let mut sys = UnitSystem::preset(name).map_err(|e| err(span.clone(), e.to_string()))?;
            for (slot, unit) in t.iter().filter(|(k, _)| k.as_str() != "preset") {
                let toml::Value::String(unit) = unit else {
                    return Err(err(
                        span,
                        format!("expected a unit name for units.{slot}, e.g. \"mm\""),
                    ));
                };
                sys.set_unit(slot, unit)
                    .map_err(|e| err(span.clone(), format!("units.{slot}: {e}")))?;
            }
            Ok(sys)
        }
        _ => Err(err(
            span,
            format!("expected a unit system name (one of {presets}) or a table"),
        )),
    }
}

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

/// The error for a model with more items than a limit allows, at the first one too many.
fn too_many(ctx: &Ctx, first_over: &Ref, m: String) -> FileError {
    ctx.err(
        first_over.span.clone(),
        &first_over.field,
        format!("the model has {m}"),
    )
    .with_help("the limits are listed in docs/model-file.md")
}

/// Role of a member without a section hint: column within 45° of vertical, else beam.
pub fn resolve_role(dx: f64, dy: f64) -> Role {
    if dy.abs() >= dx.abs() {
        Role::Column
    } else {
        Role::Beam
    }
}

type Index = HashMap<String, (usize, usize)>;

fn materials(ctx: &Ctx, raw: &RawModel) -> Result<(Vec<Material>, Index), FileError> {
    let mut index = HashMap::new();
    let mut out = Vec::new();
    for (k, m) in raw.material.iter().enumerate() {
        let m = m.get_ref();
        let field = |name: &str| format!("material[{}].{name}", k + 1);
        register(ctx, &mut index, &reference(&m.id, field("id")), "material")?;
        let unit_weight = match &m.unit_weight {
            Some(v) => Some(ctx.positive(v, Dimension::UnitWeight, &field("unit_weight"))?),
            None => None,
        };
        out.push(Material {
            id: m.id.get_ref().clone(),
            e: ctx.positive(&m.e, Dimension::Stress, &field("E"))?,
            unit_weight,
        });
    }
    Ok((out, index))
}

fn sections(ctx: &Ctx, raw: &RawModel) -> Result<(Vec<Section>, Index), FileError> {
    let mut index = HashMap::new();
    let mut out = Vec::new();
    for (k, s) in raw.section.iter().enumerate() {
        let s = s.get_ref();
        let field = |name: &str| format!("section[{}].{name}", k + 1);
        register(ctx, &mut index, &reference(&s.id, field("id")), "section")?;
        let depth = match &s.depth {
            Some(v) => Some(ctx.positive(v, Dimension::SectionLength, &field("depth"))?),
            None => None,
        };
        let role = match &s.role {
            Some(r) => Some(ctx.choice::<Role>(r, &field("role"), &ROLE_NAMES)?),
            None => None,
        };
        out.push(Section {
            id: s.id.get_ref().clone(),
            area: ctx.positive(&s.a, Dimension::Area, &field("A"))?,
            inertia: ctx.positive(&s.i, Dimension::SecondMoment, &field("I"))?,
            depth,
            role,
        });
    }
    Ok((out, index))
}

/// A support from its `type` and springs.
fn support(ctx: &Ctx, s: &S<super::raw::RawSupport>, field: &str) -> Result<SupportDef, FileError> {
    use Restraint::{Fixed, Free};
    let raw = s.get_ref();
    let node = reference(&raw.node, format!("{field}.node"));
    let mut dofs = match &raw.kind {
        None => [Free; 3],
        Some(t) => {
            match t.get_ref().as_str() {
                "fixed" => [Fixed; 3],
                "pinned" => [Fixed, Fixed, Free],
                "roller-x" => [Free, Fixed, Free],
                "roller-y" => [Fixed, Free, Free],
                "free" => [Free; 3],
                other => {
                    return Err(ctx.err(
                    t.span(),
                    &format!("{field}.type"),
                    format!("expected one of fixed, pinned, roller-x, roller-y, free, got \"{other}\""),
                ));
                }
            }
        }
    };
    let springs = [
        (&raw.kx, "kx", Dimension::Stiffness),
        (&raw.ky, "ky", Dimension::Stiffness),
        (&raw.kr, "kr", Dimension::RotationalStiffness),
    ];
    for (k, (v, name, dim)) in springs.into_iter().enumerate() {
        if let Some(v) = v {
            dofs[k] = Restraint::Spring(ctx.positive(v, dim, &format!("{field}.{name}"))?);
        }
    }
    if dofs.iter().all(|d| *d == Free) {
        return Err(ctx.err(
            raw.node.span(),
            &format!("{field}.type"),
            "support restrains nothing: expected type = fixed, pinned, roller-x or roller-y, \
             or a spring kx, ky or kr",
        ));
    }
    Ok(SupportDef { node, dofs })
}

/// Reject zero-length members, collinear members that share a length, and nodes lying on a
/// member between its ends without being connected to it, and nodes without members.
/// Largest |coordinate| a node may have, m: 100 km, far beyond any building (common
/// practice, no source). Beyond it a coordinate is a typing or unit error, and it would
/// swamp every length tolerance of the model (issue 7 item 10).
pub const MAX_COORDINATE: f64 = 1.0e5;

/// Every node coordinate finite and within [`MAX_COORDINATE`]; the error names the node.
fn check_node_coordinates(ctx: &Ctx, nodes: &[Node], defs: &[NodeDef]) -> Result<(), FileError> {
    for (n, d) in nodes.iter().zip(defs) {
        for (k, (axis, v)) in [("x", n.x), ("y", n.y)].into_iter().enumerate() {
            if !v.is_finite() || v.abs() > MAX_COORDINATE {
                let (span, field) = match &d.written {
                    Some(w) => (w[k].0.clone(), w[k].1.as_str()),
                    None => (d.at.span.clone(), d.at.field.as_str()),
                };
                return Err(ctx.err(
                    span,
                    field,
                    format!(
                        "node \"{}\" has {axis} = {v:e} m: expected a coordinate within ±{} km \
                         of the origin (check the value and the model's units)",
                        n.id,
                        MAX_COORDINATE / 1000.0
                    ),
                ));
            }
        }
    }
    Ok(())
}

/// Two distinct nodes at one point, each with members attached, split the frame in two
/// there without a word; refuse them, naming both (issue 7 item 10). Points closer than
/// 1e-9 of the model's extent are one point, as for zero-length members.
fn check_coincident_nodes(
    ctx: &Ctx,
    nodes: &[Node],
    defs: &[NodeDef],
    members: &[Member],
    extent: f64,
) -> Result<(), FileError> {
    let tol = 1e-9 * extent;
    let mut used = vec![false; nodes.len()];
    for m in members {
        used[m.i] = true;
        used[m.j] = true;
    }
    let mut order: Vec<usize> = (0..nodes.len()).filter(|&n| used[n]).collect();
    order.sort_by(|&a, &b| nodes[a].x.total_cmp(&nodes[b].x));
    for (k, &a) in order.iter().enumerate() {
        for &b in &order[k + 1..] {
            if nodes[b].x - nodes[a].x > tol {
                break;
            }
            if (nodes[b].y - nodes[a].y).abs() <= tol {
                let (first, second) = (a.min(b), a.max(b));
                return Err(ctx.err(
                    defs[second].at.span.clone(),
                    &defs[second].at.field,
                    format!(
                        "nodes \"{}\" and \"{}\" are at the same point ({}, {}) m and each has \
                         members, so the frame would be split in two there: expected one node \
                         (refer to \"{}\" from both members; use a member hinge for a pin)",
                        nodes[first].id,
                        nodes[second].id,
                        nodes[first].x,
                        nodes[first].y,
                        nodes[first].id
                    ),
                ));
            }
        }
    }
    Ok(())
}

/// Every declared story level must be the elevation of a column end (issue 7 item 10):
/// a level no column meets is a typing or unit error. The error names the level.
fn check_story_levels(
    ctx: &Ctx,
    raw: Option<&S<RawAnalysis>>,
    model: &Model,
) -> Result<(), FileError> {
    let (Some(decl), Some(list)) = (
        model.stories.as_ref(),
        raw.and_then(|a| a.get_ref().story_levels.as_ref()),
    ) else {
        return Ok(());
    };
    let column_ends: Vec<f64> = model
        .members
        .iter()
        .filter(|m| m.role == Role::Column)
        .flat_map(|m| [model.nodes[m.i].y, model.nodes[m.j].y])
        .collect();
    let lu = ctx.units.label(Dimension::Length);
    for (k, (&y, v)) in decl.levels.iter().zip(list.get_ref()).enumerate() {
        let near = column_ends
            .iter()
            .any(|&e| (e - y).abs() < crate::stories::LEVEL_TOLERANCE);
        if !near {
            let nearest = column_ends
                .iter()
                .copied()
                .min_by(|a, b| (a - y).abs().total_cmp(&(b - y).abs()));
            return Err(ctx.err(
                v.span(),
                &format!("analysis.story_levels[{}]", k + 1),
                format!(
                    "no column starts or ends at the declared story level {} {lu}: expected the \
                     elevation of a floor where columns meet{}",
                    ctx.units.from_si(y, Dimension::Length),
                    nearest.map_or(String::new(), |e| format!(
                        " (the nearest column end is at {} {lu})",
                        ctx.units.from_si(e, Dimension::Length)
                    ))
                ),
            ));
        }
    }
    Ok(())
}

fn check_geometry(
    ctx: &Ctx,
    nodes: &[Node],
    node_defs: &[NodeDef],
    members: &[Member],
    defs: &[MemberDef],
) -> Result<(), FileError> {
    if members.is_empty() {
        return Err(ctx.err(
            0..0,
            "member",
            "the model has no members: expected [[member]] tables or a [frame]",
        ));
    }
    check_node_coordinates(ctx, nodes, node_defs)?;
    let extent = nodes
        .iter()
        .fold(1.0_f64, |e, n| e.max(n.x.abs()).max(n.y.abs()));
    let lengths: Vec<f64> = members
        .iter()
        .map(|m| (nodes[m.j].x - nodes[m.i].x).hypot(nodes[m.j].y - nodes[m.i].y))
        .collect();
    for (k, m) in members.iter().enumerate() {
        if lengths[k] <= 1e-9 * extent {
            return Err(ctx.err(
                defs[k].at.span.clone(),
                &defs[k].at.field,
                format!(
                    "member \"{}\" has zero length (nodes \"{}\" and \"{}\" coincide): expected two distinct end nodes",
                    m.id, nodes[m.i].id, nodes[m.j].id
                ),
            ));
        }
    }
    check_coincident_nodes(ctx, nodes, node_defs, members, extent)?;
    // Position of point p along member k (distance from end i) and its offset from the axis.
    let along = |k: usize, px: f64, py: f64| -> (f64, f64) {
        let (a, b) = (&nodes[members[k].i], &nodes[members[k].j]);
        let (c, s) = ((b.x - a.x) / lengths[k], (b.y - a.y) / lengths[k]);
        let (rx, ry) = (px - a.x, py - a.y);
        (rx * c + ry * s, (-rx * s + ry * c).abs())
    };
    // Candidate pairs come from a sweep over bounding boxes sorted by their left edge, so
    // the cost grows with the number of nearby members, not the square of all members.
    let slack = GEOMETRY_TOL * lengths.iter().fold(0.0_f64, |a, &l| a.max(l));
    let bbox =
        |p: (f64, f64), q: (f64, f64)| [p.0.min(q.0), p.0.max(q.0), p.1.min(q.1), p.1.max(q.1)];
    let boxes: Vec<[f64; 4]> = members
        .iter()
        .map(|m| bbox((nodes[m.i].x, nodes[m.i].y), (nodes[m.j].x, nodes[m.j].y)))
        .collect();
    let mut order: Vec<usize> = (0..members.len()).collect();
    order.sort_by(|&a, &b| boxes[a][0].total_cmp(&boxes[b][0]));
    // The overlapping pair whose later member comes first in the file: (later, earlier, shared).
    let mut overlap: Option<(usize, usize, f64)> = None;
    for (p, &u) in order.iter().enumerate() {
        for &v in &order[p + 1..] {
            if boxes[v][0] > boxes[u][1] + slack {
                break;
            }
            if boxes[v][2] > boxes[u][3] + slack || boxes[u][2] > boxes[v][3] + slack {
                continue;
            }
            let (k, q) = (u.max(v), u.min(v));
            let tol = GEOMETRY_TOL * lengths[k];
            let (nq_i, nq_j) = (&nodes[members[q].i], &nodes[members[q].j]);
            let (t1, d1) = along(k, nq_i.x, nq_i.y);
            let (t2, d2) = along(k, nq_j.x, nq_j.y);
            let shared = t1.max(t2).min(lengths[k]) - t1.min(t2).max(0.0);
            if d1 <= tol && d2 <= tol && shared > tol && overlap.is_none_or(|o| (k, q) < (o.0, o.1))
            {
                overlap = Some((k, q, shared));
            }
        }
    }
    if let Some((k, q, shared)) = overlap {
        return Err(ctx.err(
            defs[k].at.span.clone(),
            &defs[k].at.field,
            format!(
                "member \"{}\" overlaps member \"{}\" over {}: expected collinear members to meet only at a shared end node",
                members[k].id,
                members[q].id,
                ctx.show(shared, Dimension::Length)
            ),
        ));
    }
    let mut connected = vec![false; nodes.len()];
    for m in members {
        connected[m.i] = true;
        connected[m.j] = true;
    }
    if let Some(n) = connected.iter().position(|c| !c) {
        let at = &node_defs[n].at;
        return Err(ctx.err(
            at.span.clone(),
            &at.field,
            format!(
                "node \"{}\" is not connected to any member: expected every node to be an end of a member",
                nodes[n].id
            ),
        ));
    }
    // Nodes sorted by x; each member looks only at the nodes within its bounding box.
    let mut by_x: Vec<usize> = (0..nodes.len()).collect();
    by_x.sort_by(|&a, &b| nodes[a].x.total_cmp(&nodes[b].x));
    // The first node (in file order) lying inside a member: (node, member, distance from i).
    let mut inside: Option<(usize, usize, f64)> = None;
    for (k, m) in members.iter().enumerate() {
        let tol = GEOMETRY_TOL * lengths[k];
        let first = by_x.partition_point(|&n| nodes[n].x < boxes[k][0] - slack);
        for &n in by_x[first..]
            .iter()
            .take_while(|&&n| nodes[n].x <= boxes[k][1] + slack)
        {
            if m.i == n
                || m.j == n
                || nodes[n].y < boxes[k][2] - slack
                || nodes[n].y > boxes[k][3] + slack
            {
                continue;
            }
            let (t, d) = along(k, nodes[n].x, nodes[n].y);
            if d <= tol
                && t > tol
                && t < lengths[k] - tol
                && inside.is_none_or(|o| (n, k) < (o.0, o.1))
            {
                inside = Some((n, k, t));
            }
        }
    }
    if let Some((n, k, t)) = inside {
        let (at, node, m) = (&node_defs[n].at, &nodes[n], &members[k]);
        return Err(ctx
            .err(
                at.span.clone(),
                &at.field,
                format!(
                    "node \"{}\" lies on member \"{}\" at {} from its end i but is not connected to it: \
                     expected members to meet only at their end nodes",
                    node.id,
                    m.id,
                    ctx.show(t, Dimension::Length)
                ),
            )
            .with_help(format!(
                "split member \"{}\" at node \"{}\" into two members, or move the node",
                m.id, node.id
            )));
    }
    Ok(())
}

fn combinations(ctx: &Ctx, raw: Option<&S<RawCombinations>>) -> Result<ComboChoice, FileError> {
    let mut written = ModelSpans {
        file: ctx.file.clone(),
        text: Some(ctx.text.clone()),
        ..ModelSpans::default()
    };
    let Some(c) = raw else {
        return Ok(ComboChoice {
            written,
            ..ComboChoice::default()
        });
    };
    let c = c.get_ref();
    let mut params = BTreeMap::new();
    for (name, v) in &c.params {
        params.insert(
            name.clone(),
            ctx.quantity(
                v,
                Dimension::Dimensionless,
                &format!("combinations.params.{name}"),
            )?,
        );
        written.params.insert(name.clone(), v.span());
    }
    let categories: Vec<&'static str> = ActionCategory::iter().map(|a| a.into()).collect();
    let levels: Vec<&'static str> = LoadLevel::iter().map(|a| a.into()).collect();
    let mut conversions = Vec::new();
    for (k, cv) in c.convert.iter().enumerate() {
        let field = |name: &str| format!("combinations.convert[{}].{name}", k + 1);
        let r = cv.get_ref();
        let category =
            ctx.choice::<ActionCategory>(&r.category, &field("category"), &categories)?;
        if !category.has_levels() {
            return Err(ctx.err(
                r.category.span(),
                &field("category"),
                format!(
                    "{category} loads have no levels to convert: expected wind, snow or seismic"
                ),
            ));
        }
        let from = ctx.choice::<LoadLevel>(&r.from, &field("from"), &levels)?;
        let to = ctx.choice::<LoadLevel>(&r.to, &field("to"), &levels)?;
        let factor = ctx.positive(&r.factor, Dimension::Dimensionless, &field("factor"))?;
        conversions.push(LevelConversion {
            category,
            from,
            to,
            factor,
        });
        written.conversions.push(cv.span());
    }
    written.table = c.table.as_ref().map(|t| t.span());
    written.service = c.service.as_ref().map(|t| t.span());
    Ok(ComboChoice {
        table: c.table.as_ref().map(|t| t.get_ref().clone()),
        service: c.service.as_ref().map(|t| t.get_ref().clone()),
        params,
        conversions,
        written,
    })
}

fn analysis(
    ctx: &Ctx,
    raw: Option<&S<RawAnalysis>>,
) -> Result<(AnalysisOptions, Option<StoryDeclaration>), FileError> {
    let mut out = AnalysisOptions::default();
    // Settings the model does not give follow the method (issue 7 item 8).
    out.origin.stiffness = SettingOrigin::MethodDefault;
    out.origin.notional = SettingOrigin::MethodDefault;
    let Some(a) = raw else {
        out.apply_method_defaults();
        return Ok((out, None));
    };
    let a = a.get_ref();
    if let Some(m) = &a.method {
        out.method = ctx.choice::<SecondOrderMethod>(m, "analysis.method", &METHOD_NAMES)?;
    }
    if let Some(s) = a.stiffness.as_ref().filter(|s| s.get_ref() != "auto") {
        out.stiffness = ctx.choice::<StiffnessPreset>(s, "analysis.stiffness", &STIFFNESS_NAMES)?;
        out.origin.stiffness = SettingOrigin::Model;
    }
    if let Some(s) = &a.service_stiffness {
        out.service_stiffness = Some(ctx.choice::<StiffnessPreset>(
            s,
            "analysis.service_stiffness",
            &SERVICE_STIFFNESS_NAMES,
        )?);
    }
    for (role, v) in &a.inertia_factor {
        let field = format!("analysis.inertia_factor.{role}");
        if Role::from_str(role).is_err() {
            return Err(ctx.err(
                v.span(),
                &field,
                format!(
                    "expected a role ({}), got \"{role}\"",
                    ROLE_NAMES.join(", ")
                ),
            ));
        }
        out.inertia_factor.insert(
            role.clone(),
            ctx.positive(v, Dimension::Dimensionless, &field)?,
        );
    }
    let coefficient = match &a.notional_coefficient {
        Some(v) => Some((
            v,
            ctx.positive(v, Dimension::Dimensionless, "analysis.notional_coefficient")?,
        )),
        None => None,
    };
    if let Some(n) = &a.notional {
        if n.get_ref() != "auto" {
            out.origin.notional = SettingOrigin::Model;
        }
        out.notional = match n.get_ref().as_str() {
            "auto" => NotionalLoads::Auto,
            "none" => NotionalLoads::None,
            "aisc" => NotionalLoads::Aisc {
                coefficient: coefficient.map_or(AISC_NOTIONAL_COEFFICIENT, |c| c.1),
            },
            "ec3-imperfection" => NotionalLoads::Ec3Imperfection,
            other => {
                return Err(ctx.err(
                    n.span(),
                    "analysis.notional",
                    format!("expected one of auto, none, aisc, ec3-imperfection, got \"{other}\""),
                ));
            }
        };
    }
    if let (Some((v, _)), false) = (
        coefficient,
        matches!(out.notional, NotionalLoads::Aisc { .. }),
    ) {
        return Err(ctx.err(
            v.span(),
            "analysis.notional_coefficient",
            "a coefficient applies only with notional = \"aisc\"",
        ));
    }
    if let Some(s) = &a.segments {
        // Fewer than 2 elements per member lose P-δ (issue 7 item 6): refused.
        let min = crate::solve::second_order::MIN_SEGMENTS as i64;
        if *s.get_ref() < min || *s.get_ref() > 1000 {
            return Err(ctx.err(
                s.span(),
                "analysis.segments",
                format!(
                    "expected an integer from {min} to 1000, got {}: with fewer than {min} \
                     elements per member the second-order analysis loses the P-δ effect of \
                     each member's own curvature",
                    s.get_ref()
                ),
            ));
        }
        out.segments = *s.get_ref() as usize;
    }
    if let Some(b) = &a.beta_dns {
        let v = ctx.quantity(b, Dimension::Dimensionless, "analysis.beta_dns")?;
        if !(0.0..=1.0).contains(&v) {
            return Err(ctx.err(
                b.span(),
                "analysis.beta_dns",
                format!("expected a ratio from 0 to 1, got {v}"),
            ));
        }
        out.beta_dns = v;
    }
    if let Some(p) = &a.live_patterns {
        out.live_patterns =
            ctx.choice::<LivePatterns>(p, "analysis.live_patterns", &["exact", "code"])?;
    }
    out.apply_method_defaults();
    let stories = match &a.story_levels {
        None => None,
        Some(list) => {
            let mut levels = Vec::new();
            for (k, v) in list.get_ref().iter().enumerate() {
                let field = format!("analysis.story_levels[{}]", k + 1);
                let y = ctx.quantity(v, Dimension::Length, &field)?;
                if levels.last().is_some_and(|&prev| y <= prev) {
                    return Err(ctx.err(
                        v.span(),
                        &field,
                        "expected story levels in increasing order, bottom up",
                    ));
                }
                levels.push(y);
            }
            if levels.is_empty() {
                return Err(ctx.err(
                    list.span(),
                    "analysis.story_levels",
                    "expected at least one level",
                ));
            }
            Some(StoryDeclaration { levels })
        }
    };
    Ok((out, stories))
}

/// Indices of the entities selected by a list of ids and patterns, in model order, each once.
fn select_ids<'a>(
    ctx: &Ctx,
    pats: &S<Patterns>,
    ids: impl Fn() -> Box<dyn Iterator<Item = &'a str> + 'a>,
    field: &str,
    what: &str,
) -> Result<Vec<usize>, FileError> {
    let mut chosen: Vec<usize> = Vec::new();
    if pats.get_ref().0.is_empty() {
        return Err(ctx.err(
            pats.span(),
            field,
            format!("expected at least one {what} id or pattern"),
        ));
    }
    for p in &pats.get_ref().0 {
        let hits: Vec<usize> = ids()
            .enumerate()
            .filter(|(_, id)| select::matches(p, id))
            .map(|(k, _)| k)
            .collect();
        if hits.is_empty() {
            let msg = if select::is_pattern(p) {
                format!(
                    "pattern \"{p}\" matches no {what}: expected a pattern such as \"B*.2\" matching existing ids"
                )
            } else {
                format!(
                    "unknown {what} \"{p}\": expected the id of a {what} defined in the file or generated by [frame]"
                )
            };
            return Err(ctx.err(pats.span(), field, msg));
        }
        for h in hits {
            if !chosen.contains(&h) {
                chosen.push(h);
            }
        }
    }
    chosen.sort_unstable();
    Ok(chosen)
}

/// The field path of a load case's key, naming the case by its id (`case "W".level`), or
/// by position when the id is blank (`case[3].level`).
fn case_field(k: usize, id: &str, name: &str) -> String {
    if id.trim().is_empty() || id.contains(['"', '\n']) {
        format!("case[{}].{name}", k + 1)
    } else {
        format!("case \"{id}\".{name}")
    }
}

fn load_cases(ctx: &Ctx, raw: &[S<RawCase>], model: &Model) -> Result<Vec<LoadCase>, FileError> {
    let mut index = HashMap::new();
    let mut groups: HashMap<String, ActionCategory> = HashMap::new();
    let mut out = Vec::new();
    for (k, c) in raw.iter().enumerate() {
        let c = c.get_ref();
        let field = |name: &str| case_field(k, c.id.get_ref(), name);
        register(ctx, &mut index, &reference(&c.id, field("id")), "load case")?;
        let names: Vec<&'static str> = ActionCategory::iter().map(|a| a.into()).collect();
        let category = ctx.choice::<ActionCategory>(&c.category, &field("category"), &names)?;
        if let Some(g) = &c.alternative {
            match groups.get(g.get_ref()) {
                Some(&other) if other != category => {
                    return Err(ctx.err(
                        g.span(),
                        &field("alternative"),
                        format!(
                            "alternative group \"{}\" holds {other} cases: expected every case of a group to share one category, got {category}",
                            g.get_ref()
                        ),
                    ));
                }
                _ => {
                    groups.insert(g.get_ref().clone(), category);
                }
            }
        }
        let level = match &c.level {
            Some(l) => {
                if !category.has_levels() {
                    return Err(ctx.err(
                        l.span(),
                        &field("level"),
                        format!("the level of a {category} load is not distinguished: expected `level` only on wind, snow and seismic cases"),
                    ));
                }
                let names: Vec<&'static str> = LoadLevel::iter().map(|a| a.into()).collect();
                Some(ctx.choice::<LoadLevel>(l, &field("level"), &names)?)
            }
            None => None,
        };
        let mut case = LoadCase {
            id: c.id.get_ref().clone(),
            description: c
                .description
                .as_ref()
                .map(|d| d.get_ref().clone())
                .unwrap_or_default(),
            category,
            alternative_group: c.alternative.as_ref().map(|g| g.get_ref().clone()),
            level,
            reverse: c.reverse.as_ref().is_some_and(|r| *r.get_ref()),
            arrange: c.arrange.as_ref().is_some_and(|a| *a.get_ref()),
            nodal: Vec::new(),
            member: Vec::new(),
        };
        for (q, nl) in c.node_load.iter().enumerate() {
            let f = |name: &str| field(&format!("node_load[{}].{name}", q + 1));
            let raw = nl.get_ref();
            let nodes = select_ids(
                ctx,
                &raw.nodes,
                || Box::new(model.nodes.iter().map(|n| n.id.as_str())),
                &f("nodes"),
                "node",
            )?;
            if raw.fx.is_none() && raw.fy.is_none() && raw.mz.is_none() {
                return Err(ctx.err(
                    raw.nodes.span(),
                    &f("nodes"),
                    "a nodal load needs at least one of fx, fy, mz",
                ));
            }
            let value = |v: &Option<S<Num>>, name: &str, dim| {
                v.as_ref()
                    .map_or(Ok(0.0), |v| ctx.quantity(v, dim, &f(name)))
            };
            let (fx, fy, mz) = (
                value(&raw.fx, "fx", Dimension::Force)?,
                value(&raw.fy, "fy", Dimension::Force)?,
                value(&raw.mz, "mz", Dimension::Moment)?,
            );
            case.nodal
                .extend(nodes.into_iter().map(|node| NodalLoad { node, fx, fy, mz }));
        }
        for (q, ml) in c.member_load.iter().enumerate() {
            let prefix = field(&format!("member_load[{}]", q + 1));
            case.member
                .extend(member_loads(ctx, ml.get_ref(), &prefix, model)?);
        }
        if let Some(sw) = c.self_weight.as_ref().filter(|s| *s.get_ref()) {
            case.member
                .extend(self_weight(ctx, sw, &field("self_weight"), model)?);
        }
        if let Some(a) = c.arrange.as_ref().filter(|a| *a.get_ref()) {
            arrangeable(ctx, a, &field("arrange"), &case, model)?;
        }
        out.push(case);
    }
    Ok(out)
}

/// An arranged load case must be live load with some of it on beams, and the frame's
/// arrangements must stay within [`crate::arrange::MAX_ARRANGEMENTS`].
fn arrangeable(
    ctx: &Ctx,
    at: &S<bool>,
    field: &str,
    case: &LoadCase,
    model: &Model,
) -> Result<(), FileError> {
    use crate::arrange::{MAX_ARRANGEMENTS, may_arrange, patterns, spans};
    if !may_arrange(case.category) {
        return Err(ctx.err(
            at.span(),
            field,
            format!(
                "only live load is arranged over spans (ACI 318-19 §6.4.3, EN 1992-1-1 §5.1.3): expected category = \"live\", got {}",
                case.category
            ),
        ));
    }
    let all = spans(model);
    let loaded: std::collections::BTreeSet<usize> = (0..all.len())
        .filter(|&s| {
            case.member
                .iter()
                .any(|ml| all[s].members.contains(&ml.member))
        })
        .collect();
    if loaded.is_empty() {
        return Err(ctx.err(
            at.span(),
            field,
            "nothing to arrange: expected member loads on beams in this case",
        ));
    }
    // The exact mode's count is known once the pieces are solved (`arrange_model`).
    let code = model.analysis.live_patterns == crate::model::LivePatterns::Code;
    let count = patterns(model, &all, &(0..all.len()).collect()).len();
    if code && count > MAX_ARRANGEMENTS {
        return Err(ctx.err(
            at.span(),
            field,
            format!(
                "the frame's beams give {count} live-load arrangements: expected at most {MAX_ARRANGEMENTS}; arrange the live load of fewer floors, or write the arrangements as alternative load cases"
            ),
        ));
    }
    Ok(())
}

/// Self-weight as a gravity load γ·A along every member.
fn self_weight(
    ctx: &Ctx,
    at: &S<bool>,
    field: &str,
    model: &Model,
) -> Result<Vec<MemberLoad>, FileError> {
    let mut out = Vec::new();
    for (k, m) in model.members.iter().enumerate() {
        let mat = &model.materials[m.material];
        let Some(gamma) = mat.unit_weight else {
            return Err(ctx.err(
                at.span(),
                field,
                format!(
                    "self-weight needs the unit weight of material \"{}\" (member \"{}\"): expected unit_weight in its [[material]] table",
                    mat.id, m.id
                ),
            ));
        };
        let w = gamma * model.sections[m.section].area;
        out.push(MemberLoad {
            member: k,
            kind: MemberLoadKind::Distributed {
                a: 0.0,
                b: model.length(k),
                w_a: w,
                w_b: w,
                direction: LoadDirection::Gravity,
                measure: Measure::AlongMember,
            },
        });
    }
    Ok(out)
}

/// A position along a member: a length, or a fraction of the member length written `"0.5L"`.
fn position(ctx: &Ctx, v: &S<Num>, l: f64, field: &str) -> Result<f64, FileError> {
    if let Num::Text(t) = v.get_ref()
        && let Some(frac) = t.trim().strip_suffix('L')
    {
        return match frac.trim().parse::<f64>() {
            Ok(f) if f.is_finite() => Ok(f * l),
            _ => Err(ctx.err(
                v.span(),
                field,
                format!("expected a fraction of the member length such as \"0.5L\", got \"{t}\""),
            )),
        };
    }
    ctx.quantity(v, Dimension::Length, field)
}

/// Member loads of one `[[case.member_load]]` table, one per selected member.
fn member_loads(
    ctx: &Ctx,
    raw: &RawMemberLoad,
    prefix: &str,
    model: &Model,
) -> Result<Vec<MemberLoad>, FileError> {
    let f = |name: &str| format!("{prefix}.{name}");
    let kind = raw.kind.get_ref().as_str();
    let allowed: &[&str] = match kind {
        "uniform" => &["w", "from", "to", "direction", "spread_over"],
        "linear" => &["w_from", "w_to", "from", "to", "direction", "spread_over"],
        "point" => &["p", "at", "direction"],
        "moment" => &["m", "at"],
        other => {
            return Err(ctx.err(
                raw.kind.span(),
                &f("kind"),
                format!("expected one of uniform, linear, point, moment, got \"{other}\""),
            ));
        }
    };
    if let Some(old) = &raw.measure {
        return Err(ctx.err(
            old.span(),
            &f("measure"),
            "`measure` was renamed: write spread_over = \"member\" (intensity per length of \
             member, the default) or spread_over = \"projection\" (per length of projection, \
             as for snow on a rafter)",
        ));
    }
    if let Some(d) = &raw.direction
        && d.get_ref() == "gravity"
    {
        return Err(ctx.err(
            d.span(),
            &f("direction"),
            format!(
                "direction \"gravity\" was renamed: write direction = \"down\" (positive downward); \
                 expected one of {}",
                DIRECTION_NAMES.join(", ")
            ),
        ));
    }
    let given: [(&str, Option<Range<usize>>); 10] = [
        ("w", raw.w.as_ref().map(|v| v.span())),
        ("w_from", raw.w_from.as_ref().map(|v| v.span())),
        ("w_to", raw.w_to.as_ref().map(|v| v.span())),
        ("p", raw.p.as_ref().map(|v| v.span())),
        ("m", raw.m.as_ref().map(|v| v.span())),
        ("from", raw.from.as_ref().map(|v| v.span())),
        ("to", raw.to.as_ref().map(|v| v.span())),
        ("at", raw.at.as_ref().map(|v| v.span())),
        ("direction", raw.direction.as_ref().map(|v| v.span())),
        ("spread_over", raw.spread_over.as_ref().map(|v| v.span())),
    ];
    for (name, span) in &given {
        if let Some(span) = span
            && !allowed.contains(name)
        {
            return Err(ctx.err(
                span.clone(),
                &f(name),
                format!(
                    "`{name}` does not apply to a {kind} load: expected {}",
                    allowed.join(", ")
                ),
            ));
        }
    }
    // A required field, or an error at `kind` naming it.
    let need = |v: &Option<S<Num>>, name: &str| -> Result<S<Num>, FileError> {
        v.clone().ok_or_else(|| {
            ctx.err(
                raw.kind.span(),
                &f(name),
                format!(
                    "a {kind} load needs `{name}` (expected {})",
                    allowed.join(", ")
                ),
            )
        })
    };
    let direction = match (&raw.direction, kind) {
        (_, "moment") => LoadDirection::LocalY, // unused for moments
        (Some(d), _) => ctx.choice::<LoadDirection>(d, &f("direction"), &DIRECTION_NAMES)?,
        (None, _) => {
            return Err(ctx.err(
                raw.kind.span(),
                &f("direction"),
                format!(
                    "a {kind} load needs `direction` (one of {})",
                    DIRECTION_NAMES.join(", ")
                ),
            ));
        }
    };
    let measure = match &raw.spread_over {
        None => Measure::AlongMember,
        Some(m) => match m.get_ref().as_str() {
            "member" => Measure::AlongMember,
            "projection" if matches!(direction, LoadDirection::LocalX | LoadDirection::LocalY) => {
                return Err(ctx.err(
                    m.span(),
                    &f("spread_over"),
                    "a load spread over the projection needs a global direction (global-x, global-y or down)",
                ));
            }
            "projection" => Measure::Projected,
            other => {
                return Err(ctx.err(
                    m.span(),
                    &f("spread_over"),
                    format!("expected one of member, projection, got \"{other}\""),
                ));
            }
        },
    };
    let members = select_ids(
        ctx,
        &raw.members,
        || Box::new(model.members.iter().map(|m| m.id.as_str())),
        &f("members"),
        "member",
    )?;
    let mut out = Vec::with_capacity(members.len());
    for m in members {
        let l = model.length(m);
        let mid = &model.members[m].id;
        // Check 0 ≤ value ≤ L for a position field.
        let within = |v: &S<Num>, name: &str| -> Result<f64, FileError> {
            let x = position(ctx, v, l, &f(name))?;
            let tol = 1e-9 * l;
            if x < -tol || x > l + tol {
                return Err(ctx.err(
                    v.span(),
                    &f(name),
                    format!(
                        "{name} = {} lies outside member \"{mid}\": expected 0 ≤ {name} ≤ L = {}",
                        ctx.show(x, Dimension::Length),
                        ctx.show(l, Dimension::Length)
                    ),
                ));
            }
            Ok(x.clamp(0.0, l))
        };
        let kind = match kind {
            "uniform" | "linear" => {
                let a = raw.from.as_ref().map_or(Ok(0.0), |v| within(v, "from"))?;
                let b = raw.to.as_ref().map_or(Ok(l), |v| within(v, "to"))?;
                if a >= b {
                    let span = raw
                        .to
                        .as_ref()
                        .or(raw.from.as_ref())
                        .map(|v| v.span())
                        .unwrap_or(raw.kind.span());
                    return Err(ctx.err(
                        span,
                        &f("to"),
                        format!(
                            "load on member \"{mid}\" runs from {} to {}: expected from < to",
                            ctx.show(a, Dimension::Length),
                            ctx.show(b, Dimension::Length)
                        ),
                    ));
                }
                let (w_a, w_b) = if kind == "uniform" {
                    let w = ctx.quantity(&need(&raw.w, "w")?, Dimension::LineLoad, &f("w"))?;
                    (w, w)
                } else {
                    (
                        ctx.quantity(
                            &need(&raw.w_from, "w_from")?,
                            Dimension::LineLoad,
                            &f("w_from"),
                        )?,
                        ctx.quantity(&need(&raw.w_to, "w_to")?, Dimension::LineLoad, &f("w_to"))?,
                    )
                };
                MemberLoadKind::Distributed {
                    a,
                    b,
                    w_a,
                    w_b,
                    direction,
                    measure,
                }
            }
            "point" => MemberLoadKind::Point {
                a: within(&need(&raw.at, "at")?, "at")?,
                p: ctx.quantity(&need(&raw.p, "p")?, Dimension::Force, &f("p"))?,
                direction,
            },
            _ => MemberLoadKind::Moment {
                a: within(&need(&raw.at, "at")?, "at")?,
                m: ctx.quantity(&need(&raw.m, "m")?, Dimension::Moment, &f("m"))?,
            },
        };
        out.push(MemberLoad { member: m, kind });
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

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
