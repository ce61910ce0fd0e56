//! The model file as written: serde structs that mirror the TOML exactly, with the source
//! span of every value kept for messages. Nothing here is checked beyond TOML types and
//! unknown keys; [`super::validate`] turns a [`RawModel`] into a [`crate::model::Model`].

use serde::Deserialize;
use serde::de::{self, Deserializer, SeqAccess, Visitor};
use std::collections::BTreeMap;
use std::fmt;
use toml::Spanned;

/// A number as written: a bare number in the model's units, or a quantity string.
#[derive(Debug, Clone, PartialEq)]
pub enum Num {
    Bare(f64),
    Text(String),
}

impl<'de> Deserialize<'de> for Num {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Num, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = Num;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a number or a quantity string such as \"12 kN/m\"")
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<Num, E> {
                Ok(Num::Bare(v as f64))
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<Num, E> {
                Ok(Num::Bare(v as f64))
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<Num, E> {
                Ok(Num::Bare(v))
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<Num, E> {
                Ok(Num::Text(v.to_string()))
            }
        }
        d.deserialize_any(V)
    }
}

/// One id pattern or a list of them (`"B*.2"` or `["B1.2", "B2.2"]`).
#[derive(Debug, Clone, PartialEq)]
pub struct Patterns(pub Vec<String>);

impl<'de> Deserialize<'de> for Patterns {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Patterns, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = Patterns;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("an id, an id pattern such as \"B*.2\", or a list of them")
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<Patterns, E> {
                Ok(Patterns(vec![v.to_string()]))
            }
            fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Patterns, A::Error> {
                let mut out = Vec::new();
                while let Some(s) = seq.next_element::<String>()? {
                    out.push(s);
                }
                Ok(Patterns(out))
            }
        }
        d.deserialize_any(V)
    }
}

pub type S<T> = Spanned<T>;

/// The whole model file.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawModel {
    pub title: Option<S<String>>,
    /// A preset name or a table `{ preset = "...", length = "...", ... }`.
    pub units: Option<S<toml::Value>>,
    #[serde(default)]
    pub material: Vec<S<RawMaterial>>,
    #[serde(default)]
    pub section: Vec<S<RawSection>>,
    pub frame: Option<S<RawFrame>>,
    #[serde(default)]
    pub node: Vec<S<RawNode>>,
    #[serde(default)]
    pub member: Vec<S<RawMember>>,
    #[serde(default)]
    pub support: Vec<S<RawSupport>>,
    #[serde(default)]
    pub case: Vec<S<RawCase>>,
    pub combinations: Option<S<RawCombinations>>,
    pub analysis: Option<S<RawAnalysis>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMaterial {
    pub id: S<String>,
    #[serde(rename = "E")]
    pub e: S<Num>,
    pub unit_weight: Option<S<Num>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawSection {
    pub id: S<String>,
    #[serde(rename = "A")]
    pub a: S<Num>,
    #[serde(rename = "I")]
    pub i: S<Num>,
    pub depth: Option<S<Num>>,
    pub role: Option<S<String>>,
}

/// The regular-frame generator.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawFrame {
    /// Bay widths, left to right.
    pub bays: S<Vec<S<Num>>>,
    /// Story heights, bottom up.
    pub stories: S<Vec<S<Num>>>,
    /// `fixed` or `pinned`.
    pub base: S<String>,
    pub material: S<String>,
    /// Column section per story (one entry: every story).
    pub columns: S<Vec<S<String>>>,
    /// Beam section per level (one entry: every level).
    pub beams: S<Vec<S<String>>>,
    /// Coordinates of node N1.0, default (0, 0).
    pub origin: Option<S<Vec<S<Num>>>>,
    /// Column section per story on the two outer grid lines, in place of `columns`.
    pub exterior_columns: Option<S<Vec<S<String>>>>,
    /// Column section per story on the inner grid lines, in place of `columns`.
    pub interior_columns: Option<S<Vec<S<String>>>>,
    /// Grid lines (from 1) whose columns are hinged at both ends (leaning columns).
    pub hinged_columns: Option<S<Vec<S<i64>>>>,
    /// Grid lines (from 1) where the ends of the beams framing into them are hinged.
    pub beam_hinges: Option<S<Vec<S<i64>>>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawNode {
    pub id: S<String>,
    pub x: S<Num>,
    pub y: S<Num>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMember {
    pub id: S<String>,
    pub i: S<String>,
    pub j: S<String>,
    pub section: S<String>,
    pub material: S<String>,
    /// `none`, `i`, `j` or `both`.
    pub hinge: Option<S<String>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawSupport {
    pub node: S<String>,
    /// `fixed`, `pinned`, `roller-x`, `roller-y` or `free`.
    #[serde(rename = "type")]
    pub kind: Option<S<String>>,
    pub kx: Option<S<Num>>,
    pub ky: Option<S<Num>>,
    pub kr: Option<S<Num>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCase {
    pub id: S<String>,
    #[serde(default)]
    pub description: Option<S<String>>,
    pub category: S<String>,
    pub alternative: Option<S<String>>,
    /// `strength`, `nominal`, `characteristic`, `specified` or `ultimate` (wind, snow and
    /// seismic cases only).
    pub level: Option<S<String>>,
    /// Also act with every load reversed.
    pub reverse: Option<S<bool>>,
    pub self_weight: Option<S<bool>>,
    /// Place this live load in the arrangements of alternate and adjacent spans.
    pub arrange: Option<S<bool>>,
    #[serde(default)]
    pub node_load: Vec<S<RawNodeLoad>>,
    #[serde(default)]
    pub member_load: Vec<S<RawMemberLoad>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawNodeLoad {
    #[serde(alias = "node")]
    pub nodes: S<Patterns>,
    pub fx: Option<S<Num>>,
    pub fy: Option<S<Num>>,
    pub mz: Option<S<Num>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMemberLoad {
    #[serde(alias = "member")]
    pub members: S<Patterns>,
    /// `uniform`, `linear`, `point` or `moment`.
    pub kind: S<String>,
    pub direction: Option<S<String>>,
    /// `member` (default) or `projection`.
    pub spread_over: Option<S<String>>,
    /// The former name of `spread_over`: read only to say what to write instead.
    pub measure: Option<S<String>>,
    pub w: Option<S<Num>>,
    pub w_from: Option<S<Num>>,
    pub w_to: Option<S<Num>>,
    pub p: Option<S<Num>>,
    pub m: Option<S<Num>>,
    pub from: Option<S<Num>>,
    pub to: Option<S<Num>>,
    pub at: Option<S<Num>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCombinations {
    pub table: Option<S<String>>,
    /// The serviceability table of the run, beside the strength `table`.
    pub service: Option<S<String>>,
    #[serde(default)]
    pub params: BTreeMap<String, S<Num>>,
    #[serde(default)]
    pub convert: Vec<S<RawConvert>>,
}

/// `[[combinations.convert]]`: load cases of `category` at level `from` are multiplied by
/// `factor` where a table expects level `to`.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawConvert {
    pub category: S<String>,
    pub from: S<String>,
    pub to: S<String>,
    pub factor: S<Num>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawAnalysis {
    pub method: Option<S<String>>,
    pub stiffness: Option<S<String>>,
    /// Stiffness of the serviceability analysis: `gross` or `aci-service`.
    pub service_stiffness: Option<S<String>>,
    #[serde(default)]
    pub inertia_factor: BTreeMap<String, S<Num>>,
    /// `none`, `aisc` or `ec3-imperfection`.
    pub notional: Option<S<String>>,
    pub notional_coefficient: Option<S<Num>>,
    pub segments: Option<S<i64>>,
    pub beta_dns: Option<S<Num>>,
    /// `exact` or `code`: how arranged live load is placed on the spans.
    pub live_patterns: Option<S<String>>,
    /// Elevations of the story tops, bottom story first.
    pub story_levels: Option<S<Vec<S<Num>>>>,
}
