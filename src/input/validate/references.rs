//! References: ids registered once, references resolved (with `*` patterns), and the
//! materials and sections that members refer to.

use std::collections::HashMap;

use super::options::ROLE_NAMES;
use super::values::{Ctx, Ref};
use crate::diag::FileError;
use crate::input::raw::{Patterns, RawModel, S};
use crate::input::select;
use crate::model::{Material, Role, Section};
use crate::units::Dimension;

/// Register a new id in `index`, rejecting empty ids, wildcards and duplicates.
pub(super) fn register(
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
pub(super) fn resolve(
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
pub(super) fn reference(v: &S<String>, field: String) -> Ref {
    Ref {
        id: v.get_ref().clone(),
        span: v.span(),
        field,
    }
}

/// The error for a model with more items than a limit allows, at the first one too many.
pub(super) fn too_many(ctx: &Ctx, first_over: &Ref, m: String) -> FileError {
    ctx.err(
        first_over.span.clone(),
        &first_over.field,
        format!("the model has {m}"),
    )
    .with_help("the limits are listed in docs/model-file.md")
}

type Index = HashMap<String, (usize, usize)>;

pub(super) fn materials(ctx: &Ctx, raw: &RawModel) -> Result<(Vec<Material>, Index), FileError> {
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

pub(super) fn sections(ctx: &Ctx, raw: &RawModel) -> Result<(Vec<Section>, Index), FileError> {
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

/// Indices of the entities selected by a list of ids and patterns, in model order, each once.
pub(super) fn select_ids<'a>(
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
