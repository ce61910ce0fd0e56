//! One model checked under several variants, side by side (issue 23): a variant is a
//! combination table, a second-order method, a stiffness or notional-load setting, or a
//! set of table parameters. The first variant is the reference.
//!
//! This module compares envelopes that `check` has already made; it runs nothing. Per
//! member it sets side by side, for each end and the span, the governing design moment
//! (the larger in magnitude of the largest positive and largest negative) with its case and
//! the part that governs, the largest design compression and tension, and the largest
//! design shear; per story the verdict and the figure that decides it under each variant's
//! method; and a headline. Every value is the one the plain `check` of that variant
//! reports (tested). SI units.

use serde::Serialize;

use crate::envelope::{DesignMoment, Envelope, Location, StoryEnvelope};
use crate::model::SecondOrderMethod;

/// A ratio to the reference is formed only where the reference value is at least this
/// share of the reference's largest value of that kind (moments, forces) over the frame:
/// below it the ratio of two small numbers is noise (common practice, no source).
pub const SIGNIFICANT_SHARE: f64 = 0.01;

/// A variant as the reports list it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct VariantInfo {
    pub label: String,
    /// The combination table's file name.
    pub table: String,
    pub method: String,
    /// The settings the variant changes, in words.
    pub settings: String,
}

/// A variant that could not run, and why.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LeftOut {
    pub label: String,
    pub settings: String,
    pub reason: String,
}

/// A ratio within this of 1 is no change (round-off of two runs of the same frame).
pub const RATIO_ROUND_OFF: f64 = 1e-9;

/// What one variant's `check` produced, as the comparison reads it.
#[derive(Debug, Clone, Copy)]
pub struct VariantRun<'a> {
    pub label: &'a str,
    pub method: SecondOrderMethod,
    pub envelope: &'a Envelope,
}

/// One variant's value of one quantity.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Value {
    /// N·m for moments, N for forces; signed as in the envelope.
    pub value: f64,
    pub case: String,
    /// `no-sway` or `sway` for a design moment: the larger amplified part there.
    pub governs: Option<String>,
}

/// What a row compares.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Quantity {
    /// The governing design moment at end i, in the span or at end j.
    MomentEndI,
    MomentSpan,
    MomentEndJ,
    /// The largest design compression and tension.
    Compression,
    Tension,
    /// The largest |design shear| of either end.
    Shear,
}

impl Quantity {
    /// Whether the quantity is a moment (else a force).
    pub fn is_moment(self) -> bool {
        matches!(
            self,
            Quantity::MomentEndI | Quantity::MomentSpan | Quantity::MomentEndJ
        )
    }
}

/// One quantity of one member under every variant.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Row {
    pub member: String,
    pub role: String,
    pub quantity: Quantity,
    /// One per variant, in variant order; None where the variant has no such value.
    pub values: Vec<Option<Value>>,
    /// |value| / |reference value| per variant (1 for the reference itself); None where
    /// either is missing or the reference value is not significant ([`SIGNIFICANT_SHARE`]).
    pub ratios: Vec<Option<f64>>,
    /// The variant with the largest |value| (the first on a tie).
    pub governs: Option<usize>,
}

/// One story's verdict and deciding figure under every variant.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StoryRow {
    pub story: usize,
    /// `sway`, `non-sway` or `no stable case` per variant.
    pub verdicts: Vec<String>,
    /// The figure that decides the verdict under the variant's method, with its name:
    /// max B2 (AISC 360-16 App. 8), max Q (ACI 318-19 6.6.4.4.1), min α_cr (EN 1993-1-1
    /// 5.2.1), max Δ2/Δ1 (direct analysis).
    pub figures: Vec<Option<Figure>>,
    /// Whether some variant's verdict differs from the reference's.
    pub changed: bool,
}

/// A story figure and its case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Figure {
    pub name: String,
    pub value: f64,
    pub case: String,
}

/// The largest change of one quantity against the reference.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Change {
    pub member: String,
    pub quantity: Quantity,
    /// Index of the variant.
    pub variant: usize,
    pub ratio: f64,
}

/// What the comparison says first.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Headline {
    /// Per variant: the number of members whose largest design moment it gives (the first variant
    /// wins a tie).
    pub members_governed: Vec<usize>,
    pub largest_increase: Option<Change>,
    pub largest_decrease: Option<Change>,
    /// Stories whose verdict changes under some variant.
    pub changed_stories: Vec<usize>,
}

/// The whole comparison.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Comparison {
    pub variants: Vec<String>,
    pub rows: Vec<Row>,
    pub stories: Vec<StoryRow>,
    pub headline: Headline,
}

/// The governing design moment at `location` of a member envelope: the larger in
/// magnitude of its largest positive and largest negative (the positive on a tie).
fn moment_at(m: &crate::envelope::MemberEnvelope, location: Location) -> Option<&DesignMoment> {
    let s = m.sections.iter().find(|s| s.location == location)?;
    match (&s.positive, &s.negative) {
        (Some(p), Some(n)) => Some(if n.moment.abs() > p.moment.abs() {
            n
        } else {
            p
        }),
        (p, n) => p.as_ref().or(n.as_ref()),
    }
}

/// The value of `quantity` for member `member` in `env`.
fn value_of(env: &Envelope, member: &str, quantity: Quantity) -> Option<Value> {
    let moment = |location| {
        let m = env.members.iter().find(|m| m.member == member)?;
        moment_at(m, location).map(|d| Value {
            value: d.moment,
            case: d.case.clone(),
            governs: Some(d.governs.clone()),
        })
    };
    let axial = |tension: bool| {
        let a = env.axial.iter().find(|a| a.member == member)?;
        let r = if tension { &a.tension } else { &a.compression };
        r.as_ref().map(|r| Value {
            value: r.axial,
            case: r.case.clone(),
            governs: None,
        })
    };
    match quantity {
        Quantity::MomentEndI => moment(Location::EndI),
        Quantity::MomentSpan => moment(Location::Span),
        Quantity::MomentEndJ => moment(Location::EndJ),
        Quantity::Compression => axial(false),
        Quantity::Tension => axial(true),
        Quantity::Shear => env
            .shear
            .iter()
            .filter(|r| r.member == member)
            .fold(None::<&crate::envelope::ShearRow>, |best, r| match best {
                Some(b) if b.shear.abs() >= r.shear.abs() => Some(b),
                _ => Some(r),
            })
            .map(|r| Value {
                value: r.shear,
                case: r.case.clone(),
                governs: None,
            }),
    }
}

const QUANTITIES: [Quantity; 6] = [
    Quantity::MomentEndI,
    Quantity::MomentSpan,
    Quantity::MomentEndJ,
    Quantity::Compression,
    Quantity::Tension,
    Quantity::Shear,
];

/// The index of the largest |value| (the first on a tie).
fn largest(values: &[Option<Value>]) -> Option<usize> {
    let mut best: Option<(usize, f64)> = None;
    for (k, v) in values.iter().enumerate() {
        if let Some(v) = v
            && best.is_none_or(|(_, b)| v.value.abs() > b)
        {
            best = Some((k, v.value.abs()));
        }
    }
    best.map(|(k, _)| k)
}

/// The verdict of a story envelope in one word: `sway` if any stable case is a sway case.
pub fn verdict(e: &StoryEnvelope) -> String {
    if e.cases == 0 {
        "no stable case".into()
    } else if e.sway_cases.is_empty() {
        "non-sway".into()
    } else {
        "sway".into()
    }
}

/// The figure that decides a story's verdict under `method`.
pub fn deciding_figure(e: &StoryEnvelope, method: SecondOrderMethod) -> Option<Figure> {
    let (name, peak) = match method {
        SecondOrderMethod::AiscB1B2 => ("max B2", &e.b2),
        SecondOrderMethod::AciMagnifier => ("max Q", &e.q_index),
        SecondOrderMethod::Ec3AlphaCr => ("min α_cr", &e.alpha_cr),
        SecondOrderMethod::Direct => ("max Δ2/Δ1", &e.drift_amplification),
    };
    peak.as_ref().map(|p| Figure {
        name: name.into(),
        value: p.value,
        case: p.case.clone(),
    })
}

/// Compare `runs`; the first is the reference. Members and stories follow the reference.
pub fn compare(runs: &[VariantRun]) -> Comparison {
    let Some(reference) = runs.first() else {
        return Comparison {
            variants: Vec::new(),
            rows: Vec::new(),
            stories: Vec::new(),
            headline: Headline {
                members_governed: Vec::new(),
                largest_increase: None,
                largest_decrease: None,
                changed_stories: Vec::new(),
            },
        };
    };
    let mut rows = Vec::new();
    for m in &reference.envelope.members {
        for q in QUANTITIES {
            let values: Vec<Option<Value>> = runs
                .iter()
                .map(|r| value_of(r.envelope, &m.member, q))
                .collect();
            if values.iter().all(Option::is_none) {
                continue;
            }
            rows.push(Row {
                member: m.member.clone(),
                role: m.role.clone(),
                quantity: q,
                governs: largest(&values),
                ratios: Vec::new(),
                values,
            });
        }
    }
    // Significance against the reference's largest moment and largest force.
    let scale = |moment: bool| {
        rows.iter()
            .filter(|r| r.quantity.is_moment() == moment)
            .filter_map(|r| r.values[0].as_ref())
            .fold(0.0, |a: f64, v| a.max(v.value.abs()))
    };
    let (moment_scale, force_scale) = (scale(true), scale(false));
    for r in &mut rows {
        let s = if r.quantity.is_moment() {
            moment_scale
        } else {
            force_scale
        };
        let reference = r.values[0]
            .as_ref()
            .map(|v| v.value.abs())
            .filter(|&v| v > 0.0 && v >= SIGNIFICANT_SHARE * s);
        r.ratios = r
            .values
            .iter()
            .map(|v| Some(v.as_ref()?.value.abs() / reference?))
            .collect();
    }
    let stories: Vec<StoryRow> = reference
        .envelope
        .stories
        .iter()
        .map(|st| {
            fn of<'e>(r: &VariantRun<'e>, story: usize) -> Option<&'e StoryEnvelope> {
                r.envelope.stories.iter().find(|s| s.story == story)
            }
            let verdicts: Vec<String> = runs
                .iter()
                .map(|r| of(r, st.story).map_or("-".into(), verdict))
                .collect();
            StoryRow {
                story: st.story,
                changed: verdicts.iter().any(|v| *v != verdicts[0]),
                figures: runs
                    .iter()
                    .map(|r| of(r, st.story).and_then(|s| deciding_figure(s, r.method)))
                    .collect(),
                verdicts,
            }
        })
        .collect();
    let headline = headline(runs.len(), &rows, &stories);
    Comparison {
        variants: runs.iter().map(|r| r.label.to_string()).collect(),
        rows,
        stories,
        headline,
    }
}

/// The headline of `rows` and `stories` over `n` variants.
fn headline(n: usize, rows: &[Row], stories: &[StoryRow]) -> Headline {
    let mut members_governed = vec![0; n];
    let mut members: Vec<&str> = rows.iter().map(|r| r.member.as_str()).collect();
    members.dedup();
    for m in members {
        // The member's largest design moment under each variant.
        let best: Vec<Option<Value>> = (0..n)
            .map(|k| {
                rows.iter()
                    .filter(|r| r.member == m && r.quantity.is_moment())
                    .filter_map(|r| r.values[k].clone())
                    .fold(None::<Value>, |b, v| match b {
                        Some(b) if b.value.abs() >= v.value.abs() => Some(b),
                        _ => Some(v),
                    })
            })
            .collect();
        if let Some(k) = largest(&best) {
            members_governed[k] += 1;
        }
    }
    // The headline's changes are those of the design moments (the hand-off's main figure).
    let changes = || {
        rows.iter()
            .filter(|r| r.quantity.is_moment())
            .flat_map(|r| {
                r.ratios
                    .iter()
                    .enumerate()
                    .skip(1)
                    .filter_map(move |(k, ratio)| {
                        ratio.map(|ratio| Change {
                            member: r.member.clone(),
                            quantity: r.quantity,
                            variant: k,
                            ratio,
                        })
                    })
            })
    };
    let largest_increase = changes().filter(|c| c.ratio > 1.0 + RATIO_ROUND_OFF).fold(
        None::<Change>,
        |b, c| match b {
            Some(b) if b.ratio >= c.ratio => Some(b),
            _ => Some(c),
        },
    );
    let largest_decrease = changes().filter(|c| c.ratio < 1.0 - RATIO_ROUND_OFF).fold(
        None::<Change>,
        |b, c| match b {
            Some(b) if b.ratio <= c.ratio => Some(b),
            _ => Some(c),
        },
    );
    Headline {
        members_governed,
        largest_increase,
        largest_decrease,
        changed_stories: stories
            .iter()
            .filter(|s| s.changed)
            .map(|s| s.story)
            .collect(),
    }
}
