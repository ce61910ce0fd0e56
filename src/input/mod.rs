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

/// The name of a table header line, without its trailing comment: `frame` for `[frame]`,
/// and with 1-based indices for arrays of tables, counted over the text `before` it:
/// `section[2]` for the second `[[section]]`, `case[3].member_load[1]` for the first
/// `[[case.member_load]]` of the third `[[case]]`.
fn header_path(before: &str, line: &str) -> String {
    let name = |l: &str| -> Option<(bool, String)> {
        let l = l.split('#').next().unwrap_or("").trim();
        let array = l.starts_with("[[");
        let inner = l
            .strip_prefix('[')?
            .split(']')
            .next()?
            .trim_start_matches('[');
        let parts: Vec<&str> = inner
            .split('.')
            .map(|p| p.trim().trim_matches('"'))
            .collect();
        Some((array, parts.join(".")))
    };
    let Some((array, path)) = name(line) else {
        return "(toml)".to_string();
    };
    if !array {
        return path;
    }
    // Count the array-of-tables headers before this one; a header resets the counts of the
    // tables nested under it.
    let mut counts: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    let mut bump = |p: &str| {
        *counts.entry(p.to_string()).or_default() += 1;
        let nested = format!("{p}.");
        counts.retain(|k, _| !k.starts_with(&nested));
    };
    for l in before.lines().filter(|l| l.trim_start().starts_with("[[")) {
        if let Some((true, p)) = name(l) {
            bump(&p);
        }
    }
    bump(&path);
    let parts: Vec<&str> = path.split('.').collect();
    (1..=parts.len())
        .map(|n| {
            let prefix = parts[..n].join(".");
            match counts.get(&prefix) {
                Some(c) => format!("{}[{c}]", parts[n - 1]),
                None => parts[n - 1].to_string(),
            }
        })
        .collect::<Vec<_>>()
        .join(".")
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
        return header_path(&text[..start], line);
    }
    match line.split_once('=') {
        Some((k, _)) if is_key(k.trim()) => k.trim().to_string(),
        _ => "(toml)".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_headers_name_their_index_not_their_comment() {
        let t = "[[section]]\nid = \"a\"\n[[section]]  # illustrative\n";
        let pos = t.rfind("[[").unwrap();
        assert_eq!(key_on_line(t, pos), "section[2]");
        let t = "[[case]]\n[[case.member_load]]\n[[case]]\n[[case.member_load]] # x\n";
        let pos = t.rfind("[[").unwrap();
        assert_eq!(key_on_line(t, pos), "case[2].member_load[1]");
        assert_eq!(key_on_line("[frame] # generated\n", 0), "frame");
    }
}
