//! Geometry: supports, node coordinates, coincident nodes, declared story levels and the
//! members' lengths, roles and crossings.

use super::references::reference;
use super::values::{Ctx, MemberDef, NodeDef, SupportDef};
use crate::diag::FileError;
use crate::input::raw::{RawAnalysis, S};
use crate::model::{Member, Model, Node, Restraint, Role};
use crate::units::Dimension;

/// Relative tolerance on lengths for geometric coincidence (fraction of a member length).
const GEOMETRY_TOL: f64 = 1e-6;

/// Role of a member without a section hint: column within 45° of vertical, else beam.
pub fn resolve_role(dx: f64, dy: f64) -> Role {
    if dy.abs() >= dx.abs() {
        Role::Column
    } else {
        Role::Beam
    }
}

/// A support from its `type` and springs.
pub(super) fn support(
    ctx: &Ctx,
    s: &S<crate::input::raw::RawSupport>,
    field: &str,
) -> Result<SupportDef, FileError> {
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
pub(super) fn check_story_levels(
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
            .any(|&e| (e - y).abs() < crate::model::LEVEL_TOLERANCE);
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

pub(super) fn check_geometry(
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
