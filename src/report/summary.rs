//! The summary of `plumbline check`: the assumptions with where each came from, the story
//! envelope, the member envelope, the columns' axial extremes, the cases that never govern,
//! the largest equilibrium residual and the caution, as text, Markdown, CSV and JSON.
//!
//! Text, Markdown and CSV are in the model's units; JSON in SI base units with a `units`
//! block. One set of row builders serves every tabular format.

use std::io::Write;

use serde::{Deserialize, Serialize};

use super::json::JsonObject;
use super::{CAUTION, num, table_of, wrap_text};
use crate::envelope::{
    AxialExtreme, DesignMoment, Envelope, GoverningMoment, Location, MemberEnvelope, Peak, Sign,
    StoryEnvelope, governing,
};
use crate::model::{Model, SecondOrderMethod};
use crate::units::Dimension;

pub use super::page::{RowStream, Selection, Setting, Summary, Table, TableInfo};

/// Version of the JSON document of `check`; raised when a key changes meaning.
pub const SCHEMA_VERSION: u32 = 4;

/// The sign convention every moment table states.
pub const SIGN_NOTE: &str = "Moments are internal bending moments, positive with the member's \
local −y face in tension (sagging for a beam drawn left to right); N is positive in tension; \
Pr is the required axial compressive strength (0 in tension).";

/// The unit of every field of the JSON document.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct JsonUnits {
    pub length: String,
    pub force: String,
    pub moment: String,
    pub stiffness: String,
    pub displacement: String,
}

/// The JSON document of `check` (keys documented in docs/json-output.md).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CheckDoc {
    pub schema_version: u32,
    /// `plumbline <version>`.
    pub program: String,
    pub title: String,
    pub model_file: String,
    pub model_sha256: String,
    pub units: JsonUnits,
    /// "title; standard; edition" of the combination table.
    pub combinations: String,
    pub table: TableInfo,
    pub method: String,
    pub method_description: String,
    pub assumptions: Vec<Setting>,
    pub selection: Selection,
    pub envelope: Envelope,
    /// The largest design moment of each member over the stable cases.
    pub governing: Vec<GoverningMoment>,
    /// Whether `report.cases[]` carry each case's member results and buckled shape (false
    /// in a `--lean` document; documents written before the key existed carry them).
    #[serde(default = "carries_case_detail")]
    pub case_detail: bool,
    /// The per-case detail: `stiffness`, `stories[]`, `cases[]` (see docs/json-output.md).
    pub report: serde_json::Value,
    /// The serviceability half of the run (see the README), when it has one.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub serviceability: Option<crate::service::ServiceReport>,
    /// The approximate check, when it was asked for (`--approximate`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub approximate: Option<serde_json::Value>,
    pub caution: String,
}

/// What a document without `case_detail` holds: every case's members (they were always
/// written before `--lean`).
fn carries_case_detail() -> bool {
    true
}

/// Write the JSON document of a run (the keys of [`CheckDoc`], documented in the README)
/// to `out`, one top-level section at a time: nothing is held whole in memory, so a tall
/// frame's document streams to its file. `approximate` is the approximate check, when it
/// was asked for. A new top-level key is one more `doc.section(...)` line here.
pub fn write_json(
    s: &Summary,
    approximate: Option<&serde_json::Value>,
    out: impl std::io::Write,
) -> std::io::Result<()> {
    let mut doc = JsonObject::begin(std::io::BufWriter::with_capacity(1 << 16, out))?;
    doc.section("schema_version", &SCHEMA_VERSION)?;
    doc.section(
        "program",
        &format!("plumbline {}", env!("CARGO_PKG_VERSION")),
    )?;
    doc.section("title", &s.model.title)?;
    doc.section("model_file", &s.model_file)?;
    doc.section("model_sha256", &s.model_sha256)?;
    doc.section(
        "units",
        &JsonUnits {
            length: "m".into(),
            force: "N".into(),
            moment: "N*m".into(),
            stiffness: "N/m".into(),
            displacement: "m".into(),
        },
    )?;
    doc.section("combinations", &s.table_line())?;
    doc.section("table", &s.table)?;
    doc.section("method", &s.report.method.to_string())?;
    doc.section(
        "method_description",
        super::check::method_title(s.report.method),
    )?;
    doc.section("assumptions", &s.settings)?;
    doc.section("selection", &s.selection)?;
    doc.section("envelope", &s.envelope)?;
    doc.section("governing", &governing(&s.envelope.members))?;
    doc.section("case_detail", &s.case_detail)?;
    doc.section("report", s.report)?;
    if let Some(r) = s.service {
        doc.section("serviceability", r)?;
    }
    if let Some(a) = approximate {
        doc.section("approximate", a)?;
    }
    doc.section("caution", CAUTION)?;
    doc.finish()?;
    Ok(())
}

/// Number formatting in the model's units.
struct Fmt<'a> {
    model: &'a Model,
}

impl Fmt<'_> {
    fn label(&self, d: Dimension) -> String {
        self.model.units.label(d)
    }
    fn v(&self, v: f64, d: Dimension, decimals: usize) -> String {
        num(self.model.units.from_si(v, d), decimals)
    }
    fn m(&self, v: f64, decimals: usize) -> String {
        self.v(v, Dimension::Moment, decimals)
    }
    fn f(&self, v: f64, decimals: usize) -> String {
        self.v(v, Dimension::Force, decimals)
    }
    fn x(&self, v: f64) -> String {
        self.v(v, Dimension::Length, 2)
    }
}

/// The assumptions table.
pub fn assumptions_table(s: &Summary) -> Table {
    let mut rows = vec![vec![
        "model file".to_string(),
        format!("{} (SHA-256 {})", s.model_file, s.model_sha256),
        "command line".into(),
    ]];
    rows.extend(
        s.settings
            .iter()
            .map(|x| vec![x.setting.clone(), x.value.clone(), x.source.clone()]),
    );
    Table {
        name: "assumptions",
        title: "Assumptions".into(),
        header: vec!["setting".into(), "value".into(), "from".into()],
        rows,
    }
}

/// The assumptions row naming the cases whose design moments fell back on the
/// second-order analysis because an amplifier was outside the conditions of its clause
/// (issue 16); None with the direct method (every case uses it) or when no case fell back.
pub fn second_order_setting(report: &crate::check::CheckReport) -> Option<Setting> {
    use crate::check::story::SwayRoute;
    if report.method == crate::model::SecondOrderMethod::Direct {
        return None;
    }
    let fell_back: Vec<&str> = report
        .cases
        .iter()
        .filter(|c| {
            c.stories
                .iter()
                .any(|s| s.route == SwayRoute::SecondOrderAnalysis)
        })
        .map(|c| c.id.as_str())
        .collect();
    if fell_back.is_empty() {
        return None;
    }
    const SHOWN: usize = 6;
    let mut list = fell_back[..fell_back.len().min(SHOWN)].join(", ");
    if fell_back.len() > SHOWN {
        list.push_str(&format!(", … ({} more)", fell_back.len() - SHOWN));
    }
    Some(Setting {
        setting: "moments from the second-order analysis".into(),
        value: format!(
            "{} of {} cases ({list}): the method's amplifier is outside its clause there; the \
             story criterion (--detail) says why",
            fell_back.len(),
            report.cases.len()
        ),
        source: match report.method {
            crate::model::SecondOrderMethod::Ec3AlphaCr => "EN 1993-1-1 5.2.2(5)B, (6)B",
            crate::model::SecondOrderMethod::AciMagnifier => "ACI 318-19 6.6.4.6.2(c)",
            _ => "AISC 360-16 App. 8 (B2 unusable) and Ch. C",
        }
        .into(),
    })
}

/// `value (case)` or `-`.
fn peak(p: &Option<Peak>, decimals: usize) -> String {
    p.as_ref().map_or("-".into(), |p| {
        format!("{} ({})", num(p.value, decimals), p.case)
    })
}

/// `1/N (case)` for a drift ratio.
fn drift_peak(p: &Option<Peak>) -> String {
    match p {
        Some(p) => format!("{} ({})", super::drift_ratio_text(p.value), p.case),
        None => "-".into(),
    }
}

/// The verdict of a story over the cases.
pub fn story_verdict(e: &StoryEnvelope) -> String {
    let verdict = if e.cases == 0 {
        "no stable case".into()
    } else if e.sway_cases.is_empty() {
        format!("non-sway in all {} cases", e.cases)
    } else {
        format!("sway in {} of {} cases", e.sway_cases.len(), e.cases)
    };
    let n = e.second_order_cases.len();
    if n > 0 && n < e.cases {
        format!("{verdict}; 2nd-order moments in {n}")
    } else {
        verdict
    }
}

/// One column of the story envelope: its head, its cell, and the methods whose figure it
/// is (`None`: every method's).
type StoryColumn = (
    &'static str,
    fn(&StoryEnvelope) -> String,
    Option<&'static [SecondOrderMethod]>,
);

/// The columns of the story envelope, in order.
const STORY_COLUMNS: [StoryColumn; 10] = {
    use SecondOrderMethod::*;
    [
        ("story", |e| e.story.to_string(), None),
        ("max drift/h", |e| drift_peak(&e.drift_ratio), None),
        (
            "max 2nd-order drift/h",
            |e| drift_peak(&e.drift_ratio_second_order),
            Some(&[Direct]),
        ),
        ("max B2", |e| peak(&e.b2, 3), Some(&[AiscB1B2])),
        ("max Q", |e| peak(&e.q_index, 3), Some(&[AciMagnifier])),
        ("max δs", |e| peak(&e.delta_s, 3), Some(&[AciMagnifier])),
        (
            "max Δ2/Δ1",
            |e| {
                if e.drift_amplification.is_none() && e.negligible_drift_cases > 0 {
                    "negligible".into()
                } else {
                    peak(&e.drift_amplification, 3)
                }
            },
            Some(&[Direct]),
        ),
        ("min α_cr", |e| peak(&e.alpha_cr, 2), Some(&[Ec3AlphaCr])),
        (
            "max sway amp",
            |e| peak(&e.sway_amplifier, 3),
            Some(&[AiscB1B2, AciMagnifier, Ec3AlphaCr]),
        ),
        ("verdict", story_verdict, None),
    ]
};

/// The story envelope table (text and Markdown): the chosen method's figures, or with
/// `detail` every method's (issue 20).
pub fn story_table(s: &Summary) -> Table {
    let method = s.report.method;
    let shown: Vec<&StoryColumn> = STORY_COLUMNS
        .iter()
        .filter(|(_, _, only)| s.detail || only.is_none_or(|m| m.contains(&method)))
        .collect();
    let rows = s
        .envelope
        .stories
        .iter()
        .map(|e| shown.iter().map(|(_, cell, _)| cell(e)).collect())
        .collect();
    Table {
        name: "stories",
        title: "Story envelope over the stable cases: largest drift ratio and the figures of the method, with the case".into(),
        header: shown.iter().map(|(h, _, _)| h.to_string()).collect(),
        rows,
    }
}

/// The entries of a member envelope in order: end i, span, end j; positive then negative.
pub fn entries(m: &MemberEnvelope) -> Vec<(Location, Sign, &DesignMoment)> {
    let mut out = Vec::new();
    for s in &m.sections {
        for (sign, d) in [(Sign::Positive, &s.positive), (Sign::Negative, &s.negative)] {
            if let Some(d) = d {
                out.push((s.location, sign, d));
            }
        }
    }
    out
}

/// Whether an entry is the member's largest |M|.
fn is_governing(m: &MemberEnvelope, location: Location, sign: Sign) -> bool {
    m.governing
        .as_ref()
        .is_some_and(|g| g.location == location && g.sign == sign)
}

/// The member envelope, one row per member, section and sign. `tidy` gives the CSV form
/// (plain values, the expression and both amplifiers in their own columns). The page
/// without `detail` leaves out the no-sway and sway parts (Mns, Ms, larger part), and Pr
/// where the method defines none.
pub fn member_table(s: &Summary, tidy: bool) -> Table {
    let mut t = member_table_full(s, tidy);
    if !tidy {
        let mut drop = Vec::new();
        if !s.detail {
            drop.extend(["Mns", "Ms", "larger part"]);
        }
        if !s.method_defines_pr() {
            drop.push("Pr");
        }
        drop_columns(&mut t, &drop);
    }
    t
}

/// `t` without the columns whose head, up to a unit in brackets, is one of `heads`.
fn drop_columns(t: &mut Table, heads: &[&str]) {
    let keep: Vec<bool> = t
        .header
        .iter()
        .map(|h| !heads.contains(&h.split(" (").next().unwrap_or(h).trim()))
        .collect();
    let filter = |row: &mut Vec<String>| {
        let mut k = keep.iter();
        row.retain(|_| *k.next().unwrap_or(&true));
    };
    filter(&mut t.header);
    t.rows.iter_mut().for_each(filter);
}

/// [`member_table`] with every column.
fn member_table_full(s: &Summary, tidy: bool) -> Table {
    let f = Fmt { model: s.model };
    let d = if tidy { 3 } else { 1 };
    let (lm, lf, lu) = (
        f.label(Dimension::Moment),
        f.label(Dimension::Force),
        f.label(Dimension::Length),
    );
    let mut header: Vec<String> = vec![
        "member".into(),
        "role".into(),
        "at".into(),
        "sign".into(),
        format!("x ({lu})"),
        format!("M design ({lm})"),
        format!("Mns ({lm})"),
        format!("Ms ({lm})"),
        "larger part".into(),
        format!("N ({lf})"),
        format!("Pr ({lf})"),
        format!("V ({lf})"),
        "case".into(),
    ];
    if tidy {
        header.extend([
            format!("M first-order ({lm})"),
            "non-sway amp".into(),
            "sway amp".into(),
            "expression".into(),
            "member max".into(),
        ]);
    } else {
        header.push("max".into());
    }
    let mut rows = Vec::new();
    for m in &s.envelope.members {
        for (location, sign, e) in entries(m) {
            let top = is_governing(m, location, sign);
            let mut row = vec![
                m.member.clone(),
                m.role.clone(),
                location.to_string(),
                if tidy {
                    sign.to_string()
                } else {
                    match sign {
                        Sign::Positive => "+".into(),
                        Sign::Negative => "−".into(),
                    }
                },
                f.x(e.x),
                f.m(e.moment, d),
                f.m(e.no_sway, d),
                f.m(e.sway, d),
                e.governs.clone(),
                f.f(e.axial, d),
                f.f(e.p_r, d),
                f.f(e.shear, d),
                e.case.clone(),
            ];
            if tidy {
                row.extend([
                    f.m(e.first_order, d),
                    e.non_sway_amplifier.map_or(String::new(), |v| num(v, 4)),
                    e.sway_amplifier.map_or(String::new(), |v| num(v, 4)),
                    e.expression.clone(),
                    top.to_string(),
                ]);
            } else {
                row.push(if top { "◀".into() } else { String::new() });
            }
            rows.push(row);
        }
    }
    Table {
        name: "members",
        title: format!(
            "Member envelope over the stable cases: largest + and − design moment at each end and in the span ({lm}); ◀ marks each member's largest"
        ),
        header,
        rows,
    }
}

/// The columns' largest compression and tension with their concurrent moments.
pub fn column_table(s: &Summary, tidy: bool) -> Table {
    let f = Fmt { model: s.model };
    let d = if tidy { 3 } else { 1 };
    let (lm, lf) = (f.label(Dimension::Moment), f.label(Dimension::Force));
    let mut rows = Vec::new();
    for m in &s.envelope.members {
        let pairs: [(&str, &Option<AxialExtreme>); 2] =
            [("compression", &m.compression), ("tension", &m.tension)];
        for (kind, a) in pairs {
            if let Some(a) = a {
                let mut row = vec![
                    m.member.clone(),
                    kind.to_string(),
                    f.f(a.axial, d),
                    f.f(a.p_r, d),
                    f.m(a.moment_i, d),
                    f.m(a.moment_j, d),
                    f.m(a.moment_span, d),
                    f.f(a.shear, d),
                    a.case.clone(),
                ];
                if tidy {
                    row.push(a.expression.clone());
                }
                rows.push(row);
            }
        }
    }
    let mut header = vec![
        "member".to_string(),
        "largest".into(),
        format!("N ({lf})"),
        format!("Pr ({lf})"),
        format!("M i ({lm})"),
        format!("M j ({lm})"),
        format!("M span ({lm})"),
        format!("V ({lf})"),
        "case".into(),
    ];
    if tidy {
        header.push("expression".into());
    }
    let mut t = Table {
        name: "columns",
        title:
            "Columns: largest compression and largest tension with the concurrent design moments"
                .into(),
        header,
        rows,
    };
    if !tidy && !s.method_defines_pr() {
        drop_columns(&mut t, &["Pr"]);
    }
    t
}

/// The cases named in the envelope, with their expressions.
pub fn case_table(s: &Summary) -> Table {
    let named: std::collections::BTreeSet<&str> = s
        .envelope
        .members
        .iter()
        .flat_map(|m| {
            entries(m)
                .into_iter()
                .map(|(_, _, d)| d.case.as_str())
                .chain(
                    [&m.compression, &m.tension]
                        .into_iter()
                        .flatten()
                        .map(|a| a.case.as_str()),
                )
        })
        .collect();
    let rows = s
        .report
        .cases
        .iter()
        .filter(|c| named.contains(c.id.as_str()))
        .map(|c| vec![c.id.clone(), c.expression.clone(), c.basis.to_string()])
        .collect();
    Table {
        name: "governing-cases",
        title: "Governing cases".into(),
        header: vec!["case".into(), "expression".into(), "basis".into()],
        rows,
    }
}

/// What the suffixes of factored case ids mean (issue 20): one line for each kind of
/// suffix that occurs in `ids`, in the order the suffixes are appended. A suffix means the
/// same thing in every id.
pub fn id_legend<'a>(ids: impl IntoIterator<Item = &'a str>) -> Vec<String> {
    let (mut left_out, mut alternative, mut arranged, mut notional) = (false, false, false, false);
    for id in ids {
        left_out |= id.contains('~');
        for part in id.split('/').skip(1) {
            match part {
                "N+" | "N-" => notional = true,
                p if p.contains(':') => arranged = true,
                _ => alternative = true,
            }
        }
    }
    let mut out = Vec::new();
    if left_out {
        out.push(
            "~S    the combination with the accompanying action S left out (the standard asks \
             for the case where it is absent)"
                .to_string(),
        );
    }
    if alternative {
        out.push(
            "/WL   the alternative that draws on load case WL of its alternative group; WL+Su \
             one case from each of two groups; -WL the case WL reversed"
                .to_string(),
        );
    }
    if arranged {
        out.push(
            "/L:p  live-load arrangement p of load case L: full, alt-a/alt-b alternate spans,              adj-J the two spans either side of joint J"
                .to_string(),
        );
    }
    if notional {
        out.push(
            "/N+   a gravity-only case with notional loads toward +X (/N- toward −X)".to_string(),
        );
    }
    out
}

/// The legend of case ids for this run's cases, under a heading; empty when no id has a
/// suffix.
pub fn id_legend_lines(s: &Summary) -> Vec<String> {
    let lines = id_legend(s.report.cases.iter().map(|c| c.id.as_str()));
    if lines.is_empty() {
        return lines;
    }
    std::iter::once(
        "Reading the case ids: the combination id of the table (and variant letter), then"
            .to_string(),
    )
    .chain(lines.into_iter().map(|l| format!("  {l}")))
    .collect()
}

/// Closing lines: cases that never govern, unstable cases, largest residual.
pub fn closing_lines(s: &Summary) -> Vec<String> {
    let e = &s.envelope;
    let mut out = Vec::new();
    out.push(if e.never_govern.is_empty() {
        "Cases that never govern: none".to_string()
    } else {
        format!(
            "Cases that never govern ({} of {}): {}",
            e.never_govern.len(),
            e.cases.len(),
            e.never_govern.join(", ")
        )
    });
    out.push(if e.unstable.is_empty() {
        "Unstable cases: none".to_string()
    } else {
        format!(
            "UNSTABLE cases (no design values, left out of the envelope): {}",
            e.unstable.join(", ")
        )
    });
    if !e.member_modes.is_empty() {
        const SHOWN: usize = 6;
        let list: Vec<String> = e
            .member_modes
            .iter()
            .take(SHOWN)
            .map(|p| format!("{} at α = {} ({})", p.member, num(p.alpha, 2), p.case))
            .collect();
        let more = e.member_modes.len().saturating_sub(SHOWN);
        out.push(format!(
            "Members that buckle on their own below the frame's sway mode (a member check, EN \
             1993-1-1 §6.3, AISC 360-16 Ch. E; not the frame's α_cr): {}{}",
            list.join(", "),
            if more > 0 {
                format!(", … ({more} more)")
            } else {
                String::new()
            }
        ));
    }
    if let Some(r) = &e.residual {
        let f = Fmt { model: s.model };
        out.push(format!(
            "Largest equilibrium residual: {:.2e} {} at a node ({:.1e} of the largest applied load), case {}",
            s.model.units.from_si(r.residual, Dimension::Force),
            f.label(Dimension::Force),
            r.relative,
            r.case
        ));
    }
    out
}

/// The tables of the one-page summary, in page order, empty ones left out (shared by the
/// text and Markdown pages).
fn page_tables(s: &Summary) -> Vec<Table> {
    [
        assumptions_table(s),
        story_table(s),
        member_table(s, false),
        column_table(s, false),
        super::handoff::axial_table(s, false),
        super::handoff::shear_table(s, false),
        super::handoff::reaction_table(s, false),
        super::handoff::service_reaction_table(s, false),
        case_table(s),
    ]
    .into_iter()
    .filter(|t| !t.rows.is_empty())
    .collect()
}

fn text_table(t: &Table) -> String {
    let width = super::text_width();
    format!(
        "{}\n{}\n\n",
        wrap_text(&t.title, width, 2),
        table_of(&t.header, t.rows.clone())
    )
}

/// The one-page summary as text, every line fitted to [`super::text_width`]: tables by
/// [`table_of`], prose and lists wrapped with their continuation lines indented.
pub fn text(s: &Summary) -> String {
    let width = super::text_width();
    let line = |out: &mut String, text: &str, indent: usize| {
        out.push_str(&wrap_text(text, width, indent));
        out.push('\n');
    };
    let mut out = String::new();
    line(&mut out, &s.model.title, 2);
    line(&mut out, &s.selection.heading(), 2);
    for r in &s.selection.remarks {
        line(&mut out, &format!("  {r}"), 4);
    }
    out.push('\n');
    for t in page_tables(s) {
        let governing_cases = t.name == "governing-cases";
        out.push_str(&text_table(&t));
        if governing_cases {
            let legend = id_legend_lines(s);
            for (k, l) in legend.iter().enumerate() {
                line(&mut out, l, if k == 0 { 2 } else { 8 });
            }
            if !legend.is_empty() {
                out.push('\n');
            }
        }
    }
    if s.has_strength() {
        for l in closing_lines(s) {
            line(&mut out, &l, 2);
        }
    }
    for w in &s.report.warnings {
        line(&mut out, &format!("Warning: {w}"), 2);
    }
    if let Some(r) = s.service {
        out.push_str(&service_text(s.model, r));
    }
    let notes = if s.has_strength() {
        vec![SIGN_NOTE, drift_note(s), CAUTION]
    } else {
        vec![CAUTION]
    };
    for note in notes {
        line(&mut out, note, 0);
    }
    out
}

/// What the strength drifts are: with a serviceability half, the note points to it.
fn drift_note(s: &Summary) -> &'static str {
    if s.service.is_some() {
        super::service::STRENGTH_DRIFT_NOTE
    } else {
        crate::check::story::DRIFT_NOTE
    }
}

/// The "Serviceability" section as text.
fn service_text(model: &Model, r: &crate::service::ServiceReport) -> String {
    use super::service;
    let width = super::text_width();
    let mut out = String::from("\nServiceability\n");
    let lines = service::heading_lines(r)
        .into_iter()
        .chain(std::iter::once(String::new()))
        .collect::<Vec<_>>();
    for l in lines {
        if !l.is_empty() {
            out.push_str(&wrap_text(&l, width, 2));
            out.push('\n');
        }
        if l.is_empty() {
            out.push('\n');
        }
    }
    for t in service::tables(model, r) {
        out.push_str(&text_table(&t));
    }
    let closing = std::iter::once(service::verdict_line(r)).chain(r.notes.iter().cloned());
    for l in closing {
        if !l.is_empty() {
            out.push_str(&wrap_text(&l, width, 2));
            out.push('\n');
        }
    }
    out
}

/// The "Serviceability" section as Markdown.
fn service_markdown(model: &Model, r: &crate::service::ServiceReport) -> String {
    use super::service;
    let mut out = String::from("## Serviceability\n\n");
    for l in service::heading_lines(r) {
        out.push_str(&format!("- {}\n", md_cell(&l)));
    }
    out.push('\n');
    for t in service::tables(model, r) {
        out.push_str(&md_table(&t));
    }
    out.push_str(&format!("**{}.**\n\n", service::verdict_line(r)));
    for n in &r.notes {
        out.push_str(&format!("{}\n\n", md_cell(n)));
    }
    out
}

/// A cell or line for Markdown: `|` would end a cell, `~` strike text through (case ids
/// such as `1.2D~L`) and `*` start emphasis, so each is escaped.
pub(super) fn md_cell(c: &str) -> String {
    c.replace('|', "\\|")
        .replace('~', "\\~")
        .replace('*', "\\*")
}

pub(super) fn md_table(t: &Table) -> String {
    let mut out = format!("### {}\n\n", t.title);
    out.push_str(&format!(
        "| {} |\n|{}|\n",
        t.header
            .iter()
            .map(|h| md_cell(h))
            .collect::<Vec<_>>()
            .join(" | "),
        t.header.iter().map(|_| "---").collect::<Vec<_>>().join("|")
    ));
    for r in &t.rows {
        out.push_str(&format!(
            "| {} |\n",
            r.iter().map(|c| md_cell(c)).collect::<Vec<_>>().join(" | ")
        ));
    }
    out.push('\n');
    out
}

/// The summary as a calculation-package page in Markdown.
pub fn markdown(s: &Summary) -> String {
    let mut out = format!("# {}\n\n", md_cell(&s.model.title));
    if s.has_strength() {
        out.push_str(&format!(
            "Second-order analysis and governing design moments, {} ({}).\n\n",
            s.table_line(),
            s.report.method
        ));
    } else {
        out.push_str(&format!("Serviceability check, {}.\n\n", s.table_line()));
    }
    out.push_str(&format!("> **Caution.** {CAUTION}\n\n"));
    out.push_str(&format!("{}.\n\n", s.selection.heading()));
    for r in &s.selection.remarks {
        out.push_str(&format!("- {}\n", md_cell(r)));
    }
    if !s.selection.remarks.is_empty() {
        out.push('\n');
    }
    for t in page_tables(s) {
        out.push_str(&md_table(&t));
        if t.name == "governing-cases" {
            for l in id_legend_lines(s) {
                out.push_str(&format!("{}  \n", md_cell(l.trim())));
            }
            out.push('\n');
        }
    }
    if s.has_strength() {
        for l in closing_lines(s) {
            out.push_str(&format!("- {}\n", md_cell(&l)));
        }
    }
    for w in &s.report.warnings {
        out.push_str(&format!("- Warning: {}\n", md_cell(w)));
    }
    if let Some(r) = s.service {
        out.push('\n');
        out.push_str(&service_markdown(s.model, r));
    }
    if s.has_strength() {
        out.push_str(&format!("\n{}\n", drift_note(s)));
    }
    out.push_str(&format!(
        "\n{SIGN_NOTE}\n\nCombination table: {} ({}). {}\n\n",
        s.table.source, s.table.name, s.table.caution
    ));
    out.push_str(&format!(
        "*plumbline {}; model file `{}`, SHA-256 `{}`.* {CAUTION}\n",
        env!("CARGO_PKG_VERSION"),
        s.model_file,
        s.model_sha256
    ));
    out
}

/// Write one table as CSV to `out` with the `csv` crate, ending with the caution as a
/// comment line (`#`).
pub fn write_csv(t: RowStream<'_>, out: impl std::io::Write) -> std::io::Result<()> {
    let mut w = csv::Writer::from_writer(std::io::BufWriter::with_capacity(1 << 16, out));
    w.write_record(&t.header)?;
    for r in t.rows {
        w.write_record(&r)?;
    }
    let mut out = w.into_inner().map_err(|e| e.into_error())?;
    writeln!(out, "# {CAUTION}")?;
    out.flush()
}

/// The CSV tables of a run, one file each (named `<table name>.csv`), each formed when it is
/// reached (and the per-case detail row by row), so that one is held at a time.
pub fn csv_tables<'s>(s: &'s Summary<'_>) -> impl Iterator<Item = RowStream<'s>> + 's {
    let envelope: [fn(&Summary) -> Table; 7] = [
        story_table_tidy,
        |s| member_table(s, true),
        |s| column_table(s, true),
        |s| super::handoff::axial_table(s, true),
        |s| super::handoff::shear_table(s, true),
        |s| super::handoff::reaction_table(s, true),
        |s| super::handoff::service_reaction_table(s, true),
    ];
    std::iter::once_with(move || csv_assumptions(s).into())
        .chain(envelope.into_iter().map(move |table| table(s).into()))
        .chain(
            std::iter::once_with(move || {
                super::check::detail_tables(s.model, s.report, s.case_detail)
            })
            .flatten(),
        )
        .chain(
            s.service
                .into_iter()
                .flat_map(move |r| super::service::tables(s.model, r))
                .map(RowStream::from),
        )
}

/// The assumptions table of the CSV files. They have no heading: it says which cases were
/// included.
fn csv_assumptions(s: &Summary) -> Table {
    let mut assumptions = assumptions_table(s);
    assumptions.rows.push(vec![
        "cases included".into(),
        s.selection.heading().replace("Cases included: ", ""),
        if s.selection.filter.is_some() {
            "command line (--case)".into()
        } else {
            "combination table".into()
        },
    ]);
    assumptions
}

/// The story envelope in tidy form: one row per story and figure.
pub fn story_table_tidy(s: &Summary) -> Table {
    let mut rows = Vec::new();
    for e in &s.envelope.stories {
        let figures: [(&str, &str, &Option<Peak>); 8] = [
            ("drift ratio", "max", &e.drift_ratio),
            (
                "second-order drift ratio",
                "max",
                &e.drift_ratio_second_order,
            ),
            ("B2", "max", &e.b2),
            ("Q", "max", &e.q_index),
            ("delta_s", "max", &e.delta_s),
            ("drift amplification", "max", &e.drift_amplification),
            ("alpha_cr", "min", &e.alpha_cr),
            ("sway amplifier", "max", &e.sway_amplifier),
        ];
        for (name, which, p) in figures {
            if let Some(p) = p {
                rows.push(vec![
                    e.story.to_string(),
                    name.to_string(),
                    which.to_string(),
                    num(p.value, 6),
                    p.case.clone(),
                ]);
            }
        }
        rows.push(vec![
            e.story.to_string(),
            "sway cases".into(),
            "count".into(),
            e.sway_cases.len().to_string(),
            e.sway_cases.join(" "),
        ]);
    }
    Table {
        name: "stories",
        title: "Story envelope".into(),
        header: ["story", "figure", "extreme", "value", "case"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}
