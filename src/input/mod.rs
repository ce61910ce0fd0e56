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

use crate::diag::{FileError, key_on_line};
use crate::model::Model;

/// Parse and validate the text of a model file; `file` names it in error messages.
pub fn parse_model(text: &str, file: &str) -> Result<Model, FileError> {
    let shared: Arc<str> = Arc::from(text);
    let raw: raw::RawModel = toml::from_str(text).map_err(|e| toml_error(&e, file, &shared))?;
    validate::build(raw, file, shared)
}

/// Read and validate a model file from disk (at most
/// [`MAX_FILE_BYTES`](crate::limits::MAX_FILE_BYTES), UTF-8).
pub fn load_model(path: &Path) -> Result<Model, FileError> {
    let text = crate::diag::read_input(path, "model file")?;
    parse_model(&text, &path.display().to_string())
}

/// Decode and validate the bytes of a model file, as [`load_model`] does after reading.
pub fn parse_model_bytes(bytes: &[u8], file: &str) -> Result<Model, FileError> {
    let text = crate::diag::decode_utf8(bytes.to_vec(), file)?;
    parse_model(&text, file)
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
