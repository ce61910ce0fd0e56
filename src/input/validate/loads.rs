//! Loads: load cases, their categories and levels, self weight and member loads placed
//! along members.

use std::collections::HashMap;
use std::ops::Range;

use strum::IntoEnumIterator;

use super::options::DIRECTION_NAMES;
use super::references::{reference, register, select_ids};
use super::values::Ctx;
use crate::diag::FileError;
use crate::input::raw::{Num, RawCase, RawMemberLoad, S};
use crate::model::{
    ActionCategory, LoadCase, LoadDirection, LoadLevel, Measure, MemberLoad, MemberLoadKind, Model,
    NodalLoad,
};
use crate::units::Dimension;

/// The field path of a load case's key, naming the case by its id (`case "W".level`), or
/// by position when the id is blank (`case[3].level`).
fn case_field(k: usize, id: &str, name: &str) -> String {
    if id.trim().is_empty() || id.contains(['"', '\n']) {
        format!("case[{}].{name}", k + 1)
    } else {
        format!("case \"{id}\".{name}")
    }
}

pub(super) fn load_cases(
    ctx: &Ctx,
    raw: &[S<RawCase>],
    model: &Model,
) -> Result<Vec<LoadCase>, FileError> {
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
/// arrangements must stay within [`crate::spans::MAX_ARRANGEMENTS`].
fn arrangeable(
    ctx: &Ctx,
    at: &S<bool>,
    field: &str,
    case: &LoadCase,
    model: &Model,
) -> Result<(), FileError> {
    use crate::spans::{MAX_ARRANGEMENTS, may_arrange, patterns, spans};
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
