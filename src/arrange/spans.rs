//! The spans, beam lines and floors of a frame, the code arrangements of live load over
//! them and the pieces an arranged load case is split into ([`Arranged`]); see
//! [`crate::arrange`] for the arrangements. The exact arrangements (`arrange/exact.rs`) are
//! built on these.

use std::collections::{BTreeMap, BTreeSet};

use crate::combos::{Expansion, FactoredCase, Merged};
use crate::model::{ActionCategory, LoadCase, Model, Role};

/// The most code arrangements a model may have (see the module documentation for the
/// count).
pub const MAX_ARRANGEMENTS: usize = 300;

/// The most exact worst subsets a model may have (each one multiplies the factored cases
/// that draw on the arranged load). Measured by `cargo bench --bench patterns`: the 5-bay,
/// 10-storey frame has 1,673.
pub const MAX_EXACT_PATTERNS: usize = 2000;

/// A span: a chain of beam members between two joints.
#[derive(Debug, Clone, PartialEq)]
pub struct Span {
    /// Members in order along the chain (indices into [`Model::members`]).
    pub members: Vec<usize>,
    /// Id of the first member, or `first–last` for a chain of several.
    pub name: String,
    /// Index of the beam line.
    pub line: usize,
    /// Position in its line from the left, from 0.
    pub index: usize,
    /// Floor rank of its line, from 0 at the lowest line.
    pub floor: usize,
    /// End nodes of the chain.
    pub ends: (usize, usize),
}

/// One arrangement: which spans carry the arranged load.
#[derive(Debug, Clone, PartialEq)]
pub struct Pattern {
    /// Short tag used in case ids: `full`, `alt-a`, `alt-b`, `adj-N2.1`.
    pub tag: String,
    /// Indices into the span list.
    pub spans: Vec<usize>,
}

/// A model with its arranged load cases split into pieces, and the arrangements.
#[derive(Debug, Clone)]
pub struct Arranged {
    /// The model with one piece load case per loaded span and arranged case appended after
    /// the model's own load cases (whose indices do not change).
    pub model: Model,
    /// Number of the model's own load cases (pieces follow them).
    pub own_cases: usize,
    pub spans: Vec<Span>,
    pub patterns: Vec<Pattern>,
    /// Per arranged load case (index into the own cases): its rest piece, if any, and its
    /// pieces by span index.
    pub(super) pieces: BTreeMap<usize, (Option<usize>, BTreeMap<usize, usize>)>,
}

/// The spans of the model's beams, with their lines and floors.
pub fn spans(model: &Model) -> Vec<Span> {
    let n = model.nodes.len();
    let beams: Vec<usize> = (0..model.members.len())
        .filter(|&m| model.members[m].role == Role::Beam)
        .collect();
    let mut at_node: Vec<Vec<usize>> = vec![Vec::new(); n];
    for &b in &beams {
        at_node[model.members[b].i].push(b);
        at_node[model.members[b].j].push(b);
    }
    let mut joint = vec![false; n];
    for m in model.members.iter().filter(|m| m.role != Role::Beam) {
        joint[m.i] = true;
        joint[m.j] = true;
    }
    for s in &model.supports {
        joint[s.node] = true;
    }
    for (v, list) in at_node.iter().enumerate() {
        if list.len() != 2 {
            joint[v] = true;
        }
    }
    // Walk chains from joints; then any closed loop of beams without a joint.
    let mut used = vec![false; model.members.len()];
    let mut chains: Vec<(Vec<usize>, usize, usize)> = Vec::new();
    let walk = |start: usize, first: usize, used: &mut Vec<bool>| {
        let mut chain = vec![first];
        used[first] = true;
        let mut node = other_end(model, first, start);
        let mut last = first;
        while !joint[node] {
            let Some(&next) = at_node[node].iter().find(|&&b| b != last && !used[b]) else {
                break;
            };
            used[next] = true;
            chain.push(next);
            node = other_end(model, next, node);
            last = next;
        }
        (chain, start, node)
    };
    for v in 0..n {
        if !joint[v] {
            continue;
        }
        for &b in &at_node[v] {
            if !used[b] {
                chains.push(walk(v, b, &mut used));
            }
        }
    }
    for &b in &beams {
        if !used[b] {
            let start = model.members[b].i;
            chains.push(walk(start, b, &mut used));
        }
    }
    // Beam lines: chains connected through shared end nodes (union-find on nodes).
    let mut parent: Vec<usize> = (0..n).collect();
    fn find(p: &mut [usize], x: usize) -> usize {
        let mut r = x;
        while p[r] != r {
            r = p[r];
        }
        p[x] = r;
        r
    }
    for (_, a, b) in &chains {
        let (ra, rb) = (find(&mut parent, *a), find(&mut parent, *b));
        parent[ra] = rb;
    }
    let mid = |chain: &[usize]| -> (f64, f64) {
        let (mut x, mut y) = (0.0, 0.0);
        for &m in chain {
            let (a, b) = (
                &model.nodes[model.members[m].i],
                &model.nodes[model.members[m].j],
            );
            x += 0.5 * (a.x + b.x);
            y += 0.5 * (a.y + b.y);
        }
        (x / chain.len() as f64, y / chain.len() as f64)
    };
    let mut roots: Vec<usize> = Vec::new();
    let mut line_of: Vec<usize> = Vec::new();
    for (_, a, _) in &chains {
        let r = find(&mut parent, *a);
        let l = roots.iter().position(|&x| x == r).unwrap_or_else(|| {
            roots.push(r);
            roots.len() - 1
        });
        line_of.push(l);
    }
    // Floor rank of each line by its mean elevation (to the millimetre).
    let mut elevation = vec![(0.0, 0usize); roots.len()];
    for (c, (chain, _, _)) in chains.iter().enumerate() {
        elevation[line_of[c]].0 += mid(chain).1;
        elevation[line_of[c]].1 += 1;
    }
    let mm: Vec<i64> = elevation
        .iter()
        .map(|(s, k)| (s / *k as f64 * 1000.0).round() as i64)
        .collect();
    let levels: BTreeSet<i64> = mm.iter().copied().collect();
    let floor_of = |l: usize| levels.iter().position(|&e| e == mm[l]).unwrap_or(0);
    // Order lines by floor then by their leftmost X; spans in a line by mid-point X.
    let mut order: Vec<usize> = (0..chains.len()).collect();
    order.sort_by(|&p, &q| {
        (floor_of(line_of[p]), line_of[p])
            .cmp(&(floor_of(line_of[q]), line_of[q]))
            .then(mid(&chains[p].0).0.total_cmp(&mid(&chains[q].0).0))
    });
    let mut out: Vec<Span> = Vec::with_capacity(chains.len());
    for c in order {
        let (chain, a, b) = &chains[c];
        let line = line_of[c];
        let index = out.iter().filter(|s| s.line == line).count();
        let first = &model.members[chain[0]].id;
        let name = if chain.len() == 1 {
            first.clone()
        } else {
            format!("{first}–{}", model.members[chain[chain.len() - 1]].id)
        };
        out.push(Span {
            members: chain.clone(),
            name,
            line,
            index,
            floor: floor_of(line),
            ends: (*a, *b),
        });
    }
    out
}

/// The node at the other end of member `m` from `node`.
fn other_end(model: &Model, m: usize, node: usize) -> usize {
    let mem = &model.members[m];
    if mem.i == node { mem.j } else { mem.i }
}

/// The code arrangements of `loaded` spans (indices into `spans`): full, the two
/// checkerboards, two adjacent spans at each interior joint of each line, then the spans
/// on each side of each column on the floors at both its ends. Empty and repeated
/// arrangements are left out.
pub fn patterns(model: &Model, spans: &[Span], loaded: &BTreeSet<usize>) -> Vec<Pattern> {
    let mut candidates: Vec<Pattern> = vec![Pattern {
        tag: "full".into(),
        spans: (0..spans.len()).collect(),
    }];
    for (tag, parity) in [("alt-a", 0), ("alt-b", 1)] {
        candidates.push(Pattern {
            tag: tag.into(),
            spans: (0..spans.len())
                .filter(|&s| (spans[s].index + spans[s].floor) % 2 == parity)
                .collect(),
        });
    }
    for (p, sp) in spans.iter().enumerate() {
        // The next span of the same line sharing a joint with this one.
        for (q, sq) in spans.iter().enumerate().skip(p + 1) {
            if sq.line != sp.line || sq.index != sp.index + 1 {
                continue;
            }
            let shared = [sp.ends.0, sp.ends.1]
                .into_iter()
                .find(|&v| v == sq.ends.0 || v == sq.ends.1);
            if let Some(node) = shared {
                candidates.push(Pattern {
                    tag: format!("adj-{}", model.nodes[node].id),
                    spans: vec![p, q],
                });
            }
        }
    }
    candidates.extend(column_patterns(model, spans));
    let mut out: Vec<Pattern> = Vec::new();
    for mut c in candidates {
        c.spans.retain(|s| loaded.contains(s));
        if !c.spans.is_empty() && !out.iter().any(|o| o.spans == c.spans) {
            out.push(c);
        }
    }
    out
}

/// For every column, the spans that meet either of its end nodes from the left, and those
/// from the right (`left-{column}`, `right-{column}`): live load on the floors at both ends
/// of the column, on one side only, bends the column in single curvature (from memory).
fn column_patterns(model: &Model, spans: &[Span]) -> Vec<Pattern> {
    let mut out = Vec::new();
    for m in model.members.iter().filter(|m| m.role == Role::Column) {
        for (side, left) in [("left", true), ("right", false)] {
            let chosen: Vec<usize> = (0..spans.len())
                .filter(|&s| {
                    let (a, b) = spans[s].ends;
                    [m.i, m.j].into_iter().any(|v| {
                        let here = model.nodes[v].x;
                        let far = if a == v {
                            model.nodes[b].x
                        } else if b == v {
                            model.nodes[a].x
                        } else {
                            return false;
                        };
                        (far < here) == left && far != here
                    })
                })
                .collect();
            out.push(Pattern {
                tag: format!("{side}-{}", m.id),
                spans: chosen,
            });
        }
    }
    out
}

/// Spans carrying any member load of the arranged cases of `model`.
pub fn loaded_spans(model: &Model, spans: &[Span]) -> BTreeSet<usize> {
    let mut out = BTreeSet::new();
    for case in model.load_cases.iter().filter(|c| c.arrange) {
        for ml in &case.member {
            if let Some(s) = spans.iter().position(|s| s.members.contains(&ml.member)) {
                out.insert(s);
            }
        }
    }
    out
}

/// Split the arranged load cases of `model` into pieces and list the arrangements.
/// A model without arranged cases comes back unchanged, with no arrangements.
pub fn arrange(model: &Model) -> Arranged {
    let own_cases = model.load_cases.len();
    let mut out = Arranged {
        model: model.clone(),
        own_cases,
        spans: Vec::new(),
        patterns: Vec::new(),
        pieces: BTreeMap::new(),
    };
    if !model.load_cases.iter().any(|c| c.arrange) {
        return out;
    }
    out.spans = spans(model);
    out.patterns = patterns(model, &out.spans, &loaded_spans(model, &out.spans));
    for (k, case) in model
        .load_cases
        .iter()
        .enumerate()
        .filter(|(_, c)| c.arrange)
    {
        let mut by_span: BTreeMap<usize, LoadCase> = BTreeMap::new();
        let mut rest = piece(case, "rest", "loads off the beams");
        rest.nodal = case.nodal.clone();
        for ml in &case.member {
            match out
                .spans
                .iter()
                .position(|s| s.members.contains(&ml.member))
            {
                Some(s) => by_span
                    .entry(s)
                    .or_insert_with(|| {
                        let name = &out.spans[s].name;
                        piece(case, name, &format!("span {name}"))
                    })
                    .member
                    .push(ml.clone()),
                None => rest.member.push(ml.clone()),
            }
        }
        let rest_index = if rest.nodal.is_empty() && rest.member.is_empty() {
            None
        } else {
            out.model.load_cases.push(rest);
            Some(out.model.load_cases.len() - 1)
        };
        let mut span_index = BTreeMap::new();
        for (s, p) in by_span {
            out.model.load_cases.push(p);
            span_index.insert(s, out.model.load_cases.len() - 1);
        }
        out.pieces.insert(k, (rest_index, span_index));
    }
    out
}

/// A piece of arranged case `case`: same category, no loads yet.
fn piece(case: &LoadCase, what: &str, description: &str) -> LoadCase {
    LoadCase {
        id: format!("{}@{what}", case.id),
        description: format!("{}: {description} (arrangement piece)", case.id),
        category: case.category,
        alternative_group: None,
        level: case.level,
        reverse: false,
        arrange: false,
        nodal: Vec::new(),
        member: Vec::new(),
    }
}

impl Arranged {
    /// Readable list of the spans an arrangement loads, e.g. `B1.1, B3.1, B2.2`, or, where
    /// that is longer, the brief map of [`Arranged::span_map`].
    pub fn spans_text(&self, p: &Pattern) -> String {
        if p.tag == "full" {
            return "every span".into();
        }
        if p.spans.is_empty() {
            return "no span".into();
        }
        let names = p
            .spans
            .iter()
            .map(|&s| self.spans[s].name.as_str())
            .collect::<Vec<_>>()
            .join(", ");
        let map = self.span_map(p);
        if names.chars().count() <= map.chars().count() {
            names
        } else {
            map
        }
    }

    /// The spans an arrangement loads as a brief map: floors from the lowest, separated by
    /// `/`, each its spans from the left (beam lines of one floor in turn), `x` loaded and
    /// `.` not, e.g. `spans x.x/.x.` for two floors.
    pub fn span_map(&self, p: &Pattern) -> String {
        let mut out = String::from("spans ");
        for (k, span) in self.spans.iter().enumerate() {
            if k > 0 && span.floor != self.spans[k - 1].floor {
                out.push('/');
            }
            out.push(if p.spans.contains(&k) { 'x' } else { '.' });
        }
        out
    }

    /// Replace every factored case that draws on an arranged load case by one case per
    /// arrangement: the arranged case's factor moves onto the pieces of the arrangement
    /// (its rest piece always included). Ids gain `/{case}:{tag}` and expressions say
    /// which spans are loaded. Identical results are merged and reported.
    pub fn apply(&self, expansion: Expansion) -> Expansion {
        if self.pieces.is_empty() {
            return expansion;
        }
        let mut out = Expansion {
            cases: Vec::new(),
            ..expansion.clone()
        };
        for fc in expansion.cases {
            let arranged: Vec<(usize, f64)> = fc
                .factors
                .iter()
                .copied()
                .filter(|(k, _)| self.pieces.contains_key(k))
                .collect();
            if arranged.is_empty() {
                out.cases.push(fc);
                continue;
            }
            let names: Vec<&str> = arranged
                .iter()
                .map(|(k, _)| self.model.load_cases[*k].id.as_str())
                .collect();
            for p in &self.patterns {
                let mut factors: BTreeMap<usize, f64> = fc
                    .factors
                    .iter()
                    .copied()
                    .filter(|(k, _)| !self.pieces.contains_key(k))
                    .collect();
                for &(k, x) in &arranged {
                    let (rest, by_span) = &self.pieces[&k];
                    let chosen = p.spans.iter().filter_map(|s| by_span.get(s));
                    for &piece in rest.iter().chain(chosen) {
                        *factors.entry(piece).or_insert(0.0) += x;
                    }
                }
                let case = FactoredCase {
                    id: format!("{}/{}:{}", fc.id, names.join("+"), p.tag),
                    expression: format!(
                        "{}; {} on {}",
                        fc.expression,
                        names.join(", "),
                        self.spans_text(p)
                    ),
                    factors: factors.into_iter().collect(),
                    ..fc.clone()
                };
                match out.cases.iter().find(|c| c.factors == case.factors) {
                    Some(kept) => {
                        let kept = kept.id.clone();
                        match out.merged.iter_mut().find(|m| m.kept == kept) {
                            Some(m) => m.dropped.push(case.id),
                            None => out.merged.push(Merged {
                                kept,
                                dropped: vec![case.id],
                            }),
                        }
                    }
                    None => out.cases.push(case),
                }
            }
        }
        out
    }
}

/// Whether a load case of `category` may be arranged (live load on floors only).
pub fn may_arrange(category: ActionCategory) -> bool {
    category == ActionCategory::Live
}
