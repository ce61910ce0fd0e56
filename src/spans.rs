//! The spans, beam lines and floors of a frame and the code arrangements of live load over
//! them (see [`crate::arrange`] for the rules): pure functions of the [`Model`], so that
//! `input` can check an arranged load case while it reads the file. `arrange` splits the
//! arranged cases into pieces and finds the exact arrangements on these, and re-exports
//! everything here.

use std::collections::BTreeSet;

use crate::model::{ActionCategory, Model, Role};

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

/// Whether a load case of `category` may be arranged (live load on floors only).
pub fn may_arrange(category: ActionCategory) -> bool {
    category == ActionCategory::Live
}
