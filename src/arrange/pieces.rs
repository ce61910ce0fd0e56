//! The pieces an arranged load case is split into ([`Arranged`]), and the rewriting of the
//! factored cases over the arrangements ([`Arranged::apply`]).

use std::collections::BTreeMap;

use crate::combos::{Expansion, FactoredCase, Merged};
use crate::model::{LoadCase, Model};
use crate::spans::{Pattern, Span, loaded_spans, patterns, spans};

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
