//! Reading model files: TOML text → [`raw`] structs mirroring the file (with source spans)
//! → [`validate`] (units applied, [`generate`]d frame expanded, ids resolved, geometry and
//! loads checked) → [`Model`]. The format is documented in `docs/model-file.md`.
//!
//! Every problem is a [`FileError`] naming the file, line, column and field.

// FileError carries the source text and span for rendering; errors are rare and returned
// once per file, so its size does not matter here.

pub mod generate;
pub mod raw;
pub mod select;
pub mod validate;

use std::path::Path;
use std::sync::Arc;

use crate::diag::FileError;
use crate::model::Model;

/// Parse and validate the text of a model file; `file` names it in error messages.
pub fn parse_model(text: &str, file: &str) -> Result<Model, FileError> {
    let shared: Arc<str> = Arc::from(text);
    let raw: raw::RawModel = toml::from_str(text).map_err(|e| toml_error(&e, file, &shared))?;
    validate::build(raw, file, shared)
}

/// Read and validate a model file from disk.
pub fn load_model(path: &Path) -> Result<Model, FileError> {
    let file = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| FileError {
        file: file.clone(),
        line: 0,
        column: 0,
        field: "(file)".to_string(),
        message: format!("cannot read the model file: {e}"),
        help: Some("expected a readable UTF-8 TOML file".to_string()),
        span: None,
        source_text: None,
    })?;
    parse_model(&text, &file)
}

/// A TOML syntax or type error as a located [`FileError`]; the field is the key (or table
/// header) written on the line of the error, when there is one.
fn toml_error(e: &toml::de::Error, file: &str, text: &Arc<str>) -> FileError {
    let span = e.span();
    let field = span
        .as_ref()
        .map_or_else(|| "(toml)".to_string(), |s| key_on_line(text, s.start));
    let message = e.message().trim().trim_end_matches('.').replace('\n', " ");
    FileError::at(file, text, span, field, message)
}

/// The key assigned on the line holding byte `pos` (`key = ...`), or the table header
/// (`[frame]`, `[[case.member_load]]`), or `(toml)`.
pub(crate) fn key_on_line(text: &str, pos: usize) -> String {
    let pos = text.floor_char_boundary(pos.min(text.len()));
    let start = text[..pos].rfind('\n').map_or(0, |k| k + 1);
    let line = text[start..].lines().next().unwrap_or("").trim();
    let is_key = |k: &str| {
        !k.is_empty()
            && k.chars()
                .all(|c| c.is_alphanumeric() || matches!(c, '_' | '-' | '.' | '"'))
    };
    if line.starts_with('[') {
        return line
            .trim_matches(|c| c == '[' || c == ']')
            .trim()
            .to_string();
    }
    match line.split_once('=') {
        Some((k, _)) if is_key(k.trim()) => k.trim().to_string(),
        _ => "(toml)".to_string(),
    }
}
