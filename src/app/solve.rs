//! `plumbline solve`: one load case, first order.

use std::path::Path;

use super::error::{AppError, analysis};
use super::output::Rendered;
use crate::input::load_model;
use crate::report::OutputFormat;
use crate::solve::SystemError;

/// `plumbline solve MODEL --case ID`: the first-order solution of one load case, with
/// gross section properties (a load case is a service load: the strength method's reduced
/// stiffness does not apply).
pub fn solve(model_path: &Path, case: &str, format: OutputFormat) -> Result<Rendered, AppError> {
    solve_with(model_path, case, "gross", format)
}

/// [`solve`] with the member stiffness preset `stiffness` (`--stiffness`).
pub fn solve_with(
    model_path: &Path,
    case: &str,
    stiffness: &str,
    format: OutputFormat,
) -> Result<Rendered, AppError> {
    use std::str::FromStr;
    let mut model = load_model(model_path)?;
    model.analysis.stiffness = crate::model::StiffnessPreset::from_str(stiffness).map_err(|_| {
        AppError::Usage(format!(
            "--stiffness: expected gross, aci-cracked, aisc-direct or aci-service, got \"{stiffness}\""
        ))
    })?;
    let k = model.case_index(case).ok_or_else(|| {
        let ids: Vec<&str> = model.load_cases.iter().map(|c| c.id.as_str()).collect();
        AppError::Usage(format!(
            "{}: no load case \"{case}\"; the model has: {}",
            model_path.display(),
            ids.join(", ")
        ))
    })?;
    let solution = crate::solve::solve_case(&model, k)
        .map_err(|e: SystemError| analysis(&model, model_path, e))?;
    Ok(Rendered {
        files: crate::report::export::render_solve(&model, k, &solution, format),
    })
}
