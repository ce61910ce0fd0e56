//! `plumbline new`: a commented starter model.

use std::path::Path;

use super::error::AppError;
use crate::report::starter::NewArgs;

/// `plumbline new FILE --bays … --stories …`: a commented starter model of a regular frame,
/// refused when `file` exists. The text is checked by reading it back as a model.
pub fn new_model(file: &Path, args: &NewArgs) -> Result<String, AppError> {
    if file.exists() {
        return Err(AppError::Usage(format!(
            "{} exists; `plumbline new` does not overwrite a file",
            file.display()
        )));
    }
    for (name, list) in [("--bays", &args.bays), ("--stories", &args.stories)] {
        if list.is_empty() || list.iter().any(|v| !v.is_finite() || *v <= 0.0) {
            return Err(AppError::Usage(format!(
                "{name}: expected positive lengths separated by commas, got {list:?}"
            )));
        }
    }
    let text = crate::report::starter::starter_model(args);
    crate::input::parse_model(&text, &file.display().to_string())?;
    Ok(text)
}
