//! Units and settings: the unit system, the `[combinations]` choice and the `[analysis]`
//! options, each name checked against the accepted names.

use std::collections::BTreeMap;
use std::ops::Range;
use std::str::FromStr;
use std::sync::Arc;

use strum::IntoEnumIterator;

use super::values::Ctx;
use crate::diag::FileError;
use crate::input::raw::{RawAnalysis, RawCombinations, S};
use crate::model::{
    ActionCategory, AnalysisOptions, ComboChoice, LevelConversion, LivePatterns, LoadLevel,
    ModelSpans, NotionalLoads, Role, SecondOrderMethod, SettingOrigin, StiffnessPreset,
    StoryDeclaration,
};
use crate::units::{Dimension, UnitSystem};

/// Names accepted for [`SecondOrderMethod`] (kebab-case, as the enum parses them).
pub const METHOD_NAMES: [&str; 4] = ["aisc-b1b2", "aci-magnifier", "ec3-alpha-cr", "direct"];

/// Names accepted for [`StiffnessPreset`].
pub const STIFFNESS_NAMES: [&str; 3] = ["gross", "aci-cracked", "aisc-direct"];

/// The stiffness presets of a serviceability analysis.
pub const SERVICE_STIFFNESS_NAMES: [&str; 2] = ["gross", "aci-service"];

/// Names accepted for [`Role`].
pub const ROLE_NAMES: [&str; 3] = ["column", "beam", "brace"];

/// Names accepted for [`LoadDirection`](crate::model::LoadDirection).
pub const DIRECTION_NAMES: [&str; 5] = ["local-x", "local-y", "global-x", "global-y", "down"];

/// AISC 360-16 §C2.2b(1): notional load Ni = 0.002·α·Yi; the default coefficient.
pub const AISC_NOTIONAL_COEFFICIENT: f64 = 0.002;

/// The unit system from the `units` key: a preset name or a table with `preset` and
/// per-dimension overrides.
pub(super) fn unit_system(
    file: &str,
    text: &Arc<str>,
    raw: Option<&S<toml::Value>>,
) -> Result<UnitSystem, FileError> {
    let err = |span: Range<usize>, msg: String| FileError::at(file, text, Some(span), "units", msg);
    let presets = crate::units::PRESET_NAMES.join(", ");
    let Some(v) = raw else {
        return Err(err(
            0..0,
            format!("missing units: expected e.g. units = \"kN-m\" (one of {presets})"),
        ));
    };
    let span = v.span();
    match v.get_ref() {
        toml::Value::String(name) => UnitSystem::preset(name).map_err(|e| err(span, e.to_string())),
        toml::Value::Table(t) => {
            let Some(toml::Value::String(name)) = t.get("preset") else {
                return Err(err(
                    span,
                    format!("expected a `preset` name in the units table (one of {presets})"),
                ));
            };
            let mut sys = UnitSystem::preset(name).map_err(|e| err(span.clone(), e.to_string()))?;
            for (slot, unit) in t.iter().filter(|(k, _)| k.as_str() != "preset") {
                let toml::Value::String(unit) = unit else {
                    return Err(err(
                        span,
                        format!("expected a unit name for units.{slot}, e.g. \"mm\""),
                    ));
                };
                sys.set_unit(slot, unit)
                    .map_err(|e| err(span.clone(), format!("units.{slot}: {e}")))?;
            }
            Ok(sys)
        }
        _ => Err(err(
            span,
            format!("expected a unit system name (one of {presets}) or a table"),
        )),
    }
}

pub(super) fn combinations(
    ctx: &Ctx,
    raw: Option<&S<RawCombinations>>,
) -> Result<ComboChoice, FileError> {
    let mut written = ModelSpans {
        file: ctx.file.clone(),
        text: Some(ctx.text.clone()),
        ..ModelSpans::default()
    };
    let Some(c) = raw else {
        return Ok(ComboChoice {
            written,
            ..ComboChoice::default()
        });
    };
    let c = c.get_ref();
    let mut params = BTreeMap::new();
    for (name, v) in &c.params {
        params.insert(
            name.clone(),
            ctx.quantity(
                v,
                Dimension::Dimensionless,
                &format!("combinations.params.{name}"),
            )?,
        );
        written.params.insert(name.clone(), v.span());
    }
    let categories: Vec<&'static str> = ActionCategory::iter().map(|a| a.into()).collect();
    let levels: Vec<&'static str> = LoadLevel::iter().map(|a| a.into()).collect();
    let mut conversions = Vec::new();
    for (k, cv) in c.convert.iter().enumerate() {
        let field = |name: &str| format!("combinations.convert[{}].{name}", k + 1);
        let r = cv.get_ref();
        let category =
            ctx.choice::<ActionCategory>(&r.category, &field("category"), &categories)?;
        if !category.has_levels() {
            return Err(ctx.err(
                r.category.span(),
                &field("category"),
                format!(
                    "{category} loads have no levels to convert: expected wind, snow or seismic"
                ),
            ));
        }
        let from = ctx.choice::<LoadLevel>(&r.from, &field("from"), &levels)?;
        let to = ctx.choice::<LoadLevel>(&r.to, &field("to"), &levels)?;
        let factor = ctx.positive(&r.factor, Dimension::Dimensionless, &field("factor"))?;
        conversions.push(LevelConversion {
            category,
            from,
            to,
            factor,
        });
        written.conversions.push(cv.span());
    }
    written.table = c.table.as_ref().map(|t| t.span());
    written.service = c.service.as_ref().map(|t| t.span());
    Ok(ComboChoice {
        table: c.table.as_ref().map(|t| t.get_ref().clone()),
        service: c.service.as_ref().map(|t| t.get_ref().clone()),
        params,
        conversions,
        written,
    })
}

pub(super) fn analysis(
    ctx: &Ctx,
    raw: Option<&S<RawAnalysis>>,
) -> Result<(AnalysisOptions, Option<StoryDeclaration>), FileError> {
    let mut out = AnalysisOptions::default();
    // Settings the model does not give follow the method (issue 7 item 8).
    out.origin.stiffness = SettingOrigin::MethodDefault;
    out.origin.notional = SettingOrigin::MethodDefault;
    let Some(a) = raw else {
        out.apply_method_defaults();
        return Ok((out, None));
    };
    let a = a.get_ref();
    if let Some(m) = &a.method {
        out.method = ctx.choice::<SecondOrderMethod>(m, "analysis.method", &METHOD_NAMES)?;
    }
    if let Some(s) = a.stiffness.as_ref().filter(|s| s.get_ref() != "auto") {
        out.stiffness = ctx.choice::<StiffnessPreset>(s, "analysis.stiffness", &STIFFNESS_NAMES)?;
        out.origin.stiffness = SettingOrigin::Model;
    }
    if let Some(s) = &a.service_stiffness {
        out.service_stiffness = Some(ctx.choice::<StiffnessPreset>(
            s,
            "analysis.service_stiffness",
            &SERVICE_STIFFNESS_NAMES,
        )?);
    }
    for (role, v) in &a.inertia_factor {
        let field = format!("analysis.inertia_factor.{role}");
        if Role::from_str(role).is_err() {
            return Err(ctx.err(
                v.span(),
                &field,
                format!(
                    "expected a role ({}), got \"{role}\"",
                    ROLE_NAMES.join(", ")
                ),
            ));
        }
        out.inertia_factor.insert(
            role.clone(),
            ctx.positive(v, Dimension::Dimensionless, &field)?,
        );
    }
    let coefficient = match &a.notional_coefficient {
        Some(v) => Some((
            v,
            ctx.positive(v, Dimension::Dimensionless, "analysis.notional_coefficient")?,
        )),
        None => None,
    };
    if let Some(n) = &a.notional {
        if n.get_ref() != "auto" {
            out.origin.notional = SettingOrigin::Model;
        }
        out.notional = match n.get_ref().as_str() {
            "auto" => NotionalLoads::Auto,
            "none" => NotionalLoads::None,
            "aisc" => NotionalLoads::Aisc {
                coefficient: coefficient.map_or(AISC_NOTIONAL_COEFFICIENT, |c| c.1),
            },
            "ec3-imperfection" => NotionalLoads::Ec3Imperfection,
            other => {
                return Err(ctx.err(
                    n.span(),
                    "analysis.notional",
                    format!("expected one of auto, none, aisc, ec3-imperfection, got \"{other}\""),
                ));
            }
        };
    }
    if let (Some((v, _)), false) = (
        coefficient,
        matches!(out.notional, NotionalLoads::Aisc { .. }),
    ) {
        return Err(ctx.err(
            v.span(),
            "analysis.notional_coefficient",
            "a coefficient applies only with notional = \"aisc\"",
        ));
    }
    if let Some(s) = &a.segments {
        // Fewer than 2 elements per member lose P-δ (issue 7 item 6): refused.
        let min = crate::model::MIN_SEGMENTS as i64;
        if *s.get_ref() < min || *s.get_ref() > 1000 {
            return Err(ctx.err(
                s.span(),
                "analysis.segments",
                format!(
                    "expected an integer from {min} to 1000, got {}: with fewer than {min} \
                     elements per member the second-order analysis loses the P-δ effect of \
                     each member's own curvature",
                    s.get_ref()
                ),
            ));
        }
        out.segments = *s.get_ref() as usize;
    }
    if let Some(b) = &a.beta_dns {
        let v = ctx.quantity(b, Dimension::Dimensionless, "analysis.beta_dns")?;
        if !(0.0..=1.0).contains(&v) {
            return Err(ctx.err(
                b.span(),
                "analysis.beta_dns",
                format!("expected a ratio from 0 to 1, got {v}"),
            ));
        }
        out.beta_dns = v;
    }
    if let Some(p) = &a.live_patterns {
        out.live_patterns =
            ctx.choice::<LivePatterns>(p, "analysis.live_patterns", &["exact", "code"])?;
    }
    out.apply_method_defaults();
    let stories = match &a.story_levels {
        None => None,
        Some(list) => {
            let mut levels = Vec::new();
            for (k, v) in list.get_ref().iter().enumerate() {
                let field = format!("analysis.story_levels[{}]", k + 1);
                let y = ctx.quantity(v, Dimension::Length, &field)?;
                if levels.last().is_some_and(|&prev| y <= prev) {
                    return Err(ctx.err(
                        v.span(),
                        &field,
                        "expected story levels in increasing order, bottom up",
                    ));
                }
                levels.push(y);
            }
            if levels.is_empty() {
                return Err(ctx.err(
                    list.span(),
                    "analysis.story_levels",
                    "expected at least one level",
                ));
            }
            Some(StoryDeclaration { levels })
        }
    };
    Ok((out, stories))
}
