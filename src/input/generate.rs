//! The regular-frame generator: a `[frame]` table with bay widths and story heights becomes
//! nodes, columns, beams and base supports with predictable ids.
//!
//! Id scheme (grid lines numbered 1, 2, … from the left; level 0 is the base, level k the
//! top of story k; stories and bays numbered from 1):
//! * node `N{g}.{k}`: grid line g at level k (`N1.0` is the bottom-left node);
//! * column `C{g}.{s}`: grid line g, story s, from `N{g}.{s-1}` up to `N{g}.{s}`;
//! * beam `B{b}.{k}`: bay b at level k, from `N{b}.{k}` to `N{b+1}.{k}` (left to right).
//!
//! Members are listed story by story (columns of the story, then the beams on top of it).
//!
//! Column sections come from `columns`, or on the two outer grid lines from
//! `exterior_columns` and on the others from `interior_columns` where the model gives them.
//! `hinged_columns` lists grid lines whose columns are hinged at both ends (leaning
//! columns); `beam_hinges` grid lines where the beam ends framing into them are hinged.

use super::raw::{RawFrame, S};
use super::validate::values::{Ctx, MemberDef, NodeDef, Ref, SupportDef};
use crate::diag::FileError;
use crate::limits::{MAX_MEMBERS, MAX_NODES, exceeded};
use crate::model::Restraint;
use crate::units::Dimension;

/// Nodes, members and supports produced by the generator, ids per the module doc.
#[derive(Debug, Default)]
pub struct Generated {
    pub nodes: Vec<NodeDef>,
    pub members: Vec<MemberDef>,
    pub supports: Vec<SupportDef>,
}

/// Id of the generated node on grid line `g` (from 1) at level `k` (0 = base).
pub fn node_id(g: usize, k: usize) -> String {
    format!("N{g}.{k}")
}

/// Id of the generated column on grid line `g` in story `s` (both from 1).
pub fn column_id(g: usize, s: usize) -> String {
    format!("C{g}.{s}")
}

/// Id of the generated beam in bay `b` (from 1) at level `k` (from 1).
pub fn beam_id(b: usize, k: usize) -> String {
    format!("B{b}.{k}")
}

/// Positive lengths from a list of values, in SI.
fn lengths(
    ctx: &Ctx,
    list: &S<Vec<S<crate::input::raw::Num>>>,
    field: &str,
) -> Result<Vec<f64>, FileError> {
    if list.get_ref().is_empty() {
        return Err(ctx.err(
            list.span(),
            field,
            "expected at least one length, got an empty list",
        ));
    }
    list.get_ref()
        .iter()
        .enumerate()
        .map(|(k, v)| ctx.positive(v, Dimension::Length, &format!("{field}[{}]", k + 1)))
        .collect()
}

/// The section of story (or level) `k` (from 1): one entry serves every story.
fn per_story(list: &[S<String>], k: usize) -> &S<String> {
    if list.len() == 1 {
        &list[0]
    } else {
        &list[k - 1]
    }
}

/// Check that a per-story section list has one entry or one per story.
fn check_per_story(
    ctx: &Ctx,
    list: &S<Vec<S<String>>>,
    field: &str,
    n: usize,
) -> Result<(), FileError> {
    let len = list.get_ref().len();
    if len == 1 || len == n {
        return Ok(());
    }
    Err(ctx.err(
        list.span(),
        field,
        format!("expected 1 section (every story) or {n} (one per story, bottom up), got {len}"),
    ))
}

/// Grid line numbers (from 1) from a list, each between 1 and `grids`.
fn grid_lines(
    ctx: &Ctx,
    list: Option<&S<Vec<S<i64>>>>,
    field: &str,
    grids: usize,
) -> Result<Vec<usize>, FileError> {
    let Some(list) = list else {
        return Ok(Vec::new());
    };
    list.get_ref()
        .iter()
        .enumerate()
        .map(|(k, g)| match usize::try_from(*g.get_ref()) {
            Ok(n) if (1..=grids).contains(&n) => Ok(n),
            _ => Err(ctx.err(
                g.span(),
                &format!("{field}[{}]", k + 1),
                format!(
                    "expected a grid line number from 1 to {grids} (left to right), got {}",
                    g.get_ref()
                ),
            )),
        })
        .collect()
}

/// Expand a `[frame]` table into nodes, members and base supports.
pub fn generate(ctx: &Ctx, frame: &S<RawFrame>) -> Result<Generated, FileError> {
    let f = frame.get_ref();
    let bays = lengths(ctx, &f.bays, "frame.bays")?;
    let stories = lengths(ctx, &f.stories, "frame.stories")?;
    let ns = stories.len();
    let counts = [
        ("nodes", (bays.len() + 1) * (ns + 1), MAX_NODES, "MAX_NODES"),
        (
            "members",
            ns * (2 * bays.len() + 1),
            MAX_MEMBERS,
            "MAX_MEMBERS",
        ),
    ];
    for (what, count, limit, name) in counts {
        if let Some(m) = exceeded(what, count, limit, name) {
            return Err(ctx
                .err(frame.span(), "frame", format!("the frame makes {m}"))
                .with_help("the limits are listed in docs/model-file.md"));
        }
    }
    check_per_story(ctx, &f.columns, "frame.columns", ns)?;
    check_per_story(ctx, &f.beams, "frame.beams", ns)?;
    for (list, field) in [
        (&f.exterior_columns, "frame.exterior_columns"),
        (&f.interior_columns, "frame.interior_columns"),
    ] {
        if let Some(list) = list {
            check_per_story(ctx, list, field, ns)?;
        }
    }
    let grids = bays.len() + 1;
    let hinged_columns = grid_lines(
        ctx,
        f.hinged_columns.as_ref(),
        "frame.hinged_columns",
        grids,
    )?;
    let beam_hinges = grid_lines(ctx, f.beam_hinges.as_ref(), "frame.beam_hinges", grids)?;
    let base = match f.base.get_ref().as_str() {
        "fixed" => [Restraint::Fixed; 3],
        "pinned" => [Restraint::Fixed, Restraint::Fixed, Restraint::Free],
        other => {
            return Err(ctx.err(
                f.base.span(),
                "frame.base",
                format!("expected \"fixed\" or \"pinned\", got \"{other}\""),
            ));
        }
    };
    let (x0, y0) = match &f.origin {
        None => (0.0, 0.0),
        Some(o) if o.get_ref().len() == 2 => (
            ctx.quantity(&o.get_ref()[0], Dimension::Length, "frame.origin[1]")?,
            ctx.quantity(&o.get_ref()[1], Dimension::Length, "frame.origin[2]")?,
        ),
        Some(o) => {
            return Err(ctx.err(o.span(), "frame.origin", "expected two coordinates [x, y]"));
        }
    };
    // Grid line abscissae and level elevations as running sums.
    let xs: Vec<f64> = std::iter::once(x0)
        .chain(bays.iter().scan(x0, |x, b| {
            *x += b;
            Some(*x)
        }))
        .collect();
    let ys: Vec<f64> = std::iter::once(y0)
        .chain(stories.iter().scan(y0, |y, h| {
            *y += h;
            Some(*y)
        }))
        .collect();

    let here = |field: &str, id: String| Ref {
        id,
        span: frame.span(),
        field: field.to_string(),
    };
    let mut out = Generated::default();
    for (k, &y) in ys.iter().enumerate() {
        for (g, &x) in xs.iter().enumerate() {
            let id = node_id(g + 1, k);
            out.nodes.push(NodeDef {
                at: here("frame", id),
                x,
                y,
                written: None,
            });
        }
    }
    let material = Ref {
        id: f.material.get_ref().clone(),
        span: f.material.span(),
        field: "frame.material".into(),
    };
    let section = |list: &S<Vec<S<String>>>, k: usize, field: &str| {
        let s = per_story(list.get_ref(), k);
        Ref {
            id: s.get_ref().clone(),
            span: s.span(),
            field: field.to_string(),
        }
    };
    // The column list of grid line g: exterior or interior where the model gives one.
    let columns_of = |g: usize| {
        let outer = g == 1 || g == grids;
        match (outer, &f.exterior_columns, &f.interior_columns) {
            (true, Some(list), _) => (list, "frame.exterior_columns"),
            (false, _, Some(list)) => (list, "frame.interior_columns"),
            _ => (&f.columns, "frame.columns"),
        }
    };
    for s in 1..=ns {
        for g in 1..=xs.len() {
            let (list, field) = columns_of(g);
            let pinned = hinged_columns.contains(&g);
            out.members.push(MemberDef {
                at: here("frame", column_id(g, s)),
                i: here("frame", node_id(g, s - 1)),
                j: here("frame", node_id(g, s)),
                section: section(list, s, field),
                material: material.clone(),
                release: [pinned, pinned],
            });
        }
        for b in 1..=bays.len() {
            out.members.push(MemberDef {
                at: here("frame", beam_id(b, s)),
                i: here("frame", node_id(b, s)),
                j: here("frame", node_id(b + 1, s)),
                section: section(&f.beams, s, "frame.beams"),
                material: material.clone(),
                release: [beam_hinges.contains(&b), beam_hinges.contains(&(b + 1))],
            });
        }
    }
    for g in 1..=xs.len() {
        out.supports.push(SupportDef {
            node: Ref {
                id: node_id(g, 0),
                span: f.base.span(),
                field: "frame.base".into(),
            },
            dofs: base,
        });
    }
    Ok(out)
}
