//! plumbline: factored load combinations, no-sway/sway frame analysis and second-order
//! amplification for planar building frames.
//!
//! Data flow, one module per stage:
//! [`input`] (model file) → [`model`] (validated frame and load cases) → [`combos`]
//! (factored cases from a combination table) → [`arrange`] (live-load arrangements over the
//! [`spans`]) → [`solve`] (first-order, no-sway/sway, second-order and buckling solutions)
//! → [`check`] (amplification and story classification) → [`approx`] (approximate
//! hand-method check, on request) → [`envelope`] (governing moments over the cases) →
//! [`report`] (the documents, written by one exporter per format: text, Markdown, CSV, JSON,
//! HTML) → [`app`] (the commands).
//!
//! Results assist a licensed engineer; local codes and the adopted edition of each
//! standard govern.
//!
//! # Using plumbline as a library
//!
//! The stable entry points live in [`api`] and are re-exported here: [`read_model`] and
//! [`FrameBuilder`] give a [`Model`] (SI inside), [`Check`] chooses the combination table,
//! the second-order method and table parameters and runs the check, and [`Outcome`] holds
//! the [`Envelope`] (member moments, axial force, shear, reactions, story figures), the
//! story verdicts and the caution. `docs/library.md` lists which items are stable.
//!
//! An invented portal frame built in code, checked under the ASCE/SEI 7-16 strength
//! combinations with the AISC 360-16 Appendix 8 method:
//!
//! ```
//! use plumbline::{ActionCategory, Check, FrameBuilder, LoadLevel, SecondOrderMethod};
//!
//! // Illustrative section values, SI: E in Pa, A in m², I in m⁴, loads in N and N/m.
//! let mut frame = FrameBuilder::new("Invented portal, 9 m bay");
//! frame
//!     .material("steel", 200e9)
//!     .section("column", 7.6e-3, 1.2e-4)
//!     .section("rafter", 8.5e-3, 2.1e-4)
//!     .node("A", 0.0, 0.0)
//!     .node("B", 0.0, 4.5)
//!     .node("C", 9.0, 4.5)
//!     .node("D", 9.0, 0.0)
//!     .member("C1", "A", "B", "steel", "column")
//!     .member("R1", "B", "C", "steel", "rafter")
//!     .member("C2", "D", "C", "steel", "column")
//!     .fixed("A")
//!     .fixed("D")
//!     .case("D", ActionCategory::Dead)
//!     .line_load("D", "R1", 10e3)
//!     .case("Lr", ActionCategory::RoofLive)
//!     .line_load("Lr", "R1", 6e3)
//!     .case("W", ActionCategory::Wind)
//!     .level("W", LoadLevel::Strength)
//!     .reversible("W")
//!     .node_load("W", "B", 20e3, 0.0);
//! let model = frame.build()?;
//!
//! let outcome = Check::new(&model)
//!     .table("asce7-16-strength")
//!     .method(SecondOrderMethod::AiscB1B2)
//!     .run()?;
//! println!("member  governing moment (kN·m)  case");
//! for g in outcome.governing() {
//!     println!("{:<7} {:>24.1}  {}", g.member, g.moment / 1e3, g.case);
//! }
//! for (story, verdict) in outcome.story_verdicts().iter().enumerate() {
//!     println!("story {}: {verdict}", story + 1);
//! }
//! println!("{}", outcome.caution());
//! assert_eq!(outcome.governing().len(), 3);
//! # Ok::<(), plumbline::Error>(())
//! ```

// Input errors carry their file, span and source text for rendering; they are returned
// once per run, so their size does not matter.
#![allow(clippy::result_large_err)]

pub mod caution;
pub use caution::CAUTION;

pub mod api;
pub mod app;
pub mod approx;
pub mod arrange;
pub mod check;
pub mod combos;
pub mod compare;
pub mod diag;
pub mod envelope;
#[doc(hidden)]
pub mod fuzzing;
pub mod input;
pub mod limits;
pub mod model;
pub mod report;
pub mod service;
pub mod solve;
pub mod spans;
pub mod stories;
pub mod units;

pub use api::{Check, Error, FrameBuilder, Outcome, check_file, read_model};
pub use envelope::{Envelope, GoverningMoment, MemberEnvelope, StoryEnvelope};
pub use model::{ActionCategory, LoadLevel, Model, Restraint, SecondOrderMethod};
