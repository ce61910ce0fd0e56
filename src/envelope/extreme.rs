//! The vocabulary shared by the moment envelope (`envelope.rs`) and the handoff envelopes
//! (`envelope/handoff.rs`): where along a member a value acts, and how a running extreme
//! is kept.

use serde::{Deserialize, Serialize};

/// Where along a member a moment acts.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize, strum::Display,
)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Location {
    /// End i.
    EndI,
    /// Within the span.
    Span,
    /// End j.
    EndJ,
}

/// Replace `slot` by `candidate` when it is empty or `better(candidate, current)`.
pub(crate) fn keep<T>(slot: &mut Option<T>, candidate: T, better: impl Fn(&T, &T) -> bool) {
    match slot {
        Some(cur) if !better(&candidate, cur) => {}
        _ => *slot = Some(candidate),
    }
}
