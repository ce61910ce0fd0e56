//! Units and values: the file being read ([`Ctx`]) turns numbers and quantity strings into
//! SI values and makes located errors; the definitions of nodes, members and supports
//! before their references are resolved. Shared by the validation and the `[frame]`
//! generator (`input/generate.rs`).

use std::ops::Range;
use std::str::FromStr;
use std::sync::Arc;

use crate::diag::{FileError, line_col};
use crate::input::raw::{Num, S};
use crate::model::Restraint;
use crate::units::{Dimension, UnitSystem, parse_quantity};

/// The file being read, its text and its unit system: makes located errors and converts
/// numbers to SI.
pub struct Ctx {
    pub file: String,
    pub text: Arc<str>,
    pub units: UnitSystem,
}

/// A reference to an id, where it was written and under which field name.
#[derive(Debug, Clone)]
pub struct Ref {
    pub id: String,
    pub span: Range<usize>,
    pub field: String,
}

/// A node before validation, SI coordinates.
#[derive(Debug, Clone)]
pub struct NodeDef {
    pub at: Ref,
    pub x: f64,
    pub y: f64,
    /// Where `x` and `y` were written, with their field names (explicit nodes only; a
    /// generated node's coordinates come from the grid).
    pub written: Option<[(Range<usize>, String); 2]>,
}

/// A member before its references are resolved.
#[derive(Debug, Clone)]
pub struct MemberDef {
    pub at: Ref,
    pub i: Ref,
    pub j: Ref,
    pub section: Ref,
    pub material: Ref,
    /// Moment releases at end i and end j.
    pub release: [bool; 2],
}

/// A support before its node is resolved.
#[derive(Debug, Clone)]
pub struct SupportDef {
    pub node: Ref,
    pub dofs: [Restraint; 3],
}

impl Ctx {
    /// A located error at byte range `span`.
    pub fn err(&self, span: Range<usize>, field: &str, message: impl Into<String>) -> FileError {
        FileError::at(&self.file, &self.text, Some(span), field, message)
    }

    /// Line number of byte offset `pos`, for "first defined at line n" messages.
    pub fn line(&self, pos: usize) -> usize {
        line_col(&self.text, pos).0
    }

    /// A value of dimension `dim` in SI: a bare number in the model's units or a quantity
    /// string with its own units; NaN and infinities are rejected.
    pub fn quantity(&self, v: &S<Num>, dim: Dimension, field: &str) -> Result<f64, FileError> {
        let si = match v.get_ref() {
            Num::Bare(x) => self.units.to_si(*x, dim),
            Num::Text(t) => {
                parse_quantity(t, dim).map_err(|e| self.err(v.span(), field, e.to_string()))?
            }
        };
        if !si.is_finite() {
            return Err(self.err(
                v.span(),
                field,
                format!("expected a finite number, got {si}"),
            ));
        }
        Ok(si)
    }

    /// A strictly positive value of dimension `dim`, SI.
    pub fn positive(&self, v: &S<Num>, dim: Dimension, field: &str) -> Result<f64, FileError> {
        let si = self.quantity(v, dim, field)?;
        if si <= 0.0 {
            return Err(self.err(
                v.span(),
                field,
                format!(
                    "expected {} greater than zero, got {}",
                    dim.describe(),
                    self.show(si, dim)
                ),
            ));
        }
        Ok(si)
    }

    /// An SI value in the model's units for messages, e.g. `6.5 m`.
    pub fn show(&self, si: f64, dim: Dimension) -> String {
        let v = self.units.from_si(si, dim);
        let mut s = format!("{v:.4}");
        if s.contains('.') {
            s = s.trim_end_matches('0').trim_end_matches('.').to_string();
        }
        format!("{s} {}", self.units.label(dim))
            .trim_end()
            .to_string()
    }

    /// A name parsed into an enum with `FromStr`, or an error listing the accepted names.
    pub fn choice<T: FromStr>(
        &self,
        v: &S<String>,
        field: &str,
        names: &[&str],
    ) -> Result<T, FileError> {
        let listed = names.contains(&v.get_ref().as_str());
        T::from_str(v.get_ref())
            .ok()
            .filter(|_| listed)
            .ok_or_else(|| {
                self.err(
                    v.span(),
                    field,
                    format!(
                        "expected one of {}, got \"{}\"",
                        names.join(", "),
                        v.get_ref()
                    ),
                )
            })
    }
}
