//! The error of every command ([`AppError`]), its exit status ([`exit`]) and the model's
//! plausibility warnings.

use std::path::Path;

use crate::check::CheckError;
use crate::diag::FileError;
use crate::input::load_model;
use crate::model::Model;
use crate::report::export::ExportError;
use crate::solve::SystemError;

/// Why a command failed; rendered for people by `miette` at the edge.
#[derive(Debug, thiserror::Error, miette::Diagnostic)]
pub enum AppError {
    /// An error located in an input file.
    #[error(transparent)]
    #[diagnostic(transparent)]
    File(Box<FileError>),
    /// The frame could not be analysed. The cause is part of the message, not a source, so
    /// that it is printed once; `note` adds what the model's properties suggest.
    #[error("{file}: {error}{note}")]
    Analysis {
        file: String,
        error: CheckError,
        note: String,
    },
    /// A command-line value is wrong.
    #[error("{0}")]
    #[diagnostic(help("see `plumbline help` for the command's options"))]
    Usage(String),
    /// An output file could not be written.
    #[error("could not write {path}: {source}")]
    Write {
        path: String,
        #[source]
        source: std::io::Error,
    },
}

impl From<FileError> for AppError {
    fn from(e: FileError) -> Self {
        AppError::File(Box::new(e))
    }
}

impl From<ExportError> for AppError {
    /// A part that could not be written is a write error; a format that has no form of the
    /// document, or no format of that name, is a wrong command line.
    fn from(e: ExportError) -> Self {
        match e {
            ExportError::Write { path, source } => AppError::Write { path, source },
            other => AppError::Usage(other.to_string()),
        }
    }
}

/// An analysis error of `model`, read from `path`. A mechanism says whether members with
/// implausible properties sit at the nodes found free to move (a unit slip makes pivots
/// vanish as surely as a missing support does).
pub(super) fn analysis(model: &Model, path: &Path, e: impl Into<CheckError>) -> AppError {
    let error = e.into();
    let note = match &error {
        CheckError::System(SystemError::Mechanism(free)) => {
            let nodes: Vec<usize> = free.iter().map(|f| f.node).collect();
            crate::model::plausible::mechanism_note(model, &nodes)
        }
        _ => String::new(),
    };
    AppError::Analysis {
        file: path.display().to_string(),
        error,
        note,
    }
}

/// Warnings on the model file at `path` that do not stop a command: members whose
/// properties look like a unit slip, each prefixed with the file name. Empty when the file
/// cannot be read (the command itself then reports why).
pub fn model_warnings(path: &Path) -> Vec<String> {
    let Ok(model) = load_model(path) else {
        return Vec::new();
    };
    crate::model::plausible::implausible_members(&model)
        .into_iter()
        .map(|w| format!("{}: {}", path.display(), w.message))
        .collect()
}

/// Exit status of the program (documented in docs/commands.md, "Exit status").
pub mod exit {
    /// The command ran and every factored case is stable.
    pub const OK: u8 = 0;
    /// The command failed: bad input (file, line and field named), an analysis that could
    /// not run, or an output that could not be written. Nothing was written.
    pub const FAILED: u8 = 1;
    /// The command line itself is wrong (unknown option, missing argument, bad value).
    pub const USAGE: u8 = 2;
    /// `check` ran and wrote its report, but at least one factored case is unstable.
    pub const UNSTABLE: u8 = 3;
}
