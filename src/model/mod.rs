//! The validated planar frame model: everything known after reading and checking the input.
//!
//! All quantities are SI base units (m, N, Pa, N·m); user units live only at the edges
//! ([`crate::units`], [`crate::input`], [`crate::report`]). Entities refer to each other by
//! index; ids are kept for messages and reports. The sign convention is documented in
//! [`loads`].

pub mod loads;
pub mod plausible;

use serde::Serialize;
use std::collections::BTreeMap;
use strum::{Display, EnumString};

pub use loads::{
    ActionCategory, LoadCase, LoadDirection, LoadLevel, LocalLoad, Measure, MemberLoad,
    MemberLoadKind, NodalLoad,
};

use crate::units::UnitSystem;

/// A joint of the frame, global coordinates in metres.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Node {
    pub id: String,
    pub x: f64,
    pub y: f64,
}

/// An elastic material.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Material {
    pub id: String,
    /// Young's modulus E, Pa.
    pub e: f64,
    /// Unit weight γ, N/m³ (for self-weight).
    pub unit_weight: Option<f64>,
}

/// What a member does in the frame; drives stiffness modifiers and story detection.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Display, EnumString)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Role {
    Column,
    Beam,
    Brace,
}

/// A cross-section.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Section {
    pub id: String,
    /// Area A, m².
    pub area: f64,
    /// Second moment of area I about the bending axis, m⁴.
    pub inertia: f64,
    /// Overall depth, m (used in reports and for ACI's minimum moment).
    pub depth: Option<f64>,
    /// Role hint; when absent the member's orientation decides (see [`Member::role`]).
    pub role: Option<Role>,
}

/// A prismatic member between two nodes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Member {
    pub id: String,
    /// Index of end i in [`Model::nodes`].
    pub i: usize,
    /// Index of end j in [`Model::nodes`].
    pub j: usize,
    /// Index into [`Model::sections`].
    pub section: usize,
    /// Index into [`Model::materials`].
    pub material: usize,
    /// Moment release (hinge) at end i.
    pub release_i: bool,
    /// Moment release (hinge) at end j.
    pub release_j: bool,
    /// Role: the section's hint, else column when the member is within 45° of vertical,
    /// beam otherwise. Resolved at validation.
    pub role: Role,
}

/// The restraint of one degree of freedom at a support.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Restraint {
    Free,
    Fixed,
    /// Elastic spring: N/m for translations, N·m/rad for the rotation.
    Spring(f64),
}

/// A support at a node: restraints of (X, Y, rotation).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Support {
    pub node: usize,
    pub dofs: [Restraint; 3],
}

/// Which second-order method `check` applies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Display, EnumString, Default)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum SecondOrderMethod {
    /// AISC 360-16 Appendix 8: B1/B2 amplified first-order analysis.
    #[default]
    #[strum(serialize = "aisc-b1b2")]
    #[serde(rename = "aisc-b1b2")]
    AiscB1B2,
    /// ACI 318-19 §6.6.4 moment magnification (Q, δs, δ).
    #[strum(serialize = "aci-magnifier")]
    #[serde(rename = "aci-magnifier")]
    AciMagnifier,
    /// EN 1993-1-1 §5.2 alpha_cr story criterion and amplified sway effects.
    #[strum(serialize = "ec3-alpha-cr")]
    #[serde(rename = "ec3-alpha-cr")]
    Ec3AlphaCr,
    /// Direct second-order elastic analysis (P-Delta and P-delta), iterated.
    #[strum(serialize = "direct")]
    #[serde(rename = "direct")]
    Direct,
}

/// Preset member stiffness reductions for the analysis.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Display, EnumString, Default)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum StiffnessPreset {
    /// Gross section properties.
    #[default]
    Gross,
    /// ACI 318-19 Table 6.6.3.1.1(a): columns 0.70 Ig, beams 0.35 Ig, area 1.0 Ag.
    AciCracked,
    /// AISC 360-16 §C2.3: 0.8 on all stiffnesses and τb on flexural stiffness of columns.
    AiscDirect,
    /// Service-level concrete: ACI 318-19 §6.6.3.2.2 permits 1.4 × the moments of inertia of
    /// Table 6.6.3.1.1(a), not above Ig (from memory): 0.98 Ig columns, 0.49 Ig beams.
    /// Only for serviceability runs.
    AciService,
}

impl StiffnessPreset {
    /// Whether the preset belongs to a serviceability analysis only.
    pub fn is_service_only(self) -> bool {
        self == StiffnessPreset::AciService
    }
}

/// How the spans of an arranged live load case (`arrange = true`) are loaded
/// ([`crate::arrange`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Display, EnumString, Default)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum LivePatterns {
    /// The worst subset of loaded spans for every enveloped quantity at every enveloped
    /// section, found from the signs of each span's first-order effect, each distinct
    /// subset run as an arrangement ([`crate::arrange::exact`]).
    #[default]
    Exact,
    /// The arrangements of ACI 318-19 §6.4.3 / EN 1992-1-1 §5.1.3 and the column patterns.
    Code,
}

/// Notional lateral loads added to every factored case where the method calls for them.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum NotionalLoads {
    /// Whatever the second-order method calls for: AISC notional loads for the AISC and
    /// direct methods, the EN 1993-1-1 sway imperfection for its method, none for ACI.
    #[default]
    Auto,
    /// None added.
    None,
    /// N_i = coefficient·α·Y_i at each level (AISC 360-16 §C2.2b, coefficient 0.002).
    Aisc { coefficient: f64 },
    /// EN 1993-1-1 §5.3.2(3)a equivalent sway imperfection φ = φ0·αh·αm applied as φ·N.
    Ec3Imperfection,
}

/// Fewest elements per member that carry P-δ: with one element the consistent geometric
/// stiffness of a member whose ends do not translate relative to each other does almost
/// nothing for its own curvature (the AISC 360-16 Commentary Case 1 mid-span moment comes
/// out about 37 % low, issue 7 item 6), so fewer are refused ([`AnalysisOptions::segments`]).
pub const MIN_SEGMENTS: usize = 2;

/// Elevations closer than this are one level, m (story levels, declared or found).
pub const LEVEL_TOLERANCE: f64 = 1e-3;

/// Analysis settings read from the model file (the command line may override them).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AnalysisOptions {
    pub method: SecondOrderMethod,
    pub stiffness: StiffnessPreset,
    /// Multipliers on I by role applied on top of the preset (1.0 = none).
    pub inertia_factor: BTreeMap<String, f64>,
    pub notional: NotionalLoads,
    /// Elements per member in the second-order and buckling analyses (P-δ capture).
    pub segments: usize,
    /// ACI 318-19 §6.6.4.4.4: βdns, ratio of sustained to total factored axial load.
    pub beta_dns: f64,
    /// How arranged live load is placed on the spans.
    pub live_patterns: LivePatterns,
    /// Where the stiffness and notional settings came from.
    pub origin: SettingOrigins,
    /// Stiffness of the serviceability analysis (`[analysis] service_stiffness`); None: the
    /// program's default ([`AnalysisOptions::service_stiffness_or_default`]).
    pub service_stiffness: Option<StiffnessPreset>,
}

/// Where an analysis setting came from, for the report's heading.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Display, Default)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum SettingOrigin {
    /// Written in the model (or set by the program that built the model).
    #[default]
    Model,
    /// Not given: what the second-order method calls for.
    MethodDefault,
    /// Given on the command line.
    CommandLine,
}

/// Where each method-dependent setting came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Default)]
pub struct SettingOrigins {
    pub stiffness: SettingOrigin,
    pub notional: SettingOrigin,
}

impl SecondOrderMethod {
    /// The stiffness the method calls for when the model does not say:
    /// * `aisc-b1b2` and `direct`: AISC 360-16 §C2.3 (0.8·τb·EI, 0.8·EA; τb = 1.0 with the
    ///   additional notional load of §C2.3(c)). App. 8 figures of the direct analysis
    ///   method use the reduced stiffness (App. 8.2, from memory);
    /// * `aci-magnifier`: ACI 318-19 Table 6.6.3.1.1(a) cracked-section moments of inertia
    ///   for the elastic analysis at factored loads (§6.6.3.1.1, from memory);
    /// * `ec3-alpha-cr`: gross section stiffness (EN 1993-1-1 §5.2 makes no reduction).
    pub fn default_stiffness(self) -> StiffnessPreset {
        match self {
            SecondOrderMethod::AiscB1B2 | SecondOrderMethod::Direct => StiffnessPreset::AiscDirect,
            SecondOrderMethod::AciMagnifier => StiffnessPreset::AciCracked,
            SecondOrderMethod::Ec3AlphaCr => StiffnessPreset::Gross,
        }
    }
}

impl AnalysisOptions {
    /// Give every setting whose origin is [`SettingOrigin::MethodDefault`] the value the
    /// method calls for ([`SecondOrderMethod::default_stiffness`]; notional loads `auto`,
    /// resolved per method by `check`). Call again after the method changes.
    pub fn apply_method_defaults(&mut self) {
        if self.origin.stiffness == SettingOrigin::MethodDefault {
            self.stiffness = self.method.default_stiffness();
        }
        if self.origin.notional == SettingOrigin::MethodDefault {
            self.notional = NotionalLoads::Auto;
        }
    }
}

impl AnalysisOptions {
    /// The stiffness of a serviceability analysis: the model's or command line's choice, else
    /// gross section properties, except under ACI 318's method (a concrete frame), where the
    /// service-level preset of ACI 318-19 §6.6.3.2.2 (1.4 × the cracked values, at most Ig,
    /// from memory) is the default.
    pub fn service_stiffness_or_default(&self) -> StiffnessPreset {
        self.service_stiffness.unwrap_or(match self.method {
            SecondOrderMethod::AciMagnifier => StiffnessPreset::AciService,
            _ => StiffnessPreset::Gross,
        })
    }
}

impl Default for AnalysisOptions {
    fn default() -> Self {
        AnalysisOptions {
            method: SecondOrderMethod::default(),
            stiffness: StiffnessPreset::default(),
            inertia_factor: BTreeMap::new(),
            notional: NotionalLoads::Auto,
            segments: 4,
            beta_dns: 0.6,
            live_patterns: LivePatterns::default(),
            origin: SettingOrigins::default(),
            service_stiffness: None,
        }
    }
}

/// Declared stories (optional; otherwise detected from column tops).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StoryDeclaration {
    /// Elevations of the story tops, m, bottom story first.
    pub levels: Vec<f64>,
}

/// Which combination table a model uses, its parameter overrides and its load-level
/// conversions, with where each was written (for located errors).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct ComboChoice {
    /// Shipped table name or path, relative to the model file.
    pub table: Option<String>,
    /// The serviceability table (`[combinations] service`), shipped name or path.
    pub service: Option<String>,
    pub params: BTreeMap<String, f64>,
    /// Conversions the engineer states between load levels (`[[combinations.convert]]`).
    pub conversions: Vec<LevelConversion>,
    /// Where the values above and the load cases were written in the model file.
    #[serde(skip)]
    pub written: ModelSpans,
}

/// A conversion between load levels stated in the model: load cases of `category` at level
/// `from` are multiplied by `factor` where a table expects level `to`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LevelConversion {
    pub category: ActionCategory,
    pub from: LoadLevel,
    pub to: LoadLevel,
    pub factor: f64,
}

/// Byte ranges in the model file of the combination settings and load cases, so that a
/// mistake found while generating factored cases points at the model's line.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ModelSpans {
    /// The model file's name as given.
    pub file: String,
    /// The model file's text (absent for models built in code).
    pub text: Option<std::sync::Arc<str>>,
    /// `[combinations] table`.
    pub table: Option<std::ops::Range<usize>>,
    /// `[combinations] service`.
    pub service: Option<std::ops::Range<usize>>,
    /// `[combinations] params.NAME`, by name.
    pub params: BTreeMap<String, std::ops::Range<usize>>,
    /// Each load case by id: its `level` key when written, else its `id`.
    pub cases: BTreeMap<String, std::ops::Range<usize>>,
    /// `[[combinations.convert]]` entries, in order.
    pub conversions: Vec<std::ops::Range<usize>>,
}

impl ModelSpans {
    /// A located error in the model file at `span` (unlocated when the model has no text).
    pub fn error(
        &self,
        span: Option<std::ops::Range<usize>>,
        field: &str,
        message: impl Into<String>,
    ) -> crate::diag::FileError {
        match &self.text {
            Some(text) => crate::diag::FileError::at(&self.file, text, span, field, message),
            None => crate::diag::FileError {
                file: self.file.clone(),
                line: 0,
                column: 0,
                field: field.to_string(),
                message: message.into(),
                help: None,
                span: None,
                source_text: None,
            },
        }
    }

    /// `file:line:column` of `span`, or the file name alone.
    pub fn place(&self, span: Option<&std::ops::Range<usize>>) -> String {
        match (&self.text, span) {
            (Some(t), Some(s)) => {
                let (l, c) = crate::diag::line_col(t, s.start);
                format!("{}:{l}:{c}", self.file)
            }
            _ => self.file.clone(),
        }
    }
}

/// A validated planar frame.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Model {
    pub title: String,
    /// The user's units, used for reporting.
    pub units: UnitSystem,
    pub nodes: Vec<Node>,
    pub materials: Vec<Material>,
    pub sections: Vec<Section>,
    pub members: Vec<Member>,
    pub supports: Vec<Support>,
    pub load_cases: Vec<LoadCase>,
    pub combos: ComboChoice,
    pub analysis: AnalysisOptions,
    pub stories: Option<StoryDeclaration>,
}

impl Model {
    /// Length of member `m`, m.
    pub fn length(&self, m: usize) -> f64 {
        let (dx, dy) = self.delta(m);
        dx.hypot(dy)
    }

    /// Projections (ΔX, ΔY) of member `m` from end i to end j, m.
    pub fn delta(&self, m: usize) -> (f64, f64) {
        let mem = &self.members[m];
        let (a, b) = (&self.nodes[mem.i], &self.nodes[mem.j]);
        (b.x - a.x, b.y - a.y)
    }

    /// Direction cosines (c, s) of member `m`.
    pub fn cosines(&self, m: usize) -> (f64, f64) {
        let (dx, dy) = self.delta(m);
        let l = dx.hypot(dy);
        (dx / l, dy / l)
    }

    /// E·A and E·I of member `m` with gross properties, N and N·m².
    pub fn gross_stiffness(&self, m: usize) -> (f64, f64) {
        let mem = &self.members[m];
        let e = self.materials[mem.material].e;
        let s = &self.sections[mem.section];
        (e * s.area, e * s.inertia)
    }

    /// Index of the node with this id.
    pub fn node_index(&self, id: &str) -> Option<usize> {
        self.nodes.iter().position(|n| n.id == id)
    }

    /// Index of the member with this id.
    pub fn member_index(&self, id: &str) -> Option<usize> {
        self.members.iter().position(|m| m.id == id)
    }

    /// Index of the load case with this id.
    pub fn case_index(&self, id: &str) -> Option<usize> {
        self.load_cases.iter().position(|c| c.id == id)
    }

    /// Member loads of load case `case` reduced to local axes, grouped by member.
    pub fn local_loads(&self, case: usize) -> Vec<Vec<LocalLoad>> {
        let mut out = vec![Vec::new(); self.members.len()];
        for ml in &self.load_cases[case].member {
            let (c, s) = self.cosines(ml.member);
            out[ml.member].push(ml.kind.to_local(c, s));
        }
        out
    }
}
