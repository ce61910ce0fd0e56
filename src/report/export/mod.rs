//! Output formats as exporters: one type per format ([`Text`], [`Csv`], [`Json`],
//! [`Markdown`], [`Html`]), each implementing [`Exporter`] for the documents it has a form
//! of, and the registry that finds a format's exporter by name ([`exporter`], [`FORMATS`]).
//! A document a format has no form of is refused with [`ExportError::Unsupported`].
//!
//! Adding a format: a new file here with one type implementing [`Exporter`], and one line in
//! [`FORMATS`]; a command offers it when its format list (`OutputFormat`, `CheckFormat`,
//! `CompareFormat`) names it.

mod csv;
mod exporter;
mod html;
mod json;
mod markdown;
mod registry;
mod text;

pub use csv::Csv;
pub use exporter::{
    CasesView, CheckView, CompareView, Document, ExportError, Exporter, Memory, Sink, SolveView,
    unsupported, whole,
};
pub use html::Html;
pub use json::Json;
pub use markdown::Markdown;
pub use registry::{
    FORMATS, cases_report, cases_report_with, exporter, offered, render_compare, render_expansion,
    render_solve, to_memory,
};
pub use text::Text;
